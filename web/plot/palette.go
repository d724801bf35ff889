package plot

import "meltbook"

// The Okabe & Ito colour-blind-safe palette.
//
// Reference: M. Okabe and K. Ito, "Color Universal Design (CUD): how to make
// figures and presentations that are friendly to colorblind people" (2008).
const (
	Orange        = "#E69F00"
	SkyBlue       = "#56B4E9"
	BluishGreen   = "#009E73"
	Yellow        = "#F0E442"
	Blue          = "#0072B2"
	Vermillion    = "#D55E00"
	ReddishPurple = "#CC79A7"
	Black         = "#000000"
)

// Class is what a sample shows on a map: one class per sample, chosen from
// its recorded outcomes.
type Class int

// The map classes. The order is the order of precedence in ClassOf and of
// the legend.
const (
	ClassIcosahedral Class = iota
	ClassDecagonal
	ClassApproximant
	ClassAmorphous
	ClassCrystalline
	ClassUndecided
)

// Classes lists the map classes in legend order.
var Classes = []Class{ClassIcosahedral, ClassDecagonal, ClassApproximant, ClassAmorphous, ClassCrystalline, ClassUndecided}

// Shape is a marker shape.
type Shape string

// Marker shapes. Each map class has its own, so that a class never depends
// on colour alone; the undecided class is drawn as an open cross so that it
// recedes behind the decided ones.
const (
	ShapePentagon Shape = "pentagon"
	ShapeDiamond  Shape = "diamond"
	ShapeTriangle Shape = "triangle"
	ShapeCircle   Shape = "circle"
	ShapeSquare   Shape = "square"
	ShapeCross    Shape = "cross"
)

type classStyle struct {
	slug, label string
	colour      string
	shape       Shape
	id          string // SVG symbol id
}

// meltbook's own assignment of colours and shapes. The pentagon recalls the
// five-fold axes of the icosahedral phase; the rest are simply far apart in
// both hue and outline.
var classStyles = [...]classStyle{
	ClassIcosahedral: {"icosahedral", "icosahedral", Vermillion, ShapePentagon, "mi"},
	ClassDecagonal:   {"decagonal", "decagonal", ReddishPurple, ShapeDiamond, "md"},
	ClassApproximant: {"approximant", "approximant", Orange, ShapeTriangle, "ma"},
	ClassAmorphous:   {"amorphous", "amorphous (partly or fully)", BluishGreen, ShapeCircle, "mg"},
	ClassCrystalline: {"crystalline", "crystalline only", Blue, ShapeSquare, "mc"},
	ClassUndecided:   {"undecided", "no outcome yet", Black, ShapeCross, "mu"},
}

// Slug is the class's stable name in URLs, data attributes and JSON.
func (c Class) Slug() string { return classStyles[c].slug }

// Label is the class's name in a legend.
func (c Class) Label() string { return classStyles[c].label }

// Colour is the class's colour, "#RRGGBB".
func (c Class) Colour() string { return classStyles[c].colour }

// Shape is the class's marker shape.
func (c Class) Shape() Shape { return classStyles[c].shape }

// String returns the slug.
func (c Class) String() string { return c.Slug() }

// ClassBySlug returns the class with the given slug.
func ClassBySlug(slug string) (Class, bool) {
	for _, c := range Classes {
		if c.Slug() == slug {
			return c, true
		}
	}
	return 0, false
}

// ClassOf sums up a sample's outcomes as one map class. Only decided
// outcomes count: a person's, or an automatic one that was confirmed;
// proposals still awaiting a decision and rejected ones do not. Among the
// phases found, the first in this order wins: icosahedral, decagonal,
// approximant, amorphous, crystalline. So a ribbon with an icosahedral phase
// beside crystalline ones is icosahedral, one with amorphous and crystalline
// parts is amorphous, and only one with nothing but crystalline phases is
// "crystalline only". No decided outcome gives ClassUndecided.
func ClassOf(outcomes []meltbook.Outcome) Class {
	best := ClassUndecided
	for _, o := range outcomes {
		decided := o.Source == meltbook.ByPerson && o.Status != meltbook.Rejected ||
			o.Source == meltbook.ByAutomatic && o.Status == meltbook.Confirmed
		if !decided {
			continue
		}
		var c Class
		switch o.Kind {
		case meltbook.Icosahedral:
			c = ClassIcosahedral
		case meltbook.Decagonal:
			c = ClassDecagonal
		case meltbook.Approximant:
			c = ClassApproximant
		case meltbook.Amorphous:
			c = ClassAmorphous
		case meltbook.Crystalline:
			c = ClassCrystalline
		default:
			continue
		}
		if c < best {
			best = c
		}
	}
	return best
}

package element

import "strings"

// Hazard is a set of bench hazard classes an element carries.
type Hazard uint8

const (
	// Toxic marks elements whose dust, vapour or fumes are poisonous (Be, Cd, Hg, Pb, Tl, As, ...).
	Toxic Hazard = 1 << iota
	// ReadilyBurning marks elements that ignite readily as fine pieces, turnings or vapour (Mg, Li, Ca, rare earths, ...).
	ReadilyBurning
	// Radioactive marks elements with no stable isotope.
	Radioactive
)

// Element is one chemical element's data. A zero float field means the
// value is not defined or not published for that element; use the Has*
// methods rather than comparing with zero.
type Element struct {
	Z      int
	Symbol string
	Name   string
	// AtomicWeight is the standard atomic weight in g/mol (IUPAC/CIAAW 2021,
	// abridged to five significant figures where the table gives an interval).
	// For elements with no stable isotope it is the mass number of the
	// longest-lived isotope, and Radioactive is set.
	AtomicWeight float64
	// Electronegativity is the Pauling electronegativity (dimensionless).
	Electronegativity float64
	// MetallicRadiusCN12 is the metallic radius for 12-fold coordination, in Å.
	MetallicRadiusCN12 float64
	// ValenceElectrons counts s+d (groups 1-12) or s+p (groups 13-18)
	// electrons outside the noble-gas core, as used for VEC. Lanthanides
	// count 3 (Eu and Yb, divalent in the metal, count 2); actinides count
	// every electron outside the radon core. See the table's source notes.
	ValenceElectrons int
	// Group is the IUPAC group (1-18); 0 for lanthanides and actinides.
	Group int
	// Density is the density of the solid near room temperature, in kg/m³.
	Density float64
	// SpecificHeat is the specific heat capacity near room temperature, in J/(kg·K).
	SpecificHeat float64
	// ThermalConductivity near room temperature, in W/(m·K).
	ThermalConductivity float64
	// Hazards are the bench hazard classes to show as cautions.
	Hazards Hazard
}

// HasElectronegativity reports whether a Pauling value is tabulated.
func (e Element) HasElectronegativity() bool { return e.Electronegativity > 0 }

// HasMetallicRadius reports whether a CN12 metallic radius is tabulated.
func (e Element) HasMetallicRadius() bool { return e.MetallicRadiusCN12 > 0 }

// HasDensity reports whether a room-temperature density is tabulated.
func (e Element) HasDensity() bool { return e.Density > 0 }

// HasSpecificHeat reports whether a room-temperature specific heat is tabulated.
func (e Element) HasSpecificHeat() bool { return e.SpecificHeat > 0 }

// HasThermalConductivity reports whether a room-temperature thermal
// conductivity is tabulated.
func (e Element) HasThermalConductivity() bool { return e.ThermalConductivity > 0 }

// Has reports whether h includes every class in x.
func (h Hazard) Has(x Hazard) bool { return h&x == x }

// String lists the hazard classes in words, e.g. "toxic, readily burning";
// "none" for the empty set.
func (h Hazard) String() string {
	var words []string
	if h.Has(Toxic) {
		words = append(words, "toxic")
	}
	if h.Has(ReadilyBurning) {
		words = append(words, "readily burning")
	}
	if h.Has(Radioactive) {
		words = append(words, "radioactive")
	}
	if len(words) == 0 {
		return "none"
	}
	return strings.Join(words, ", ")
}

// MaxZ is the highest atomic number in the table (plutonium).
const MaxZ = 94

var bySymbol map[string]int

func init() {
	if len(table) != MaxZ {
		panic("element: table must hold Z = 1..MaxZ")
	}
	bySymbol = make(map[string]int, len(table))
	for i, e := range table {
		if e.Z != i+1 {
			panic("element: table out of order at " + e.Symbol)
		}
		bySymbol[e.Symbol] = i
	}
}

// BySymbol returns the element with the given symbol. Symbols are
// case-sensitive: "Co" is cobalt, "CO" is not an element.
func BySymbol(symbol string) (Element, bool) {
	i, ok := bySymbol[symbol]
	if !ok {
		return Element{}, false
	}
	return table[i], true
}

// ByZ returns the element with atomic number z (1 ≤ z ≤ MaxZ).
func ByZ(z int) (Element, bool) {
	if z < 1 || z > len(table) {
		return Element{}, false
	}
	return table[z-1], true
}

// All returns every element in the table, ordered by atomic number.
// The slice is a copy; callers may modify it.
func All() []Element {
	out := make([]Element, len(table))
	copy(out, table)
	return out
}

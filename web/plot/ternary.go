package plot

import (
	"fmt"
	"math"
	"strings"

	"meltbook"
)

// Corner is one corner of a Gibbs triangle: a single element, or a group of
// elements whose atomic fractions are added together, such as (Fe+Si).
type Corner struct {
	Elements []string
}

// Label is how the corner is written on a map: "Al" or "(Fe+Si)".
func (c Corner) Label() string {
	if len(c.Elements) == 1 {
		return c.Elements[0]
	}
	return "(" + strings.Join(c.Elements, "+") + ")"
}

// ParseCorner reads a corner written as "Al", "Fe+Si" or "(Fe+Si)".
// Element symbols are a capital letter and up to two lower-case letters;
// whether they name real elements is left to the caller.
func ParseCorner(s string) (Corner, error) {
	t := strings.TrimSpace(s)
	if strings.HasPrefix(t, "(") && strings.HasSuffix(t, ")") {
		t = t[1 : len(t)-1]
	}
	if strings.TrimSpace(t) == "" {
		return Corner{}, fmt.Errorf("corner %q names no element", s)
	}
	var c Corner
	for part := range strings.SplitSeq(t, "+") {
		sym := strings.TrimSpace(part)
		if !isSymbol(sym) {
			return Corner{}, fmt.Errorf("corner %q: %q is not an element symbol (write e.g. Al or Fe+Si)", s, sym)
		}
		for _, e := range c.Elements {
			if e == sym {
				return Corner{}, fmt.Errorf("corner %q names %s twice", s, sym)
			}
		}
		c.Elements = append(c.Elements, sym)
	}
	return c, nil
}

func isSymbol(s string) bool {
	if len(s) < 1 || len(s) > 3 || s[0] < 'A' || s[0] > 'Z' {
		return false
	}
	for i := 1; i < len(s); i++ {
		if s[i] < 'a' || s[i] > 'z' {
			return false
		}
	}
	return true
}

// Triangle is a Gibbs triangle with corners A, B and C.
type Triangle struct {
	Corners [3]Corner
}

// NewTriangle checks that each corner names at least one element and that
// no element belongs to two corners.
func NewTriangle(a, b, c Corner) (Triangle, error) {
	t := Triangle{Corners: [3]Corner{a, b, c}}
	owner := map[string]int{}
	for i, corner := range t.Corners {
		if len(corner.Elements) == 0 {
			return Triangle{}, fmt.Errorf("corner %c names no element", 'A'+i)
		}
		for _, e := range corner.Elements {
			if j, ok := owner[e]; ok {
				return Triangle{}, fmt.Errorf("%s is in corner %c and corner %c; an element may belong to one corner only", e, 'A'+j, 'A'+i)
			}
			owner[e] = i
		}
	}
	return t, nil
}

// Labels returns the three corner labels.
func (t Triangle) Labels() [3]string {
	return [3]string{t.Corners[0].Label(), t.Corners[1].Label(), t.Corners[2].Label()}
}

// Ternary is a point of the triangle in barycentric coordinates: the shares
// of corners A, B and C, each 0..1, summing to 1.
type Ternary [3]float64

// Projection is where a composition lands on a triangle.
type Projection struct {
	Point Ternary
	// Ignored is the atomic fraction of the composition that belongs to no
	// corner (0..1). Such elements are left out of Point, which is
	// renormalised over the three corners.
	Ignored float64
}

// DefaultMaxIgnored is the largest share of a composition outside the three
// corners for which a map still draws the sample: beyond 5 at.% the point
// would misrepresent the alloy. Chosen for meltbook (common practice is to
// allow small additions of one or two at.% to be left out of a ternary map).
const DefaultMaxIgnored = 0.05

// Project places a composition on the triangle. Each corner's share is the
// sum of its elements' fractions, renormalised over the three corners:
//
//	s_k = Σ_{e ∈ corner k} x_e
//	P_k = s_k / (s_A + s_B + s_C)
//	ignored = 1 − (s_A + s_B + s_C) / Σ_all x_e
//
// Fractions need not sum to 1; they are taken relative to their total. It
// fails when the composition has no element of any corner or a fraction is
// negative or not finite.
//
// Reference: common practice (pseudo-ternary sections with grouped corners).
func (t Triangle) Project(comp []meltbook.ElementFraction) (Projection, error) {
	var shares [3]float64
	var total float64
	for _, ef := range comp {
		if !(ef.Fraction >= 0) || math.IsInf(ef.Fraction, 0) {
			return Projection{}, fmt.Errorf("%s fraction %g is not a finite non-negative number", ef.Element, ef.Fraction)
		}
		total += ef.Fraction
		if k := t.cornerOf(ef.Element); k >= 0 {
			shares[k] += ef.Fraction
		}
	}
	inside := shares[0] + shares[1] + shares[2]
	if !(inside > 0) {
		return Projection{}, fmt.Errorf("the composition has none of %s, %s, %s", t.Corners[0].Label(), t.Corners[1].Label(), t.Corners[2].Label())
	}
	return Projection{
		Point:   Ternary{shares[0] / inside, shares[1] / inside, shares[2] / inside},
		Ignored: 1 - inside/total,
	}, nil
}

func (t Triangle) cornerOf(element string) int {
	for k, c := range t.Corners {
		for _, e := range c.Elements {
			if e == element {
				return k
			}
		}
	}
	return -1
}

// Point is a position in the plane of a triangle of unit side, with y
// pointing up: corner A at (0, 0), B at (1, 0) and C at (1/2, √3/2).
type Point struct{ X, Y float64 }

// Cartesian maps ternary coordinates to the plane:
//
//	x = b + c/2
//	y = c·√3/2
//
// Reference: common practice (equilateral Gibbs triangle).
func (p Ternary) Cartesian() Point {
	return Point{X: p[1] + p[2]/2, Y: p[2] * math.Sqrt(3) / 2}
}

// TernaryAt is the inverse of Cartesian:
//
//	c = 2y/√3,  b = x − c/2,  a = 1 − b − c
//
// Points outside the triangle give shares outside 0..1.
func TernaryAt(q Point) Ternary {
	c := 2 * q.Y / math.Sqrt(3)
	b := q.X - c/2
	return Ternary{1 - b - c, b, c}
}

package composition

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"meltbook/analysis/element"
)

// Part is one element's share of a composition.
type Part struct {
	Element  string  // case-sensitive symbol, e.g. "Al"
	Fraction float64 // atomic (or weight, see the function) fraction, 0..1
}

// Composition is a normalised list of element fractions summing to 1, in the
// order the elements were first written. Unless a function says otherwise
// the fractions are atomic (mole) fractions.
type Composition []Part

// Fraction returns the fraction of symbol, 0 when absent.
func (c Composition) Fraction(symbol string) float64 {
	for _, p := range c {
		if p.Element == symbol {
			return p.Fraction
		}
	}
	return 0
}

// Elements returns the symbols in order.
func (c Composition) Elements() []string {
	out := make([]string, len(c))
	for i, p := range c {
		out[i] = p.Element
	}
	return out
}

// Map returns symbol -> fraction.
func (c Composition) Map() map[string]float64 {
	m := make(map[string]float64, len(c))
	for _, p := range c {
		m[p.Element] = p.Fraction
	}
	return m
}

// Normalise returns a copy scaled so the fractions sum to 1. Repeated
// elements are merged at their first position; zero parts are dropped.
// It fails when the total is not positive or a part is negative.
func Normalise(parts []Part) (Composition, error) {
	var total float64
	index := make(map[string]int, len(parts))
	merged := make(Composition, 0, len(parts))
	for _, p := range parts {
		if p.Fraction < 0 || math.IsNaN(p.Fraction) || math.IsInf(p.Fraction, 0) {
			return nil, fmt.Errorf("%s: amount %g is not a finite non-negative number", p.Element, p.Fraction)
		}
		total += p.Fraction
		if i, ok := index[p.Element]; ok {
			merged[i].Fraction += p.Fraction
			continue
		}
		index[p.Element] = len(merged)
		merged = append(merged, p)
	}
	if !(total > 0) {
		return nil, fmt.Errorf("composition total is %g; it must be positive", total)
	}
	out := merged[:0]
	for _, p := range merged {
		if p.Fraction == 0 {
			continue
		}
		p.Fraction /= total
		out = append(out, p)
	}
	return out, nil
}

// ToWeight converts atomic fractions to weight fractions:
//
//	w_i = x_i·M_i / Σ_j x_j·M_j
//
// with M the standard atomic weights. Reference: common practice.
func (c Composition) ToWeight() (Composition, error) {
	return convert(c, func(x, m float64) float64 { return x * m })
}

// FromWeight converts weight fractions (c read as weight fractions) to
// atomic fractions:
//
//	x_i = (w_i/M_i) / Σ_j (w_j/M_j)
//
// Reference: common practice.
func (c Composition) FromWeight() (Composition, error) {
	return convert(c, func(w, m float64) float64 { return w / m })
}

func convert(c Composition, f func(fraction, weight float64) float64) (Composition, error) {
	parts := make([]Part, len(c))
	for i, p := range c {
		e, ok := element.BySymbol(p.Element)
		if !ok {
			return nil, fmt.Errorf("unknown element %q", p.Element)
		}
		parts[i] = Part{Element: p.Element, Fraction: f(p.Fraction, e.AtomicWeight)}
	}
	return Normalise(parts)
}

// String formats c in at% with up to two decimals, e.g. "Al63Cu25Fe12".
func (c Composition) String() string { return c.Format(2) }

// MeanAtomicWeight returns the mean atomic weight in g/mol,
//
//	M̄ = Σ_i x_i·M_i
//
// with x the atomic fractions and M the standard atomic weights. It fails
// on an unknown symbol. Reference: common practice.
func (c Composition) MeanAtomicWeight() (float64, error) {
	var m float64
	for _, p := range c {
		e, ok := element.BySymbol(p.Element)
		if !ok {
			return 0, fmt.Errorf("unknown element %q", p.Element)
		}
		m += p.Fraction * e.AtomicWeight
	}
	return m, nil
}

// Distance returns the Euclidean distance between two compositions in
// atomic-fraction space over the union of their elements,
//
//	d = sqrt( Σ_i (a_i − b_i)² )
//
// where an element missing from one side counts 0 there. d is a fraction
// (multiply by 100 for at%); two compositions differing by moving 1 at%
// from one element to another are 0.01·√2 apart. Reference: common
// practice.
func Distance(a, b Composition) float64 {
	var s float64
	for _, p := range a {
		d := p.Fraction - b.Fraction(p.Element)
		s += d * d
	}
	for _, p := range b {
		if !a.has(p.Element) {
			s += p.Fraction * p.Fraction
		}
	}
	return math.Sqrt(s)
}

// EqualWithin reports whether no element's fraction differs between a and
// b by more than tolerance, over the union of their elements and
// regardless of order.
func EqualWithin(a, b Composition, tolerance float64) bool {
	for _, p := range a {
		if !(math.Abs(p.Fraction-b.Fraction(p.Element)) <= tolerance) {
			return false
		}
	}
	for _, p := range b {
		if !a.has(p.Element) && !(p.Fraction <= tolerance) {
			return false
		}
	}
	return true
}

// Sorted returns a copy ordered by decreasing fraction; equal fractions
// keep their order.
func (c Composition) Sorted() Composition {
	out := make(Composition, len(c))
	copy(out, c)
	sort.SliceStable(out, func(i, j int) bool { return out[i].Fraction > out[j].Fraction })
	return out
}

// Validate checks that c is a composition as this package makes them: at
// least one part, known element symbols each written once, fractions in
// 0..1 summing to 1 within 1e-9.
func (c Composition) Validate() error {
	if len(c) == 0 {
		return errors.New("composition has no elements")
	}
	var sum float64
	for i, p := range c {
		if _, ok := element.BySymbol(p.Element); !ok {
			return fmt.Errorf("part %d: %q is not an element symbol", i+1, p.Element)
		}
		if c[:i].has(p.Element) {
			return fmt.Errorf("part %d: %s appears twice", i+1, p.Element)
		}
		if !(p.Fraction >= 0 && p.Fraction <= 1) {
			return fmt.Errorf("part %d: %s fraction %g is outside 0..1", i+1, p.Element, p.Fraction)
		}
		sum += p.Fraction
	}
	if math.Abs(sum-1) > 1e-9 {
		return fmt.Errorf("fractions sum to %g, not 1", sum)
	}
	return nil
}

func (c Composition) has(symbol string) bool {
	for _, p := range c {
		if p.Element == symbol {
			return true
		}
	}
	return false
}

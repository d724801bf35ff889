package composition

import (
	"fmt"
	"math"

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

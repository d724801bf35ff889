package plot

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"meltbook"
)

// ElectronsPerAtom returns the electron-per-atom ratio of a composition
// under a valence table (element symbol → valence):
//
//	e/a = Σ x_i·v_i / Σ x_i
//
// It fails when an element has no valence in the table or the fractions do
// not have a positive total.
//
// Reference: Hume-Rothery rules, common practice; valences come from the
// scheme the caller chooses.
func ElectronsPerAtom(comp []meltbook.ElementFraction, valence map[string]float64) (float64, error) {
	var sum, total float64
	for _, ef := range comp {
		v, ok := valence[ef.Element]
		if !ok {
			return math.NaN(), fmt.Errorf("no valence for %s in this scheme", ef.Element)
		}
		sum += ef.Fraction * v
		total += ef.Fraction
	}
	if !(total > 0) {
		return math.NaN(), fmt.Errorf("composition has no positive total")
	}
	return sum / total, nil
}

// ShareRule says how a grouped corner such as (Fe+Si) is split into its
// elements when a map needs one valence for the corner.
type ShareRule string

// The share rules.
const (
	// PooledShares splits each group in the proportions of its elements
	// summed over the samples on the map: for corner k and element e,
	//
	//	w_e = Σ_samples x_e / Σ_samples Σ_{f ∈ corner k} x_f
	//
	// Pooling (rather than averaging per-sample ratios) keeps a sample with
	// only a trace of the group from weighing as much as one rich in it.
	// A group that no sample contains falls back to equal shares.
	PooledShares ShareRule = "pooled"
	// EqualShares gives each element of a group the same share.
	EqualShares ShareRule = "equal"
)

// Shares holds, per corner, the share of each of its elements (summing to
// 1 within the corner) and the rule that set them.
type Shares struct {
	Rule   ShareRule
	Corner [3][]meltbook.ElementFraction
	// Pooled counts the samples that contributed under PooledShares.
	Pooled int
}

// GroupShares returns the shares of every corner's elements under the rule;
// samples are used only by PooledShares and are the compositions drawn on
// the map. Single-element corners always have share 1.
func (t Triangle) GroupShares(rule ShareRule, samples [][]meltbook.ElementFraction) Shares {
	s := Shares{Rule: rule}
	var sums [3]map[string]float64
	if rule == PooledShares {
		for k := range sums {
			sums[k] = map[string]float64{}
		}
		for _, comp := range samples {
			contributed := false
			for _, ef := range comp {
				if k := t.cornerOf(ef.Element); k >= 0 && ef.Fraction > 0 {
					sums[k][ef.Element] += ef.Fraction
					contributed = true
				}
			}
			if contributed {
				s.Pooled++
			}
		}
	}
	for k, c := range t.Corners {
		var total float64
		if rule == PooledShares {
			for _, e := range c.Elements {
				total += sums[k][e]
			}
		}
		shares := make([]meltbook.ElementFraction, len(c.Elements))
		for i, e := range c.Elements {
			w := 1 / float64(len(c.Elements))
			if total > 0 {
				w = sums[k][e] / total
			}
			shares[i] = meltbook.ElementFraction{Element: e, Fraction: w}
		}
		s.Corner[k] = shares
	}
	return s
}

// CornerValences returns the valence standing for each corner: the
// share-weighted mean of its elements' valences,
//
//	v_k = Σ_{e ∈ corner k} w_e·v_e
//
// It fails when an element of a corner has no valence in the table.
func (s Shares) CornerValences(valence map[string]float64) ([3]float64, error) {
	var out [3]float64
	for k, shares := range s.Corner {
		v, err := ElectronsPerAtom(shares, valence)
		if err != nil {
			return out, err
		}
		out[k] = v
	}
	return out, nil
}

// Describe writes the shares of grouped corners for a caption, e.g.
// "(Fe+Si) = Fe 0.62 + Si 0.38"; it returns "" when no corner is grouped.
func (s Shares) Describe() string {
	var parts []string
	for _, shares := range s.Corner {
		if len(shares) < 2 {
			continue
		}
		names := make([]string, len(shares))
		terms := make([]string, len(shares))
		for i, ef := range shares {
			names[i] = ef.Element
			terms[i] = ef.Element + " " + strconv.FormatFloat(ef.Fraction, 'f', 2, 64)
		}
		parts = append(parts, "("+strings.Join(names, "+")+") = "+strings.Join(terms, " + "))
	}
	return strings.Join(parts, "; ")
}

// ElectronField returns e/a over the triangle for the given corner
// valences. With each corner standing for a fixed mixture the composition at
// (a, b, c) is a·A + b·B + c·C, so
//
//	e/a(a, b, c) = a·v_A + b·v_B + c·v_C
//
// which is linear, so its isolines are straight.
func ElectronField(v [3]float64) func(Ternary) float64 {
	return func(p Ternary) float64 { return p[0]*v[0] + p[1]*v[1] + p[2]*v[2] }
}

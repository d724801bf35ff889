package weighout

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"

	"meltbook/analysis/composition"
	"meltbook/analysis/element"
	"meltbook/analysis/hazard"
)

// defaultLoss holds rule-of-thumb evaporation allowances for arc or
// induction melting under argon: the fraction of the charged mass of each
// element expected to be lost. They depend on the furnace, the superheat
// and the number of remelts; weigh the button after melting and adjust.
//
// Reference: common practice (rules of thumb, not measured values).
var defaultLoss = map[string]float64{
	"Mg": 0.03,
	"Zn": 0.02,
	"Mn": 0.01,
	"Li": 0.03,
	"Ca": 0.02,
}

// DefaultLosses returns a copy of the rule-of-thumb loss allowances
// applied when Options.Loss does not name an element: Mg 3 %, Zn 2 %,
// Mn 1 %, Li 3 %, Ca 2 % of the element's charged mass.
func DefaultLosses() map[string]float64 {
	out := make(map[string]float64, len(defaultLoss))
	for k, v := range defaultLoss {
		out[k] = v
	}
	return out
}

// Options describe the button and the pieces.
type Options struct {
	// TotalMassGrams is the intended mass of the alloy button, g.
	TotalMassGrams float64
	// Purity maps an element to the purity of its pieces as a mass
	// fraction in (0, 1]. Elements not listed are taken as pure (1.0), and
	// the sheet says so.
	Purity map[string]float64
	// Loss maps an element to the fraction of its charged mass expected to
	// evaporate, in [0, 1). Elements not listed get the rule-of-thumb
	// allowance of DefaultLosses, or none.
	Loss map[string]float64
	// NoDefaultLoss turns the rule-of-thumb allowances off.
	NoDefaultLoss bool
}

// Loss bases, reported per line.
const (
	LossGiven       = "given"
	LossRuleOfThumb = "rule of thumb"
	LossNone        = "none"
)

// Line is one element of the sheet.
type Line struct {
	Element        string
	AtomicFraction float64
	WeightFraction float64
	// TargetGrams is the element's mass in the finished button, w·M.
	TargetGrams float64
	// ElementGrams is the pure element to charge, TargetGrams/(1 − Loss).
	ElementGrams float64
	// MassGrams is the mass of pieces to weigh, ElementGrams/Purity: the
	// pieces include their impurities.
	MassGrams float64
	// Purity is the mass fraction of the element in its pieces.
	Purity float64
	// PurityAssumed is true when no purity was given and 1.0 was assumed.
	PurityAssumed bool
	// Loss is the evaporation allowance, a fraction of the charged mass.
	Loss float64
	// LossBasis is LossGiven, LossRuleOfThumb or LossNone.
	LossBasis string
}

// Sheet is a planned weigh-out.
type Sheet struct {
	// Composition is the nominal atomic composition.
	Composition composition.Composition
	// TargetGrams is the intended button mass.
	TargetGrams float64
	Lines       []Line
	// TotalGrams is the sum of the masses to weigh.
	TotalGrams float64
	// ExpectedGrams is the button mass once the allowed losses have
	// happened: the target plus the impurities, which are assumed to stay.
	ExpectedGrams float64
	// ImpurityGrams is the mass of impurities charged with the pieces.
	ImpurityGrams float64
	// ExpectedComposition is the atomic composition of the elements left
	// after the allowed losses (impurities not counted); it equals the
	// nominal one when the losses happen as allowed.
	ExpectedComposition composition.Composition
	// IfNoLoss is the atomic composition if nothing evaporates, to show
	// how much the allowance shifts the alloy when it is not needed.
	IfNoLoss composition.Composition
	// Notes state the assumptions in words.
	Notes []string
	// Cautions are the bench cautions for the elements, ending with the
	// deferral to local rules.
	Cautions []hazard.Caution
}

// Plan computes the weigh-out for a button of the atomic composition c:
//
//	w_i   = x_i·M_i / Σ x_j·M_j          (weight fraction; M: standard atomic weights)
//	m_i   = w_i·m                        (element in the button, m = button mass)
//	e_i   = m_i / (1 − L_i)              (pure element to charge; L = loss allowance)
//	p_i   = e_i / P_i                    (pieces to weigh; P = purity, mass fraction)
//
// The pieces carry p_i − e_i of impurity, assumed to stay in the button.
// If every allowed loss happens the button weighs m + Σ(p_i − e_i) and has
// the nominal composition; if nothing evaporates the composition follows
// from e_i instead, which Sheet.IfNoLoss reports.
//
// Errors: empty composition or an unknown element, a button mass that is
// not positive, a purity outside (0, 100 %], a loss allowance outside
// [0, 100 %), or a purity or loss given for an element not in c.
//
// Reference: common practice; atomic weights CIAAW 2021 via the element
// table; loss allowances are rules of thumb (see DefaultLosses).
func Plan(c composition.Composition, opt Options) (Sheet, error) {
	if len(c) == 0 {
		return Sheet{}, errors.New("weigh-out: empty composition")
	}
	m := opt.TotalMassGrams
	if !(m > 0) || math.IsInf(m, 0) {
		return Sheet{}, fmt.Errorf("weigh-out: button mass must be a positive number of grams, got %g g", m)
	}
	if err := checkKeys("purity", opt.Purity, c); err != nil {
		return Sheet{}, err
	}
	if err := checkKeys("loss allowance", opt.Loss, c); err != nil {
		return Sheet{}, err
	}
	s := Sheet{Composition: c, TargetGrams: m, Lines: make([]Line, len(c))}
	weights := make([]float64, len(c))
	var xm float64
	for i, p := range c {
		e, ok := element.BySymbol(p.Element)
		if !ok {
			return Sheet{}, fmt.Errorf("weigh-out: unknown element %q", p.Element)
		}
		if !(p.Fraction > 0) {
			return Sheet{}, fmt.Errorf("weigh-out: %s has fraction %g; fractions must be positive", p.Element, p.Fraction)
		}
		weights[i] = e.AtomicWeight
		xm += p.Fraction * e.AtomicWeight
	}
	var assumedPure, ruleOfThumb []string
	for i, p := range c {
		l := Line{Element: p.Element, AtomicFraction: p.Fraction, Purity: 1, PurityAssumed: true, LossBasis: LossNone}
		if v, ok := opt.Purity[p.Element]; ok {
			if !(v > 0 && v <= 1) {
				return Sheet{}, fmt.Errorf("weigh-out: purity of %s is %s; it must be above 0%% and at most 100%%", p.Element, percent(v))
			}
			l.Purity, l.PurityAssumed = v, false
		} else {
			assumedPure = append(assumedPure, p.Element)
		}
		if v, ok := opt.Loss[p.Element]; ok {
			if !(v >= 0 && v < 1) {
				return Sheet{}, fmt.Errorf("weigh-out: loss allowance for %s is %s; it must be at least 0%% and below 100%%", p.Element, percent(v))
			}
			l.Loss, l.LossBasis = v, LossGiven
		} else if v, ok := defaultLoss[p.Element]; ok && !opt.NoDefaultLoss {
			l.Loss, l.LossBasis = v, LossRuleOfThumb
			ruleOfThumb = append(ruleOfThumb, p.Element+" "+percent(v))
		}
		l.WeightFraction = p.Fraction * weights[i] / xm
		l.TargetGrams = l.WeightFraction * m
		l.ElementGrams = l.TargetGrams / (1 - l.Loss)
		l.MassGrams = l.ElementGrams / l.Purity
		s.TotalGrams += l.MassGrams
		s.ImpurityGrams += l.MassGrams - l.ElementGrams
		s.Lines[i] = l
	}

	// The composition's elements are distinct, so the two compositions are
	// the mole amounts divided by their totals.
	s.ExpectedComposition = make(composition.Composition, len(c))
	s.IfNoLoss = make(composition.Composition, len(c))
	var left, molesAfter, molesNoLoss float64
	for i, l := range s.Lines {
		remaining := l.ElementGrams * (1 - l.Loss)
		left += remaining
		s.ExpectedComposition[i] = composition.Part{Element: l.Element, Fraction: remaining / weights[i]}
		s.IfNoLoss[i] = composition.Part{Element: l.Element, Fraction: l.ElementGrams / weights[i]}
		molesAfter += s.ExpectedComposition[i].Fraction
		molesNoLoss += s.IfNoLoss[i].Fraction
	}
	for i := range s.ExpectedComposition {
		s.ExpectedComposition[i].Fraction /= molesAfter
		s.IfNoLoss[i].Fraction /= molesNoLoss
	}
	s.ExpectedGrams = left + s.ImpurityGrams

	if len(assumedPure) > 0 {
		s.Notes = append(s.Notes, "No purity given for "+strings.Join(assumedPure, ", ")+": taken as 100 %. "+
			"A piece of purity P holds only P times its mass of the element, so give the certificate purity.")
	}
	if len(ruleOfThumb) > 0 {
		s.Notes = append(s.Notes, "Evaporation allowance by rule of thumb for "+strings.Join(ruleOfThumb, ", ")+
			" of the charged mass; adjust it to the button's measured mass loss.")
	}
	if s.ImpurityGrams > 0 {
		s.Notes = append(s.Notes, fmt.Sprintf("The pieces carry %.1f mg of impurities in total, assumed to stay in the button.",
			s.ImpurityGrams*1000))
	}
	s.Cautions = hazard.Cautions(c.Elements())
	return s, nil
}

func checkKeys(what string, m map[string]float64, c composition.Composition) error {
	if len(m) == 0 {
		return nil
	}
	var extra []string
	for k := range m {
		if c.Fraction(k) == 0 {
			extra = append(extra, k)
		}
	}
	if len(extra) == 0 {
		return nil
	}
	sort.Strings(extra)
	return fmt.Errorf("weigh-out: %s given for %s, which %s not in the composition (%s)",
		what, strings.Join(extra, ", "), map[bool]string{true: "is", false: "are"}[len(extra) == 1],
		strings.Join(c.Elements(), ", "))
}

// percent formats a fraction as a percentage for messages.
func percent(v float64) string {
	return fmt.Sprintf("%g%%", math.Round(v*100*1e6)/1e6)
}

package meltbook

import (
	"math"
	"strings"
	"time"
)

// ElementFraction is one element's atomic fraction (0..1) in a composition.
type ElementFraction struct {
	Element  string  `json:"element"`
	Fraction float64 `json:"fraction"`
}

// Melt is one alloy button: what was planned, weighed and melted. Every
// later piece of it is a Sample.
type Melt struct {
	ID        int64     `json:"-"`
	Code      string    `json:"code"` // unique, human-readable, e.g. "QX-0042"
	Operator  string    `json:"operator"`
	CreatedAt time.Time `json:"created_at"`
	// CompositionEntered is the nominal composition exactly as typed.
	CompositionEntered string `json:"composition_entered"`
	// Nominal is the normalised nominal composition (atomic fractions).
	Nominal []ElementFraction `json:"nominal"`
	// TargetMassGrams is the planned button mass.
	TargetMassGrams float64 `json:"target_mass_g"`
	// MassAfterMeltGrams is the button mass weighed after arc melting; nil
	// until measured.
	MassAfterMeltGrams *float64       `json:"mass_after_melt_g,omitempty"`
	WeighOut           []WeighOutLine `json:"weigh_out,omitempty"`
	Notes              string         `json:"notes,omitempty"`
}

// MassLossGrams is the mass lost in melting, when both masses are known:
// the sum of weighed masses (or the target mass) minus the mass after melting.
func (m *Melt) MassLossGrams() (float64, bool) {
	if m.MassAfterMeltGrams == nil {
		return 0, false
	}
	before := m.TargetMassGrams
	var weighed float64
	complete := len(m.WeighOut) > 0
	for _, w := range m.WeighOut {
		if w.WeighedGrams == nil {
			complete = false
			break
		}
		weighed += *w.WeighedGrams
	}
	if complete {
		before = weighed
	}
	return before - *m.MassAfterMeltGrams, true
}

// WeighOutLine is one element of a weigh-out: planned and actually weighed.
type WeighOutLine struct {
	Element      string   `json:"element"`
	PlannedGrams float64  `json:"planned_g"`
	WeighedGrams *float64 `json:"weighed_g,omitempty"`
	// PurityPercent of the elemental piece (e.g. 99.99).
	PurityPercent float64 `json:"purity_pct"`
	// LossPercent allowed for evaporation of this element.
	LossPercent float64 `json:"loss_pct"`
}

// Validate checks a melt before it is stored.
func (m *Melt) Validate() error {
	if strings.TrimSpace(m.Code) == "" {
		return Errorf(Invalid, "code", "a melt needs a code")
	}
	if strings.ContainsAny(m.Code, " \t\r\n/") {
		return Errorf(Invalid, "code", "%q may not contain spaces or slashes", m.Code)
	}
	if strings.TrimSpace(m.Operator) == "" {
		return Errorf(Invalid, "operator", "a melt needs an operator")
	}
	if err := validateFractions("composition", m.Nominal); err != nil {
		return err
	}
	if !(m.TargetMassGrams > 0) || math.IsInf(m.TargetMassGrams, 0) {
		return Errorf(Invalid, "mass", "target mass must be positive, got %g g", m.TargetMassGrams)
	}
	if m.MassAfterMeltGrams != nil && !(*m.MassAfterMeltGrams > 0) {
		return Errorf(Invalid, "mass-after", "mass after melting must be positive, got %g g", *m.MassAfterMeltGrams)
	}
	for _, w := range m.WeighOut {
		if !(w.PlannedGrams >= 0) || (w.WeighedGrams != nil && !(*w.WeighedGrams >= 0)) {
			return Errorf(Invalid, "weigh-out."+w.Element, "masses must not be negative")
		}
		if !(w.PurityPercent > 0 && w.PurityPercent <= 100) {
			return Errorf(Invalid, "weigh-out."+w.Element, "purity %g%% is outside (0, 100]", w.PurityPercent)
		}
		if !(w.LossPercent >= 0 && w.LossPercent < 100) {
			return Errorf(Invalid, "weigh-out."+w.Element, "loss allowance %g%% is outside [0, 100)", w.LossPercent)
		}
	}
	return nil
}

func validateFractions(field string, fs []ElementFraction) error {
	if len(fs) == 0 {
		return Errorf(Invalid, field, "no elements")
	}
	var sum float64
	seen := make(map[string]bool, len(fs))
	for _, f := range fs {
		if f.Element == "" {
			return Errorf(Invalid, field, "empty element symbol")
		}
		if seen[f.Element] {
			return Errorf(Invalid, field, "%s appears twice", f.Element)
		}
		seen[f.Element] = true
		if !(f.Fraction >= 0 && f.Fraction <= 1) {
			return Errorf(Invalid, field, "%s fraction %g is outside 0..1", f.Element, f.Fraction)
		}
		sum += f.Fraction
	}
	if math.Abs(sum-1) > 1e-6 {
		return Errorf(Invalid, field, "fractions sum to %g, not 1", sum)
	}
	return nil
}

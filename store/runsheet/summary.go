package runsheet

import (
	"fmt"
	"strconv"
	"strings"

	"meltbook"
	"meltbook/analysis/quantity"
)

// Summary says in one line what a row holds: composition, mass, date,
// operator, each step's parameters in the units written, and the phases.
func (r *Row) Summary() string {
	m := &r.Melt
	parts := []string{m.CompositionEntered, strconv.FormatFloat(m.TargetMassGrams, 'g', 6, 64) + " g"}
	if !m.CreatedAt.IsZero() {
		layout := "2006-01-02"
		if m.CreatedAt.Hour() != 0 || m.CreatedAt.Minute() != 0 {
			layout = "2006-01-02 15:04"
		}
		parts = append(parts, m.CreatedAt.Format(layout))
	}
	if m.Operator != "" {
		parts = append(parts, "by "+m.Operator)
	}
	for _, st := range r.Steps {
		var ps []string
		for _, p := range st.Params {
			if p.Name == "cooling-regime" {
				continue
			}
			ps = append(ps, p.Name+" "+paramText(st.Kind, p))
		}
		parts = append(parts, string(st.Kind)+": "+strings.Join(ps, ", "))
	}
	if len(r.Outcomes) > 0 {
		var os []string
		for _, o := range r.Outcomes {
			os = append(os, OutcomeText(o))
		}
		parts = append(parts, "found: "+strings.Join(os, " + "))
	}
	return strings.Join(parts, "; ")
}

// OutcomeText shows an outcome briefly: "icosahedral F 80%",
// "approximant 1/1 P", "crystalline λ-Al13Fe4", "icosahedral (tentative)".
func OutcomeText(o meltbook.Outcome) string {
	s := string(o.Kind)
	for _, x := range []string{o.Order, o.Lattice, o.Name} {
		if x != "" {
			s += " " + x
		}
	}
	if o.Fraction != nil {
		s += fmt.Sprintf(" %.0f%%", 100**o.Fraction)
	}
	if strings.HasPrefix(o.Evidence, Tentative) {
		s += " (" + Tentative + ")"
	}
	return s
}

// paramText shows a parameter in the unit it was written in.
func paramText(kind meltbook.StepKind, p meltbook.Param) string {
	if p.Text != "" {
		return p.Text
	}
	spec, _ := meltbook.ParamSpecFor(kind, p.Name)
	var dim quantity.Dimension
	switch spec.Dimension {
	case meltbook.Length:
		dim = quantity.Length
	case meltbook.Speed:
		dim = quantity.Speed
	case meltbook.Pressure:
		dim = quantity.Pressure
	case meltbook.Temperature:
		dim = quantity.Temperature
	case meltbook.Duration:
		dim = quantity.Time
	case meltbook.Mass:
		dim = quantity.Mass
	case meltbook.CoolingRate:
		return fmt.Sprintf("%.2g K/s (estimate)", p.SI)
	default:
		s := strconv.FormatFloat(p.SI, 'g', 6, 64)
		if p.Unit != "" {
			s += " " + p.Unit
		}
		return s
	}
	if s, err := quantity.Format(quantity.Value{SI: p.SI, Dimension: dim}, p.Unit); err == nil {
		return s
	}
	return strconv.FormatFloat(p.SI, 'g', 6, 64) + " " + spec.Dimension.SIUnit()
}

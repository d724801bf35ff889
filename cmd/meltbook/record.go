package main

import (
	"strconv"

	"meltbook"
	"meltbook/analysis/quantity"
	"meltbook/store/runform"
)

// A run is what `meltbook log` records; package runform reads its fields
// (flags, run files, prompts) and checks them. What is left here shows
// stored values back.

// formatParam shows a stored parameter in the unit it was typed in.
func formatParam(kind meltbook.StepKind, p meltbook.Param) string {
	spec, ok := meltbook.ParamSpecFor(kind, p.Name)
	if !ok || spec.Dimension == meltbook.Text || p.Text != "" {
		return p.Text
	}
	switch spec.Dimension {
	case meltbook.Count:
		return strconv.FormatFloat(p.SI, 'g', -1, 64)
	case meltbook.Current:
		return strconv.FormatFloat(p.SI, 'g', 6, 64) + " A"
	case meltbook.CoolingRate:
		return strconv.FormatFloat(p.SI, 'g', 3, 64) + " K/s"
	}
	return formatSI(spec, p.SI, p.Unit)
}

// formatSI shows an SI value of a parameter in unit, else in the
// parameter's display unit, else in SI.
func formatSI(spec meltbook.ParamSpec, si float64, unit string) string {
	dim, ok := runform.QuantityDimension(spec.Dimension)
	if ok {
		for _, u := range []string{unit, spec.DisplayUnit} {
			if u == "" {
				continue
			}
			if s, err := quantity.Format(quantity.Value{SI: si, Dimension: dim}, u); err == nil {
				return s
			}
		}
	}
	return strconv.FormatFloat(si, 'g', 6, 64) + " " + spec.Dimension.SIUnit()
}

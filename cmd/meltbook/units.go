package main

import (
	"strings"

	"meltbook"
	"meltbook/analysis/quantity"
)

// parseQuantity reads a flag value with units into SI, naming the flag in
// the error.
func parseQuantity(flag, s string, dim quantity.Dimension) (quantity.Value, error) {
	v, err := quantity.Parse(s, dim)
	if err != nil {
		return v, meltbook.Errorf(meltbook.Invalid, flag, "%v", err)
	}
	return v, nil
}

// parseElementPercents reads repeated El=VALUE flag values (VALUE a
// percentage, "%" optional, or a fraction with "ppm") into element ->
// fraction.
func parseElementPercents(flag string, values []string) (map[string]float64, error) {
	out := make(map[string]float64, len(values))
	for _, v := range values {
		el, amount, ok := strings.Cut(v, "=")
		el, amount = strings.TrimSpace(el), strings.TrimSpace(amount)
		if !ok || el == "" || amount == "" {
			return nil, meltbook.Errorf(meltbook.Invalid, flag, "%q is not ELEMENT=PERCENT, e.g. Mg=3%%", v)
		}
		if !strings.HasSuffix(amount, "%") && !strings.HasSuffix(amount, "ppm") {
			amount += "%"
		}
		q, err := quantity.Parse(amount, quantity.Fraction)
		if err != nil {
			return nil, meltbook.Errorf(meltbook.Invalid, flag, "%s: %v", el, err)
		}
		if _, dup := out[el]; dup {
			return nil, meltbook.Errorf(meltbook.Invalid, flag, "%s given twice", el)
		}
		out[el] = q.SI
	}
	return out, nil
}

// invalidFlag is a bad-input error about one flag.
func invalidFlag(flag, msg string) error {
	return meltbook.Errorf(meltbook.Invalid, flag, "%s", msg)
}

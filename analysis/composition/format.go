package composition

import "strconv"

// Format writes c as an at% formula, each element followed by its atomic
// percentage rounded to precision decimals with trailing zeros trimmed:
// Al62.5Cu25Fe12.5 at precision 1 or more, Al63Cu25Fe12 at precision 0.
// A negative precision writes the shortest form that reads back to the
// same number. Rounding is to nearest, ties to even on the exact binary
// value (as strconv does), and rounded values need not add up to exactly
// 100. Elements keep their order. The result reads back with Parse.
func (c Composition) Format(precision int) string {
	return string(c.appendFormula(nil, 100, precision))
}

// FormatFractions writes c as a fraction formula, e.g. Al0.63Cu0.25Fe0.12,
// with the same rounding as Format.
func (c Composition) FormatFractions(precision int) string {
	return string(c.appendFormula(nil, 1, precision))
}

// FormatBalance writes c in balance notation in at%, e.g. Al-25Cu-12Fe.
// The balance element is the one with the largest fraction (the first of
// them on a tie), written first with no amount; the others follow in
// their order, each amount rounded as in Format. The balance is whatever
// the written amounts leave of 100, so it stays exact.
func (c Composition) FormatBalance(precision int) string {
	if len(c) == 0 {
		return ""
	}
	base := 0
	for i, p := range c {
		if p.Fraction > c[base].Fraction {
			base = i
		}
	}
	b := make([]byte, 0, 8*len(c))
	b = append(b, c[base].Element...)
	for i, p := range c {
		if i == base {
			continue
		}
		b = append(b, '-')
		b = appendAmount(b, 100*p.Fraction, precision)
		b = append(b, p.Element...)
	}
	return string(b)
}

// FormatWeight converts c (atomic fractions) to weight percent and writes
// it as a formula with a " wt%" suffix, e.g. "Al42.94Cu40.13Fe16.93 wt%"
// for Al63Cu25Fe12 at precision 2. It fails on an unknown symbol. For
// balance notation in wt%, format the weight fractions from ToWeight with
// FormatBalance and add " wt%".
func (c Composition) FormatWeight(precision int) (string, error) {
	w, err := c.ToWeight()
	if err != nil {
		return "", err
	}
	return string(append(w.appendFormula(nil, 100, precision), " wt%"...)), nil
}

func (c Composition) appendFormula(b []byte, scale float64, precision int) []byte {
	if b == nil {
		b = make([]byte, 0, 8*len(c))
	}
	for _, p := range c {
		b = append(b, p.Element...)
		b = appendAmount(b, scale*p.Fraction, precision)
	}
	return b
}

// appendAmount appends v with precision decimals (shortest when
// negative), trailing zeros and a trailing point removed.
func appendAmount(b []byte, v float64, precision int) []byte {
	start := len(b)
	b = strconv.AppendFloat(b, v, 'f', precision, 64)
	dot := -1
	for i := start; i < len(b); i++ {
		if b[i] == '.' {
			dot = i
			break
		}
	}
	if dot < 0 {
		return b
	}
	for b[len(b)-1] == '0' {
		b = b[:len(b)-1]
	}
	if b[len(b)-1] == '.' {
		b = b[:len(b)-1]
	}
	return b
}

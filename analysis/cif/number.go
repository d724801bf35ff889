package cif

import (
	"errors"
	"math"
	"strconv"
	"strings"
)

// ErrUnknown is returned by Number for "?" and ".".
var ErrUnknown = errors.New("value is unknown (? or .)")

// ErrNotNumber is returned by Number for text that is not a CIF number.
var ErrNotNumber = errors.New("not a number")

// ErrNotFinite is returned by Number for a value or uncertainty beyond
// the range of a float64, and for text spelling NaN or infinity.
var ErrNotFinite = errors.New("not a finite number")

// Number reads a CIF numeric value with an optional standard uncertainty
// in parentheses, which counts in units of the last digit of the mantissa:
//
//	"28.4400(5)" = 28.44 ± 0.0005    "1.5e3(2)" = 1500 ± 200
//
// hasSU tells whether an uncertainty was given. "?" and "." give
// ErrUnknown; a number too large for a float64, or NaN or infinity
// spelt out, ErrNotFinite; anything else that is not a decimal number
// ErrNotNumber.
//
// Reference: IUCr, CIF 1.1 syntax specification, numeric values.
func (v Value) Number() (x, su float64, hasSU bool, err error) {
	if v.Unknown() {
		return 0, 0, false, ErrUnknown
	}
	text := v.Text
	num := text
	if open := strings.IndexByte(text, '('); open >= 0 {
		if !strings.HasSuffix(text, ")") || open+2 > len(text)-1 {
			return 0, 0, false, ErrNotNumber
		}
		digits := text[open+1 : len(text)-1]
		for i := 0; i < len(digits); i++ {
			if digits[i] < '0' || digits[i] > '9' {
				return 0, 0, false, ErrNotNumber
			}
		}
		num = text[:open]
		n, perr := strconv.ParseFloat(digits, 64)
		if perr != nil || math.IsInf(n, 0) {
			return 0, 0, false, ErrNotFinite
		}
		su = n * math.Pow(10, float64(exponentOf(num)-decimalsOf(num)))
		if math.IsInf(su, 0) || math.IsNaN(su) {
			return 0, 0, false, ErrNotFinite
		}
		hasSU = true
	}
	if !isDecimal(num) {
		switch strings.TrimLeft(strings.ToLower(num), "+-") {
		case "nan", "inf", "infinity":
			return 0, 0, false, ErrNotFinite
		}
		return 0, 0, false, ErrNotNumber
	}
	x, perr := strconv.ParseFloat(num, 64)
	if perr != nil || math.IsInf(x, 0) {
		return 0, 0, false, ErrNotFinite
	}
	return x, su, hasSU, nil
}

// isDecimal reports whether s is [+-]digits[.digits][e[+-]digits] with at
// least one mantissa digit.
func isDecimal(s string) bool {
	i, n := 0, len(s)
	if i < n && (s[i] == '+' || s[i] == '-') {
		i++
	}
	digits := 0
	for i < n && s[i] >= '0' && s[i] <= '9' {
		i, digits = i+1, digits+1
	}
	if i < n && s[i] == '.' {
		i++
		for i < n && s[i] >= '0' && s[i] <= '9' {
			i, digits = i+1, digits+1
		}
	}
	if digits == 0 {
		return false
	}
	if i < n && (s[i] == 'e' || s[i] == 'E') {
		i++
		if i < n && (s[i] == '+' || s[i] == '-') {
			i++
		}
		exp := 0
		for i < n && s[i] >= '0' && s[i] <= '9' {
			i, exp = i+1, exp+1
		}
		if exp == 0 {
			return false
		}
	}
	return i == n
}

// decimalsOf counts the digits after the decimal point of a mantissa.
func decimalsOf(num string) int {
	m := num
	if i := strings.IndexAny(m, "eE"); i >= 0 {
		m = m[:i]
	}
	if i := strings.IndexByte(m, '.'); i >= 0 {
		return len(m) - i - 1
	}
	return 0
}

// exponentOf returns the decimal exponent of a number, 0 when it has none
// or it is out of reach.
func exponentOf(num string) int {
	i := strings.IndexAny(num, "eE")
	if i < 0 {
		return 0
	}
	e, err := strconv.Atoi(num[i+1:])
	if err != nil || e > 400 || e < -400 {
		return 0
	}
	return e
}

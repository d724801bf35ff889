package powder

import (
	"math"
	"strings"

	"meltbook"
)

// formFactor holds the coefficients of one element's form factor.
type formFactor struct {
	Symbol string
	Z      int
	A      [4]float64 // e
	B      [4]float64 // Å²
	C      float64    // e
}

// MaxSinThetaOverLambda is the largest s = sinθ/λ in Å⁻¹ for which the
// four-Gaussian fits of International Tables Vol. C (1992), Table 6.1.1.4,
// are given.
const MaxSinThetaOverLambda = 2.0

var formFactorIndex = func() map[string]int {
	m := make(map[string]int, len(formFactorTable))
	for i, f := range formFactorTable {
		m[f.Symbol] = i
	}
	return m
}()

// lookupFormFactor finds the coefficients of an element symbol written in
// any case ("Al", "AL", "al").
func lookupFormFactor(el string) (formFactor, bool) {
	sym := strings.TrimSpace(el)
	if sym == "" {
		return formFactor{}, false
	}
	sym = strings.ToUpper(sym[:1]) + strings.ToLower(sym[1:])
	i, ok := formFactorIndex[sym]
	if !ok {
		return formFactor{}, false
	}
	return formFactorTable[i], true
}

// at returns f0(s) for s = sinθ/λ in Å⁻¹.
func (f formFactor) at(s float64) float64 {
	s2 := s * s
	return f.A[0]*math.Exp(-f.B[0]*s2) + f.A[1]*math.Exp(-f.B[1]*s2) +
		f.A[2]*math.Exp(-f.B[2]*s2) + f.A[3]*math.Exp(-f.B[3]*s2) + f.C
}

// ScatteringFactor returns the X-ray atomic form factor f0 in electrons of
// the neutral atom of element el (H to U, symbol in any case) at
// s = sinθ/λ in Å⁻¹:
//
//	f0(s) = Σᵢ₌₁⁴ aᵢ exp(−bᵢ s²) + c
//
// with the coefficients of International Tables Vol. C (1992), Table
// 6.1.1.4, taken from python3-gemmi's copy of that table. The fit holds for
// 0 ≤ s ≤ 2 Å⁻¹; s outside that range, or an element not in the table, is
// an error. Ions are not tabulated; anomalous dispersion is not included.
//
// Reference: International Tables for Crystallography Vol. C (1992),
// §6.1.1.4 and Table 6.1.1.4 (Cromer–Mann form of the coefficients).
func ScatteringFactor(el string, s float64) (float64, error) {
	f, ok := lookupFormFactor(el)
	if !ok {
		return 0, meltbook.Errorf(meltbook.Invalid, "element", "%q is not an element from H to U with a tabulated X-ray form factor", el)
	}
	if !(s >= 0 && s <= MaxSinThetaOverLambda) {
		return 0, meltbook.Errorf(meltbook.Invalid, "sinθ/λ", "%g Å⁻¹ is outside the 0 to %g Å⁻¹ range of the form-factor fit", s, MaxSinThetaOverLambda)
	}
	return f.at(s), nil
}

package peaks

import "math"

const (
	ln2      = math.Ln2
	gaussC   = 4 * ln2            // exponent factor: exp(−4 ln2 u²)
	gaussN   = 0.9394372786996513 // 2·sqrt(ln2/π)
	lorentzN = 2 / math.Pi        // 2/π
	degree   = math.Pi / 180
)

// PseudoVoigt returns the area-normalised pseudo-Voigt profile at x times
// area, for a peak at center with full width at half maximum fwhm and
// Lorentzian fraction eta:
//
//	pV(x) = area · [η L(x) + (1 − η) G(x)]
//	L(x)  = (2/πΓ) / (1 + 4u²)
//	G(x)  = (2/Γ) √(ln2/π) · exp(−4 ln2 u²),   u = (x − center)/Γ
//
// Both components have the common FWHM Γ and unit area. fwhm must be
// positive; eta is used as given (0 Gaussian, 1 Lorentzian).
//
// Reference: G. K. Wertheim, M. A. Butler, K. W. West and D. N. E.
// Buchanan, Rev. Sci. Instrum. 45, 1369 (1974) (citation from memory);
// common practice in powder diffraction.
func PseudoVoigt(x, center, fwhm, eta, area float64) float64 {
	u := (x - center) / fwhm
	u2 := u * u
	f := eta * lorentzN / (1 + 4*u2)
	if u2 < gaussCut {
		f += (1 - eta) * gaussN * math.Exp(-gaussC*u2)
	}
	return area / fwhm * f
}

// gaussCut is the squared distance in FWHM beyond which the Gaussian part,
// exp(−4 ln2 · 40) ≈ 1e−48 of its peak, is left out.
const gaussCut = 40

// PseudoVoigtHeight returns the maximum of the pseudo-Voigt of the given
// area, FWHM and Lorentzian fraction:
//
//	H = area · [η · 2/(πΓ) + (1 − η) · (2/Γ) √(ln2/π)]
//
// Reference: follows from PseudoVoigt at x = center.
func PseudoVoigtHeight(area, fwhm, eta float64) float64 {
	return area / fwhm * (eta*lorentzN + (1-eta)*gaussN)
}

// pvTerms returns the profile at x of unit area and its partial derivatives
// with respect to the center, the FWHM and η.
func pvTerms(x, center, fwhm, eta float64) (f, dCenter, dFWHM, dEta float64) {
	inv := 1 / fwhm
	u := (x - center) * inv
	u2 := u * u
	den := 1 / (1 + 4*u2)
	l := lorentzN * inv * den
	g := gaussN * inv * math.Exp(-gaussC*u2)
	f = eta*l + (1-eta)*g
	// dL/du = −8u·L/(1+4u²); dG/du = −2·gaussC·u·G; du/dcenter = −1/Γ, du/dΓ = −u/Γ.
	dLdu := -8 * u * l * den
	dGdu := -2 * gaussC * u * g
	dfdu := eta*dLdu + (1-eta)*dGdu
	dCenter = -dfdu * inv
	dFWHM = -f*inv - dfdu*u*inv
	dEta = l - g
	return
}

package peaks

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"

	"meltbook/analysis/radiation"
)

// Extinction names the reflection conditions of a cubic standard.
type Extinction int

// The reflection conditions known here.
const (
	// Primitive cubic: every hkl reflects (LaB6, Pm-3m).
	Primitive Extinction = iota + 1
	// Diamond: h, k, l all odd, or all even with h + k + l = 4n (Si, Fd-3m).
	Diamond
)

func (e Extinction) allowed(h, k, l int) bool {
	switch e {
	case Primitive:
		return true
	case Diamond:
		odd := h%2 != 0 && k%2 != 0 && l%2 != 0
		even := h%2 == 0 && k%2 == 0 && l%2 == 0
		return odd || even && (h+k+l)%4 == 0
	}
	panic(fmt.Sprintf("peaks: unknown extinction %d", int(e)))
}

// Standard is a cubic line-position standard mixed into a specimen.
type Standard struct {
	Name string
	// LatticeAngstrom is the certified lattice parameter in Å.
	LatticeAngstrom float64
	Extinction      Extinction
}

// The internal standards meltbook knows.
var (
	// SiliconSRM640f: a = 5.431144 Å at 22.5 °C, certificate of NIST SRM
	// 640f (silicon powder, line position and line shape standard).
	SiliconSRM640f = Standard{Name: "Si (NIST SRM 640f)", LatticeAngstrom: 5.431144, Extinction: Diamond}
	// LaB6SRM660c: a = 4.156826 Å at 22.5 °C, certificate of NIST SRM 660c
	// (LaB6 powder, line position and line shape standard).
	LaB6SRM660c = Standard{Name: "LaB6 (NIST SRM 660c)", LatticeAngstrom: 4.156826, Extinction: Primitive}
)

// StandardByName returns the standard named "Si" or "LaB6" (any case).
func StandardByName(name string) (Standard, error) {
	switch strings.ToLower(strings.TrimSpace(name)) {
	case "si", "silicon":
		return SiliconSRM640f, nil
	case "lab6":
		return LaB6SRM660c, nil
	}
	return Standard{}, fmt.Errorf("unknown internal standard %q (known: Si, LaB6)", name)
}

// Reflection is one line of a standard.
type Reflection struct {
	H, K, L     int
	DAngstrom   float64
	TwoThetaDeg float64
}

// Label returns "Si (NIST SRM 640f) 111"-style text naming the line.
func (r Reflection) Label(std Standard) string {
	return fmt.Sprintf("%s %d%d%d", std.Name, r.H, r.K, r.L)
}

// Reflections lists the standard's reflections reached by wavelength
// lambdaA between minDeg and maxDeg (2θ, degrees), one per distinct
// d-spacing (with the smallest-index representative h ≥ k ≥ l ≥ 0, so
// 511 for 511/333), in order of increasing angle:
//
//	d = a / √(h² + k² + l²),   2θ = 2 asin(λ / 2d)
//
// Reference: Bragg's law and the cubic metric, common practice.
func (s Standard) Reflections(lambdaA, minDeg, maxDeg float64) []Reflection {
	if !(lambdaA > 0) || !(s.LatticeAngstrom > 0) {
		return nil
	}
	// λ/2d ≤ 1 bounds h² + k² + l² by (2a/λ)².
	maxN := int(math.Floor(4 * s.LatticeAngstrom * s.LatticeAngstrom / (lambdaA * lambdaA)))
	seen := map[int]bool{}
	var out []Reflection
	hmax := int(math.Sqrt(float64(maxN))) + 1
	for h := 0; h <= hmax; h++ {
		for k := 0; k <= h; k++ {
			for l := 0; l <= k; l++ {
				n := h*h + k*k + l*l
				if n == 0 || n > maxN || seen[n] || !s.Extinction.allowed(h, k, l) {
					continue
				}
				d := s.LatticeAngstrom / math.Sqrt(float64(n))
				tt, ok := radiation.DToTwoTheta(d, lambdaA)
				if !ok || tt < minDeg || tt > maxDeg {
					continue
				}
				seen[n] = true
				out = append(out, Reflection{H: h, K: k, L: l, DAngstrom: d, TwoThetaDeg: tt})
			}
		}
	}
	sort.Slice(out, func(i, j int) bool { return out[i].TwoThetaDeg < out[j].TwoThetaDeg })
	return out
}

// Match pairs a found peak with a line of the standard.
type Match struct {
	Peak            int // index into the peak list
	Reflection      Reflection
	ObservedDeg     float64 // fitted 2θ
	ResidualDeg     float64 // observed − (calculated + correction)
	ObservedSUDeg   float64
	CalculatedDeg   float64
	CorrectionAtDeg float64 // zero + displacement·cos θ at this line
}

// ZeroShift is the angular correction found from an internal standard.
// Observed angles relate to true ones by
//
//	2θ_obs = 2θ_true + Z + D · cos θ
//
// so a corrected angle is 2θ_obs − Z − D cos θ.
type ZeroShift struct {
	Standard string
	// ZeroDeg is the zero shift Z in degrees 2θ, with its standard
	// uncertainty.
	ZeroDeg, ZeroSUDeg float64
	// DisplacementDeg is D, the coefficient of cos θ, in degrees 2θ; zero
	// unless fitted. For a specimen displaced by s from the focusing circle
	// of a diffractometer of radius R, D = −(2s/R)·(180/π).
	DisplacementDeg, DisplacementSUDeg float64
	Fitted                             bool // whether D was fitted
	Matches                            []Match
	// ReducedChiSquare is χ²/(n − p) of the fit, NaN with no degrees of
	// freedom.
	ReducedChiSquare float64

	cov01 float64 // covariance of Z and D
}

// ErrNoStandardPeaks is wrapped by FitZeroShift's error when too few peaks
// match the standard.
var ErrNoStandardPeaks = errors.New("too few peaks of the internal standard")

// FitZeroShift matches peaks to the standard's lines for wavelength
// lambdaA (each line takes the nearest unused peak within toleranceDeg)
// and fits Z, and D when displacement is set, by weighted least squares
// with weights 1/u(2θ)²:
//
//	Δ_i = 2θ_obs,i − 2θ_calc,i = Z + D cos θ_i
//
// Standard uncertainties come from the inverse normal matrix, scaled by the
// reduced χ² when that exceeds one (the Birge ratio). One match suffices
// for Z alone (its uncertainty is that of the peak); D needs three.
//
// Reference: common practice for internal-standard calibration; the cos θ
// form of the specimen-displacement shift is common practice (from memory:
// H. P. Klug and L. E. Alexander, X-ray Diffraction Procedures, 2nd ed.,
// Wiley 1974).
func FitZeroShift(peaks []Peak, std Standard, lambdaA, toleranceDeg float64, displacement bool) (ZeroShift, error) {
	z := ZeroShift{Standard: std.Name, Fitted: displacement, ReducedChiSquare: math.NaN()}
	if len(peaks) == 0 {
		return z, fmt.Errorf("zero shift: %w: no peaks", ErrNoStandardPeaks)
	}
	lo, hi := peaks[0].TwoThetaDeg-toleranceDeg, peaks[len(peaks)-1].TwoThetaDeg+toleranceDeg
	used := map[int]bool{}
	for _, r := range std.Reflections(lambdaA, lo, hi) {
		best, bestDist := -1, toleranceDeg
		for i, p := range peaks {
			if d := math.Abs(p.TwoThetaDeg - r.TwoThetaDeg); !used[i] && d <= bestDist {
				best, bestDist = i, d
			}
		}
		if best >= 0 {
			used[best] = true
			p := peaks[best]
			u := p.TwoThetaSUDeg
			if !(u > 1e-5) {
				u = 1e-5
			}
			z.Matches = append(z.Matches, Match{Peak: best, Reflection: r, ObservedDeg: p.TwoThetaDeg,
				ObservedSUDeg: u, CalculatedDeg: r.TwoThetaDeg})
		}
	}
	need := 1
	if displacement {
		need = 3
	}
	if len(z.Matches) < need {
		return z, fmt.Errorf("zero shift: %w: %d of the found peaks lie within %.3g° of a %s line; need %d",
			ErrNoStandardPeaks, len(z.Matches), toleranceDeg, std.Name, need)
	}
	// Normal equations for Δ = Z + D c, c = cos θ.
	var s00, s01, s11, b0, b1 float64
	for _, m := range z.Matches {
		w := 1 / (m.ObservedSUDeg * m.ObservedSUDeg)
		c := math.Cos(m.CalculatedDeg / 2 * degree)
		d := m.ObservedDeg - m.CalculatedDeg
		s00 += w
		s01 += w * c
		s11 += w * c * c
		b0 += w * d
		b1 += w * d * c
	}
	var v00, v01, v11 float64
	if displacement {
		det := s00*s11 - s01*s01
		if !(det > 1e-12*s00*s11) {
			return z, fmt.Errorf("zero shift: the matched %s lines span too little of cos θ to separate zero shift from displacement", std.Name)
		}
		v00, v01, v11 = s11/det, -s01/det, s00/det
		z.ZeroDeg = v00*b0 + v01*b1
		z.DisplacementDeg = v01*b0 + v11*b1
	} else {
		v00 = 1 / s00
		z.ZeroDeg = b0 / s00
	}
	chi2 := 0.0
	for i := range z.Matches {
		m := &z.Matches[i]
		m.CorrectionAtDeg = z.ZeroDeg + z.DisplacementDeg*math.Cos(m.CalculatedDeg/2*degree)
		m.ResidualDeg = m.ObservedDeg - m.CalculatedDeg - m.CorrectionAtDeg
		chi2 += m.ResidualDeg * m.ResidualDeg / (m.ObservedSUDeg * m.ObservedSUDeg)
	}
	np := 1
	if displacement {
		np = 2
	}
	scale := 1.0
	if dof := len(z.Matches) - np; dof > 0 {
		z.ReducedChiSquare = chi2 / float64(dof)
		scale = math.Max(1, z.ReducedChiSquare)
	}
	z.ZeroSUDeg = math.Sqrt(v00 * scale)
	if displacement {
		z.DisplacementSUDeg = math.Sqrt(v11 * scale)
	}
	z.cov01 = v01 * scale
	return z, nil
}

// Correct returns p with its angle corrected by z and the d-spacing and
// uncertainties recomputed for wavelength lambdaA:
//
//	2θ = 2θ_obs − Z − D cos θ_obs
//	u²(2θ) = u²(2θ_obs) + u²(Z) + cos²θ u²(D) + 2 cos θ cov(Z, D)
func (z ZeroShift) Correct(p Peak, lambdaA float64) Peak {
	c := math.Cos(p.TwoThetaDeg / 2 * degree)
	p.TwoThetaDeg -= z.ZeroDeg + z.DisplacementDeg*c
	v := p.TwoThetaSUDeg*p.TwoThetaSUDeg + z.ZeroSUDeg*z.ZeroSUDeg +
		c*c*z.DisplacementSUDeg*z.DisplacementSUDeg + 2*c*z.cov01
	p.TwoThetaSUDeg = math.Sqrt(math.Max(v, 0))
	p.DAngstrom = radiation.TwoThetaToD(p.TwoThetaDeg, lambdaA)
	p.DSUAngstrom = radiation.DSU(p.TwoThetaDeg, p.TwoThetaSUDeg, lambdaA)
	return p
}

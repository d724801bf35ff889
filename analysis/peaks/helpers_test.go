package peaks_test

import (
	"math"
	"math/rand/v2"

	"gonum.org/v1/gonum/stat/distuv"

	"meltbook/analysis/radiation"
	"meltbook/analysis/scanfile"
)

// truePeak is a peak put into a synthetic scan.
type truePeak struct {
	center, area, fwhm, eta float64
}

// pv is an independent restatement of the pseudo-Voigt used to build
// synthetic scans (area-normalised Lorentzian and Gaussian with common
// FWHM, mixed by eta; common practice).
func pv(x float64, p truePeak) float64 {
	u := (x - p.center) / p.fwhm
	l := 2 / (math.Pi * p.fwhm) / (1 + 4*u*u)
	g := 2 / p.fwhm * math.Sqrt(math.Ln2/math.Pi) * math.Exp(-4*math.Ln2*u*u)
	return p.area * (p.eta*l + (1-p.eta)*g)
}

// synthScan returns a scan from x0 by step for n points of the expected
// intensity bg(x) + Σ peaks (with Kα2 components of ratio 0.5 when
// doublet holds λ1, λ2), with Poisson noise from the seed (no noise when
// seed is 0).
func synthScan(seed uint64, x0, step float64, n int, bg func(float64) float64, ps []truePeak, doublet *radiation.Radiation) (scanfile.Scan, []float64) {
	src := rand.NewPCG(seed, 0x6d656c74)
	s := scanfile.Scan{TwoThetaDeg: make([]float64, n), Counts: make([]float64, n)}
	expect := make([]float64, n)
	for i := range s.TwoThetaDeg {
		x := x0 + step*float64(i)
		s.TwoThetaDeg[i] = x
		e := bg(x)
		for _, p := range ps {
			e += pv(x, p)
			if doublet != nil {
				// sin θ₂ = (λ₂/λ₁) sin θ₁ (Bragg's law)
				s2 := doublet.Kalpha2Angstrom / doublet.Kalpha1Angstrom * math.Sin(p.center/2*math.Pi/180)
				q := p
				q.center = 2 * math.Asin(s2) * 180 / math.Pi
				q.area *= 0.5 // I(Kα2)/I(Kα1), common practice
				e += pv(x, q)
			}
		}
		expect[i] = e
		if seed == 0 {
			s.Counts[i] = e
		} else {
			s.Counts[i] = distuv.Poisson{Lambda: e, Src: src}.Rand()
		}
	}
	return s, expect
}

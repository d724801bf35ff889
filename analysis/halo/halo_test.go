package halo_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"meltbook/analysis/halo"
)

// Cu Kα1 in Å: Hölzer et al., Phys. Rev. A 56, 4554 (1997).
const cuKa1 = 1.5405929

// scan builds 2θ from 15° to 90° in steps of 0.02° with a background
// falling from 350 to about 90 counts, a Gaussian hump (centre, FWHM in
// degrees, height in counts; none when height is 0), narrow Gaussian peaks
// at the given angles (0.12° FWHM, 2000 counts) and Poisson-like noise.
func scan(centre, fwhm, height float64, peaks []float64, seed uint64) (tt, y []float64) {
	rng := rand.New(rand.NewPCG(seed, 3))
	s := fwhm / (2 * math.Sqrt(2*math.Ln2))
	ps := 0.12 / (2 * math.Sqrt(2*math.Ln2))
	for i := 0; i <= 3750; i++ {
		x := 15 + 0.02*float64(i)
		v := 90 + 260*math.Exp(-(x-15)/12)
		if height > 0 {
			v += height * math.Exp(-(x-centre)*(x-centre)/(2*s*s))
		}
		for _, p := range peaks {
			v += 2000 * math.Exp(-(x-p)*(x-p)/(2*ps*ps))
		}
		tt = append(tt, x)
		y = append(y, math.Max(0, math.Round(v+math.Sqrt(v)*rng.NormFloat64())))
	}
	return tt, y
}

func TestFind(t *testing.T) {
	// A metallic-glass halo at Q = 2.75 Å⁻¹: 2θ = 2 asin(Qλ/4π) = 39.43°
	// for Cu Kα1 (worked by hand).
	centre := 2 * math.Asin(2.75*cuKa1/(4*math.Pi)) * 180 / math.Pi
	tt, y := scan(centre, 6.5, 600, nil, 1)
	h, ok := halo.Find(tt, y, cuKa1)
	if !ok {
		t.Fatalf("no halo found in a 600-count hump: %+v", h)
	}
	// Block means of 0.5° shift the centre by at most a quarter block and
	// the interpolated width by a fraction of a block.
	if math.Abs(h.CentreDeg-centre) > 0.3 || math.Abs(h.FWHMDeg-6.5) > 0.4 {
		t.Errorf("centre %.2f°, FWHM %.2f°; want %.2f° and 6.5° within 0.3° and 0.4°", h.CentreDeg, h.FWHMDeg, centre)
	}
	if math.Abs(h.QPerA-2.75) > 0.02 {
		t.Errorf("Q = %.3f Å⁻¹; want 2.75 within 0.02", h.QPerA)
	}
	// The baseline under the hump is the falling background, within a
	// tenth of the hump: 90 + 260·exp(−(39.4−15)/12) ≈ 124 counts.
	if math.Abs(h.HeightCounts-600) > 60 {
		t.Errorf("height %.0f; want 600 within 60", h.HeightCounts)
	}
}

func TestFindRefuses(t *testing.T) {
	cases := []struct {
		name                 string
		centre, fwhm, height float64
		peaks                []float64
	}{
		{"background only", 0, 0, 0, nil},
		{"sharp peaks only", 0, 0, 0, []float64{28.4, 47.3, 56.1}},
		{"a hump too faint", 40, 6, 8, nil},
		{"a hump too narrow: a broadened peak", 40, 1.2, 600, nil},
		{"a hump running off the end", 92, 8, 600, nil},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			tt, y := scan(c.centre, c.fwhm, c.height, c.peaks, 2)
			if h, ok := halo.Find(tt, y, cuKa1); ok {
				t.Errorf("found a halo: %+v", h)
			}
		})
	}
	if _, ok := halo.Find([]float64{20, 21, 22}, []float64{1, 2, 1}, cuKa1); ok {
		t.Error("a halo in three points")
	}
}

package wholepattern_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"meltbook/analysis/crystal"
	"meltbook/analysis/wholepattern"
)

// benchReflections lists up to n reflections (h ≥ k ≥ 0, any l ≥ 0, not
// all zero) of a cell, with multiplicity 1: enough for timing, where the
// families' sizes do not matter.
func benchReflections(n int) []wholepattern.Reflection {
	var out []wholepattern.Reflection
	for s := 1; len(out) < n; s++ {
		for h := 0; h <= s; h++ {
			for k := 0; k <= h; k++ {
				l := s - h - k
				if l < 0 {
					continue
				}
				out = append(out, wholepattern.Reflection{HKL: [3]int{h, k, l}, Multiplicity: 1})
				if len(out) == n {
					return out
				}
			}
		}
	}
	return out
}

// BenchmarkRefineTwoPhases refines two tetragonal phases of 60
// reflections each against a 5000-point scan, from cells 0.3 % off.
// The scan is a sum of Gaussians (a shape the package does not fit
// exactly) on a sloping background with Poisson-like noise; no value is
// checked.
func BenchmarkRefineTwoPhases(b *testing.B) {
	rad := cuDoublet(b)
	x := make([]float64, 5000)
	for i := range x {
		x[i] = 20 + 0.02*float64(i)
	}
	cells := []crystal.Cell{{A: 6.1, C: 4.9}, {A: 5.3, C: 7.7}}
	y := make([]float64, len(x))
	rng := rand.New(rand.NewPCG(1, 2))
	for i, v := range x {
		y[i] = 200 - 0.5*(v-20)
	}
	var phases []wholepattern.Phase
	for p, c := range cells {
		refl := benchReflections(60)
		cell := crystal.Cell{A: c.A, B: c.A, C: c.C, Alpha: 90, Beta: 90, Gamma: 90}
		for r, rf := range refl {
			d := cell.DSpacing(rf.HKL[0], rf.HKL[1], rf.HKL[2])
			area := 20 + 200*float64((r*7+p*3)%11)
			for j, lam := range []float64{rad.Kalpha1Angstrom, rad.Kalpha2Angstrom} {
				s := lam / (2 * d)
				if s >= 1 {
					continue
				}
				c2t := 2 * math.Asin(s) / math.Pi * 180
				a := area
				if j == 1 {
					a *= rad.Kalpha2Ratio
				}
				fw := 0.08 + 0.04*math.Tan(c2t/2*math.Pi/180)
				sig := fw / 2.3548
				for i, v := range x {
					if u := (v - c2t) / sig; u*u < 100 {
						y[i] += a / (sig * math.Sqrt(2*math.Pi)) * math.Exp(-u*u/2)
					}
				}
			}
		}
		phases = append(phases, wholepattern.Phase{
			Name: "phase", System: crystal.Tetragonal, Cell: cell.Scaled(1.003), Reflections: refl,
		})
	}
	for i := range y {
		y[i] = math.Max(0, math.Round(y[i]+math.Sqrt(y[i])*rng.NormFloat64()))
	}
	b.ResetTimer()
	for b.Loop() {
		res, err := wholepattern.Refine(x, y, rad, phases, wholepattern.Options{})
		if err != nil {
			b.Fatal(err)
		}
		b.ReportMetric(float64(res.Cycles), "cycles")
		b.ReportMetric(res.Rwp/res.Rexp, "Rwp/Rexp")
	}
}

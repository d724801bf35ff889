package wholepattern_test

import (
	"errors"
	"math"
	"testing"

	"meltbook"
	"meltbook/analysis/crystal"
	"meltbook/analysis/wholepattern"
)

// FuzzRefine feeds arbitrary counts and start cells: Refine must either
// refuse with an invalid-input error or return finite agreement factors
// and curves as long as the scan, never panic.
func FuzzRefine(f *testing.F) {
	f.Add([]byte{10, 200, 30, 0, 5, 99, 255, 1}, 4.05, uint8(6))
	f.Add([]byte{0, 0, 0, 0}, 3.0, uint8(1))
	f.Add([]byte{255}, 0.5, uint8(20))
	rad := cuDoublet(f)
	f.Fuzz(func(t *testing.T, raw []byte, a float64, terms uint8) {
		n := 300
		x, y := make([]float64, n), make([]float64, n)
		for i := range x {
			x[i] = 30 + 0.05*float64(i)
			if len(raw) > 0 {
				y[i] = float64(raw[i%len(raw)]) * float64(1+i%7)
			}
		}
		ph := wholepattern.Phase{Name: "p", System: crystal.Cubic, Cell: crystal.Cell{A: a},
			Reflections: []wholepattern.Reflection{{HKL: [3]int{1, 1, 1}, Multiplicity: 8}, {HKL: [3]int{2, 0, 0}, Multiplicity: 6}}}
		res, err := wholepattern.Refine(x, y, rad, []wholepattern.Phase{ph}, wholepattern.Options{BackgroundTerms: int(terms % 22), MaxCycles: 20})
		if err != nil {
			var me *meltbook.Error
			if !errors.As(err, &me) || me.Kind != meltbook.Invalid {
				t.Fatalf("error %v is not an invalid-input error", err)
			}
			return
		}
		for _, v := range []float64{res.Rwp, res.Rp, res.Rexp, res.Chi2} {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("agreement factor %v not finite: %+v", v, res)
			}
		}
		if len(res.Calculated) != n {
			t.Fatalf("%d calculated points for %d", len(res.Calculated), n)
		}
	})
}

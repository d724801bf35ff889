package wholepattern_test

import (
	"fmt"
	"math"

	"meltbook/analysis/crystal"
	"meltbook/analysis/radiation"
	"meltbook/analysis/wholepattern"
)

// Example refines the cell of fcc aluminium from a start 0.3 % too large,
// against a noise-free scan built here from Gaussian Kα1 lines of a
// 4.0495 Å cell (from memory) on a flat background.
func Example() {
	rad, _ := radiation.Monochromatic(1.5405929) // Cu Kα1 (Hölzer et al. 1997)
	refl := []wholepattern.Reflection{
		{HKL: [3]int{1, 1, 1}, Multiplicity: 8}, {HKL: [3]int{2, 0, 0}, Multiplicity: 6},
		{HKL: [3]int{2, 2, 0}, Multiplicity: 12}, {HKL: [3]int{3, 1, 1}, Multiplicity: 24},
		{HKL: [3]int{2, 2, 2}, Multiplicity: 8},
	}
	truth := crystal.Cell{A: 4.0495, B: 4.0495, C: 4.0495, Alpha: 90, Beta: 90, Gamma: 90}
	var x, y []float64
	for t := 30.0; t <= 85; t += 0.02 {
		v := 100.0
		for _, r := range refl {
			c, _ := rad.TwoTheta(truth.DSpacing(r.HKL[0], r.HKL[1], r.HKL[2]))
			s := 0.1 / 2.3548 // FWHM 0.1°
			v += 50 / (s * math.Sqrt(2*math.Pi)) * math.Exp(-(t-c)*(t-c)/(2*s*s))
		}
		x, y = append(x, t), append(y, v)
	}
	res, err := wholepattern.Refine(x, y, rad, []wholepattern.Phase{
		{Name: "Al", System: crystal.Cubic, Cell: truth.Scaled(1.003), Reflections: refl},
	}, wholepattern.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("a = %.4f Å, zero shift within 0.001°: %v, Rwp below 1 %%: %v\n", res.Cells[0].Cell.A, math.Abs(res.ZeroShiftDeg) < 0.001, res.Rwp < 0.01)
	// Output: a = 4.0495 Å, zero shift within 0.001°: true, Rwp below 1 %: true
}

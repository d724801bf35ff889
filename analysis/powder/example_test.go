package powder_test

import (
	"fmt"
	"os"
	"sort"

	"meltbook/analysis/crystal"
	"meltbook/analysis/powder"
)

// The strongest lines of θ-Al2Cu at Cu Kα1 (1.5405929 Å, Hölzer et al.
// 1997), intensities relative to the strongest. The same structure's
// pattern is checked against pymatgen's XRDCalculator in
// TestAgainstPymatgen (positions to 0.001°, intensities to 6 %, there
// with U = 0) and its |F|² against gemmi in TestAgainstGemmi.
func ExamplePattern() {
	data, err := os.ReadFile("../phaselib/phases/theta-Al2Cu.cif")
	if err != nil {
		fmt.Println(err)
		return
	}
	structures, err := crystal.ReadCIF("theta-Al2Cu.cif", data)
	if err != nil {
		fmt.Println(err)
		return
	}
	lines, err := powder.Pattern(structures[0], powder.Options{WavelengthA: 1.5405929})
	if err != nil {
		fmt.Println(err)
		return
	}
	sort.SliceStable(lines, func(i, j int) bool { return lines[i].Intensity > lines[j].Intensity })
	top := lines[0].Intensity
	for _, l := range lines[:6] {
		fmt.Printf("%d%d%d  m = %2d  d = %.4f Å  2θ = %6.3f°  I = %5.1f\n",
			l.HKL[0], l.HKL[1], l.HKL[2], l.Multiplicity, l.DSpacingA, l.TwoThetaDeg, 100*l.Intensity/top)
	}
	// Output:
	// 110  m =  4  d = 4.2900 Å  2θ = 20.688°  I = 100.0
	// 112  m =  8  d = 2.1200 Å  2θ = 42.613°  I =  72.7
	// 310  m =  8  d = 1.9186 Å  2θ = 47.344°  I =  68.5
	// 202  m =  8  d = 1.9006 Å  2θ = 47.820°  I =  56.9
	// 211  m = 16  d = 2.3710 Å  2θ = 37.917°  I =  48.5
	// 200  m =  4  d = 3.0335 Å  2θ = 29.420°  I =  33.1
}

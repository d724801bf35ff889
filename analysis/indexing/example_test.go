package indexing_test

import (
	"fmt"

	"meltbook/analysis/indexing"
)

func ExampleIndex() {
	// Lines of fcc aluminium with Cu Kα1 (Al a = 4.0495 Å).
	peaks := []indexing.Peak{
		{TwoThetaDeg: 38.4725, Intensity: 100},
		{TwoThetaDeg: 44.7209, Intensity: 48},
		{TwoThetaDeg: 65.0969, Intensity: 31},
		{TwoThetaDeg: 78.2295, Intensity: 36},
		{TwoThetaDeg: 82.4363, Intensity: 11},
		{TwoThetaDeg: 99.0809, Intensity: 5},
		{TwoThetaDeg: 112.0195, Intensity: 19},
	}
	res, err := indexing.Index(peaks, 1.54056, indexing.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, ph := range res.Phases {
		fmt.Printf("%s %s a = %.4f Å, chance < 0.01: %v\n", ph.Kind, ph.Lattice, ph.AA, ph.Chance < 0.01)
		for _, p := range ph.Peaks {
			fmt.Printf("  %.2f° %v\n", p.TwoThetaDeg, *p.HKL)
		}
	}
	// Output:
	// cubic F a = 4.0495 Å, chance < 0.01: true
	//   38.47° [1 1 1]
	//   44.72° [2 0 0]
	//   65.10° [2 2 0]
	//   78.23° [3 1 1]
	//   82.44° [2 2 2]
	//   99.08° [4 0 0]
	//   112.02° [3 3 1]
}

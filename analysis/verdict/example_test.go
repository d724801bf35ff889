package verdict_test

import (
	"fmt"

	"meltbook"
	"meltbook/analysis/verdict"
)

// An F-type icosahedral phase indexed from a ribbon's pattern, with 5-fold
// axes seen in electron diffraction and e/a inside the Al-Cu-Fe window.
func ExampleWeigh() {
	v := verdict.Weigh(verdict.Input{
		Phase: &verdict.Phase{Kind: meltbook.ModelIcosahedral, Lattice: "F", ConstantA: 4.462, ConstantSUA: 0.001,
			Chance: 2e-7, IndexedPeaks: 14, SpecimenPeaks: 15, ExplainedIntensity: 0.96},
		Folds:             []int{2, 3, 5},
		EOverA:            verdict.EOverA{Status: verdict.Inside, Value: 1.751, Low: 1.70, High: 1.80, Family: "Al-Cu-(Fe,Ru,Os)", Scheme: "raynor"},
		NeighbourDistance: 0.02,
	})
	fmt.Println(v.Outcome.Kind, v.Outcome.Lattice, v.Confidence, v.Points)
	for _, r := range v.Agree {
		fmt.Printf("%s: %s\n", r.Evidence, r.Text)
	}
	// Output:
	// icosahedral F high 4
	// diffraction: 14 of 15 peaks (96% of the intensity) indexed, chance 2e-07: strong
	// symmetry: electron diffraction saw 2-, 3- and 5-fold: 5-fold axes belong to icosahedral symmetry and to no crystal
	// e/a: e/a 1.751 (raynor valences) inside the Al-Cu-(Fe,Ru,Os) window 1.70-1.80
}

package suggest_test

import (
	"fmt"
	"math"

	"meltbook/analysis/suggest"
)

func ExampleSuggest() {
	// Five Al-Cu-Fe runs: the quasicrystal formed near Al62Cu25.5Fe12.5.
	runs := []suggest.Point{
		{Code: "QR-0001", Composition: map[string]float64{"Al": 0.620, "Cu": 0.255, "Fe": 0.125}, Outcome: suggest.Quasicrystal},
		{Code: "QR-0002", Composition: map[string]float64{"Al": 0.630, "Cu": 0.250, "Fe": 0.120}, Outcome: suggest.Quasicrystal},
		{Code: "QR-0003", Composition: map[string]float64{"Al": 0.650, "Cu": 0.200, "Fe": 0.150}, Outcome: suggest.Ambiguous},
		{Code: "QR-0004", Composition: map[string]float64{"Al": 0.600, "Cu": 0.300, "Fe": 0.100}, Outcome: suggest.NoQuasicrystal},
		{Code: "QR-0005", Composition: map[string]float64{"Al": 0.700, "Cu": 0.200, "Fe": 0.100}, Outcome: suggest.NoQuasicrystal},
	}
	opts := suggest.DefaultOptions()
	opts.Count = 3
	// e/a window with the transition-metal valences commonly quoted after
	// Raynor (Fe −2.66).
	opts.Window = &suggest.Window{Low: 1.70, High: 1.80, Scheme: "raynor",
		Valences: map[string]float64{"Al": 3, "Cu": 1, "Fe": -2.66}}
	res, err := suggest.Suggest(runs, opts)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, s := range res.Suggestions {
		for _, f := range s.Composition {
			fmt.Printf("%s%g", f.Element, math.Round(1000*f.Fraction)/10)
		}
		fmt.Printf(": %s\n", s.Reason)
	}
	// Output:
	// Al62Cu24.5Fe13.5: predicted quasicrystal probability 0.78 ± 0.21 from 3 neighbouring runs within 4.0 at.%; nearest run QR-0001 at 1.0 at.%; e/a 1.746 (raynor, window 1.70–1.80)
	// Al60Cu26.5Fe13.5: predicted quasicrystal probability 0.69 ± 0.25 from 3 neighbouring runs within 4.0 at.%; nearest run QR-0001 at 1.7 at.%; e/a 1.706 (raynor, window 1.70–1.80)
	// Al64Cu22.5Fe13.5: predicted quasicrystal probability 0.68 ± 0.25 from 3 neighbouring runs within 4.0 at.%; nearest run QR-0003 at 2.2 at.%; e/a 1.786 (raynor, window 1.70–1.80)
}

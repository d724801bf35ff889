package store_test

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"time"

	"meltbook"
	"meltbook/store"
)

// A melt logged with its arc-melt and melt-spin steps, a person's outcome,
// and a search that finds it.
func Example() {
	ctx := context.Background()
	dir, _ := os.MkdirTemp("", "meltbook-example-")
	defer os.RemoveAll(dir)
	clock := func() time.Time { return time.Date(2026, 3, 2, 9, 0, 0, 0, time.UTC) }
	s, err := store.Init(ctx, filepath.Join(dir, "notebook.db"), store.Options{
		Now: clock,
		// Raynor's valences as commonly quoted (Fe −2.66); Al and Cu by group.
		Valences: map[string]map[string]float64{"raynor": {"Al": 3, "Cu": 1, "Fe": -2.66}},
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	defer s.Close()

	code, _ := s.NextMeltCode(ctx, "QX")
	m := &meltbook.Melt{Code: code, Operator: "Ines Marlow", CompositionEntered: "Al65Cu20Fe15",
		Nominal: []meltbook.ElementFraction{{Element: "Al", Fraction: 0.65}, {Element: "Cu", Fraction: 0.20},
			{Element: "Fe", Fraction: 0.15}},
		TargetMassGrams: 8}
	spin := meltbook.ProcessStep{Kind: meltbook.MeltSpin, Params: []meltbook.Param{
		{Name: "wheel-speed", SI: 30, Unit: "m/s"},
		{Name: "cooling-rate", SI: 1.2e6, Unit: "K/s"},
	}}
	if err := s.CreateMelt(ctx, "Ines Marlow", m, spin); err != nil {
		fmt.Println(err)
		return
	}
	if _, err := s.AddOutcome(ctx, "Ines Marlow", code, meltbook.Outcome{Kind: meltbook.Icosahedral, Lattice: "F"}); err != nil {
		fmt.Println(err)
		return
	}

	rows, total, err := s.FindMelts(ctx, meltbook.MeltFilter{
		Outcomes:         []meltbook.PhaseKind{meltbook.Icosahedral},
		Elements:         []string{"Al", "Cu", "Fe"},
		Scheme:           "raynor",
		EOverA:           meltbook.Between(1.7, 1.8),
		CoolingRateKPerS: meltbook.AtLeast(1e6),
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(total, "found")
	for _, r := range rows {
		fmt.Printf("%s e/a %.3f, %.1e K/s, %s %s\n", r.Code, *r.EOverA, *r.CoolingRateKPerS, r.Outcomes[0].Lattice, r.Outcomes[0].Kind)
	}
	// Output:
	// 1 found
	// QX-0001 e/a 1.751, 1.2e+06 K/s, F icosahedral
}

package store_test

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"sync"
	"testing"
	"time"

	"meltbook"
	"meltbook/store"
	"meltbook/store/storetest"
)

func TestMain(m *testing.M) {
	code := m.Run()
	if big.dir != "" {
		os.RemoveAll(big.dir)
	}
	os.Exit(code)
}

// big is the generated notebook the find and open benchmarks share; it is
// made once per run of the test binary.
var big struct {
	once sync.Once
	dir  string
	path string
	err  error
}

const bigMelts = 100_000

func bigNotebook(b *testing.B) string {
	big.once.Do(func() {
		big.dir, big.err = os.MkdirTemp("", "meltbook-bench-")
		if big.err != nil {
			return
		}
		big.path = filepath.Join(big.dir, "notebook.db")
		start := time.Now()
		big.err = generate(big.path, bigMelts)
		b.Logf("generated %d melts in %v", bigMelts, time.Since(start).Round(time.Millisecond))
	})
	if big.err != nil {
		b.Fatal(big.err)
	}
	return big.path
}

// generate writes n invented runs in one transaction (package storetest).
func generate(path string, n int) error {
	return storetest.Generate(context.Background(), path, storetest.Options{Melts: n, Store: store.Options{Valences: testValences}})
}

func BenchmarkCreateMelt(b *testing.B) {
	ctx := context.Background()
	s := MustOpen(b)
	i := 0
	for b.Loop() {
		i++
		if err := s.CreateMelt(ctx, "Ines Marlow", newMelt(fmt.Sprintf("QX-%06d", i)), arcMelt(), meltSpin(1e6)); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkFind(b *testing.B) {
	path := bigNotebook(b)
	ctx := context.Background()
	s, err := store.Open(ctx, path, store.Options{Valences: testValences})
	if err != nil {
		b.Fatal(err)
	}
	defer s.Close()
	from, before := time.Date(2023, 1, 1, 0, 0, 0, 0, time.UTC), time.Date(2025, 1, 1, 0, 0, 0, 0, time.UTC)
	own := map[string]float64{"Al": 3, "Cu": 1, "Fe": -2.66, "Si": 4, "Pd": 0, "Mn": -3.66}
	for _, c := range []struct {
		name   string
		filter meltbook.MeltFilter
	}{
		{"elements+Cu-range+e/a", meltbook.MeltFilter{Elements: []string{"Al", "Cu", "Fe"},
			Fractions: []meltbook.FractionRange{{Element: "Cu", Range: *meltbook.Between(0.10, 0.20)}},
			Scheme:    "raynor", EOverA: meltbook.Between(1.7, 1.9), Limit: 50}},
		{"icosahedral+cooling+dates", meltbook.MeltFilter{Outcomes: []meltbook.PhaseKind{meltbook.Icosahedral},
			CoolingRateKPerS: meltbook.AtLeast(1e6), CreatedFrom: &from, CreatedBefore: &before, Scheme: "raynor", Limit: 50}},
		{"own-scheme+only+operator", meltbook.MeltFilter{Elements: []string{"Al", "Cu", "Fe"}, OnlyElements: true,
			Scheme: "mine", Valences: own, EOverA: meltbook.Between(1.7, 1.9), Operator: "Kai Ostrow", Limit: 50}},
		{"e/a-sorted page 10", meltbook.MeltFilter{Scheme: "raynor", EOverA: meltbook.Between(1.7, 1.9),
			CoolingRateKPerS: meltbook.Between(1e5, 1e6), Sort: meltbook.SortEOverA, Limit: 50, Offset: 450}},
	} {
		b.Run(c.name, func(b *testing.B) {
			var total int
			for b.Loop() {
				var err error
				if _, total, err = s.FindMelts(ctx, c.filter); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(total), "matches")
		})
	}
}

func BenchmarkOpen(b *testing.B) {
	ctx := context.Background()
	small := MustOpen(b)
	for i := range 20 {
		if err := small.CreateMelt(ctx, "Ines Marlow", newMelt(fmt.Sprintf("QX-%04d", i+1)), arcMelt(), meltSpin(1e6)); err != nil {
			b.Fatal(err)
		}
	}
	for _, c := range []struct{ name, path string }{{"20-melts", small.Path()}, {"100k-melts", bigNotebook(b)}} {
		b.Run(c.name, func(b *testing.B) {
			for b.Loop() {
				s, err := store.Open(ctx, c.path, store.Options{Valences: testValences})
				if err != nil {
					b.Fatal(err)
				}
				if err := s.Close(); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

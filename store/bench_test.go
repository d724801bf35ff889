package store_test

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"sync"
	"testing"
	"time"

	"meltbook"
	"meltbook/store"
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

// generate writes n invented runs in one transaction.
func generate(path string, n int) error {
	ctx := context.Background()
	s, err := store.Init(ctx, path, store.Options{Valences: testValences})
	if err != nil {
		return err
	}
	rng := rand.New(rand.NewPCG(1, 2))
	systems := [][]string{
		{"Al", "Cu", "Fe"}, {"Al", "Cu", "Fe"}, {"Al", "Cu", "Fe", "Si"},
		{"Al", "Pd", "Mn"}, {"Al", "Ni", "Co"}, {"Al", "Mn", "Si"}, {"Al", "Cu", "Cr"}, {"Zn", "Mg", "Al"},
	}
	operators := []string{"Ines Marlow", "Jon Pell", "Kai Ostrow", "Lena Fitch", "Omar Vey", "Rui Tanaka"}
	kinds := meltbook.PhaseKinds
	t0 := time.Date(2020, 1, 1, 0, 0, 0, 0, time.UTC)
	batch := make([]store.NewMelt, n)
	for i := range batch {
		sys := systems[rng.IntN(len(systems))]
		var parts []meltbook.ElementFraction
		// Major element 0.5..0.75, the rest shared at random.
		rest := 1 - (0.5 + 0.25*rng.Float64())
		parts = append(parts, meltbook.ElementFraction{Element: sys[0], Fraction: math.Round((1-rest)*1000) / 1000})
		left := math.Round(rest*1000) / 1000
		for j, el := range sys[1:] {
			f := left
			if j < len(sys)-2 {
				f = math.Round(left*(0.3+0.5*rng.Float64())*1000) / 1000
			}
			left = math.Round((left-f)*1000) / 1000
			parts = append(parts, meltbook.ElementFraction{Element: el, Fraction: f})
		}
		m := meltbook.Melt{
			Code: fmt.Sprintf("GEN-%06d", i+1), Operator: operators[rng.IntN(len(operators))],
			CompositionEntered: "generated", Nominal: parts, TargetMassGrams: 5 + 15*rng.Float64(),
			CreatedAt: t0.Add(time.Duration(rng.Int64N(int64(6 * 365 * 24 * time.Hour)))),
		}
		nm := store.NewMelt{Melt: m, Steps: []meltbook.ProcessStep{arcMelt(), meltSpin(math.Pow(10, 4+3*rng.Float64()))}}
		if rng.Float64() < 0.6 {
			o := meltbook.Outcome{Kind: kinds[rng.IntN(len(kinds))], Order: "1/1", Name: "generated"}
			if rng.Float64() < 0.3 {
				o.Source = meltbook.ByAutomatic
			}
			nm.Outcomes = []meltbook.Outcome{o}
		}
		batch[i] = nm
	}
	if err := s.CreateMelts(ctx, "generator", batch); err != nil {
		s.Close()
		return err
	}
	return s.Close()
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

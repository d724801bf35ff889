package lattice_test

import (
	"math/rand"
	"testing"

	"meltbook/analysis/crystal"
	"meltbook/analysis/indexing/lattice"
)

func benchSearch(b *testing.B, peaks []lattice.Peak, opt lattice.Options) {
	b.Helper()
	if len(peaks) > 20 {
		peaks = peaks[:20]
	}
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := lattice.Search(peaks, opt); err != nil {
			b.Fatal(err)
		}
	}
}

// MgZn2 lines (a = 5.221, c = 8.567 Å, from memory) from the formula.
func BenchmarkSearchHexagonal20(b *testing.B) {
	benchSearch(b, measured(hexagonalLines(5.221, 8.567, 1.45, 2), 1, []int{2, 7}, []float64{3.03, 2.02}, 0.03, 0.02, 0.06, 7), lattice.Options{})
}

// fcc Al (a = 4.0494 Å, from memory): the cubic decoy as the caller meets it.
func BenchmarkSearchCubicDecoy(b *testing.B) {
	benchSearch(b, measured(cubicLines(4.0494, 'F', 0.95), 0, nil, nil, 0, 0.02, 0.05, 11), lattice.Options{})
}

func BenchmarkSearchRandom15(b *testing.B) {
	rng := rand.New(rand.NewSource(1))
	lists := make([][]lattice.Peak, 64)
	for i := range lists {
		lists[i] = randomPeaks(rng, 15)
	}
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := lattice.Search(lists[i%len(lists)], lattice.Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkSearchRandom20(b *testing.B) {
	rng := rand.New(rand.NewSource(2))
	lists := make([][]lattice.Peak, 64)
	for i := range lists {
		lists[i] = randomPeaks(rng, 20)
	}
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := lattice.Search(lists[i%len(lists)], lattice.Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// The Al6Mn-like C cell (a = 7.55, b = 6.50, c = 8.87 Å, from memory).
func BenchmarkSearchOrthorhombicC20(b *testing.B) {
	benchSearch(b, measured(orthorhombicCLines(7.55, 6.50, 8.87, 2.0, 3), 1, []int{6, 13}, []float64{3.93, 2.339}, 0.03, 0.02, 0.06, 7),
		lattice.Options{Systems: []crystal.System{crystal.Orthorhombic}, Centrings: []lattice.Centring{lattice.BaseCentred}})
}

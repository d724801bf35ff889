package indexing_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"meltbook/analysis/crystal"
	"meltbook/analysis/indexing"
)

// twentyPeaks is an i-Al-Cu-Fe-like list (F, a_R = 4.46 Å) of 20 peaks
// from the test's projection, 20–120°.
func twentyPeaks(b *testing.B) []indexing.Peak {
	fams := projectFamilies("F", 8, 0.45)
	peaks, _ := icosahedralPeaks(fams, 4.46, cuKa1, 0.45, 20, 120, 0.02)
	if len(peaks) < 20 {
		b.Fatalf("only %d peaks", len(peaks))
	}
	return peaks[:20]
}

// BenchmarkIndex20 indexes 20 peaks against every model, chance included,
// once the random-list calibration for this peak count and range is cached.
func BenchmarkIndex20(b *testing.B) {
	peaks := twentyPeaks(b)
	if _, err := indexing.Index(peaks, cuKa1, indexing.Options{}); err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := indexing.Index(peaks, cuKa1, indexing.Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkIndex20Random indexes 20 random peaks (calibration cached): the
// slow path, where every model is tried and none is significant.
func BenchmarkIndex20Random(b *testing.B) {
	peaks := randomList(7, 20, 20, 120)
	if _, err := indexing.Index(peaks, cuKa1, indexing.Options{}); err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := indexing.Index(peaks, cuKa1, indexing.Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkIndex20Cold measures a first call for a new peak count and
// range: the random-list calibration dominates. Each iteration uses a
// different range bucket so that nothing is cached.
func BenchmarkIndex20Cold(b *testing.B) {
	for i := 0; i < b.N; i++ {
		lo := 10 + float64(i%30)
		if _, err := indexing.Index(randomList(uint64(i), 20, lo, lo+60+float64(i/30)*5), cuKa1, indexing.Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// benchLibrary makes n synthetic phases of known structure for the
// benchmarks: tetragonal cells of 3–12 Å with every reflection to
// h, k, l = 6 and seeded random intensities (lines only, no structure).
func benchLibrary(n int) []indexing.KnownPhase {
	rng := rand.New(rand.NewPCG(11, 13))
	lib := make([]indexing.KnownPhase, n)
	for i := range lib {
		a, c := 3+9*rng.Float64(), 3+9*rng.Float64()
		var lines []indexing.KnownLine
		for h := 0; h <= 6; h++ {
			for k := 0; k <= h; k++ {
				for l := 0; l <= 6; l++ {
					if h+k+l == 0 {
						continue
					}
					d := 1 / math.Sqrt(float64(h*h+k*k)/(a*a)+float64(l*l)/(c*c))
					if d < 0.8 {
						continue
					}
					lines = append(lines, indexing.KnownLine{DSpacingA: d, Intensity: rng.Float64() * rng.Float64(), HKL: [3]int{h, k, l}})
				}
			}
		}
		lib[i] = indexing.KnownPhase{Name: fmt.Sprintf("phase %d", i+1), System: indexing.Tetragonal, Centring: "P",
			Cell: crystal.Cell{A: a, B: a, C: c, Alpha: 90, Beta: 90, Gamma: 90}, Lines: lines}
	}
	return lib
}

// BenchmarkIndex20Library30 indexes the 20 peaks of BenchmarkIndex20
// against every model and a 30-phase library, calibration cached.
func BenchmarkIndex20Library30(b *testing.B) {
	peaks := twentyPeaks(b)
	opts := indexing.Options{Library: benchLibrary(30)}
	if _, err := indexing.Index(peaks, cuKa1, opts); err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := indexing.Index(peaks, cuKa1, opts); err != nil {
			b.Fatal(err)
		}
	}
}

package indexing_test

import (
	"testing"

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

package peaks_test

import (
	"testing"

	"meltbook/analysis/peaks"
	"meltbook/analysis/radiation"
)

// benchPeaks: an invented 16-line pattern over 20-120° (areas in
// counts·degrees), for a 5,000-point scan at 0.02° steps.
var benchPeaks = []truePeak{
	{22.3, 60, 0.12, 0.4}, {27.9, 150, 0.12, 0.5}, {31.4, 90, 0.13, 0.5}, {36.1, 300, 0.13, 0.5},
	{38.7, 45, 0.14, 0.6}, {42.2, 500, 0.14, 0.4}, {42.55, 200, 0.14, 0.4}, {48.8, 120, 0.15, 0.5},
	{55.0, 80, 0.16, 0.5}, {61.7, 180, 0.17, 0.5}, {68.4, 60, 0.18, 0.6}, {73.9, 140, 0.19, 0.5},
	{82.6, 70, 0.21, 0.6}, {91.2, 100, 0.23, 0.5}, {103.5, 65, 0.26, 0.6}, {114.8, 90, 0.3, 0.6},
}

func benchmarkFind(b *testing.B, rad radiation.Radiation) {
	var doublet *radiation.Radiation
	if rad.HasKalpha2() {
		doublet = &rad
	}
	s, _ := synthScan(42, 20, 0.02, 5000, func(x float64) float64 { return 220 - 0.6*(x-20) }, benchPeaks, doublet)
	res, err := peaks.Find(s, rad, peaks.Options{})
	if err != nil || len(res.Peaks) != len(benchPeaks) {
		b.Fatalf("%v: %d peaks of %d (%v)", err, len(res.Peaks), len(benchPeaks), res.Dropped)
	}
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := peaks.Find(s, rad, peaks.Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkFind runs the whole chain on a 5,000-point Cu scan holding the
// Kα1/Kα2 doublet (the slower case: stripping and doublet fits).
func BenchmarkFind(b *testing.B) {
	cu, _ := radiation.FromAnode("Cu", radiation.Kalpha2Present)
	benchmarkFind(b, cu)
}

// BenchmarkFindMonochromated runs it on the same pattern without Kα2.
func BenchmarkFindMonochromated(b *testing.B) {
	mono, _ := radiation.FromAnode("Cu", radiation.Kalpha2Absent)
	benchmarkFind(b, mono)
}

func BenchmarkSNIP(b *testing.B) {
	s, _ := synthScan(42, 20, 0.02, 5000, func(x float64) float64 { return 220 }, benchPeaks, nil)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		peaks.SNIP(s.Counts, 50, true)
	}
}

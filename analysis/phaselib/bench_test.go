package phaselib_test

import (
	"fmt"
	"testing"

	"meltbook/analysis/indexing"
	"meltbook/analysis/phaselib"
)

// library30 is the built-in library made up to 30 phases by copies whose
// cells are scaled by 3 %, 6 %, … (beyond the ±2 % a phase may vary), as a
// user's library of that size would be.
func library30(b *testing.B) []indexing.KnownPhase {
	lib, err := phaselib.Builtin()
	if err != nil {
		b.Fatal(err)
	}
	base, err := phaselib.KnownPhases(lib.Phases(), cuKalpha1)
	if err != nil {
		b.Fatal(err)
	}
	out := append([]indexing.KnownPhase(nil), base...)
	for i := 0; len(out) < 30; i++ {
		k := base[i%len(base)]
		f := 1 + 0.03*float64(1+i/len(base))
		k.Name = fmt.Sprintf("%s×%.2f", k.Name, f)
		k.Cell = k.Cell.Scaled(f)
		lines := make([]indexing.KnownLine, len(k.Lines))
		for j, l := range k.Lines {
			l.DSpacingA *= f
			lines[j] = l
		}
		k.Lines = lines
		out = append(out, k)
	}
	return out
}

// peaks20 are θ-Al2Cu's 14 strongest lines (pymatgen's pattern, see
// searchmatch_test.go, rounded) and six lines of fcc Al (a = 4.0494 Å).
var peaks20 = []indexing.Peak{
	{TwoThetaDeg: 20.690, Intensity: 100}, {TwoThetaDeg: 29.409, Intensity: 33.9}, {TwoThetaDeg: 37.898, Intensity: 51.7},
	{TwoThetaDeg: 38.47, Intensity: 60}, {TwoThetaDeg: 42.082, Intensity: 34.1}, {TwoThetaDeg: 42.618, Intensity: 78.6},
	{TwoThetaDeg: 44.72, Intensity: 28}, {TwoThetaDeg: 47.360, Intensity: 75.7}, {TwoThetaDeg: 47.838, Intensity: 62.9},
	{TwoThetaDeg: 57.157, Intensity: 15.5}, {TwoThetaDeg: 61.422, Intensity: 10.3}, {TwoThetaDeg: 65.09, Intensity: 16},
	{TwoThetaDeg: 69.211, Intensity: 16.3}, {TwoThetaDeg: 73.483, Intensity: 21.8}, {TwoThetaDeg: 77.293, Intensity: 25.2},
	{TwoThetaDeg: 78.23, Intensity: 17}, {TwoThetaDeg: 82.44, Intensity: 5}, {TwoThetaDeg: 92.147, Intensity: 12.4},
	{TwoThetaDeg: 96.931, Intensity: 19.1}, {TwoThetaDeg: 99.08, Intensity: 3},
}

// BenchmarkIndex20Library30 indexes 20 peaks against every model and a
// 30-phase library, warm (the chance calibrations made by the first call
// are kept for the process, as the notebook keeps them between calls).
func BenchmarkIndex20Library30(b *testing.B) {
	lib := library30(b)
	opt := indexing.Options{Library: lib}
	if _, err := indexing.Index(peaks20, cuKalpha1, opt); err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := indexing.Index(peaks20, cuKalpha1, opt); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkKnownPhasesCold converts the built-in library for the indexer
// at a new wavelength each time (no cache), as the first call of a process
// does.
func BenchmarkKnownPhasesCold(b *testing.B) {
	lib, err := phaselib.Builtin()
	if err != nil {
		b.Fatal(err)
	}
	for i := 0; i < b.N; i++ {
		if _, err := phaselib.KnownPhases(lib.Phases(), 1.5+float64(i)*1e-9); err != nil {
			b.Fatal(err)
		}
	}
}

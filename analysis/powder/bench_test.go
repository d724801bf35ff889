package powder_test

import (
	"math/rand/v2"
	"testing"

	"meltbook/analysis/crystal"
	"meltbook/analysis/powder"
)

// BenchmarkPatternThetaAl2Cu: θ-Al2Cu (I4/mcm, 12 atoms in the cell) to
// 2θ = 120° at Cu Kα1.
func BenchmarkPatternThetaAl2Cu(b *testing.B) {
	s := readStructure(b, "../phaselib/phases/theta-Al2Cu.cif")
	opt := powder.Options{WavelengthA: CuKalpha1A}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := powder.Pattern(s, opt); err != nil {
			b.Fatal(err)
		}
	}
}

// largeCell is an invented 100-atom cell: 50 sites of Al, Cu and Fe in
// general positions of P-1 (a worst case: only Friedel pairs merge, so
// every reflection is a family of its own), a = 9.8, b = 10.4, c = 11.2 Å.
func largeCell(tb testing.TB) crystal.Structure {
	g, err := crystal.FindSpaceGroup("P -1")
	if err != nil {
		tb.Fatal(err)
	}
	r := rand.New(rand.NewPCG(1, 2))
	elements := []string{"Al", "Al", "Al", "Cu", "Fe"}
	s := crystal.Structure{
		Name:  "invented P-1",
		Cell:  crystal.Cell{A: 9.8, B: 10.4, C: 11.2, Alpha: 88, Beta: 95, Gamma: 101},
		Group: g,
	}
	for i := 0; i < 50; i++ {
		s.Sites = append(s.Sites, crystal.Site{
			Label:     "X" + string(rune('A'+i/26)) + string(rune('a'+i%26)),
			Element:   elements[i%len(elements)],
			Fract:     [3]float64{r.Float64(), r.Float64(), r.Float64()},
			Occupancy: 1,
			UisoA2:    0.008 + 0.002*float64(i%3),
		})
	}
	return s
}

// BenchmarkPatternLargeCell: the 100-atom P-1 cell to 2θ = 120° at Cu Kα1.
func BenchmarkPatternLargeCell(b *testing.B) {
	s := largeCell(b)
	if n := len(s.Atoms()); n != 100 {
		b.Fatalf("%d atoms, want 100", n)
	}
	opt := powder.Options{WavelengthA: CuKalpha1A}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := powder.Pattern(s, opt); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkPatternAl6Mn: Al6Mn (Cmcm, 28 atoms) to 2θ = 120° at Cu Kα1.
func BenchmarkPatternAl6Mn(b *testing.B) {
	s := readStructure(b, "../phaselib/phases/Al6Mn.cif")
	opt := powder.Options{WavelengthA: CuKalpha1A}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := powder.Pattern(s, opt); err != nil {
			b.Fatal(err)
		}
	}
}

// approximantCell is an invented cubic cell the size of a 1/1
// approximant (a = 12.68 Å, space group Pm-3): four Al, Mn or Si sites in
// general positions (24 atoms each), one at the origin and one on
// (x, 0, 0), 103 atoms in all. Coordinates are random; only the size and
// symmetry matter for the benchmark.
func approximantCell(tb testing.TB) crystal.Structure {
	g, err := crystal.FindSpaceGroup("P m -3")
	if err != nil {
		tb.Fatal(err)
	}
	r := rand.New(rand.NewPCG(3, 4))
	s := crystal.Structure{
		Name:  "invented Pm-3",
		Cell:  crystal.Cell{A: 12.68, B: 12.68, C: 12.68, Alpha: 90, Beta: 90, Gamma: 90},
		Group: g,
		Sites: []crystal.Site{
			{Label: "Mn1", Element: "Mn", Fract: [3]float64{0, 0, 0}, Occupancy: 1, UisoA2: 0.006},
			{Label: "Si1", Element: "Si", Fract: [3]float64{0.31, 0, 0}, Occupancy: 1, UisoA2: 0.01},
		},
	}
	for i, el := range []string{"Al", "Al", "Al", "Mn"} {
		s.Sites = append(s.Sites, crystal.Site{
			Label:     el + string(rune('2'+i)),
			Element:   el,
			Fract:     [3]float64{r.Float64(), r.Float64(), r.Float64()},
			Occupancy: 1,
			UisoA2:    0.01,
		})
	}
	return s
}

// BenchmarkPatternApproximant: the 103-atom Pm-3 cell to 2θ = 120° at Cu
// Kα1, the size of the phases the library holds at most.
func BenchmarkPatternApproximant(b *testing.B) {
	s := approximantCell(b)
	if n := len(s.Atoms()); n != 103 {
		b.Fatalf("%d atoms, want 103", n)
	}
	opt := powder.Options{WavelengthA: CuKalpha1A}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := powder.Pattern(s, opt); err != nil {
			b.Fatal(err)
		}
	}
}

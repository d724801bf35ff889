package lattice_test

import (
	"math"
	"testing"

	"meltbook/analysis/crystal"
	"meltbook/analysis/indexing/lattice"
)

func firstOf(sols []lattice.Solution, sys crystal.System, cen lattice.Centring) (lattice.Solution, int) {
	for i, s := range sols {
		if s.System == sys && s.Centring == cen {
			return s, i
		}
	}
	return lattice.Solution{}, -1
}

func TestSearchRecoversCells(t *testing.T) {
	const zero, jitter, tol = 0.03, 0.02, 0.06 // °2θ
	cases := []struct {
		name    string
		lines   func(t *testing.T) []refLine
		remove  []int
		impure  []float64 // Å
		opt     lattice.Options
		sys     crystal.System
		cen     lattice.Centring
		a, b, c float64 // Å
	}{
		{
			// hcp Mg, a = 3.2094 Å, c = 5.2108 Å (from memory; close to
			// the ICDD card values), Mg on 2c of P6₃/mmc; pattern by pymatgen.
			name: "Mg", sys: crystal.Hexagonal, cen: lattice.Primitive, a: 3.2094, b: 3.2094, c: 5.2108,
			lines: func(t *testing.T) []refLine {
				return pymatgenLines(t, structureSpec{Kind: "hexagonal", Group: "P6_3/mmc", A: 3.2094, C: 5.2108,
					Species: []string{"Mg"}, Coords: [][]float64{{1.0 / 3, 2.0 / 3, 0.25}}})
			},
			remove: []int{4, 9}, impure: []float64{3.52, 1.93},
		},
		{
			// θ-Al2Cu, I4/mcm, a = 6.067 Å, c = 4.877 Å, Cu on 4a (0, 0, 1/4),
			// Al on 8h (x, x + 1/2, 0) with x = 0.1581 (from memory); pattern
			// by pymatgen.
			name: "Al2Cu", sys: crystal.Tetragonal, cen: lattice.BodyCentred, a: 6.067, b: 6.067, c: 4.877,
			lines: func(t *testing.T) []refLine {
				return pymatgenLines(t, structureSpec{Kind: "tetragonal", Group: "I4/mcm", A: 6.067, C: 4.877,
					Species: []string{"Cu", "Al"}, Coords: [][]float64{{0, 0, 0.25}, {0.1581, 0.6581, 0}}})
			},
			remove: []int{5, 11}, impure: []float64{2.338, 1.655},
		},
		{
			// hcp Zn, a = 2.6649 Å, c = 4.9468 Å (from memory), lines from
			// the hexagonal d-spacing formula.
			name: "Zn", sys: crystal.Hexagonal, cen: lattice.Primitive, a: 2.6649, b: 2.6649, c: 4.9468,
			lines:  func(*testing.T) []refLine { return hexagonalLines(2.6649, 4.9468, 0.95, 1) },
			remove: []int{3, 8}, impure: []float64{2.81, 1.62},
		},
		{
			// MgZn2 Laves phase, a = 5.221 Å, c = 8.567 Å (from memory),
			// lines from the hexagonal d-spacing formula.
			name: "MgZn2", sys: crystal.Hexagonal, cen: lattice.Primitive, a: 5.221, b: 5.221, c: 8.567,
			lines:  func(*testing.T) []refLine { return hexagonalLines(5.221, 8.567, 1.45, 2) },
			remove: []int{2, 7, 12}, impure: []float64{3.03, 2.02},
		},
		{
			// An Al6Mn-like C-centred orthorhombic cell, a = 7.55, b = 6.50,
			// c = 8.87 Å (from memory), lines from the orthorhombic formula.
			name: "Al6Mn-like", sys: crystal.Orthorhombic, cen: lattice.BaseCentred, a: 6.50, b: 7.55, c: 8.87,
			lines:  func(*testing.T) []refLine { return orthorhombicCLines(7.55, 6.50, 8.87, 2.0, 3) },
			remove: []int{6, 13}, impure: []float64{3.93, 2.339},
			opt: lattice.Options{Systems: []crystal.System{crystal.Orthorhombic}, Centrings: []lattice.Centring{lattice.BaseCentred}},
		},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			peaks := measured(tc.lines(t), 1, tc.remove, tc.impure, zero, jitter, tol, 7)
			if len(peaks) > 20 {
				peaks = peaks[:20]
			}
			sols, err := lattice.Search(peaks, tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			if len(sols) == 0 {
				t.Fatalf("no solution for %d peaks", len(peaks))
			}
			s := sols[0]
			if s.System != tc.sys || s.Centring != tc.cen {
				for i, x := range sols {
					t.Logf("%d %s %c %s M20 %.1f indexed %d/%d", i, x.System, x.Centring, x.Cell.String(x.System), x.M20, x.Indexed, len(peaks))
				}
				t.Fatalf("best is %s %c, want %s %c", s.System, s.Centring, tc.sys, tc.cen)
			}
			// 0.1 % on each constant: the brief's target.
			for _, e := range []struct {
				name      string
				got, want float64
			}{{"a", s.Cell.A, tc.a}, {"b", s.Cell.B, tc.b}, {"c", s.Cell.C, tc.c}} {
				if math.Abs(e.got/e.want-1) > 1e-3 {
					t.Errorf("%s = %.5f Å, want %.5f Å within 0.1 %%", e.name, e.got, e.want)
				}
			}
			if s.Indexed < len(peaks)-2 {
				t.Errorf("indexed %d of %d peaks, want all but the two impurities", s.Indexed, len(peaks))
			}
			t.Logf("%s %c %s ±(%.1e, %.1e) M20 %.1f N20 %d indexed %d/%d unobserved %d",
				s.System, s.Centring, s.Cell.String(s.System), s.CellUncertainty.A, s.CellUncertainty.C,
				s.M20, s.N20, s.Indexed, len(peaks), len(s.Unobserved))
		})
	}
}

package lattice_test

import (
	"encoding/json"
	"math"
	"testing"

	"meltbook/analysis/crystal"
	"meltbook/analysis/indexing/lattice"
	"meltbook/analysis/internal/pyref"
)

// absentScript asks gemmi which reflections of a box are systematically
// absent in each space group named on standard input.
const absentScript = `
import sys, json, gemmi
out = {}
for name in json.load(sys.stdin):
    ops = gemmi.SpaceGroup(name).operations()
    out[name] = [[h, k, l] for h in range(-5, 6) for k in range(-5, 6) for l in range(-5, 6)
                 if (h, k, l) != (0, 0, 0) and ops.is_systematically_absent([h, k, l])]
json.dump(out, sys.stdout)
`

func TestAllowedMatchesGemmi(t *testing.T) {
	// Space groups whose only reflection conditions are those of the
	// centring (International Tables Vol. A).
	groups := map[string]lattice.Centring{
		"P 4": lattice.Primitive, "I 4": lattice.BodyCentred, "C 2 2 2": lattice.BaseCentred,
		"F 2 2 2": lattice.FaceCentred, "I 2 2 2": lattice.BodyCentred, "R 3:H": lattice.Rhombohedral,
	}
	var names []string
	for n := range groups {
		names = append(names, n)
	}
	in, _ := json.Marshal(names)
	var absent map[string][][3]int
	if err := json.Unmarshal(pyref.Run(t, []string{"gemmi"}, absentScript, in), &absent); err != nil {
		t.Fatal(err)
	}
	for name, cen := range groups {
		gone := map[[3]int]bool{}
		for _, h := range absent[name] {
			gone[h] = true
		}
		for h := -5; h <= 5; h++ {
			for k := -5; k <= 5; k++ {
				for l := -5; l <= 5; l++ {
					if h == 0 && k == 0 && l == 0 {
						continue
					}
					if got, want := lattice.Allowed(h, k, l, cen), !gone[[3]int{h, k, l}]; got != want {
						t.Errorf("%s: Allowed(%d %d %d) = %v, gemmi says %v", name, h, k, l, got, want)
					}
				}
			}
		}
	}
}

func TestLinesMultiplicities(t *testing.T) {
	type want struct {
		hkl [3]int
		d   float64 // Å
		m   int
	}
	cases := []struct {
		name  string
		sys   crystal.System
		cen   lattice.Centring
		cell  crystal.Cell
		lines []want
	}{
		{
			// hcp Mg: d from 1/d² = 4(h²+hk+k²)/(3a²) + l²/c² worked by hand
			// (a = 3.2094, c = 5.2108 Å); multiplicities of 6/mmm: hk0 6,
			// 00l 2, h0l 12 (common practice). The P lattice keeps 001, which
			// P6₃/mmc would extinguish.
			name: "hexagonal P", sys: crystal.Hexagonal, cen: lattice.Primitive,
			cell: crystal.Cell{A: 3.2094, C: 5.2108},
			lines: []want{{[3]int{1, 0, 0}, 2.7794, 6}, {[3]int{0, 0, 1}, 5.2108, 2}, {[3]int{1, 0, 1}, 2.4522, 12},
				{[3]int{1, 1, 0}, 1.6047, 6}, {[3]int{1, 1, 2}, 1.3663, 12}},
		},
		{
			// θ-Al2Cu cell, I: d = 1/√((h²+k²)/a² + l²/c²) by hand (a = 6.067,
			// c = 4.877 Å; 211: 5/36.808 + 1/23.785 = 0.17788 Å⁻², d = 2.3710);
			// 4/mmm multiplicities hh0 4, h00 4, hkl 16, 00l 2, h0l 8
			// (common practice).
			name: "tetragonal I", sys: crystal.Tetragonal, cen: lattice.BodyCentred,
			cell: crystal.Cell{A: 6.067, C: 4.877},
			lines: []want{{[3]int{1, 1, 0}, 4.2900, 4}, {[3]int{2, 0, 0}, 3.0335, 4}, {[3]int{2, 1, 1}, 2.3710, 16},
				{[3]int{0, 0, 2}, 2.4385, 2}, {[3]int{1, 0, 1}, 3.8010, 8}},
		},
		{
			// Rhombohedral in hexagonal axes: −h+k+l = 3n keeps 101 (with
			// its mirror 011 absent, so 6 of 12 members) and 003 (2), drops
			// 001 (International Tables Vol. A); d by hand for a = 5, c = 12 Å
			// (101: 4/75 + 1/144 = 0.060278 Å⁻², d = 4.0731 Å).
			name: "hexagonal R", sys: crystal.Hexagonal, cen: lattice.Rhombohedral,
			cell:  crystal.Cell{A: 5, C: 12},
			lines: []want{{[3]int{1, 0, 1}, 4.0731, 6}, {[3]int{0, 0, 3}, 4.0000, 2}, {[3]int{1, 1, 0}, 2.5, 6}},
		},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			lines, err := lattice.Lines(tc.sys, tc.cen, tc.cell, 0.8)
			if err != nil {
				t.Fatal(err)
			}
			for _, w := range tc.lines {
				found := false
				for _, ln := range lines {
					h := ln.HKL
					if h == w.hkl || tc.sys == crystal.Hexagonal && h == [3]int{w.hkl[1], w.hkl[0], w.hkl[2]} {
						found = true
						if math.Abs(1/ln.InverseD-w.d) > 5e-4 || ln.Multiplicity != w.m {
							t.Errorf("%v: d = %.4f Å, multiplicity %d; want %.4f Å, %d", w.hkl, 1/ln.InverseD, ln.Multiplicity, w.d, w.m)
						}
					}
				}
				if !found {
					t.Errorf("%v missing", w.hkl)
				}
			}
			for _, ln := range lines {
				if !lattice.Allowed(ln.HKL[0], ln.HKL[1], ln.HKL[2], tc.cen) {
					t.Errorf("%v listed but not allowed", ln.HKL)
				}
				if tc.cen == lattice.Rhombohedral && ln.HKL == [3]int{0, 0, 1} {
					t.Errorf("001 listed for R")
				}
			}
		})
	}
}

func TestLinesRejects(t *testing.T) {
	if _, err := lattice.Lines(crystal.Hexagonal, lattice.BodyCentred, crystal.Cell{A: 3, C: 5}, 1); err == nil {
		t.Error("hexagonal I accepted")
	}
	if _, err := lattice.Lines(crystal.Tetragonal, lattice.Primitive, crystal.Cell{A: 0, C: 5}, 1); err == nil {
		t.Error("zero edge accepted")
	}
}

package cubic_test

import (
	"encoding/json"
	"fmt"
	"testing"

	"meltbook/analysis/indexing/cubic"
	"meltbook/analysis/internal/pyref"
)

// absentScript asks gemmi which reflections of a box are systematically
// absent in each space group named on standard input.
const absentScript = `
import sys, json, gemmi
groups = json.load(sys.stdin)
out = {}
for name in groups:
    ops = gemmi.SpaceGroup(name).operations()
    out[name] = [[h, k, l] for h in range(-6, 7) for k in range(-6, 7) for l in range(-6, 7)
                 if (h, k, l) != (0, 0, 0) and ops.is_systematically_absent([h, k, l])]
json.dump(out, sys.stdout)
`

func TestCentringMatchesGemmi(t *testing.T) {
	groups := []string{"P m -3 m", "I m -3 m", "F m -3 m", "F d -3 m"}
	in, _ := json.Marshal(groups)
	out := pyref.Run(t, []string{"gemmi"}, absentScript, in)
	var absent map[string][][3]int
	if err := json.Unmarshal(out, &absent); err != nil {
		t.Fatalf("gemmi output: %v", err)
	}
	isAbsent := func(group string, h, k, l int) bool {
		for _, r := range absent[group] {
			if r == [3]int{h, k, l} {
				return true
			}
		}
		return false
	}
	// The centred groups with no glides or screws have exactly the lattice
	// centring conditions (gemmi's reflection conditions).
	lat := map[string]cubic.Lattice{"P m -3 m": cubic.Primitive, "I m -3 m": cubic.BodyCentred, "F m -3 m": cubic.FaceCentred}
	forbiddenByDiamond := 0
	for h := -6; h <= 6; h++ {
		for k := -6; k <= 6; k++ {
			for l := -6; l <= 6; l++ {
				if h == 0 && k == 0 && l == 0 {
					continue
				}
				for g, lt := range lat {
					if got, want := cubic.Allowed(h, k, l, lt), !isAbsent(g, h, k, l); got != want {
						t.Errorf("%s: %d%d%d allowed = %v, gemmi says %v", g, h, k, l, got, want)
					}
				}
				// Fd-3m: every reflection the diamond glide allows, the F
				// lattice allows too, so Si indexes as F.
				if !isAbsent("F d -3 m", h, k, l) && !cubic.Allowed(h, k, l, cubic.FaceCentred) {
					t.Errorf("F d -3 m allows %d%d%d but the F lattice does not", h, k, l)
				}
				if isAbsent("F d -3 m", h, k, l) && cubic.Allowed(h, k, l, cubic.FaceCentred) {
					forbiddenByDiamond++
				}
			}
		}
	}
	if forbiddenByDiamond == 0 {
		t.Error("gemmi reports no diamond-glide extinctions beyond F: the cross-check saw no data")
	}
}

func TestLineMultiplicities(t *testing.T) {
	// Multiplicities of cubic powder lines, m-3m Laue class (common
	// practice; e.g. International Tables Vol. A form multiplicities):
	// {100} 6, {110} 12, {111} 8, {200} 6, {210} 24, {211} 24, and S = 9
	// holding {300} 6 + {221} 24.
	want := map[cubic.Lattice]map[int]int{
		cubic.Primitive:   {1: 6, 2: 12, 3: 8, 4: 6, 5: 24, 6: 24, 9: 30},
		cubic.BodyCentred: {2: 12, 4: 6, 6: 24, 8: 12},
		cubic.FaceCentred: {3: 8, 4: 6, 8: 12, 11: 24, 12: 8},
	}
	for lat, m := range want {
		got := map[int]int{}
		for _, ln := range cubic.Lines(lat, 12) {
			got[ln.S] = ln.Multiplicity
		}
		for s, w := range m {
			if got[s] != w {
				t.Errorf("%s S=%d: multiplicity %d, want %d", lat, s, got[s], w)
			}
		}
		// S = 7 is no sum of three squares (Legendre's three-square theorem).
		if _, ok := got[7]; ok {
			t.Errorf("%s lists S = 7", lat)
		}
	}
}

func ExampleLines() {
	for _, ln := range cubic.Lines(cubic.FaceCentred, 12) {
		fmt.Println(ln.S, ln.HKL, ln.Multiplicity)
	}
	// Output:
	// 3 [1 1 1] 8
	// 4 [2 0 0] 6
	// 8 [2 2 0] 12
	// 11 [3 1 1] 24
	// 12 [2 2 2] 8
}

package plot_test

import (
	"math"
	"testing"

	"meltbook"
	"meltbook/web/plot"
)

// valences: Al 3, Cu 1, Si 4 (group valences, common practice); Fe −2.66
// (Raynor as commonly quoted, from memory).
var valences = map[string]float64{"Al": 3, "Cu": 1, "Fe": -2.66, "Si": 4}

func TestElectronsPerAtom(t *testing.T) {
	// Al63Cu25Fe12: 3·0.63 + 1·0.25 − 2.66·0.12 = 1.89 + 0.25 − 0.3192 = 1.8208.
	got, err := plot.ElectronsPerAtom(comp("Al", .63, "Cu", .25, "Fe", .12), valences)
	if err != nil || math.Abs(got-1.8208) > 1e-12 {
		t.Errorf("e/a(Al63Cu25Fe12) = %v, %v; want 1.8208", got, err)
	}
	if _, err := plot.ElectronsPerAtom(comp("Al", .7, "Pd", .3), valences); err == nil {
		t.Error("an element with no valence was accepted")
	}
}

func TestGroupedCornerValences(t *testing.T) {
	const tol = 1e-9
	tri := triangle(t, "Al", "Cu", "Fe+Si")

	// Equal shares: v_(Fe+Si) = (−2.66 + 4)/2 = 0.67.
	eq := tri.GroupShares(plot.EqualShares, nil)
	v, err := eq.CornerValences(valences)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(v[0]-3) > tol || math.Abs(v[1]-1) > tol || math.Abs(v[2]-0.67) > tol {
		t.Errorf("equal shares: corner valences %v, want [3 1 0.67]", v)
	}
	// The 1.75 line then meets edge Al-(Fe+Si) where
	//   3x + 0.67(1 − x) = 1.75 ⇒ 2.33x = 1.08 ⇒ x_Al = 0.4635193.
	line := plot.SampleField(30, plot.ElectronField(v)).Isolines(1.75)
	if len(line) != 1 {
		t.Fatalf("%d polylines, want 1", len(line))
	}
	found := false
	for _, p := range []plot.Ternary{line[0][0], line[0][len(line[0])-1]} {
		if math.Abs(p[1]) < tol {
			found = true
			if math.Abs(p[0]-1.08/2.33) > tol {
				t.Errorf("crosses Al-(Fe+Si) at x_Al = %.9f, want %.9f", p[0], 1.08/2.33)
			}
		}
	}
	if !found {
		t.Error("the 1.75 line does not reach the Al-(Fe+Si) edge")
	}

	// Pooled shares over Al60Cu25Fe10Si5 and Al62Cu25Fe9Si4:
	//   Fe 0.10 + 0.09 = 0.19, Si 0.05 + 0.04 = 0.09, group total 0.28
	//   w_Fe = 0.19/0.28 = 0.6785714, w_Si = 0.09/0.28 = 0.3214286
	//   v = 0.6785714·(−2.66) + 0.3214286·4 = −1.805 + 1.2857143 = −0.5192857
	samples := [][]meltbook.ElementFraction{
		comp("Al", .60, "Cu", .25, "Fe", .10, "Si", .05),
		comp("Al", .62, "Cu", .25, "Fe", .09, "Si", .04),
	}
	pooled := tri.GroupShares(plot.PooledShares, samples)
	if pooled.Pooled != 2 {
		t.Errorf("pooled over %d samples, want 2", pooled.Pooled)
	}
	v, err = pooled.CornerValences(valences)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(v[2]-(-0.5192857142857)) > tol {
		t.Errorf("pooled (Fe+Si) valence %.9f, want −0.519285714", v[2])
	}
	if got, want := pooled.Describe(), "(Fe+Si) = Fe 0.68 + Si 0.32"; got != want {
		t.Errorf("Describe = %q, want %q", got, want)
	}

	// No sample holds the group: pooled falls back to equal shares.
	none := tri.GroupShares(plot.PooledShares, [][]meltbook.ElementFraction{comp("Al", .7, "Cu", .3)})
	if got, want := none.Describe(), "(Fe+Si) = Fe 0.50 + Si 0.50"; got != want {
		t.Errorf("fallback Describe = %q, want %q", got, want)
	}
	if _, err := tri.GroupShares(plot.EqualShares, nil).CornerValences(map[string]float64{"Al": 3, "Cu": 1, "Fe": -2.66}); err == nil {
		t.Error("a corner element without valence was accepted")
	}
}

package peaks_test

import (
	"math"
	"testing"

	"meltbook/analysis/peaks"
	"meltbook/analysis/radiation"
)

func TestSNIPHandWorked(t *testing.T) {
	// Clipping without the LLS operator, worked by hand for y = 1 2 10 4 3
	// and half-window 2 (window shrinking at the ends, end points kept):
	//   p = 1: y₁ = min(2, (1+10)/2) = 2; y₂ = min(10, (2+4)/2) = 3;
	//          y₃ = min(4, (10+3)/2) = 4             → 1 2 3 4 3
	//   p = 2: y₁ (window 1) = min(2, (1+3)/2) = 2; y₂ = min(3, (1+3)/2) = 2;
	//          y₃ (window 1) = min(4, (3+3)/2) = 3   → 1 2 2 3 3
	got := peaks.SNIP([]float64{1, 2, 10, 4, 3}, 2, false)
	want := []float64{1, 2, 2, 3, 3}
	for i := range want {
		if got[i] != want[i] {
			t.Fatalf("SNIP = %v, want %v", got, want)
		}
	}
}

func TestSNIPLLSIsInvertible(t *testing.T) {
	// With no clipping (half-window 0) the LLS operator and its inverse
	// must give the data back: (exp(exp(v)−1)−1)² − 1 inverts
	// ln(ln(√(y+1)+1)+1) (Ryan et al. 1988).
	y := []float64{0, 1, 7.5, 120, 4e5}
	got := peaks.SNIP(y, 0, true)
	for i := range y {
		if math.Abs(got[i]-y[i]) > 1e-9*math.Max(1, y[i]) {
			t.Errorf("LLS round trip [%d] = %v, want %v", i, got[i], y[i])
		}
	}
}

func TestSNIPRecoversBackground(t *testing.T) {
	// Noise-free scan built here: curved background plus narrow peaks; the
	// truth is the background put in. SNIP with a window wider than the
	// peaks must follow it within 2% away from and under the peaks.
	bg := func(x float64) float64 { return 300 + 400*math.Exp(-(x-20)/15) }
	ps := []truePeak{{30, 150, 0.2, 0.5}, {45, 400, 0.15, 0.3}, {45.6, 100, 0.15, 0.3}, {70, 80, 0.3, 0.7}}
	s, _ := synthScan(0, 20, 0.02, 3001, bg, ps, nil)
	got := peaks.SNIP(s.Counts, 50, true)
	for i, x := range s.TwoThetaDeg {
		if i < 50 || i >= len(got)-50 {
			continue // the shrinking window cannot clip at the very ends
		}
		if rel := math.Abs(got[i]-bg(x)) / bg(x); rel > 0.02 {
			t.Fatalf("background at %.2f° = %.1f, true %.1f (%.1f%% off)", x, got[i], bg(x), 100*rel)
		}
	}
}

func TestStripKalpha2RecoversKalpha1(t *testing.T) {
	// Noise-free Cu doublets built here from Kα1-only profiles (Kα2 at its
	// Bragg angle for λ = 1.5444274 Å, ratio 0.5; Hölzer et al. 1997
	// wavelengths). Stripping must leave the Kα1 profile: within 1% of the
	// Kα1 peak height everywhere, the interpolation between 0.005° steps
	// being the only error.
	cu, _ := radiation.FromAnode("Cu", radiation.Kalpha2Present)
	ps := []truePeak{{40, 20, 0.08, 0.5}, {80, 20, 0.1, 0.5}, {130, 20, 0.2, 0.5}}
	zero := func(float64) float64 { return 0 }
	doublet, _ := synthScan(0, 30, 0.005, 22001, zero, ps, &cu)
	single, _ := synthScan(0, 30, 0.005, 22001, zero, ps, nil)
	got := peaks.StripKalpha2(doublet.TwoThetaDeg, doublet.Counts, cu.Kalpha1Angstrom, cu.Kalpha2Angstrom, 0.5)
	for _, p := range ps {
		h := pv(p.center, p)
		worst := 0.0
		for i, x := range doublet.TwoThetaDeg {
			if math.Abs(x-p.center) > 2 {
				continue
			}
			worst = math.Max(worst, math.Abs(got[i]-single.Counts[i]))
		}
		if worst > 0.01*h {
			t.Errorf("peak at %v°: stripped profile off by %.3g (%.2f%% of height %.1f)", p.center, worst, 100*worst/h, h)
		}
	}
}

func TestStripKalpha2SubStep(t *testing.T) {
	// Below 2θ ≈ 15° the Cu Kα2 shift (2 tan θ Δλ/λ) is smaller than a
	// 0.02° step; the implicit interpolation must still remove it: a flat
	// doublet level of 1.5 (1 + 0.5) strips to 1.
	x := make([]float64, 300)
	y := make([]float64, 300)
	for i := range x {
		x[i] = 5 + 0.02*float64(i)
		y[i] = 1.5
	}
	y[0] = 1 // the first point has nothing before it to strip
	got := peaks.StripKalpha2(x, y, 1.5405929, 1.5444274, 0.5)
	for i := 1; i < len(got); i++ {
		if math.Abs(got[i]-1) > 1e-9 {
			t.Fatalf("stripped[%d] at %.2f° = %v, want 1", i, x[i], got[i])
		}
	}
}

package plot_test

import (
	"math"
	"slices"
	"testing"

	"meltbook/web/plot"
)

func TestNiceTicksHandWorked(t *testing.T) {
	// Heckbert (Graphics Gems, 1990): range = nice(hi−lo, up),
	// step = nice(range/(want−1), nearest), ends rounded outward.
	for _, tc := range []struct {
		lo, hi float64
		want   int
		ticks  []float64
		step   float64
	}{
		// range nice(0.28) = 0.5; step nice(0.125) = 0.1; 1.6 … 2.0.
		{1.63, 1.91, 5, []float64{1.6, 1.7, 1.8, 1.9, 2.0}, 0.1},
		// range 100; step nice(20) = 20.
		{0, 100, 6, []float64{0, 20, 40, 60, 80, 100}, 20},
		// range nice(5.66) = 10; step nice(2.5) = 2; ⌊−1.33⌋·2 = −4 … ⌈1.5⌉·2 = 4.
		{-2.66, 3, 5, []float64{-4, -2, 0, 2, 4}, 2},
		// range nice(60) = 100; step nice(100/7 = 14.3) = 10; 20 … 80.
		{20, 80, 8, []float64{20, 30, 40, 50, 60, 70, 80}, 10},
	} {
		ticks, step := plot.NiceTicks(tc.lo, tc.hi, tc.want)
		if !slices.Equal(ticks, tc.ticks) || math.Abs(step-tc.step) > 1e-12 {
			t.Errorf("NiceTicks(%g, %g, %d) = %v step %g; want %v step %g", tc.lo, tc.hi, tc.want, ticks, step, tc.ticks, tc.step)
		}
	}
}

func TestLevelsStayInsideTheRange(t *testing.T) {
	// Over Al-Cu-Fe (3, 1, −2.66): NiceTicks(−2.66, 3, 8) has step
	// nice(10/7) = 1, so the levels strictly inside are −2 … 2.
	levels, step := plot.Levels(-2.66, 3, 6)
	if want := []float64{-2, -1, 0, 1, 2}; !slices.Equal(levels, want) || step != 1 {
		t.Errorf("Levels = %v step %g, want %v step 1", levels, step, want)
	}
	if got := plot.Decimals(0.05); got != 2 {
		t.Errorf("Decimals(0.05) = %d, want 2", got)
	}
	if got := plot.Decimals(20); got != 0 {
		t.Errorf("Decimals(20) = %d, want 0", got)
	}
}

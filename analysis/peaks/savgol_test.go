package peaks_test

import (
	"encoding/json"
	"fmt"
	"math"
	"testing"

	"meltbook/analysis/internal/pyref"
	"meltbook/analysis/peaks"
)

func TestSavitzkyGolayTable(t *testing.T) {
	// Convolution integers and normalising factors from the tables of
	// A. Savitzky and M. J. E. Golay, Anal. Chem. 36, 1627 (1964):
	// smoothing by quadratic/cubic (5, 7, 9 points) and quartic/quintic
	// (7 points) polynomials, and the first derivative by a quadratic
	// (5 points).
	cases := []struct {
		half, order, deriv int
		ints               []float64
		norm               float64
	}{
		{2, 2, 0, []float64{-3, 12, 17, 12, -3}, 35},
		{3, 2, 0, []float64{-2, 3, 6, 7, 6, 3, -2}, 21},
		{4, 2, 0, []float64{-21, 14, 39, 54, 59, 54, 39, 14, -21}, 231},
		{3, 4, 0, []float64{5, -30, 75, 131, 75, -30, 5}, 231},
		{2, 2, 1, []float64{-2, -1, 0, 1, 2}, 10},
		// A cubic smooths exactly as a quadratic over a symmetric window
		// (same table column in Savitzky & Golay 1964).
		{2, 3, 0, []float64{-3, 12, 17, 12, -3}, 35},
	}
	const tol = 1e-12
	for _, c := range cases {
		sg, err := peaks.NewSavitzkyGolay(c.half, c.order)
		if err != nil {
			t.Fatal(err)
		}
		got := sg.Coefficients(c.deriv)
		for i, v := range c.ints {
			if math.Abs(got[i]-v/c.norm) > tol {
				t.Errorf("window %d order %d deriv %d: c[%d] = %.15f, want %g/%g", 2*c.half+1, c.order, c.deriv, i, got[i], v, c.norm)
			}
		}
	}
}

func TestSavitzkyGolayVarianceFactor(t *testing.T) {
	// Σc² of the 5-point quadratic: (9+144+289+144+9)/35² = 595/1225 = 17/35
	// (hand computation from the table above).
	sg, _ := peaks.NewSavitzkyGolay(2, 2)
	if got := sg.VarianceFactor(); math.Abs(got-17.0/35) > 1e-12 {
		t.Errorf("VarianceFactor = %v, want 17/35", got)
	}
}

func TestSavitzkyGolayErrors(t *testing.T) {
	for _, c := range []struct{ half, order int }{{0, 0}, {2, 5}, {2, -1}} {
		if _, err := peaks.NewSavitzkyGolay(c.half, c.order); err == nil {
			t.Errorf("NewSavitzkyGolay(%d, %d) gave no error", c.half, c.order)
		}
	}
	sg, _ := peaks.NewSavitzkyGolay(3, 2)
	if _, err := sg.Smooth(make([]float64, 6)); err == nil {
		t.Error("Smooth of 6 points with a 7-point window gave no error")
	}
}

// TestSavitzkyGolayScipy compares the weights with scipy.signal.savgol_coeffs
// and the smoothing, ends included, with scipy.signal.savgol_filter in its
// "interp" mode (polynomial fitted to the end windows).
func TestSavitzkyGolayScipy(t *testing.T) {
	type combo struct{ Half, Order, Deriv int }
	var combos []combo
	for half := 1; half <= 7; half++ {
		for order := 0; order <= min(2*half, 6); order++ {
			for deriv := 0; deriv <= min(order, 2); deriv++ {
				combos = append(combos, combo{half, order, deriv})
			}
		}
	}
	y := make([]float64, 60)
	for i := range y {
		y[i] = 100 + 40*math.Sin(float64(i)/4) + float64((i*37)%11)
	}
	in, _ := json.Marshal(map[string]any{"combos": combos, "y": y})
	script := `
import json, sys
import numpy as np
from scipy.signal import savgol_coeffs, savgol_filter
d = json.load(sys.stdin)
out = {"coeffs": [], "smooth": []}
for c in d["combos"]:
    w = 2 * c["Half"] + 1
    out["coeffs"].append(list(savgol_coeffs(w, c["Order"], deriv=c["Deriv"], use="dot")))
y = np.array(d["y"])
for half in range(1, 8):
    for order in range(0, min(2 * half, 6) + 1):
        out["smooth"].append(list(savgol_filter(y, 2 * half + 1, order, mode="interp")))
json.dump(out, sys.stdout)
`
	raw := pyref.Run(t, []string{"scipy.signal", "numpy"}, script, in)
	var ref struct{ Coeffs, Smooth [][]float64 }
	if err := json.Unmarshal(raw, &ref); err != nil {
		t.Fatal(err)
	}
	const tol = 1e-9
	for k, c := range combos {
		sg, err := peaks.NewSavitzkyGolay(c.Half, c.Order)
		if err != nil {
			t.Fatal(err)
		}
		got := sg.Coefficients(c.Deriv)
		for i := range got {
			if math.Abs(got[i]-ref.Coeffs[k][i]) > tol {
				t.Errorf("%+v: c[%d] = %.12g, scipy %.12g", c, i, got[i], ref.Coeffs[k][i])
				break
			}
		}
	}
	k := 0
	for half := 1; half <= 7; half++ {
		for order := 0; order <= min(2*half, 6); order++ {
			sg, _ := peaks.NewSavitzkyGolay(half, order)
			got, err := sg.Smooth(y)
			if err != nil {
				t.Fatal(err)
			}
			for i := range got {
				if math.Abs(got[i]-ref.Smooth[k][i]) > 1e-7 {
					t.Errorf("smooth half %d order %d: [%d] = %.10g, scipy %.10g", half, order, i, got[i], ref.Smooth[k][i])
					break
				}
			}
			k++
		}
	}
}

func ExampleNewSavitzkyGolay() {
	sg, err := peaks.NewSavitzkyGolay(2, 2)
	if err != nil {
		panic(err)
	}
	for _, c := range sg.Coefficients(0) {
		fmt.Printf("%.0f ", c*35)
	}
	fmt.Println("(÷35)")
	// Output: -3 12 17 12 -3 (÷35)
}

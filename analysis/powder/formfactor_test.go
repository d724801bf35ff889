package powder_test

import (
	"encoding/json"
	"errors"
	"math"
	"testing"

	"meltbook"
	"meltbook/analysis/internal/pyref"
	"meltbook/analysis/powder"
)

// TestScatteringFactorForwardIsAtomicNumber: for a neutral atom f0(0)
// counts its electrons, f0(0) = Z (common practice; the IT92 fits meet it
// within 0.1 e). Atomic numbers from memory (periodic table).
func TestScatteringFactorForwardIsAtomicNumber(t *testing.T) {
	for _, c := range []struct {
		el string
		z  float64
	}{
		{"H", 1}, {"C", 6}, {"O", 8}, {"Mg", 12}, {"Al", 13}, {"Si", 14},
		{"Mn", 25}, {"Fe", 26}, {"Co", 27}, {"Ni", 28}, {"Cu", 29}, {"Zn", 30},
		{"Pd", 46}, {"Ag", 47}, {"La", 57}, {"W", 74}, {"Au", 79}, {"Pb", 82}, {"U", 92},
	} {
		f, err := powder.ScatteringFactor(c.el, 0)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(f-c.z) > 0.1 { // common practice: f0(0) = Z within 0.1 e
			t.Errorf("f0(%s, 0) = %.4f, want %g ± 0.1", c.el, f, c.z)
		}
	}
}

// TestScatteringFactorFallsWithAngle: f0 falls monotonically with s for
// neutral atoms (common practice).
func TestScatteringFactorFallsWithAngle(t *testing.T) {
	for _, el := range []string{"H", "Al", "Cu", "Pd", "U"} {
		prev := math.Inf(1)
		for s := 0.0; s <= 2; s += 0.05 {
			f, err := powder.ScatteringFactor(el, s)
			if err != nil {
				t.Fatal(err)
			}
			if f > prev+1e-9 {
				t.Errorf("f0(%s) rises from %.4f to %.4f at s = %.2f Å⁻¹", el, prev, f, s)
			}
			prev = f
		}
	}
}

// TestScatteringFactorAgainstReferences evaluates every element H to U at
// s = 0 … 2 Å⁻¹ against two reference libraries:
//   - gemmi's IT92 coefficients evaluated by gemmi (IT92Coef.calculate_sf):
//     the table this package embeds, so agreement to 1e-9 e shows the
//     transcription and the formula;
//   - periodictable.cromermann, which carries the five-Gaussian fits of
//     Waasmaier & Kirfel, Acta Cryst. A51, 416 (1995), to the same
//     International Tables values: an independent fit, agreeing within
//     0.15 e over 0 ≤ s ≤ 2 Å⁻¹ and within 0.1 e over the Cu Kα range
//     s ≤ 0.65 Å⁻¹ (two fits of one tabulation; measured largest
//     differences are logged). Hydrogen is left out of this comparison:
//     the IT92 entry is the bonded hydrogen of Stewart, Davidson & Simpson
//     (J. Chem. Phys. 42, 3175 (1965)), the Waasmaier–Kirfel one the free
//     atom (from memory of the tables' notes); the difference, 0.09 e
//     at most when this test was written, is logged.
func TestScatteringFactorAgainstReferences(t *testing.T) {
	const script = `
import json, sys
import numpy as np
import gemmi
from periodictable import cromermann
out = []
for z in range(1, 93):
    el = gemmi.Element(z)
    for s in np.linspace(0, 2, 41):
        g = float(el.it92.calculate_sf(np.array([s * s]))[0])
        p = float(cromermann.fxrayatstol(el.name, s))
        out.append({'el': el.name, 's': float(s), 'gemmi': g, 'waaskirf': p})
json.dump(out, sys.stdout)
`
	out := pyref.Run(t, []string{"gemmi", "periodictable", "numpy"}, script, nil)
	var got []struct {
		El       string  `json:"el"`
		S        float64 `json:"s"`
		Gemmi    float64 `json:"gemmi"`
		WaasKirf float64 `json:"waaskirf"`
	}
	if err := json.Unmarshal(out, &got); err != nil {
		t.Fatal(err)
	}
	if len(got) != 92*41 {
		t.Fatalf("%d reference values, want %d", len(got), 92*41)
	}
	worstLow, worstAll, worstH := 0.0, 0.0, 0.0
	for _, r := range got {
		f, err := powder.ScatteringFactor(r.El, r.S)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(f-r.Gemmi) > 1e-9 { // same table, gemmi's own evaluation
			t.Errorf("f0(%s, %.2f) = %.9f, gemmi %.9f", r.El, r.S, f, r.Gemmi)
		}
		d := math.Abs(f - r.WaasKirf)
		if r.El == "H" {
			worstH = math.Max(worstH, d)
			continue
		}
		worstAll = math.Max(worstAll, d)
		tol := 0.15 // e, 0 ≤ s ≤ 2 Å⁻¹: two fits to the same tabulation
		if r.S <= 0.65 {
			tol = 0.1 // e, Cu Kα range
			worstLow = math.Max(worstLow, d)
		}
		if d > tol {
			t.Errorf("f0(%s, %.2f) = %.4f, Waasmaier–Kirfel fit %.4f (tolerance %g e)", r.El, r.S, f, r.WaasKirf, tol)
		}
	}
	t.Logf("largest difference from the Waasmaier–Kirfel fits: %.3f e for s ≤ 0.65 Å⁻¹, %.3f e for s ≤ 2 Å⁻¹; hydrogen (bonded against free atom) %.3f e", worstLow, worstAll, worstH)
}

func TestScatteringFactorErrors(t *testing.T) {
	for _, c := range []struct {
		el string
		s  float64
	}{
		{"Xx", 0.1},         // no such element
		{"Np", 0.1},         // Z = 93, beyond U
		{"", 0.1},           // empty symbol
		{"Al", -0.1},        // negative s
		{"Al", 2.5},         // beyond the fit
		{"Al", math.NaN()},  // not a number
		{"Al", math.Inf(1)}, // not finite
	} {
		_, err := powder.ScatteringFactor(c.el, c.s)
		var me *meltbook.Error
		if !errors.As(err, &me) || me.Kind != meltbook.Invalid {
			t.Errorf("ScatteringFactor(%q, %g) = %v, want an invalid-input error", c.el, c.s, err)
		}
	}
	// Symbols in any case are one element (common practice in CIF type symbols).
	a, err1 := powder.ScatteringFactor("AL", 0.3)
	b, err2 := powder.ScatteringFactor("Al", 0.3)
	if err1 != nil || err2 != nil || a != b {
		t.Errorf("AL and Al differ: %v %v %v %v", a, b, err1, err2)
	}
}

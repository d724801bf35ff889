package element_test

import (
	"math"
	"testing"

	"meltbook/analysis/element"
)

// TestStandardAtomicWeights checks the weights of elements used in
// quasicrystal and approximant work against the CIAAW 2021 table
// (T. Prohaska et al., Pure Appl. Chem. 94, 573 (2022); ciaaw.org "Standard
// Atomic Weights 2021"). A single value must lie within its stated
// uncertainty; an interval value must lie inside the interval.
func TestStandardAtomicWeights(t *testing.T) {
	tests := []struct {
		symbol string
		value  float64 // standard atomic weight
		unc    float64 // stated uncertainty; 0 for interval rows
		lo, hi float64 // interval; 0 for single-value rows
	}{
		{"Li", 0, 0, 6.938, 6.997},          // CIAAW 2021: [6.938, 6.997]
		{"Be", 9.0121831, 0.0000005, 0, 0},  // CIAAW 2021: 9.012 1831(5)
		{"B", 0, 0, 10.806, 10.821},         // CIAAW 2021: [10.806, 10.821]
		{"Mg", 0, 0, 24.304, 24.307},        // CIAAW 2021: [24.304, 24.307]
		{"Al", 26.9815384, 0.0000003, 0, 0}, // CIAAW 2021: 26.981 5384(3)
		{"Si", 0, 0, 28.084, 28.086},        // CIAAW 2021: [28.084, 28.086]
		{"Ca", 40.078, 0.004, 0, 0},         // CIAAW 2021: 40.078(4)
		{"Sc", 44.955907, 0.000004, 0, 0},   // CIAAW 2021: 44.955 907(4)
		{"Ti", 47.867, 0.001, 0, 0},         // CIAAW 2021: 47.867(1)
		{"V", 50.9415, 0.0001, 0, 0},        // CIAAW 2021: 50.9415(1)
		{"Cr", 51.9961, 0.0006, 0, 0},       // CIAAW 2021: 51.9961(6)
		{"Mn", 54.938043, 0.000002, 0, 0},   // CIAAW 2021: 54.938 043(2)
		{"Fe", 55.845, 0.002, 0, 0},         // CIAAW 2021: 55.845(2)
		{"Co", 58.933194, 0.000003, 0, 0},   // CIAAW 2021: 58.933 194(3)
		{"Ni", 58.6934, 0.0004, 0, 0},       // CIAAW 2021: 58.6934(4)
		{"Cu", 63.546, 0.003, 0, 0},         // CIAAW 2021: 63.546(3)
		{"Zn", 65.38, 0.02, 0, 0},           // CIAAW 2021: 65.38(2)
		{"Ga", 69.723, 0.001, 0, 0},         // CIAAW 2021: 69.723(1)
		{"Ge", 72.630, 0.008, 0, 0},         // CIAAW 2021: 72.630(8)
		{"Y", 88.905838, 0.000002, 0, 0},    // CIAAW 2021: 88.905 838(2)
		{"Zr", 91.224, 0.002, 0, 0},         // CIAAW 2021: 91.224(2)
		{"Nb", 92.90637, 0.00001, 0, 0},     // CIAAW 2021: 92.906 37(1)
		{"Mo", 95.95, 0.01, 0, 0},           // CIAAW 2021: 95.95(1)
		{"Ru", 101.07, 0.02, 0, 0},          // CIAAW 2021: 101.07(2)
		{"Rh", 102.90549, 0.00002, 0, 0},    // CIAAW 2021: 102.905 49(2)
		{"Pd", 106.42, 0.01, 0, 0},          // CIAAW 2021: 106.42(1)
		{"Ag", 107.8682, 0.0002, 0, 0},      // CIAAW 2021: 107.8682(2)
		{"Cd", 112.414, 0.004, 0, 0},        // CIAAW 2021: 112.414(4)
		{"In", 114.818, 0.001, 0, 0},        // CIAAW 2021: 114.818(1)
		{"Sn", 118.710, 0.007, 0, 0},        // CIAAW 2021: 118.710(7)
		{"Sb", 121.760, 0.001, 0, 0},        // CIAAW 2021: 121.760(1)
		{"La", 138.90547, 0.00007, 0, 0},    // CIAAW 2021: 138.905 47(7), from memory
		{"Ce", 140.116, 0.001, 0, 0},        // CIAAW 2021: 140.116(1), from memory
		{"Nd", 144.242, 0.003, 0, 0},        // CIAAW 2021: 144.242(3), from memory
		{"Gd", 157.25, 0.03, 0, 0},          // CIAAW 2021: 157.25(3), from memory
		{"Tb", 158.925354, 0.000007, 0, 0},  // CIAAW 2021: 158.925 354(7), from memory
		{"Dy", 162.500, 0.001, 0, 0},        // CIAAW 2021: 162.500(1), from memory
		{"Ho", 164.930329, 0.000005, 0, 0},  // CIAAW 2021: 164.930 329(5), from memory
		{"Er", 167.259, 0.003, 0, 0},        // CIAAW 2021: 167.259(3), from memory
		{"Yb", 173.045, 0.010, 0, 0},        // CIAAW 2021: 173.045(10) (revised from 173.054)
		{"Hf", 178.486, 0.006, 0, 0},        // CIAAW 2021: 178.486(6) (revised from 178.49)
		{"Ta", 180.94788, 0.00002, 0, 0},    // CIAAW 2021: 180.947 88(2), from memory
		{"W", 183.84, 0.01, 0, 0},           // CIAAW 2021: 183.84(1), from memory
		{"Re", 186.207, 0.001, 0, 0},        // CIAAW 2021: 186.207(1), from memory
		{"Os", 190.23, 0.03, 0, 0},          // CIAAW 2021: 190.23(3), from memory
		{"Ir", 192.217, 0.002, 0, 0},        // CIAAW 2021: 192.217(2) (uncertainty revised)
		{"Pt", 195.084, 0.009, 0, 0},        // CIAAW 2021: 195.084(9), from memory
		{"Au", 196.966570, 0.000004, 0, 0},  // CIAAW 2021: 196.966 570(4), from memory
		{"Pb", 0, 0, 206.14, 207.94},        // CIAAW 2021: [206.14, 207.94] (interval since 2019)
		{"Bi", 208.98040, 0.00001, 0, 0},    // CIAAW 2021: 208.980 40(1), from memory
	}
	for _, tt := range tests {
		e, ok := element.BySymbol(tt.symbol)
		if !ok {
			t.Errorf("%s: not in table", tt.symbol)
			continue
		}
		if tt.unc > 0 {
			if math.Abs(e.AtomicWeight-tt.value) > tt.unc {
				t.Errorf("%s: weight %v, want %v ± %v", tt.symbol, e.AtomicWeight, tt.value, tt.unc)
			}
			continue
		}
		if e.AtomicWeight < tt.lo || e.AtomicWeight > tt.hi {
			t.Errorf("%s: weight %v outside [%v, %v]", tt.symbol, e.AtomicWeight, tt.lo, tt.hi)
		}
	}
}

// TestAbridgedIntervalWeights checks the conventional five-figure values
// used for interval elements. Source: CIAAW abridged standard atomic
// weights (ciaaw.org), from memory.
func TestAbridgedIntervalWeights(t *testing.T) {
	want := map[string]float64{
		"H": 1.0080, "Li": 6.94, "B": 10.81, "C": 12.011, "N": 14.007, "O": 15.999,
		"Mg": 24.305, "Si": 28.085, "S": 32.06, "Cl": 35.45, "Ar": 39.95, "Br": 79.904,
		"Tl": 204.38, "Pb": 207.2,
	}
	for sym, w := range want {
		e, _ := element.BySymbol(sym)
		if e.AtomicWeight != w {
			t.Errorf("%s: weight %v, want abridged %v", sym, e.AtomicWeight, w)
		}
	}
}

// TestMassNumbers checks the elements without a standard atomic weight:
// mass number of the longest-lived isotope (NUBASE2020 half-lives, from
// memory: Tc-97 4.2 My, Pm-145 17.7 y, Po-209 ~124 y, At-210 8.1 h,
// Rn-222 3.8 d, Fr-223 22 min, Ra-226 1600 y, Ac-227 21.8 y,
// Np-237 2.1 My, Pu-244 80 My).
func TestMassNumbers(t *testing.T) {
	want := map[string]float64{"Tc": 97, "Pm": 145, "Po": 209, "At": 210, "Rn": 222,
		"Fr": 223, "Ra": 226, "Ac": 227, "Np": 237, "Pu": 244}
	for sym, a := range want {
		e, _ := element.BySymbol(sym)
		if e.AtomicWeight != a {
			t.Errorf("%s: weight %v, want mass number %v", sym, e.AtomicWeight, a)
		}
		if !e.Hazards.Has(element.Radioactive) {
			t.Errorf("%s: not marked radioactive", sym)
		}
	}
}

// TestRadioactiveSet checks that exactly the elements with no stable
// isotope (Tc, Pm, Po-Pu; common knowledge) carry Radioactive.
func TestRadioactiveSet(t *testing.T) {
	for _, e := range element.All() {
		want := e.Z == 43 || e.Z == 61 || e.Z >= 84
		if got := e.Hazards.Has(element.Radioactive); got != want {
			t.Errorf("%s: radioactive %v, want %v", e.Symbol, got, want)
		}
	}
}

// TestHazardClasses checks the hazard decisions documented beside the
// table (bench-safety judgement, common practice).
func TestHazardClasses(t *testing.T) {
	toxic := []string{"Be", "Cd", "Hg", "Pb", "Tl", "As", "Se", "Te", "Sb", "Co", "Ni", "Os"}
	burning := []string{"Li", "Na", "K", "Rb", "Cs", "Mg", "Ca", "Sr", "Ba", "Sc", "Y",
		"La", "Ce", "Pr", "Nd", "Sm", "Eu", "Gd", "Tb", "Dy", "Ho", "Er", "Tm", "Yb", "Lu",
		"Ti", "Zr", "Hf", "Th", "U", "Pu"}
	neither := []string{"Al", "Cu", "Fe", "Pd", "Mn", "Ru", "Si", "Ga", "Ag", "Au", "Cr", "Ge", "Sn", "Zn"}
	for _, sym := range toxic {
		if e, _ := element.BySymbol(sym); !e.Hazards.Has(element.Toxic) {
			t.Errorf("%s: want Toxic", sym)
		}
	}
	for _, sym := range burning {
		if e, _ := element.BySymbol(sym); !e.Hazards.Has(element.ReadilyBurning) {
			t.Errorf("%s: want ReadilyBurning", sym)
		}
	}
	for _, sym := range neither {
		if e, _ := element.BySymbol(sym); e.Hazards.Has(element.Toxic) || e.Hazards.Has(element.ReadilyBurning) {
			t.Errorf("%s: hazards %v, want none", sym, e.Hazards)
		}
	}
}

func TestHazardString(t *testing.T) {
	tests := []struct {
		h    element.Hazard
		want string
	}{
		{0, "none"},
		{element.Toxic, "toxic"},
		{element.ReadilyBurning | element.Radioactive, "readily burning, radioactive"},
		{element.Toxic | element.ReadilyBurning | element.Radioactive, "toxic, readily burning, radioactive"},
	}
	for _, tt := range tests {
		if got := tt.h.String(); got != tt.want {
			t.Errorf("%d: %q, want %q", tt.h, got, tt.want)
		}
	}
}

// TestValenceElectronConvention checks the VEC column against the stated
// convention: group number for groups 1-12, group − 10 for 13-18 (He 2),
// 3 for the lanthanides except divalent Eu and Yb, electrons outside the
// radon core for the actinides (common practice).
func TestValenceElectronConvention(t *testing.T) {
	for _, e := range element.All() {
		var want int
		switch {
		case e.Symbol == "He":
			want = 2
		case e.Z >= 57 && e.Z <= 71:
			want = 3
			if e.Symbol == "Eu" || e.Symbol == "Yb" {
				want = 2
			}
		case e.Z >= 89:
			want = e.Z - 86
		case e.Group <= 12:
			want = e.Group
		default:
			want = e.Group - 10
		}
		if e.ValenceElectrons != want {
			t.Errorf("%s: %d valence electrons, want %d", e.Symbol, e.ValenceElectrons, want)
		}
	}
}

// TestGroups checks a few IUPAC group assignments (common knowledge) and
// that f-block rows carry group 0.
func TestGroups(t *testing.T) {
	want := map[string]int{"H": 1, "Be": 2, "Sc": 3, "Y": 3, "Ti": 4, "Mn": 7, "Fe": 8, "Pd": 10,
		"Cu": 11, "Zn": 12, "Al": 13, "Si": 14, "Bi": 15, "Te": 16, "I": 17, "Rn": 18, "Ra": 2}
	for sym, g := range want {
		if e, _ := element.BySymbol(sym); e.Group != g {
			t.Errorf("%s: group %d, want %d", sym, e.Group, g)
		}
	}
	for _, e := range element.All() {
		f := (e.Z >= 57 && e.Z <= 71) || e.Z >= 89
		if f != (e.Group == 0) {
			t.Errorf("%s: group %d", e.Symbol, e.Group)
		}
	}
}

func TestLookups(t *testing.T) {
	all := element.All()
	if len(all) != element.MaxZ {
		t.Fatalf("All: %d elements, want %d", len(all), element.MaxZ)
	}
	seen := map[string]bool{}
	for i, e := range all {
		if e.Z != i+1 {
			t.Fatalf("All()[%d].Z = %d", i, e.Z)
		}
		if seen[e.Symbol] {
			t.Errorf("symbol %s twice", e.Symbol)
		}
		seen[e.Symbol] = true
		if e.AtomicWeight <= 0 || e.Name == "" {
			t.Errorf("%s: empty weight or name", e.Symbol)
		}
		byZ, ok := element.ByZ(e.Z)
		if !ok || byZ.Symbol != e.Symbol {
			t.Errorf("ByZ(%d) = %q, %v", e.Z, byZ.Symbol, ok)
		}
		bySym, ok := element.BySymbol(e.Symbol)
		if !ok || bySym.Z != e.Z {
			t.Errorf("BySymbol(%q) = %d, %v", e.Symbol, bySym.Z, ok)
		}
	}
	for _, bad := range []string{"", "CO", "co", "Xx", "Am", " Fe"} {
		if _, ok := element.BySymbol(bad); ok {
			t.Errorf("BySymbol(%q) found an element", bad)
		}
	}
	for _, z := range []int{-1, 0, 95, 118} {
		if _, ok := element.ByZ(z); ok {
			t.Errorf("ByZ(%d) found an element", z)
		}
	}
	all[0].Symbol = "changed"
	if e, _ := element.ByZ(1); e.Symbol != "H" {
		t.Error("All returned the table itself, not a copy")
	}
}

// TestRareEarthRadiiAnomaly checks the CN12 radii show the divalent
// anomaly of Eu and Yb, larger than both neighbours (the lanthanide
// contraction interrupted; common knowledge in rare-earth metallurgy).
func TestRareEarthRadiiAnomaly(t *testing.T) {
	r := func(sym string) float64 { e, _ := element.BySymbol(sym); return e.MetallicRadiusCN12 }
	if !(r("Eu") > r("Sm") && r("Eu") > r("Gd")) {
		t.Errorf("Eu radius %v not above Sm %v and Gd %v", r("Eu"), r("Sm"), r("Gd"))
	}
	if !(r("Yb") > r("Tm") && r("Yb") > r("Lu")) {
		t.Errorf("Yb radius %v not above Tm %v and Lu %v", r("Yb"), r("Tm"), r("Lu"))
	}
}

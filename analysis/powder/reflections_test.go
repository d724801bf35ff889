package powder_test

import (
	"errors"
	"math"
	"testing"

	"meltbook"
	"meltbook/analysis/crystal"
	"meltbook/analysis/powder"
)

func familyMap(t *testing.T, s crystal.Structure, dMinA float64) map[[3]int]powder.Reflection {
	t.Helper()
	refl, err := powder.Reflections(s, dMinA)
	if err != nil {
		t.Fatal(err)
	}
	m := map[[3]int]powder.Reflection{}
	for _, r := range refl {
		m[r.HKL] = r
	}
	return m
}

// TestFaceCentredCubic: fcc Al shows only reflections with h, k, l all even
// or all odd (F-centring; common practice), and the m-3m multiplicities
// are {100} 6, {110} 12, {111} 8, {210} 24, {321} 48 (common practice,
// e.g. Cullity, Elements of X-ray Diffraction, appendix of multiplicities;
// from memory).
func TestFaceCentredCubic(t *testing.T) {
	al := readStructure(t, "../phaselib/phases/Al.cif")
	fams := familyMap(t, al, 0.8)
	for hkl := range fams {
		odd := 0
		for _, v := range hkl {
			odd += ((v % 2) + 2) % 2
		}
		if odd != 0 && odd != 3 {
			t.Errorf("fcc Al has mixed-parity reflection %v", hkl)
		}
	}
	for _, want := range [][3]int{{1, 1, 1}, {2, 0, 0}, {2, 2, 0}, {3, 1, 1}, {2, 2, 2}, {4, 0, 0}, {3, 3, 1}, {4, 2, 0}} {
		if _, ok := fams[want]; !ok {
			t.Errorf("fcc Al lacks %v (all even or all odd: allowed, common practice)", want)
		}
	}
	// Multiplicities need every family, so take the primitive cubic
	// Pm-3m of β-AlCuFe (CsCl type), which has no absences.
	beta := readStructure(t, "../phaselib/phases/beta-AlCuFe.cif")
	fams = familyMap(t, beta, 0.5)
	for _, c := range []struct {
		hkl  [3]int
		mult int
	}{
		{[3]int{1, 0, 0}, 6}, {[3]int{1, 1, 0}, 12}, {[3]int{1, 1, 1}, 8},
		{[3]int{2, 1, 0}, 24}, {[3]int{2, 1, 1}, 24}, {[3]int{3, 2, 1}, 48},
	} { // m-3m multiplicities, common practice
		if got := fams[c.hkl].Multiplicity; got != c.mult {
			t.Errorf("m-3m {%d%d%d}: multiplicity %d, want %d", c.hkl[0], c.hkl[1], c.hkl[2], got, c.mult)
		}
	}
}

// TestDiamond: diamond-structure Si lacks 200 (a space-group absence of
// Fd-3m: h00 needs h = 4n) and 222 (the 8a site: all even with
// h + k + l = 4n + 2 gives F = 0), while 111, 220, 311, 400 stay (common
// practice, the textbook Si pattern; from memory).
func TestDiamond(t *testing.T) {
	si := readStructure(t, "../phaselib/phases/Si.cif")
	fams := familyMap(t, si, 1.0)
	if _, ok := fams[[3]int{2, 0, 0}]; ok {
		t.Error("Si has a 200 family; Fd-3m forbids h00 with h ≠ 4n")
	}
	lines, err := powder.Pattern(si, powder.Options{WavelengthA: CuKalpha1A})
	if err != nil {
		t.Fatal(err)
	}
	f2 := map[[3]int]float64{}
	for _, l := range lines {
		f2[l.HKL] = l.F2
	}
	if v, ok := f2[[3]int{2, 2, 2}]; !ok || v > 1e-12*f2[[3]int{1, 1, 1}] {
		t.Errorf("Si 222: |F|² = %g (present %v), want 0: the atoms of 8a cancel", v, ok)
	}
	for _, want := range [][3]int{{1, 1, 1}, {2, 2, 0}, {3, 1, 1}, {4, 0, 0}, {3, 3, 1}} {
		if f2[want] < 100 { // e²; Si f0 > 5 e at these angles, F = 4√2 f or 8 f (common practice)
			t.Errorf("Si %v: |F|² = %g, want a strong line", want, f2[want])
		}
	}
	// |F(111)| = 4√2·f(s)·exp(−B s²) for diamond (common practice: the
	// eight atoms give phases 1, i, −1, −i in pairs); f from the table.
	d := si.Cell.DSpacing(1, 1, 1)
	s := 1 / (2 * d)
	f, err := powder.ScatteringFactor("Si", s)
	if err != nil {
		t.Fatal(err)
	}
	b := 8 * math.Pi * math.Pi * si.Sites[0].UisoA2
	want := 32 * f * f * math.Exp(-2*b*s*s)
	if math.Abs(f2[[3]int{1, 1, 1}]-want) > 1e-9*want {
		t.Errorf("Si 111: |F|² = %.6f, want 32 f² e^(−2Bs²) = %.6f", f2[[3]int{1, 1, 1}], want)
	}
}

// TestHexagonalClosePacked: hcp Mg lacks 001 (00l needs l = 2n in
// P6₃/mmc; common practice) and has the 6/mmm multiplicities {100} 6,
// {002} 2, {101} 12, {110} 6, {102} 12, {112} 12 (common practice; from
// memory).
func TestHexagonalClosePacked(t *testing.T) {
	mg := readStructure(t, "../crystal/testdata/mg.cif")
	fams := familyMap(t, mg, 0.9)
	for _, absent := range [][3]int{{0, 0, 1}, {0, 0, 3}, {0, 0, 5}} {
		if _, ok := fams[absent]; ok {
			t.Errorf("hcp Mg has %v; 00l needs l even", absent)
		}
	}
	for _, c := range []struct {
		hkl  [3]int
		mult int
	}{
		{[3]int{1, 0, 0}, 6}, {[3]int{0, 0, 2}, 2}, {[3]int{1, 0, 1}, 12},
		{[3]int{1, 1, 0}, 6}, {[3]int{1, 0, 2}, 12}, {[3]int{1, 1, 2}, 12},
	} {
		r, ok := fams[c.hkl]
		if !ok {
			t.Errorf("hcp Mg lacks %v", c.hkl)
			continue
		}
		if r.Multiplicity != c.mult {
			t.Errorf("6/mmm {%d%d%d}: multiplicity %d, want %d", c.hkl[0], c.hkl[1], c.hkl[2], r.Multiplicity, c.mult)
		}
	}
	// d(100) = a·√3/2 for a hexagonal cell (common practice).
	if d := fams[[3]int{1, 0, 0}].DSpacingA; math.Abs(d-mg.Cell.A*math.Sqrt(3)/2) > 1e-12 {
		t.Errorf("hcp d(100) = %.6f Å, want a√3/2 = %.6f Å", d, mg.Cell.A*math.Sqrt(3)/2)
	}
}

// TestTriclinicFriedelOnly: with the identity alone every (hkl) pairs only
// with (−h−k−l): multiplicity 2, no absences, and the number of families
// is half the lattice points in the sphere of radius 1/dmin, counted here
// directly from the cell (hand-built check).
func TestTriclinicFriedelOnly(t *testing.T) {
	s := crystal.Structure{
		Cell:  crystal.Cell{A: 5.1, B: 6.3, C: 7.7, Alpha: 81, Beta: 97, Gamma: 104},
		Sites: []crystal.Site{{Label: "Cu1", Element: "Cu", Occupancy: 1}},
	}
	const dMin = 1.2
	refl, err := powder.Reflections(s, dMin)
	if err != nil {
		t.Fatal(err)
	}
	points := 0
	for h := -10; h <= 10; h++ {
		for k := -10; k <= 10; k++ {
			for l := -10; l <= 10; l++ {
				if (h != 0 || k != 0 || l != 0) && s.Cell.DSpacing(h, k, l) >= dMin {
					points++
				}
			}
		}
	}
	if len(refl)*2 != points {
		t.Errorf("%d families, want %d/2", len(refl), points)
	}
	for i, r := range refl {
		if r.Multiplicity != 2 {
			t.Errorf("%v: multiplicity %d, want 2", r.HKL, r.Multiplicity)
		}
		if i > 0 && r.DSpacingA > refl[i-1].DSpacingA+1e-12 {
			t.Errorf("families out of order at %v", r.HKL)
		}
	}
}

func TestReflectionErrors(t *testing.T) {
	al := readStructure(t, "../phaselib/phases/Al.cif")
	bad := al
	bad.Cell.A = -1
	skew := al
	skew.Cell = crystal.Cell{A: 4, B: 4, C: 5, Alpha: 90, Beta: 90, Gamma: 90} // tetragonal cell, cubic operations
	for _, c := range []struct {
		name  string
		s     crystal.Structure
		dMin  float64
		field string
	}{
		{"negative edge", bad, 1, "cell a"},
		{"zero d", al, 0, "minimum d-spacing"},
		{"NaN d", al, math.NaN(), "minimum d-spacing"},
		{"operations not of the cell", skew, 1, "symmetry operation"},
		{"too many reflections", al, 0.005, "minimum d-spacing"},
	} {
		_, err := powder.Reflections(c.s, c.dMin)
		var me *meltbook.Error
		if !errors.As(err, &me) || me.Kind != meltbook.Invalid || me.Field != c.field {
			t.Errorf("%s: error %v, want invalid %q", c.name, err, c.field)
		}
	}
}

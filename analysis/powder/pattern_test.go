package powder_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"meltbook"
	"meltbook/analysis/crystal"
	"meltbook/analysis/powder"
)

// TestLorentzPolarisation checks LP at hand-worked points. Without a
// monochromator at 2θ = 90°: (1 + 0)/(2·sin²45°·cos45°) = 1/(2·0.5·0.70711)
// = 1.41421. With a graphite 002 monochromator at Cu Kα (2θm = 26.57°,
// cos²2θm = 0.8000; d(002) = 3.354 Å, common practice) at 2θ = 60°:
// (1 + 0.8·0.25)/(0.25·0.86603·1.8) = 1.2/0.38971 = 3.07920. Those angles
// are hit by building cubic cells whose first line sits there.
func TestLorentzPolarisation(t *testing.T) {
	line := func(tth, mono float64) powder.Line {
		t.Helper()
		// P cubic, one atom: first line 100 at d = a; choose a for the 2θ wanted.
		a := CuKalpha1A / (2 * math.Sin(tth*math.Pi/360))
		g, err := crystal.FindSpaceGroup("P m -3 m")
		if err != nil {
			t.Fatal(err)
		}
		s := crystal.Structure{
			Cell:  crystal.Cell{A: a, B: a, C: a, Alpha: 90, Beta: 90, Gamma: 90},
			Group: g,
			Sites: []crystal.Site{{Label: "Fe1", Element: "Fe", Occupancy: 1}},
		}
		lines, err := powder.Pattern(s, powder.Options{WavelengthA: CuKalpha1A, TwoThetaMaxDeg: tth + 1, MonochromatorTwoThetaDeg: mono})
		if err != nil {
			t.Fatal(err)
		}
		if len(lines) != 1 || math.Abs(lines[0].TwoThetaDeg-tth) > 1e-9 {
			t.Fatalf("want one line at 2θ = %g°, got %+v", tth, lines)
		}
		return lines[0]
	}
	mono := 2 * math.Asin(CuKalpha1A/(2*3.354)) * 180 / math.Pi // graphite 002
	for _, c := range []struct {
		tth, mono, want float64
	}{
		{90, 0, 1.41421},    // hand-worked above
		{60, mono, 3.07920}, // hand-worked above (cos²2θm rounded to 0.8000)
	} {
		l := line(c.tth, c.mono)
		if math.Abs(l.LP-c.want) > 2e-4*c.want { // rounding of the hand calculation
			t.Errorf("2θ = %g°, 2θm = %.2f°: LP = %.5f, want %.5f", c.tth, c.mono, l.LP, c.want)
		}
		if math.Abs(l.Intensity-float64(l.Multiplicity)*l.F2*l.LP) > 1e-12*l.Intensity {
			t.Errorf("intensity %g is not m·|F|²·LP", l.Intensity)
		}
		if l.Multiplicity != 6 { // {100} in m-3m, common practice
			t.Errorf("multiplicity %d, want 6", l.Multiplicity)
		}
	}
}

// TestPatternRange: lines come in increasing 2θ up to the limit, 120° by
// default, and every reflection within the limit gets a line.
func TestPatternRange(t *testing.T) {
	s := readStructure(t, "../phaselib/phases/theta-Al2Cu.cif")
	lines, err := powder.Pattern(s, powder.Options{WavelengthA: CuKalpha1A})
	if err != nil {
		t.Fatal(err)
	}
	// d at 2θ = 120°: λ/(2 sin 60°) (Bragg's law, common practice).
	refl, err := powder.Reflections(s, CuKalpha1A/(2*math.Sin(math.Pi/3)))
	if err != nil {
		t.Fatal(err)
	}
	if len(lines) != len(refl) {
		t.Errorf("%d lines, %d reflections to 120°", len(lines), len(refl))
	}
	for i, l := range lines {
		if l.TwoThetaDeg > 120 || (i > 0 && l.TwoThetaDeg < lines[i-1].TwoThetaDeg-1e-12) {
			t.Errorf("line %v at 2θ = %g° out of order or range", l.HKL, l.TwoThetaDeg)
		}
		want := 2 * math.Asin(CuKalpha1A/(2*l.DSpacingA)) * 180 / math.Pi // Bragg's law
		if math.Abs(l.TwoThetaDeg-want) > 1e-9 {
			t.Errorf("%v: 2θ = %g°, Bragg %g°", l.HKL, l.TwoThetaDeg, want)
		}
	}
	short, err := powder.Pattern(s, powder.Options{WavelengthA: CuKalpha1A, TwoThetaMaxDeg: 40})
	if err != nil {
		t.Fatal(err)
	}
	// θ-Al2Cu lines below 40° at Cu Kα1: 110, 200, 002, 211 (a = 6.067 Å,
	// c = 4.877 Å, I4/mcm conditions hkl: h+k+l = 2n, 0kl: k, l = 2n,
	// hhl: l = 2n; hand-worked with d = 1/√((h²+k²)/a² + l²/c²)).
	var got [][3]int
	for _, l := range short {
		got = append(got, l.HKL)
	}
	want := [][3]int{{1, 1, 0}, {2, 0, 0}, {0, 0, 2}, {2, 1, 1}}
	if len(got) != len(want) {
		t.Fatalf("lines below 40°: %v, want %v", got, want)
	}
	for i := range want {
		if got[i] != want[i] {
			t.Errorf("lines below 40°: %v, want %v", got, want)
			break
		}
	}
}

// TestDisplacementLowersHighAngles: with U > 0 each |F|² falls by
// exp(−2B s²) against U = 0 for a one-element structure (definition of
// the isotropic displacement factor, common practice).
func TestDisplacementLowersHighAngles(t *testing.T) {
	al := readStructure(t, "../phaselib/phases/Al.cif")
	warm, err := powder.Pattern(al, powder.Options{WavelengthA: CuKalpha1A})
	if err != nil {
		t.Fatal(err)
	}
	cold, err := powder.Pattern(withoutDisplacement(al), powder.Options{WavelengthA: CuKalpha1A})
	if err != nil {
		t.Fatal(err)
	}
	b := 0.85 // Å², the B given in Al.cif
	for i := range warm {
		s := 1 / (2 * warm[i].DSpacingA)
		want := cold[i].F2 * math.Exp(-2*b*s*s)
		if math.Abs(warm[i].F2-want) > 1e-9*want {
			t.Errorf("%v: |F|² = %g, want %g", warm[i].HKL, warm[i].F2, want)
		}
	}
}

func TestPatternErrors(t *testing.T) {
	al := readStructure(t, "../phaselib/phases/Al.cif")
	unknown := al
	unknown.Sites = []crystal.Site{{Label: "Q1", Element: "Qq", Occupancy: 1}}
	badCell := al
	badCell.Cell.Gamma = 0
	for _, c := range []struct {
		name  string
		s     crystal.Structure
		opt   powder.Options
		field string
	}{
		{"no wavelength", al, powder.Options{}, "wavelength"},
		{"negative wavelength", al, powder.Options{WavelengthA: -1.54}, "wavelength"},
		{"NaN wavelength", al, powder.Options{WavelengthA: math.NaN()}, "wavelength"},
		{"2θ limit above 180°", al, powder.Options{WavelengthA: 1.54, TwoThetaMaxDeg: 200}, "2θ maximum"},
		{"2θ limit at 180°", al, powder.Options{WavelengthA: 1.54, TwoThetaMaxDeg: 180}, "2θ maximum"},
		{"negative 2θ limit", al, powder.Options{WavelengthA: 1.54, TwoThetaMaxDeg: -5}, "2θ maximum"},
		{"monochromator at 180°", al, powder.Options{WavelengthA: 1.54, MonochromatorTwoThetaDeg: 180}, "monochromator 2θ"},
		{"beyond the form-factor fit", al, powder.Options{WavelengthA: 0.2, TwoThetaMaxDeg: 150}, "2θ maximum"},
		{"unknown element", unknown, powder.Options{WavelengthA: 1.54}, "site Q1 element"},
		{"invalid cell", badCell, powder.Options{WavelengthA: 1.54}, "cell gamma"},
	} {
		_, err := powder.Pattern(c.s, c.opt)
		var me *meltbook.Error
		if !errors.As(err, &me) || me.Kind != meltbook.Invalid || me.Field != c.field {
			t.Errorf("%s: error %v, want invalid %q", c.name, err, c.field)
			continue
		}
		if strings.TrimSpace(me.Message) == "" {
			t.Errorf("%s: empty message", c.name)
		}
	}
}

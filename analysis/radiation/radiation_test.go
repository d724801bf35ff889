package radiation_test

import (
	"errors"
	"fmt"
	"math"
	"testing"

	"meltbook/analysis/radiation"
)

// Silicon NIST SRM 640f: a = 5.431144 Å at 22.5 °C (certificate of SRM 640f).
const siSRM640fA = 5.431144

func TestAnodeWavelengths(t *testing.T) {
	// Kα1 and Kα2 in Å. Cr, Fe, Co, Cu: Hölzer et al., Phys. Rev. A 56, 4554
	// (1997); Mo: International Tables for Crystallography Vol. C (2004),
	// Table 4.2.2.1. Transcribed here a second time on purpose.
	want := map[string][2]float64{
		"Cr": {2.2897260, 2.2936510},
		"Fe": {1.9360410, 1.9399730},
		"Co": {1.7889960, 1.7928350},
		"Cu": {1.5405929, 1.5444274},
		"Mo": {0.70931715, 0.713607},
	}
	if got := len(radiation.Anodes()); got != len(want) {
		t.Errorf("Anodes() has %d entries, want %d", got, len(want))
	}
	for sym, w := range want {
		for _, spelling := range []string{sym, " " + sym + " ", string([]byte{sym[0] | 0x20, sym[1] &^ 0x20})} {
			a, err := radiation.Lookup(spelling)
			if err != nil {
				t.Fatalf("Lookup(%q): %v", spelling, err)
			}
			if a.Symbol != sym || a.Kalpha1Angstrom != w[0] || a.Kalpha2Angstrom != w[1] {
				t.Errorf("Lookup(%q) = %+v, want %s %v", spelling, a, sym, w)
			}
		}
	}
}

func TestLookupUnknown(t *testing.T) {
	_, err := radiation.Lookup("W")
	if !errors.Is(err, radiation.ErrUnknownAnode) {
		t.Fatalf("Lookup(W) error %v, want ErrUnknownAnode", err)
	}
	if want := `unknown anode "W" (known: Co, Cr, Cu, Fe, Mo)`; err.Error() != want {
		t.Errorf("error %q, want %q", err, want)
	}
}

func TestSiliconSRM640fPositions(t *testing.T) {
	// 2θ (degrees) for Cu Kα1, λ = 1.5405929 Å, from Table 1 of the NIST
	// SRM 640f certificate (values given to 0.001°). By hand for (111):
	// d = 5.431144/√3 = 3.135672 Å; sin θ = 1.5405929/(2·3.135672) = 0.245656;
	// θ = 14.22060°, 2θ = 28.4412°.
	cases := []struct {
		h, k, l  int
		twoTheta float64
	}{
		{1, 1, 1, 28.441}, {2, 2, 0, 47.301}, {3, 1, 1, 56.120}, {4, 0, 0, 69.127},
		{3, 3, 1, 76.373}, {4, 2, 2, 88.026}, {5, 1, 1, 94.947}, {4, 4, 0, 106.702},
		{5, 3, 1, 114.085}, {6, 2, 0, 127.535}, {5, 3, 3, 136.882},
	}
	const tol = 0.0006 // table rounding to 0.001° plus float noise
	cu, err := radiation.FromAnode("Cu", radiation.Kalpha2Present)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range cases {
		d := siSRM640fA / math.Sqrt(float64(c.h*c.h+c.k*c.k+c.l*c.l))
		got, ok := radiation.DToTwoTheta(d, 1.5405929)
		if !ok || math.Abs(got-c.twoTheta) > tol {
			t.Errorf("(%d%d%d): 2θ = %.4f ok=%v, want %.3f ± %.4f", c.h, c.k, c.l, got, ok, c.twoTheta, tol)
		}
		if got2, _ := cu.TwoTheta(d); got2 != got {
			t.Errorf("Radiation.TwoTheta differs from DToTwoTheta: %v vs %v", got2, got)
		}
		back := radiation.TwoThetaToD(c.twoTheta, 1.5405929)
		// d moves by d·cotθ·Δθ for the 0.0005° table rounding.
		dtol := radiation.DSU(c.twoTheta, tol, 1.5405929)
		if math.Abs(back-d) > dtol {
			t.Errorf("(%d%d%d): d(%.3f°) = %.6f, want %.6f ± %.6f", c.h, c.k, c.l, c.twoTheta, back, d, dtol)
		}
	}
}

func TestQ(t *testing.T) {
	// Si (111), SRM 640f, Cu Kα1: Q = 2π/d = 6.2831853/3.1356725 = 2.003776 Å⁻¹
	// (hand computation).
	const d111 = 3.1356725
	const tol = 2e-6
	if q := radiation.DToQ(d111); math.Abs(q-2.003776) > tol {
		t.Errorf("DToQ = %.6f, want 2.003776", q)
	}
	if q := radiation.TwoThetaToQ(28.441198, 1.5405929); math.Abs(q-2.003776) > tol {
		t.Errorf("TwoThetaToQ = %.6f, want 2.003776", q)
	}
	if d := radiation.QToD(2.003776); math.Abs(d-d111) > 1e-5 {
		t.Errorf("QToD = %.6f, want %.6f", d, d111)
	}
	if tt, ok := radiation.QToTwoTheta(2.003776, 1.5405929); !ok || math.Abs(tt-28.4412) > 1e-4 {
		t.Errorf("QToTwoTheta = %.5f %v, want 28.4412", tt, ok)
	}
}

func TestDoubletSplitting(t *testing.T) {
	// Si (111) with Cu: the Kα2 line reflects at sin θ₂ = (1.5444274/1.5405929)·sin 14.22060°
	// = 1.0024890 × 0.2456559 = 0.2462673, θ₂ = 14.25672°, 2θ₂ = 28.5134° (hand computation).
	got, ok := radiation.DoubletTwoTheta(28.44120, 1.5405929, 1.5444274)
	if !ok || math.Abs(got-28.5134) > 2e-4 {
		t.Errorf("DoubletTwoTheta = %.5f %v, want 28.5134", got, ok)
	}
}

func TestOutOfDomain(t *testing.T) {
	if v := radiation.TwoThetaToD(0, 1.54); !math.IsNaN(v) {
		t.Errorf("TwoThetaToD(0) = %v, want NaN", v)
	}
	if v := radiation.TwoThetaToD(181, 1.54); !math.IsNaN(v) {
		t.Errorf("TwoThetaToD(181) = %v, want NaN", v)
	}
	if v := radiation.TwoThetaToD(30, -1); !math.IsNaN(v) {
		t.Errorf("TwoThetaToD(λ<0) = %v, want NaN", v)
	}
	// d = 0.7 Å cannot reflect Cu Kα1: λ/2d = 1.10 > 1.
	if _, ok := radiation.DToTwoTheta(0.7, 1.5405929); ok {
		t.Error("DToTwoTheta(0.7 Å, Cu) ok, want unreachable")
	}
	if _, ok := radiation.QToTwoTheta(9, 1.5405929); ok {
		t.Error("QToTwoTheta(9 Å⁻¹, Cu) ok, want unreachable")
	}
	if v := radiation.DToQ(0); !math.IsNaN(v) {
		t.Errorf("DToQ(0) = %v", v)
	}
}

func TestParseRadiation(t *testing.T) {
	cases := []struct {
		in        string
		anode     string
		l1, l2    float64
		state     radiation.Kalpha2State
		canonical string
	}{
		{"Cu", "Cu", 1.5405929, 1.5444274, radiation.Kalpha2Present, "Cu"},
		{" co : stripped ", "Co", 1.7889960, 1.7928350, radiation.Kalpha2Stripped, "Co:stripped"},
		{"MO:Mono", "Mo", 0.70931715, 0.713607, radiation.Kalpha2Absent, "Mo:mono"},
		{"Fe:doublet", "Fe", 1.9360410, 1.9399730, radiation.Kalpha2Present, "Fe"},
		{"0.7093", "", 0.7093, 0, radiation.Kalpha2Absent, "0.7093"},
		{"1.5406/1.5444", "", 1.5406, 1.5444, radiation.Kalpha2Present, "1.5406/1.5444"},
		{"1.5406/1.5444:stripped", "", 1.5406, 1.5444, radiation.Kalpha2Stripped, "1.5406/1.5444:stripped"},
	}
	for _, c := range cases {
		r, err := radiation.ParseRadiation(c.in)
		if err != nil {
			t.Errorf("ParseRadiation(%q): %v", c.in, err)
			continue
		}
		if r.Anode != c.anode || r.Kalpha1Angstrom != c.l1 || r.Kalpha2Angstrom != c.l2 || r.Kalpha2 != c.state {
			t.Errorf("ParseRadiation(%q) = %+v", c.in, r)
		}
		if r.Kalpha2Angstrom != 0 && r.Kalpha2Ratio != 0.5 { // common practice
			t.Errorf("ParseRadiation(%q) ratio %v, want 0.5", c.in, r.Kalpha2Ratio)
		}
		if s := r.String(); s != c.canonical {
			t.Errorf("String() = %q, want %q", s, c.canonical)
		}
	}
}

func TestParseRadiationErrors(t *testing.T) {
	cases := []struct{ in, want string }{
		{"", `radiation "": column 1: missing anode or wavelength`},
		{"W", `radiation "W": column 1: unknown anode "W" (known: Co, Cr, Cu, Fe, Mo)`},
		{"Cu:foo", `radiation "Cu:foo": column 4: unknown Kα2 state "foo" (want doublet, stripped or mono)`},
		{"1.54:stripped", `radiation "1.54:stripped": column 6: state "stripped" needs a Kα2 wavelength: give two wavelengths, λ1/λ2`},
		{"1.54/x", `radiation "1.54/x": column 6: wavelength "x" is not a number in Å`},
		{"0/1", `radiation "0/1": column 1: wavelength "0" is not a positive number in Å`},
		{"1.6/1.5", `radiation "1.6/1.5": column 1: radiation: Kα2 wavelength 1.5 Å must be a number above Kα1 (1.6 Å)`},
	}
	for _, c := range cases {
		_, err := radiation.ParseRadiation(c.in)
		var pe *radiation.ParseError
		if !errors.As(err, &pe) {
			t.Errorf("ParseRadiation(%q) error %v, want *ParseError", c.in, err)
			continue
		}
		if err.Error() != c.want {
			t.Errorf("ParseRadiation(%q)\n got  %s\n want %s", c.in, err, c.want)
		}
	}
}

func FuzzParseRadiation(f *testing.F) {
	for _, s := range []string{"Cu", "co:stripped", "1.5406/1.5444:mono", "0.7093", ":", "Cu:", "/", "1e400", "NaN"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		r, err := radiation.ParseRadiation(s)
		if err != nil {
			return
		}
		if err := r.Validate(); err != nil {
			t.Fatalf("ParseRadiation(%q) returned invalid %+v: %v", s, r, err)
		}
		back, err := radiation.ParseRadiation(r.String())
		if err != nil || back != r {
			t.Fatalf("round trip %q -> %q -> %+v, %v; want %+v", s, r.String(), back, err, r)
		}
	})
}

func ExampleParseRadiation() {
	r, err := radiation.ParseRadiation("Cu")
	if err != nil {
		panic(err)
	}
	fmt.Printf("%s Kα1 %.7f Å, Kα2 %.7f Å, in scan: %v\n", r.Anode, r.Kalpha1Angstrom, r.Kalpha2Angstrom, r.HasKalpha2())
	fmt.Printf("d at 2θ = 28.441°: %.4f Å\n", r.D(28.441))
	// Output:
	// Cu Kα1 1.5405929 Å, Kα2 1.5444274 Å, in scan: true
	// d at 2θ = 28.441°: 3.1357 Å
}

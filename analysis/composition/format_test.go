package composition_test

import (
	"testing"

	"meltbook/analysis/composition"
)

func mustParse(t testing.TB, s string) composition.Composition {
	t.Helper()
	p, err := composition.Parse(s)
	if err != nil {
		t.Fatalf("Parse(%q): %v", s, err)
	}
	return p.Atomic
}

func TestFormat(t *testing.T) {
	tests := []struct {
		in        string
		precision int
		format    string // Format
		fractions string // FormatFractions
		balance   string // FormatBalance
	}{
		// worked by hand: 63, 25, 12 at%; Al is the largest
		{"Al63Cu25Fe12", 2, "Al63Cu25Fe12", "Al0.63Cu0.25Fe0.12", "Al-25Cu-12Fe"},
		// worked by hand: Al5Cu2Fe1 is 5/8 = 62.5, 2/8 = 25, 1/8 = 12.5 at%;
		// trailing zeros are trimmed at any precision of 1 or more; as
		// fractions 0.625, 0.25 and 0.125 are exact halfway cases at one
		// decimal and round to even: 0.6, 0.2, 0.1
		{"Al5Cu2Fe1", 1, "Al62.5Cu25Fe12.5", "Al0.6Cu0.2Fe0.1", "Al-25Cu-12.5Fe"},
		{"Al5Cu2Fe1", 4, "Al62.5Cu25Fe12.5", "Al0.625Cu0.25Fe0.125", "Al-25Cu-12.5Fe"},
		// worked by hand: 2/3 = 66.67 and 1/3 = 33.33 at% at two decimals
		{"Al2Cu", 2, "Al66.67Cu33.33", "Al0.67Cu0.33", "Al-33.33Cu"},
		// worked by hand: the largest element (Cu 60) becomes the balance and
		// moves to the front; the others keep their order
		{"Zr10Cu60Al30", 0, "Zr10Cu60Al30", "Zr0Cu1Al0", "Cu-10Zr-30Al"},
		// worked by hand: a tie picks the first of the largest
		{"Ti40Zr40Ni20", 0, "Ti40Zr40Ni20", "Ti0Zr0Ni0", "Ti-40Zr-20Ni"},
		// worked by hand: one element
		{"Fe", 3, "Fe100", "Fe1", "Fe"},
	}
	for _, tt := range tests {
		c := mustParse(t, tt.in)
		if got := c.Format(tt.precision); got != tt.format {
			t.Errorf("%q Format(%d) = %q, want %q", tt.in, tt.precision, got, tt.format)
		}
		if got := c.FormatFractions(tt.precision); got != tt.fractions {
			t.Errorf("%q FormatFractions(%d) = %q, want %q", tt.in, tt.precision, got, tt.fractions)
		}
		if got := c.FormatBalance(tt.precision); got != tt.balance {
			t.Errorf("%q FormatBalance(%d) = %q, want %q", tt.in, tt.precision, got, tt.balance)
		}
	}
	var empty composition.Composition
	if empty.Format(2) != "" || empty.FormatBalance(2) != "" || empty.FormatFractions(2) != "" {
		t.Error("an empty composition should format as the empty string")
	}
}

func TestFormatWeight(t *testing.T) {
	// worked by hand with IUPAC/CIAAW 2021 weights Al 26.9815384, Cu 63.546,
	// Fe 55.845: 63·26.9815384 = 1699.837, 25·63.546 = 1588.650,
	// 12·55.845 = 670.140; sum 3958.627; 42.940, 40.131, 16.929 wt%.
	got, err := mustParse(t, "Al63Cu25Fe12").FormatWeight(2)
	if err != nil {
		t.Fatal(err)
	}
	if want := "Al42.94Cu40.13Fe16.93 wt%"; got != want {
		t.Errorf("FormatWeight(2) = %q, want %q", got, want)
	}
	if _, err := (composition.Composition{{Element: "Xx", Fraction: 1}}).FormatWeight(2); err == nil {
		t.Error("FormatWeight with an unknown symbol: no error")
	}
}

// TestFormatRoundTrip checks that every formatted form reads back to the
// same composition (a property, not a value check).
func TestFormatRoundTrip(t *testing.T) {
	for _, in := range []string{
		"Al63Cu25Fe12", "Al2Cu", "(Al0.7Pd0.2Mn0.1)99B1", "Ti41.5Zr41.5Ni17",
		"Al-0.001B", "Zn60Mg30Ho10", "Cd84.6Yb15.4",
	} {
		c := mustParse(t, in)
		w, err := c.ToWeight()
		if err != nil {
			t.Fatal(err)
		}
		for _, s := range []string{
			c.Format(-1), c.FormatFractions(-1), c.FormatBalance(-1), w.Format(-1) + " wt%", w.FormatBalance(-1) + " wt%",
		} {
			back := mustParse(t, s)
			if !composition.EqualWithin(back, c, 1e-12) {
				t.Errorf("%q formatted as %q reads back as %v", in, s, back)
			}
		}
	}
}

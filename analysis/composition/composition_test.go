package composition_test

import (
	"math"
	"strings"
	"testing"

	"meltbook/analysis/composition"
)

func TestMeanAtomicWeight(t *testing.T) {
	// worked by hand with IUPAC/CIAAW 2021 weights: 0.63·26.9815384 +
	// 0.25·63.546 + 0.12·55.845 = 16.99837 + 15.88650 + 6.70140 = 39.58627 g/mol
	got, err := mustParse(t, "Al63Cu25Fe12").MeanAtomicWeight()
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(got-39.58627) > 1e-3 {
		t.Errorf("MeanAtomicWeight = %.6f g/mol, want 39.58627", got)
	}
	if _, err := (composition.Composition{{Element: "Xx", Fraction: 1}}).MeanAtomicWeight(); err == nil {
		t.Error("unknown symbol: no error")
	}
}

func TestDistance(t *testing.T) {
	tests := []struct {
		a, b string
		want float64
	}{
		// worked by hand: 1 at% moved from Al to Cu: sqrt(0.01² + 0.01²) = 0.0141421356
		{"Al63Cu25Fe12", "Al62Cu26Fe12", 0.01 * math.Sqrt2},
		// worked by hand: order does not matter
		{"Al63Cu25Fe12", "Fe12Al63Cu25", 0},
		// worked by hand: disjoint pure elements: sqrt(1 + 1)
		{"Al", "Cu", math.Sqrt2},
		// worked by hand: an element on one side only: Al 0.5 vs 0.5, Cu 0.5 vs 0,
		// Fe 0 vs 0.5: sqrt(0 + 0.25 + 0.25) = 0.7071068
		{"Al1Cu1", "Al1Fe1", math.Sqrt(0.5)},
	}
	for _, tt := range tests {
		a, b := mustParse(t, tt.a), mustParse(t, tt.b)
		if got := composition.Distance(a, b); math.Abs(got-tt.want) > 1e-12 {
			t.Errorf("Distance(%s, %s) = %.12g, want %.12g", tt.a, tt.b, got, tt.want)
		}
		if got := composition.Distance(b, a); math.Abs(got-tt.want) > 1e-12 {
			t.Errorf("Distance(%s, %s) = %.12g, want %.12g", tt.b, tt.a, got, tt.want)
		}
	}
}

func TestEqualWithin(t *testing.T) {
	a := mustParse(t, "Al63Cu25Fe12")
	tests := []struct {
		b    string
		tol  float64
		want bool
	}{
		{"Fe12Cu25Al63", 1e-12, true},        // same, other order
		{"Al63.4Cu24.6Fe12", 0.005, true},    // 0.4 at% off, within 0.5 at%
		{"Al63.6Cu24.4Fe12", 0.005, false},   // 0.6 at% off
		{"Al63Cu25Fe11.9Si0.1", 0.002, true}, // Si only on one side, 0.1 at%
		{"Al63Cu25Fe11Si1", 0.005, false},    // Si 1 at% on one side only
	}
	for _, tt := range tests {
		b := mustParse(t, tt.b)
		if got := composition.EqualWithin(a, b, tt.tol); got != tt.want {
			t.Errorf("EqualWithin(Al63Cu25Fe12, %s, %g) = %v", tt.b, tt.tol, got)
		}
		if got := composition.EqualWithin(b, a, tt.tol); got != tt.want {
			t.Errorf("EqualWithin(%s, Al63Cu25Fe12, %g) = %v", tt.b, tt.tol, got)
		}
	}
}

func TestSorted(t *testing.T) {
	c := mustParse(t, "Cu25Fe12Al63Ni12")
	got := c.Sorted().Elements()
	want := []string{"Al", "Cu", "Fe", "Ni"} // by hand: 63 > 25 > 12 = 12, ties keep order
	if strings.Join(got, " ") != strings.Join(want, " ") {
		t.Errorf("Sorted = %v, want %v", got, want)
	}
	if c[0].Element != "Cu" {
		t.Error("Sorted changed its receiver")
	}
}

func TestValidate(t *testing.T) {
	good := mustParse(t, "Al63Cu25Fe12")
	if err := good.Validate(); err != nil {
		t.Errorf("Validate(Al63Cu25Fe12): %v", err)
	}
	bad := []struct {
		name string
		c    composition.Composition
		want string
	}{
		{"empty", nil, "no elements"},
		{"unknown", composition.Composition{{"Xx", 1}}, `"Xx" is not an element symbol`},
		{"twice", composition.Composition{{"Al", 0.5}, {"Al", 0.5}}, "Al appears twice"},
		{"negative", composition.Composition{{"Al", 1.5}, {"Cu", -0.5}}, "outside 0..1"},
		{"NaN", composition.Composition{{"Al", math.NaN()}}, "outside 0..1"},
		{"sum", composition.Composition{{"Al", 0.5}, {"Cu", 0.4}}, "sum to 0.9"},
	}
	for _, tt := range bad {
		err := tt.c.Validate()
		if err == nil || !strings.Contains(err.Error(), tt.want) {
			t.Errorf("%s: Validate = %v, want it to contain %q", tt.name, err, tt.want)
		}
	}
}

func TestNormalise(t *testing.T) {
	// worked by hand: 2 + 1 + 1 = 4 with Al merged: Al 3/4, Cu 1/4; zero Fe dropped
	c, err := composition.Normalise([]composition.Part{{"Al", 2}, {"Cu", 1}, {"Al", 1}, {"Fe", 0}})
	if err != nil {
		t.Fatal(err)
	}
	checkFractions(t, "Normalise", c, want{{"Al", 0.75}, {"Cu", 0.25}}, 1e-15)
	for _, parts := range [][]composition.Part{nil, {{"Al", 0}}, {{"Al", -1}, {"Cu", 2}}, {{"Al", math.Inf(1)}}} {
		if _, err := composition.Normalise(parts); err == nil {
			t.Errorf("Normalise(%v): no error", parts)
		}
	}
}

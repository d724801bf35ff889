package plot_test

import (
	"math"
	"slices"
	"testing"

	"meltbook"
	"meltbook/web/plot"
)

func comp(pairs ...any) []meltbook.ElementFraction {
	var out []meltbook.ElementFraction
	for i := 0; i < len(pairs); i += 2 {
		out = append(out, meltbook.ElementFraction{Element: pairs[i].(string), Fraction: pairs[i+1].(float64)})
	}
	return out
}

func corner(t *testing.T, s string) plot.Corner {
	t.Helper()
	c, err := plot.ParseCorner(s)
	if err != nil {
		t.Fatal(err)
	}
	return c
}

func triangle(t *testing.T, a, b, c string) plot.Triangle {
	t.Helper()
	tri, err := plot.NewTriangle(corner(t, a), corner(t, b), corner(t, c))
	if err != nil {
		t.Fatal(err)
	}
	return tri
}

func TestParseCorner(t *testing.T) {
	for _, tc := range []struct {
		in    string
		want  []string
		label string
	}{
		{"Al", []string{"Al"}, "Al"},
		{" Fe+Si ", []string{"Fe", "Si"}, "(Fe+Si)"},
		{"(Fe + Si)", []string{"Fe", "Si"}, "(Fe+Si)"},
		{"(Ru)", []string{"Ru"}, "Ru"},
	} {
		c, err := plot.ParseCorner(tc.in)
		if err != nil {
			t.Errorf("ParseCorner(%q): %v", tc.in, err)
			continue
		}
		if !slices.Equal(c.Elements, tc.want) || c.Label() != tc.label {
			t.Errorf("ParseCorner(%q) = %v labelled %q, want %v labelled %q", tc.in, c.Elements, c.Label(), tc.want, tc.label)
		}
	}
	for _, bad := range []string{"", "()", "fe", "Fe+Fe", "Fe+", "Al2", "AL", "Fe,Si"} {
		if _, err := plot.ParseCorner(bad); err == nil {
			t.Errorf("ParseCorner(%q) accepted a bad corner", bad)
		}
	}
}

func TestNewTriangleRejectsSharedElement(t *testing.T) {
	if _, err := plot.NewTriangle(corner(t, "Al"), corner(t, "Fe+Si"), corner(t, "Si")); err == nil {
		t.Fatal("Si in two corners was accepted")
	}
	if _, err := plot.NewTriangle(corner(t, "Al"), plot.Corner{}, corner(t, "Si")); err == nil {
		t.Fatal("an empty corner was accepted")
	}
}

func TestCartesianHandWorkedPoints(t *testing.T) {
	const tol = 1e-12
	// x = b + c/2, y = c·√3/2 with A at (0,0), B at (1,0), C at (1/2, √3/2)
	// (common practice, equilateral Gibbs triangle of unit side).
	for _, tc := range []struct {
		name string
		p    plot.Ternary
		x, y float64
	}{
		{"corner A", plot.Ternary{1, 0, 0}, 0, 0},
		{"corner B", plot.Ternary{0, 1, 0}, 1, 0},
		{"corner C", plot.Ternary{0, 0, 1}, 0.5, math.Sqrt(3) / 2},
		// Centroid: x = 1/3 + 1/6 = 1/2, y = (1/3)(√3/2) = √3/6.
		{"centroid", plot.Ternary{1.0 / 3, 1.0 / 3, 1.0 / 3}, 0.5, math.Sqrt(3) / 6},
		// Midpoint of A-B: x = 1/2, y = 0.
		{"mid A-B", plot.Ternary{0.5, 0.5, 0}, 0.5, 0},
		// On B-C: x = 0.25 + 0.75/2 = 0.625, y = 0.75·0.8660254 = 0.6495191.
		{"B-C edge", plot.Ternary{0, 0.25, 0.75}, 0.625, 0.75 * math.Sqrt(3) / 2},
		// Al63Cu25Fe12 on Al/Cu/Fe: x = 0.25 + 0.06 = 0.31, y = 0.12·0.8660254 = 0.1039230.
		{"Al63Cu25Fe12", plot.Ternary{0.63, 0.25, 0.12}, 0.31, 0.12 * math.Sqrt(3) / 2},
	} {
		q := tc.p.Cartesian()
		if math.Abs(q.X-tc.x) > tol || math.Abs(q.Y-tc.y) > tol {
			t.Errorf("%s: Cartesian(%v) = (%.9f, %.9f), want (%.9f, %.9f)", tc.name, tc.p, q.X, q.Y, tc.x, tc.y)
		}
		back := plot.TernaryAt(plot.Point{X: tc.x, Y: tc.y})
		for k := range back {
			if math.Abs(back[k]-tc.p[k]) > tol {
				t.Errorf("%s: TernaryAt(%.6f, %.6f) = %v, want %v", tc.name, tc.x, tc.y, back, tc.p)
				break
			}
		}
	}
}

func TestProject(t *testing.T) {
	const tol = 1e-12
	for _, tc := range []struct {
		name    string
		corners [3]string
		comp    []meltbook.ElementFraction
		want    plot.Ternary
		ignored float64
	}{
		{"single-element corners", [3]string{"Al", "Cu", "Fe"}, comp("Al", .63, "Cu", .25, "Fe", .12),
			plot.Ternary{.63, .25, .12}, 0},
		// (Fe+Si) = 0.10 + 0.05 = 0.15.
		{"grouped corner", [3]string{"Al", "Cu", "Fe+Si"}, comp("Al", .60, "Cu", .25, "Fe", .10, "Si", .05),
			plot.Ternary{.60, .25, .15}, 0},
		// B outside the corners: inside = 0.98, so (0.62, 0.24, 0.12)/0.98 =
		// (0.6326531, 0.2448980, 0.1224490) and 0.02 is ignored.
		{"element outside the corners", [3]string{"Al", "Cu", "Fe"}, comp("Al", .62, "Cu", .24, "Fe", .12, "B", .02),
			plot.Ternary{.62 / .98, .24 / .98, .12 / .98}, 0.02},
		// Percentages rather than fractions: 63/100 etc.
		{"unnormalised input", [3]string{"Al", "Cu", "Fe"}, comp("Al", 63.0, "Cu", 25.0, "Fe", 12.0),
			plot.Ternary{.63, .25, .12}, 0},
		// A binary on the A-C edge.
		{"binary on an edge", [3]string{"Al", "Cu", "Fe"}, comp("Al", .75, "Fe", .25),
			plot.Ternary{.75, 0, .25}, 0},
	} {
		tri := triangle(t, tc.corners[0], tc.corners[1], tc.corners[2])
		got, err := tri.Project(tc.comp)
		if err != nil {
			t.Errorf("%s: %v", tc.name, err)
			continue
		}
		for k := range got.Point {
			if math.Abs(got.Point[k]-tc.want[k]) > tol {
				t.Errorf("%s: point %v, want %v", tc.name, got.Point, tc.want)
				break
			}
		}
		if math.Abs(got.Ignored-tc.ignored) > tol {
			t.Errorf("%s: ignored %g, want %g", tc.name, got.Ignored, tc.ignored)
		}
	}
	tri := triangle(t, "Al", "Cu", "Fe")
	if _, err := tri.Project(comp("Ni", 1.0)); err == nil {
		t.Error("a composition with no corner element was placed")
	}
	if _, err := tri.Project(comp("Al", -0.1, "Cu", 1.1)); err == nil {
		t.Error("a negative fraction was accepted")
	}
}

package plot_test

import (
	"math"
	"testing"

	"meltbook/web/plot"
)

// Valences for Al-Cu-Fe: Al 3 and Cu 1 (common practice), Fe −2.66 (Raynor's
// transition-metal valence as commonly quoted, from memory).
var alCuFe = [3]float64{3, 1, -2.66}

func TestElectronIsolineCrossesEdgesWhereHandWorked(t *testing.T) {
	const tol = 1e-9
	// e/a = 1.75 with corners A = Al (3), B = Cu (1), C = Fe (−2.66). Only
	// corner A lies above 1.75, so the line runs from edge A-B to edge A-C.
	//   On A-B (c = 0):  3x + 1(1 − x) = 1.75  ⇒ 2x = 0.75  ⇒ x_Al = 0.375
	//   On A-C (b = 0):  3x − 2.66(1 − x) = 1.75 ⇒ 5.66x = 4.41 ⇒ x_Al = 0.7791519
	wantAB, wantAC := 0.375, 4.41/5.66
	// n = 40 puts the A-B crossing exactly on a grid node (0.375·40 = 15);
	// n = 37 and 7 do not.
	for _, n := range []int{40, 37, 7} {
		g := plot.SampleField(n, plot.ElectronField(alCuFe))
		lines := g.Isolines(1.75)
		if len(lines) != 1 {
			t.Fatalf("n=%d: %d polylines, want 1", n, len(lines))
		}
		line := lines[0]
		var onAB, onAC int
		for _, p := range []plot.Ternary{line[0], line[len(line)-1]} {
			switch {
			case math.Abs(p[2]) < tol:
				onAB++
				if math.Abs(p[0]-wantAB) > tol {
					t.Errorf("n=%d: crosses A-B at x_Al = %.9f, want %.9f", n, p[0], wantAB)
				}
			case math.Abs(p[1]) < tol:
				onAC++
				if math.Abs(p[0]-wantAC) > tol {
					t.Errorf("n=%d: crosses A-C at x_Al = %.9f, want %.9f", n, p[0], wantAC)
				}
			default:
				t.Errorf("n=%d: end %v is on neither edge A-B nor A-C", n, p)
			}
		}
		if onAB != 1 || onAC != 1 {
			t.Errorf("n=%d: ends on A-B %d and A-C %d times, want once each", n, onAB, onAC)
		}
		// Every vertex satisfies 3a + b − 2.66c = 1.75 (the field is linear).
		for _, p := range line {
			if v := 3*p[0] + p[1] - 2.66*p[2]; math.Abs(v-1.75) > tol {
				t.Errorf("n=%d: vertex %v has e/a %.12f", n, p, v)
			}
		}
	}
}

func TestIsolineOfANonlinearFieldIsAClosedCircle(t *testing.T) {
	// Distance from the centroid (1/2, √3/6) in the plane; the level 0.2 is
	// a circle inside the triangle (inradius √3/6 ≈ 0.2887).
	centre := plot.Point{X: 0.5, Y: math.Sqrt(3) / 6}
	dist := func(p plot.Ternary) float64 {
		q := p.Cartesian()
		return math.Hypot(q.X-centre.X, q.Y-centre.Y)
	}
	g := plot.SampleField(60, dist)
	lines := g.Isolines(0.2)
	if len(lines) != 1 {
		t.Fatalf("%d polylines, want one closed curve", len(lines))
	}
	line := lines[0]
	if line[0] != line[len(line)-1] {
		t.Errorf("curve is not closed: starts %v, ends %v", line[0], line[len(line)-1])
	}
	// Linear interpolation of a convex field on a grid of spacing h = 1/60
	// misplaces the curve by at most about h²/(8r) ≈ 2e-4 (common practice,
	// interpolation error bound); allow 1e-3.
	for _, p := range line {
		if d := dist(p); math.Abs(d-0.2) > 1e-3 {
			t.Errorf("vertex %v is %.5f from the centre, want 0.2", p, d)
		}
	}
	if len(line) < 40 {
		t.Errorf("circle drawn with only %d points", len(line))
	}
}

func TestIsolinesSkipUndefinedRegionsAndOutOfRangeLevels(t *testing.T) {
	field := func(p plot.Ternary) float64 {
		if p[0] > 0.5 {
			return math.NaN()
		}
		return p[1]
	}
	const n = 20
	g := plot.SampleField(n, field)
	for _, line := range g.Isolines(0.3) {
		for _, p := range line {
			if p[0] > 0.5+1.0/n {
				t.Errorf("vertex %v lies where the field is undefined", p)
			}
		}
	}
	if lines := g.Isolines(0.3); len(lines) == 0 {
		t.Error("no isoline drawn where the field is defined")
	}
	if lines := g.Isolines(2); len(lines) != 0 {
		t.Errorf("level above the field's range drew %d lines", len(lines))
	}
	lo, hi := g.Range()
	if lo != 0 || hi != 1 {
		t.Errorf("Range = %g, %g; want 0, 1 (b runs 0..1 where a ≤ 0.5)", lo, hi)
	}
}

package crystal_test

import (
	"math"
	"testing"

	"meltbook/analysis/crystal"
)

func TestParseOperation(t *testing.T) {
	const tol = 1e-12
	for _, c := range []struct {
		in   string
		r    [3][3]int
		t    [3]float64
		text string // canonical form
	}{
		// Each matrix and translation is read off the text by hand (CIF core dictionary, xyz form).
		{"x,y,z", [3][3]int{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}, [3]float64{}, "x,y,z"},
		{"-y,x-y,z+1/3", [3][3]int{{0, -1, 0}, {1, -1, 0}, {0, 0, 1}}, [3]float64{0, 0, 1.0 / 3}, "-y,x-y,z+1/3"},
		{"1/2+x, -y, z", [3][3]int{{1, 0, 0}, {0, -1, 0}, {0, 0, 1}}, [3]float64{0.5, 0, 0}, "x+1/2,-y,z"},
		{"x-y,-y,-z+1/2", [3][3]int{{1, -1, 0}, {0, -1, 0}, {0, 0, -1}}, [3]float64{0, 0, 0.5}, "x-y,-y,-z+1/2"},
		{"+x,+y,+z", [3][3]int{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}, [3]float64{}, "x,y,z"},
		{"-X,-Y+1/2,Z", [3][3]int{{-1, 0, 0}, {0, -1, 0}, {0, 0, 1}}, [3]float64{0, 0.5, 0}, "-x,-y+1/2,z"},
		{"x+0.5,y+0.25,z+0.3333", [3][3]int{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}, [3]float64{0.5, 0.25, 1.0 / 3}, "x+1/2,y+1/4,z+1/3"},
		{"-x+.75, y-1/4, 0.125-z", [3][3]int{{-1, 0, 0}, {0, 1, 0}, {0, 0, -1}}, [3]float64{0.75, -0.25, 0.125}, "-x+3/4,y-1/4,-z+1/8"},
		{"z, x, y", [3][3]int{{0, 0, 1}, {1, 0, 0}, {0, 1, 0}}, [3]float64{}, "z,x,y"},
		{"-x+y,y,-z+2/3", [3][3]int{{-1, 1, 0}, {0, 1, 0}, {0, 0, -1}}, [3]float64{0, 0, 2.0 / 3}, "-x+y,y,-z+2/3"},
	} {
		op, err := crystal.ParseOperation(c.in)
		if err != nil {
			t.Errorf("ParseOperation(%q): %v", c.in, err)
			continue
		}
		if op.R != c.r {
			t.Errorf("ParseOperation(%q).R = %v, want %v", c.in, op.R, c.r)
		}
		for i := range c.t {
			if math.Abs(op.T[i]-c.t[i]) > tol {
				t.Errorf("ParseOperation(%q).T = %v, want %v", c.in, op.T, c.t)
				break
			}
		}
		if got := op.String(); got != c.text {
			t.Errorf("ParseOperation(%q).String() = %q, want %q", c.in, got, c.text)
		}
	}
}

func TestParseOperationRefuses(t *testing.T) {
	for _, in := range []string{
		"", "x,y", "x,y,z,x", "x,y,w", "x,x,z", "x,y,z+", "x,y,2z", "x,y,z+1/0",
		"x+x,y,z", "x,y,z+abc", "xy,y,z", "x,y,", "x,y,z+1..2",
	} {
		if op, err := crystal.ParseOperation(in); err == nil {
			t.Errorf("ParseOperation(%q) = %v, want an error", in, op)
		}
	}
}

func TestNormalised(t *testing.T) {
	op, err := crystal.ParseOperation("-x-1/2,y+3/2,z-2/3")
	if err != nil {
		t.Fatal(err)
	}
	n := op.Normalised()
	// -1/2 → 1/2, 3/2 → 1/2, -2/3 → 1/3 (reduction modulo 1, worked by hand).
	want := [3]float64{0.5, 0.5, 1.0 / 3}
	for i := range want {
		if math.Abs(n.T[i]-want[i]) > 1e-12 {
			t.Fatalf("Normalised().T = %v, want %v", n.T, want)
		}
	}
	if got := n.String(); got != "-x+1/2,y+1/2,z+1/3" {
		t.Errorf("Normalised().String() = %q", got)
	}
}

func mustOp(t testing.TB, s string) crystal.Operation {
	t.Helper()
	op, err := crystal.ParseOperation(s)
	if err != nil {
		t.Fatal(err)
	}
	return op
}

func TestComposition(t *testing.T) {
	for _, c := range []struct {
		first, second, want string // want = apply first, then second; worked by substitution by hand
	}{
		// 6₃ screw twice is the 3-fold axis: -y,x-y... (International Tables Vol. A, P6₃: (2) -y,x-y,z; 6₃ = x-y,x,z+1/2).
		{"x-y,x,z+1/2", "x-y,x,z+1/2", "-y,x-y,z+1"},
		{"-y,x-y,z", "-y,x-y,z", "-x+y,-x,z"},
		{"x+1/2,y,z", "-x,-y,-z", "-x-1/2,-y,-z"},
		{"-x,-y,-z", "x+1/2,y,z", "-x+1/2,-y,-z"},
		{"z,x,y", "y,z,x", "x,y,z"},
	} {
		a, b := mustOp(t, c.first), mustOp(t, c.second)
		w := mustOp(t, c.want)
		if got := a.Then(b); !got.Equal(w, 1e-12) {
			t.Errorf("%s then %s = %s, want %s", c.first, c.second, got, c.want)
		}
		if got := b.Compose(a); !got.Equal(w, 1e-12) {
			t.Errorf("(%s)∘(%s) = %s, want %s", c.second, c.first, got, c.want)
		}
		if inv := a.Inverse(); !a.Then(inv).Equal(crystal.Identity, 1e-12) {
			t.Errorf("%s then its inverse %s is not the identity", c.first, inv)
		}
	}
	if !mustOp(t, "x+1,y,z-1").EqualModLattice(crystal.Identity, 1e-9) {
		t.Error("x+1,y,z-1 should equal x,y,z modulo the lattice")
	}
	if mustOp(t, "x+1/2,y,z").EqualModLattice(crystal.Identity, 1e-9) {
		t.Error("x+1/2,y,z should not equal x,y,z modulo the lattice")
	}
}

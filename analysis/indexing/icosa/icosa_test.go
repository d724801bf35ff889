package icosa_test

import (
	"fmt"
	"math"
	"sort"
	"testing"

	"meltbook/analysis/indexing/icosa"
)

// projection builds, independently of the package, the parallel and
// perpendicular projections of the six-dimensional hypercubic reciprocal
// basis in a setting with one 5-fold axis along z: the parallel basis
// vectors point to six vertices of an icosahedron,
//
//	e1 = (0, 0, 1),  e(k+2) = (2/√5 cos 2πk/5, 2/√5 sin 2πk/5, 1/√5),  k = 0..4,
//
// and the perpendicular ones to the Galois-conjugate star (angles doubled,
// z component −1/√5). Each is scaled by 1/√2 so that the 6×6 matrix of both
// is orthogonal, with a6 = 1.
//
// Reference: the cut-and-project construction of the icosahedral module
// (common practice in quasicrystallography; e.g. V. Elser, Acta Cryst. A42,
// 36 (1986)).
func projection() (par, perp [6][3]float64) {
	s5 := math.Sqrt(5)
	par[0] = [3]float64{0, 0, 1}
	perp[0] = [3]float64{0, 0, 1}
	for k := 0; k < 5; k++ {
		phi := 2 * math.Pi * float64(k) / 5
		par[k+1] = [3]float64{2 / s5 * math.Cos(phi), 2 / s5 * math.Sin(phi), 1 / s5}
		perp[k+1] = [3]float64{2 / s5 * math.Cos(2*phi), 2 / s5 * math.Sin(2*phi), -1 / s5}
	}
	for i := range par {
		for c := 0; c < 3; c++ {
			par[i][c] /= math.Sqrt2
			perp[i][c] /= math.Sqrt2
		}
	}
	return par, perp
}

func TestProjectionIsOrthogonal(t *testing.T) {
	par, perp := projection()
	for i := 0; i < 6; i++ {
		for j := 0; j < 6; j++ {
			var dot float64
			for c := 0; c < 3; c++ {
				dot += par[i][c]*par[j][c] + perp[i][c]*perp[j][c]
			}
			want := 0.0
			if i == j {
				want = 1
			}
			if math.Abs(dot-want) > 1e-12 {
				t.Fatalf("basis %d·%d = %g, want %g", i, j, dot, want)
			}
		}
	}
}

type bruteFamily struct {
	par, perp float64
	mult      int
}

// bruteFamilies enumerates basis index vectors n (doubled, so that F's
// half-odd vectors are integers) and groups their projections by length.
func bruteFamilies(lat icosa.Lattice, maxPar, maxPerp float64) []bruteFamily {
	par, perp := projection()
	// The projection is orthogonal, so |n|² = (|G∥|² + |G⊥|²)·a6² bounds the
	// search; v holds 2n.
	r2 := 4 * (maxPar*maxPar + maxPerp*maxPerp)
	lim := int(math.Sqrt(r2))
	var fams []bruteFamily
	var v [6]int
	var rec func(i, sq int)
	rec = func(i, sq int) {
		if i < 6 {
			for x := -lim; x <= lim; x++ {
				if float64(sq+x*x) > r2 {
					continue
				}
				v[i] = x
				rec(i+1, sq+x*x)
			}
			return
		}
		odd := 0
		sum := 0
		for _, x := range v {
			odd += x & 1
			sum += x
		}
		switch lat {
		case icosa.Primitive:
			if odd != 0 {
				return
			}
		case icosa.BodyCentred:
			if odd != 0 || (sum/2)%2 != 0 {
				return
			}
		case icosa.FaceCentred:
			if odd != 0 && odd != 6 {
				return
			}
		}
		if v == [6]int{} {
			return
		}
		var gp, gq [3]float64
		for b := 0; b < 6; b++ {
			for c := 0; c < 3; c++ {
				gp[c] += float64(v[b]) / 2 * par[b][c]
				gq[c] += float64(v[b]) / 2 * perp[b][c]
			}
		}
		lp := math.Sqrt(gp[0]*gp[0] + gp[1]*gp[1] + gp[2]*gp[2])
		lq := math.Sqrt(gq[0]*gq[0] + gq[1]*gq[1] + gq[2]*gq[2])
		if lp > maxPar || lq > maxPerp {
			return
		}
		for k := range fams {
			if math.Abs(fams[k].par-lp) < 1e-7 && math.Abs(fams[k].perp-lq) < 1e-7 {
				fams[k].mult++
				return
			}
		}
		fams = append(fams, bruteFamily{lp, lq, 1})
	}
	rec(0, 0)
	sort.Slice(fams, func(i, j int) bool { return fams[i].par < fams[j].par })
	return fams
}

func TestFamiliesAgreeWithBruteForceProjection(t *testing.T) {
	const maxPar, maxPerp = 3.8, 0.75
	for _, lat := range icosa.Lattices {
		t.Run(lat.String(), func(t *testing.T) {
			want := bruteFamilies(lat, maxPar, maxPerp)
			got := icosa.Families(lat, maxPar, maxPerp)
			if len(got) != len(want) {
				t.Fatalf("%d families, brute force finds %d", len(got), len(want))
			}
			for i := range want {
				g, w := got[i], want[i]
				if math.Abs(g.Parallel-w.par) > 1e-9 || math.Abs(g.Perp-w.perp) > 1e-9 || g.Multiplicity != w.mult {
					t.Errorf("family %d (%d,%d): |G∥|a6 %.9f |G⊥|a6 %.9f ×%d; brute force %.9f %.9f ×%d",
						i, g.N, g.M, g.Parallel, g.Perp, g.Multiplicity, w.par, w.perp, w.mult)
				}
				n, m := g.Index.NM()
				if n != g.N || m != g.M || !g.Index.In(lat) {
					t.Errorf("family (%d,%d): representative %v has (%d,%d), in %s: %v", g.N, g.M, g.Index, n, m, lat, g.Index.In(lat))
				}
			}
		})
	}
}

func TestFamilyCountIsNotTrivial(t *testing.T) {
	// Guards the brute-force comparison against comparing two empty lists.
	if n := len(icosa.Families(icosa.Primitive, 3.8, 0.75)); n < 8 {
		t.Fatalf("only %d primitive families below |G∥|a6 = 3.8", n)
	}
}

func TestSymmetryAxisMultiplicities(t *testing.T) {
	// Orbit sizes of the icosahedral group m-3-5 (order 120) for vectors on
	// its rotation axes: 12 on 5-fold, 20 on 3-fold, 30 on 2-fold axes
	// (common practice). (18,29) and (20,32) are the two strong lines of
	// i-Al-Cu-Fe and i-Al-Mn patterns, along 5-fold and 2-fold axes (from
	// memory of the CSG indexing tables).
	tests := []struct {
		lat  icosa.Lattice
		n, m int
		mult int
	}{
		{icosa.Primitive, 18, 29, 12},
		{icosa.Primitive, 20, 32, 30},
		{icosa.Primitive, 6, 9, 20},
		{icosa.Primitive, 8, 12, 30},
		{icosa.Primitive, 52, 84, 30},
		{icosa.FaceCentred, 7, 11, 12},
		{icosa.FaceCentred, 3, 4, 12},
		{icosa.FaceCentred, 15, 24, 20},
	}
	for _, tt := range tests {
		found := false
		for _, f := range icosa.Families(tt.lat, 6, 0.6) {
			if f.N == tt.n && f.M == tt.m {
				found = true
				if f.Multiplicity != tt.mult {
					t.Errorf("%s (%d,%d): multiplicity %d, want %d", tt.lat, tt.n, tt.m, f.Multiplicity, tt.mult)
				}
			}
		}
		if !found {
			t.Errorf("%s (%d,%d) not listed", tt.lat, tt.n, tt.m)
		}
	}
}

func TestLatticeMembership(t *testing.T) {
	// (h/h' k/k' l/l'): the 5-fold basis vector (1, τ, 0) is 1/0 0/1 0/0;
	// τ times it, (τ, 1+τ, 0) = 0/1 1/1 0/0, has half-odd basis indices and
	// belongs to F only; the 2-fold vector (2, 0, 0) has Σn = 2 and belongs
	// to all three (package documentation's parity rules, derived from
	// Cahn, Shechtman, Gratias 1986).
	tests := []struct {
		ix      icosa.Index
		p, f, i bool
	}{
		{icosa.Index{1, 0, 0, 1, 0, 0}, true, true, false},
		{icosa.Index{0, 1, 1, 1, 0, 0}, false, true, false},
		{icosa.Index{2, 0, 0, 0, 0, 0}, true, true, true},
		{icosa.Index{1, 0, 0, 0, 0, 0}, false, false, false},
	}
	for _, tt := range tests {
		if got := tt.ix.In(icosa.Primitive); got != tt.p {
			t.Errorf("%v in P = %v", tt.ix, got)
		}
		if got := tt.ix.In(icosa.FaceCentred); got != tt.f {
			t.Errorf("%v in F = %v", tt.ix, got)
		}
		if got := tt.ix.In(icosa.BodyCentred); got != tt.i {
			t.Errorf("%v in I = %v", tt.ix, got)
		}
	}
}

func ExampleFamilies() {
	for _, f := range icosa.Families(icosa.Primitive, 3.2, 0.3) {
		fmt.Printf("(%d,%d) |G∥|a6=%.4f |G⊥|a6=%.4f ×%d %v\n", f.N, f.M, f.Parallel, f.Perp, f.Multiplicity, f.Index)
	}
	// Output:
	// (18,29) |G∥|a6=2.9954 |G⊥|a6=0.1669 ×12 2/3 0/0 1/2
	// (20,32) |G∥|a6=3.1495 |G⊥|a6=0.2840 ×30 2/4 0/0 0/0
}

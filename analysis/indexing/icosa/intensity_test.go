package icosa_test

import (
	"encoding/json"
	"math"
	"testing"

	"meltbook/analysis/indexing/icosa"
	"meltbook/analysis/internal/pyref"
)

func det3(a, b, c [3]float64) float64 {
	return a[0]*(b[1]*c[2]-b[2]*c[1]) - a[1]*(b[0]*c[2]-b[2]*c[0]) + a[2]*(b[0]*c[1]-b[1]*c[0])
}

// TestWindowVolumeIsProjectedHypercube checks the P window volume against
// the volume of the zonohedron spanned by the perpendicular projections of
// the six direct basis vectors (the test's own projection; with an
// orthogonal 6×6 matrix the direct basis of edge a6 = 1 projects like the
// reciprocal one), V = Σ_{i<j<k} |det(vᵢ, vⱼ, vₖ)| (the volume of a
// zonotope, G. C. Shephard, Can. J. Math. 26, 302 (1974)), and the F and I
// windows against the covolumes of their direct lattices, computed here
// as determinants of explicit bases: even-sum integer vectors (F, 2) and
// the integer vectors with the body centre (I, ½).
func TestWindowVolumeIsProjectedHypercube(t *testing.T) {
	_, perp := projection()
	v := 0.0
	for i := 0; i < 6; i++ {
		for j := i + 1; j < 6; j++ {
			for k := j + 1; k < 6; k++ {
				v += math.Abs(det3(perp[i], perp[j], perp[k]))
			}
		}
	}
	if got := icosa.WindowVolume(icosa.Primitive); math.Abs(got-v) > 1e-9 {
		t.Errorf("P window volume %.9f a6³, projected hypercube %.9f", got, v)
	}
	// Covolume of the F direct lattice {n ∈ Z⁶ : Σn even}: basis
	// e1−e2, …, e5−e6, e5+e6. Of the I direct lattice Z⁶ ∪ (Z⁶ + ½): basis
	// e1 … e5 and (½, …, ½).
	var fBasis, iBasis [6][6]float64
	for r := 0; r < 5; r++ {
		fBasis[r][r], fBasis[r][r+1] = 1, -1
		iBasis[r][r] = 1
	}
	fBasis[5][4], fBasis[5][5] = 1, 1
	for c := 0; c < 6; c++ {
		iBasis[5][c] = 0.5
	}
	for _, tc := range []struct {
		lat   icosa.Lattice
		basis [6][6]float64
	}{{icosa.FaceCentred, fBasis}, {icosa.BodyCentred, iBasis}} {
		want := v * math.Abs(det6(tc.basis))
		if got := icosa.WindowVolume(tc.lat); math.Abs(got-want) > 1e-9 {
			t.Errorf("%s window volume %.9f a6³, want %.9f", tc.lat, got, want)
		}
		r := math.Cbrt(3 * want / (4 * math.Pi))
		if got := icosa.WindowRadius(tc.lat); math.Abs(got-r) > 1e-9 {
			t.Errorf("%s window radius %.9f a6, want %.9f", tc.lat, got, r)
		}
	}
}

// det6 is a determinant by Gaussian elimination with partial pivoting.
func det6(m [6][6]float64) float64 {
	d := 1.0
	for c := 0; c < 6; c++ {
		p := c
		for r := c + 1; r < 6; r++ {
			if math.Abs(m[r][c]) > math.Abs(m[p][c]) {
				p = r
			}
		}
		if m[p][c] == 0 {
			return 0
		}
		if p != c {
			m[p], m[c] = m[c], m[p]
			d = -d
		}
		d *= m[c][c]
		for r := c + 1; r < 6; r++ {
			f := m[r][c] / m[c][c]
			for k := c; k < 6; k++ {
				m[r][k] -= f * m[c][k]
			}
		}
	}
	return d
}

// TestSphereFormFactor checks g(x) = 3 j₁(x)/x against scipy's spherical
// Bessel function, and its first zero against the first root of
// tan x = x, 4.493409 (M. Abramowitz, I. A. Stegun, Handbook of
// Mathematical Functions (1964), Table 10.6).
func TestSphereFormFactor(t *testing.T) {
	xs := []float64{0, 1e-4, 0.5, 1, 2, 3, 4, 4.493409, 5, 6, 7.725252, 10}
	if g := icosa.SphereFormFactor(4.493409); math.Abs(g) > 1e-6 {
		t.Errorf("g(4.493409) = %g, want 0 (first root of tan x = x)", g)
	}
	if g := icosa.SphereFormFactor(0); g != 1 {
		t.Errorf("g(0) = %g, want 1", g)
	}
	in, _ := json.Marshal(xs)
	out := pyref.Run(t, []string{"scipy.special"}, `
import sys, json
from scipy.special import spherical_jn
xs = json.load(sys.stdin)
print(json.dumps([1.0 if x == 0 else 3 * spherical_jn(1, x) / x for x in xs]))
`, in)
	var want []float64
	if err := json.Unmarshal(out, &want); err != nil {
		t.Fatal(err)
	}
	for i, x := range xs {
		if g := icosa.SphereFormFactor(x); math.Abs(g-want[i]) > 1e-9 {
			t.Errorf("g(%g) = %.12f, scipy %.12f", x, g, want[i])
		}
	}
}

// TestWindowFormFactorFillsZeros: below the sphere's first zero the
// radius-averaged ⟨g²⟩ stays within 25 % of g² at the equal-volume radius
// and it stays positive where g has its zero (constructed case: the
// average runs over radii 0.96–1.13 R, common practice for a size spread).
func TestWindowFormFactorFillsZeros(t *testing.T) {
	r := icosa.WindowRadius(icosa.Primitive)
	for _, perp := range []float64{0.05, 0.15, 0.25, 0.35, 0.45} {
		g := icosa.SphereFormFactor(2 * math.Pi * perp * r)
		if w := icosa.WindowFormFactor2(icosa.Primitive, perp); math.Abs(w/(g*g)-1) > 0.25 {
			t.Errorf("|G⊥|a6 = %.2f: ⟨g²⟩ = %.4f, g² = %.4f", perp, w, g*g)
		}
	}
	zero := 4.493409 / (2 * math.Pi * r)
	if w := icosa.WindowFormFactor2(icosa.Primitive, zero); !(w > 1e-4) {
		t.Errorf("⟨g²⟩ at the sphere's zero |G⊥|a6 = %.3f is %g", zero, w)
	}
}

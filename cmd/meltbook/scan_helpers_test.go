package main

import (
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// Cu Kα1 and Kα2 wavelengths in Å: Hölzer et al., Phys. Rev. A 56, 4554 (1997).
const (
	cuKa1 = 1.5405929
	cuKa2 = 1.5444274
)

// braggTwoTheta is 2θ in degrees for spacing d (Å) and wavelength λ (Å),
// written out here so the tests do not lean on the code under test.
func braggTwoTheta(d, lambda float64) float64 {
	return 2 * math.Asin(lambda/(2*d)) * 180 / math.Pi
}

// syntheticScan writes an XY file holding Gaussian Kα1/Kα2 doublets (ratio
// 0.5) at the given d-spacings with relative heights, on a sloping
// background, with seeded Poisson-like noise; it returns the path.
func syntheticScan(t testing.TB, name string, ds, heights []float64, lo, hi, step float64, seed uint64) string {
	t.Helper()
	rng := rand.New(rand.NewPCG(seed, 7))
	var b strings.Builder
	b.WriteString("# synthetic scan built by the test: 2theta (deg), counts\n")
	const fwhm = 0.12
	sigma := fwhm / (2 * math.Sqrt(2*math.Ln2))
	for x := lo; x <= hi+1e-9; x += step {
		y := 200 - 1.2*(x-lo)
		for i, d := range ds {
			for _, l := range []struct{ lambda, w float64 }{{cuKa1, 1}, {cuKa2, 0.5}} {
				c := braggTwoTheta(d, l.lambda)
				y += heights[i] * l.w * math.Exp(-0.5*(x-c)*(x-c)/(sigma*sigma))
			}
		}
		y += rng.NormFloat64() * math.Sqrt(y)
		if y < 0 {
			y = 0
		}
		fmt.Fprintf(&b, "%.4f %.1f\n", x, math.Round(y))
	}
	path := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// fccAluminiumSpacings are d = a/√(h²+k²+l²) for the first five fcc lines
// of Al, a = 4.0495 Å (room-temperature lattice constant as tabulated in
// handbooks, e.g. Pearson's Handbook; from memory).
func fccAluminiumSpacings() (hkl []string, ds []float64) {
	const a = 4.0495
	for _, r := range []struct {
		hkl string
		s   int
	}{{"111", 3}, {"200", 4}, {"220", 8}, {"311", 11}, {"222", 12}} {
		hkl = append(hkl, r.hkl)
		ds = append(ds, a/math.Sqrt(float64(r.s)))
	}
	return hkl, ds
}

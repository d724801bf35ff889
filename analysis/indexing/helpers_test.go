package indexing_test

import (
	"fmt"
	"math"
	"sort"
	"sync"

	"meltbook/analysis/indexing"
)

// cuKa1 is the Cu Kα1 wavelength in Å (Hölzer et al., Phys. Rev. A 56,
// 4554 (1997)).
const cuKa1 = 1.5405929

// tau is the golden mean.
var tau = (1 + math.Sqrt(5)) / 2

// projectedFamily is a reflection family found by projecting six-dimensional
// vectors in the test's own setting: lengths in units of 1/a6.
type projectedFamily struct {
	par, perp float64
	mult      int
	odd       bool // half-odd basis indices (F only)
}

// projectFamilies enumerates the reciprocal vectors n of the 6D hypercubic
// lattice (a6 = 1), n integer (primitive), n integer with even sum (body
// centred) or n all integer or all half-odd (face centred), projects them
// with explicit 6×3 matrices whose rows point to the vertices of an
// icosahedron with a 5-fold axis along z (parallel space) and to the
// Galois-conjugate vertices (perpendicular space), each row of length 1/√2,
// and groups them by the two lengths. The enumeration meets in the middle:
// the projections of the first three and of the last three coordinates are
// listed separately and paired where their perpendicular parts nearly
// cancel. Results are cached per bound.
//
// Reference: the cut-and-project construction of the icosahedral module
// (V. Elser, Acta Cryst. A42, 36 (1986)); lattice types after J. W. Cahn,
// D. Shechtman, D. Gratias, J. Mater. Res. 1, 13 (1986).
func projectFamilies(lattice string, maxPar, maxPerp float64) []projectedFamily {
	key := fmt.Sprintf("%s %g %g", lattice, maxPar, maxPerp)
	if v, ok := familyCache.Load(key); ok {
		return v.([]projectedFamily)
	}
	var par, perp [6][3]float64
	s5 := math.Sqrt(5)
	par[0], perp[0] = [3]float64{0, 0, 1}, [3]float64{0, 0, 1}
	for k := 0; k < 5; k++ {
		phi := 2 * math.Pi * float64(k) / 5
		par[k+1] = [3]float64{2 / s5 * math.Cos(phi), 2 / s5 * math.Sin(phi), 1 / s5}
		perp[k+1] = [3]float64{2 / s5 * math.Cos(2*phi), 2 / s5 * math.Sin(2*phi), -1 / s5}
	}
	// The 6×6 matrix is orthogonal, so |n|² = |G∥|² + |G⊥|² bounds n; the
	// halves hold v = 2n.
	r2 := 4 * (maxPar*maxPar + maxPerp*maxPerp)
	lim := int(math.Sqrt(r2))
	type half struct {
		v         [3]int
		par, perp [3]float64
		sq        int
	}
	halves := func(first int) []half {
		var out []half
		for a := -lim; a <= lim; a++ {
			for b := -lim; b <= lim; b++ {
				for c := -lim; c <= lim; c++ {
					sq := a*a + b*b + c*c
					if float64(sq) > r2 {
						continue
					}
					h := half{v: [3]int{a, b, c}, sq: sq}
					for i, x := range h.v {
						for k := 0; k < 3; k++ {
							h.par[k] += float64(x) / 2 * par[first+i][k] / math.Sqrt2
							h.perp[k] += float64(x) / 2 * perp[first+i][k] / math.Sqrt2
						}
					}
					out = append(out, h)
				}
			}
		}
		return out
	}
	cell := func(p [3]float64) [3]int {
		return [3]int{int(math.Floor(p[0] / maxPerp)), int(math.Floor(p[1] / maxPerp)), int(math.Floor(p[2] / maxPerp))}
	}
	grid := map[[3]int][]half{}
	for _, h := range halves(3) {
		c := cell(h.perp)
		grid[c] = append(grid[c], h)
	}
	var fams []projectedFamily
	for _, a := range halves(0) {
		c := cell([3]float64{-a.perp[0], -a.perp[1], -a.perp[2]})
		for dx := -1; dx <= 1; dx++ {
			for dy := -1; dy <= 1; dy++ {
				for dz := -1; dz <= 1; dz++ {
					for _, b := range grid[[3]int{c[0] + dx, c[1] + dy, c[2] + dz}] {
						v := [6]int{a.v[0], a.v[1], a.v[2], b.v[0], b.v[1], b.v[2]}
						odd, sum := 0, 0
						for _, x := range v {
							odd += x & 1
							sum += x
						}
						switch {
						case v == [6]int{}:
							continue
						case lattice == "P" && odd != 0:
							continue
						case lattice == "I" && (odd != 0 || (sum/2)%2 != 0):
							continue
						case lattice == "F" && odd != 0 && odd != 6:
							continue
						}
						var gp, gq [3]float64
						for k := 0; k < 3; k++ {
							gp[k] = a.par[k] + b.par[k]
							gq[k] = a.perp[k] + b.perp[k]
						}
						lp := math.Sqrt(gp[0]*gp[0] + gp[1]*gp[1] + gp[2]*gp[2])
						lq := math.Sqrt(gq[0]*gq[0] + gq[1]*gq[1] + gq[2]*gq[2])
						if lp > maxPar || lq > maxPerp {
							continue
						}
						found := false
						for k := range fams {
							if math.Abs(fams[k].par-lp) < 1e-7 && math.Abs(fams[k].perp-lq) < 1e-7 {
								fams[k].mult++
								found = true
								break
							}
						}
						if !found {
							fams = append(fams, projectedFamily{par: lp, perp: lq, mult: 1, odd: odd == 6})
						}
					}
				}
			}
		}
	}
	sort.Slice(fams, func(i, j int) bool { return fams[i].par < fams[j].par })
	familyCache.Store(key, fams)
	return fams
}

var familyCache sync.Map

// bragg returns 2θ in degrees for 1/d = q (Å⁻¹), and false when unreachable.
func bragg(q, lambda float64) (float64, bool) {
	s := lambda * q / 2
	if s >= 1 {
		return 0, false
	}
	return 2 * math.Asin(s) * 180 / math.Pi, true
}

// icosahedralPeaks builds a peak list from the projected families with
// |G⊥|·a6 ≤ maxPerp seen between lo and hi degrees, for quasilattice
// constant aR (Å), with intensity falling with |G⊥| as a Debye-Waller-like
// exp(−(|G⊥|a6/0.25)²), shifted by zero degrees.
func icosahedralPeaks(fams []projectedFamily, aR, lambda, maxPerp, lo, hi, zero float64) ([]indexing.Peak, []projectedFamily) {
	a6 := aR * math.Sqrt2
	var peaks []indexing.Peak
	var used []projectedFamily
	for _, f := range fams {
		if f.perp > maxPerp {
			continue
		}
		tt, ok := bragg(f.par/a6, lambda)
		if !ok || tt < lo || tt > hi {
			continue
		}
		peaks = append(peaks, indexing.Peak{TwoThetaDeg: tt + zero, Intensity: 100 * math.Exp(-math.Pow(f.perp/0.25, 2))})
		used = append(used, f)
	}
	return peaks, used
}

// csgParallel returns |G∥|·a6 of a reflection written in the notation of
// Cahn, Shechtman and Gratias, |(h+h'τ, k+k'τ, l+l'τ)| / √(2(2+τ)).
func csgParallel(ix [6]int) float64 {
	var s float64
	for c := 0; c < 3; c++ {
		x := float64(ix[2*c]) + float64(ix[2*c+1])*tau
		s += x * x
	}
	return math.Sqrt(s / (2 * (2 + tau)))
}

// cubicPeaks lists the 2θ of every line of a cubic lattice ("P", "I", "F")
// with constant a (Å) between lo and hi degrees, with its h²+k²+l².
func cubicPeaks(lattice string, a, lambda, lo, hi float64) (tt []float64, s []int) {
	seen := map[int]bool{}
	for h := 0; h <= 60; h++ {
		for k := 0; k <= h; k++ {
			for l := 0; l <= k; l++ {
				sum := h*h + k*k + l*l
				if sum == 0 || seen[sum] {
					continue
				}
				switch lattice {
				case "I":
					if (h+k+l)%2 != 0 {
						continue
					}
				case "F":
					if !(h%2 == k%2 && k%2 == l%2) {
						continue
					}
				}
				x, ok := bragg(math.Sqrt(float64(sum))/a, lambda)
				if !ok || x < lo || x > hi {
					continue
				}
				seen[sum] = true
				tt = append(tt, x)
				s = append(s, sum)
			}
		}
	}
	return tt, s
}

func sqrt(x float64) float64 { return math.Sqrt(x) }

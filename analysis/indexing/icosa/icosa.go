package icosa

import (
	"fmt"
	"math"
	"sort"
)

// Tau is the golden mean τ = (1+√5)/2.
var Tau = (1 + math.Sqrt(5)) / 2

// norm is √(2(2+τ)), the denominator shared by both projections.
var norm = math.Sqrt(2 * (2 + Tau))

// Lattice is an icosahedral Bravais module type.
type Lattice byte

// The three icosahedral Bravais module types.
const (
	Primitive   Lattice = 'P'
	FaceCentred Lattice = 'F'
	BodyCentred Lattice = 'I'
)

// Lattices lists the module types, primitive first.
var Lattices = []Lattice{Primitive, FaceCentred, BodyCentred}

// String returns "P", "F" or "I".
func (l Lattice) String() string { return string(l) }

// Index is a reflection in Cahn-Shechtman-Gratias notation,
// (h, h', k, k', l, l'): the parallel component along the three orthogonal
// 2-fold axes is (h + h'τ, k + k'τ, l + l'τ) in units of 1/(a6·√(2(2+τ))).
type Index [6]int

// String writes the index as "h/h' k/k' l/l'".
func (ix Index) String() string {
	return fmt.Sprintf("%d/%d %d/%d %d/%d", ix[0], ix[1], ix[2], ix[3], ix[4], ix[5])
}

// NM returns the integer pair that labels the reflection's family:
//
//	N = h² + h'² + k² + k'² + l² + l'²
//	M = h'² + k'² + l'² + 2(hh' + kk' + ll')
//
// so that |G∥|² ∝ N + Mτ and |G⊥|² ∝ τ(Nτ − M).
//
// Reference: Cahn, Shechtman, Gratias, J. Mater. Res. 1, 13 (1986),
// doi:10.1557/JMR.1986.0013.
func (ix Index) NM() (n, m int) {
	for c := 0; c < 3; c++ {
		a, b := ix[2*c], ix[2*c+1]
		n += a*a + b*b
		m += b*b + 2*a*b
	}
	return n, m
}

// Basis returns the index in the six 5-fold basis vectors e1…e6 of the
// package documentation, doubled so that it stays integral for the
// half-odd F reflections: 2n = (k'+h, h'+l, l'+k, k'−h, h'−l, l'−k).
func (ix Index) Basis() [6]int {
	h, hp, k, kp, l, lp := ix[0], ix[1], ix[2], ix[3], ix[4], ix[5]
	return [6]int{kp + h, hp + l, lp + k, kp - h, hp - l, lp - k}
}

// In reports whether the reflection belongs to the module of lattice type
// lat (see the package documentation for the parity rules).
func (ix Index) In(lat Lattice) bool {
	p1 := (ix[0]-ix[3])&1 == 0 // h ≡ k'
	p2 := (ix[2]-ix[5])&1 == 0 // k ≡ l'
	p3 := (ix[4]-ix[1])&1 == 0 // l ≡ h'
	prim := p1 && p2 && p3
	switch lat {
	case Primitive:
		return prim
	case BodyCentred:
		return prim && (ix[1]+ix[3]+ix[5])&1 == 0
	case FaceCentred:
		return prim || (!p1 && !p2 && !p3)
	}
	panic(fmt.Sprintf("icosa: unknown lattice %q", byte(lat)))
}

// ParallelLength returns |G∥|·a6 for the family (N, M):
//
//	|G∥|·a6 = √((N + Mτ) / (2(2+τ)))
//
// Dimensionless; divide by a6 in Å for Å⁻¹ (1/d).
//
// Reference: Cahn, Shechtman, Gratias, J. Mater. Res. 1, 13 (1986).
func ParallelLength(n, m int) float64 {
	return math.Sqrt((float64(n) + float64(m)*Tau) / (2 * (2 + Tau)))
}

// PerpLength returns |G⊥|·a6 for the family (N, M):
//
//	|G⊥|·a6 = √(τ(Nτ − M) / (2(2+τ)))
//
// Dimensionless. Nτ − M is never negative for a real reflection.
//
// Reference: Cahn, Shechtman, Gratias, J. Mater. Res. 1, 13 (1986).
func PerpLength(n, m int) float64 {
	x := Tau * (float64(n)*Tau - float64(m)) / (2 * (2 + Tau))
	if x < 0 {
		x = 0
	}
	return math.Sqrt(x)
}

// Family is every reflection of one module sharing (N, M): they have the
// same |G∥| and |G⊥| and so fall on one powder line.
type Family struct {
	N, M         int
	Parallel     float64 // |G∥|·a6, dimensionless
	Perp         float64 // |G⊥|·a6, dimensionless
	Multiplicity int     // number of reflections ±G counted separately
	Index        Index   // one representative, the lexicographically largest
}

// Families lists the families of lattice type lat with
// |G∥|·a6 ≤ maxParallel and |G⊥|·a6 ≤ maxPerp, sorted by |G∥|, the
// origin excluded. It panics when a bound is negative or so large that the
// enumeration would not be practical (maxParallel·maxPerp > 40).
//
// The enumeration runs over the Cahn indices directly: each coordinate
// pair (h, h') must itself satisfy |h + h'τ| ≤ maxParallel·√(2(2+τ)) and
// |h' − τh| ≤ maxPerp·√(2(2+τ)), which bounds the search box.
func Families(lat Lattice, maxParallel, maxPerp float64) []Family {
	if maxParallel < 0 || maxPerp < 0 || maxParallel*maxPerp > 40 {
		panic(fmt.Sprintf("icosa: unworkable bounds %g, %g", maxParallel, maxPerp))
	}
	xPar := maxParallel * norm
	xPerp := maxPerp * norm
	type pair struct {
		a, b       int
		par, perp2 float64 // component and perpendicular component squared
	}
	// Coordinate pairs within both bounds. |h| ≤ (xPar + xPerp)/ (τ + 1/τ) roughly;
	// a generous box is cheap.
	lim := int(xPar+xPerp) + 2
	var pairs []pair
	for a := -lim; a <= lim; a++ {
		for b := -lim; b <= lim; b++ {
			par := float64(a) + float64(b)*Tau
			perp := float64(b) - Tau*float64(a)
			if math.Abs(par) <= xPar && math.Abs(perp) <= xPerp {
				pairs = append(pairs, pair{a, b, par * par, perp * perp})
			}
		}
	}
	xPar2, xPerp2 := xPar*xPar+1e-9, xPerp*xPerp+1e-9
	type key struct{ n, m int }
	found := map[key]*Family{}
	for _, p := range pairs {
		for _, q := range pairs {
			par2 := p.par + q.par
			perp2 := p.perp2 + q.perp2
			if par2 > xPar2 || perp2 > xPerp2 {
				continue
			}
			for _, r := range pairs {
				if par2+r.par > xPar2 || perp2+r.perp2 > xPerp2 {
					continue
				}
				ix := Index{p.a, p.b, q.a, q.b, r.a, r.b}
				if ix == (Index{}) || !ix.In(lat) {
					continue
				}
				n, m := ix.NM()
				f := found[key{n, m}]
				if f == nil {
					f = &Family{N: n, M: m, Parallel: ParallelLength(n, m), Perp: PerpLength(n, m), Index: ix}
					found[key{n, m}] = f
				}
				f.Multiplicity++
				if lexGreater(ix, f.Index) {
					f.Index = ix
				}
			}
		}
	}
	out := make([]Family, 0, len(found))
	for _, f := range found {
		out = append(out, *f)
	}
	sort.Slice(out, func(i, j int) bool {
		if out[i].Parallel != out[j].Parallel {
			return out[i].Parallel < out[j].Parallel
		}
		return out[i].Perp < out[j].Perp
	})
	return out
}

func lexGreater(a, b Index) bool {
	for i := range a {
		if a[i] != b[i] {
			return a[i] > b[i]
		}
	}
	return false
}

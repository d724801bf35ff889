package cubic

import (
	"fmt"
	"math"
)

// Lattice is a cubic Bravais lattice type.
type Lattice byte

// The three cubic Bravais lattices.
const (
	Primitive   Lattice = 'P'
	BodyCentred Lattice = 'I'
	FaceCentred Lattice = 'F'
)

// Lattices lists the lattice types, primitive first.
var Lattices = []Lattice{Primitive, BodyCentred, FaceCentred}

// String returns "P", "I" or "F".
func (l Lattice) String() string { return string(l) }

// Allowed reports whether the lattice centring lets reflection hkl occur:
//
//	P: always
//	I: h + k + l even
//	F: h, k, l all odd or all even
//
// The origin (000) is never a reflection.
//
// Reference: International Tables for Crystallography Vol. A, Table 2.2.13.1
// (integral reflection conditions for centred cells).
func Allowed(h, k, l int, lat Lattice) bool {
	if h == 0 && k == 0 && l == 0 {
		return false
	}
	switch lat {
	case Primitive:
		return true
	case BodyCentred:
		return (h+k+l)&1 == 0
	case FaceCentred:
		return (h&1) == (k&1) && (k&1) == (l&1)
	}
	panic(fmt.Sprintf("cubic: unknown lattice %q", byte(lat)))
}

// Line is one powder line: every allowed reflection with the same
// S = h² + k² + l², which all have d = a/√S.
type Line struct {
	S            int
	HKL          [3]int // representative with h ≥ k ≥ l ≥ 0, largest h first
	Multiplicity int    // number of allowed (h, k, l) with this S, signs and orders counted
}

// Sqrt returns √S, the line's position in units of 1/a.
func (ln Line) Sqrt() float64 { return math.Sqrt(float64(ln.S)) }

// Lines returns the lines of lat with 0 < S ≤ maxS in increasing S.
// It panics when maxS is negative or above 1e6.
func Lines(lat Lattice, maxS int) []Line {
	if maxS < 0 || maxS > 1e6 {
		panic(fmt.Sprintf("cubic: unworkable maxS %d", maxS))
	}
	mult := make([]int, maxS+1)
	rep := make([][3]int, maxS+1)
	lim := int(math.Sqrt(float64(maxS)))
	for h := -lim; h <= lim; h++ {
		for k := -lim; k <= lim; k++ {
			for l := -lim; l <= lim; l++ {
				s := h*h + k*k + l*l
				if s > maxS || !Allowed(h, k, l, lat) {
					continue
				}
				mult[s]++
				if h >= k && k >= l && l >= 0 && h > rep[s][0] {
					rep[s] = [3]int{h, k, l}
				}
			}
		}
	}
	var out []Line
	for s := 1; s <= maxS; s++ {
		if mult[s] > 0 {
			out = append(out, Line{S: s, HKL: rep[s], Multiplicity: mult[s]})
		}
	}
	return out
}

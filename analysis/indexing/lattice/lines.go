package lattice

import (
	"math"
	"sort"

	"meltbook"
	"meltbook/analysis/crystal"
)

// Centring is a lattice centring letter.
type Centring byte

// The centrings the search knows.
const (
	Primitive    Centring = 'P'
	BodyCentred  Centring = 'I'
	BaseCentred  Centring = 'C' // on the ab face
	FaceCentred  Centring = 'F'
	Rhombohedral Centring = 'R' // hexagonal axes, obverse setting
)

// String returns the centring letter.
func (c Centring) String() string { return string(c) }

// centrings lists the centrings each system allows, primitive first.
var centrings = map[crystal.System][]Centring{
	crystal.Tetragonal:   {Primitive, BodyCentred},
	crystal.Hexagonal:    {Primitive, Rhombohedral},
	crystal.Orthorhombic: {Primitive, BaseCentred, BodyCentred, FaceCentred},
}

// Centrings returns the centrings the search knows for a system, primitive
// first, or nil for a system it does not search.
func Centrings(sys crystal.System) []Centring {
	return append([]Centring(nil), centrings[sys]...)
}

func validCentring(sys crystal.System, cen Centring) bool {
	for _, c := range centrings[sys] {
		if c == cen {
			return true
		}
	}
	return false
}

func mod(x, n int) int { return ((x % n) + n) % n }

// Allowed reports whether the centring lets reflection hkl occur:
//
//	P: always
//	I: h + k + l = 2n
//	C: h + k = 2n
//	F: h, k, l all even or all odd
//	R: −h + k + l = 3n (hexagonal axes, obverse)
//
// The origin is never a reflection.
//
// Reference: International Tables for Crystallography Vol. A,
// Table 2.2.13.1.
func Allowed(h, k, l int, cen Centring) bool {
	if h == 0 && k == 0 && l == 0 {
		return false
	}
	switch cen {
	case Primitive:
		return true
	case BodyCentred:
		return mod(h+k+l, 2) == 0
	case BaseCentred:
		return mod(h+k, 2) == 0
	case FaceCentred:
		return mod(h, 2) == mod(k, 2) && mod(k, 2) == mod(l, 2)
	case Rhombohedral:
		return mod(-h+k+l, 3) == 0
	}
	return false
}

// Line is one powder line: an orbit of reflections under the Laue class of
// the system, with its position.
type Line struct {
	InverseD        float64 // q = 1/d, Å⁻¹
	InverseDSquared float64 // Q = 1/d², Å⁻²
	HKL             [3]int  // allowed representative, h, k, l ≥ 0; h ≥ k for tetragonal and hexagonal (R may swap h and k)
	Multiplicity    int     // members of the orbit the centring allows
}

// constants returns the coefficients (A, B, C) of Q in the system's
// form (B unused for two-constant systems).
func constants(sys crystal.System, cell crystal.Cell) [3]float64 {
	switch sys {
	case crystal.Hexagonal:
		return [3]float64{4 / (3 * cell.A * cell.A), 0, 1 / (cell.C * cell.C)}
	case crystal.Orthorhombic:
		return [3]float64{1 / (cell.A * cell.A), 1 / (cell.B * cell.B), 1 / (cell.C * cell.C)}
	}
	return [3]float64{1 / (cell.A * cell.A), 0, 1 / (cell.C * cell.C)}
}

// cellOf is the inverse of constants.
func cellOf(sys crystal.System, p [3]float64) crystal.Cell {
	switch sys {
	case crystal.Hexagonal:
		a := math.Sqrt(4 / (3 * p[0]))
		return crystal.Cell{A: a, B: a, C: 1 / math.Sqrt(p[2]), Alpha: 90, Beta: 90, Gamma: 120}
	case crystal.Orthorhombic:
		return crystal.Cell{A: 1 / math.Sqrt(p[0]), B: 1 / math.Sqrt(p[1]), C: 1 / math.Sqrt(p[2]), Alpha: 90, Beta: 90, Gamma: 90}
	}
	a := 1 / math.Sqrt(p[0])
	return crystal.Cell{A: a, B: a, C: 1 / math.Sqrt(p[2]), Alpha: 90, Beta: 90, Gamma: 90}
}

// qOf returns Q of hkl for constants p.
func qOf(sys crystal.System, p [3]float64, h, k, l int) float64 {
	switch sys {
	case crystal.Hexagonal:
		return p[0]*float64(h*h+h*k+k*k) + p[2]*float64(l*l)
	case crystal.Orthorhombic:
		return p[0]*float64(h*h) + p[1]*float64(k*k) + p[2]*float64(l*l)
	}
	return p[0]*float64(h*h+k*k) + p[2]*float64(l*l)
}

// orbitAllowed reports whether any member of the Laue orbit of the
// representative hkl is allowed. Only R differs from Allowed: under 6/mmm
// the orbit of (h, k, l) takes −h + k to ±(k − h) mod 3 and l to ±l.
func orbitAllowed(h, k, l int, cen Centring) bool {
	if cen == Rhombohedral {
		return (h != 0 || k != 0 || l != 0) && (mod(k-h+l, 3) == 0 || mod(k-h-l, 3) == 0)
	}
	return Allowed(h, k, l, cen)
}

// laueOrbit returns the distinct index triples equivalent to hkl under the
// Laue class of the system: 4/mmm, 6/mmm or mmm.
func laueOrbit(sys crystal.System, hkl [3]int) [][3]int {
	seen := map[[3]int]bool{hkl: true}
	queue := [][3]int{hkl}
	for i := 0; i < len(queue); i++ {
		h, k, l := queue[i][0], queue[i][1], queue[i][2]
		var next [][3]int
		switch sys {
		case crystal.Tetragonal:
			next = [][3]int{{-k, h, l}, {k, h, l}, {h, k, -l}, {-h, -k, -l}}
		case crystal.Hexagonal:
			next = [][3]int{{-k, h + k, l}, {k, h, l}, {h, k, -l}, {-h, -k, -l}}
		default:
			next = [][3]int{{-h, k, l}, {h, -k, l}, {h, k, -l}}
		}
		for _, n := range next {
			if !seen[n] {
				seen[n] = true
				queue = append(queue, n)
			}
		}
	}
	return queue
}

// eachRepresentative calls f for every Laue-orbit representative with
// 0 < Q ≤ qMax² whose orbit the centring allows.
func eachRepresentative(sys crystal.System, cen Centring, p [3]float64, maxQ float64, f func(h, k, l int, q float64)) {
	lMax := int(math.Sqrt(maxQ / p[2]))
	for l := 0; l <= lMax; l++ {
		rest := maxQ - p[2]*float64(l*l)
		switch sys {
		case crystal.Orthorhombic:
			kMax := int(math.Sqrt(rest / p[1]))
			for k := 0; k <= kMax; k++ {
				hMax := int(math.Sqrt((rest - p[1]*float64(k*k)) / p[0]))
				for h := 0; h <= hMax; h++ {
					if Allowed(h, k, l, cen) {
						f(h, k, l, qOf(sys, p, h, k, l))
					}
				}
			}
		default:
			// h ≥ k ≥ 0, so A·h² ≤ Q in both forms.
			hMax := int(math.Sqrt(rest / p[0]))
			for h := 0; h <= hMax; h++ {
				for k := 0; k <= h; k++ {
					q := qOf(sys, p, h, k, l)
					if q > maxQ {
						break
					}
					if orbitAllowed(h, k, l, cen) {
						f(h, k, l, q)
					}
				}
			}
		}
	}
}

// Lines returns the allowed powder lines of a cell with 0 < q ≤ maxInverseD
// (Å⁻¹), in increasing q, one per Laue orbit (4/mmm, 6/mmm, mmm), with
//
//	tetragonal    1/d² = (h² + k²)/a² + l²/c²
//	hexagonal     1/d² = 4(h² + hk + k²)/(3a²) + l²/c²
//	orthorhombic  1/d² = h²/a² + k²/b² + l²/c²
//
// and the multiplicity counted over the orbit members the centring allows
// (for R under 6/mmm, half the members of a general orbit). Only the edges
// the system leaves free are read from cell.
//
// Reference: International Tables for Crystallography Vol. A,
// Table 2.2.13.1; d-spacing formulae, common practice.
func Lines(sys crystal.System, cen Centring, cell crystal.Cell, maxInverseD float64) ([]Line, error) {
	if !validCentring(sys, cen) {
		return nil, meltbook.Errorf(meltbook.Invalid, "centring", "%q is no centring of a %s lattice here", string(cen), sys)
	}
	edges := []float64{cell.A, cell.C}
	if sys == crystal.Orthorhombic {
		edges = append(edges, cell.B)
	}
	for _, e := range edges {
		if !(e > 0) || math.IsInf(e, 0) {
			return nil, meltbook.Errorf(meltbook.Invalid, "cell", "%g Å is not a positive length", e)
		}
	}
	if !(maxInverseD >= 0) || math.IsInf(maxInverseD, 0) {
		return nil, meltbook.Errorf(meltbook.Invalid, "maximum 1/d", "%g Å⁻¹ is not a finite non-negative number", maxInverseD)
	}
	p := constants(sys, cell)
	maxQ := maxInverseD * maxInverseD
	if n := maxQ / math.Min(p[0], math.Min(p[2], nonZero(p[1]))); n > 1e6 {
		return nil, meltbook.Errorf(meltbook.Invalid, "maximum 1/d", "%g Å⁻¹ asks for more than a million lines of this cell", maxInverseD)
	}
	var out []Line
	eachRepresentative(sys, cen, p, maxQ, func(h, k, l int, q float64) {
		m := 0
		for _, o := range laueOrbit(sys, [3]int{h, k, l}) {
			if Allowed(o[0], o[1], o[2], cen) {
				m++
			}
		}
		rep := [3]int{h, k, l}
		if !Allowed(h, k, l, cen) {
			rep = [3]int{k, h, l} // R: the mirror image is the allowed member
		}
		out = append(out, Line{InverseD: math.Sqrt(q), InverseDSquared: q, HKL: rep, Multiplicity: m})
	})
	sort.SliceStable(out, func(i, j int) bool { return out[i].InverseDSquared < out[j].InverseDSquared })
	return out, nil
}

func nonZero(x float64) float64 {
	if x == 0 {
		return math.Inf(1)
	}
	return x
}

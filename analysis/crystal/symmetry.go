package crystal

import (
	"math"

	"meltbook"
)

// Operation is a space-group operation on fractional coordinates,
//
//	x' = R·x + t
//
// with R an integer matrix and t a translation (fractions of the cell
// edges, in [0, 1) once normalised).
type Operation struct {
	R [3][3]int
	T [3]float64
}

// Apply returns R·x + t, not reduced into the cell.
func (o Operation) Apply(x [3]float64) [3]float64 {
	var y [3]float64
	for i := 0; i < 3; i++ {
		y[i] = o.T[i]
		for j := 0; j < 3; j++ {
			y[i] += float64(o.R[i][j]) * x[j]
		}
	}
	return y
}

// Identity is x, y, z.
var Identity = Operation{R: [3][3]int{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}}

// SpaceGroup is one space group in one setting, with every operation of
// the conventional cell (centring translations included).
type SpaceGroup struct {
	Number int    // 1 … 230
	HM     string // Hermann–Mauguin symbol of the setting, e.g. "P 63/m m c", "I 4/m c m"
	// Setting is the extension telling two settings of one symbol apart:
	// "1" or "2" (origin choice), "H" or "R" (hexagonal or rhombohedral
	// axes), "" when there is only one.
	Setting string
	Hall    string // Hall symbol, e.g. "-P 6c 2c"
	System  System
	// Centring is the lattice letter: P, A, B, C, I, F or R (R for the
	// hexagonal-axes setting of a rhombohedral group, P for its
	// rhombohedral-axes setting).
	Centring byte
	Ops      []Operation
}

// Wrap reduces each fractional coordinate into [0, 1).
func Wrap(x [3]float64) [3]float64 {
	for i := range x {
		x[i] -= math.Floor(x[i])
		if x[i] >= 1-1e-12 {
			x[i] = 0
		}
	}
	return x
}

// CheckGroup reports whether the operations form a group modulo lattice
// translations: the identity is among them and the product of any two,
//
//	(Ra, ta)·(Rb, tb) = (Ra·Rb, Ra·tb + ta)
//
// equals one of them up to a whole-cell translation (tolerance 10⁻⁴ in
// each translation component). Repeated operations are refused too.
//
// Reference: International Tables for Crystallography Vol. A, 1.2.2.
func (g SpaceGroup) CheckGroup() error {
	const tol = 1e-4
	find := func(op Operation) int {
		for i, o := range g.Ops {
			if o.EqualModLattice(op, tol) {
				return i
			}
		}
		return -1
	}
	if len(g.Ops) == 0 {
		return meltbook.Errorf(meltbook.Invalid, "symmetry operations", "there are none; give at least x,y,z")
	}
	if find(Identity) < 0 {
		return meltbook.Errorf(meltbook.Invalid, "symmetry operations", "the identity x,y,z is not among the %d operations", len(g.Ops))
	}
	for i, a := range g.Ops {
		for j := 0; j < i; j++ {
			if a.EqualModLattice(g.Ops[j], tol) {
				return meltbook.Errorf(meltbook.Invalid, "symmetry operations", "%s is given twice (operations %d and %d)", a, j+1, i+1)
			}
		}
	}
	for _, a := range g.Ops {
		for _, b := range g.Ops {
			if c := a.Compose(b); find(c) < 0 {
				return meltbook.Errorf(meltbook.Invalid, "symmetry operations", "do not form a group: %s followed by %s gives %s, which is not among them", b, a, c.Normalised())
			}
		}
	}
	return nil
}

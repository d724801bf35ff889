package crystal

import "math"

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
	Hall   string // Hall symbol, e.g. "-P 6c 2c"
	System System
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

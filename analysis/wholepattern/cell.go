package wholepattern

import (
	"math"

	"meltbook"
	"meltbook/analysis/crystal"
)

// cellKind says which constants of a cell are free.
type cellKind int

const (
	kindCubic        cellKind = iota // a
	kindTetragonal                   // a, c
	kindHexagonal                    // a, c; γ = 120°
	kindRhombohedral                 // a, α; a = b = c, α = β = γ
	kindOrthorhombic                 // a, b, c
	kindMonoclinicB                  // a, b, c, β
	kindMonoclinicC                  // a, b, c, γ (unique axis c)
	kindMonoclinicA                  // a, b, c, α (unique axis a)
	kindTriclinic                    // a, b, c, α, β, γ
)

// freeNames are the constants each kind refines, in parameter order.
var freeNames = map[cellKind][]string{
	kindCubic:        {"a"},
	kindTetragonal:   {"a", "c"},
	kindHexagonal:    {"a", "c"},
	kindRhombohedral: {"a", "alpha"},
	kindOrthorhombic: {"a", "b", "c"},
	kindMonoclinicB:  {"a", "b", "c", "beta"},
	kindMonoclinicC:  {"a", "b", "c", "gamma"},
	kindMonoclinicA:  {"a", "b", "c", "alpha"},
	kindTriclinic:    {"a", "b", "c", "alpha", "beta", "gamma"},
}

// kindOf chooses the parameterisation of a start cell in system sys. A
// trigonal cell is taken on hexagonal axes unless its γ is not 120° and
// its three angles are equal (rhombohedral axes); a monoclinic cell's
// unique axis is the one whose angle is not 90° (b when none is).
func kindOf(sys crystal.System, c crystal.Cell, field string) (cellKind, error) {
	near := func(x, v float64) bool { return math.Abs(x-v) < 1e-6 }
	switch sys {
	case crystal.Cubic:
		return kindCubic, nil
	case crystal.Tetragonal:
		return kindTetragonal, nil
	case crystal.Hexagonal:
		return kindHexagonal, nil
	case crystal.Trigonal:
		if !near(c.Gamma, 120) && c.Gamma != 0 && near(c.Alpha, c.Beta) && near(c.Beta, c.Gamma) {
			return kindRhombohedral, nil
		}
		return kindHexagonal, nil
	case crystal.Orthorhombic:
		return kindOrthorhombic, nil
	case crystal.Monoclinic:
		switch {
		case !near(c.Gamma, 90) && near(c.Alpha, 90) && near(c.Beta, 90):
			return kindMonoclinicC, nil
		case !near(c.Alpha, 90) && near(c.Beta, 90) && near(c.Gamma, 90):
			return kindMonoclinicA, nil
		}
		return kindMonoclinicB, nil
	case crystal.Triclinic:
		return kindTriclinic, nil
	}
	return 0, meltbook.Errorf(meltbook.Invalid, field, "%q is not a crystal system (cubic, tetragonal, hexagonal, trigonal, orthorhombic, monoclinic, triclinic)", string(sys))
}

// freeConstants returns the start values of the free constants of c.
func freeConstants(k cellKind, c crystal.Cell) []float64 {
	switch k {
	case kindCubic:
		return []float64{c.A}
	case kindTetragonal, kindHexagonal:
		return []float64{c.A, c.C}
	case kindRhombohedral:
		return []float64{c.A, c.Alpha}
	case kindOrthorhombic:
		return []float64{c.A, c.B, c.C}
	case kindMonoclinicB:
		return []float64{c.A, c.B, c.C, c.Beta}
	case kindMonoclinicC:
		return []float64{c.A, c.B, c.C, c.Gamma}
	case kindMonoclinicA:
		return []float64{c.A, c.B, c.C, c.Alpha}
	}
	return []float64{c.A, c.B, c.C, c.Alpha, c.Beta, c.Gamma}
}

// cellFrom builds the full cell from the free constants q.
func cellFrom(k cellKind, q []float64) crystal.Cell {
	switch k {
	case kindCubic:
		return crystal.Cell{A: q[0], B: q[0], C: q[0], Alpha: 90, Beta: 90, Gamma: 90}
	case kindTetragonal:
		return crystal.Cell{A: q[0], B: q[0], C: q[1], Alpha: 90, Beta: 90, Gamma: 90}
	case kindHexagonal:
		return crystal.Cell{A: q[0], B: q[0], C: q[1], Alpha: 90, Beta: 90, Gamma: 120}
	case kindRhombohedral:
		return crystal.Cell{A: q[0], B: q[0], C: q[0], Alpha: q[1], Beta: q[1], Gamma: q[1]}
	case kindOrthorhombic:
		return crystal.Cell{A: q[0], B: q[1], C: q[2], Alpha: 90, Beta: 90, Gamma: 90}
	case kindMonoclinicB:
		return crystal.Cell{A: q[0], B: q[1], C: q[2], Alpha: 90, Beta: q[3], Gamma: 90}
	case kindMonoclinicC:
		return crystal.Cell{A: q[0], B: q[1], C: q[2], Alpha: 90, Beta: 90, Gamma: q[3]}
	case kindMonoclinicA:
		return crystal.Cell{A: q[0], B: q[1], C: q[2], Alpha: q[3], Beta: 90, Gamma: 90}
	}
	return crystal.Cell{A: q[0], B: q[1], C: q[2], Alpha: q[3], Beta: q[4], Gamma: q[5]}
}

// cellSU spreads the standard uncertainties s of the free constants over
// the six constants of the cell: a constant tied to a free one (b = a in a
// cubic cell) carries its uncertainty; one fixed by symmetry carries zero.
func cellSU(k cellKind, s []float64) crystal.Cell {
	switch k {
	case kindCubic:
		return crystal.Cell{A: s[0], B: s[0], C: s[0]}
	case kindTetragonal, kindHexagonal:
		return crystal.Cell{A: s[0], B: s[0], C: s[1]}
	case kindRhombohedral:
		return crystal.Cell{A: s[0], B: s[0], C: s[0], Alpha: s[1], Beta: s[1], Gamma: s[1]}
	case kindOrthorhombic:
		return crystal.Cell{A: s[0], B: s[1], C: s[2]}
	case kindMonoclinicB:
		return crystal.Cell{A: s[0], B: s[1], C: s[2], Beta: s[3]}
	case kindMonoclinicC:
		return crystal.Cell{A: s[0], B: s[1], C: s[2], Gamma: s[3]}
	case kindMonoclinicA:
		return crystal.Cell{A: s[0], B: s[1], C: s[2], Alpha: s[3]}
	}
	return crystal.Cell{A: s[0], B: s[1], C: s[2], Alpha: s[3], Beta: s[4], Gamma: s[5]}
}

// isAngle reports whether free constant j of kind k is an angle.
func isAngle(k cellKind, j int) bool {
	n := freeNames[k][j]
	return n == "alpha" || n == "beta" || n == "gamma"
}

package crystal

import (
	"fmt"
	"math"

	"meltbook"
)

// Two copies of one site are the same atom when they lie within
// sameAtomDistance of each other, or, whatever the cell, within
// sameAtomFraction in fractional coordinates.
const (
	sameAtomDistance = 0.005 // Å
	sameAtomFraction = 1e-3  // fraction of the cell edges (Euclidean)
)

// Atoms returns every atom of the cell: each operation of Group.Ops is
// applied to each site, x' = R·x + t, and the result wrapped into [0, 1).
// Copies of one site that fall on each other are kept once: two copies
// are merged when their separation, taken to the nearest lattice image,
//
//	Δ = x₁ − x₂ − round(x₁ − x₂),   |Δ| = √(Δᵀ G Δ)
//
// is at most 0.005 Å with the cell metric G, or when √(Δ·Δ) < 10⁻³ in
// fractional units (which also covers a cell not yet valid). Copies of
// different sites are never merged: sites of mixed occupancy legitimately
// share a position. An empty Group.Ops is taken as the identity alone.
//
// Atoms come site by site in the order of Sites, and for each site in the
// order of the operations.
//
// Reference: International Tables for Crystallography Vol. A, ch. 1.4
// (general and special positions, Wyckoff multiplicities).
func (s Structure) Atoms() []Atom {
	ops := s.Group.Ops
	if len(ops) == 0 {
		ops = []Operation{Identity}
	}
	g := s.Cell.Metric()
	metricOK := s.Cell.Validate() == nil
	var atoms []Atom
	for i, site := range s.Sites {
		first := len(atoms)
		for _, op := range ops {
			x := Wrap(op.Apply(site.Fract))
			dup := false
			for _, a := range atoms[first:] {
				if sameAtom(a.Fract, x, g, metricOK) {
					dup = true
					break
				}
			}
			if !dup {
				atoms = append(atoms, Atom{Site: i, Fract: x})
			}
		}
	}
	return atoms
}

// sameAtom reports whether fractional positions a and b are one atom.
func sameAtom(a, b [3]float64, g [3][3]float64, metricOK bool) bool {
	var d [3]float64
	f2 := 0.0
	for i := range d {
		d[i] = a[i] - b[i]
		d[i] -= math.Round(d[i])
		f2 += d[i] * d[i]
	}
	if f2 < sameAtomFraction*sameAtomFraction {
		return true
	}
	if !metricOK {
		return false
	}
	l2 := 0.0
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			l2 += d[i] * g[i][j] * d[j]
		}
	}
	return l2 <= sameAtomDistance*sameAtomDistance
}

// Validate checks the structure: a valid cell; operations whose matrices
// have determinant ±1 and finite translations, the identity among them
// (modulo lattice translations) when any are given; and sites with unique
// non-empty labels, an element symbol, finite coordinates, occupancy in
// (0, 1] and U ≥ 0. It does not look the element up in a table, nor check
// that the operations form a group (see SpaceGroup.CheckGroup).
func (s Structure) Validate() error {
	if err := s.Cell.Validate(); err != nil {
		return err
	}
	hasIdentity := len(s.Group.Ops) == 0
	for i, op := range s.Group.Ops {
		if d := op.Determinant(); d != 1 && d != -1 {
			return meltbook.Errorf(meltbook.Invalid, fmt.Sprintf("symmetry operation %d", i+1), "%s has determinant %d, not ±1", op, d)
		}
		for _, t := range op.T {
			if math.IsNaN(t) || math.IsInf(t, 0) {
				return meltbook.Errorf(meltbook.Invalid, fmt.Sprintf("symmetry operation %d", i+1), "translation %g is not a finite number", t)
			}
		}
		if op.EqualModLattice(Identity, 1e-6) {
			hasIdentity = true
		}
	}
	if !hasIdentity {
		return meltbook.Errorf(meltbook.Invalid, "symmetry operations", "the identity x,y,z is not among the %d operations", len(s.Group.Ops))
	}
	labels := make(map[string]bool, len(s.Sites))
	for i, site := range s.Sites {
		field := fmt.Sprintf("site %d", i+1)
		if site.Label != "" {
			field = "site " + site.Label
		}
		switch {
		case site.Label == "":
			return meltbook.Errorf(meltbook.Invalid, field, "has no label")
		case labels[site.Label]:
			return meltbook.Errorf(meltbook.Invalid, field, "the label %q is used by an earlier site", site.Label)
		case site.Element == "":
			return meltbook.Errorf(meltbook.Invalid, field, "has no element")
		case !(site.Occupancy > 0 && site.Occupancy <= 1):
			return meltbook.Errorf(meltbook.Invalid, field, "occupancy %g is not in (0, 1]", site.Occupancy)
		case !(site.UisoA2 >= 0) || math.IsInf(site.UisoA2, 0):
			return meltbook.Errorf(meltbook.Invalid, field, "U = %g Å² is not a finite number ≥ 0", site.UisoA2)
		}
		for _, x := range site.Fract {
			if math.IsNaN(x) || math.IsInf(x, 0) {
				return meltbook.Errorf(meltbook.Invalid, field, "coordinate %g is not a finite number", x)
			}
		}
		labels[site.Label] = true
	}
	return nil
}

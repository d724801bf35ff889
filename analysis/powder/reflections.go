package powder

import (
	"cmp"
	"math"
	"slices"

	"meltbook"
	"meltbook/analysis/crystal"
)

// Reflection is one family of symmetry-equivalent reflections: (hkl) and
// its equivalents under the rotations of the point group together with
// Friedel's −h−k−l, i.e. the Laue class.
type Reflection struct {
	HKL          [3]int  // representative: fewest negative indices, then largest (h, k, l) in lexicographic order
	Multiplicity int     // number of distinct (h, k, l) in the family
	DSpacingA    float64 // Å
}

// absenceTolerance is how far h·t may lie from a whole number and still
// count as one: translations are multiples of 1/24, so a phase that is not
// whole differs from one by at least 1/24.
const absenceTolerance = 1e-6

// metricTolerance is the relative mismatch allowed between G* and R G* Rᵀ
// for a rotation R to be accepted as a symmetry of the cell.
const metricTolerance = 1e-4

// maxLatticePoints bounds the box of indices searched (one byte each), so
// that a very large cell or a tiny d cannot exhaust memory.
const maxLatticePoints = 5e7

// family is a Reflection with its 1/d² in Å⁻².
type family struct {
	Reflection
	invD2 float64
}

// Reflections lists every family of reflections with d ≥ dMinA (Å) that
// the space group allows, sorted by decreasing d, then by increasing HKL.
//
// Families: two reflections are equivalent when h′ = h·R or h′ = −h·R for
// a rotation R of the operations (Laue class; no anomalous dispersion).
// The multiplicity is the number of distinct members. The representative
// is the member with the fewest negative indices and, among those, the
// largest in lexicographic order (h, then k, then l): 210 in a cubic
// group, 110 rather than 2−10 in a hexagonal one, 012 rather than 10−2.
//
// Systematic absences follow from the operations themselves: with atoms at
// R·x + t, the structure factor obeys F(h·R) = exp(−2πi h·t)·F(h), so a
// reflection is absent whatever the atoms when some operation (R, t) has
//
//	h·R = h   and   exp(2πi h·t) ≠ 1   (h·t not a whole number)
//
// An empty operation list is taken as the identity alone (P1). The
// rotations must leave the reciprocal metric unchanged (R G* Rᵀ = G*);
// operations that do not fit the cell are an error.
//
// Reference: International Tables for Crystallography Vol. A, §1.6.3
// (general reflection conditions) and Vol. B, §1.4.2 (structure-factor
// symmetry).
func Reflections(s crystal.Structure, dMinA float64) ([]Reflection, error) {
	fams, err := families(s, dMinA)
	if err != nil {
		return nil, err
	}
	out := make([]Reflection, len(fams))
	for i, f := range fams {
		out[i] = f.Reflection
	}
	return out, nil
}

// rotations returns the distinct rotation matrices of ops, or the identity
// when ops is empty.
func rotations(ops []crystal.Operation) [][3][3]int {
	if len(ops) == 0 {
		return [][3][3]int{crystal.Identity.R}
	}
	var rs [][3][3]int
next:
	for _, op := range ops {
		for _, r := range rs {
			if r == op.R {
				continue next
			}
		}
		rs = append(rs, op.R)
	}
	return rs
}

// times returns the row vector h·R.
func times(h [3]int, r *[3][3]int) [3]int {
	return [3]int{
		h[0]*r[0][0] + h[1]*r[1][0] + h[2]*r[2][0],
		h[0]*r[0][1] + h[1]*r[1][1] + h[2]*r[2][1],
		h[0]*r[0][2] + h[1]*r[1][2] + h[2]*r[2][2],
	}
}

func lexLess(a, b [3]int) bool {
	if a[0] != b[0] {
		return a[0] < b[0]
	}
	if a[1] != b[1] {
		return a[1] < b[1]
	}
	return a[2] < b[2]
}

// negatives counts the negative indices of h.
func negatives(h [3]int) int {
	n := 0
	for _, v := range h {
		if v < 0 {
			n++
		}
	}
	return n
}

// checkMetric reports an error when rotation r does not preserve the
// reciprocal metric gs: (R G* Rᵀ)ᵢⱼ must equal G*ᵢⱼ.
func checkMetric(r [3][3]int, gs [3][3]float64, op crystal.Operation) error {
	scale := math.Max(gs[0][0], math.Max(gs[1][1], gs[2][2]))
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			v := 0.0
			for k := 0; k < 3; k++ {
				for l := 0; l < 3; l++ {
					v += float64(r[i][k]) * gs[k][l] * float64(r[j][l])
				}
			}
			if math.Abs(v-gs[i][j]) > metricTolerance*scale {
				return meltbook.Errorf(meltbook.Invalid, "symmetry operation", "%s is not a symmetry of the cell: it changes the lattice metric", op)
			}
		}
	}
	return nil
}

// families enumerates the allowed families with d ≥ dMinA.
func families(s crystal.Structure, dMinA float64) ([]family, error) {
	if err := s.Cell.Validate(); err != nil {
		return nil, err
	}
	if !(dMinA > 0) || math.IsInf(dMinA, 0) {
		return nil, meltbook.Errorf(meltbook.Invalid, "minimum d-spacing", "%g Å is not a positive length", dMinA)
	}
	ops := s.Group.Ops
	if len(ops) == 0 {
		ops = []crystal.Operation{crystal.Identity}
	}
	gs := s.Cell.ReciprocalMetric()
	rots := rotations(ops)
	for _, r := range rots {
		for _, op := range ops {
			if op.R == r {
				if err := checkMetric(r, gs, op); err != nil {
					return nil, err
				}
				break
			}
		}
	}
	// Laue class: the rotations and their negatives, without repeats.
	laue := make([][3][3]int, 0, 2*len(rots))
	seen := map[[3][3]int]bool{}
	for _, r := range rots {
		var m [3][3]int
		for i := range r {
			for j := range r[i] {
				m[i][j] = -r[i][j]
			}
		}
		for _, x := range [][3][3]int{r, m} {
			if !seen[x] {
				seen[x] = true
				laue = append(laue, x)
			}
		}
	}

	// |h| = |a·g| ≤ a/d for every reflection g with d ≥ dMin.
	limit := [3]int{
		int(s.Cell.A/dMinA + 1e-9),
		int(s.Cell.B/dMinA + 1e-9),
		int(s.Cell.C/dMinA + 1e-9),
	}
	n := [3]int{2*limit[0] + 1, 2*limit[1] + 1, 2*limit[2] + 1}
	if float64(n[0])*float64(n[1])*float64(n[2]) > maxLatticePoints {
		return nil, meltbook.Errorf(meltbook.Invalid, "minimum d-spacing", "%g Å in a cell of %.4g × %.4g × %.4g Å would list more than %g lattice points; choose a larger d", dMinA, s.Cell.A, s.Cell.B, s.Cell.C, maxLatticePoints)
	}
	visited := make([]bool, n[0]*n[1]*n[2])
	maxInv := 1 / (dMinA * dMinA) * (1 + 1e-12)
	// Only operations with a translation can cause absences.
	var translated []crystal.Operation
	for _, op := range ops {
		for _, t := range op.T {
			if math.Abs(t-math.Round(t)) > absenceTolerance {
				translated = append(translated, op)
				break
			}
		}
	}
	// Expected count: lattice points in the sphere, (4π/3)·V/d³, over the
	// Laue-class order.
	expect := 4 * math.Pi / 3 * s.Cell.Volume() / (dMinA * dMinA * dMinA) / float64(len(laue))
	out := make([]family, 0, int(expect*1.2)+16)
	var outside [][3]int // members beyond the box, kept apart (rounding at its edge)
	// Every family holds h and −h, so the half space h > 0, or h = 0 and
	// k > 0, or h = k = 0 and l > 0 meets each one. For each (h, k) the l
	// inside the sphere solve A l² + B l + C ≤ 1/d²min.
	for h := 0; h <= limit[0]; h++ {
		kFrom := -limit[1]
		if h == 0 {
			kFrom = 0
		}
		for k := kFrom; k <= limit[1]; k++ {
			fh, fk := float64(h), float64(k)
			a := gs[2][2]
			b := 2 * (fh*gs[0][2] + fk*gs[1][2])
			c := fh*fh*gs[0][0] + fk*fk*gs[1][1] + 2*fh*fk*gs[0][1]
			disc := b*b - 4*a*(c-maxInv)
			if disc < 0 {
				continue
			}
			root := math.Sqrt(disc)
			lFrom := max(-limit[2], int(math.Floor((-b-root)/(2*a)))-1)
			lTo := min(limit[2], int(math.Ceil((-b+root)/(2*a)))+1)
			if h == 0 && k == 0 {
				lFrom = max(lFrom, 1)
			}
			for l := lFrom; l <= lTo; l++ {
				hkl := [3]int{h, k, l}
				if visited[((h+limit[0])*n[1]+(k+limit[1]))*n[2]+l+limit[2]] {
					continue
				}
				inv := invDSquared(gs, hkl)
				if inv > maxInv {
					continue
				}
				// The members of an unvisited family are all unvisited, so
				// the visited marks also tell repeats within the family.
				rep, mult := hkl, 0
				repNeg := negatives(hkl)
				outside = outside[:0]
				for ri := range laue {
					m := times(hkl, &laue[ri])
					j := ((m[0]+limit[0])*n[1]+(m[1]+limit[1]))*n[2] + m[2] + limit[2]
					if uint(m[0]+limit[0]) < uint(n[0]) && uint(m[1]+limit[1]) < uint(n[1]) && uint(m[2]+limit[2]) < uint(n[2]) {
						if visited[j] {
							continue
						}
						visited[j] = true
					} else if slices.Contains(outside, m) {
						continue
					} else {
						outside = append(outside, m)
					}
					mult++
					if neg := negatives(m); neg < repNeg || (neg == repNeg && lexLess(rep, m)) {
						rep, repNeg = m, neg
					}
				}
				if absent(rep, translated) {
					continue
				}
				out = append(out, family{
					Reflection: Reflection{HKL: rep, Multiplicity: mult, DSpacingA: 1 / math.Sqrt(inv)},
					invD2:      inv,
				})
			}
		}
	}
	sortFamilies(out)
	return out, nil
}

// sortFamilies orders families by increasing 1/d², families whose 1/d²
// agree to 1e-10 relative (equal d by symmetry or by accident) by
// increasing HKL. It sorts compact keys and then fixes the order of runs
// of equal d.
func sortFamilies(fams []family) {
	type key struct {
		inv float64
		i   int
	}
	keys := make([]key, len(fams))
	for i, f := range fams {
		keys[i] = key{f.invD2, i}
	}
	slices.SortFunc(keys, func(a, b key) int { return cmp.Compare(a.inv, b.inv) })
	sorted := make([]family, len(fams))
	for i, k := range keys {
		sorted[i] = fams[k.i]
	}
	for i := 0; i < len(sorted); {
		j := i + 1
		for j < len(sorted) && sorted[j].invD2-sorted[i].invD2 <= 1e-10*sorted[j].invD2 {
			j++
		}
		if j-i > 1 {
			slices.SortFunc(sorted[i:j], func(a, b family) int { return slices.Compare(a.HKL[:], b.HKL[:]) })
		}
		i = j
	}
	copy(fams, sorted)
}

// invDSquared returns hᵀ G* h in Å⁻².
func invDSquared(gs [3][3]float64, h [3]int) float64 {
	x, y, z := float64(h[0]), float64(h[1]), float64(h[2])
	return x*x*gs[0][0] + y*y*gs[1][1] + z*z*gs[2][2] +
		2*(x*y*gs[0][1]+x*z*gs[0][2]+y*z*gs[1][2])
}

// absent reports whether some operation (R, t) with h·R = h gives h·t a
// fractional part.
func absent(h [3]int, ops []crystal.Operation) bool {
	for i := range ops {
		op := &ops[i]
		if times(h, &op.R) != h {
			continue
		}
		p := float64(h[0])*op.T[0] + float64(h[1])*op.T[1] + float64(h[2])*op.T[2]
		if math.Abs(p-math.Round(p)) > absenceTolerance {
			return true
		}
	}
	return false
}

package lattice

import (
	"math"
	"sort"

	"meltbook"
	"meltbook/analysis/crystal"
)

func (o *Options) defaults() {
	if len(o.Systems) == 0 {
		o.Systems = []crystal.System{crystal.Tetragonal, crystal.Hexagonal}
	}
	if o.MinEdge == 0 {
		o.MinEdge = 2
	}
	if o.MaxEdge == 0 {
		o.MaxEdge = 25
	}
	if o.MaxVolume == 0 {
		o.MaxVolume = 2000
	}
	if o.ProposalLines == 0 {
		o.ProposalLines = 7
	}
	if o.MaxSolutions == 0 {
		o.MaxSolutions = 10
	}
}

func validate(peaks []Peak, o Options) error {
	if len(peaks) < 4 {
		return meltbook.Errorf(meltbook.Invalid, "peaks", "%d peaks are too few to index a lattice of two or three constants (4 at least)", len(peaks))
	}
	for i, p := range peaks {
		if !(p.InverseD > 0) || math.IsInf(p.InverseD, 0) {
			return meltbook.Errorf(meltbook.Invalid, "peaks", "peak %d: 1/d = %g Å⁻¹ is not a positive number", i+1, p.InverseD)
		}
		if !(p.Tolerance > 0) || p.Tolerance >= p.InverseD {
			return meltbook.Errorf(meltbook.Invalid, "peaks", "peak %d: tolerance %g Å⁻¹ must be positive and below 1/d", i+1, p.Tolerance)
		}
		if !(p.Intensity >= 0) || math.IsInf(p.Intensity, 0) {
			return meltbook.Errorf(meltbook.Invalid, "peaks", "peak %d: intensity %g is not a finite non-negative number", i+1, p.Intensity)
		}
		if i > 0 && p.InverseD < peaks[i-1].InverseD {
			return meltbook.Errorf(meltbook.Invalid, "peaks", "peak %d: 1/d = %g Å⁻¹ is below the peak before it; sort the peaks by 1/d", i+1, p.InverseD)
		}
	}
	for _, s := range o.Systems {
		if centrings[s] == nil {
			return meltbook.Errorf(meltbook.Invalid, "systems", "%q is not searched here (tetragonal, hexagonal, orthorhombic)", string(s))
		}
	}
	for _, c := range o.Centrings {
		ok := false
		for _, s := range o.Systems {
			ok = ok || validCentring(s, c)
		}
		if !ok {
			return meltbook.Errorf(meltbook.Invalid, "centrings", "%q is no centring of the systems searched", string(c))
		}
	}
	if !(o.MinEdge > 0 && o.MaxEdge >= o.MinEdge) || math.IsInf(o.MaxEdge, 0) {
		return meltbook.Errorf(meltbook.Invalid, "edges", "edge bounds %g–%g Å are not a finite positive range", o.MinEdge, o.MaxEdge)
	}
	if !(o.MaxVolume > 0) {
		return meltbook.Errorf(meltbook.Invalid, "volume", "maximum volume %g Å³ is not positive", o.MaxVolume)
	}
	if o.ProposalLines < 3 || o.MaxSolutions < 0 {
		return meltbook.Errorf(meltbook.Invalid, "proposal lines", "%d proposal lines are too few (3 at least)", o.ProposalLines)
	}
	return nil
}

type found struct {
	fam family
	t   trial
	vol float64
}

func (f found) score(peaks int) float64 {
	return f.t.m20 * math.Pow(float64(f.t.indexed)/float64(peaks), 6)
}

// Search indexes peaks with the lattices of opt and returns the solutions
// ranked best first by
//
//	score = M20 · (indexed peaks / peaks)⁶
//
// Peaks are q = 1/d in Å⁻¹ sorted ascending, at least four; the search and
// its rules are described in the package documentation. A peak list no
// lattice indexes gives no solutions and no error.
//
// Reference: P. M. de Wolff, J. Appl. Cryst. 1, 108 (1968) (M20);
// trial-and-error indexing in Q, common practice.
func Search(peaks []Peak, opt Options) ([]Solution, error) {
	opt.defaults()
	if err := validate(peaks, opt); err != nil {
		return nil, err
	}
	var all []found
	for _, sys := range opt.Systems {
		for _, cen := range centrings[sys] {
			if len(opt.Centrings) > 0 && !containsCentring(opt.Centrings, cen) {
				continue
			}
			fam := family{sys: sys, cen: cen, n: 2}
			if sys == crystal.Orthorhombic {
				fam.n = 3
			}
			s := newSearcher(fam, peaks, opt)
			if fam.n == 2 {
				s.proposePairs()
			} else {
				s.proposeTriples()
			}
			for _, p := range s.candidates {
				if t, ok := s.evaluate(p); ok {
					canonicalise(fam, &t)
					if fam.sys == crystal.Orthorhombic && higherSymmetry(fam.cen, t.p) {
						continue
					}
					all = append(all, found{fam: fam, t: t, vol: volumeOf(sys, t.p)})
				}
			}
		}
	}
	sort.SliceStable(all, func(i, j int) bool {
		if all[i].vol != all[j].vol {
			return all[i].vol < all[j].vol
		}
		return all[i].t.m20 > all[j].t.m20
	})
	var kept []found
	for _, f := range all {
		covered := false
		for _, k := range kept {
			if subset(f.t.set, k.t.set) {
				covered = true
				break
			}
		}
		if !covered {
			kept = append(kept, f)
		}
	}
	sort.SliceStable(kept, func(i, j int) bool { return kept[i].score(len(peaks)) > kept[j].score(len(peaks)) })
	if len(kept) > opt.MaxSolutions {
		kept = kept[:opt.MaxSolutions]
	}
	out := make([]Solution, 0, len(kept))
	for _, f := range kept {
		out = append(out, solution(f, peaks))
	}
	return out, nil
}

func containsCentring(cs []Centring, c Centring) bool {
	for _, x := range cs {
		if x == c {
			return true
		}
	}
	return false
}

func subset(a, b []uint64) bool {
	for i := range a {
		if a[i]&^b[i] != 0 {
			return false
		}
	}
	return true
}

// canonicalise orders orthorhombic edges a ≤ b ≤ c (a ≤ b for C, whose
// centred face stays ab), permuting the indices alike.
func canonicalise(fam family, t *trial) {
	if fam.sys != crystal.Orthorhombic {
		return
	}
	perm := []int{0, 1, 2}
	if fam.cen == BaseCentred {
		if t.p[0] < t.p[1] {
			perm = []int{1, 0, 2}
		}
	} else {
		sort.Slice(perm, func(i, j int) bool { return t.p[perm[i]] > t.p[perm[j]] })
	}
	var p, sg [3]float64
	for i, j := range perm {
		p[i], sg[i] = t.p[j], t.sigma[j]
	}
	t.p, t.sigma = p, sg
	for n, h := range t.hkl {
		t.hkl[n] = [3]int{h[perm[0]], h[perm[1]], h[perm[2]]}
	}
}

func near(x, y float64) bool { return math.Abs(x-y) <= 1e-3*y }

// higherSymmetry reports an orthorhombic metric that is tetragonal (two
// equal edges; b = a for C is tetragonal P of edge a/√2) or hexagonal
// (C with b = a√3).
func higherSymmetry(cen Centring, p [3]float64) bool {
	a, b, c := 1/math.Sqrt(p[0]), 1/math.Sqrt(p[1]), 1/math.Sqrt(p[2])
	if near(a, b) || near(b, c) || near(a, c) {
		return true
	}
	return cen == BaseCentred && (near(b, a*math.Sqrt(3)) || near(a, b*math.Sqrt(3)))
}

// pseudoCubic reports a tetragonal or rhombohedral metric that is cubic:
//
//	tetragonal P, I   c/a = 1
//	tetragonal P      c/a = 1/√2        (its lines 2(h² + k²) + 4l² hold every
//	                                     line of cubic I with a = a_t√2)
//	tetragonal I      c/a = √2          (cubic F: a_t = a/√2, c_t = a)
//	hexagonal R       c/a = √6          (cubic F: a_h = a/√2, c_h = a√3)
//	                  c/a = √(3/2)      (cubic P: a_h = a√2, c_h = a√3)
//	                  c/a = √(3/8)      (cubic I: a_h = a√2, c_h = a√3/2)
//
// within three standard uncertainties of c/a or 0.1 %, whichever is wider.
//
// Reference: International Tables for Crystallography Vol. A, the
// tetragonal and rhombohedral descriptions of the cubic lattices, common
// practice.
func pseudoCubic(sys crystal.System, cen Centring, cell, sigma crystal.Cell) bool {
	r := cell.C / cell.A
	sr := r * math.Hypot(sigma.A/cell.A, sigma.C/cell.C)
	tol := math.Max(3*sr, 1e-3*r)
	var ratios []float64
	switch {
	case sys == crystal.Tetragonal && cen == Primitive:
		ratios = []float64{1, 1 / math.Sqrt2}
	case sys == crystal.Tetragonal && cen == BodyCentred:
		ratios = []float64{1, math.Sqrt2}
	case sys == crystal.Hexagonal && cen == Rhombohedral:
		ratios = []float64{math.Sqrt(6), math.Sqrt(1.5), math.Sqrt(3.0 / 8)}
	}
	for _, x := range ratios {
		if math.Abs(r-x) <= tol {
			return true
		}
	}
	return false
}

func solution(f found, peaks []Peak) Solution {
	t := f.t
	sys := f.fam.sys
	cell := cellOf(sys, t.p)
	// each edge is e = k·p^(−1/2), so σ_e = e·σ_p/(2p)
	se := func(e float64, i int) float64 { return e * t.sigma[i] / (2 * t.p[i]) }
	unc := crystal.Cell{A: se(cell.A, 0), C: se(cell.C, 2)}
	if sys == crystal.Orthorhombic {
		unc.B = se(cell.B, 1)
	} else {
		unc.B = unc.A
	}
	sol := Solution{
		System: sys, Centring: f.fam.cen, Cell: cell, CellUncertainty: unc,
		Volume: f.vol, Peaks: make([]Assignment, len(peaks)), Indexed: t.indexed,
		M20: t.m20, N20: t.n20,
	}
	lastQ := 0.0
	for i, p := range peaks {
		if !t.ok[i] {
			continue
		}
		qo := p.InverseD * p.InverseD
		sol.Peaks[i] = Assignment{Indexed: true, HKL: t.hkl[i],
			ResidualInverseD: p.InverseD - math.Sqrt(t.calc[i]), ResidualInverseDSquared: qo - t.calc[i]}
		lastQ = qo
	}
	lines, _ := Lines(sys, f.fam.cen, cell, math.Sqrt(lastQ)*(1+1e-9))
	prev := -1.0
	for _, ln := range lines {
		if ln.InverseDSquared-prev > 1e-9*ln.InverseDSquared {
			sol.LinesToLast++
		}
		prev = ln.InverseDSquared
		if !observed(ln.InverseD, peaks) {
			sol.Unobserved = append(sol.Unobserved, ln)
		}
	}
	sol.PseudoCubic = pseudoCubic(sys, f.fam.cen, cell, unc)
	sol.Score = f.score(len(peaks))
	return sol
}

// observed reports a peak within its tolerance of q.
func observed(q float64, peaks []Peak) bool {
	i := sort.Search(len(peaks), func(i int) bool { return peaks[i].InverseD >= q })
	for j := i - 3; j <= i+3; j++ {
		if j >= 0 && j < len(peaks) && math.Abs(peaks[j].InverseD-q) <= peaks[j].Tolerance {
			return true
		}
	}
	return false
}

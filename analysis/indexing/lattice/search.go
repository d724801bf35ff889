package lattice

import (
	"math"
	"sort"

	"meltbook/analysis/crystal"
)

// Peak is one observed powder peak.
type Peak struct {
	InverseD  float64 // q = 1/d, Å⁻¹
	Tolerance float64 // largest accepted |q_obs − q_calc|, Å⁻¹
	Intensity float64 // relative, any positive scale
}

// Options bound the search. Zero values take the defaults given.
type Options struct {
	Systems          []crystal.System // default tetragonal and hexagonal
	Centrings        []Centring       // default every centring of each system (see Centrings)
	MinEdge, MaxEdge float64          // Å, default 2 and 25
	MaxVolume        float64          // Å³, default 2000
	ProposalLines    int              // lowest lines used to propose cells, default 7
	StrictProposals  bool             // every proposal line must be explained (default: all but one)
	MaxSolutions     int              // default 10
}

// Assignment is the indexing of one observed peak.
type Assignment struct {
	Indexed                 bool
	HKL                     [3]int  // allowed reflection nearest the peak (zero when not indexed)
	ResidualInverseD        float64 // q_obs − q_calc, Å⁻¹
	ResidualInverseDSquared float64 // Q_obs − Q_calc, Å⁻²
}

// Solution is one indexed cell.
type Solution struct {
	System          crystal.System
	Centring        Centring
	Cell            crystal.Cell // conventional cell, Å and degrees
	CellUncertainty crystal.Cell // standard uncertainties of the free edges, Å (angles zero)
	Volume          float64      // Å³
	Peaks           []Assignment // one per input peak, in input order
	Indexed         int          // peaks indexed
	M20             float64      // de Wolff's figure of merit over the first 20 indexed peaks (fewer when fewer are indexed)
	N20             int          // distinct calculated Q up to the last of those peaks
	LinesToLast     int          // distinct calculated Q up to the last indexed peak
	Unobserved      []Line       // allowed lines below the last indexed peak with no peak within tolerance
	PseudoCubic     bool         // the metric is that of a cubic lattice (see the package documentation)
	Score           float64      // M20·(Indexed/len(peaks))⁶, the ranking key
}

type family struct {
	sys crystal.System
	cen Centring
	n   int // free constants
}

// feature returns the coefficients of the constants in Q for hkl.
func (f family) feature(h, k, l int) [3]float64 {
	switch f.sys {
	case crystal.Hexagonal:
		return [3]float64{float64(h*h + h*k + k*k), float64(l * l), 0}
	case crystal.Orthorhombic:
		return [3]float64{float64(h * h), float64(k * k), float64(l * l)}
	}
	return [3]float64{float64(h*h + k*k), float64(l * l), 0}
}

// params maps the solved coefficients (in feature order) to (A, B, C).
func (f family) params(x [3]float64) [3]float64 {
	if f.n == 2 {
		return [3]float64{x[0], 0, x[1]}
	}
	return x
}

func (f family) unknowns(p [3]float64) [3]float64 {
	if f.n == 2 {
		return [3]float64{p[0], p[2], 0}
	}
	return p
}

func volumeOf(sys crystal.System, p [3]float64) float64 {
	switch sys {
	case crystal.Hexagonal:
		return 2 / (math.Sqrt(3) * p[0] * math.Sqrt(p[2]))
	case crystal.Orthorhombic:
		return 1 / math.Sqrt(p[0]*p[1]*p[2])
	}
	return 1 / (p[0] * math.Sqrt(p[2]))
}

type searcher struct {
	fam        family
	q, tol     []float64 // Q = 1/d² and its tolerance 2q·δq, Å⁻²
	lo, hi     [3]float64
	maxVolume  float64
	table      []uint8 // tetragonal, hexagonal: bit l mod 6 set when some orbit with this m and l is allowed
	hyps       [][3]float64
	proposal   int
	misses     int
	candidates [][3]float64
	seen       map[[3]int32]bool
}

func newSearcher(fam family, peaks []Peak, opt Options) *searcher {
	s := &searcher{fam: fam, maxVolume: opt.MaxVolume, seen: map[[3]int32]bool{}}
	s.q = make([]float64, len(peaks))
	s.tol = make([]float64, len(peaks))
	for i, p := range peaks {
		s.q[i] = p.InverseD * p.InverseD
		s.tol[i] = 2 * p.InverseD * p.Tolerance
	}
	lo, hi := 1/(opt.MaxEdge*opt.MaxEdge), 1/(opt.MinEdge*opt.MinEdge)
	s.lo, s.hi = [3]float64{lo, lo, lo}, [3]float64{hi, hi, hi}
	if fam.sys == crystal.Hexagonal {
		s.lo[0], s.hi[0] = 4*lo/3, 4*hi/3
	}
	maxQ := s.q[len(s.q)-1] + s.tol[len(s.tol)-1]
	if fam.n == 2 {
		mMax := int(maxQ/s.lo[0]) + 2
		s.table = make([]uint8, mMax+1)
		for h := 0; h*h <= mMax; h++ {
			for k := 0; k <= h; k++ {
				m := int(fam.feature(h, k, 0)[0])
				if m > mMax {
					break
				}
				for r := 0; r < 6; r++ {
					if orbitAllowed(h, k, r+6, fam.cen) {
						s.table[m] |= 1 << r
					}
				}
			}
		}
	}
	seen := map[[3]float64]bool{}
	small := 2
	if fam.n == 2 {
		small = 3
	}
	for l := 0; l <= small+1; l++ {
		for h := 0; h <= small; h++ {
			for k := 0; k <= small; k++ {
				if fam.n == 2 && k > h || fam.n == 3 && l > small || !orbitAllowed(h, k, l, fam.cen) {
					continue
				}
				f := fam.feature(h, k, l)
				if !seen[f] {
					seen[f] = true
					s.hyps = append(s.hyps, f)
				}
			}
		}
	}
	s.proposal = opt.ProposalLines
	if s.proposal > len(peaks) {
		s.proposal = len(peaks)
	}
	if !opt.StrictProposals {
		s.misses = (s.proposal - fam.n) / 2
	}
	return s
}

// explain returns the allowed reflection nearest to Q within tol.
func (s *searcher) explain(p [3]float64, q, tol float64) (hkl [3]int, calc float64, ok bool) {
	best := math.Inf(1)
	if s.fam.n == 2 {
		a, c := p[0], p[2]
		for l := 0; ; l++ {
			cl := c * float64(l*l)
			if cl > q+tol {
				break
			}
			lo := int(math.Ceil((q - tol - cl) / a))
			hi := int(math.Floor((q + tol - cl) / a))
			if lo < 0 {
				lo = 0
			}
			if hi >= len(s.table) {
				hi = len(s.table) - 1
			}
			for m := lo; m <= hi; m++ {
				if s.table[m]>>(l%6)&1 == 0 || m == 0 && l == 0 {
					continue
				}
				qc := a*float64(m) + cl
				if r := math.Abs(q - qc); r < best {
					best, calc, ok = r, qc, true
					hkl = [3]int{m, l, 0} // resolved to h, k by indices
				}
			}
		}
		if ok {
			hkl = s.indices(hkl[0], hkl[1])
		}
		return hkl, calc, ok
	}
	for l := 0; ; l++ {
		cl := p[2] * float64(l*l)
		if cl > q+tol {
			break
		}
		for k := 0; ; k++ {
			bk := cl + p[1]*float64(k*k)
			if bk > q+tol {
				break
			}
			x := (q - bk) / p[0]
			h0 := int(math.Sqrt(math.Max(x, 0)))
			for h := h0; h <= h0+1; h++ {
				if !Allowed(h, k, l, s.fam.cen) {
					continue
				}
				qc := bk + p[0]*float64(h*h)
				if r := math.Abs(q - qc); r <= tol && r < best {
					best, calc, ok = r, qc, true
					hkl = [3]int{h, k, l}
				}
			}
		}
	}
	return hkl, calc, ok
}

// indices finds an allowed (h, k, l) with h² + k² (or h² + hk + k²) = m.
func (s *searcher) indices(m, l int) [3]int {
	for h := 0; h*h <= m; h++ {
		for k := 0; k <= h; k++ {
			if int(s.fam.feature(h, k, 0)[0]) != m {
				continue
			}
			if Allowed(h, k, l, s.fam.cen) {
				return [3]int{h, k, l}
			}
			if Allowed(k, h, l, s.fam.cen) {
				return [3]int{k, h, l}
			}
		}
	}
	return [3]int{0, 0, l}
}

func (s *searcher) inBounds(p [3]float64) bool {
	for _, i := range []int{0, 2, 1}[:s.fam.n] {
		if !(p[i] >= s.lo[i] && p[i] <= s.hi[i]) {
			return false
		}
	}
	return volumeOf(s.fam.sys, p) <= s.maxVolume
}

// propose keeps p when it explains the proposal lines.
func (s *searcher) propose(p [3]float64) {
	if !s.inBounds(p) {
		return
	}
	missed := 0
	for i := 0; i < s.proposal; i++ {
		if _, _, ok := s.explain(p, s.q[i], s.tol[i]); !ok {
			missed++
			if missed > s.misses {
				return
			}
		}
	}
	var key [3]int32
	for i := range key {
		if p[i] > 0 {
			key[i] = int32(math.Round(math.Log(p[i]) / 2e-3))
		}
	}
	if s.seen[key] {
		return
	}
	s.seen[key] = true
	s.candidates = append(s.candidates, p)
}

func (s *searcher) proposePairs() {
	for i := 0; i < s.proposal; i++ {
		for j := i + 1; j < s.proposal; j++ {
			qi, qj := s.q[i], s.q[j]
			for _, a := range s.hyps {
				for _, b := range s.hyps {
					det := a[0]*b[1] - a[1]*b[0]
					if det == 0 {
						continue
					}
					x := [3]float64{(qi*b[1] - qj*a[1]) / det, (qj*a[0] - qi*b[0]) / det}
					if x[0] <= 0 || x[1] <= 0 {
						continue
					}
					s.propose(s.fam.params(x))
				}
			}
		}
	}
}

func (s *searcher) proposeTriples() {
	canonical := func(a [3]float64) bool {
		if s.fam.cen == BaseCentred {
			return a[0] >= a[1]
		}
		return a[0] >= a[1] && a[1] >= a[2]
	}
	for i := 0; i < s.proposal; i++ {
		for j := i + 1; j < s.proposal; j++ {
			for k := j + 1; k < s.proposal; k++ {
				qv := [3]float64{s.q[i], s.q[j], s.q[k]}
				for _, a := range s.hyps {
					if !canonical(a) {
						continue
					}
					for _, b := range s.hyps {
						for _, c := range s.hyps {
							m := [3][3]float64{a, b, c}
							x, ok := solve3(m, qv)
							if !ok || x[0] <= 0 || x[1] <= 0 || x[2] <= 0 {
								continue
							}
							s.propose(x)
						}
					}
				}
			}
		}
	}
}

func det3(m [3][3]float64) float64 {
	return m[0][0]*(m[1][1]*m[2][2]-m[1][2]*m[2][1]) -
		m[0][1]*(m[1][0]*m[2][2]-m[1][2]*m[2][0]) +
		m[0][2]*(m[1][0]*m[2][1]-m[1][1]*m[2][0])
}

// solve3 solves m·x = v by Cramer's rule.
func solve3(m [3][3]float64, v [3]float64) ([3]float64, bool) {
	d := det3(m)
	if math.Abs(d) < 1e-9 {
		return [3]float64{}, false
	}
	var x [3]float64
	for c := 0; c < 3; c++ {
		mc := m
		for r := 0; r < 3; r++ {
			mc[r][c] = v[r]
		}
		x[c] = det3(mc) / d
	}
	return x, true
}

// trial is a refined candidate before the final bookkeeping.
type trial struct {
	p, sigma [3]float64
	hkl      [][3]int
	calc     []float64
	ok       []bool
	indexed  int
	m20      float64
	n20      int
	set      []uint64
}

func (s *searcher) match(p [3]float64, t *trial) {
	t.indexed = 0
	for i := range s.q {
		t.hkl[i], t.calc[i], t.ok[i] = s.explain(p, s.q[i], s.tol[i])
		if t.ok[i] {
			t.indexed++
		}
	}
}

// refine fits the constants by weighted linear least squares in Q,
//
//	minimise Σ wᵢ (Qᵢ − Σⱼ xⱼ fⱼ(hklᵢ))²,   wᵢ = 1/tolᵢ²,
//
// with standard uncertainties from the inverse normal matrix scaled by
// the reduced χ². It reports false when too few peaks are indexed.
func (s *searcher) refine(t *trial) bool {
	n := s.fam.n
	if t.indexed <= n {
		return false
	}
	var nm [3][3]float64
	var rhs [3]float64
	for i, ok := range t.ok {
		if !ok {
			continue
		}
		f := s.fam.feature(t.hkl[i][0], t.hkl[i][1], t.hkl[i][2])
		w := 1 / (s.tol[i] * s.tol[i])
		for a := 0; a < n; a++ {
			rhs[a] += w * f[a] * s.q[i]
			for b := 0; b < n; b++ {
				nm[a][b] += w * f[a] * f[b]
			}
		}
	}
	if n == 2 {
		nm[2][2] = 1
	}
	inv, ok := inverse3(nm)
	if !ok {
		return false
	}
	var x [3]float64
	for a := 0; a < n; a++ {
		for b := 0; b < n; b++ {
			x[a] += inv[a][b] * rhs[b]
		}
	}
	p := s.fam.params(x)
	if !(p[0] > 0 && p[2] > 0 && (n == 2 || p[1] > 0)) {
		return false
	}
	chi2 := 0.0
	for i, ok := range t.ok {
		if !ok {
			continue
		}
		r := (s.q[i] - qOf(s.fam.sys, p, t.hkl[i][0], t.hkl[i][1], t.hkl[i][2])) / s.tol[i]
		chi2 += r * r
	}
	scale := chi2 / float64(t.indexed-n)
	var sx [3]float64
	for a := 0; a < n; a++ {
		sx[a] = math.Sqrt(inv[a][a] * scale)
	}
	t.p, t.sigma = p, s.fam.params(sx)
	return true
}

func inverse3(m [3][3]float64) ([3][3]float64, bool) {
	d := det3(m)
	if d == 0 || math.IsNaN(d) {
		return m, false
	}
	var inv [3][3]float64
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			r0, r1 := (j+1)%3, (j+2)%3
			c0, c1 := (i+1)%3, (i+2)%3
			inv[i][j] = (m[r0][c0]*m[r1][c1] - m[r0][c1]*m[r1][c0]) / d
		}
	}
	return inv, true
}

// distinctUpTo counts the distinct calculated Q ≤ maxQ (equal within
// 1e-9 relative counts once).
func (s *searcher) distinctUpTo(p [3]float64, maxQ float64) int {
	var qs []float64
	eachRepresentative(s.fam.sys, s.fam.cen, p, maxQ*(1+1e-12), func(_, _, _ int, q float64) { qs = append(qs, q) })
	sort.Float64s(qs)
	n := 0
	for i, q := range qs {
		if i == 0 || q-qs[i-1] > 1e-9*q {
			n++
		}
	}
	return n
}

// figure computes de Wolff's figure of merit over the first (up to) 20
// indexed peaks:
//
//	M20 = Q20 / (2 ε̄ N20)
//
// with Q20 the observed Q of the last of them, ε̄ their mean |Q_obs − Q_calc|
// and N20 the number of distinct calculated Q up to Q20.
//
// Reference: P. M. de Wolff, J. Appl. Cryst. 1, 108 (1968).
func (s *searcher) figure(t *trial) {
	sum, count, last := 0.0, 0, 0.0
	for i, ok := range t.ok {
		if !ok || count == 20 {
			continue
		}
		sum += math.Abs(s.q[i] - t.calc[i])
		count++
		last = s.q[i]
	}
	t.n20 = s.distinctUpTo(t.p, last)
	eps := math.Max(sum/float64(count), 1e-9*last)
	t.m20 = last / (2 * eps * float64(t.n20))
}

func (s *searcher) evaluate(p [3]float64) (trial, bool) {
	t := trial{p: p, hkl: make([][3]int, len(s.q)), calc: make([]float64, len(s.q)), ok: make([]bool, len(s.q))}
	s.match(p, &t)
	for iter := 0; iter < 3; iter++ {
		before := t.p
		if !s.refine(&t) || !s.inBounds(t.p) {
			return t, false
		}
		s.match(t.p, &t)
		if before == t.p {
			break
		}
	}
	if t.indexed <= s.fam.n {
		return t, false
	}
	s.figure(&t)
	t.set = make([]uint64, (len(s.q)+63)/64)
	for i, ok := range t.ok {
		if ok {
			t.set[i/64] |= 1 << (i % 64)
		}
	}
	return t, true
}

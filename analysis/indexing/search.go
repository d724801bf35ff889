package indexing

import (
	"math"
	"sort"
)

// solution is a model's best fit to a peak list.
type solution struct {
	a, z       float64 // scale (Å) and zero shift (degrees)
	sigA, sigZ float64 // standard uncertainties
	score      float64
	indexed    int
	assign     []int // per peak: line index or -1
	approx     int   // approximant window index, -1 otherwise
	// sigFloorA is the uncertainty of the scale that residuals of r₀ alone
	// would give (see occam).
	sigFloorA float64
}

// searchConfig carries what a search needs besides the model.
type searchConfig struct {
	lambda  float64
	tol     float64
	maxZero float64
	// all holds every peak of the scan, sorted by 2θ, when the search runs
	// on what earlier phases left; nil means the peaks searched are all.
	all []Peak
}

// allPeaks returns the scan's whole peak list for a search on peaks.
func (c searchConfig) allPeaks(peaks []Peak) []Peak {
	if c.all != nil {
		return c.all
	}
	return peaks
}

// anchors returns the indices of the strongest peaks, strongest first.
func anchors(peaks []Peak) []int {
	idx := make([]int, len(peaks))
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(i, j int) bool { return peaks[idx[i]].Intensity > peaks[idx[j]].Intensity })
	if len(idx) > anchorCount {
		idx = idx[:anchorCount]
	}
	return idx
}

// search finds the model's best solution for the peaks (sorted by 2θ). The
// scale is proposed by putting each of the strongest peaks on each line
// allowed for it within the model's windows, scored with no zero shift;
// the best few proposals are refined by least squares on scale and zero
// shift, re-matching the peaks each time. The best solution may index too
// few peaks to be a phase; the caller decides. ok is false when no scale
// puts two strong peaks on lines.
func (m *model) search(peaks []Peak, cfg searchConfig) (best solution, ok bool) {
	prep := prepare(peaks, cfg.lambda, 0, cfg.tol, make([]preparedPeak, 0, len(peaks)))
	allPrep := prep
	if cfg.all != nil {
		allPrep = prepare(cfg.all, cfg.lambda, 0, cfg.tol, nil)
	}
	type cand struct{ a, s float64 }
	var cands []cand
	anc := anchors(peaks)
	for _, i := range anc {
		pp := &prep[i]
		for _, w := range m.windows {
			j := lowerBound(m.gs, pp.q*w.lo)
			for ; j < len(m.gs) && m.gs[j] <= pp.q*w.hi; j++ {
				if m.lines[j].perp > anchorPerp || (m.weighted && m.lines[j].w < eligibleRatio*eligibleLevels[pp.lvl]) {
					continue
				}
				a := m.gs[j] / pp.q
				// A scale worth scoring puts a second strong peak on a line.
				second := false
				for _, k := range anc {
					if k != i && m.hits(&prep[k], a) {
						second = true
						break
					}
				}
				if second {
					cands = append(cands, cand{a: a})
				}
			}
		}
	}
	if len(cands) == 0 {
		return solution{}, false
	}
	sort.Slice(cands, func(i, j int) bool { return cands[i].a < cands[j].a })
	uniq := cands[:1]
	for _, c := range cands[1:] {
		if c.a > uniq[len(uniq)-1].a*(1+1e-7) {
			uniq = append(uniq, c)
		}
	}
	for i := range uniq {
		uniq[i].s = m.score(prep, allPrep, uniq[i].a)
	}
	// Equal scores keep the smaller scale first.
	sort.SliceStable(uniq, func(i, j int) bool { return uniq[i].s > uniq[j].s })
	best.score = -1
	var good []solution
	for _, c := range uniq[:min(len(uniq), refineCount)] {
		sol, ok := m.refine(peaks, c.a, cfg)
		if !ok {
			continue
		}
		good = append(good, sol)
		if sol.score > best.score {
			best = sol
		}
	}
	// The smallest cell whose constant is a √n sub-multiple of the best
	// one's and that indexes as many peaks is preferred.
	for _, s := range good {
		if s.a < best.a && subCell(s.a, best.a) && s.indexed >= best.indexed {
			best = s
		}
	}
	return best, best.score >= 0
}

// Sub-cell relation: a cubic cell of constant a indexes every line of the
// cell of constant √n·a (n = 2 … maxSubCellN), whose lines with
// h² + k² + l² = n·S stand where the small cell's S lines stand.
const (
	maxSubCellN  = 16
	subCellSlack = 0.002 // relative tolerance on the constant ratio
)

// subCell reports whether large/small is √n within subCellSlack for an
// integer n in [2, maxSubCellN].
//
//	large/small = √n,  n = 2, 3, 4, … (k = √2, √3, 2, √5, …, 4)
//
// Reference: common practice (a cubic supercell of an index n makes the
// same lines plus more).
func subCell(small, large float64) bool {
	r := large / small
	n := math.Round(r * r)
	return n >= 2 && n <= maxSubCellN && math.Abs(r/math.Sqrt(n)-1) <= subCellSlack
}

// refine iterates matching and least squares from scale a with no zero shift.
func (m *model) refine(peaks []Peak, a float64, cfg searchConfig) (solution, bool) {
	prep := make([]preparedPeak, 0, len(peaks))
	var allPrep []preparedPeak
	all := cfg.allPeaks(peaks)
	z := 0.0
	for iter := 0; iter < 4; iter++ {
		prep = prepare(peaks, cfg.lambda, z, cfg.tol, prep)
		allPrep = prepare(all, cfg.lambda, z, cfg.tol, allPrep)
		sol := m.assign(prep, allPrep, a, z)
		if sol.indexed < 2 {
			return sol, false
		}
		na, nz, _, _ := m.leastSquares(peaks, sol.assign, a, z, cfg)
		if math.Abs(na-a) < 1e-9*a && math.Abs(nz-z) < 1e-7 {
			break
		}
		if !m.inWindows(na, 0.002) {
			break
		}
		a, z = na, nz
	}
	prep = prepare(peaks, cfg.lambda, z, cfg.tol, prep)
	allPrep = prepare(all, cfg.lambda, z, cfg.tol, allPrep)
	final := m.assign(prep, allPrep, a, z)
	if final.indexed < 2 {
		return final, false
	}
	_, _, final.sigA, final.sigZ = m.leastSquares(peaks, final.assign, a, z, cfg)
	final.sigFloorA = m.scaleFloor(final.assign, a, cfg.lambda)
	if m.kind == Approximant {
		final.approx = m.approximantWindow(a)
		if final.approx < 0 || !m.strongLinesIcosahedral(peaks, final, cfg.lambda) {
			return final, false
		}
	}
	return final, true
}

// assign matches every peak at (a, z) and scores the result.
func (m *model) assign(prep, allPrep []preparedPeak, a, z float64) solution {
	sol := solution{a: a, z: z, assign: make([]int, len(prep)), approx: -1}
	for i := range prep {
		idx, _, p := m.match(&prep[i], a)
		sol.assign[i] = idx
		if idx >= 0 {
			sol.indexed++
			sol.score -= math.Log(p)
		}
	}
	sol.score = math.Max(sol.score-m.missingPenalty(prep, allPrep, a), 0)
	return sol
}

// twoTheta returns the calculated angle (degrees) of line g at scale a, and
// whether it is reachable.
func twoTheta(g, a, lambda float64) (float64, bool) {
	s := lambda * g / (2 * a)
	if s >= 1 {
		return 0, false
	}
	return 2 * math.Asin(s) * 180 / math.Pi, true
}

// leastSquares fits scale a and zero shift z to the assigned peaks,
//
//	2θobs,i = 2·asin(λ gᵢ / 2a) + z
//
// by Gauss-Newton, and returns the standard uncertainties from the
// covariance σ²(JᵀJ)⁻¹ with σ² = RSS/(m − p). With fewer than four
// assigned peaks, or when the fitted |z| exceeds cfg.maxZero, z is held at 0.
//
// Reference: common practice (linearised least squares).
func (m *model) leastSquares(peaks []Peak, assign []int, a, z float64, cfg searchConfig) (na, nz, sigA, sigZ float64) {
	n := 0
	for _, j := range assign {
		if j >= 0 {
			n++
		}
	}
	fitZero := n >= 4
	na, nz, sigA, sigZ = m.gaussNewton(peaks, assign, a, z, fitZero, cfg.lambda)
	if fitZero && math.Abs(nz) > cfg.maxZero {
		na, nz, sigA, sigZ = m.gaussNewton(peaks, assign, a, 0, false, cfg.lambda)
	}
	return na, nz, sigA, sigZ
}

func (m *model) gaussNewton(peaks []Peak, assign []int, a, z float64, fitZero bool, lambda float64) (float64, float64, float64, float64) {
	if !fitZero {
		z = 0
	}
	var saa, saz, szz, rss float64
	n := 0
	for it := 0; it < 6; it++ {
		var ga, gz float64
		saa, saz, szz, rss, n = 0, 0, 0, 0, 0
		for i, j := range assign {
			if j < 0 {
				continue
			}
			g := m.gs[j]
			s := lambda * g / (2 * a)
			if s >= 1 {
				continue
			}
			calc := 2 * math.Asin(s) * 180 / math.Pi
			r := peaks[i].TwoThetaDeg - z - calc
			// ∂calc/∂a in degrees per Å.
			da := -2 * s / a / math.Sqrt(1-s*s) * 180 / math.Pi
			saa += da * da
			saz += da
			szz++
			ga += da * r
			gz += r
			rss += r * r
			n++
		}
		var dA, dZ float64
		if fitZero {
			det := saa*szz - saz*saz
			if det <= 0 {
				break
			}
			dA = (szz*ga - saz*gz) / det
			dZ = (saa*gz - saz*ga) / det
		} else if saa > 0 {
			dA = ga / saa
		}
		a += dA
		z += dZ
		if math.Abs(dA) < 1e-12*a && math.Abs(dZ) < 1e-10 {
			break
		}
	}
	p := 1
	if fitZero {
		p = 2
	}
	if n <= p {
		return a, z, 0, 0
	}
	sigma2 := rss / float64(n-p)
	if fitZero {
		det := saa*szz - saz*saz
		if det <= 0 {
			return a, z, 0, 0
		}
		return a, z, math.Sqrt(sigma2 * szz / det), math.Sqrt(sigma2 * saa / det)
	}
	if saa <= 0 {
		return a, z, 0, 0
	}
	return a, z, math.Sqrt(sigma2 / saa), 0
}

// scaleFloor returns the uncertainty of the scale a that residuals of r₀
// (residualFloorDeg) on the assigned peaks would give,
//
//	σ₀ = r₀ / √(Σᵢ (∂2θᵢ/∂a)²)
//
// Reference: common practice (linearised least squares).
func (m *model) scaleFloor(assign []int, a, lambda float64) float64 {
	var sum float64
	for _, j := range assign {
		if j < 0 {
			continue
		}
		s := lambda * m.gs[j] / (2 * a)
		if s >= 1 {
			continue
		}
		d := 2 * s / a / math.Sqrt(1-s*s) * 180 / math.Pi
		sum += d * d
	}
	if sum == 0 {
		return a
	}
	return residualFloorDeg / math.Sqrt(sum)
}

package indexing

import (
	"fmt"
	"math"
	"sort"
	"strings"
	"sync"

	"meltbook/analysis/indexing/cubic"
	"meltbook/analysis/indexing/icosa"
)

// Search ranges and scoring constants.
const (
	minQuasilatticeA = 3.9 // a_R search range, Å; spans the Al-, Ti-, Zn- and Cd-based i-phases
	maxQuasilatticeA = 6.1
	minCubicA        = 2.5 // general cubic search range, Å
	maxCubicA        = 16.0
	maxPeaks         = 200
	residualFloorDeg = 0.02 // r₀: precision of a fitted peak position in 2θ
	densityHalfDeg   = 5.0  // half width of the window for the local line density
	anchorCount      = 5    // strongest peaks that propose scales
	anchorPerp       = 0.30 // icosahedral families allowed to explain an anchor peak, |G⊥|·a6
	refineCount      = 6    // candidates refined by least squares
	// Approximant check: each of the strongest peaks of an approximant must
	// lie within strongShift (relative, in q) of an icosahedral family with
	// |G⊥|·a6 ≤ strongPerp, for the a_R the cubic constant implies.
	strongPeaks = 3
	strongShift = 0.02
	strongPerp  = 0.35
	// Families are enumerated once up to this |G∥|·a6 (Cu Kα to 2θ = 170°
	// with a_R = 6.1 Å needs 11.0; Mo Kα to 60° at 6.1 Å needs 12.2).
	maxFamilyParallel = 13.0
	maxFamilyPerp     = 0.8
	// Unobserved-line penalty of the general cubic search (see
	// missingPenalty): the lowest missingLines allowed lines from d =
	// missingReach·d(first peak) up to the last peak are checked, and each
	// one no peak lies on costs missingCost nats.
	missingLines = 8
	missingReach = 1.5
	missingCost  = 1.0
)

// line is one allowed powder line of a model, at q = g/scale.
type line struct {
	g    float64 // position in units of 1/scale (|G∥|·a6, or √S)
	perp float64 // |G⊥|·a6 for icosahedral lines, 0 for cubic
	w    float64 // predicted relative intensity, LP removed, 0..1 (weighted models)
	ref  int     // index into the model's family or line table
}

// window is a range of scale in Å.
type window struct{ lo, hi float64 }

// model is one searchable set of lines: a kind, a lattice type, the lines
// and the allowed range of the scale (a6 for icosahedral models, a for
// cubic ones).
type model struct {
	kind    Kind
	lattice string
	id      string // names the model for the chance cache
	lines   []line
	gs      []float64 // lines' g, ascending
	bins    []int32   // lookup table, see firstAtLeast
	windows []window
	// icosahedral tables
	families []icosa.Family
	// cubic tables
	cubicLines []cubic.Line
	// approximant windows: which reference and order each window belongs to
	approx []approxWindow
	// weighted models match peaks to lines by intensity too (see match);
	// wcum holds their eligibility tables (see prepareWeights).
	weighted bool
	wcum     [][]int32
	// known is the library phase of a library model; alternatives is the
	// number of library phases tried, for the Šidák correction.
	known        *KnownPhase
	alternatives int
}

var (
	familyOnce  sync.Once
	familyTable map[icosa.Lattice][]icosa.Family
	cubicOnce   sync.Once
	cubicTable  map[cubic.Lattice][]cubic.Line
)

func allFamilies(lat icosa.Lattice) []icosa.Family {
	familyOnce.Do(func() {
		familyTable = map[icosa.Lattice][]icosa.Family{}
		for _, l := range icosa.Lattices {
			familyTable[l] = icosa.Families(l, maxFamilyParallel, maxFamilyPerp)
		}
	})
	return familyTable[lat]
}

// maxCubicS covers the largest approximant (3/2 of a_R = 6.1 Å, +10 %)
// to q = 1/d = 2/λ at λ = 1.5 Å.
const maxCubicS = 3600

func allCubicLines(lat cubic.Lattice) []cubic.Line {
	cubicOnce.Do(func() {
		cubicTable = map[cubic.Lattice][]cubic.Line{}
		for _, l := range cubic.Lattices {
			cubicTable[l] = cubic.Lines(l, maxCubicS)
		}
	})
	return cubicTable[lat]
}

func icosahedralID(lat icosa.Lattice, perpCutoff float64) string {
	return fmt.Sprintf("icosahedral-%s-%.4f-sphere-%.3f", lat, perpCutoff, icosa.DefaultPhasonDebyeWaller)
}

// icosahedralNormParallel is the |G∥|·a6 up to which the strongest
// predicted family sets the scale of an icosahedral model's weights: Cu Kα
// to 2θ = 110° at a_R = 4.5 Å. Multiplicity makes families beyond it
// stronger still in the model, while the atomic form factor and the
// thermal Debye–Waller factor, left out of it, weaken them in a real
// pattern; their weights are capped at 1.
const icosahedralNormParallel = 6.7

// newIcosahedralModel builds the model of icosahedral lattice type lat: the
// families with |G⊥|·a6 ≤ perpCutoff, each weighted by its predicted
// intensity (icosa.Intensity: spherical atomic surface of the volume of
// the lattice type's window, multiplicity, phason Debye–Waller factor),
// relative to the strongest family with |G∥|·a6 ≤ icosahedralNormParallel
// and capped at 1. Families predicted weaker than weakestLine are dropped.
// The model is weighted: peaks are matched to lines by intensity too (see
// match), and strong predicted lines with no peak cost (missingStrong).
func newIcosahedralModel(lat icosa.Lattice, perpCutoff float64) *model {
	m := &model{
		kind:     Icosahedral,
		lattice:  lat.String(),
		id:       icosahedralID(lat, perpCutoff),
		windows:  []window{{minQuasilatticeA * math.Sqrt2, maxQuasilatticeA * math.Sqrt2}},
		weighted: true,
	}
	m.families = allFamilies(lat)
	ws := make([]float64, len(m.families))
	top := 0.0
	for i, f := range m.families {
		ws[i] = icosa.Intensity(f, lat, icosa.DefaultPhasonDebyeWaller)
		if f.Parallel <= icosahedralNormParallel {
			top = math.Max(top, ws[i])
		}
	}
	for i, f := range m.families {
		if w := math.Min(ws[i]/top, 1); f.Perp <= perpCutoff && w >= weakestLine {
			m.lines = append(m.lines, line{g: f.Parallel, perp: f.Perp, w: w, ref: i})
		}
	}
	m.finish()
	return m
}

func newCubicModel(kind Kind, lat cubic.Lattice, windows []window, approx []approxWindow) *model {
	m := &model{kind: kind, lattice: lat.String(), windows: windows, approx: approx, id: newCubicID(kind, lat, windows)}
	m.cubicLines = allCubicLines(lat)
	for i, c := range m.cubicLines {
		m.lines = append(m.lines, line{g: c.Sqrt(), ref: i})
	}
	m.finish()
	return m
}

func newCubicID(kind Kind, lat cubic.Lattice, windows []window) string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s-%s", kind, lat)
	for _, w := range windows {
		fmt.Fprintf(&b, "-%.4f:%.4f", w.lo, w.hi)
	}
	return b.String()
}

// approxID names the approximant windows' orders and references.
func approxID(ws []approxWindow) string {
	var b strings.Builder
	for _, w := range ws {
		fmt.Fprintf(&b, "|%s@%.4f", w.order, w.ideal)
	}
	return b.String()
}

func (m *model) finish() {
	sort.Slice(m.lines, func(i, j int) bool { return m.lines[i].g < m.lines[j].g })
	m.gs = make([]float64, len(m.lines))
	for i, l := range m.lines {
		m.gs[i] = l.g
	}
	// bins[b] is the first line with g ≥ b·binWidth.
	nb := 1
	if len(m.gs) > 0 {
		nb = int(m.gs[len(m.gs)-1]/binWidth) + 2
	}
	m.bins = make([]int32, nb)
	for b := range m.bins {
		m.bins[b] = int32(lowerBound(m.gs, float64(b)*binWidth))
	}
	m.prepareWeights()
}

// inWindows reports whether scale a lies in one of the model's windows,
// widened by the relative slack.
func (m *model) inWindows(a, slack float64) bool {
	for _, w := range m.windows {
		if a >= w.lo*(1-slack) && a <= w.hi*(1+slack) {
			return true
		}
	}
	return false
}

// preparedPeak holds per-peak quantities at one zero shift, so that scoring
// a scale costs only multiplications and binary searches.
type preparedPeak struct {
	q        float64 // 1/d at the corrected angle, Å⁻¹
	qLo, qHi float64 // 1/d at the corrected angle ∓ tolerance
	qWLo     float64 // 1/d at the edges of the density window
	qWHi     float64
	wDeg     float64 // width of the density window, degrees
	dxdq     float64 // d(2θ)/dq in degrees per Å⁻¹
	o        float64 // observed relative intensity, LP removed, 0..1
	lvl      int     // eligibility level of o (see eligibleLevels)
}

func qAt(twoThetaDeg, lambda float64) float64 {
	return 2 * math.Sin(twoThetaDeg*math.Pi/360) / lambda
}

func prepare(peaks []Peak, lambda, zero, tol float64, out []preparedPeak) []preparedPeak {
	out = out[:0]
	obs := observedWeights(peaks)
	for i, p := range peaks {
		x := p.TwoThetaDeg - zero
		lo := math.Max(x-densityHalfDeg, 0.5)
		hi := math.Min(x+densityHalfDeg, 179.5)
		theta := x * math.Pi / 360
		out = append(out, preparedPeak{
			q:    qAt(x, lambda),
			qLo:  qAt(math.Max(x-tol, 0.01), lambda),
			qHi:  qAt(math.Min(x+tol, 179.99), lambda),
			qWLo: qAt(lo, lambda),
			qWHi: qAt(hi, lambda),
			wDeg: hi - lo,
			dxdq: lambda / math.Cos(theta) * 180 / math.Pi,
			o:    obs[i],
			lvl:  level(obs[i]),
		})
	}
	return out
}

// match finds the line explaining a peak at scale a: for a weighted model
// (icosahedral and library), among the lines within tolerance eligible for
// the peak's intensity, the strongest; otherwise the nearest.
// It returns the line index or -1, the residual in degrees (observed −
// calculated) and the chance probability p of the match, whose line
// density counts, for a weighted model, only the eligible lines.
func (m *model) match(pp *preparedPeak, a float64) (idx int, resid, p float64) {
	gLo, gHi := pp.qLo*a, pp.qHi*a
	j := m.firstAtLeast(gLo)
	idx = -1
	bestPerp, bestDist := math.Inf(1), math.Inf(1)
	floor := eligibleRatio * eligibleLevels[pp.lvl]
	for ; j < len(m.gs) && m.gs[j] <= gHi; j++ {
		dist := math.Abs(pp.q - m.gs[j]/a)
		perp := m.lines[j].perp
		if m.weighted {
			// Rank by −w so that the strongest eligible line wins.
			if m.lines[j].w < floor {
				continue
			}
			perp = -m.lines[j].w
		}
		if perp < bestPerp-1e-9 || (perp < bestPerp+1e-9 && dist < bestDist) {
			idx, bestPerp, bestDist = j, perp, dist
		}
	}
	if idx < 0 {
		return -1, 0, 1
	}
	resid = (pp.q - m.gs[idx]/a) * pp.dxdq
	jLo, jHi := m.firstAtLeast(pp.qWLo*a), m.firstAtLeast(pp.qWHi*a)
	count := float64(jHi - jLo)
	if m.weighted {
		c := m.wcum[pp.lvl]
		count = float64(c[jHi] - c[jLo])
	}
	if count < 1 {
		count = 1
	}
	p = 2 * math.Max(math.Abs(resid), residualFloorDeg) * count / pp.wDeg
	if p > 1 {
		p = 1
	}
	return idx, resid, p
}

// score returns S = Σ −ln p over the peaks indexed at scale a, less the
// unobserved-line penalty, at least 0. all holds every peak of the scan
// (prep those still to be indexed), for the missing-line check.
func (m *model) score(prep, all []preparedPeak, a float64) float64 {
	prod := 1.0
	for i := range prep {
		if idx, _, p := m.match(&prep[i], a); idx >= 0 {
			prod *= p
		}
	}
	return math.Max(-math.Log(prod)-m.missingPenalty(prep, all, a), 0)
}

// missingPenalty is the cost, in nats, of the allowed lines a general cubic
// solution at scale a puts where no peak lies:
//
//	U = missingCost · #{ the lowest missingLines allowed lines with
//	    q_first/missingReach ≤ q ≤ q_last + tolerance that have no peak
//	    within the tolerance }
//
// with q = 1/d and q_first, q_last those of the lowest- and highest-angle
// peaks (prep sorted by 2θ). The lowest lines of a small cubic cell are its
// strong ones, and a lattice or cell that predicts them where nothing is seen
// is the worse explanation: this is what tells a primitive cell from the
// body- or face-centred cell of the same constant, and a cell from its
// doubled or √2 multiples, where the sparse lines otherwise score alike.
// Lines down to d = missingReach·d(first peak) count because a scan
// normally starts well below its first peak. Approximants carry no
// penalty: their intensity gathers near the strong icosahedral families and
// most low-angle lines are weak by nature. Weighted models (icosahedral and
// library) pay for their missing strong lines instead (missingStrong). The
// random lists of the chance calibration are scored the same way.
//
// Reference: common practice (the absence of predicted low-angle lines
// rules out a cell; de Wolff's M20 weighs the calculated lines up to the
// last observed one).
func (m *model) missingPenalty(prep, all []preparedPeak, a float64) float64 {
	if m.weighted {
		return m.missingStrong(all, a)
	}
	if m.kind != Cubic || len(prep) == 0 {
		return 0
	}
	first, last := &prep[0], &prep[len(prep)-1]
	gHi := last.qHi * a
	missing := 0
	j := m.firstAtLeast(first.q / missingReach * a)
	for n := 0; n < missingLines && j < len(m.gs) && m.gs[j] <= gHi; n, j = n+1, j+1 {
		q := m.gs[j] / a
		// First peak whose upper tolerance edge reaches q.
		k := sort.Search(len(prep), func(i int) bool { return prep[i].qHi >= q })
		if k == len(prep) || prep[k].qLo > q {
			missing++
		}
	}
	return missingCost * float64(missing)
}

// missingStrong is the cost, in nats, of the strong lines a weighted model
// at scale a predicts where the scan shows no peak:
//
//	U = missingStrongCost · Σ wⱼ  over the lines with wⱼ ≥ strongLine and
//	    q_first − δ ≤ qⱼ ≤ q_last + δ that have no peak within the tolerance
//
// with wⱼ the line's predicted intensity relative to the model's strongest
// (Lorentz–polarisation removed), q_first and q_last the lowest- and
// highest-angle peaks of the whole scan (all, sorted by 2θ) and δ the
// tolerance. Every peak of the scan counts as present, those another phase
// already took included, since lines of two phases may overlap.
//
// Reference: common practice in search-match (the strong lines of a phase
// must all be seen; a missing strong line rules a candidate out unless
// preferred orientation explains it, hence a finite cost).
func (m *model) missingStrong(all []preparedPeak, a float64) float64 {
	if len(all) == 0 {
		return 0
	}
	lo, hi := all[0].qLo*a, all[len(all)-1].qHi*a
	cost := 0.0
	for j := m.firstAtLeast(lo); j < len(m.gs) && m.gs[j] <= hi; j++ {
		w := m.lines[j].w
		if w < strongLine {
			continue
		}
		q := m.gs[j] / a
		k := sort.Search(len(all), func(i int) bool { return all[i].qHi >= q })
		if k == len(all) || all[k].qLo > q {
			cost += missingStrongCost * w
		}
	}
	return cost
}

// hits reports whether some line lies within tolerance of the peak at
// scale a (for a weighted model, a line eligible for the peak).
func (m *model) hits(pp *preparedPeak, a float64) bool {
	j := m.firstAtLeast(pp.qLo * a)
	if !m.weighted {
		return j < len(m.gs) && m.gs[j] <= pp.qHi*a
	}
	floor := eligibleRatio * eligibleLevels[pp.lvl]
	for ; j < len(m.gs) && m.gs[j] <= pp.qHi*a; j++ {
		if m.lines[j].w >= floor {
			return true
		}
	}
	return false
}

// binWidth is the g step of the lookup table that replaces binary searches.
const binWidth = 0.01

// firstAtLeast returns the index of the first line with g ≥ v.
func (m *model) firstAtLeast(v float64) int {
	b := int(v / binWidth)
	if b < 0 {
		b = 0
	}
	if b >= len(m.bins) {
		return len(m.gs)
	}
	j := int(m.bins[b])
	for j < len(m.gs) && m.gs[j] < v {
		j++
	}
	return j
}

// lowerBound returns the first index i with xs[i] ≥ v (len(xs) if none).
func lowerBound(xs []float64, v float64) int {
	lo, hi := 0, len(xs)
	for lo < hi {
		mid := int(uint(lo+hi) >> 1)
		if xs[mid] < v {
			lo = mid + 1
		} else {
			hi = mid
		}
	}
	return lo
}

package indexing

import (
	"math"
	"sort"
	"sync"

	"meltbook/analysis/indexing/cubic"
	"meltbook/analysis/indexing/icosa"
)

var modelCache sync.Map // model id -> *model

func cachedModel(id string, build func() *model) *model {
	if v, ok := modelCache.Load(id); ok {
		return v.(*model)
	}
	v, _ := modelCache.LoadOrStore(id, build())
	return v.(*model)
}

// models builds the models of one round: icosahedral, general cubic and
// approximant windows around the references and the quasilattice
// constants already found in the list.
func models(opts Options, lambda float64, found []float64) []*model {
	var out []*model
	for _, lat := range icosa.Lattices {
		out = append(out, cachedModel(icosahedralID(lat, opts.PerpCutoff), func() *model { return newIcosahedralModel(lat, opts.PerpCutoff) }))
	}
	general := []window{{minCubicA, maxCubicA}}
	refs := append([]Reference(nil), opts.References...)
	for _, aR := range found {
		refs = append(refs, Reference{Name: "icosahedral phase in this list", QuasilatticeConstantA: aR})
	}
	aw := approximantWindows(refs, opts.ApproximantOrders, opts.ApproximantTolerance)
	merged := mergedWindows(aw)
	for _, lat := range cubic.Lattices {
		out = append(out, cachedModel(newCubicID(Cubic, lat, general), func() *model { return newCubicModel(Cubic, lat, general, nil) }))
	}
	for _, lat := range approximantLattices {
		out = append(out, cachedModel(newCubicID(Approximant, lat, merged)+approxID(aw), func() *model {
			m := newCubicModel(Approximant, lat, merged, aw)
			m.id += approxID(aw)
			return m
		}))
	}
	return append(out, knownModels(opts.Library, lambda)...)
}

// minIndexed is the fewest indexed peaks that make a phase of the kind.
func minIndexed(k Kind) int {
	if k == Icosahedral {
		return 5
	}
	return 3
}

// approximantLattices are the cubic lattice types sought for approximants:
// the known cubic approximants are primitive (α-AlMnSi, Pm-3) or
// body-centred (Cd6Yb, Im-3).
var approximantLattices = []cubic.Lattice{cubic.Primitive, cubic.BodyCentred}

// latticesOfKind is the number of models tried of the model's kind (its
// lattice types, or the library's phases), for the Šidák correction and
// the model-choice criterion.
func (m *model) latticesOfKind() int {
	switch m.kind {
	case Approximant:
		return len(approximantLattices)
	case library:
		return max(m.alternatives, 1)
	}
	return 3
}

type scored struct {
	m      *model
	sol    solution
	chance float64
	basis  string
}

func run(peaks []Peak, lambda float64, opts Options) Result {
	cfg := searchConfig{lambda: lambda, tol: opts.ToleranceDeg, maxZero: opts.MaxZeroShiftDeg, all: peaks}
	total := 0.0
	for _, p := range peaks {
		total += p.Intensity
	}
	res := Result{WavelengthA: lambda, Phases: []Phase{}, Unexplained: []Peak{}, Models: []ModelSummary{}}
	remaining := peaks
	var found []float64
	var taken []takenPhase
	for round := 0; round < opts.MaxPhases && len(remaining) >= minIndexed(Cubic); round++ {
		var all []scored
		for _, m := range models(opts, lambda, found) {
			sol, ok := m.search(remaining, cfg)
			if !ok {
				if round == 0 {
					res.Models = append(res.Models, summary(m, solution{}, 1))
				}
				continue
			}
			all = append(all, scored{m: m, sol: sol, chance: 1})
		}
		// Best figure of merit first; the first significant solution with
		// enough peaks is the phase. Chance is refined with more random
		// lists only where it decides.
		sort.SliceStable(all, func(i, j int) bool { return better(all[i], all[j]) })
		best := -1
		for i := range all {
			s := &all[i]
			perModel := 1 - math.Pow(1-opts.MaxChance, 1/float64(s.m.latticesOfKind()))
			decides := best < 0 && s.sol.indexed >= minIndexed(s.m.kind)
			if !decides && round > 0 {
				continue
			}
			c, basis := chance(s.m, remaining, nullConfig(cfg), s.sol.score, perModel, decides)
			s.chance, s.basis = sidak(c, s.m.latticesOfKind()), basis
			if decides && s.chance <= opts.MaxChance {
				best = i
			}
		}
		if best >= 0 {
			best = preferSubCell(all, best, remaining, cfg, opts.MaxChance)
		}
		if best >= 0 && outranked(all, best, opts.MaxChance) {
			best = -1
		}
		if round == 0 {
			for _, s := range all {
				res.Models = append(res.Models, summary(s.m, s.sol, s.chance))
			}
		}
		if best < 0 {
			break
		}
		b := all[best]
		ph := buildPhase(b, remaining, peaks, cfg, total)
		res.Phases = append(res.Phases, ph)
		taken = append(taken, takenPhase{b, remaining})
		if b.m.kind == Icosahedral {
			found = append(found, ph.QuasilatticeConstantA)
		}
		var rest []Peak
		for i, j := range b.sol.assign {
			if j < 0 {
				rest = append(rest, remaining[i])
			}
		}
		remaining = rest
	}
	relabelApproximants(res.Phases, taken, found, lambda, opts)
	res.Unexplained = append(res.Unexplained, remaining...)
	sort.SliceStable(res.Phases, func(i, j int) bool {
		return res.Phases[i].ExplainedIntensity > res.Phases[j].ExplainedIntensity
	})
	return res
}

// preferSubCell returns the solution to take instead of all[best]: the
// significant cubic solution with the smallest constant a such that
// all[best].a = √n·a (see subCell) and that indexes at least as many
// peaks, or, when all[best] is an approximant and a = all[best].a/k with
// k = 2, 3 or 4, that indexes its strongPeaks strongest peaks. (The √n
// multiples with n not a square are left out of the approximant rule: a
// body-centred cell a and the primitive cell a/√2 make nearly the same
// lines, so a real I approximant would lose to a P sub-cell indexing
// fewer of its peaks.) A cell whose lines the smaller cell already
// makes is the larger explanation of the same peaks, and an approximant
// that is a supercell of a plain cubic phase owes its strong lines to that
// phase. Chances are computed where still missing.
func preferSubCell(all []scored, best int, peaks []Peak, cfg searchConfig, maxChance float64) int {
	x := all[best]
	if x.m.kind != Cubic && x.m.kind != Approximant {
		return best
	}
	strong := strongest(peaks, x.sol.assign)
	for i := range all {
		y := &all[i]
		if (y.m.kind != Cubic && y.m.kind != Approximant) || y.sol.indexed < minIndexed(y.m.kind) || !(y.sol.a < all[best].sol.a) || !subCell(y.sol.a, x.sol.a) {
			continue
		}
		same := y.sol.indexed >= x.sol.indexed
		if !same && x.m.kind == Approximant && y.m.kind == Cubic && integerMultiple(y.sol.a, x.sol.a) {
			same = true
			for _, k := range strong {
				same = same && y.sol.assign[k] >= 0
			}
		}
		if !same {
			continue
		}
		if y.basis == "" {
			perModel := 1 - math.Pow(1-maxChance, 1/float64(y.m.latticesOfKind()))
			c, basis := chance(y.m, peaks, nullConfig(cfg), y.sol.score, perModel, true)
			y.chance, y.basis = sidak(c, y.m.latticesOfKind()), basis
		}
		if y.chance <= maxChance {
			best = i
		}
	}
	return best
}

// integerMultiple reports whether large/small is 2, 3 or 4 within
// subCellSlack.
func integerMultiple(small, large float64) bool {
	r := large / small
	k := math.Round(r)
	return k >= 2 && k <= 4 && math.Abs(r/k-1) <= subCellSlack
}

// strongest returns the indices of the strongPeaks strongest assigned peaks.
func strongest(peaks []Peak, assign []int) []int {
	var idx []int
	for i, j := range assign {
		if j >= 0 {
			idx = append(idx, i)
		}
	}
	sort.SliceStable(idx, func(i, j int) bool { return peaks[idx[i]].Intensity > peaks[idx[j]].Intensity })
	return idx[:min(len(idx), strongPeaks)]
}

// better orders solutions by the model-choice criterion, higher first; an
// approximant beats the same cubic solution found by the general search.
func better(x, y scored) bool {
	cx, cy := x.m.evidence(x.sol), y.m.evidence(y.sol)
	if math.Abs(cx-cy) > 1e-6*math.Max(1, math.Abs(cy)) {
		return cx > cy
	}
	return x.m.kind == Approximant && y.m.kind == Cubic
}

// nullConfig is the configuration the random lists are searched with:
// each list is a whole scan.
func nullConfig(cfg searchConfig) searchConfig {
	cfg.all = nil
	return cfg
}

// evidence returns the model-choice criterion of a solution, in nats:
//
//	C = S − ln K − Σⱼ ln(Δⱼ / σ₀ⱼ)
//
// S the figure of merit, K the number of models of the kind tried (three
// lattices, or the library's phases), and for each fitted constant j the
// width Δⱼ of its search range over σ₀ⱼ, the uncertainty the residual floor
// r₀ alone would give it (see scaleFloor). The sum is the Occam factor of
// the constant: the share of its prior range that the data leave
// plausible; a model whose constant could land anywhere in a wide range
// pays more than one whose constant is known in advance to within a few
// per cent. The zero shift is common to every model and left out.
//
// Reference: D. J. C. MacKay, Information Theory, Inference, and Learning
// Algorithms, Cambridge University Press (2003), ch. 28 (the Occam factor);
// G. Schwarz, Ann. Stat. 6, 461 (1978) for the large-sample form ½ ln n
// per parameter that it refines.
func (m *model) evidence(sol solution) float64 {
	if sol.indexed == 0 {
		return 0
	}
	width := 0.0
	for _, w := range m.windows {
		width += w.hi - w.lo
	}
	occam := 0.0
	if sol.sigFloorA > 0 && width > sol.sigFloorA {
		occam = math.Log(width / sol.sigFloorA)
	}
	return sol.score - math.Log(float64(m.latticesOfKind())) - occam
}

func summary(m *model, sol solution, c float64) ModelSummary {
	s := ModelSummary{Kind: m.reportedKind(), Lattice: m.lattice, ScaleA: sol.a, IndexedPeaks: sol.indexed, FigureOfMerit: sol.score, Evidence: m.evidence(sol), Chance: c}
	if m.kind == Icosahedral {
		s.ScaleA = sol.a / math.Sqrt2
	}
	if m.known != nil {
		s.Phase = m.known.Name
		s.ScaleA = sol.a * m.known.Cell.A
	}
	if m.kind == Approximant && sol.approx >= 0 {
		s.Order = m.approx[sol.approx].order.String()
	}
	return s
}

func buildPhase(s scored, peaks, all []Peak, cfg searchConfig, total float64) Phase {
	lambda := cfg.lambda
	m, sol := s.m, s.sol
	ph := Phase{
		Kind:                    m.reportedKind(),
		Evidence:                m.evidence(sol),
		Lattice:                 m.lattice,
		ZeroShiftDeg:            sol.z,
		ZeroShiftUncertaintyDeg: sol.sigZ,
		FigureOfMerit:           sol.score,
		Chance:                  s.chance,
		ChanceBasis:             s.basis,
		Peaks:                   []IndexedPeak{},
	}
	switch m.kind {
	case Icosahedral:
		ph.SixDimensionalConstantA = sol.a
		ph.QuasilatticeConstantA = sol.a / math.Sqrt2
		ph.QuasilatticeConstantUncertaintyA = sol.sigA / math.Sqrt2
	case library:
		setKnownPhase(&ph, m.known, sol)
	default:
		ph.AA = sol.a
		ph.AUncertaintyA = sol.sigA
	}
	if m.kind == Approximant {
		w := m.approx[sol.approx]
		ph.Order = w.order.String()
		ph.ApproximantOf = w.reference
		ph.IdealAA = w.ideal
	}
	var explained, rss float64
	var trendX, trendY []float64
	for i, j := range sol.assign {
		if j < 0 {
			continue
		}
		p := peaks[i]
		ln := m.lines[j]
		calc, _ := twoTheta(ln.g, sol.a, lambda)
		calc += sol.z
		ip := IndexedPeak{
			TwoThetaDeg:           p.TwoThetaDeg,
			Intensity:             p.Intensity,
			DSpacingA:             1 / qAt(p.TwoThetaDeg-sol.z, lambda),
			CalculatedTwoThetaDeg: calc,
			ResidualDeg:           p.TwoThetaDeg - calc,
		}
		if m.kind == Icosahedral {
			f := m.families[ln.ref]
			ip.Icosahedral = &IcosahedralLabel{N: f.N, M: f.M, Index: f.Index, Multiplicity: f.Multiplicity, Perp: f.Perp, PerpPerA: f.Perp / sol.a}
			trendX = append(trendX, f.Perp/sol.a)
			trendY = append(trendY, math.Abs(qAt(p.TwoThetaDeg-sol.z, lambda)-ln.g/sol.a))
		} else if m.known != nil {
			hkl := m.known.Lines[ln.ref].HKL
			ip.HKL = &hkl
			pi := m.known.Lines[ln.ref].Intensity
			ip.PredictedIntensity = &pi
		} else {
			hkl := m.cubicLines[ln.ref].HKL
			ip.HKL = &hkl
		}
		ph.Peaks = append(ph.Peaks, ip)
		explained += p.Intensity
		rss += ip.ResidualDeg * ip.ResidualDeg
	}
	ph.RMSResidualDeg = math.Sqrt(rss / float64(len(ph.Peaks)))
	if total > 0 {
		ph.ExplainedIntensity = explained / total
	}
	if m.kind == Icosahedral {
		ph.PhasonTrend = phasonTrend(trendX, trendY)
	}
	if m.known != nil {
		m.finishKnown(&ph, sol, all, cfg)
	}
	if m.kind == Icosahedral {
		m.finishIcosahedral(&ph, sol, all, cfg)
	}
	return ph
}

// finishIcosahedral fills the predicted intensity of an icosahedral
// phase's peaks: the family's intensity (icosa.Intensity) times the
// Lorentz–polarisation factor at its calculated angle, relative to the
// strongest family within the range of the scan's peaks (100),
//
//	Iⱼ = 100 · m g(2π|G⊥|R)² exp(−B⊥|G⊥|²) LP(2θⱼ) / max over the range
//
// Reference: see icosa.Intensity; lorentzPolarisation.
func (m *model) finishIcosahedral(ph *Phase, sol solution, all []Peak, cfg searchConfig) {
	allPrep := prepare(all, cfg.lambda, sol.z, cfg.tol, nil)
	if len(allPrep) == 0 {
		return
	}
	lat := icosa.Lattice(m.lattice[0])
	predicted := func(j int) float64 {
		tt, ok := twoTheta(m.gs[j], sol.a, cfg.lambda)
		if !ok {
			return 0
		}
		return icosa.Intensity(m.families[m.lines[j].ref], lat, icosa.DefaultPhasonDebyeWaller) * lorentzPolarisation(tt)
	}
	lo, hi := allPrep[0].qLo*sol.a, allPrep[len(allPrep)-1].qHi*sol.a
	top := 0.0
	for j := m.firstAtLeast(lo); j < len(m.gs) && m.gs[j] <= hi; j++ {
		top = math.Max(top, predicted(j))
	}
	if top <= 0 {
		return
	}
	k := 0
	for _, j := range sol.assign {
		if j < 0 {
			continue
		}
		v := 100 * predicted(j) / top
		ph.Peaks[k].PredictedIntensity = &v
		k++
	}
}

// phasonTrend fits y = c + slope·x by least squares and flags a positive
// slope beyond three standard uncertainties over at least five points.
//
// Reference: common practice (ordinary least squares).
func phasonTrend(x, y []float64) *PhasonTrend {
	n := float64(len(x))
	if len(x) < 3 {
		return &PhasonTrend{}
	}
	var mx, my float64
	for i := range x {
		mx += x[i]
		my += y[i]
	}
	mx /= n
	my /= n
	var sxx, sxy float64
	for i := range x {
		sxx += (x[i] - mx) * (x[i] - mx)
		sxy += (x[i] - mx) * (y[i] - my)
	}
	if sxx == 0 {
		return &PhasonTrend{}
	}
	slope := sxy / sxx
	var rss float64
	for i := range x {
		r := y[i] - my - slope*(x[i]-mx)
		rss += r * r
	}
	sig := math.Sqrt(rss / (n - 2) / sxx)
	return &PhasonTrend{Slope: slope, SlopeUncertainty: sig, Flagged: len(x) >= 5 && slope > 0 && slope > 3*sig}
}

// takenPhase keeps what a reported phase was built from.
type takenPhase struct {
	s     scored
	peaks []Peak
}

// relabelApproximants marks as approximants the cubic phases, found before
// the icosahedral phase of the same list, whose constant and strong lines
// fit an approximant of that icosahedral phase.
func relabelApproximants(phases []Phase, taken []takenPhase, found []float64, lambda float64, opts Options) {
	if len(found) == 0 {
		return
	}
	refs := make([]Reference, len(found))
	for i, aR := range found {
		refs[i] = Reference{Name: "icosahedral phase in this list", QuasilatticeConstantA: aR}
	}
	aw := approximantWindows(refs, opts.ApproximantOrders, opts.ApproximantTolerance)
	for i, t := range taken {
		if t.s.m.kind != Cubic {
			continue
		}
		m := &model{kind: Approximant, approx: aw, gs: t.s.m.gs, lines: t.s.m.lines}
		sol := t.s.sol
		if sol.approx = m.approximantWindow(sol.a); sol.approx < 0 {
			continue
		}
		lattice := false
		for _, l := range approximantLattices {
			lattice = lattice || l.String() == t.s.m.lattice
		}
		if !lattice || !m.strongLinesIcosahedral(t.peaks, sol, lambda) {
			continue
		}
		w := aw[sol.approx]
		phases[i].Kind = Approximant
		phases[i].Order = w.order.String()
		phases[i].ApproximantOf = w.reference
		phases[i].IdealAA = w.ideal
	}
}

// outranked reports whether a solution of another kind with a higher
// model-choice criterion, not significant itself, indexes at least as many
// peaks and most (four in five) of those all[best] indexes. Then the peaks
// are better explained by a model that chance could also explain, and
// reporting the weaker one in its place would be a guess: the peaks stay
// unidentified. (A cubic crystal's dozen lines, half of which an
// icosahedral model also fits, is the case this guards against.) Only
// another phase of known structure outranks a phase of known structure.
//
// Reference: common practice (a phase call must be the best explanation,
// not merely a significant one).
func outranked(all []scored, best int, maxChance float64) bool {
	b := all[best]
	cb := b.m.evidence(b.sol)
	cubicLike := func(k Kind) bool { return k == Cubic || k == Approximant }
	for i := range all {
		x := all[i]
		if i == best || x.m.reportedKind() == b.m.reportedKind() || x.m.evidence(x.sol) <= cb || x.sol.indexed < b.sol.indexed {
			continue
		}
		// A significant rival was passed over on purpose (preferSubCell);
		// cubic cells and approximants are one family of explanations.
		if (x.basis != "" && x.chance <= maxChance) || (cubicLike(x.m.kind) && cubicLike(b.m.kind)) {
			continue
		}
		// A phase of known structure matched positions and intensities; a
		// lattice or quasilattice that fits positions alone does not set it
		// aside (a pseudo-cubic cell such as Al3Pd2's, c/a ≈ √(3/2), has a
		// cubic I cell that indexes every line).
		if b.m.known != nil && x.m.known == nil {
			continue
		}
		shared := 0
		for k, j := range b.sol.assign {
			if j >= 0 && k < len(x.sol.assign) && x.sol.assign[k] >= 0 {
				shared++
			}
		}
		if 5*shared >= 4*b.sol.indexed {
			return true
		}
	}
	return false
}

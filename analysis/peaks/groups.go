package peaks

import (
	"fmt"
	"math"
	"sort"

	"meltbook/analysis/radiation"
	"meltbook/analysis/scanfile"
)

// maxGroupPeaks caps how many overlapping peaks one window fits together;
// a longer run of overlapping peaks is cut into windows of this many, so
// that a crowded or noisy stretch cannot make one fit of hundreds of
// parameters.
const maxGroupPeaks = 8

// fitAll groups the candidates into windows, fits each window and fills
// res.Peaks, res.Groups and res.Profile.
func fitAll(res *Result, scan scanfile.Scan, cands []candidate, variance []float64, step float64, o Options) {
	x, raw := scan.TwoThetaDeg, scan.Counts
	n := len(x)
	rad := res.Radiation
	doublet := rad.HasKalpha2()
	copy(res.Profile, res.Background)

	span := func(c candidate) (lo, hi float64) {
		fw := math.Max(c.fwhm, 2*step)
		lo, hi = c.center-o.WindowFWHM*fw, c.center+o.WindowFWHM*fw
		if doublet {
			if c2, ok := radiation.DoubletTwoTheta(c.center, rad.Kalpha1Angstrom, rad.Kalpha2Angstrom); ok {
				hi += c2 - c.center
			}
		}
		return lo, hi
	}

	for first := 0; first < len(cands); {
		lo, hi := span(cands[first])
		last := first
		for last+1 < len(cands) && last+1-first < maxGroupPeaks {
			l2, h2 := span(cands[last+1])
			if l2 > hi {
				break
			}
			last++
			hi = math.Max(hi, h2)
		}
		group := cands[first : last+1]
		first = last + 1

		iLo := sort.SearchFloat64s(x, lo)
		iHi := sort.SearchFloat64s(x, hi)
		if iHi >= n {
			iHi = n - 1
		}
		np := bgTerms + perPeak*len(group)
		for iHi-iLo+1 < np+5 && (iLo > 0 || iHi < n-1) {
			iLo = max(iLo-1, 0)
			iHi = min(iHi+1, n-1)
		}
		members := append([]candidate(nil), group...)
		var g *groupFit
		for {
			g = setupFit(x, raw, res.Background, variance, iLo, iHi, members, step, rad)
			g.run(o.MaxIterations)
			// Refuse one candidate at a time, the worst first: no area or
			// no place in the window, then the least significant area,
			// then any the covariance cannot judge (a singular covariance
			// is usually caused by another candidate's zero area).
			worst, worstWhy, worstScore := -1, "", math.Inf(1)
			for k := range members {
				q := g.p[bgTerms+perPeak*k : bgTerms+perPeak*(k+1)]
				su := g.su(bgTerms + perPeak*k + pArea)
				why := rejection(g, q, su, o.Significance)
				if why == "" {
					continue
				}
				score := q[pArea] / su
				switch {
				case !(q[pArea] > 0) || q[pCenter] <= g.lo || q[pCenter] >= g.hi:
					score = math.Inf(-1)
				case math.IsNaN(score):
					score = math.MaxFloat64
				}
				if worst < 0 || score < worstScore {
					worst, worstWhy, worstScore = k, why, score
				}
			}
			if worst < 0 {
				break
			}
			res.Dropped = append(res.Dropped, Dropped{TwoThetaDeg: members[worst].center, Reason: worstWhy})
			members = append(members[:worst], members[worst+1:]...)
			if len(members) == 0 {
				break
			}
		}
		if len(members) == 0 {
			continue
		}
		group = members

		gi := len(res.Groups)
		res.Groups = append(res.Groups, Group{First: iLo, Last: iHi, Peaks: len(group),
			ReducedChiSquare: g.reducedChi2(), Iterations: g.iterations, Converged: g.converged,
			BackgroundLevel: g.p[0], BackgroundSlope: g.p[1], MiddleDeg: g.xMid})
		for i := iLo; i <= iHi; i++ {
			res.Profile[i] += g.p[0] + g.p[1]*(x[i]-g.xMid)
		}
		for k, c := range group {
			base := bgTerms + perPeak*k
			q := g.p[base : base+perPeak]
			p := Peak{
				TwoThetaDeg: q[pCenter], TwoThetaSUDeg: g.su(base + pCenter),
				Area: q[pArea], AreaSU: g.su(base + pArea),
				FWHMDeg: q[pFWHM], FWHMSUDeg: g.su(base + pFWHM),
				Eta: q[pEta], EtaSU: g.su(base + pEta),
				Height: PseudoVoigtHeight(q[pArea], q[pFWHM], q[pEta]), HeightSU: g.heightSU(k),
				Significance: c.significance,
				Group:        gi,
			}
			p.DAngstrom = radiation.TwoThetaToD(p.TwoThetaDeg, rad.Kalpha1Angstrom)
			p.DSUAngstrom = radiation.DSU(p.TwoThetaDeg, p.TwoThetaSUDeg, rad.Kalpha1Angstrom)
			res.Peaks = append(res.Peaks, p)
			addProfile(res.Profile, x, p, g)
		}
	}
}

// setupFit prepares the fit of members to raw − background in the scan
// window iLo … iHi.
func setupFit(x, raw, bg, variance []float64, iLo, iHi int, members []candidate, step float64, rad radiation.Radiation) *groupFit {
	m := iHi - iLo + 1
	g := newGroupFit(m, len(members))
	g.x = x[iLo : iHi+1]
	g.y = make([]float64, m)
	g.w = make([]float64, m)
	for i := range g.y {
		g.y[i] = raw[iLo+i] - bg[iLo+i]
		g.w[i] = 1 / variance[iLo+i]
	}
	g.xMid = 0.5 * (g.x[0] + g.x[m-1])
	g.lo, g.hi = g.x[0], g.x[m-1]
	g.minFWHM = 0.5 * step
	g.maxFWHM = g.x[m-1] - g.x[0]
	if rad.HasKalpha2() {
		g.doublet = true
		g.lambdaRatio = rad.Kalpha2Angstrom / rad.Kalpha1Angstrom
		g.rat = rad.Kalpha2Ratio
	}
	for k, c := range members {
		q := g.p[bgTerms+perPeak*k:]
		q[pCenter] = c.center
		q[pFWHM] = math.Min(math.Max(c.fwhm, g.minFWHM), g.maxFWHM)
		q[pEta] = 0.5
		q[pArea] = c.height / PseudoVoigtHeight(1, q[pFWHM], 0.5)
	}
	return g
}

// rejection says why fitted peak parameters q, with area uncertainty
// areaSU, are not a peak, or "".
func rejection(g *groupFit, q []float64, areaSU, k float64) string {
	switch {
	case !(q[pArea] > 0):
		return "the fit gave it no area"
	case math.IsNaN(areaSU):
		return "the fit cannot determine it (singular covariance)"
	case q[pArea] < k*areaSU:
		return fmt.Sprintf("fitted area %.4g ± %.2g is under %g standard uncertainties", q[pArea], areaSU, k)
	case q[pCenter] <= g.lo || q[pCenter] >= g.hi:
		return "the fit moved it to the edge of its window"
	case q[pFWHM] <= g.minFWHM:
		return "narrower than half a step: a spike, not a diffraction peak"
	case q[pFWHM] >= g.maxFWHM:
		return "as wide as its window: not separable from the background"
	}
	return ""
}

// addProfile adds the peak (and its Kα2 component) to prof within 30 FWHM.
func addProfile(prof, x []float64, p Peak, g *groupFit) {
	add := func(center, area float64) {
		lo := sort.SearchFloat64s(x, center-30*p.FWHMDeg)
		hi := sort.SearchFloat64s(x, center+30*p.FWHMDeg)
		for i := lo; i < hi && i < len(x); i++ {
			prof[i] += PseudoVoigt(x[i], center, p.FWHMDeg, p.Eta, area)
		}
	}
	add(p.TwoThetaDeg, p.Area)
	if g.doublet {
		if c2, _, ok := g.kalpha2(p.TwoThetaDeg); ok {
			add(c2, g.rat*p.Area)
		}
	}
}

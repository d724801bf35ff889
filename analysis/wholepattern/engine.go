package wholepattern

import (
	"fmt"
	"math"
	"sort"

	"meltbook"
	"meltbook/analysis/crystal"
	"meltbook/analysis/peaks"
	"meltbook/analysis/radiation"
)

const (
	// tailCut is how far either side of its center a line is computed, in
	// FWHM.
	tailCut = 25
	// maxExtractionPasses caps the Le Bail passes per cycle, and
	// extractionTol ends them: the passes only re-sum stored line values,
	// so they cost little beside one evaluation of the profiles.
	maxExtractionPasses = 30
	extractionTol       = 1e-4
	// widenedPasses is the number of Le Bail passes per cycle of a widened
	// stage, where the intensities only need to follow the cell.
	widenedPasses = 3
	// gaussianCut is tailCut for the Gaussian lines of the widened stages:
	// exp(−4 ln2 · 3²) ≈ 10⁻¹¹ of the peak.
	gaussianCut = 3
	// intensityFloor keeps every intensity at or above this fraction of the
	// strongest.
	intensityFloor = 1e-6
	// narrowestWidening is the smallest cell error a widened stage covers.
	narrowestWidening = 4e-4
	// widenedCycles caps the cycles of one widened stage.
	widenedCycles = 10
	// detectable is the least χ² a phase's lines must carry, Σ w c², to
	// count as seen: five standard deviations.
	detectable = 25
)

type phaseState struct {
	name   string
	sys    crystal.System
	kind   cellKind
	start  crystal.Cell
	refl   []Reflection
	off    int // index of the first free constant in the parameter vector
	nc     int
	lo, hi []float64 // bounds of the free constants
	intens []float64
	held   bool
}

// line is one wavelength's peak of one reflection.
type line struct {
	phase, refl int
	scale       float64 // 1 for Kα1, R for Kα2
	bragg       float64 // 2θ without zero shift, degrees
	center      float64 // degrees
	tan         float64 // tan θ
	fwhm        float64
	i0, i1      int // points [i0, i1) carry the line
	off         int // offset of the line's values in the buffers
	dcdq        [6]float64
}

type engine struct {
	x, y, w []float64
	lam     [2]float64
	ratio   float64
	doublet bool
	phases  []*phaseState
	nbg     int
	basis   []float64 // n × nbg Chebyshev values

	np                         int
	iZero, iU, iV, iW, iEta    int
	iBg                        int
	p                          []float64
	free                       []bool
	widening                   float64
	holdZero                   bool
	maxCycles                  int
	startErr                   float64
	lambda                     float64
	cycles                     int
	converged                  bool
	warnings                   []string
	lines                      []line
	val, dc, dg, de            []float64
	peak, bg, yc               []float64
	jac                        []float64 // n × np, ∂y_calc/∂p (unweighted)
	normal, grad, damped, step []float64
	trial                      []float64
	chi2                       float64
	su                         []float64
	topIntensity               float64
	cut                        float64 // window half-width in FWHM
	passes                     int     // Le Bail passes per cycle
}

func newEngine(x, y []float64, rad radiation.Radiation, phases []Phase, kinds []cellKind, opt Options) (*engine, error) {
	i0 := sort.SearchFloat64s(x, opt.MinTwoThetaDeg)
	i1 := sort.Search(len(x), func(i int) bool { return x[i] > opt.MaxTwoThetaDeg })
	e := &engine{
		x:         x[i0:i1],
		y:         y[i0:i1],
		nbg:       opt.BackgroundTerms,
		ratio:     rad.Kalpha2Ratio,
		doublet:   rad.HasKalpha2() && rad.Kalpha2Ratio > 0,
		lam:       [2]float64{rad.Kalpha1Angstrom, rad.Kalpha2Angstrom},
		holdZero:  opt.HoldZeroShift,
		maxCycles: opt.MaxCycles,
		startErr:  opt.StartErrorFraction,
		lambda:    1e-3,
		cut:       tailCut,
		passes:    maxExtractionPasses,
	}
	n := len(e.x)
	off := 0
	for p, ph := range phases {
		k := kinds[p]
		q := freeConstants(k, ph.Cell)
		s := &phaseState{name: ph.Name, sys: ph.System, kind: k, refl: ph.Reflections, off: off, nc: len(q)}
		s.start = cellFrom(k, q)
		s.lo, s.hi = make([]float64, len(q)), make([]float64, len(q))
		for j, v := range q {
			if isAngle(k, j) {
				d := 4 * opt.StartErrorFraction / degree
				s.lo[j], s.hi[j] = math.Max(v-d, 1), math.Min(v+d, 179)
			} else {
				s.lo[j], s.hi[j] = v*(1-4*opt.StartErrorFraction), v*(1+4*opt.StartErrorFraction)
			}
		}
		s.intens = make([]float64, len(ph.Reflections))
		off += len(q)
		e.phases = append(e.phases, s)
	}
	e.iZero = off
	e.iU, e.iV, e.iW, e.iEta = off+1, off+2, off+3, off+4
	e.iBg = off + 5
	e.np = e.iBg + e.nbg
	if n < 20 || n <= 2*e.np {
		return nil, meltbook.Errorf(meltbook.Invalid, "options.range", "%d points in %g° to %g°: too few for %d parameters (need at least %d)", n, opt.MinTwoThetaDeg, opt.MaxTwoThetaDeg, e.np, max(20, 2*e.np+1))
	}
	positive := false
	for _, v := range e.y {
		positive = positive || v > 0
	}
	if !positive {
		return nil, meltbook.Errorf(meltbook.Invalid, "counts", "no positive count between %g° and %g°: nothing to fit", opt.MinTwoThetaDeg, opt.MaxTwoThetaDeg)
	}
	e.w = make([]float64, n)
	for i, v := range e.y {
		e.w[i] = 1 / math.Max(v, 1)
	}
	e.basis = make([]float64, n*e.nbg)
	lo, hi := e.x[0], e.x[n-1]
	for i, v := range e.x {
		t := 2*(v-lo)/(hi-lo) - 1
		row := e.basis[i*e.nbg : (i+1)*e.nbg]
		row[0] = 1
		if e.nbg > 1 {
			row[1] = t
		}
		for m := 2; m < e.nbg; m++ {
			row[m] = 2*t*row[m-1] - row[m-2]
		}
	}
	e.p = make([]float64, e.np)
	for _, s := range e.phases {
		copy(e.p[s.off:s.off+s.nc], freeConstants(s.kind, s.start))
	}
	e.p[e.iZero] = opt.StartZeroShiftDeg
	e.peak, e.bg, e.yc = make([]float64, n), make([]float64, n), make([]float64, n)
	e.jac = make([]float64, n*e.np)
	e.normal, e.damped = make([]float64, e.np*e.np), make([]float64, e.np*e.np)
	e.grad, e.step, e.trial = make([]float64, e.np), make([]float64, e.np), make([]float64, e.np)
	e.free = make([]bool, e.np)
	e.su = make([]float64, e.np)

	copy(e.p[e.iBg:], e.startBackground())
	fw := opt.StartFWHMDeg
	if fw == 0 {
		fw = e.estimateFWHM()
	}
	e.p[e.iW] = fw * fw
	e.p[e.iEta] = 0.5
	e.placeOnly()
	return e, nil
}

// startBackground fits the Chebyshev background to the lower envelope of
// the counts: fit, clip the counts to the fit, fit again.
func (e *engine) startBackground() []float64 {
	n := len(e.x)
	yy := append([]float64(nil), e.y...)
	c := make([]float64, e.nbg)
	for pass := 0; pass < 30; pass++ {
		a := make([]float64, e.nbg*e.nbg)
		g := make([]float64, e.nbg)
		for i := 0; i < n; i++ {
			row := e.basis[i*e.nbg : (i+1)*e.nbg]
			for r := 0; r < e.nbg; r++ {
				g[r] += row[r] * yy[i]
				for s := r; s < e.nbg; s++ {
					a[r*e.nbg+s] += row[r] * row[s]
				}
			}
		}
		sol, ok := solveSPD(a, g, e.nbg)
		if !ok {
			break
		}
		c = sol
		for i := 0; i < n; i++ {
			b := e.background(i, c)
			yy[i] = math.Min(yy[i], b)
		}
	}
	return c
}

func (e *engine) background(i int, c []float64) float64 {
	row := e.basis[i*e.nbg : (i+1)*e.nbg]
	b := 0.0
	for m, v := range row {
		b += c[m] * v
	}
	return b
}

// estimateFWHM measures the full width at half maximum of the strongest
// net maximum, bounded to between three point spacings and 2°.
func (e *engine) estimateFWHM() float64 {
	n := len(e.x)
	c := e.p[e.iBg:]
	im, hm := 0, math.Inf(-1)
	for i := 0; i < n; i++ {
		if v := e.y[i] - e.background(i, c); v > hm {
			im, hm = i, v
		}
	}
	half := hm / 2
	l := im
	for l > 0 && e.y[l]-e.background(l, c) > half {
		l--
	}
	r := im
	for r < n-1 && e.y[r]-e.background(r, c) > half {
		r++
	}
	fw := e.x[r] - e.x[l]
	step := (e.x[n-1] - e.x[0]) / float64(n-1)
	return math.Min(math.Max(fw, 3*step), 2)
}

// placeOnly sets the initial intensities from the multiplicities and marks
// phases with no line in range as held.
func (e *engine) placeOnly() {
	e.geometry(e.p, false)
	inRange := make([][]bool, len(e.phases))
	for p, s := range e.phases {
		inRange[p] = make([]bool, len(s.refl))
	}
	lo, hi := e.x[0], e.x[len(e.x)-1]
	for _, ln := range e.lines {
		if ln.scale == 1 && ln.center >= lo && ln.center <= hi {
			inRange[ln.phase][ln.refl] = true
		}
	}
	for p, s := range e.phases {
		any := false
		for r, in := range inRange[p] {
			if in {
				any = true
				s.intens[r] = float64(s.refl[r].Multiplicity)
			}
		}
		if !any {
			s.held = true
			e.warnings = append(e.warnings, fmt.Sprintf("phase %q has no reflection between %.3g° and %.3g°: its cell is held at the start", s.name, lo, hi))
		}
	}
}

// geometry places every line for parameters p: center, width and window,
// and with deriv the derivatives of the centers by the cell constants. It
// reports false when a width is not a positive number.
func (e *engine) geometry(p []float64, deriv bool) bool {
	e.lines = e.lines[:0]
	zero := p[e.iZero]
	u, v, w := p[e.iU], p[e.iV], p[e.iW]
	nw := 1
	if e.doublet {
		nw = 2
	}
	off := 0
	for pi, s := range e.phases {
		q := p[s.off : s.off+s.nc]
		gs := cellFrom(s.kind, q).ReciprocalMetric()
		var gd [6][3][3]float64
		var hq [6]float64
		if deriv {
			qq := make([]float64, s.nc)
			for j := 0; j < s.nc; j++ {
				copy(qq, q)
				hq[j] = 1e-6 * math.Abs(q[j])
				qq[j] += hq[j]
				gd[j] = cellFrom(s.kind, qq).ReciprocalMetric()
			}
		}
		for r, rf := range s.refl {
			s2 := quad(gs, rf.HKL)
			for wl := 0; wl < nw; wl++ {
				lam := e.lam[wl]
				sinT := lam / 2 * math.Sqrt(s2)
				if !(sinT < 1) {
					continue
				}
				th := math.Asin(sinT)
				ln := line{phase: pi, refl: r, scale: 1, bragg: 2 * th / degree, tan: math.Tan(th)}
				if wl == 1 {
					ln.scale = e.ratio
				}
				ln.center = ln.bragg + zero
				wd := 2 * e.widening * ln.tan / degree
				f2 := u*ln.tan*ln.tan + v*ln.tan + w + wd*wd
				if !(f2 > 0) || math.IsInf(f2, 0) {
					return false
				}
				ln.fwhm = math.Sqrt(f2)
				if deriv {
					for j := 0; j < s.nc; j++ {
						sj := lam / 2 * math.Sqrt(quad(gd[j], rf.HKL))
						if sj < 1 {
							ln.dcdq[j] = (2*math.Asin(sj)/degree - ln.bragg) / hq[j]
						}
					}
				}
				lo, hi := ln.center-e.cut*ln.fwhm, ln.center+e.cut*ln.fwhm
				ln.i0 = sort.SearchFloat64s(e.x, lo)
				ln.i1 = sort.SearchFloat64s(e.x, hi)
				ln.off = off
				off += ln.i1 - ln.i0
				e.lines = append(e.lines, ln)
			}
		}
	}
	e.val = grow(e.val, off)
	if deriv {
		e.dc, e.dg, e.de = grow(e.dc, off), grow(e.dg, off), grow(e.de, off)
	}
	return true
}

func grow(b []float64, n int) []float64 {
	if cap(b) < n {
		return make([]float64, n, n+n/4)
	}
	return b[:n]
}

func quad(g [3][3]float64, h [3]int) float64 {
	v := [3]float64{float64(h[0]), float64(h[1]), float64(h[2])}
	s := 0.0
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			s += v[i] * g[i][j] * v[j]
		}
	}
	return s
}

// profiles fills the unit-area line values (times the line's scale) and,
// with deriv, their derivatives by center, width and η.
func (e *engine) profiles(eta float64, deriv bool) {
	for _, ln := range e.lines {
		vals := e.val[ln.off : ln.off+ln.i1-ln.i0]
		if !deriv {
			for i := ln.i0; i < ln.i1; i++ {
				vals[i-ln.i0] = peaks.PseudoVoigt(e.x[i], ln.center, ln.fwhm, eta, ln.scale)
			}
			continue
		}
		dc := e.dc[ln.off : ln.off+ln.i1-ln.i0]
		dg := e.dg[ln.off : ln.off+ln.i1-ln.i0]
		de := e.de[ln.off : ln.off+ln.i1-ln.i0]
		h := 1e-5 * ln.fwhm
		for i := ln.i0; i < ln.i1; i++ {
			x := e.x[i]
			l := peaks.PseudoVoigt(x, ln.center, ln.fwhm, 1, ln.scale)
			g := peaks.PseudoVoigt(x, ln.center, ln.fwhm, 0, ln.scale)
			f := eta*l + (1-eta)*g
			k := i - ln.i0
			vals[k] = f
			de[k] = l - g
			dc[k] = (peaks.PseudoVoigt(x, ln.center+h, ln.fwhm, eta, ln.scale) - f) / h
			dg[k] = (peaks.PseudoVoigt(x, ln.center, ln.fwhm+h, eta, ln.scale) - f) / h
		}
	}
}

// evaluate computes the calculated pattern for p with the current
// intensities and returns S = Σ w (y_obs − y_calc)²; with jac it also
// fills the Jacobian. ok is false when p gives no valid profile.
func (e *engine) evaluate(p []float64, jac bool) (s float64, ok bool) {
	if !e.geometry(p, jac) {
		return math.Inf(1), false
	}
	e.profiles(p[e.iEta], jac)
	n := len(e.x)
	for i := 0; i < n; i++ {
		e.bg[i] = e.background(i, p[e.iBg:])
		e.peak[i] = 0
	}
	if jac {
		clear(e.jac)
	}
	for _, ln := range e.lines {
		ph := e.phases[ln.phase]
		in := ph.intens[ln.refl]
		if in == 0 {
			continue
		}
		vals := e.val[ln.off : ln.off+ln.i1-ln.i0]
		for i := ln.i0; i < ln.i1; i++ {
			e.peak[i] += in * vals[i-ln.i0]
		}
		if !jac {
			continue
		}
		t2 := ln.tan * ln.tan
		dgdu, dgdv, dgdw := t2/(2*ln.fwhm), ln.tan/(2*ln.fwhm), 1/(2*ln.fwhm)
		for i := ln.i0; i < ln.i1; i++ {
			k := i - ln.i0 + ln.off
			row := e.jac[i*e.np : (i+1)*e.np]
			c := in * e.dc[k]
			for j := 0; j < ph.nc; j++ {
				row[ph.off+j] += c * ln.dcdq[j]
			}
			row[e.iZero] += c
			g := in * e.dg[k]
			row[e.iU] += g * dgdu
			row[e.iV] += g * dgdv
			row[e.iW] += g * dgdw
			row[e.iEta] += in * e.de[k]
		}
	}
	for i := 0; i < n; i++ {
		e.yc[i] = e.bg[i] + e.peak[i]
		r := e.y[i] - e.yc[i]
		s += e.w[i] * r * r
		if jac {
			copy(e.jac[i*e.np+e.iBg:(i+1)*e.np], e.basis[i*e.nbg:(i+1)*e.nbg])
		}
	}
	return s, true
}

// recompute sums the pattern again from the line values last computed and
// the current intensities, and returns S.
func (e *engine) recompute() (s float64) {
	clear(e.peak)
	for _, ln := range e.lines {
		in := e.phases[ln.phase].intens[ln.refl]
		if in == 0 {
			continue
		}
		vals := e.val[ln.off : ln.off+ln.i1-ln.i0]
		pk := e.peak[ln.i0:ln.i1]
		for i, v := range vals {
			pk[i] += in * v
		}
	}
	for i := range e.x {
		e.yc[i] = e.bg[i] + e.peak[i]
		r := e.y[i] - e.yc[i]
		s += e.w[i] * r * r
	}
	return s
}

// extractAll repeats the Le Bail formula on the line values last computed
// until no intensity changes by more than extractionTol of itself, at
// most e.passes times, and returns S.
func (e *engine) extractAll() float64 {
	for k := 0; k < e.passes; k++ {
		if e.extract() < extractionTol {
			break
		}
		e.recompute()
	}
	return e.recompute()
}

// extract runs one pass of the Le Bail formula with the pattern last
// evaluated and returns the largest relative change of an intensity.
func (e *engine) extract() (change float64) {
	num := make([][]float64, len(e.phases))
	den := make([][]float64, len(e.phases))
	for p, s := range e.phases {
		num[p] = make([]float64, len(s.refl))
		den[p] = make([]float64, len(s.refl))
	}
	for _, ln := range e.lines {
		vals := e.val[ln.off : ln.off+ln.i1-ln.i0]
		for i := ln.i0; i < ln.i1; i++ {
			v := vals[i-ln.i0]
			den[ln.phase][ln.refl] += v
			if yc := e.yc[i]; yc > 0 && e.y[i] > 0 {
				num[ln.phase][ln.refl] += v * e.y[i] / yc
			}
		}
	}
	top := 0.0
	for p, s := range e.phases {
		for r := range s.refl {
			if den[p][r] > 0 {
				f := num[p][r] / den[p][r]
				if s.intens[r] > intensityFloor*e.topIntensity {
					change = math.Max(change, math.Abs(f-1))
				}
				s.intens[r] *= f
				top = math.Max(top, s.intens[r])
			} else {
				s.intens[r] = 0
			}
		}
	}
	for p, s := range e.phases {
		for r := range s.refl {
			if den[p][r] > 0 && s.intens[r] < intensityFloor*top {
				s.intens[r] = intensityFloor * top
			}
		}
	}
	e.topIntensity = top
	return change
}

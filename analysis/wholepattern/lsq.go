package wholepattern

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// solveSPD solves the symmetric positive-definite system a x = b (a n × n
// row-major, upper triangle read) by Cholesky factorisation.
func solveSPD(a, b []float64, n int) ([]float64, bool) {
	sym := mat.NewSymDense(n, nil)
	for r := 0; r < n; r++ {
		for c := r; c < n; c++ {
			sym.SetSym(r, c, a[r*n+c])
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(sym) {
		return nil, false
	}
	x := mat.NewVecDense(n, nil)
	if err := ch.SolveVecTo(x, mat.NewVecDense(n, append([]float64(nil), b...))); err != nil {
		return nil, false
	}
	out := x.RawVector().Data
	for _, v := range out {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, false
		}
	}
	return append([]float64(nil), out...), true
}

// setFree chooses the refined parameters: the cells of phases not held,
// Z unless held, the background, and with profile the width and η.
func (e *engine) setFree(profile bool) {
	clear(e.free)
	for _, s := range e.phases {
		for j := 0; j < s.nc; j++ {
			e.free[s.off+j] = !s.held
		}
	}
	e.free[e.iZero] = !e.holdZero
	e.free[e.iU], e.free[e.iV], e.free[e.iW], e.free[e.iEta] = profile, profile, profile, profile
	for m := 0; m < e.nbg; m++ {
		e.free[e.iBg+m] = true
	}
}

// normalEquations forms JᵀWJ and JᵀW(y_obs − y_calc) from the last
// evaluation with a Jacobian.
func (e *engine) normalEquations() {
	np := e.np
	clear(e.normal)
	clear(e.grad)
	for i := range e.x {
		row := e.jac[i*np : (i+1)*np]
		w := e.w[i]
		r := w * (e.y[i] - e.yc[i])
		for a := 0; a < np; a++ {
			ja := row[a]
			if ja == 0 {
				continue
			}
			e.grad[a] += ja * r
			wa := w * ja
			na := e.normal[a*np:]
			for b := a; b < np; b++ {
				na[b] += wa * row[b]
			}
		}
	}
}

// active lists the free parameters that the data determine (a column of
// zeros, as for a phase whose lines carry no intensity, is left out).
func (e *engine) active() []int {
	var idx []int
	for a := 0; a < e.np; a++ {
		if e.free[a] && e.normal[a*e.np+a] > 0 {
			idx = append(idx, a)
		}
	}
	return idx
}

// solveStep solves the damped equations over idx into e.step.
func (e *engine) solveStep(idx []int, lambda float64) bool {
	m := len(idx)
	a := make([]float64, m*m)
	b := make([]float64, m)
	for r, pa := range idx {
		b[r] = e.grad[pa]
		for c := r; c < m; c++ {
			a[r*m+c] = e.normal[pa*e.np+idx[c]]
		}
		a[r*m+r] *= 1 + lambda
	}
	x, ok := solveSPD(a, b, m)
	if !ok {
		return false
	}
	clear(e.step)
	for r, pa := range idx {
		e.step[pa] = x[r]
	}
	return true
}

// bound keeps trial parameters in range and reports which cells hit a
// bound.
func (e *engine) bound(p []float64) {
	for _, s := range e.phases {
		for j := 0; j < s.nc; j++ {
			v := &p[s.off+j]
			*v = math.Min(math.Max(*v, s.lo[j]), s.hi[j])
		}
	}
	p[e.iZero] = math.Min(math.Max(p[e.iZero], -zeroBoundDeg), zeroBoundDeg)
	p[e.iEta] = math.Min(math.Max(p[e.iEta], 0), 1)
}

// lmStep takes one damped least-squares step from e.p with the intensities
// held. It returns the largest shift in standard uncertainties, S at the
// new point and whether a step was taken; when it was, the line values
// left in the buffers belong to the new point.
func (e *engine) lmStep() (maxShift, s float64, moved bool) {
	s0, ok := e.evaluate(e.p, true)
	if !ok {
		return 0, s0, false
	}
	e.normalEquations()
	idx := e.active()
	if len(idx) == 0 {
		return 0, s0, false
	}
	for e.lambda < 1e10 {
		if e.solveStep(idx, e.lambda) {
			for a := range e.p {
				e.trial[a] = e.p[a] + e.step[a]
			}
			e.bound(e.trial)
			if s1, ok := e.evaluate(e.trial, false); ok && s1 < s0 {
				e.lambda = math.Max(e.lambda/10, 1e-7)
				e.uncertainties(idx, s1)
				for _, a := range idx {
					if e.su[a] > 0 {
						maxShift = math.Max(maxShift, math.Abs(e.trial[a]-e.p[a])/e.su[a])
					}
				}
				copy(e.p, e.trial)
				return maxShift, s1, true
			}
		}
		e.lambda *= 10
	}
	e.lambda = 1e-3
	return 0, s0, false
}

// uncertainties sets e.su over idx from the normal matrix last formed:
// √(C_jj · S/(N − P)).
func (e *engine) uncertainties(idx []int, s float64) {
	clear(e.su)
	m := len(idx)
	sym := mat.NewSymDense(m, nil)
	for r, pa := range idx {
		for c := r; c < m; c++ {
			sym.SetSym(r, c, e.normal[pa*e.np+idx[c]])
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(sym) {
		return
	}
	var inv mat.SymDense
	if err := ch.InverseTo(&inv); err != nil {
		return
	}
	dof := float64(len(e.x) - m - e.countIntensities())
	if dof <= 0 {
		return
	}
	for r, pa := range idx {
		e.su[pa] = math.Sqrt(math.Max(inv.At(r, r), 0) * s / dof)
	}
}

// countIntensities counts the reflections in range of phases not held.
func (e *engine) countIntensities() int {
	lo, hi := e.x[0], e.x[len(e.x)-1]
	seen := map[[2]int]bool{}
	for _, ln := range e.lines {
		if ln.scale == 1 && ln.center >= lo && ln.center <= hi && !e.phases[ln.phase].held {
			seen[[2]int{ln.phase, ln.refl}] = true
		}
	}
	return len(seen)
}

// stage runs cycles until χ² settles or maxCycles; it reports convergence.
func (e *engine) stage(maxCycles int, tol float64, shiftTol float64) bool {
	prev := math.Inf(1)
	fresh := false // the buffers hold the line values at e.p
	for c := 0; c < maxCycles; c++ {
		e.cycles++
		if !fresh {
			if _, ok := e.evaluate(e.p, false); !ok {
				return false
			}
		}
		e.extractAll()
		shift, s, moved := e.lmStep()
		fresh = moved
		if math.Abs(prev-s) <= tol*s || (moved && e.lambda <= 1e-3 && shift < shiftTol && c > 0) {
			return true
		}
		prev = s
	}
	return false
}

// run carries the widened stages and the final one.
func (e *engine) run() {
	// Widened stages: Gaussian lines, few Le Bail passes per cycle.
	e.setFree(false)
	eta := e.p[e.iEta]
	e.p[e.iEta], e.cut, e.passes = 0, gaussianCut, widenedPasses
	for f := e.startErr; f >= narrowestWidening; f /= 2 {
		e.widening = f
		e.stage(widenedCycles, 1e-3, 0)
	}
	e.widening = 0
	e.p[e.iEta], e.cut, e.passes = eta, tailCut, maxExtractionPasses
	e.setFree(true)
	e.lambda = 1e-3
	e.converged = e.stage(e.maxCycles, 1e-7, 1e-2)
	if !e.converged {
		e.warnings = append(e.warnings, fmt.Sprintf("not converged after %d cycles of the final stage", e.maxCycles))
	}
	// Final extraction, then the curves and uncertainties at the end point.
	e.evaluate(e.p, false)
	e.extract()
	s, _ := e.evaluate(e.p, true)
	e.chi2 = s
	e.normalEquations()
	e.uncertainties(e.active(), s)
}

// result gathers the curves, factors, cells and warnings.
func (e *engine) result() Result {
	n := len(e.x)
	res := Result{
		Points:                 n,
		TwoThetaDeg:            append([]float64(nil), e.x...),
		Observed:               append([]float64(nil), e.y...),
		Calculated:             append([]float64(nil), e.yc...),
		Background:             append([]float64(nil), e.bg...),
		Difference:             make([]float64, n),
		BackgroundCoefficients: append([]float64(nil), e.p[e.iBg:]...),
		Cycles:                 e.cycles,
		Converged:              e.converged,
		ZeroShiftDeg:           e.p[e.iZero],
		ZeroShiftSUDeg:         e.su[e.iZero],
	}
	var swy2, sad, say float64
	for i := 0; i < n; i++ {
		d := e.y[i] - e.yc[i]
		res.Difference[i] = d
		swy2 += e.w[i] * e.y[i] * e.y[i]
		sad += math.Abs(d)
		say += math.Abs(e.y[i])
	}
	res.Parameters = len(e.active()) + e.countIntensities()
	res.Rwp = math.Sqrt(e.chi2 / swy2)
	if say > 0 {
		res.Rp = sad / say
	}
	if dof := n - res.Parameters; dof > 0 {
		res.Rexp = math.Sqrt(float64(dof) / swy2)
		res.Chi2 = e.chi2 / float64(dof)
	}
	res.Profile = Profile{
		U: e.p[e.iU], V: e.p[e.iV], W: e.p[e.iW], Eta: e.p[e.iEta],
		USU: e.su[e.iU], VSU: e.su[e.iV], WSU: e.su[e.iW], EtaSU: e.su[e.iEta],
	}

	// Per-phase χ² carried by its lines, Σ w c².
	carried := make([]float64, len(e.phases))
	contrib := make([]float64, n)
	lo, hi := e.x[0], e.x[n-1]
	for p, s := range e.phases {
		clear(contrib)
		for _, ln := range e.lines {
			if ln.phase != p {
				continue
			}
			vals := e.val[ln.off : ln.off+ln.i1-ln.i0]
			for i := ln.i0; i < ln.i1; i++ {
				contrib[i] += s.intens[ln.refl] * vals[i-ln.i0]
			}
		}
		for i, c := range contrib {
			carried[p] += e.w[i] * c * c
		}
	}
	for p, s := range e.phases {
		q := e.p[s.off : s.off+s.nc]
		rc := RefinedCell{
			Name:    s.name,
			System:  s.sys,
			Cell:    cellFrom(s.kind, q),
			SU:      cellSU(s.kind, e.su[s.off:s.off+s.nc]),
			Free:    append([]string(nil), freeNames[s.kind]...),
			Refined: !s.held,
		}
		for j := 0; j < s.nc && !s.held; j++ {
			if q[j] <= s.lo[j] || q[j] >= s.hi[j] {
				e.warnings = append(e.warnings, fmt.Sprintf("phase %q: %s ran to its bound %g (start %g): the start cell or the phase may be wrong", s.name, freeNames[s.kind][j], q[j], freeConstants(s.kind, s.start)[j]))
			}
		}
		for j := 0; j < s.nc && !s.held; j++ {
			q0 := freeConstants(s.kind, s.start)[j]
			moved, allowed, unit := math.Abs(q[j]/q0-1), e.startErr, "%"
			if isAngle(s.kind, j) {
				moved, allowed, unit = math.Abs(q[j]-q0), e.startErr/degree, "°"
			}
			if moved > allowed {
				if unit == "%" {
					moved, allowed = 100*moved, 100*allowed
				}
				e.warnings = append(e.warnings, fmt.Sprintf("phase %q: %s moved %.3g%s from its start, more than the %.3g%s a start cell may be off: the phase or its start cell may be wrong", s.name, freeNames[s.kind][j], moved, unit, allowed, unit))
			}
		}
		if !s.held && carried[p] < detectable {
			e.warnings = append(e.warnings, fmt.Sprintf("phase %q: its lines carry no intensity above the counting noise (Σ w·y_phase² = %.3g, below %d); its cell is not determined", s.name, carried[p], detectable))
		}
		gs := rc.Cell.ReciprocalMetric()
		for r, rf := range s.refl {
			d := 1 / math.Sqrt(quad(gs, rf.HKL))
			fit := ReflectionFit{HKL: rf.HKL, Multiplicity: rf.Multiplicity, DSpacingA: d, TwoThetaDeg: math.NaN(), FWHMDeg: math.NaN()}
			if sinT := e.lam[0] / (2 * d); sinT < 1 {
				b := 2 * math.Asin(sinT) / degree
				fit.TwoThetaDeg = b + res.ZeroShiftDeg
				fit.FWHMDeg = res.Profile.FWHMDeg(b)
				fit.InRange = fit.TwoThetaDeg >= lo && fit.TwoThetaDeg <= hi
			}
			if fit.InRange {
				fit.Intensity = s.intens[r]
			}
			rc.Reflections = append(rc.Reflections, fit)
		}
		res.Cells = append(res.Cells, rc)
	}
	res.Warnings = append([]string(nil), e.warnings...)
	return res
}

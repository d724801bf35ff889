package peaks

import (
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack/lapack64"
	"gonum.org/v1/gonum/mat"
)

// Parameter layout of a group fit: two background terms, then four per
// peak.
const (
	bgTerms = 2
	perPeak = 4
	pCenter = 0
	pArea   = 1
	pFWHM   = 2
	pEta    = 3
)

// groupFit fits the sum of pseudo-Voigt peaks plus a straight line to net
// intensities in one window by weighted least squares (Levenberg-Marquardt).
//
// The model, with u = x − xMid and, when doublet is set, each peak repeated
// at its Kα2 angle with area ratio·A:
//
//	f(x) = b₀ + b₁u + Σ_k A_k [pV(x; c_k, Γ_k, η_k) + R · pV(x; c₂(c_k), Γ_k, η_k)]
//	sin(c₂/2) = (λ₂/λ₁) sin(c/2)
type groupFit struct {
	x, y, w []float64 // window angles, net intensities, weights 1/σ²
	xMid    float64
	lo, hi  float64 // allowed centers
	minFWHM float64
	maxFWHM float64

	doublet          bool
	lambdaRatio, rat float64 // λ₂/λ₁ and I(Kα2)/I(Kα1)

	c2, dc2 []float64 // per peak: Kα2 angle and its derivative by the Kα1 angle
	has2    []bool

	p      []float64 // parameters
	trial  []float64
	jac    []float64 // n × np, row-major
	resid  []float64 // weighted residuals √w (y − f)
	model  []float64
	normal []float64 // JᵀWJ, np × np row-major (upper triangle used)
	grad   []float64 // JᵀW r
	damped []float64 // scratch for the damped normal matrix
	rhs    []float64 // scratch: right-hand side, then the step

	iterations int
	converged  bool
	chi2       float64
	cov        *mat.SymDense // scaled covariance, nil if singular
}

func newGroupFit(n, npk int) *groupFit {
	np := bgTerms + perPeak*npk
	return &groupFit{
		c2:     make([]float64, npk),
		dc2:    make([]float64, npk),
		has2:   make([]bool, npk),
		p:      make([]float64, np),
		trial:  make([]float64, np),
		jac:    make([]float64, n*np),
		resid:  make([]float64, n),
		model:  make([]float64, n),
		normal: make([]float64, np*np),
		grad:   make([]float64, np),
		damped: make([]float64, np*np),
		rhs:    make([]float64, np),
	}
}

func (g *groupFit) npk() int { return (len(g.p) - bgTerms) / perPeak }

// kalpha2 returns the Kα2 angle of a Kα1 center and its derivative.
func (g *groupFit) kalpha2(c float64) (c2, dc2 float64, ok bool) {
	s := g.lambdaRatio * math.Sin(c/2*degree)
	if s >= 1 {
		return 0, 0, false
	}
	t2 := math.Asin(s)
	return 2 * t2 / degree, g.lambdaRatio * math.Cos(c/2*degree) / math.Cos(t2), true
}

// evaluate fills model and weighted residuals for parameters p, and the
// weighted Jacobian when withJac; it returns χ².
func (g *groupFit) evaluate(p []float64, withJac bool) float64 {
	np := len(p)
	npk := g.npk()
	if g.doublet {
		for k := 0; k < npk; k++ {
			g.c2[k], g.dc2[k], g.has2[k] = g.kalpha2(p[bgTerms+perPeak*k+pCenter])
		}
	}
	chi2 := 0.0
	for i, x := range g.x {
		u := x - g.xMid
		f := p[0] + p[1]*u
		sw := math.Sqrt(g.w[i])
		var row []float64
		if withJac {
			row = g.jac[i*np : (i+1)*np]
			row[0] = sw
			row[1] = sw * u
		}
		for k := 0; k < npk; k++ {
			q := p[bgTerms+perPeak*k : bgTerms+perPeak*(k+1)]
			c, a, fw, eta := q[pCenter], q[pArea], q[pFWHM], q[pEta]
			v, dc, dw, de := pvTerms(x, c, fw, eta)
			if g.doublet && g.has2[k] {
				v2, dcc, dw2, de2 := pvTerms(x, g.c2[k], fw, eta)
				v += g.rat * v2
				dc += g.rat * dcc * g.dc2[k]
				dw += g.rat * dw2
				de += g.rat * de2
			}
			f += a * v
			if withJac {
				r := row[bgTerms+perPeak*k:]
				r[pCenter] = sw * a * dc
				r[pArea] = sw * v
				r[pFWHM] = sw * a * dw
				r[pEta] = sw * a * de
			}
		}
		g.model[i] = f
		r := sw * (g.y[i] - f)
		g.resid[i] = r
		chi2 += r * r
	}
	return chi2
}

// clamp keeps parameters in their physical ranges.
func (g *groupFit) clamp(p []float64) {
	for k := 0; k < g.npk(); k++ {
		q := p[bgTerms+perPeak*k:]
		q[pCenter] = math.Min(math.Max(q[pCenter], g.lo), g.hi)
		q[pArea] = math.Max(q[pArea], 0)
		q[pFWHM] = math.Min(math.Max(q[pFWHM], g.minFWHM), g.maxFWHM)
		q[pEta] = math.Min(math.Max(q[pEta], 0), 1)
	}
}

// pinned reports whether parameter a sits on a bound of clamp with the
// gradient of −χ²/2 pointing out of the allowed range.
func (g *groupFit) pinned(a int) bool {
	v, gr := g.p[a], g.grad[a]
	var lo, hi float64
	switch (a - bgTerms) % perPeak {
	case pCenter:
		lo, hi = g.lo, g.hi
	case pArea:
		lo, hi = 0, math.Inf(1)
	case pFWHM:
		lo, hi = g.minFWHM, g.maxFWHM
	case pEta:
		lo, hi = 0, 1
	}
	return v <= lo && gr < 0 || v >= hi && gr > 0
}

// formNormal builds JᵀWJ (upper triangle) and JᵀW r from the current
// Jacobian and residuals.
func (g *groupFit) formNormal() {
	np := len(g.p)
	for a := range g.normal {
		g.normal[a] = 0
	}
	for a := range g.grad {
		g.grad[a] = 0
	}
	for i := range g.x {
		row := g.jac[i*np : (i+1)*np]
		r := g.resid[i]
		for a, ja := range row {
			if ja == 0 {
				continue
			}
			g.grad[a] += ja * r
			na := g.normal[a*np : (a+1)*np]
			for b := a; b < np; b++ {
				na[b] += ja * row[b]
			}
		}
	}
}

// solveDamped solves (JᵀWJ + λ·diag(JᵀWJ)) δ = JᵀW r, with pinned
// parameters held fixed, into g.rhs; false when the matrix is not positive
// definite.
func (g *groupFit) solveDamped(lambda float64) bool {
	np := len(g.p)
	copy(g.damped, g.normal)
	copy(g.rhs, g.grad)
	for a := 0; a < np; a++ {
		d := g.normal[a*np+a]
		if d == 0 {
			d = 1e-12
		}
		g.damped[a*np+a] = d * (1 + lambda)
	}
	// A parameter held at a bound that the gradient pushes against stays
	// there: drop it from this step (projected step).
	for a := bgTerms; a < np; a++ {
		if g.pinned(a) {
			for b := 0; b < np; b++ {
				if b != a {
					g.damped[min(a, b)*np+max(a, b)] = 0
				}
			}
			g.rhs[a] = 0
		}
	}
	t, ok := lapack64.Potrf(blas64.Symmetric{N: np, Stride: np, Data: g.damped, Uplo: blas.Upper})
	if !ok {
		return false
	}
	lapack64.Potrs(t, blas64.General{Rows: np, Cols: 1, Stride: 1, Data: g.rhs})
	for _, v := range g.rhs {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return false
		}
	}
	return true
}

// run minimises χ² from the starting parameters in g.p, for at most
// maxIter accepted or rejected steps.
//
// Reference: K. Levenberg, Q. Appl. Math. 2, 164 (1944); D. W. Marquardt,
// J. Soc. Ind. Appl. Math. 11, 431 (1963), doi:10.1137/0111030.
func (g *groupFit) run(maxIter int) {
	np := len(g.p)
	g.clamp(g.p)
	g.chi2 = g.evaluate(g.p, true)
	g.formNormal()
	lambda := 1e-3
	for g.iterations = 0; g.iterations < maxIter; g.iterations++ {
		if g.solveDamped(lambda) {
			for a := 0; a < np; a++ {
				g.trial[a] = g.p[a] + g.rhs[a]
			}
			g.clamp(g.trial)
			// evaluate overwrites the residuals, but the gradient
			// already holds what the next damped step needs.
			if chi2 := g.evaluate(g.trial, false); chi2 < g.chi2 {
				drop := g.chi2 - chi2
				copy(g.p, g.trial)
				g.chi2 = g.evaluate(g.p, true)
				g.formNormal()
				lambda = math.Max(lambda/10, 1e-9)
				// A fall in χ² far below one moves no parameter by a
				// meaningful fraction of its uncertainty.
				if drop < 1e-3 || drop < 1e-9*g.chi2 {
					g.converged = true
					break
				}
				continue
			}
		}
		lambda *= 10
		if lambda > 1e12 {
			// No step along the gradient lowers χ²: a minimum (to
			// rounding) has been reached.
			g.converged = true
			break
		}
	}
	g.evaluate(g.p, true)
	g.formNormal()
	g.covariance()
}

// covariance sets g.cov = (JᵀWJ)⁻¹ · χ²/(n − p), or nil when the normal
// matrix is singular or there are no degrees of freedom.
func (g *groupFit) covariance() {
	np := len(g.p)
	dof := len(g.x) - np
	g.cov = nil
	if dof <= 0 {
		return
	}
	var ch mat.Cholesky
	if !ch.Factorize(mat.NewSymDense(np, append([]float64(nil), g.normal...))) {
		return
	}
	var inv mat.SymDense
	if err := ch.InverseTo(&inv); err != nil {
		return
	}
	inv.ScaleSym(g.chi2/float64(dof), &inv)
	g.cov = &inv
}

// reducedChi2 returns χ²/(n − p), NaN without degrees of freedom.
func (g *groupFit) reducedChi2() float64 {
	dof := len(g.x) - len(g.p)
	if dof <= 0 {
		return math.NaN()
	}
	return g.chi2 / float64(dof)
}

// su returns the standard uncertainty of parameter a, NaN when unknown.
func (g *groupFit) su(a int) float64 {
	if g.cov == nil {
		return math.NaN()
	}
	v := g.cov.At(a, a)
	if !(v >= 0) {
		return math.NaN()
	}
	return math.Sqrt(v)
}

// heightSU propagates the covariance of (area, FWHM, η) of peak k into the
// standard uncertainty of its height H = A/Γ · (η·2/π + (1−η)·2√(ln2/π)).
func (g *groupFit) heightSU(k int) float64 {
	if g.cov == nil {
		return math.NaN()
	}
	base := bgTerms + perPeak*k
	a, fw, eta := g.p[base+pArea], g.p[base+pFWHM], g.p[base+pEta]
	shape := eta*lorentzN + (1-eta)*gaussN
	grad := [3]float64{shape / fw, -a * shape / (fw * fw), a / fw * (lorentzN - gaussN)}
	idx := [3]int{base + pArea, base + pFWHM, base + pEta}
	v := 0.0
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			v += grad[i] * grad[j] * g.cov.At(idx[i], idx[j])
		}
	}
	if !(v >= 0) {
		return math.NaN()
	}
	return math.Sqrt(v)
}

package indexing

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mathext"
)

// fisherChance bounds the chance that uniformly random peaks score at
// least s with a phase of known structure, analytically instead of by
// random lists.
//
// Each indexed peak's p is the probability that a random peak lands as
// close to an eligible line as it does (2·|residual|·line density), and a
// peak left unindexed has p = 1, so for one fixed scale and zero shift
// every −ln pᵢ is at most an exponential variate with mean 1 and, for n
// independent peaks, S = Σ −ln pᵢ is at most a Gamma(n, 1) variate
// (Fisher's method of combining p-values):
//
//	P(S ≥ s) ≤ Q(n, s) = e^(−s) · Σₖ₌₀ⁿ⁻¹ sᵏ/k!
//
// The search tries every scale within ±knownScaleSlack and every zero shift
// within ±maxZero; the solutions it can reach are about
//
//	N = (1 + 2·slack·q_last / (2·δq_last)) · (1 + maxZero/tol)
//
// apart by more than the tolerance (δq_last is the tolerance in q at the
// last peak), and the bound is Bonferroni's, min(1, N·Q(n, s)).
// The unobserved-line penalty only lowers scores and is left out, so the
// bound stays an upper one. Sampling random lists cannot resolve chances
// below 1/(lists + 1), which for a library of many phases is above the
// decision threshold; the bound resolves them at no cost.
//
// Reference: R. A. Fisher, Statistical Methods for Research Workers, 4th
// ed. (1932), §21.1 (combining probabilities); the Bonferroni bound is
// common practice.
func fisherChance(peaks []Peak, cfg searchConfig, s float64) (float64, string) {
	n := len(peaks)
	if n == 0 || s <= 0 {
		return 1, "no peaks indexed"
	}
	last := 0.0
	for _, p := range peaks {
		last = math.Max(last, p.TwoThetaDeg)
	}
	q := qAt(last, cfg.lambda)
	dq := (qAt(math.Min(last+cfg.tol, 179.99), cfg.lambda) - qAt(math.Max(last-cfg.tol, 0.01), cfg.lambda)) / 2
	trials := 1 + knownScaleSlack*q/dq
	if cfg.tol > 0 {
		trials *= 1 + cfg.maxZero/cfg.tol
	}
	c := math.Min(1, trials*mathext.GammaIncRegComp(float64(n), s))
	return c, fmt.Sprintf("Fisher bound for %d peaks over %.0f distinct scales and zero shifts", n, trials)
}

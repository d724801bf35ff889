// Package suggest proposes what to melt next in one alloy system: the
// compositions where the notebook's own results make a quasicrystal most
// likely, or where too few runs have been made to know.
//
// The estimate is a kernel-weighted Beta-Bernoulli model, a light stand-in
// for a Gaussian process on a binary outcome. Each characterised sample i of
// the system is a point x_i on the composition simplex with outcome y_i
// (1 quasicrystal, 0 none, ½ ambiguous). At a candidate composition x every
// point gets a Gaussian weight
//
//	w_i = exp(−d(x, x_i)² / (2h²)) · c_i
//	d(x, y) = sqrt(½ Σ_e (x_e − y_e)²)
//
// where h is the bandwidth and c_i an optional cooling-rate factor (below);
// points beyond 8h (w < e^−32) are left out of the sums.
// The distance is scaled by ½ so that moving δ of atomic fraction from one
// element to another is a distance of exactly δ. The weights act as
// fractional counts added to a Beta prior of mean p₀ and weight α:
//
//	a = α·p₀ + Σ w_i·y_i
//	b = α·(1 − p₀) + Σ w_i·(1 − y_i)
//	p(x) = a / (a + b)                              (posterior mean)
//	s(x) = sqrt(a·b / ((a + b)²·(a + b + 1)))       (posterior standard deviation)
//
// p(x) is the Nadaraya-Watson kernel regression of y shrunk towards p₀
// where data are sparse; s(x) is large where the weighted count a+b is small,
// which is where nothing has been melted. Candidates are ranked by the upper
// confidence bound
//
//	score(x) = p(x) + κ·s(x)
//
// with κ ≥ 0 trading exploration against exploitation (κ = 0: pure
// exploitation). The prior mean p₀ defaults to Laplace's rule of succession
// over the points used, (Σ y_i + 1)/(n + 2).
//
// Candidates lie on a grid of the simplex with a fixed step (0.5 at.% by
// default), inside a region that is by default the range of the points
// widened by a margin. A candidate is dropped when it is closer than a
// minimum distance to a composition already melted, and, when an e/a window
// is given, when its e/a (Σ x_e·v_e under the window's valences) lies outside
// the window. Suggestions are picked greedily by score, each at least a
// separation distance from those already picked, so that they do not crowd
// one spot.
//
// When a target cooling rate r* is given, points are further weighted by how
// close their cooling rate is on a logarithmic scale,
//
//	c_i = exp(−(log₁₀ r_i − log₁₀ r*)² / (2h_r²)),
//
// with h_r in decades; a point of unknown rate counts as one bandwidth away
// (c_i = e^(−½)). Points may also be restricted to as-spun or to annealed
// samples.
//
// The package is pure: plain values in, plain values out.
//
// Reference: E. A. Nadaraya, Theory Probab. Appl. 9, 141 (1964),
// doi:10.1137/1109020; G. S. Watson, Sankhyā A 26, 359 (1964) (kernel
// regression). P. Auer, N. Cesa-Bianchi, P. Fischer, Mach. Learn. 47, 235
// (2002), doi:10.1023/A:1013689704352; N. Srinivas, A. Krause, S. Kakade,
// M. Seeger, Proc. ICML 2010, arXiv:0912.3995 (upper-confidence-bound
// selection). Beta-Bernoulli updating with fractional counts and Laplace's
// rule: common practice in experiment planning.
package suggest

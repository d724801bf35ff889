// Package indexing indexes a powder diffraction peak list against three
// kinds of model: icosahedral quasicrystals (P, F, I), cubic crystals
// (P, I, F) and cubic approximants of icosahedral phases (orders 1/1, 2/1,
// 3/2). It fits the lattice or quasilattice constant and a zero shift by
// least squares, labels every peak, separates mixtures phase by phase and
// says, for each phase, how likely a fit that good would be by chance.
//
// Input is plain values: peak positions 2θ in degrees with relative
// intensities, and one wavelength in Å (a Kα2 component must be stripped
// before). Geometry of the reflections lives in the sub-packages icosa and
// cubic.
//
// # Figure of merit
//
// Each candidate solution is scored by
//
//	S = Σ −ln pᵢ   over the indexed peaks,   pᵢ = min(1, 2·max(|rᵢ|, r₀)·ρᵢ)
//
// where rᵢ is the peak's residual in 2θ, r₀ a floor for measurement
// precision and ρᵢ the model's density of allowed lines (per degree) around
// the peak: pᵢ is the probability that a peak dropped at random near peak i
// would land at least as close to an allowed line. S is in nats and grows
// with the number of peaks indexed, with their accuracy and with the
// sparseness of the model, so a dense model (large cubic cell, large
// perpendicular-space cut-off) earns little for a hit.
//
// # Chance
//
// Because the set of icosahedral line positions is dense and every search
// scans a range of cell sizes, a good-looking S proves nothing by itself.
// Every model's best S is therefore compared with the best S the same search
// reaches on random peak lists of the same count, spread uniformly over the
// same 2θ range (5° buckets) and wavelength. The random lists come from a
// fixed seed, so the answer is repeatable; their scores are computed on first
// need and kept for the life of the process. Chance is the fraction of random
// lists that scored at least as well, or, beyond the simulated lists, an
// exponential tail fitted to their upper quarter. A phase is reported only
// when its chance, corrected for the lattice types tried for its kind, is at
// most Options.MaxChance.
//
// Reference: P. M. de Wolff, J. Appl. Cryst. 1, 108 (1968) and G. S. Smith,
// R. L. Snyder, J. Appl. Cryst. 12, 60 (1979) for figures of merit that
// weigh accuracy against line density; J. W. Cahn, D. Shechtman,
// D. Gratias, J. Mater. Res. 1, 13 (1986) for icosahedral indexing; V. Elser,
// C. L. Henley, Phys. Rev. Lett. 55, 2883 (1985) for cubic approximants.
package indexing

// Package indexing indexes a powder diffraction peak list against
// icosahedral quasicrystals (P, F, I), cubic crystals (P, I, F), cubic
// approximants of icosahedral phases (orders 1/1, 2/1, 3/2) and phases of
// known structure (search-match). It fits the lattice or quasilattice constant and a zero shift by
// least squares, labels every peak, separates mixtures phase by phase and
// says, for each phase, how likely a fit that good would be by chance.
//
// Input is plain values: peak positions 2θ in degrees with relative
// intensities, and one wavelength in Å (a Kα2 component must be stripped
// before). Geometry of the reflections lives in the sub-packages icosa and
// cubic.
//
// # Search
//
// Each model proposes scales by putting each of the five strongest peaks on
// each line it may explain within the model's range of cell sizes (for
// icosahedral models only families with |G⊥|·a6 ≤ 0.30 may explain a strong
// peak), keeps proposals that put a second strong peak on a line, scores
// them with no zero shift and refines the best six by least squares on the
// scale and the zero shift, matching the peaks again each time. A peak is
// matched to the strongest eligible line within the tolerance (icosahedral
// and library models, see below) or to the nearest (cubic). Mixtures are
// handled by taking the best significant phase, removing its peaks and
// searching again.
//
// # Icosahedral intensities
//
// The icosahedral models keep every family out to |G⊥|·a6 = 0.8
// (Options.PerpCutoff, an upper bound) and weigh each by the intensity a
// cut-and-project model with one spherical atomic surface per node
// predicts (icosa.Intensity):
//
//	I = m · ⟨g(2π|G⊥|R)²⟩ · exp(−B⊥(|G⊥|·a6)²),   g(x) = 3(sin x − x cos x)/x³
//
// with m the multiplicity, g the Fourier transform of a uniform ball, R the
// radius of the ball with the volume of the lattice type's window (the
// perpendicular-space projection of the direct 6D cell: the rhombic
// triacontahedron of edge a6/√2 for P, V = 4.3525·a6³, R = 1.0131·a6; F and
// I in proportion to their direct cells, R = 1.2764·a6 and 0.8041·a6),
// ⟨⟩ an average over radii spanning the triacontahedron's in-radius to
// its 5-fold radius (0.96–1.13·R), which fills the single sphere's zeros,
// and B⊥ = 1 (in units of a6²) a mild phason Debye–Waller factor. Weights
// are relative to the strongest family with |G∥|·a6 ≤ 6.7 (the range of a
// Cu Kα scan) and capped at 1. The families are then used like the lines of
// a library phase: a strong peak must sit on a family predicted strong, a
// weak one may take a family of large |G⊥|, the line density counts the
// eligible families only, and strong predicted families where no peak
// lies cost nats. Indexed icosahedral peaks carry the predicted intensity
// (with the Lorentz–polarisation factor, strongest family in the scan's
// range 100). The fit of |Δq| against |G⊥| over the indexed peaks
// (PhasonTrend) flags residuals that grow with |G⊥|, the powder signature
// of phason strain.
//
// Reference: V. Elser, Acta Cryst. A42, 36 (1986); C. Janot,
// Quasicrystals: A Primer, 2nd ed., Oxford (1994), ch. 4 (from memory).
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
// sparseness of the model, so a dense model (large cubic cell, many weak
// icosahedral families) earns little for a hit.
//
// A general cubic solution also pays for lines it predicts where nothing is
// seen: of its eight lowest allowed lines from d = 1.5·d(first peak) up to
// the last peak, each with no peak within the tolerance costs 1 nat, and S
// is kept at 0 or above. This tells P from I and F of the same constant
// and a cell from its √2, √3 or doubled multiples, which sparse lines
// otherwise score alike; approximant and icosahedral models carry no such
// cost here (icosahedral models pay for missing strong families as library
// phases do, below). The random lists of the chance calibration are scored
// the same way.
//
// Among solutions whose constants differ by a factor √n (n = 2 … 16), the
// smaller cell is taken when it indexes at least as many peaks, within a
// model's search and between the cubic models; an approximant whose
// constant is 2, 3 or 4 times that of a significant cubic solution
// indexing its three strongest peaks gives way to that solution.
//
// # Search-match against phases of known structure
//
// Options.Library offers phases of known structure with their computed
// lines; the same intensity-weighted scoring serves the icosahedral models. Each is a model of its own whose scale is the ratio of the cell
// to the published one, within ±2 % (solid solution), beside the zero
// shift. Lines carry their predicted intensity w and peaks their observed
// one o, both with the Lorentz–polarisation factor removed and relative to
// the strongest: a line may explain a peak only when w ≥ 0.05·o, the
// strongest such line within the tolerance explains it, and the line
// density ρ of the figure of merit counts only the lines eligible for the
// peak, so a strong peak on a strong predicted line earns much. Each
// predicted line with w ≥ 0.15, inside the range of the scan's peaks, with
// no peak of the scan (those other phases took included) within the
// tolerance costs 3·w nats. The chance is calibrated like every other
// model's and corrected for the number of library phases tried.
//
// # Model choice
//
// Among the solutions of all models, the one with the highest
//
//	C = S − ln K − Σⱼ ln(Δⱼ / σ₀ⱼ)
//
// is taken first when it is significant: K is the number of models of its
// kind tried, Δⱼ the width of the search range of fitted constant j and
// σ₀ⱼ the uncertainty a residual of r₀ on every indexed peak would give it.
// The sum is the Occam factor: a constant free over a wide range (a cubic
// cell of 2.5–16 Å) pays more than one known in advance to ±2 % (a library
// phase), and every free constant pays. C is reported as Evidence.
//
// Reference: D. J. C. MacKay, Information Theory, Inference, and Learning
// Algorithms, Cambridge University Press (2003), ch. 28.
//
// # Chance
//
// Because the set of icosahedral line positions is dense and every search
// scans a range of cell sizes, a good-looking S proves nothing by itself.
// Every model's best S is therefore compared with the best S the same search
// reaches on random peak lists of the same count, spread uniformly over the
// same 2θ range (5° buckets) and wavelength. The random lists come from a
// fixed seed, so the answer is repeatable; their scores are computed on first
// need and kept for the life of the process: 256 lists per model, peak
// count and range, and 1024 where the first estimate lies near the
// threshold. Chance is the fraction of random lists that scored at least as
// well, or, where fewer than eight did, an exponential tail fitted to the
// best of them (peaks over threshold). Checked against 2048 fresh random
// lists, the tail estimate near a true 1 % scatters by up to a factor of
// about five either way, more often high than low; the Šidák correction
// over the lattice types of a kind moves the reported chance towards the
// conservative side. A phase is
// reported only when its corrected chance is at most Options.MaxChance.
//
// Reference: P. M. de Wolff, J. Appl. Cryst. 1, 108 (1968) and G. S. Smith,
// R. L. Snyder, J. Appl. Cryst. 12, 60 (1979) for figures of merit that
// weigh accuracy against line density; J. W. Cahn, D. Shechtman,
// D. Gratias, J. Mater. Res. 1, 13 (1986) for icosahedral indexing; V. Elser,
// C. L. Henley, Phys. Rev. Lett. 55, 2883 (1985) for cubic approximants.
package indexing

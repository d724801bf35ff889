package indexing

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"sort"

	"meltbook/analysis/crystal"
	"meltbook/analysis/indexing/icosa"
	"meltbook/analysis/indexing/lattice"
)

// Structured decoys: peak lists made from patterns of random crystals and
// random icosahedral phases, against which a model's chance is calibrated
// beside the uniform random lists. A large cubic cell fits a dozen lines of
// almost any real crystal, and a uniform list is no test of that.

// decoySet names the decoys a model is calibrated against.
type decoySet string

const (
	// noDecoys: uniform random lists only.
	noDecoys decoySet = ""
	// nonCubicAndIcosahedral: random tetragonal, hexagonal, rhombohedral,
	// orthorhombic, monoclinic and triclinic crystals, and random
	// icosahedral phases (for the general cubic models).
	nonCubicAndIcosahedral decoySet = "noncubic+icosahedral"
	// nonCubic: the six non-cubic systems only (for approximants, which
	// stand near icosahedral phases by nature).
	nonCubic decoySet = "noncubic"
	// cubicAndNonCubic: random cubic crystals and the six non-cubic
	// systems (for the icosahedral models).
	cubicAndNonCubic decoySet = "cubic+noncubic"
	// everything: every crystal system and icosahedral phases (library
	// phases).
	everything decoySet = "all"
)

// Sizes of the decoy calibration (see nullSmall, nullLarge).
const (
	decoySmall = 128
	decoyLarge = 512
)

// decoyClasses lists, per set, the generators drawn in turn.
var decoyClasses = map[decoySet][]Kind{
	nonCubicAndIcosahedral: {Tetragonal, Hexagonal, Rhombohedral, Orthorhombic, Monoclinic, Triclinic, Icosahedral},
	nonCubic:               {Tetragonal, Hexagonal, Rhombohedral, Orthorhombic, Monoclinic, Triclinic},
	cubicAndNonCubic:       {Cubic, Cubic, Tetragonal, Hexagonal, Rhombohedral, Orthorhombic, Monoclinic, Triclinic},
	everything:             {Cubic, Tetragonal, Hexagonal, Rhombohedral, Orthorhombic, Monoclinic, Triclinic, Icosahedral},
}

// decoys returns the decoy set a model is calibrated against.
func (m *model) decoys() decoySet {
	switch m.kind {
	case Cubic:
		return nonCubicAndIcosahedral
	case Approximant:
		return nonCubic
	case Icosahedral:
		return cubicAndNonCubic
	case library:
		// A random cubic crystal within 2 % of a cubic phase's constant
		// has its very lines: no decoy, but the same answer.
		if m.known.System == Cubic {
			return nonCubicAndIcosahedral
		}
		return everything
	}
	return noDecoys
}

// decoyPeaks draws the i-th decoy list of a null distribution: a random
// phase of the i-th class of the set, its computed lines in the key's 2θ
// range at its wavelength merged where closer than half the tolerance, and
// the key.n strongest of them. It returns nil when the phase has too few
// lines in the range (the list then counts as scoring 0).
func decoyPeaks(key nullKey, set decoySet, i int) []Peak {
	classes := decoyClasses[set]
	rng := rand.New(rand.NewPCG(key.seed(), uint64(i)))
	kind := classes[i%len(classes)]
	lambda := float64(key.lambda) * 1e-6
	lo, hi := float64(key.lo), float64(key.hi)
	var lines []Peak
	if kind == Icosahedral {
		lines = icosahedralDecoy(rng, lambda, lo, hi)
	} else {
		lines = crystalDecoy(rng, kind, lambda, lo, hi)
	}
	lines = mergeLines(lines, float64(key.tol)*1e-6/2)
	if len(lines) < key.n {
		return nil
	}
	sort.Slice(lines, func(a, b int) bool { return lines[a].Intensity > lines[b].Intensity })
	lines = lines[:key.n]
	sort.Slice(lines, func(a, b int) bool { return lines[a].TwoThetaDeg < lines[b].TwoThetaDeg })
	return lines
}

// mergeLines sums lines (sorted or not) closer than sep degrees into one at
// their intensity-weighted position, and returns them sorted by 2θ.
func mergeLines(lines []Peak, sep float64) []Peak {
	sort.Slice(lines, func(a, b int) bool { return lines[a].TwoThetaDeg < lines[b].TwoThetaDeg })
	var out []Peak
	for _, l := range lines {
		if n := len(out); n > 0 && l.TwoThetaDeg-out[n-1].TwoThetaDeg < sep {
			p := &out[n-1]
			w := p.Intensity + l.Intensity
			if w > 0 {
				p.TwoThetaDeg = (p.TwoThetaDeg*p.Intensity + l.TwoThetaDeg*l.Intensity) / w
			}
			p.Intensity = w
			continue
		}
		out = append(out, l)
	}
	return out
}

// crystalDecoy computes the lines of a random crystal of the system: a
// random cell (edges 2.8–12 Å, angles as the system allows), a random
// centring of those the system has, and two to six point scatterers at
// random positions with a common Gaussian fall-off f(s) = exp(−3 s²)
// (s = sinθ/λ in Å⁻¹, roughly the shape of a light metal's form factor),
// so that intensities vary from line to line as in a real pattern:
//
//	I(hkl) = |Σⱼ f(s) exp(2πi h·xⱼ)|² · LP(2θ),  Friedel mates merged
//
// A centring enters through its reflection conditions; equal d-spacings
// of reflections that symmetry would relate add up in mergeLines.
//
// Reference: common practice (kinematic structure factor; reflection
// conditions of the centred lattices, International Tables for
// Crystallography Vol. A, Table 2.2.13.1).
func crystalDecoy(rng *rand.Rand, kind Kind, lambda, lo, hi float64) []Peak {
	edge := func() float64 { return 2.8 + 9.2*rng.Float64() }
	a, b, c := edge(), edge(), edge()
	alpha, beta, gamma := 90.0, 90.0, 90.0
	centrings := []byte{'P'}
	switch kind {
	case Cubic:
		b, c = a, a
		centrings = []byte{'P', 'I', 'F'}
	case Tetragonal:
		b = a
		centrings = []byte{'P', 'I'}
	case Hexagonal:
		b, gamma = a, 120
	case Rhombohedral:
		// Hexagonal axes, obverse setting.
		b, gamma = a, 120
		centrings = []byte{'R'}
	case Orthorhombic:
		centrings = []byte{'P', 'C', 'I', 'F'}
	case Monoclinic:
		beta = 95 + 25*rng.Float64()
		centrings = []byte{'P', 'C'}
	case Triclinic:
		alpha, beta, gamma = 75+30*rng.Float64(), 75+30*rng.Float64(), 75+30*rng.Float64()
	}
	centring := lattice.Centring(centrings[rng.IntN(len(centrings))])
	cell := crystal.Cell{A: a, B: b, C: c, Alpha: alpha, Beta: beta, Gamma: gamma}
	if cell.Validate() != nil {
		return nil
	}
	g := cell.ReciprocalMetric()
	nAtoms := 2 + rng.IntN(5)
	atoms := make([][3]float64, nAtoms)
	for j := range atoms {
		atoms[j] = [3]float64{rng.Float64(), rng.Float64(), rng.Float64()}
	}
	qLo, qHi := qAt(lo, lambda), qAt(hi, lambda)
	// |h| = |q·a| ≤ q·a for any angles, so q_max times each edge bounds
	// its index.
	hMax, kMax, lMax := int(qHi*a)+1, int(qHi*b)+1, int(qHi*c)+1
	var out []Peak
	for h := 0; h <= hMax; h++ {
		for k := -kMax; k <= kMax; k++ {
			for l := -lMax; l <= lMax; l++ {
				// One of each Friedel pair: h > 0, or h = 0 and (k > 0 or
				// k = 0 and l > 0).
				if h == 0 && (k < 0 || (k == 0 && l <= 0)) {
					continue
				}
				if !lattice.Allowed(h, k, l, centring) {
					continue
				}
				hh := [3]float64{float64(h), float64(k), float64(l)}
				var q2 float64
				for x := 0; x < 3; x++ {
					for y := 0; y < 3; y++ {
						q2 += hh[x] * g[x][y] * hh[y]
					}
				}
				q := math.Sqrt(q2)
				if q < qLo || q > qHi {
					continue
				}
				s := q / 2
				f := math.Exp(-3 * s * s)
				var F complex128
				for _, at := range atoms {
					F += cmplx.Exp(complex(0, 2*math.Pi*(hh[0]*at[0]+hh[1]*at[1]+hh[2]*at[2])))
				}
				tt := 2 * math.Asin(q*lambda/2) * 180 / math.Pi
				in := 2 * f * f * real(F*cmplx.Conj(F)) * lorentzPolarisation(tt)
				out = append(out, Peak{TwoThetaDeg: tt, Intensity: in})
			}
		}
	}
	return out
}

// icosahedralDecoy computes the lines of a random icosahedral phase: a
// random lattice type and a_R in [3.9, 6.1] Å, every family with
// |G⊥|·a6 ≤ 0.8, intensity
//
//	I = m · exp(−(|G⊥|·a6 / 0.3)²) · LP(2θ)
//
// a Gaussian fall-off with |G⊥| chosen here on purpose different from the
// indexer's own intensity model, so that the decoys do not share its
// assumptions.
//
// Reference: common practice (intensity falls with |G⊥|; J. W. Cahn,
// D. Shechtman, D. Gratias, J. Mater. Res. 1, 13 (1986)).
func icosahedralDecoy(rng *rand.Rand, lambda, lo, hi float64) []Peak {
	lat := icosa.Lattices[rng.IntN(len(icosa.Lattices))]
	aR := minQuasilatticeA + (maxQuasilatticeA-minQuasilatticeA)*rng.Float64()
	a6 := aR * math.Sqrt2
	var out []Peak
	for _, f := range allFamilies(lat) {
		tt, ok := twoTheta(f.Parallel, a6, lambda)
		if !ok || tt < lo || tt > hi {
			continue
		}
		x := f.Perp / 0.3
		out = append(out, Peak{TwoThetaDeg: tt, Intensity: float64(f.Multiplicity) * math.Exp(-x*x) * lorentzPolarisation(tt)})
	}
	return out
}

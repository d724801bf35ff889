package indexing

import (
	"fmt"
	"hash/fnv"
	"math"
	"sort"
	"strings"

	"meltbook"
	"meltbook/analysis/crystal"
)

// The crystal-system kinds of phases of known structure and of the
// general lattice search, beside Cubic.
const (
	Tetragonal   Kind = "tetragonal"
	Hexagonal    Kind = "hexagonal"
	Orthorhombic Kind = "orthorhombic"
	Monoclinic   Kind = "monoclinic"
	Triclinic    Kind = "triclinic"
	Rhombohedral Kind = "rhombohedral"
)

// library is the internal model kind of a phase of known structure; the
// phase reports its crystal system as its Kind.
const library Kind = "library"

// crystalKinds are the Kind values a KnownPhase may give as its system.
var crystalKinds = []Kind{Cubic, Tetragonal, Hexagonal, Orthorhombic, Monoclinic, Triclinic, Rhombohedral}

// KnownPhase is a crystalline phase of known structure offered to the
// search-match: its name, crystal system and cell, and its computed powder
// lines at the scan's wavelength.
type KnownPhase struct {
	Name       string // as displayed, e.g. "θ-Al2Cu"
	Formula    string
	System     Kind   // Cubic, Tetragonal, Hexagonal, …, Rhombohedral
	Centring   string // P, I, F, A, B, C or R
	SpaceGroup string // short Hermann–Mauguin symbol, e.g. "I4/mcm"
	Reference  string // the published structure
	Cell       crystal.Cell
	Lines      []KnownLine
}

// KnownLine is one computed powder line of a known phase.
type KnownLine struct {
	DSpacingA float64 // Å, at the published cell
	// Intensity is the computed integrated intensity, Lorentz–polarisation
	// included, at the wavelength of the scan, on any positive scale.
	Intensity float64
	HKL       [3]int // a representative reflection
}

// Search-match constants (see the package documentation).
const (
	// knownScaleSlack is the largest relative change of a known phase's
	// cell, for solid solution.
	knownScaleSlack = 0.02
	// eligibleRatio: a line may explain a peak only when its predicted
	// relative intensity is at least eligibleRatio times the peak's
	// observed relative intensity (both Lorentz–polarisation corrected).
	eligibleRatio = 0.05
	// strongLine: a predicted line at least this strong (relative to the
	// model's strongest) with no peak within the tolerance is missing and
	// costs missingStrongCost·w nats.
	strongLine        = 0.15
	missingStrongCost = 3.0
	// weakestLine: lines predicted weaker than this are dropped.
	weakestLine = 0.002
)

// eligibleLevels quantise the observed relative intensity o of a peak for
// the density of eligible lines: a peak uses the level just below its o.
var eligibleLevels = []float64{0, 0.02, 0.05, 0.1, 0.2, 0.35, 0.5, 0.7, 0.85, 1}

func (k KnownPhase) validate(i int) error {
	field := fmt.Sprintf("library phase %d (%s)", i+1, k.Name)
	if strings.TrimSpace(k.Name) == "" {
		return meltbook.Errorf(meltbook.Invalid, fmt.Sprintf("library phase %d", i+1), "has no name")
	}
	ok := false
	for _, c := range crystalKinds {
		ok = ok || k.System == c
	}
	if !ok {
		return meltbook.Errorf(meltbook.Invalid, field, "crystal system %q is not one of cubic, tetragonal, hexagonal, orthorhombic, monoclinic, triclinic, rhombohedral", k.System)
	}
	if !strings.Contains("PIFABCR", k.Centring) || len(k.Centring) != 1 {
		return meltbook.Errorf(meltbook.Invalid, field, "centring %q is not one of P, I, F, A, B, C, R", k.Centring)
	}
	if !(k.Cell.A > 0) {
		return meltbook.Errorf(meltbook.Invalid, field, "cell edge a = %g Å is not positive", k.Cell.A)
	}
	n := 0
	for j, l := range k.Lines {
		if !(l.DSpacingA > 0) || math.IsInf(l.DSpacingA, 0) || !(l.Intensity >= 0) || math.IsInf(l.Intensity, 0) {
			return meltbook.Errorf(meltbook.Invalid, field, "line %d: d = %g Å, intensity %g: need d > 0 and a finite intensity ≥ 0", j+1, l.DSpacingA, l.Intensity)
		}
		if l.Intensity > 0 {
			n++
		}
	}
	if n == 0 {
		return meltbook.Errorf(meltbook.Invalid, field, "has no line with a positive intensity")
	}
	return nil
}

// lorentzPolarisation is the Lorentz–polarisation factor of a powder line
// at 2θ (degrees) with no monochromator:
//
//	LP = (1 + cos²2θ) / (sin²θ · cosθ)
//
// Reference: B. D. Cullity, S. R. Stock, Elements of X-Ray Diffraction,
// 3rd ed. (2001), §4-9.
func lorentzPolarisation(twoThetaDeg float64) float64 {
	t := twoThetaDeg * math.Pi / 360
	c2 := math.Cos(2 * t)
	s := math.Sin(t)
	return (1 + c2*c2) / (s * s * math.Cos(t))
}

// newKnownModel builds the model of one known phase at wavelength lambda.
// Its scale is the ratio of the cell to the published one, within
// ±knownScaleSlack; a line at d sits at g = 1/d.
func newKnownModel(k *KnownPhase, lambda float64) *model {
	m := &model{kind: library, lattice: k.Centring, known: k, weighted: true,
		windows: []window{{1 - knownScaleSlack, 1 + knownScaleSlack}}}
	maxW := 0.0
	ws := make([]float64, len(k.Lines))
	for i, l := range k.Lines {
		tt, ok := twoTheta(1/l.DSpacingA, 1, lambda)
		if !ok || l.Intensity <= 0 {
			continue
		}
		ws[i] = l.Intensity / lorentzPolarisation(tt)
		maxW = math.Max(maxW, ws[i])
	}
	for i, l := range k.Lines {
		if maxW > 0 && ws[i]/maxW >= weakestLine {
			m.lines = append(m.lines, line{g: 1 / l.DSpacingA, w: ws[i] / maxW, ref: i})
		}
	}
	h := fnv.New64a()
	fmt.Fprintf(h, "%s|%s|%s|%v", k.Name, k.System, k.Centring, k.Cell)
	for _, l := range m.lines {
		fmt.Fprintf(h, "|%.6f:%.4f", l.g, l.w)
	}
	fmt.Fprintf(h, "@%.6f", lambda)
	m.id = fmt.Sprintf("library-%x", h.Sum64())
	m.finish()
	return m
}

// knownModels builds the models of the library phases at wavelength
// lambda. They are built afresh for every call (a few hundred lines each);
// their random-list scores are kept by model id like every model's.
func knownModels(lib []KnownPhase, lambda float64) []*model {
	out := make([]*model, 0, len(lib))
	for i := range lib {
		m := newKnownModel(&lib[i], lambda)
		m.alternatives = len(lib)
		out = append(out, m)
	}
	return out
}

// reportedKind returns the kind a phase of the model is reported as: a
// library phase's crystal system, else the model's kind.
func (m *model) reportedKind() Kind {
	if m.known != nil {
		return m.known.System
	}
	return m.kind
}

// prepareWeights fills the models' eligibility tables: wcum[l][j] is the
// number of lines among the first j whose weight is at least
// eligibleRatio·eligibleLevels[l].
func (m *model) prepareWeights() {
	if !m.weighted {
		return
	}
	m.wcum = make([][]int32, len(eligibleLevels))
	for l, o := range eligibleLevels {
		c := make([]int32, len(m.lines)+1)
		for j, ln := range m.lines {
			c[j+1] = c[j]
			if ln.w >= eligibleRatio*o {
				c[j+1]++
			}
		}
		m.wcum[l] = c
	}
}

// level returns the eligibility level of observed relative intensity o.
func level(o float64) int {
	l := sort.SearchFloat64s(eligibleLevels, o)
	if l >= len(eligibleLevels) || eligibleLevels[l] > o {
		l--
	}
	return max(l, 0)
}

// observedWeights returns each peak's Lorentz–polarisation-corrected
// intensity relative to the strongest: oᵢ = (Iᵢ/LPᵢ) / maxⱼ(Iⱼ/LPⱼ).
func observedWeights(peaks []Peak) []float64 {
	o := make([]float64, len(peaks))
	mx := 0.0
	for i, p := range peaks {
		o[i] = p.Intensity / lorentzPolarisation(p.TwoThetaDeg)
		mx = math.Max(mx, o[i])
	}
	for i := range o {
		if mx > 0 {
			o[i] /= mx
		} else {
			o[i] = 1
		}
	}
	return o
}

// knownCell returns the phase's cell scaled by s, with uncertainties σ_s
// times each edge.
func knownCell(k *KnownPhase, s, sigS float64) (crystal.Cell, crystal.Cell) {
	c := k.Cell
	return crystal.Cell{A: c.A * s, B: c.B * s, C: c.C * s, Alpha: c.Alpha, Beta: c.Beta, Gamma: c.Gamma},
		crystal.Cell{A: c.A * sigS, B: c.B * sigS, C: c.C * sigS}
}

// setKnownPhase fills the names and the cell of a library phase.
func setKnownPhase(ph *Phase, k *KnownPhase, sol solution) {
	ph.Phase, ph.Formula, ph.SpaceGroup, ph.Reference = k.Name, k.Formula, k.SpaceGroup, k.Reference
	ph.Lattice = k.Centring
	ph.CellScale = sol.a
	c, su := knownCell(k, sol.a, sol.sigA)
	ph.AA, ph.AUncertaintyA = c.A, su.A
	switch k.System {
	case Cubic:
	case Tetragonal, Hexagonal:
		ph.CA, ph.CUncertaintyA = c.C, su.C
	case Rhombohedral:
		ph.CA, ph.CUncertaintyA = c.C, su.C
		if c.Gamma != 120 {
			ph.AlphaDeg = c.Alpha
			ph.CA, ph.CUncertaintyA = 0, 0
		}
	default:
		ph.BA, ph.BUncertaintyA = c.B, su.B
		ph.CA, ph.CUncertaintyA = c.C, su.C
		if k.System == Monoclinic {
			ph.BetaDeg = c.Beta
		}
		if k.System == Triclinic {
			ph.AlphaDeg, ph.BetaDeg, ph.GammaDeg = c.Alpha, c.Beta, c.Gamma
		}
	}
}

// finishKnown rescales the predicted intensities of a library phase's
// peaks to its strongest line within the range of the scan's peaks, and
// lists its strong lines that no peak of the scan explains.
func (m *model) finishKnown(ph *Phase, sol solution, all []Peak, cfg searchConfig) {
	lambda := cfg.lambda
	allPrep := prepare(all, lambda, sol.z, cfg.tol, nil)
	if len(allPrep) == 0 {
		return
	}
	lo, hi := allPrep[0].qLo*sol.a, allPrep[len(allPrep)-1].qHi*sol.a
	top := 0.0
	for j := m.firstAtLeast(lo); j < len(m.gs) && m.gs[j] <= hi; j++ {
		top = math.Max(top, m.known.Lines[m.lines[j].ref].Intensity)
	}
	if top <= 0 {
		return
	}
	for i := range ph.Peaks {
		if p := ph.Peaks[i].PredictedIntensity; p != nil {
			v := 100 * *p / top
			ph.Peaks[i].PredictedIntensity = &v
		}
	}
	for j := m.firstAtLeast(lo); j < len(m.gs) && m.gs[j] <= hi; j++ {
		ln := m.lines[j]
		if ln.w < strongLine {
			continue
		}
		q := m.gs[j] / sol.a
		k := sort.Search(len(allPrep), func(i int) bool { return allPrep[i].qHi >= q })
		if k < len(allPrep) && allPrep[k].qLo <= q {
			continue
		}
		kl := m.known.Lines[ln.ref]
		tt, _ := twoTheta(m.gs[j], sol.a, lambda)
		ph.MissingLines = append(ph.MissingLines, PredictedLine{TwoThetaDeg: tt + sol.z, DSpacingA: 1 / q, HKL: kl.HKL, Intensity: 100 * kl.Intensity / top})
	}
}

// Title writes the phase in short: "θ-Al2Cu, tetragonal I4/mcm,
// a = 6.067(2) Å, c = 4.877(3) Å", "hexagonal P, a = 3.2094(5) Å,
// c = 5.2108(9) Å", "icosahedral F, a_R = 4.4621(8) Å", "cubic P
// approximant 1/1, a = 12.271(3) Å".
func (p Phase) Title() string {
	u := meltbook.WithUncertainty
	switch p.Kind {
	case Icosahedral:
		return "icosahedral " + p.Lattice + ", a_R = " + u(p.QuasilatticeConstantA, p.QuasilatticeConstantUncertaintyA) + " Å"
	case Approximant:
		return "cubic " + p.Lattice + " approximant " + p.Order + ", a = " + u(p.AA, p.AUncertaintyA) + " Å"
	}
	var b strings.Builder
	if p.Phase != "" {
		b.WriteString(p.Phase + ", ")
	}
	b.WriteString(string(p.Kind) + " ")
	if p.SpaceGroup != "" {
		b.WriteString(p.SpaceGroup)
	} else {
		b.WriteString(p.Lattice)
	}
	b.WriteString(", a = " + u(p.AA, p.AUncertaintyA) + " Å")
	if p.BA > 0 {
		b.WriteString(", b = " + u(p.BA, p.BUncertaintyA) + " Å")
	}
	if p.CA > 0 {
		b.WriteString(", c = " + u(p.CA, p.CUncertaintyA) + " Å")
	}
	for _, ang := range []struct {
		name   string
		v, sig float64
	}{{"α", p.AlphaDeg, p.AlphaUncertaintyDeg}, {"β", p.BetaDeg, p.BetaUncertaintyDeg}, {"γ", p.GammaDeg, p.GammaUncertaintyDeg}} {
		if ang.v > 0 {
			b.WriteString(", " + ang.name + " = " + u(ang.v, ang.sig) + "°")
		}
	}
	return b.String()
}

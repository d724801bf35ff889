package verdict

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"meltbook"
)

// Phase is the diffraction evidence: one phase an indexing found.
type Phase struct {
	// Kind is meltbook.ModelIcosahedral, ModelApproximant or ModelCubic;
	// Lattice is P, I or F.
	Kind    string
	Lattice string
	// Order and ApproximantOf describe an approximant ("1/1" of
	// "i-Al-Cu-Fe").
	Order         string
	ApproximantOf string
	// ConstantA is a_R (icosahedral) or a (cubic), in Å, with its standard
	// uncertainty.
	ConstantA, ConstantSUA float64
	// Chance is the probability that random peaks index as well.
	Chance float64
	// IndexedPeaks of SpecimenPeaks are explained by the phase, carrying
	// ExplainedIntensity (0..1) of the intensity.
	IndexedPeaks, SpecimenPeaks int
	ExplainedIntensity          float64
	// Name is the library phase the search-match named ("θ-Al2Cu"), empty
	// otherwise; Title describes a crystalline phase of any system in
	// short ("tetragonal I4/mcm, a = 6.07 Å, c = 4.88 Å") for one that has
	// no name.
	Name, Title string
}

// Halo is a diffuse maximum seen in a pattern without crystalline peaks
// (see analysis/halo).
type Halo struct {
	CentreDeg float64 // 2θ of the maximum, degrees
	FWHMDeg   float64 // full width at half maximum, degrees 2θ
	// QPerA is the scattering vector at the centre, 4π sin θ/λ, in Å⁻¹.
	QPerA float64
}

// Window states are the places e/a can take against a published window.
const (
	Inside     = "inside"
	Below      = "below"
	Above      = "above"
	NotWeighed = "" // no window for the family, or other valences
)

// EOverA is the sample's e/a against the icosahedral window of its family.
type EOverA struct {
	// Status is Inside, Below, Above or NotWeighed.
	Status    string
	Value     float64
	Low, High float64
	Family    string
	Scheme    string
	// Note says why e/a was not weighed (Status NotWeighed).
	Note string
}

// Neighbour is a sample of another melt of nearby composition, with the
// kinds of its standing outcomes.
type Neighbour struct {
	Sample string
	// DistanceFraction is the composition distance (analysis/composition
	// Distance), an atomic fraction.
	DistanceFraction float64
	Kinds            []meltbook.PhaseKind
}

// Input is the evidence about one candidate: a phase or a halo, with what
// is known of the sample.
type Input struct {
	// Phase, or else Halo, is the diffraction evidence.
	Phase *Phase
	Halo  *Halo
	// Folds are the rotational symmetries electron diffraction saw on the
	// sample, all observations together; empty when none was recorded.
	Folds  []int
	EOverA EOverA
	// Neighbours are the samples within NeighbourDistance (an atomic
	// fraction, for the text).
	Neighbours        []Neighbour
	NeighbourDistance float64
}

// Evidence kinds, naming where a reason comes from.
const (
	FromDiffraction = "diffraction"
	FromSymmetry    = "symmetry"
	FromEOverA      = "e/a"
	FromNeighbours  = "neighbours"
)

// Reason is one piece of evidence weighed, with its points.
type Reason struct {
	Evidence string `json:"evidence"`
	Text     string `json:"text"`
	Points   int    `json:"points"`
}

// Confidence levels.
const (
	High   = "high"
	Medium = "medium"
	Low    = "low"
)

// Verdict is the weighed candidate.
type Verdict struct {
	// Outcome holds Kind, Lattice, Order and Name; the caller adds the
	// rest (evidence text, who, when).
	Outcome meltbook.Outcome `json:"outcome"`
	Points  int              `json:"points"`
	// Confidence is High, Medium or Low.
	Confidence string `json:"confidence"`
	// Agree, Disagree and Neutral sort the reasons by the sign of their
	// points, in the order diffraction, symmetry, e/a, neighbours.
	Agree    []Reason `json:"agree"`
	Disagree []Reason `json:"disagree"`
	Neutral  []Reason `json:"neutral"`
}

// KnownPhase is a cubic crystalline phase the candidate may be named after.
type KnownPhase struct {
	Name      string
	Lattice   string  // P, I or F
	ConstantA float64 // a in Å
	Source    string
}

// KnownPhases are the cubic phases met in the alloy systems meltbook's
// users make, named when an indexed cubic phase matches one.
var KnownPhases = []KnownPhase{
	{Name: "Al (fcc)", Lattice: "F", ConstantA: 4.0495, Source: "from memory: handbook value for pure aluminium at room temperature"},
	{Name: "Cu (fcc)", Lattice: "F", ConstantA: 3.6149, Source: "from memory: handbook value for pure copper at room temperature"},
	{Name: "Si (diamond)", Lattice: "F", ConstantA: 5.431144, Source: "NIST SRM 640f certificate, 22.5 °C"},
	{Name: "β-Al(Cu,Fe) (B2)", Lattice: "P", ConstantA: 2.91, Source: "from memory: B2 β phase of Al-Cu-Fe, a ≈ 2.90-2.92 Å depending on composition"},
}

// knownTolerance is the largest relative difference in a for a name to be
// given.
const knownTolerance = 0.015

// Name returns the name of the known cubic phase with the lattice type and
// a within 1.5 % of constantA, nearest first, or "" when none is.
func Name(lattice string, constantA float64) string {
	best, bestDiff := "", knownTolerance
	for _, k := range KnownPhases {
		if k.Lattice != lattice {
			continue
		}
		if d := math.Abs(constantA-k.ConstantA) / k.ConstantA; d <= bestDiff {
			best, bestDiff = k.Name, d
		}
	}
	return best
}

// MetallicGlassQLowPerA and MetallicGlassQHighPerA bound, in Å⁻¹, the
// scattering vector Q = 4π sin θ/λ at which the first diffraction maximum
// of metallic glasses lies; an amorphous halo elsewhere more likely comes
// from an amorphous holder, an oxide or grease (silica glass scatters near
// 1.5 Å⁻¹).
//
// Reference: from memory, common practice (the first maximum of metallic
// glasses sits near Q ≈ 2.5-3.0 Å⁻¹; the range is widened by a margin).
const (
	MetallicGlassQLowPerA  = 2.2
	MetallicGlassQHighPerA = 3.4
)

// InMetallicGlassRange reports whether a halo at qPerA (Å⁻¹) lies where a
// metallic glass scatters.
func InMetallicGlassRange(qPerA float64) bool {
	return qPerA >= MetallicGlassQLowPerA && qPerA <= MetallicGlassQHighPerA
}

// Weigh weighs the evidence about one candidate by the rules of the
// package documentation. It panics unless exactly one of in.Phase and
// in.Halo is set.
func Weigh(in Input) Verdict {
	if (in.Phase == nil) == (in.Halo == nil) {
		panic("verdict: Weigh needs exactly one of Phase and Halo")
	}
	var v Verdict
	var reasons []Reason
	if in.Phase != nil {
		v.Outcome = candidate(*in.Phase)
		reasons = append(reasons, diffraction(*in.Phase))
	} else {
		v.Outcome = meltbook.Outcome{Kind: meltbook.Amorphous}
		reasons = append(reasons, halo(*in.Halo))
	}
	reasons = append(reasons, symmetry(v.Outcome.Kind, in.Phase, in.Folds))
	reasons = append(reasons, eOverA(v.Outcome.Kind, in.EOverA))
	reasons = append(reasons, neighbours(v.Outcome.Kind, in.Neighbours, in.NeighbourDistance))
	for _, r := range reasons {
		v.Points += r.Points
		switch {
		case r.Points > 0:
			v.Agree = append(v.Agree, r)
		case r.Points < 0:
			v.Disagree = append(v.Disagree, r)
		default:
			v.Neutral = append(v.Neutral, r)
		}
	}
	switch {
	case v.Points >= 3:
		v.Confidence = High
	case v.Points >= 1:
		v.Confidence = Medium
	default:
		v.Confidence = Low
	}
	return v
}

// candidate turns an indexed phase into the outcome it proposes.
func candidate(p Phase) meltbook.Outcome {
	switch p.Kind {
	case meltbook.ModelIcosahedral:
		return meltbook.Outcome{Kind: meltbook.Icosahedral, Lattice: p.Lattice}
	case meltbook.ModelApproximant:
		return meltbook.Outcome{Kind: meltbook.Approximant, Lattice: p.Lattice, Order: p.Order}
	}
	name := p.Name
	if name == "" && (p.Kind == meltbook.ModelCubic || p.Kind == "") {
		name = Name(p.Lattice, p.ConstantA)
	}
	if name == "" && p.Title != "" {
		name = p.Title
	}
	if name == "" {
		name = fmt.Sprintf("cubic %s, a = %s Å", p.Lattice, meltbook.WithUncertainty(p.ConstantA, p.ConstantSUA))
	}
	return meltbook.Outcome{Kind: meltbook.Crystalline, Name: name}
}

func diffraction(p Phase) Reason {
	what := fmt.Sprintf("%d of %d peaks (%.0f%% of the intensity) indexed, chance %.1g", p.IndexedPeaks, p.SpecimenPeaks, 100*p.ExplainedIntensity, p.Chance)
	switch {
	case p.Chance <= 1e-4:
		return Reason{FromDiffraction, what + ": strong", 2}
	case p.Chance <= 1e-3:
		return Reason{FromDiffraction, what + ": clear", 1}
	}
	return Reason{FromDiffraction, what + ": beats chance, but not by much", 0}
}

func halo(h Halo) Reason {
	what := fmt.Sprintf("no crystalline peaks; a diffuse halo at 2θ = %.1f° (Q = %.2f Å⁻¹), %.1f° wide", h.CentreDeg, h.QPerA, h.FWHMDeg)
	if InMetallicGlassRange(h.QPerA) {
		return Reason{FromDiffraction, what + ", where the first maximum of a metallic glass lies", 1}
	}
	return Reason{FromDiffraction, what + fmt.Sprintf(", outside %.1f-%.1f Å⁻¹ where a metallic glass scatters: an amorphous holder, oxide or grease can give such a hump", MetallicGlassQLowPerA, MetallicGlassQHighPerA), -1}
}

func symmetry(kind meltbook.PhaseKind, p *Phase, folds []int) Reason {
	if len(folds) == 0 {
		return Reason{FromSymmetry, "no electron diffraction recorded", 0}
	}
	has := map[int]bool{}
	for _, f := range folds {
		has[f] = true
	}
	seen := "electron diffraction saw " + foldList(folds)
	var odd []int
	switch kind {
	case meltbook.Icosahedral:
		for _, f := range []int{4, 6, 8, 12} {
			if has[f] {
				odd = append(odd, f)
			}
		}
		switch {
		case len(odd) > 0:
			return Reason{FromSymmetry, seen + ": the icosahedral point group has no " + foldList(odd) + " axes", -2}
		case has[5]:
			return Reason{FromSymmetry, seen + ": 5-fold axes belong to icosahedral symmetry and to no crystal", 1}
		case has[10] && !has[3]:
			return Reason{FromSymmetry, seen + ": 10-fold without 3- or 5-fold axes points to a decagonal phase", -1}
		}
		return Reason{FromSymmetry, seen + ": consistent, but crystals show these too", 0}
	case meltbook.Amorphous:
		return Reason{FromSymmetry, seen + ": an ordered structure was found", -1}
	}
	for _, f := range []int{5, 8, 10, 12} {
		if has[f] {
			odd = append(odd, f)
		}
	}
	if len(odd) > 0 {
		return Reason{FromSymmetry, seen + ": no periodic crystal has " + foldList(odd) + " axes (twinning can mimic them)", -2}
	}
	if kind == meltbook.Crystalline && p != nil && p.Kind == meltbook.ModelCubic && has[4] {
		return Reason{FromSymmetry, seen + ": 4-fold axes fit a cubic crystal", 1}
	}
	return Reason{FromSymmetry, seen + ": consistent, not telling", 0}
}

// foldList writes folds as "2-, 3- and 5-fold".
func foldList(folds []int) string {
	f := append([]int(nil), folds...)
	sort.Ints(f)
	var uniq []string
	for i, x := range f {
		if i == 0 || x != f[i-1] {
			uniq = append(uniq, fmt.Sprint(x))
		}
	}
	if len(uniq) == 1 {
		return uniq[0] + "-fold"
	}
	return strings.Join(uniq[:len(uniq)-1], "-, ") + "- and " + uniq[len(uniq)-1] + "-fold"
}

func eOverA(kind meltbook.PhaseKind, e EOverA) Reason {
	if kind != meltbook.Icosahedral && kind != meltbook.Approximant {
		return Reason{FromEOverA, "e/a is weighed for icosahedral phases and their approximants only", 0}
	}
	if e.Status == NotWeighed {
		note := e.Note
		if note == "" {
			note = "no published window for this alloy family"
		}
		return Reason{FromEOverA, "e/a not weighed: " + note, 0}
	}
	what := fmt.Sprintf("e/a %.3f (%s valences) %s the %s window %.2f-%.2f", e.Value, e.Scheme, e.Status, e.Family, e.Low, e.High)
	if e.Status == Inside {
		return Reason{FromEOverA, what, 1}
	}
	return Reason{FromEOverA, what, -1}
}

func neighbours(kind meltbook.PhaseKind, ns []Neighbour, within float64) Reason {
	dist := fmt.Sprintf("%.1f at.%%", 100*within)
	if len(ns) == 0 {
		return Reason{FromNeighbours, "no examined samples of other melts within " + dist, 0}
	}
	same := 0
	for _, n := range ns {
		for _, k := range n.Kinds {
			if k == kind {
				same++
				break
			}
		}
	}
	what := fmt.Sprintf("%d of %d examined samples of other melts within %s had a %s phase", same, len(ns), dist, kind)
	switch {
	case same >= 1 && 2*same >= len(ns):
		return Reason{FromNeighbours, what, 1}
	case same == 0 && len(ns) >= 3:
		return Reason{FromNeighbours, what, -1}
	}
	return Reason{FromNeighbours, what, 0}
}

// Text writes the verdict for an outcome's evidence: what agreed, what did
// not, what was not telling, and the confidence with its points.
func (v Verdict) Text() string {
	var b strings.Builder
	write := func(title string, rs []Reason) {
		if len(rs) == 0 {
			return
		}
		b.WriteString(title)
		for i, r := range rs {
			if i > 0 {
				b.WriteString("; ")
			}
			fmt.Fprintf(&b, "%s (%+d)", r.Text, r.Points)
		}
		b.WriteString(". ")
	}
	write("Agrees: ", v.Agree)
	write("Disagrees: ", v.Disagree)
	write("Not telling: ", v.Neutral)
	fmt.Fprintf(&b, "Confidence %s (%+d).", v.Confidence, v.Points)
	return b.String()
}

package intake

import (
	"context"
	"fmt"

	"meltbook"
	"meltbook/analysis/composition"
	"meltbook/analysis/descriptor"
	"meltbook/analysis/element"
	"meltbook/analysis/verdict"
	"meltbook/store"
)

// eaScheme is the valence scheme e/a is weighed under: the one the
// published windows count with for most families, and find's default.
const eaScheme = element.RaynorScheme

// propose weighs each phase of the analysis (or its halo) and returns the
// proposals to store and, per weighing added to res.Weighed, whether it
// was proposed; it adds notes to res.
func propose(ctx context.Context, st *store.Store, ev *store.SampleEvidence, sc *meltbook.Scan, an *analysis, within float64, res *Result) ([]store.Proposal, []bool, error) {
	if within <= 0 {
		within = DefaultNeighbourDistance
	}
	x := &an.indexing
	if an.haloNote != "" {
		res.Notes = append(res.Notes, an.haloNote)
	}
	if len(x.Phases) == 0 && an.halo == nil {
		if n := x.SpecimenPeaks(); n > 0 {
			res.Notes = append(res.Notes, fmt.Sprintf("no phase indexes the %d peaks better than chance: nothing proposed", n))
		} else {
			res.Notes = append(res.Notes, "no peaks and no diffuse halo: nothing proposed")
		}
		return nil, nil, nil
	}
	base := verdict.Input{NeighbourDistance: within}
	for _, o := range ev.Symmetry {
		base.Folds = append(base.Folds, o.Folds...)
	}
	comp, err := toComposition(ev.Nominal)
	if err != nil {
		return nil, nil, err
	}
	base.EOverA = eOverA(comp)
	near, err := st.SamplesNear(ctx, ev.Nominal, within, ev.MeltCode)
	if err != nil {
		return nil, nil, err
	}
	for _, n := range near {
		nc, err := toComposition(n.Nominal)
		if err != nil {
			continue // a melt whose composition does not normalise cannot be compared
		}
		d := composition.Distance(comp, nc)
		if d > within {
			continue
		}
		nb := verdict.Neighbour{Sample: n.SampleCode, DistanceFraction: d}
		for _, o := range n.Outcomes {
			nb.Kinds = append(nb.Kinds, o.Kind)
		}
		base.Neighbours = append(base.Neighbours, nb)
	}
	var props []store.Proposal
	var proposed []bool
	specimen := x.SpecimenPeaks()
	for i, ph := range x.Phases {
		in := base
		in.Phase = &verdict.Phase{
			Kind: ph.Kind, Lattice: ph.Lattice, Order: ph.Order, ApproximantOf: ph.ApproximantOf,
			ConstantA: ph.ConstantA, ConstantSUA: ph.ConstantSUA, Chance: ph.Chance,
			IndexedPeaks: len(ph.Assignments), SpecimenPeaks: specimen, ExplainedIntensity: ph.ExplainedIntensity,
			Name: ph.Phase, Title: ph.Title(),
		}
		v := verdict.Weigh(in)
		res.Weighed = append(res.Weighed, Weighing{Verdict: v})
		proposed = append(proposed, true)
		o := v.Outcome
		o.Evidence = fmt.Sprintf("From %s: %s. %s", sc.FileName, ph.Title(), v.Text())
		props = append(props, store.Proposal{Outcome: o, Phase: i, Confidence: v.Confidence})
	}
	if h := an.halo; h != nil {
		in := base
		in.Halo = &verdict.Halo{CentreDeg: h.CentreDeg, FWHMDeg: h.FWHMDeg, QPerA: h.QPerA}
		v := verdict.Weigh(in)
		res.Weighed = append(res.Weighed, Weighing{Verdict: v})
		// A halo outside the metallic-glass range is only noted.
		ok := verdict.InMetallicGlassRange(h.QPerA)
		proposed = append(proposed, ok)
		if ok {
			o := v.Outcome
			o.Evidence = fmt.Sprintf("From %s: %s", sc.FileName, v.Text())
			props = append(props, store.Proposal{Outcome: o, Phase: -1, Confidence: v.Confidence})
		} else {
			res.Notes = append(res.Notes, fmt.Sprintf("a diffuse hump at 2θ = %.1f° (Q = %.2f Å⁻¹) lies where an amorphous holder or oxide scatters, not a metallic glass: nothing proposed", h.CentreDeg, h.QPerA))
		}
	}
	return props, proposed, nil
}

// toComposition normalises a stored composition.
func toComposition(fs []meltbook.ElementFraction) (composition.Composition, error) {
	parts := make([]composition.Part, len(fs))
	for i, f := range fs {
		parts[i] = composition.Part{Element: f.Element, Fraction: f.Fraction}
	}
	c, err := composition.Normalise(parts)
	if err != nil {
		return nil, fmt.Errorf("composition %v: %w", fs, err)
	}
	return c, nil
}

// eOverA places the composition's e/a against its family's window.
func eOverA(c composition.Composition) verdict.EOverA {
	scheme, ok := element.LookupScheme(eaScheme)
	if !ok {
		return verdict.EOverA{Note: "the " + eaScheme + " valence scheme is missing"}
	}
	d, err := descriptor.Describe(c, scheme, descriptor.Options{})
	if err != nil {
		return verdict.EOverA{Note: err.Error()}
	}
	e := verdict.EOverA{Value: d.ElectronsPerAtom, Scheme: eaScheme}
	for _, w := range descriptor.Windows() {
		if w.Matches(c) {
			e.Family, e.Low, e.High = w.Family, w.Low, w.High
			break
		}
	}
	for _, f := range d.Flags {
		switch f.Code {
		case descriptor.FlagInsideWindow:
			e.Status = verdict.Inside
		case descriptor.FlagBelowWindow:
			e.Status = verdict.Below
		case descriptor.FlagAboveWindow:
			e.Status = verdict.Above
		case descriptor.FlagOtherValences, descriptor.FlagNoWindow:
			e.Note = f.Text
		}
	}
	return e
}

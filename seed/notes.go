package seed

import (
	"fmt"
	"strings"

	"meltbook"
	"meltbook/analysis/composition"
)

// purpose is the melt's own note: why this composition.
func (g *generator) purpose(s *system, p plan, nominal composition.Composition) string {
	r := g.r
	switch {
	case p.anchor:
		return pick(r,
			"Literature composition, made as a reference for our own furnace.",
			"Reference composition from the literature; compare with our earlier ribbons.",
			"Published composition, repeated to check the process.")
	case s.name == "Al-Cu-Fe-Si":
		return fmt.Sprintf("Si-for-Al series at about Cu25.5Fe12.5: %.1f at.%% Si.", 100*nominal.Fraction("Si"))
	case s.name == "Al-Mn-Si" && r.Float64() < 0.4:
		return "Part of the wheel-speed series: same kind of composition, different ribbon thickness."
	case p.progress < 0.3:
		centre := s.comp(s.start).Format(1)
		return pick(r, "Survey point around "+centre+".", "Coarse survey step near "+centre+".")
	case p.progress < 0.7:
		return pick(r,
			"Following up the better ribbons so far.",
			"Step towards the compositions that gave the cleanest patterns.",
			"Filling a gap in the map between earlier runs.")
	}
	return pick(r,
		"Refinement: small step from the best runs.",
		"Fine step in composition around the best result so far.",
		"Repeat-and-refine near the target.")
}

// voice prefixes and habits of each operator.
func (g *generator) meltRemark(op int, s *system, step meltbook.ProcessStep, afterG, lossMg float64) string {
	if step.Kind == meltbook.OtherStep {
		return fmt.Sprintf("Cast button %.4f g, %.1f mg lost (grey Zn/Mg deposit on the lid). Crucible reused for the same system only.", afterG, lossMg)
	}
	remelts, _ := step.Param("remelts")
	current, _ := step.Param("current")
	n, amps := int(remelts.SI), int(current.SI)
	smoke := ""
	if indexOf(s.elements, "Mn") >= 0 {
		smoke = " Brown Mn film on the hearth around the button."
	}
	switch op {
	case opFemi:
		return fmt.Sprintf("%dx remelt, %d A. %.4f g after, -%.1f mg.", n, amps, afterG, lossMg)
	case opDario:
		return fmt.Sprintf("NB: arc at %d A, %d remelts, flipped each time; %.1f mg lost.%s", amps, n, lossMg, smoke)
	case opAiko:
		return fmt.Sprintf("Button looks uniform after %d remelts at %d A, no unmelted pieces on the underside. %.4f g, %.1f mg lost.", n, amps, afterG, lossMg)
	case opYusuf:
		if lossMg > 40 {
			return fmt.Sprintf("%d remelts, %d A. Loss %.1f mg: higher than usual, check the Mn allowance?%s", n, amps, lossMg, smoke)
		}
		return fmt.Sprintf("%d remelts, %d A. Loss %.1f mg.%s", n, amps, lossMg, smoke)
	}
	return fmt.Sprintf("Remelted %d times at %d A, flipping between melts. Button %.4f g after melting (loss %.1f mg).%s", n, amps, afterG, lossMg, smoke)
}

func (g *generator) spinRemark(op int, step meltbook.ProcessStep, thicknessM float64, failure string) string {
	r := g.r
	prefix := ""
	switch op {
	case opDario:
		prefix = "NB: "
	case opFemi:
		prefix = "Spin: "
	}
	switch failure {
	case clogged:
		return prefix + "Nozzle clogged at ejection, no ribbon. Tip to be cut back; button kept for another try."
	case leaked:
		return prefix + "Chamber pressure crept up during the spin (viewport seal). Ribbon dark and oxidised: discarded, seal replaced."
	case flakes:
		return prefix + "Ribbon broke into flakes a few mm long straight off the wheel. Kept them for XRD anyway."
	}
	w, _ := step.Param("width")
	t := thicknessM * 1e6
	width := w.SI * 1e3
	switch {
	case t < 25:
		return prefix + fmt.Sprintf("Thin ribbon, %.0f µm, lacy edges, %.1f mm wide.", t, width)
	case t > 45:
		return prefix + fmt.Sprintf("Thick ribbon, %.0f µm × %.1f mm; wheel side dull with some pitting.", t, width)
	}
	return prefix + pick(r,
		fmt.Sprintf("Continuous ribbon, several metres, %.0f µm × %.1f mm.", t, width),
		fmt.Sprintf("Good run: %.0f µm × %.1f mm, shiny wheel side, matt free side.", t, width),
		fmt.Sprintf("Ribbon %.0f µm × %.1f mm, a few short pieces at the start, then continuous.", t, width))
}

// xrdRemark is the note left after looking at the pattern, for some
// samples.
func (g *generator) xrdRemark(phases []found, st sample, s *system) string {
	r := g.r
	if r.Float64() > 0.45 {
		return ""
	}
	var ico, other *found
	for i := range phases {
		f := &phases[i]
		switch {
		case f.phase.kind == meltbook.Icosahedral:
			ico = f
		case other == nil || f.fraction > other.fraction:
			other = f
		}
	}
	switch {
	case ico != nil && ico.tentative:
		return "Cannot decide from XRD alone; asked for TEM time."
	case ico != nil && ico.fraction >= 1:
		return pick(r, "Single i-phase as far as XRD can tell.", "Clean icosahedral pattern, no second phase visible.")
	case ico != nil && other != nil:
		return strings.TrimSpace(fmt.Sprintf("i-phase with %s. %s", describe(other.phase), pick(r, "Move the composition away from it next time.", "Anneal a piece?", "")))
	case other != nil && other.phase.kind == meltbook.Amorphous:
		return "Amorphous halo only; a crystallisation anneal is worth a try."
	case other != nil && other.phase.kind == meltbook.Approximant:
		return "Anneal turned it into the cubic 1/1 approximant."
	case other != nil && other.phase.kind == meltbook.Decagonal:
		return "Decagonal, not icosahedral: interesting but off target."
	case other != nil:
		return strings.TrimSpace(fmt.Sprintf("No quasicrystal: %s. %s", describe(other.phase), pick(r, "Off the window.", "", "Noted on the map.")))
	}
	return ""
}

func describe(p phase) string {
	switch p.kind {
	case meltbook.Amorphous:
		return "an amorphous part"
	case meltbook.Decagonal:
		return "decagonal phase"
	case meltbook.Approximant:
		return "the " + p.order + " approximant"
	}
	return p.name
}

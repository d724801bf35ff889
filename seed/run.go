package seed

import (
	"fmt"
	"math"
	"strings"
	"time"

	"meltbook"
	"meltbook/analysis/composition"
	"meltbook/analysis/element"
)

// Tentative starts the evidence of an outcome the lab could not settle;
// such an outcome has no fraction.
const Tentative = "tentative"

// failure kinds of a melt-spinning run.
const (
	noFailure = ""
	clogged   = "clogged" // nozzle clogged: no ribbon
	leaked    = "leaked"  // chamber leak: ribbon oxidised and discarded
	flakes    = "flakes"  // ribbon came off in brittle flakes, still examined
	failShare = 0.065     // share of runs that fail one way or another
)

// found is one phase decided for a sample.
type found struct {
	phase     phase
	fraction  float64
	tentative bool
}

// run builds one melt and everything done to it.
func (g *generator) run(p plan, code string) (Run, error) {
	s, r := p.s, g.r
	op := g.operator(s)
	who := g.lab.Operators[op].Name

	nominal := s.comp(p.nominal)
	entered := nominal.Format(1)
	if s.balanceByOperator && op == opDario {
		entered = nominal.FormatBalance(1)
	}
	parsed, err := composition.Parse(entered)
	if err != nil {
		return Run{}, fmt.Errorf("composition %q: %w", entered, err)
	}
	massG := round(g.uniform(s.massG[0], s.massG[1]), 0.5)
	lines, weighed, err := g.weigh(s, parsed.Atomic, massG)
	if err != nil {
		return Run{}, err
	}
	actual, afterG, lossMg := g.melt(s, lines, weighed)
	run := Run{System: s.name, Melt: meltbook.Melt{
		Code: code, Operator: who, CreatedAt: p.at, CompositionEntered: entered,
		Nominal: fractions(parsed.Atomic), TargetMassGrams: massG, MassAfterMeltGrams: &afterG,
		WeighOut: lines, Notes: g.purpose(s, p, parsed.Atomic),
	}}

	// Melting.
	meltAt := p.at.Add(g.minutes(20, 60))
	first := g.firstStep(s, meltAt, who)
	run.Steps = append(run.Steps, first)
	run.Notes = append(run.Notes, g.note(who, meltAt.Add(g.minutes(30, 90)), "", g.meltRemark(op, s, first, afterG, lossMg)))
	for _, c := range s.cautionNotes {
		if !g.cautions[c] || r.Float64() < 0.15 {
			g.cautions[c] = true
			run.Notes = append(run.Notes, g.note(who, meltAt, "", c))
		}
	}

	// Melt spinning.
	spinAt := meltAt.Add(g.minutes(70, 180))
	if r.Float64() < 0.3 {
		spinAt = workingDay(meltAt.Truncate(24*time.Hour).AddDate(0, 0, 1)).Add(g.minutes(8*60+30, 11*60))
	}
	failure := noFailure
	if r.Float64() < failShare {
		failure = pick(r, clogged, clogged, leaked, flakes)
	}
	spin, rate, thicknessM, err := g.spin(s, p, spinAt, who, failure)
	if err != nil {
		return Run{}, err
	}
	run.Steps = append(run.Steps, spin)
	run.Notes = append(run.Notes, g.note(who, spinAt.Add(g.minutes(20, 120)), "", g.spinRemark(op, spin, thicknessM, failure)))
	if wheel, _ := spin.Param("wheel-material"); wheel.Text == "CuBe" && (!g.cuBeSeen || r.Float64() < 0.1) {
		g.cuBeSeen = true
		run.Notes = append(run.Notes, g.note(who, spinAt, "",
			"CuBe wheel: polish only wet, in the extraction booth, with the Be dust procedure (local rules and the safety officer first)."))
	}
	if failure == clogged || failure == leaked {
		return run, nil
	}

	// Characterisation of the as-spun ribbon.
	ea, err := g.electronsPerAtom(s, actual)
	if err != nil {
		return Run{}, err
	}
	st := sample{x: actual, ea: ea, logRate: math.Log10(rate)}
	phases := g.decide(s, st, failure == flakes)
	xrdAt := spinAt.Add(24*time.Hour*time.Duration(1+r.IntN(8)) + g.minutes(0, 300))
	run.Outcomes = g.outcomes(s, phases, xrdAt, g.characteriser(op))
	run.Measured = g.measurements(s, actual, spinAt, who)
	if o, ok := g.tem(phases, spinAt); ok {
		run.Observations = append(run.Observations, o)
	}
	if n := g.xrdRemark(phases, st, s); n != "" {
		run.Notes = append(run.Notes, g.note(g.characteriser(op), xrdAt.Add(g.minutes(10, 60)), "", n))
	}

	// Anneals.
	if r.Float64() < s.annealShare {
		count := 1
		if r.Float64() < 0.3 {
			count = 2
		}
		start := spinAt
		for k := 1; k <= count; k++ {
			start = workingDay(start.Truncate(24*time.Hour).AddDate(0, 0, 1+r.IntN(10))).Add(g.minutes(9*60, 15*60))
			d, err := g.anneal(s, code, k, start, actual, ea, st.logRate, op)
			if err != nil {
				return Run{}, err
			}
			run.Derived = append(run.Derived, d)
		}
	}
	return run, nil
}

// operator picks who melts: the system's first lead most often.
func (g *generator) operator(s *system) int {
	weights := []float64{0.55, 0.3, 0.15}[:len(s.leads)]
	var total float64
	for _, w := range weights {
		total += w
	}
	u := g.r.Float64() * total
	for i, w := range weights {
		if u < w {
			return s.leads[i]
		}
		u -= w
	}
	return s.leads[len(s.leads)-1]
}

// characteriser is who runs the diffractometer for a melt: the doctoral
// students and the postdoc do their own, the technician's melts go to
// Marit.
func (g *generator) characteriser(op int) string {
	if op == opFemi {
		return g.lab.Operators[opMarit].Name
	}
	return g.lab.Operators[op].Name
}

func fractions(c composition.Composition) []meltbook.ElementFraction {
	out := make([]meltbook.ElementFraction, len(c))
	for i, p := range c {
		out[i] = meltbook.ElementFraction{Element: p.Element, Fraction: p.Fraction}
	}
	return out
}

func indexOf(list []string, s string) int {
	for i, v := range list {
		if v == s {
			return i
		}
	}
	return -1
}

// melt loses part of each element in melting and returns the actual
// composition of the button, its mass after melting and the mass lost.
func (g *generator) melt(s *system, lines []meltbook.WeighOutLine, weighed []float64) (actual vec, afterG, lossMg float64) {
	remaining := make(vec, len(s.elements))
	var kept, charged float64
	for i, l := range lines {
		k := indexOf(s.elements, l.Element)
		charged += weighed[i]
		pure := weighed[i] * l.PurityPercent / 100
		loss := math.Max(0, math.Min(3*s.meltLoss[k], s.meltLoss[k]*(1+0.35*g.r.NormFloat64())))
		remaining[k] = pure * (1 - loss)
		kept += weighed[i] - pure*loss
	}
	afterG = round(kept, 1e-4)
	var moles float64
	actual = make(vec, len(s.elements))
	for k, m := range remaining {
		e, _ := element.BySymbol(s.elements[k])
		actual[k] = m / e.AtomicWeight
		moles += actual[k]
	}
	for k := range actual {
		actual[k] /= moles
	}
	return actual, afterG, round(1000*(charged-afterG), 0.1)
}

func num(name string, si float64, unit string) meltbook.Param {
	return meltbook.Param{Name: name, SI: si, Unit: unit}
}

func text(name, t string) meltbook.Param { return meltbook.Param{Name: name, Text: t} }

func celsius(c float64) float64 { return c + 273.15 }

// firstStep is the arc melt, or for Zn-Mg-Y an induction melt in a closed
// crucible, since Zn and Mg would boil off under the arc.
func (g *generator) firstStep(s *system, at time.Time, who string) meltbook.ProcessStep {
	r := g.r
	if s.induction {
		hold := 5 + 5*r.IntN(3)
		desc := fmt.Sprintf("induction melt in a closed BN crucible under %d kPa Ar: Y-Mg master alloy first, then Zn and the rest of the Mg; held %d min, stirred by the field, cast into a Cu mould",
			50+5*r.IntN(4), hold)
		return meltbook.ProcessStep{Seq: 1, Kind: meltbook.OtherStep, At: at, Operator: who,
			Params: []meltbook.Param{text("description", desc)}}
	}
	return meltbook.ProcessStep{Seq: 1, Kind: meltbook.ArcMelt, At: at, Operator: who, Params: []meltbook.Param{
		num("remelts", float64(3+r.IntN(3)), ""),
		num("current", float64(150+10*r.IntN(11)), "A"),
		text("atmosphere", "Ar after Ti getter"),
		num("chamber-pressure", 1000*float64(50+5*r.IntN(7)), "kPa"),
	}}
}

// spin builds the melt-spin step and returns it with the estimated
// cooling rate (K/s) and the ribbon thickness (m); both are zero when no
// ribbon was made.
func (g *generator) spin(s *system, p plan, at time.Time, who string, failure string) (meltbook.ProcessStep, float64, float64, error) {
	r := g.r
	wheel := "Cu"
	if !at.Before(day(time.June, 1)) && r.Float64() < 0.45 {
		wheel = "CuBe"
	}
	speed := round(g.uniform(s.wheelSpeed[0], s.wheelSpeed[1]), 0.5)
	orifice := pick(r, 0.6, 0.7, 0.8, 0.8, 0.8, 0.9, 1.0)
	gap := round(g.uniform(0.2, 1.0), 0.05)
	if r.Float64() < 0.6 {
		gap = round(g.uniform(0.3, 0.6), 0.05)
	}
	pressure := math.Round(g.uniform(20, 60))
	if r.Float64() < 0.6 {
		pressure = math.Round(g.uniform(30, 45))
	}
	meltC := round(s.liquidusC+g.uniform(100, 200), 5)
	gas := "He"
	if r.Float64() < 0.35 {
		gas = "Ar"
	}
	chamber := math.Round(g.uniform(30, 50))
	step := meltbook.ProcessStep{Seq: 2, Kind: meltbook.MeltSpin, At: at, Operator: who, Params: []meltbook.Param{
		text("wheel-material", wheel),
		num("wheel-speed", speed, "m/s"),
		num("orifice", orifice/1000, "mm"),
		num("gap", gap/1000, "mm"),
		num("ejection-pressure", pressure*1e3, "kPa"),
		num("melt-temperature", celsius(meltC), "°C"),
		text("chamber-gas", gas),
		num("chamber-pressure", chamber*1e3, "kPa"),
	}}
	if failure == clogged {
		return step, 0, 0, nil
	}
	// Thickness falls with wheel speed roughly as v^−0.8 and rises with
	// ejection pressure and orifice (invented fit in the range of
	// published melt-spinning practice).
	thicknessUm := 38 * math.Pow(25/speed, 0.8) * math.Pow(pressure/40, 0.15) * math.Pow(orifice/0.8, 0.3) *
		math.Pow(gap/0.5, 0.1) * math.Exp(0.08*r.NormFloat64())
	thicknessUm = math.Round(math.Max(18, math.Min(65, thicknessUm)))
	widthMm := 1.7 * (orifice / 0.8) * math.Pow(pressure/40, 0.3) * math.Pow(25/speed, 0.3) * (1 + 0.08*r.NormFloat64())
	widthMm = math.Max(1, math.Min(3, widthMm))
	if failure == flakes {
		widthMm /= 2 // the flakes, not a ribbon
	}
	widthMm = round(widthMm, 0.1)
	t := thicknessUm / 1e6
	est, regime, err := g.cooling(s, p.nominal, t, celsius(meltC), speed)
	if err != nil {
		return step, 0, 0, err
	}
	rate := roundSignificant(est.RateKPerS, 2)
	step.Params = append(step.Params,
		num("thickness", t, "µm"),
		num("width", widthMm/1000, "mm"),
		num("cooling-rate", rate, "K/s"),
		text("cooling-regime", regime),
	)
	return step, rate, t, nil
}

func roundSignificant(x float64, digits int) float64 {
	if x == 0 {
		return 0
	}
	scale := math.Pow(10, float64(digits)-1-math.Floor(math.Log10(math.Abs(x))))
	return math.Round(x*scale) / scale
}

// decide draws the phases of a sample from the truth model.
func (g *generator) decide(s *system, st sample, brittle bool) []found {
	r := g.r
	var out []found
	rest := 1.0
	for _, c := range s.special(s, st) {
		if rest < 0.05 {
			break
		}
		if r.Float64() < c.p {
			f := math.Min(rest, c.fraction[0]+(c.fraction[1]-c.fraction[0])*r.Float64())
			out = append(out, found{phase: c.phase, fraction: f})
			rest -= f
		}
	}
	pI := s.asSpunI(st)
	if st.annealed {
		pI = s.annealedI(s, st)
	}
	quality := math.Min(1, pI/s.iMax)
	haveI := false
	if rest >= 0.05 && r.Float64() < pI {
		f := 0.3 + 0.65*quality + 0.08*r.NormFloat64()
		if st.annealed {
			f += 0.1
		}
		if brittle {
			f -= 0.1
		}
		f = math.Max(0.1, math.Min(1, f))
		if f > 0.92 {
			f = 1
		}
		f = math.Min(f, rest)
		out = append(out, found{phase: s.icosa, fraction: f})
		rest -= f
		haveI = true
	}
	if rest >= 0.025 {
		others := s.compete(s, st)
		if len(out) == 0 && rest > 0.3 && r.Float64() < 0.8 || len(out) > 0 && rest > 0.3 && r.Float64() < 0.3 {
			f := rest * g.uniform(0.5, 0.85)
			out = append(out, found{phase: others[0], fraction: f}, found{phase: others[1], fraction: rest - f})
		} else {
			out = append(out, found{phase: others[0], fraction: rest})
		}
	}
	out = roundShares(out)
	// Ambiguous results: a weak icosahedral trace that cannot be settled,
	// or a small icosahedral share left unconfirmed.
	switch {
	case !haveI && pI > 0.2 && pI < 0.8 && r.Float64() < 0.35:
		out = append(out, found{phase: s.icosa, tentative: true})
	case haveI:
		for i := range out {
			if out[i].phase.kind == meltbook.Icosahedral && out[i].fraction <= 0.2 && len(out) > 1 && r.Float64() < 0.5 {
				// Unconfirmed: its share goes to the largest other phase.
				out[i].tentative = true
				largest := -1
				for j := range out {
					if j != i && (largest < 0 || out[j].fraction > out[largest].fraction) {
						largest = j
					}
				}
				out[largest].fraction += out[i].fraction
				out[i].fraction = 0
			}
		}
	}
	return out
}

// roundShares rounds fractions to 0.05 (at least 0.05), merges repeats and
// makes them add up to 1 by adjusting the largest.
func roundShares(in []found) []found {
	var out []found
	for _, f := range in {
		merged := false
		for i := range out {
			if out[i].phase.name == f.phase.name && out[i].phase.kind == f.phase.kind {
				out[i].fraction += f.fraction
				merged = true
			}
		}
		if !merged {
			out = append(out, f)
		}
	}
	var sum float64
	largest := 0
	for i := range out {
		out[i].fraction = math.Max(0.05, round(out[i].fraction, 0.05))
		sum += out[i].fraction
		if out[i].fraction > out[largest].fraction {
			largest = i
		}
	}
	if len(out) > 0 {
		out[largest].fraction = round(out[largest].fraction+1-sum, 0.05)
	}
	return out
}

// outcomes turns decided phases into a person's confirmed outcomes.
func (g *generator) outcomes(s *system, phases []found, at time.Time, who string) []meltbook.Outcome {
	out := make([]meltbook.Outcome, 0, len(phases))
	for _, f := range phases {
		o := meltbook.Outcome{Kind: f.phase.kind, Lattice: f.phase.lattice, Order: f.phase.order, Name: f.phase.name,
			Source: meltbook.ByPerson, RecordedBy: who, Status: meltbook.Confirmed, At: at,
			Evidence: g.evidence(s, f)}
		if !f.tentative {
			v := f.fraction
			o.Fraction = &v
		}
		out = append(out, o)
	}
	return out
}

// evidence says, in the lab's words, what the decision rests on.
func (g *generator) evidence(s *system, f found) string {
	const xrd = "; powder XRD, Cu Kα, 2θ 20-100°, Si internal standard"
	if f.tentative {
		return Tentative + ": two or three weak lines near the strongest icosahedral positions, too weak to index" + xrd + "; to check by TEM"
	}
	share := ""
	if f.fraction < 1 {
		share = "; share from relative peak areas, rough"
	}
	var what string
	switch f.phase.kind {
	case meltbook.Icosahedral:
		what = "icosahedral lines with the F-type superlattice lines"
		if f.phase.lattice == "P" {
			what = "primitive icosahedral lines, no superlattice lines"
		}
		if f.fraction >= 1 {
			what = "all lines index as " + what
		}
	case meltbook.Decagonal:
		what = "decagonal reflections, no match to any crystalline phase on file"
	case meltbook.Approximant:
		a := "12.68 Å (the α-Al-Mn-Si value)"
		if strings.Contains(f.phase.name, "Cu") {
			a = "about 12.3 Å"
		}
		what = "cubic P lines, a ≈ " + a + ", the strong ones beside the icosahedral positions"
	case meltbook.Amorphous:
		what = "broad halo, no Bragg peaks"
	default:
		what = "lines of " + f.phase.name
	}
	return what + xrd + share
}

// measurements draws EDS and sometimes ICP-OES results scattered around the
// actual composition.
func (g *generator) measurements(s *system, actual vec, after time.Time, who string) []meltbook.MeasuredComposition {
	var out []meltbook.MeasuredComposition
	if g.r.Float64() < 0.7 {
		out = append(out, g.measure(s, actual, "EDS", after.Add(24*time.Hour*time.Duration(3+g.r.IntN(18))), who))
	}
	if g.r.Float64() < 0.15 {
		out = append(out, g.measure(s, actual, "ICP-OES", after.Add(24*time.Hour*time.Duration(10+g.r.IntN(21))),
			g.lab.Operators[opFemi].Name))
	}
	return out
}

// measure draws one measured composition: EDS with 0.5-1 at.% standard
// uncertainty on the major elements, ICP-OES with 0.2-0.3 at.%, rounded to
// 0.1 at.%.
func (g *generator) measure(s *system, actual vec, method string, at time.Time, who string) meltbook.MeasuredComposition {
	r := g.r
	u := pick(r, 0.005, 0.007, 0.01)
	notes := pick(r, "mean of five 200 µm areas on the free side, 15 kV", "mean of six areas, wheel and free sides, 20 kV", "area scans on a polished cross-section, 15 kV")
	if method == "ICP-OES" {
		u = pick(r, 0.002, 0.003)
		notes = "about 50 mg of ribbon dissolved in aqua regia, two dilutions"
	}
	var present []int
	for i, f := range actual {
		if f > 0 {
			present = append(present, i)
		}
	}
	const units = 1000 // 0.1 at.%
	n := make([]int, len(present))
	unc := make([]float64, len(present))
	sum := 0
	for j := len(present) - 1; j >= 0; j-- {
		i := present[j]
		unc[j] = u
		if actual[i] < 0.1 {
			unc[j] = math.Max(0.002, u/2)
		}
		if j == 0 {
			continue
		}
		n[j] = max(1, int(math.Round((actual[i]+unc[j]*r.NormFloat64())*units)))
		sum += n[j]
	}
	n[0] = units - sum
	m := meltbook.MeasuredComposition{Method: method, At: at, Operator: who, Notes: notes}
	for j, i := range present {
		m.Fractions = append(m.Fractions, meltbook.ElementFraction{Element: s.elements[i], Fraction: float64(n[j]) / units})
		m.Uncertainty = append(m.Uncertainty, meltbook.ElementFraction{Element: s.elements[i], Fraction: unc[j]})
	}
	return m
}

// tem records, for some samples, which rotational symmetries selected-area
// electron diffraction showed in the main structured phase.
func (g *generator) tem(phases []found, after time.Time) (meltbook.SymmetryObservation, bool) {
	r := g.r
	var main *found
	for i := range phases {
		if phases[i].tentative || len(phases[i].phase.folds) == 0 {
			continue
		}
		if main == nil || phases[i].fraction > main.fraction {
			main = &phases[i]
		}
	}
	if main == nil {
		return meltbook.SymmetryObservation{}, false
	}
	share := 0.1
	switch main.phase.kind {
	case meltbook.Icosahedral, meltbook.Decagonal, meltbook.Approximant:
		share = 0.45
	}
	if r.Float64() >= share {
		return meltbook.SymmetryObservation{}, false
	}
	who := g.lab.Operators[pick(r, opMarit, opMarit, opDario)].Name
	notes := map[meltbook.PhaseKind]string{
		meltbook.Icosahedral: "SAED on ion-milled ribbon: 5-, 3- and 2-fold zone axes at the icosahedral angles, sharp spots",
		meltbook.Decagonal:   "SAED: 10-fold pattern along the periodic axis, 2-fold patterns at right angles",
		meltbook.Approximant: "SAED: pseudo-5-fold patterns with split spots; true axes are 3- and 2-fold, so cubic approximant, not i-phase",
		meltbook.Crystalline: "SAED on a few grains: ordinary crystal zone axes only",
	}
	return meltbook.SymmetryObservation{Folds: append([]int(nil), main.phase.folds...),
		At: after.Add(24 * time.Hour * time.Duration(10+r.IntN(30))), Operator: who, Notes: notes[main.phase.kind]}, true
}

// anneal builds one annealed piece of the ribbon.
func (g *generator) anneal(s *system, code string, k int, start time.Time, actual vec, ea, logRate float64, op int) (Derived, error) {
	r := g.r
	who := g.lab.Operators[op].Name
	tempC := round(g.uniform(s.annealC[0], s.annealC[1]), 25)
	var hoursChoices []float64
	for _, h := range []float64{1, 2, 4, 8, 12, 24, 48, 100, 200} {
		if h >= s.annealH[0] && h <= s.annealH[1] {
			hoursChoices = append(hoursChoices, h)
		}
	}
	hours := pick(r, hoursChoices...)
	quench := pick(r, "water quench", "water quench", "furnace cool")
	end := start.Add(time.Duration(hours * float64(time.Hour)))
	sampleCode := fmt.Sprintf("%s.a%d", code, k)
	d := Derived{
		Sample: meltbook.Sample{Code: sampleCode, ParentCode: code, CreatedAt: end,
			Label: fmt.Sprintf("annealed %g °C, %g h, %s", tempC, hours, quench)},
		Step: meltbook.ProcessStep{Seq: 1, Kind: meltbook.Anneal, At: start, Operator: who, Params: []meltbook.Param{
			num("temperature", celsius(tempC), "°C"),
			num("time", hours*3600, "h"),
			text("atmosphere", s.annealAtmos),
			text("cooling", quench),
		}},
	}
	if len(s.annealNotes) > 0 {
		d.Step.Notes = s.annealNotes[0]
	}
	st := sample{x: actual, ea: ea, logRate: logRate, annealed: true, annealC: tempC, hours: hours}
	phases := g.decide(s, st, false)
	xrdAt := end.Add(24*time.Hour*time.Duration(1+r.IntN(7)) + g.minutes(0, 300))
	d.Outcomes = g.outcomes(s, phases, xrdAt, g.characteriser(op))
	if r.Float64() < 0.3 {
		d.Measured = append(d.Measured, g.measure(s, actual, "EDS", xrdAt.Add(24*time.Hour*time.Duration(2+r.IntN(10))), who))
	}
	if o, ok := g.tem(phases, end); ok {
		d.Observations = append(d.Observations, o)
	}
	if n := g.xrdRemark(phases, st, s); n != "" {
		d.Notes = append(d.Notes, g.note(g.characteriser(op), xrdAt.Add(g.minutes(10, 60)), sampleCode, n))
	}
	return d, nil
}

func (g *generator) note(who string, at time.Time, sampleCode, text string) meltbook.Note {
	return meltbook.Note{Author: who, At: at, SampleCode: sampleCode, Text: text}
}

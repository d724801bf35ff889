package seed

import (
	"fmt"
	"math"
	"math/rand/v2"
	"sort"
	"strings"
	"time"

	"meltbook"
	"meltbook/analysis/composition"
	"meltbook/analysis/cooling"
	"meltbook/analysis/descriptor"
	"meltbook/analysis/element"
	"meltbook/analysis/weighout"
)

// wheelTemperatureK is the wheel temperature the lab assumes for its
// cooling estimates (room temperature, 22 °C).
const wheelTemperatureK = 295.15

// stream is the second PCG word; the first is the caller's seed.
const stream = 0x51ED_C0DE

// Generate builds the invented notebook for a seed. The same seed gives the
// same notebook, value for value; the values are plain domain values, not
// written anywhere. Every melt, step, measurement, observation and outcome
// passes its Validate method; a failure there is an Internal error.
func Generate(seed uint64) (*Notebook, error) {
	raynor, ok := element.LookupScheme(element.RaynorScheme)
	if !ok {
		return nil, meltbook.Errorf(meltbook.Internal, "seed", "the raynor valence scheme is missing")
	}
	g := &generator{r: rand.New(rand.NewPCG(seed, stream)), lab: newLab(), raynor: raynor}
	var plans []plan
	for _, s := range systems() {
		if err := g.prepare(s); err != nil {
			return nil, err
		}
		ps, err := g.plan(s)
		if err != nil {
			return nil, err
		}
		plans = append(plans, ps...)
	}
	sort.SliceStable(plans, func(i, j int) bool { return plans[i].at.Before(plans[j].at) })
	nb := &Notebook{Lab: g.lab}
	for i, p := range plans {
		code := fmt.Sprintf("%s-%04d", g.lab.CodePrefix, i+1)
		// Each run draws from its own stream, so that a change in one run
		// does not reshuffle every later one.
		g.r = rand.New(rand.NewPCG(p.seed, stream))
		run, err := g.run(p, code)
		if err != nil {
			return nil, fmt.Errorf("seed %s: %w", code, err)
		}
		if err := validate(&run); err != nil {
			return nil, meltbook.Errorf(meltbook.Internal, "seed "+code, "generated run does not validate: %v", err)
		}
		nb.Runs = append(nb.Runs, run)
	}
	return nb, nil
}

type generator struct {
	r      *rand.Rand
	lab    Lab
	raynor element.Scheme
	// windows maps a system name to its e/a window, when descriptor holds
	// one for the family.
	windows map[string]descriptor.Window
	// cuBeSeen and cautions remember first occurrences for notes.
	cuBeSeen bool
	cautions map[string]bool
}

// plan is one melt before it has a code.
type plan struct {
	s        *system
	at       time.Time
	nominal  vec
	progress float64
	anchor   bool
	seed     uint64 // of the run's own random stream
}

// prepare looks up the system's e/a window and calibrates the cooling-rate
// references of its truth model.
func (g *generator) prepare(s *system) error {
	if g.windows == nil {
		g.windows = map[string]descriptor.Window{}
		g.cautions = map[string]bool{}
	}
	probe := s.goal
	if probe == nil {
		probe = s.anchors[0]
	}
	c := s.comp(probe)
	for _, w := range descriptor.Windows() {
		if w.Matches(c) {
			g.windows[s.name] = w
			break
		}
	}
	s.win = g.windows[s.name]
	s.hasWin = s.win.High > 0
	// References: the Al-Mn-Si i-phase needs ribbons thinner than about
	// 28 µm; Mg-rich Zn-Mg-Y ribbons thinner than about 22 µm come off
	// amorphous (invented thresholds, set on the lab's own estimate scale).
	s.refs = map[string]float64{}
	ref := func(name string, x vec, thicknessM float64) error {
		rate, _, err := g.cooling(s, x, thicknessM, s.liquidusC+150+273.15, 0)
		if err != nil {
			return err
		}
		s.refs[name] = math.Log10(rate.RateKPerS)
		return nil
	}
	switch s.name {
	case "Al-Mn-Si":
		return ref("i", at(74, 20, 6), 28e-6)
	case "Zn-Mg-Y":
		return ref("amorphous", at(50, 42, 8), 22e-6)
	}
	return nil
}

// plan draws the system's melt dates and nominal compositions.
func (g *generator) plan(s *system) ([]plan, error) {
	r := g.r
	span := s.to.Sub(s.from)
	days := make([]time.Time, s.melts)
	for i := range days {
		d := s.from.Add(time.Duration(r.Float64() * float64(span))).Truncate(24 * time.Hour)
		days[i] = workingDay(d)
	}
	// The campaign opens and closes on its dates.
	days[0], days[len(days)-1] = workingDay(s.from), workingDay(s.to)
	sort.Slice(days, func(i, j int) bool { return days[i].Before(days[j]) })
	out := make([]plan, s.melts)
	for i, d := range days {
		progress := float64(i) / float64(s.melts-1)
		start := d.Add(time.Duration(8*60+30+r.IntN(6*60)) * time.Minute)
		x, anchor, err := g.choose(s, progress)
		if err != nil {
			return nil, err
		}
		out[i] = plan{s: s, at: start, nominal: x, progress: progress, anchor: anchor, seed: r.Uint64()}
	}
	return out, nil
}

// workingDay moves weekends to the next Monday and the summer closure
// (27 July - 7 August) to the Monday after it.
func workingDay(d time.Time) time.Time {
	closeFrom, closeTo := day(time.July, 27), day(time.August, 10)
	if !d.Before(closeFrom) && d.Before(closeTo) {
		d = closeTo
	}
	switch d.Weekday() {
	case time.Saturday:
		d = d.AddDate(0, 0, 2)
	case time.Sunday:
		d = d.AddDate(0, 0, 1)
	}
	return d
}

// choose draws a nominal composition rounded to 0.5 at.% inside the
// system's bounds.
func (g *generator) choose(s *system, progress float64) (vec, bool, error) {
	const units = 200 // 0.5 at.% steps
	for range 100 {
		raw := s.composition(g.r, s, progress)
		anchor := false
		for _, a := range s.anchors {
			anchor = anchor || equal(raw, a)
		}
		n := make([]int, len(raw))
		sum := 0
		for i := 1; i < len(raw); i++ {
			n[i] = int(math.Round(raw[i] * units))
			sum += n[i]
		}
		n[0] = units - sum
		ok := true
		x := make(vec, len(raw))
		for i := range n {
			x[i] = float64(n[i]) / units
			ok = ok && x[i] >= s.low[i]-1e-9 && x[i] <= s.high[i]+1e-9
		}
		if ok {
			return x, anchor, nil
		}
	}
	return nil, false, meltbook.Errorf(meltbook.Internal, "seed "+s.name, "no composition inside the bounds after 100 draws")
}

func equal(a, b vec) bool {
	for i := range a {
		if math.Abs(a[i]-b[i]) > 1e-9 {
			return false
		}
	}
	return true
}

// comp turns a vector into a composition in the system's element order,
// dropping zero parts.
func (s *system) comp(x vec) composition.Composition {
	c := make(composition.Composition, 0, len(x))
	for i, f := range x {
		if f > 0 {
			c = append(c, composition.Part{Element: s.elements[i], Fraction: f})
		}
	}
	return c
}

// window is the soft e/a window factor W, 1 when no window is held.
func (s *system) window(st sample) float64 {
	if !s.hasWin {
		return 1
	}
	return softWindow(st.ea, s.win.Low, s.win.High, s.eaSoft)
}

// asSpunI is the as-spun icosahedral probability.
func (s *system) asSpunI(st sample) float64 {
	d := distanceToSegment(st.x, s.iRegion[0], s.iRegion[1])
	return s.iMax * gauss(d, s.iSigma) * s.window(st) * s.coolingC(s, st)
}

// cooling estimates the cooling rate of a ribbon of composition x.
func (g *generator) cooling(s *system, x vec, thicknessM, meltK, speed float64) (cooling.Estimate, string, error) {
	m, err := cooling.MaterialFromComposition(s.comp(x))
	if err != nil {
		return cooling.Estimate{}, "", err
	}
	e, err := cooling.Rate(cooling.Input{ThicknessMetres: thicknessM, MeltTemperatureK: meltK,
		WheelTemperatureK: wheelTemperatureK, Material: m, WheelSpeedMPerS: speed})
	if err != nil {
		return cooling.Estimate{}, "", err
	}
	regime := fmt.Sprintf("%s (Bi = %.2g); h = %.0e W/(m²·K) assumed, wheel at 22 °C; properties by rule of mixtures",
		e.Regime, e.Biot, e.HeatTransferWPerM2K)
	return e, regime, nil
}

// electronsPerAtom is e/a under Raynor's valences.
func (g *generator) electronsPerAtom(s *system, x vec) (float64, error) {
	d, err := descriptor.Describe(s.comp(x), g.raynor, descriptor.Options{})
	if err != nil {
		return 0, err
	}
	if !d.ElectronsPerAtomDefined {
		return 0, fmt.Errorf("seed: %s", strings.Join(d.Undefined, "; "))
	}
	return d.ElectronsPerAtom, nil
}

func validate(run *Run) error {
	if err := run.Melt.Validate(); err != nil {
		return err
	}
	check := func(steps []meltbook.ProcessStep, ms []meltbook.MeasuredComposition, os []meltbook.SymmetryObservation, oc []meltbook.Outcome) error {
		for i := range steps {
			if err := steps[i].Validate(); err != nil {
				return err
			}
		}
		for i := range ms {
			if err := ms[i].Validate(); err != nil {
				return err
			}
		}
		for i := range os {
			if err := os[i].Validate(); err != nil {
				return err
			}
		}
		for i := range oc {
			if err := oc[i].Validate(); err != nil {
				return err
			}
		}
		return nil
	}
	if err := check(run.Steps, run.Measured, run.Observations, run.Outcomes); err != nil {
		return err
	}
	for _, d := range run.Derived {
		if err := check([]meltbook.ProcessStep{d.Step}, d.Measured, d.Observations, d.Outcomes); err != nil {
			return fmt.Errorf("%s: %w", d.Sample.Code, err)
		}
	}
	return nil
}

// round rounds x to a multiple of step; for steps below 1 it divides by
// the whole number 1/step so that the result is the double nearest the
// decimal (0.45, not 0.45000000000000007).
func round(x, step float64) float64 {
	if step < 1 {
		inv := math.Round(1 / step)
		return math.Round(x*inv) / inv
	}
	return math.Round(x/step) * step
}

// uniform draws from [lo, hi).
func (g *generator) uniform(lo, hi float64) float64 { return lo + (hi-lo)*g.r.Float64() }

// pick returns one of the options.
func pick[T any](r *rand.Rand, options ...T) T { return options[r.IntN(len(options))] }

// minutes returns a duration of lo to hi minutes.
func (g *generator) minutes(lo, hi int) time.Duration {
	return time.Duration(lo+g.r.IntN(hi-lo+1)) * time.Minute
}

// weigh returns the weigh-out lines and the masses charged per element.
func (g *generator) weigh(s *system, nominal composition.Composition, massG float64) ([]meltbook.WeighOutLine, []float64, error) {
	purity := map[string]float64{}
	for i, e := range s.elements {
		purity[e] = s.purity[i]
	}
	for e := range purity {
		if nominal.Fraction(e) == 0 {
			delete(purity, e)
		}
	}
	sheet, err := weighout.Plan(nominal, weighout.Options{TotalMassGrams: massG, Purity: purity})
	if err != nil {
		return nil, nil, err
	}
	lines := make([]meltbook.WeighOutLine, len(sheet.Lines))
	weighed := make([]float64, len(sheet.Lines))
	for i, l := range sheet.Lines {
		planned := round(l.MassGrams, 1e-4)
		w := round(planned+g.uniform(-4e-4, 4e-4), 1e-4)
		weighed[i] = w
		lines[i] = meltbook.WeighOutLine{Element: l.Element, PlannedGrams: planned, WeighedGrams: &weighed[i],
			PurityPercent: round(100*l.Purity, 1e-3), LossPercent: round(100*l.Loss, 0.1)}
	}
	return lines, weighed, nil
}

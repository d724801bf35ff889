package suggest

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"meltbook"
)

// Outcome is what a sample showed, as far as the estimate cares.
type Outcome int

// The outcomes. Ambiguous counts as half a quasicrystal.
const (
	NoQuasicrystal Outcome = iota
	Quasicrystal
	Ambiguous
)

// String returns "no", "yes" or "ambiguous".
func (o Outcome) String() string {
	switch o {
	case NoQuasicrystal:
		return "no"
	case Quasicrystal:
		return "yes"
	case Ambiguous:
		return "ambiguous"
	}
	return fmt.Sprintf("Outcome(%d)", int(o))
}

func (o Outcome) value() (float64, bool) {
	switch o {
	case NoQuasicrystal:
		return 0, true
	case Quasicrystal:
		return 1, true
	case Ambiguous:
		return 0.5, true
	}
	return 0, false
}

// Point is one characterised sample of the system.
type Point struct {
	// Code names the sample in reasons, e.g. "QR-0042" or "QR-0042.a1".
	Code string
	// Composition maps element symbol to atomic fraction; fractions sum to 1.
	// The caller chooses nominal or measured composition.
	Composition map[string]float64
	// ElectronsPerAtom is the sample's e/a under the window's scheme, or 0
	// when not known. When a window with valences is given, a non-zero value
	// must agree with Σ x_e·v_e within 0.01, which catches points computed
	// under another scheme.
	ElectronsPerAtom float64
	// CoolingRateKPerS is the estimated cooling rate in K/s, 0 when unknown.
	CoolingRateKPerS float64
	Outcome          Outcome
	// Annealed marks a sample heat-treated after melt spinning.
	Annealed bool
}

// Treatment selects which samples inform the estimate. All points count
// for the distance to compositions already melted.
type Treatment int

// The treatments.
const (
	AnyTreatment Treatment = iota
	AsSpunOnly
	AnnealedOnly
)

// Window is an e/a window; candidates outside it are not suggested.
type Window struct {
	Low, High float64
	// Scheme names the valence scheme, for reasons (e.g. "raynor").
	Scheme string
	// Valences maps each element of the system to its valence in Scheme.
	Valences map[string]float64
}

// Range is a closed interval of atomic fraction.
type Range struct{ Low, High float64 }

// Options tune the search. Start from DefaultOptions; every field is used
// as given.
type Options struct {
	// Elements of the system in display order; nil takes them from the
	// points, ordered by decreasing mean fraction.
	Elements []string
	// StepFraction is the grid step in atomic fraction; 1/StepFraction must
	// be a whole number.
	StepFraction float64
	// BandwidthFraction is the kernel width h in atomic fraction.
	BandwidthFraction float64
	// MinDistanceFraction drops candidates nearer than this to any point.
	MinDistanceFraction float64
	// SeparationFraction is the least distance between two suggestions.
	SeparationFraction float64
	// MarginFraction widens the points' range of each element to make the
	// default region.
	MarginFraction float64
	// Bounds sets the region for the elements it names, overriding the
	// default range.
	Bounds map[string]Range
	// Window restricts candidates by e/a; nil for none.
	Window *Window
	// CoolingRateKPerS is the target cooling rate in K/s; 0 ignores rates.
	CoolingRateKPerS float64
	// CoolingBandwidthDecades is h_r, in decades of cooling rate.
	CoolingBandwidthDecades float64
	Treatment               Treatment
	// Exploration is κ in the score p + κ·s; 0 for pure exploitation.
	Exploration float64
	// PriorWeight is α, the weight of the prior in runs.
	PriorWeight float64
	// Prior is p₀ in (0, 1); 0 takes Laplace's rule over the points used.
	Prior float64
	// Count is the number of suggestions wanted.
	Count int
	// MaxGridPoints bounds the work; a larger region is an error.
	MaxGridPoints int
}

// DefaultOptions returns the settings the notebook uses: a 0.5 at.% grid,
// 2 at.% bandwidth, at least 1 at.% from any run, suggestions 2 at.% apart,
// a 5 at.% margin, cooling bandwidth half a decade, κ = 1, α = 1, Laplace
// prior, five suggestions and at most two million grid points.
func DefaultOptions() Options {
	return Options{
		StepFraction:            0.005,
		BandwidthFraction:       0.02,
		MinDistanceFraction:     0.01,
		SeparationFraction:      0.02,
		MarginFraction:          0.05,
		CoolingBandwidthDecades: 0.5,
		Exploration:             1,
		PriorWeight:             1,
		Count:                   5,
		MaxGridPoints:           2_000_000,
	}
}

// Prediction is the estimate at one composition.
type Prediction struct {
	// Probability is the posterior mean p of a quasicrystal outcome.
	Probability float64
	// Uncertainty is the posterior standard deviation s.
	Uncertainty float64
	// EffectiveRuns is Σ w_i, the kernel-weighted number of runs.
	EffectiveRuns float64
	// Neighbours counts the points used within two bandwidths.
	Neighbours int
	// Nearest is the code of the nearest point of all given, and
	// NearestDistanceFraction its distance d.
	Nearest                 string
	NearestDistanceFraction float64
}

// Suggestion is one proposed composition.
type Suggestion struct {
	// Composition in the system's element order; elements at zero are kept.
	Composition []meltbook.ElementFraction
	// ElectronsPerAtom under the window's valences; NaN without a window.
	ElectronsPerAtom float64
	Prediction
	// Score is p + κ·s.
	Score float64
	// Reason says in words why this composition was chosen.
	Reason string
}

// Result is the ranked suggestions with the bookkeeping of the search.
type Result struct {
	Suggestions []Suggestion
	Elements    []string
	// Prior is the p₀ used.
	Prior float64
	// PointsUsed counts the points that informed the estimate (after the
	// treatment filter).
	PointsUsed int
	// GridPoints is the number of grid points in the region; ExcludedNear
	// and ExcludedWindow count those dropped for being too close to a run
	// and for e/a outside the window.
	GridPoints, ExcludedNear, ExcludedWindow int
}

// model is the validated input in the system's element order.
type model struct {
	elements []string
	opts     Options
	all      []vec     // every point's composition
	codes    []string  // every point's code
	used     []bool    // whether the point informs the estimate
	y        []float64 // outcome value of each point
	c        []float64 // cooling factor of each point
	nUsed    int
	prior    float64
}

type vec []float64

// Predict returns the estimate at one composition (element -> atomic
// fraction, elements of the system only, summing to 1).
func Predict(points []Point, at map[string]float64, opts Options) (Prediction, error) {
	m, err := newModel(points, opts)
	if err != nil {
		return Prediction{}, err
	}
	x, err := m.vector(at, "at")
	if err != nil {
		return Prediction{}, err
	}
	return m.predict(x), nil
}

// Suggest ranks grid compositions of one alloy system by p + κ·s and
// returns up to opts.Count of them, best first. It fails with a
// *meltbook.Error (kind Invalid) naming the point or option at fault.
func Suggest(points []Point, opts Options) (Result, error) {
	m, err := newModel(points, opts)
	if err != nil {
		return Result{}, err
	}
	lo, hi, steps, err := m.region()
	if err != nil {
		return Result{}, err
	}
	res := Result{Elements: m.elements, Prior: m.prior, PointsUsed: m.nUsed}
	k := len(m.elements)
	type candidate struct {
		x     vec
		pred  Prediction
		ea    float64
		score float64
	}
	var cands []candidate
	minD := opts.MinDistanceFraction - 1e-9
	units := make([]int, k)
	var walk func(i, left int) error
	walk = func(i, left int) error {
		if i == k-1 {
			if left < lo[i] || left > hi[i] {
				return nil
			}
			units[i] = left
			res.GridPoints++
			if res.GridPoints > opts.MaxGridPoints {
				return meltbook.Errorf(meltbook.Invalid, "options.step",
					"the region holds more than %d grid points; narrow the bounds or use a coarser step", opts.MaxGridPoints)
			}
			x := make(vec, k)
			for j, u := range units {
				x[j] = float64(u) / float64(steps)
			}
			ea := math.NaN()
			if w := opts.Window; w != nil {
				ea = m.electronsPerAtom(x)
				if ea < w.Low-1e-9 || ea > w.High+1e-9 {
					res.ExcludedWindow++
					return nil
				}
			}
			p := m.predict(x)
			if p.NearestDistanceFraction < minD {
				res.ExcludedNear++
				return nil
			}
			cands = append(cands, candidate{x: x, pred: p, ea: ea, score: p.Probability + opts.Exploration*p.Uncertainty})
			return nil
		}
		for u := lo[i]; u <= hi[i] && u <= left; u++ {
			units[i] = u
			if err := walk(i+1, left-u); err != nil {
				return err
			}
		}
		return nil
	}
	if err := walk(0, steps); err != nil {
		return Result{}, err
	}
	sort.SliceStable(cands, func(i, j int) bool { return cands[i].score > cands[j].score })
	sep := opts.SeparationFraction - 1e-9
	var picked []vec
	for _, c := range cands {
		if len(res.Suggestions) == opts.Count {
			break
		}
		crowded := false
		for _, p := range picked {
			if distance(c.x, p) < sep {
				crowded = true
				break
			}
		}
		if crowded {
			continue
		}
		picked = append(picked, c.x)
		comp := make([]meltbook.ElementFraction, k)
		for j, e := range m.elements {
			comp[j] = meltbook.ElementFraction{Element: e, Fraction: c.x[j]}
		}
		s := Suggestion{Composition: comp, ElectronsPerAtom: c.ea, Prediction: c.pred, Score: c.score}
		s.Reason = m.reason(s)
		res.Suggestions = append(res.Suggestions, s)
	}
	return res, nil
}

func newModel(points []Point, opts Options) (*model, error) {
	if err := checkOptions(opts); err != nil {
		return nil, err
	}
	if len(points) == 0 {
		return nil, meltbook.Errorf(meltbook.Invalid, "points", "no points: melt something in this system first, or give its points")
	}
	m := &model{opts: opts}
	if opts.Elements != nil {
		m.elements = append([]string(nil), opts.Elements...)
	} else {
		m.elements = elementsOf(points)
	}
	seen := map[string]bool{}
	for _, e := range m.elements {
		if e == "" || seen[e] {
			return nil, meltbook.Errorf(meltbook.Invalid, "options.elements", "element %q is empty or repeated", e)
		}
		seen[e] = true
	}
	if len(m.elements) < 2 {
		return nil, meltbook.Errorf(meltbook.Invalid, "options.elements", "a system needs at least two elements, got %v", m.elements)
	}
	if w := opts.Window; w != nil {
		for _, e := range m.elements {
			v, ok := w.Valences[e]
			if !ok || math.IsNaN(v) || math.IsInf(v, 0) {
				return nil, meltbook.Errorf(meltbook.Invalid, "options.window", "no valence for %s in scheme %q", e, w.Scheme)
			}
		}
	}
	var sumY float64
	for i, p := range points {
		field := fmt.Sprintf("points[%d]", i)
		if strings.TrimSpace(p.Code) == "" {
			return nil, meltbook.Errorf(meltbook.Invalid, field+".code", "a point needs its sample code")
		}
		field = fmt.Sprintf("points[%d] (%s)", i, p.Code)
		x, err := m.vector(p.Composition, field+".composition")
		if err != nil {
			return nil, err
		}
		y, ok := p.Outcome.value()
		if !ok {
			return nil, meltbook.Errorf(meltbook.Invalid, field+".outcome", "%v is not yes, no or ambiguous", p.Outcome)
		}
		if r := p.CoolingRateKPerS; !(r >= 0) || math.IsInf(r, 0) {
			return nil, meltbook.Errorf(meltbook.Invalid, field+".cooling-rate", "%g K/s is not a finite non-negative rate", r)
		}
		if w := opts.Window; w != nil && p.ElectronsPerAtom != 0 {
			if ea := m.electronsPerAtom(x); math.Abs(ea-p.ElectronsPerAtom) > 0.01 {
				return nil, meltbook.Errorf(meltbook.Invalid, field+".e/a",
					"given %.3f but the composition gives %.3f under %q; points and window must use one scheme", p.ElectronsPerAtom, ea, w.Scheme)
			}
		}
		used := !(opts.Treatment == AsSpunOnly && p.Annealed || opts.Treatment == AnnealedOnly && !p.Annealed)
		m.all = append(m.all, x)
		m.codes = append(m.codes, p.Code)
		m.used = append(m.used, used)
		m.y = append(m.y, y)
		m.c = append(m.c, coolingFactor(p.CoolingRateKPerS, opts))
		if used {
			m.nUsed++
			sumY += y
		}
	}
	m.prior = opts.Prior
	if m.prior == 0 {
		m.prior = (sumY + 1) / (float64(m.nUsed) + 2)
	}
	return m, nil
}

func checkOptions(o Options) error {
	bad := func(field, format string, args ...any) error {
		return meltbook.Errorf(meltbook.Invalid, "options."+field, format, args...)
	}
	positive := func(v float64) bool { return v > 0 && !math.IsInf(v, 0) }
	nonNegative := func(v float64) bool { return v >= 0 && !math.IsInf(v, 0) }
	switch {
	case !(o.StepFraction > 0 && o.StepFraction <= 0.5):
		return bad("step", "%g is not in (0, 0.5]", o.StepFraction)
	case math.Abs(1/o.StepFraction-math.Round(1/o.StepFraction)) > 1e-6:
		return bad("step", "1/%g is not a whole number of steps", o.StepFraction)
	case !positive(o.BandwidthFraction):
		return bad("bandwidth", "%g must be positive", o.BandwidthFraction)
	case !nonNegative(o.MinDistanceFraction):
		return bad("min-distance", "%g must not be negative", o.MinDistanceFraction)
	case !nonNegative(o.SeparationFraction):
		return bad("separation", "%g must not be negative", o.SeparationFraction)
	case !nonNegative(o.MarginFraction):
		return bad("margin", "%g must not be negative", o.MarginFraction)
	case !nonNegative(o.CoolingRateKPerS):
		return bad("cooling-rate", "%g K/s must not be negative", o.CoolingRateKPerS)
	case o.CoolingRateKPerS > 0 && !positive(o.CoolingBandwidthDecades):
		return bad("cooling-bandwidth", "%g decades must be positive", o.CoolingBandwidthDecades)
	case o.Treatment < AnyTreatment || o.Treatment > AnnealedOnly:
		return bad("treatment", "%d is not a known treatment", o.Treatment)
	case !nonNegative(o.Exploration):
		return bad("exploration", "%g must not be negative", o.Exploration)
	case !positive(o.PriorWeight):
		return bad("prior-weight", "%g must be positive", o.PriorWeight)
	case !(o.Prior >= 0 && o.Prior < 1):
		return bad("prior", "%g is not 0 (from the data) or in (0, 1)", o.Prior)
	case o.Count < 1:
		return bad("count", "%d: ask for at least one suggestion", o.Count)
	case o.MaxGridPoints < 1:
		return bad("max-grid-points", "%d must be positive", o.MaxGridPoints)
	}
	if w := o.Window; w != nil && !(w.Low <= w.High) {
		return bad("window", "e/a window %g–%g is empty", w.Low, w.High)
	}
	for e, r := range o.Bounds {
		if !(r.Low >= 0 && r.Low <= r.High && r.High <= 1) {
			return bad("bounds."+e, "%g–%g is not a range within 0..1", r.Low, r.High)
		}
	}
	return nil
}

// elementsOf orders the points' elements by decreasing mean fraction, then
// by symbol.
func elementsOf(points []Point) []string {
	sum := map[string]float64{}
	for _, p := range points {
		for e, f := range p.Composition {
			sum[e] += f
		}
	}
	out := make([]string, 0, len(sum))
	for e := range sum {
		out = append(out, e)
	}
	sort.Slice(out, func(i, j int) bool {
		if sum[out[i]] != sum[out[j]] {
			return sum[out[i]] > sum[out[j]]
		}
		return out[i] < out[j]
	})
	return out
}

// vector checks a composition and returns it in the system's order.
func (m *model) vector(c map[string]float64, field string) (vec, error) {
	x := make(vec, len(m.elements))
	var sum float64
	for e, f := range c {
		if math.IsNaN(f) || f < 0 || f > 1 {
			return nil, meltbook.Errorf(meltbook.Invalid, field, "%s fraction %g is outside 0..1", e, f)
		}
		j := indexOf(m.elements, e)
		if j < 0 {
			if f == 0 {
				continue
			}
			return nil, meltbook.Errorf(meltbook.Invalid, field, "%s is not an element of the system %s", e, strings.Join(m.elements, "-"))
		}
		x[j] = f
		sum += f
	}
	if math.Abs(sum-1) > 1e-3 {
		return nil, meltbook.Errorf(meltbook.Invalid, field, "fractions sum to %.4g, not 1", sum)
	}
	return x, nil
}

func indexOf(list []string, s string) int {
	for i, v := range list {
		if v == s {
			return i
		}
	}
	return -1
}

func (m *model) electronsPerAtom(x vec) float64 {
	var ea float64
	for j, e := range m.elements {
		ea += x[j] * m.opts.Window.Valences[e]
	}
	return ea
}

func coolingFactor(rate float64, o Options) float64 {
	switch {
	case o.CoolingRateKPerS == 0:
		return 1
	case rate == 0:
		return math.Exp(-0.5)
	}
	z := (math.Log10(rate) - math.Log10(o.CoolingRateKPerS)) / o.CoolingBandwidthDecades
	return math.Exp(-z * z / 2)
}

// distance is sqrt(½ Σ (x_e − y_e)²).
func distance(x, y vec) float64 {
	return math.Sqrt(distance2(x, y))
}

func distance2(x, y vec) float64 {
	var s float64
	for j := range x {
		d := x[j] - y[j]
		s += d * d
	}
	return s / 2
}

func (m *model) predict(x vec) Prediction {
	h2 := m.opts.BandwidthFraction * m.opts.BandwidthFraction
	near2 := 4 * h2
	far2 := 64 * h2 // beyond 8h, w < e^−32 ≈ 1.3e−14: dropped
	var p Prediction
	nearest2 := math.Inf(1)
	a := m.opts.PriorWeight * m.prior
	b := m.opts.PriorWeight * (1 - m.prior)
	for i, xi := range m.all {
		d2 := distance2(x, xi)
		if d2 < nearest2 {
			nearest2 = d2
			p.Nearest = m.codes[i]
		}
		if !m.used[i] {
			continue
		}
		if d2 <= near2 {
			p.Neighbours++
		}
		if d2 > far2 {
			continue
		}
		w := math.Exp(-d2/(2*h2)) * m.c[i]
		p.EffectiveRuns += w
		a += w * m.y[i]
		b += w * (1 - m.y[i])
	}
	p.NearestDistanceFraction = math.Sqrt(nearest2)
	n := a + b
	p.Probability = a / n
	p.Uncertainty = math.Sqrt(a * b / (n * n * (n + 1)))
	return p
}

// region returns the grid-unit bounds of each element and the number of
// steps that make up a whole.
func (m *model) region() (lo, hi []int, steps int, err error) {
	o := m.opts
	steps = int(math.Round(1 / o.StepFraction))
	k := len(m.elements)
	lo, hi = make([]int, k), make([]int, k)
	for e := range o.Bounds {
		if indexOf(m.elements, e) < 0 {
			return nil, nil, 0, meltbook.Errorf(meltbook.Invalid, "options.bounds."+e, "%s is not an element of the system %s", e, strings.Join(m.elements, "-"))
		}
	}
	var sumLo, sumHi int
	for j, e := range m.elements {
		r, ok := o.Bounds[e]
		if !ok {
			r = Range{Low: 1, High: 0}
			for _, x := range m.all {
				r.Low = math.Min(r.Low, x[j])
				r.High = math.Max(r.High, x[j])
			}
			r.Low = math.Max(0, r.Low-o.MarginFraction)
			r.High = math.Min(1, r.High+o.MarginFraction)
		}
		lo[j] = int(math.Ceil(r.Low/o.StepFraction - 1e-9))
		hi[j] = int(math.Floor(r.High/o.StepFraction + 1e-9))
		if lo[j] > hi[j] {
			return nil, nil, 0, meltbook.Errorf(meltbook.Invalid, "options.bounds."+e, "%g–%g holds no grid step of %g", r.Low, r.High, o.StepFraction)
		}
		sumLo += lo[j]
		sumHi += hi[j]
	}
	if sumLo > steps || sumHi < steps {
		return nil, nil, 0, meltbook.Errorf(meltbook.Invalid, "options.bounds", "the bounds admit no composition summing to 1")
	}
	return lo, hi, steps, nil
}

func (m *model) reason(s Suggestion) string {
	o := m.opts
	var b strings.Builder
	within := 200 * o.BandwidthFraction
	if s.Neighbours > 0 {
		runs := "runs"
		if s.Neighbours == 1 {
			runs = "run"
		}
		fmt.Fprintf(&b, "predicted quasicrystal probability %.2f ± %.2f from %d neighbouring %s within %.1f at.%%",
			s.Probability, s.Uncertainty, s.Neighbours, runs, within)
	} else {
		fmt.Fprintf(&b, "no runs within %.1f at.%%: exploring, probability %.2f ± %.2f (prior %.2f from %d runs)",
			within, s.Probability, s.Uncertainty, m.prior, m.nUsed)
	}
	fmt.Fprintf(&b, "; nearest run %s at %.1f at.%%", s.Nearest, 100*s.NearestDistanceFraction)
	if w := o.Window; w != nil {
		scheme := w.Scheme
		if scheme == "" {
			scheme = "given valences"
		}
		fmt.Fprintf(&b, "; e/a %.3f (%s, window %.2f–%.2f)", s.ElectronsPerAtom, scheme, w.Low, w.High)
	}
	if o.CoolingRateKPerS > 0 {
		fmt.Fprintf(&b, "; runs weighted to cooling near %.1e K/s", o.CoolingRateKPerS)
	}
	switch o.Treatment {
	case AsSpunOnly:
		b.WriteString("; as-spun samples only")
	case AnnealedOnly:
		b.WriteString("; annealed samples only")
	}
	return b.String()
}

package suggest_test

import (
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"meltbook"
	"meltbook/analysis/internal/pyref"
	"meltbook/analysis/suggest"
)

func near(got, want, tol float64) bool { return math.Abs(got-want) <= tol }

func fraction(s suggest.Suggestion, el string) float64 {
	for _, f := range s.Composition {
		if f.Element == el {
			return f.Fraction
		}
	}
	return math.NaN()
}

// fixed returns the default options with a fixed prior p₀ = ½ and weight
// α = 1, so that expected values can be worked by hand.
func fixed() suggest.Options {
	o := suggest.DefaultOptions()
	o.Prior = 0.5
	o.PriorWeight = 1
	return o
}

func TestPredictOnePoint(t *testing.T) {
	// One quasicrystal at Al63Cu25Fe12; query Al61Cu27Fe12. By hand:
	// d² = ½(0.02² + 0.02²) = 0.0004, d = 0.02 = h, w = e^(−½) = 0.6065307;
	// a = 0.5 + w = 1.1065307, b = 0.5, n = 1.6065307;
	// p = a/n = 0.6887703; s = sqrt(a·b/(n²(n+1))) = 0.2867783.
	pts := []suggest.Point{{Code: "T-1", Composition: map[string]float64{"Al": 0.63, "Cu": 0.25, "Fe": 0.12}, Outcome: suggest.Quasicrystal}}
	p, err := suggest.Predict(pts, map[string]float64{"Al": 0.61, "Cu": 0.27, "Fe": 0.12}, fixed())
	if err != nil {
		t.Fatal(err)
	}
	const tol = 1e-6
	if !near(p.Probability, 0.6887703, tol) || !near(p.Uncertainty, 0.2867783, tol) || !near(p.EffectiveRuns, 0.6065307, tol) {
		t.Errorf("got p %.7f s %.7f n %.7f, want 0.6887703 0.2867783 0.6065307", p.Probability, p.Uncertainty, p.EffectiveRuns)
	}
	if p.Nearest != "T-1" || !near(p.NearestDistanceFraction, 0.02, 1e-12) || p.Neighbours != 1 {
		t.Errorf("nearest %s at %g, neighbours %d; want T-1 at 0.02, 1", p.Nearest, p.NearestDistanceFraction, p.Neighbours)
	}
}

func TestPredictFarFromDataIsPrior(t *testing.T) {
	// Far from every point the posterior is the prior Beta(α p₀, α(1−p₀)).
	// With α = 1, p₀ = 0.3 by hand: mean 0.3, s = sqrt(0.3·0.7/(1·2)) = 0.3240370.
	o := fixed()
	o.Prior = 0.3
	pts := []suggest.Point{{Code: "T-1", Composition: map[string]float64{"Al": 0.9, "Cu": 0.1}, Outcome: suggest.Quasicrystal}}
	p, err := suggest.Predict(pts, map[string]float64{"Al": 0.1, "Cu": 0.9}, o)
	if err != nil {
		t.Fatal(err)
	}
	if !near(p.Probability, 0.3, 1e-9) || !near(p.Uncertainty, 0.3240370, 1e-6) {
		t.Errorf("got %.7f ± %.7f, want 0.3 ± 0.3240370", p.Probability, p.Uncertainty)
	}
	if p.Neighbours != 0 {
		t.Errorf("neighbours %d, want 0", p.Neighbours)
	}
}

func TestPredictMatchesScipyBeta(t *testing.T) {
	// The posterior is Beta(a, b); scipy.stats.beta gives its mean and
	// standard deviation independently of this package. Points sit on the
	// query composition (w = 1), so a and b are counted by hand.
	cases := []struct {
		name  string
		prior float64
		alpha float64
		out   []suggest.Outcome
		a, b  float64 // by hand: α p₀ + Σ y, α(1−p₀) + Σ(1−y)
	}{
		{"two yes one no", 0.5, 1, []suggest.Outcome{suggest.Quasicrystal, suggest.Quasicrystal, suggest.NoQuasicrystal}, 2.5, 1.5},
		{"one ambiguous", 0.2, 2, []suggest.Outcome{suggest.Ambiguous}, 0.9, 2.1},
		{"five no", 0.4, 1, []suggest.Outcome{0, 0, 0, 0, 0}, 0.4, 5.6},
	}
	at := map[string]float64{"Zn": 0.6, "Mg": 0.3, "Y": 0.1}
	var script strings.Builder
	script.WriteString("from scipy.stats import beta\n")
	got := make([]suggest.Prediction, len(cases))
	for i, c := range cases {
		var pts []suggest.Point
		for j, o := range c.out {
			pts = append(pts, suggest.Point{Code: fmt.Sprintf("T-%d", j), Composition: at, Outcome: o})
		}
		opt := fixed()
		opt.Prior, opt.PriorWeight = c.prior, c.alpha
		p, err := suggest.Predict(pts, at, opt)
		if err != nil {
			t.Fatal(err)
		}
		got[i] = p
		fmt.Fprintf(&script, "d = beta(%g, %g); print(repr(d.mean()), repr(d.std()))\n", c.a, c.b)
	}
	out := strings.Fields(string(pyref.Run(t, []string{"scipy"}, script.String(), nil)))
	if len(out) != 2*len(cases) {
		t.Fatalf("scipy printed %q", out)
	}
	for i, c := range cases {
		var mean, sd float64
		fmt.Sscan(out[2*i], &mean)
		fmt.Sscan(out[2*i+1], &sd)
		if !near(got[i].Probability, mean, 1e-12) || !near(got[i].Uncertainty, sd, 1e-12) {
			t.Errorf("%s: got %.15g ± %.15g, scipy.stats.beta %.15g ± %.15g", c.name, got[i].Probability, got[i].Uncertainty, mean, sd)
		}
	}
}

// binary is an Al-Cu line: a quasicrystal at Cu 0.30 and none at Cu 0.34.
// On a binary line d = |Δx_Cu| because ½(δ² + δ²) = δ².
func binary() ([]suggest.Point, suggest.Options) {
	pts := []suggest.Point{
		{Code: "P", Composition: map[string]float64{"Al": 0.70, "Cu": 0.30}, Outcome: suggest.Quasicrystal},
		{Code: "N", Composition: map[string]float64{"Al": 0.66, "Cu": 0.34}, Outcome: suggest.NoQuasicrystal},
	}
	o := fixed()
	o.Elements = []string{"Al", "Cu"}
	o.Bounds = map[string]suggest.Range{"Al": {Low: 0.55, High: 0.75}, "Cu": {Low: 0.25, High: 0.45}}
	return pts, o
}

func TestSuggestExploitation(t *testing.T) {
	// κ = 0, h = 0.02, minimum distance 0.01, separation 0.02. By hand, with
	// w = exp(−(Δ/0.02)²/2):
	//   Cu 0.290: wP = e^−0.125 = 0.882497, wN = e^−3.125 = 0.043937,
	//             p = 1.382497/1.926434 = 0.717646 (the maximum; the grid
	//             points 0.295..0.305 lie within 0.01 of P and are dropped)
	//   Cu 0.285: p = 1.254840/1.777634 = 0.705904
	//   Cu 0.310: wP = 0.882497, wN = e^−1.125 = 0.324652, p = 0.626372
	//   Cu 0.270: wP = 0.324652, wN = e^−6.125 = 0.002187, p = 0.621516
	// so the first suggestion is Cu 0.29 and the second, at least 0.02 away,
	// Cu 0.31.
	pts, o := binary()
	o.Exploration = 0
	o.Count = 2
	res, err := suggest.Suggest(pts, o)
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Suggestions) != 2 {
		t.Fatalf("got %d suggestions, want 2", len(res.Suggestions))
	}
	want := []struct{ cu, p, s float64 }{
		{0.29, 0.717646, 0.263138}, // s = sqrt(a b/(n²(n+1))), a 1.382497, b 0.543937
		{0.31, 0.626372, 0.270132}, // a 1.382497, b 0.824652
	}
	for i, w := range want {
		s := res.Suggestions[i]
		if !near(fraction(s, "Cu"), w.cu, 1e-12) || !near(s.Probability, w.p, 1e-5) || !near(s.Uncertainty, w.s, 1e-5) || !near(s.Score, w.p, 1e-5) {
			t.Errorf("suggestion %d: Cu %g p %.6f s %.6f score %.6f; want Cu %g p %.6f s %.6f", i, fraction(s, "Cu"), s.Probability, s.Uncertainty, s.Score, w.cu, w.p, w.s)
		}
	}
	// Grid: Cu 0.25..0.45 in 0.005 steps is 41 points; within 0.01 of P:
	// 0.295, 0.300, 0.305; of N: 0.335, 0.340, 0.345 — six dropped.
	if res.GridPoints != 41 || res.ExcludedNear != 6 || res.ExcludedWindow != 0 {
		t.Errorf("grid %d, near %d, window %d; want 41, 6, 0", res.GridPoints, res.ExcludedNear, res.ExcludedWindow)
	}
	wantReason := "predicted quasicrystal probability 0.72 ± 0.26 from 1 neighbouring run within 4.0 at.%; nearest run P at 1.0 at.%"
	if got := res.Suggestions[0].Reason; got != wantReason {
		t.Errorf("reason\n got %q\nwant %q", got, wantReason)
	}
}

func TestSuggestExploration(t *testing.T) {
	// Two failures at Cu 0.30 and 0.32 on Cu 0.20..0.40, κ = 1, p₀ = ½:
	// moving away from both raises p towards ½ and s towards its prior value
	// sqrt(¼/2) = 0.353553, so the farthest grid point wins: Cu 0.20, 0.10
	// from the nearer failure. There wN = e^−12.5 + e^−18 ≈ 3.7e−6, score
	// 0.5 + 0.353553 − O(1e−6) = 0.853552 (hand). The next two, Cu 0.22 and
	// Cu 0.40, are mirror images (0.08 and 0.10 from the failures) and tie.
	pts := []suggest.Point{
		{Code: "N1", Composition: map[string]float64{"Al": 0.70, "Cu": 0.30}, Outcome: suggest.NoQuasicrystal},
		{Code: "N2", Composition: map[string]float64{"Al": 0.68, "Cu": 0.32}, Outcome: suggest.NoQuasicrystal},
	}
	o := fixed()
	o.Exploration = 1
	o.Count = 3
	o.Bounds = map[string]suggest.Range{"Al": {Low: 0.60, High: 0.80}, "Cu": {Low: 0.20, High: 0.40}}
	res, err := suggest.Suggest(pts, o)
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Suggestions) != 3 {
		t.Fatalf("got %d suggestions", len(res.Suggestions))
	}
	top := res.Suggestions[0]
	if !near(fraction(top, "Cu"), 0.20, 1e-12) || !near(top.Score, 0.853552, 2e-6) {
		t.Errorf("top: Cu %g score %.6f; want Cu 0.20 score 0.853552", fraction(top, "Cu"), top.Score)
	}
	if !strings.HasPrefix(top.Reason, "no runs within 4.0 at.%: exploring") {
		t.Errorf("reason %q should say it explores", top.Reason)
	}
	a, b := fraction(res.Suggestions[1], "Cu"), fraction(res.Suggestions[2], "Cu")
	if !(near(a, 0.22, 1e-12) && near(b, 0.40, 1e-12) || near(a, 0.40, 1e-12) && near(b, 0.22, 1e-12)) {
		t.Errorf("second and third Cu %g, %g; want 0.22 and 0.40 in either order", a, b)
	}
}

func TestSuggestWindowAndGrid(t *testing.T) {
	// Valences A 3, B 1, C 1 make e/a = 1 + 2·x_A; the window 2.0–3.0 keeps
	// x_A ≥ 0.5. On a 0.1 grid of the whole triangle there are C(12,2) = 66
	// points; those with x_A = 0.5..1.0 number 6+5+4+3+2+1 = 21, so 45 fall
	// outside the window. The one point, at x_A = 1, removes only itself
	// (minimum distance 0.01), leaving 20 candidates.
	pts := []suggest.Point{{Code: "T-1", Composition: map[string]float64{"Al": 1}, Outcome: suggest.NoQuasicrystal}}
	o := fixed()
	o.Elements = []string{"Al", "Cu", "Ag"}
	o.StepFraction = 0.1
	o.Bounds = map[string]suggest.Range{"Al": {0, 1}, "Cu": {0, 1}, "Ag": {0, 1}}
	o.Window = &suggest.Window{Low: 2.0, High: 3.0, Scheme: "test", Valences: map[string]float64{"Al": 3, "Cu": 1, "Ag": 1}}
	o.Count = 100
	o.SeparationFraction = 0
	res, err := suggest.Suggest(pts, o)
	if err != nil {
		t.Fatal(err)
	}
	if res.GridPoints != 66 || res.ExcludedWindow != 45 || res.ExcludedNear != 1 || len(res.Suggestions) != 20 {
		t.Errorf("grid %d, window %d, near %d, suggestions %d; want 66, 45, 1, 20", res.GridPoints, res.ExcludedWindow, res.ExcludedNear, len(res.Suggestions))
	}
	for _, s := range res.Suggestions {
		want := 1 + 2*fraction(s, "Al")
		if !near(s.ElectronsPerAtom, want, 1e-12) || s.ElectronsPerAtom < 2-1e-9 {
			t.Errorf("%v: e/a %g, want %g inside 2.0–3.0", s.Composition, s.ElectronsPerAtom, want)
		}
		if !strings.Contains(s.Reason, "(test, window 2.00–3.00)") {
			t.Errorf("reason %q lacks the window", s.Reason)
		}
	}
}

func TestGridCountQuaternary(t *testing.T) {
	// A 0.1 grid of a four-element simplex has C(13,3) = 286 points.
	pts := []suggest.Point{{Code: "T-1", Composition: map[string]float64{"Al": 0.6, "Cu": 0.25, "Fe": 0.1, "Si": 0.05}, Outcome: suggest.Quasicrystal}}
	o := fixed()
	o.StepFraction = 0.1
	o.Bounds = map[string]suggest.Range{"Al": {0, 1}, "Cu": {0, 1}, "Fe": {0, 1}, "Si": {0, 1}}
	res, err := suggest.Suggest(pts, o)
	if err != nil {
		t.Fatal(err)
	}
	if res.GridPoints != 286 {
		t.Errorf("grid %d, want 286", res.GridPoints)
	}
	if got := strings.Join(res.Elements, "-"); got != "Al-Cu-Fe-Si" {
		t.Errorf("elements %s, want Al-Cu-Fe-Si (by decreasing fraction)", got)
	}
}

func TestCoolingWeights(t *testing.T) {
	// Both points sit on the query (distance 0). Target 1e6 K/s, h_r = 0.5
	// decade: the yes at 1e6 K/s weighs 1, the no at 1e4 K/s weighs
	// exp(−(2/0.5)²/2) = e^−8 = 3.3546e−4. By hand a = 0.5 + 1 = 1.5,
	// b = 0.5 + 3.3546e−4, p = 1.5/2.0003355 = 0.7498742.
	at := map[string]float64{"Al": 0.7, "Pd": 0.2, "Mn": 0.1}
	pts := []suggest.Point{
		{Code: "F", Composition: at, CoolingRateKPerS: 1e6, Outcome: suggest.Quasicrystal},
		{Code: "S", Composition: at, CoolingRateKPerS: 1e4, Outcome: suggest.NoQuasicrystal},
	}
	o := fixed()
	o.CoolingRateKPerS = 1e6
	p, err := suggest.Predict(pts, at, o)
	if err != nil {
		t.Fatal(err)
	}
	if !near(p.Probability, 0.7498742, 1e-6) {
		t.Errorf("p %.7f, want 0.7498742", p.Probability)
	}
	// A point of unknown rate counts as one bandwidth away: w = e^−½ =
	// 0.6065307. With the no of unknown rate: b = 0.5 + 0.6065307,
	// p = 1.5/2.6065307 = 0.5754770.
	pts[1].CoolingRateKPerS = 0
	p, err = suggest.Predict(pts, at, o)
	if err != nil {
		t.Fatal(err)
	}
	if !near(p.Probability, 0.5754770, 1e-6) {
		t.Errorf("unknown rate: p %.7f, want 0.5754770", p.Probability)
	}
}

func TestTreatmentAndLaplacePrior(t *testing.T) {
	// Three yes, one no, one ambiguous: Σy = 3.5 over 5 points, Laplace
	// p₀ = (3.5 + 1)/(5 + 2) = 0.6428571. As-spun only, the two annealed
	// yes drop out: Σy = 1.5 over 3, p₀ = 2.5/5 = 0.5.
	at := map[string]float64{"Zn": 0.6, "Mg": 0.3, "Y": 0.1}
	far := map[string]float64{"Zn": 0.3, "Mg": 0.6, "Y": 0.1}
	pts := []suggest.Point{
		{Code: "A", Composition: far, Outcome: suggest.Quasicrystal},
		{Code: "B", Composition: far, Outcome: suggest.Quasicrystal, Annealed: true},
		{Code: "C", Composition: far, Outcome: suggest.Quasicrystal, Annealed: true},
		{Code: "D", Composition: far, Outcome: suggest.NoQuasicrystal},
		{Code: "E", Composition: far, Outcome: suggest.Ambiguous},
	}
	o := suggest.DefaultOptions()
	o.Bounds = map[string]suggest.Range{"Zn": {0.5, 0.7}, "Mg": {0.2, 0.4}, "Y": {0.05, 0.15}}
	res, err := suggest.Suggest(pts, o)
	if err != nil {
		t.Fatal(err)
	}
	if !near(res.Prior, 0.6428571, 1e-6) || res.PointsUsed != 5 {
		t.Errorf("prior %.7f from %d points, want 0.6428571 from 5", res.Prior, res.PointsUsed)
	}
	o.Treatment = suggest.AsSpunOnly
	res, err = suggest.Suggest(pts, o)
	if err != nil {
		t.Fatal(err)
	}
	if !near(res.Prior, 0.5, 1e-12) || res.PointsUsed != 3 {
		t.Errorf("as-spun: prior %g from %d points, want 0.5 from 3", res.Prior, res.PointsUsed)
	}
	// Far from every point (d = 0.3) the estimate is the prior.
	p, err := suggest.Predict(pts, at, o)
	if err != nil {
		t.Fatal(err)
	}
	if !near(p.Probability, 0.5, 1e-9) || p.Nearest != "A" {
		t.Errorf("p %g nearest %s, want 0.5 and A", p.Probability, p.Nearest)
	}
}

func TestSuggestionsKeepApartAndAwayFromRuns(t *testing.T) {
	pts := demoPoints(60, 7)
	o := suggest.DefaultOptions()
	o.Count = 8
	res, err := suggest.Suggest(pts, o)
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Suggestions) != 8 {
		t.Fatalf("got %d suggestions", len(res.Suggestions))
	}
	vec := func(s suggest.Suggestion) map[string]float64 {
		m := map[string]float64{}
		for _, f := range s.Composition {
			m[f.Element] = f.Fraction
		}
		return m
	}
	for i, s := range res.Suggestions {
		var sum float64
		for _, f := range s.Composition {
			sum += f.Fraction
		}
		if !near(sum, 1, 1e-9) {
			t.Errorf("suggestion %d sums to %g", i, sum)
		}
		if i > 0 && s.Score > res.Suggestions[i-1].Score {
			t.Errorf("suggestion %d scores above the one before", i)
		}
		for _, p := range pts {
			if d := dist(vec(s), p.Composition); d < o.MinDistanceFraction-1e-9 {
				t.Errorf("suggestion %d is %g from run %s", i, d, p.Code)
			}
		}
		for j := range i {
			if d := dist(vec(s), vec(res.Suggestions[j])); d < o.SeparationFraction-1e-9 {
				t.Errorf("suggestions %d and %d are %g apart", j, i, d)
			}
		}
	}
	again, err := suggest.Suggest(pts, o)
	if err != nil {
		t.Fatal(err)
	}
	a, _ := json.Marshal(res)
	b, _ := json.Marshal(again)
	if string(a) != string(b) {
		t.Error("two calls on the same input differ")
	}
}

// dist is the package's documented distance, sqrt(½ Σ Δ²), written out again.
func dist(a, b map[string]float64) float64 {
	var s float64
	for _, e := range []string{"Al", "Cu", "Fe"} {
		s += (a[e] - b[e]) * (a[e] - b[e])
	}
	return math.Sqrt(s / 2)
}

// demoPoints scatters n Al-Cu-Fe runs around Al63Cu25Fe12, yes within 3
// at.% of it.
func demoPoints(n int, seed uint64) []suggest.Point {
	r := rand.New(rand.NewPCG(seed, 1))
	pts := make([]suggest.Point, n)
	for i := range pts {
		cu := 0.25 + 0.04*r.NormFloat64()
		fe := 0.12 + 0.03*r.NormFloat64()
		c := map[string]float64{"Al": 1 - cu - fe, "Cu": cu, "Fe": fe}
		out := suggest.NoQuasicrystal
		if dist(c, map[string]float64{"Al": 0.63, "Cu": 0.25, "Fe": 0.12}) < 0.03 {
			out = suggest.Quasicrystal
		}
		pts[i] = suggest.Point{Code: fmt.Sprintf("D-%03d", i), Composition: c, Outcome: out, CoolingRateKPerS: 1e5 * (1 + 9*r.Float64())}
	}
	return pts
}

func TestExploitationFindsTheYesRegion(t *testing.T) {
	// The yes region of demoPoints is a disc of radius 0.03 around
	// Al63Cu25Fe12; with κ = 0 the best suggestion must lie in it.
	o := suggest.DefaultOptions()
	o.Exploration = 0
	o.MinDistanceFraction = 0.005
	res, err := suggest.Suggest(demoPoints(60, 3), o)
	if err != nil {
		t.Fatal(err)
	}
	c := map[string]float64{}
	for _, f := range res.Suggestions[0].Composition {
		c[f.Element] = f.Fraction
	}
	if d := dist(c, map[string]float64{"Al": 0.63, "Cu": 0.25, "Fe": 0.12}); d > 0.03 {
		t.Errorf("best suggestion %v is %g from the yes region's centre", c, d)
	}
	if res.Suggestions[0].Probability < 0.6 {
		t.Errorf("best probability %g; runs around it are yes", res.Suggestions[0].Probability)
	}
}

func TestErrors(t *testing.T) {
	ok := []suggest.Point{{Code: "T-1", Composition: map[string]float64{"Al": 0.7, "Cu": 0.3}}}
	cases := []struct {
		name   string
		points []suggest.Point
		edit   func(*suggest.Options)
		want   string // a fragment naming what and where
	}{
		{"no points", nil, nil, "points: no points"},
		{"no code", []suggest.Point{{Composition: map[string]float64{"Al": 0.5, "Cu": 0.5}}}, nil, "points[0].code"},
		{"bad sum", []suggest.Point{ok[0], {Code: "Q-9", Composition: map[string]float64{"Al": 0.7, "Cu": 0.2}}}, nil, "points[1] (Q-9).composition: fractions sum to 0.9"},
		{"foreign element", ok, func(o *suggest.Options) { o.Elements = []string{"Al", "Fe"} }, "points[0] (T-1).composition: Cu is not an element of the system Al-Fe"},
		{"negative", []suggest.Point{{Code: "N", Composition: map[string]float64{"Al": 1.1, "Cu": -0.1}}}, nil, "(N).composition"},
		{"outcome", []suggest.Point{{Code: "O", Composition: map[string]float64{"Al": 0.5, "Cu": 0.5}, Outcome: 7}}, nil, "points[0] (O).outcome"},
		{"rate", []suggest.Point{{Code: "R", Composition: map[string]float64{"Al": 0.5, "Cu": 0.5}, CoolingRateKPerS: -1}}, nil, "(R).cooling-rate"},
		{"step", ok, func(o *suggest.Options) { o.StepFraction = 0.003 }, "options.step: 1/0.003 is not a whole number"},
		{"zero step", ok, func(o *suggest.Options) { o.StepFraction = 0 }, "options.step"},
		{"bandwidth", ok, func(o *suggest.Options) { o.BandwidthFraction = 0 }, "options.bandwidth"},
		{"prior", ok, func(o *suggest.Options) { o.Prior = 1 }, "options.prior"},
		{"count", ok, func(o *suggest.Options) { o.Count = 0 }, "options.count"},
		{"kappa", ok, func(o *suggest.Options) { o.Exploration = -1 }, "options.exploration"},
		{"valence", ok, func(o *suggest.Options) {
			o.Window = &suggest.Window{Low: 1.7, High: 1.8, Scheme: "raynor", Valences: map[string]float64{"Al": 3}}
		}, `options.window: no valence for Cu in scheme "raynor"`},
		{"scheme mismatch", []suggest.Point{{Code: "M", Composition: map[string]float64{"Al": 0.7, "Cu": 0.3}, ElectronsPerAtom: 2.0}}, func(o *suggest.Options) {
			// 0.7·3 + 0.3·1 = 2.4 under these valences, not 2.0.
			o.Window = &suggest.Window{Low: 1.7, High: 2.5, Scheme: "raynor", Valences: map[string]float64{"Al": 3, "Cu": 1}}
		}, "points[0] (M).e/a: given 2.000 but the composition gives 2.400"},
		{"bounds element", ok, func(o *suggest.Options) { o.Bounds = map[string]suggest.Range{"Si": {0, 0.1}} }, "options.bounds.Si"},
		{"bounds empty", ok, func(o *suggest.Options) {
			o.Bounds = map[string]suggest.Range{"Al": {0.1, 0.2}, "Cu": {0.1, 0.2}}
		}, "options.bounds: the bounds admit no composition"},
		{"too big", ok, func(o *suggest.Options) { o.MaxGridPoints = 10 }, "more than 10 grid points"},
	}
	for _, c := range cases {
		o := suggest.DefaultOptions()
		if c.edit != nil {
			c.edit(&o)
		}
		_, err := suggest.Suggest(c.points, o)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want it to contain %q", c.name, err, c.want)
			continue
		}
		if meltbook.KindOf(err) != meltbook.Invalid {
			t.Errorf("%s: kind %q, want invalid", c.name, meltbook.KindOf(err))
		}
	}
}

func BenchmarkSuggestTernary(b *testing.B) {
	// 150 Al-Cu-Fe runs, default options: a 0.5 at.% grid over the runs'
	// range plus 5 at.%.
	pts := demoPoints(150, 11)
	o := suggest.DefaultOptions()
	o.Window = &suggest.Window{Low: 1.70, High: 1.85, Scheme: "raynor", Valences: map[string]float64{"Al": 3, "Cu": 1, "Fe": -2.66}}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := suggest.Suggest(pts, o); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkSuggestQuaternary(b *testing.B) {
	// 150 Al-Cu-Fe-Si runs with Si 0-6 at.%, default options.
	r := rand.New(rand.NewPCG(5, 5))
	pts := make([]suggest.Point, 150)
	for i := range pts {
		cu, fe, si := 0.25+0.02*r.NormFloat64(), 0.12+0.015*r.NormFloat64(), 0.06*r.Float64()
		pts[i] = suggest.Point{Code: fmt.Sprintf("B-%d", i), Composition: map[string]float64{"Al": 1 - cu - fe - si, "Cu": cu, "Fe": fe, "Si": si}, Outcome: suggest.Outcome(i % 3)}
	}
	o := suggest.DefaultOptions()
	b.ReportAllocs()
	for b.Loop() {
		if _, err := suggest.Suggest(pts, o); err != nil {
			b.Fatal(err)
		}
	}
}

package web_test

import (
	"context"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/input"
	"github.com/chromedp/chromedp"

	"meltbook"
	"meltbook/store"
)

// TestBrowserDemo drives the demonstration notebook's pages in a real
// headless Chromium: the map's markers against the store's own records,
// a marker opening its run, logging a melt from the form, uploading a scan
// and confirming its proposal, and zooming a demo scan.
func TestBrowserDemo(t *testing.T) {
	st, _, scans := demoStore(t)
	ctx, base, problems := browserSession(t, st)
	step := func(name string, f func(t *testing.T, ctx context.Context)) {
		t.Run(name, func(t *testing.T) {
			sctx, cancel := context.WithTimeout(ctx, 40*time.Second)
			defer cancel()
			f(t, sctx)
		})
	}
	step("map markers per outcome", func(t *testing.T, ctx context.Context) { demoMapMarkers(t, ctx, base, st) })
	step("a marker opens its run", func(t *testing.T, ctx context.Context) { demoMarkerOpensRun(t, ctx, base) })
	step("log form", func(t *testing.T, ctx context.Context) { demoLogForm(t, ctx, base, st) })
	step("scan upload and proposal", func(t *testing.T, ctx context.Context) {
		sc, sample, melt := icosahedralScan(t, st, scans)
		path := filepath.Join(t.TempDir(), "ribbon-xrd.xy")
		if err := os.WriteFile(path, sc.Data, 0o644); err != nil {
			t.Fatal(err)
		}
		demoUpload(t, ctx, base, st, path, sample, melt)
	})
	step("pattern zoom", func(t *testing.T, ctx context.Context) { demoZoom(t, ctx, base, st) })
	// A refused form answers 422, which the browser logs as a failed load;
	// that one was meant.
	var unexpected []string
	for _, p := range problems() {
		if !strings.Contains(p, "status of 422") {
			unexpected = append(unexpected, p)
		}
	}
	if len(unexpected) > 0 {
		t.Errorf("the browser reported errors: %v", unexpected)
	}
}

// mapClass sorts a sample's outcomes as the README and the map's legend
// describe it, written here apart from the page's code: only a person's
// outcomes and confirmed proposals count, and the first of icosahedral,
// decagonal, approximant, amorphous, crystalline found wins; none is
// "undecided".
func mapClass(os []meltbook.Outcome) string {
	found := map[meltbook.PhaseKind]bool{}
	for _, o := range os {
		if o.Source == meltbook.ByPerson || o.Status == meltbook.Confirmed {
			found[o.Kind] = true
		}
	}
	for _, k := range []meltbook.PhaseKind{meltbook.Icosahedral, meltbook.Decagonal, meltbook.Approximant, meltbook.Amorphous, meltbook.Crystalline} {
		if found[k] {
			return string(k)
		}
	}
	return "undecided"
}

func demoMapMarkers(t *testing.T, ctx context.Context, base string, st *store.Store) {
	// What the store holds: every sample whose composition (measured, else
	// nominal) has at most 5 at.% outside Al, Cu and Fe, by class.
	samples, err := st.MapSamples(ctx)
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]int{}
	for _, m := range samples {
		var in, all float64
		for _, ef := range m.Composition {
			all += ef.Fraction
			if ef.Element == "Al" || ef.Element == "Cu" || ef.Element == "Fe" {
				in += ef.Fraction
			}
		}
		if in > 0 && all-in <= 0.05*all+1e-12 {
			want[mapClass(m.Outcomes)]++
		}
	}
	if want["icosahedral"] == 0 || want["crystalline"] == 0 {
		t.Fatalf("the demo's Al-Cu-Fe samples by class %v: want icosahedral and crystalline ones", want)
	}
	if err := chromedp.Do(ctx, chromedp.Navigate(base+"/map?a=Al&b=Cu&c=Fe"), chromedp.WaitVisible(chromedp.CSS(".marks"))); err != nil {
		t.Fatal(err)
	}
	got := must(t, ctx, chromedp.Evaluate[map[string]int](`Object.fromEntries(
		[...document.querySelectorAll('.figure-frame .marks > g')].map(g => [g.dataset.o, g.querySelectorAll('use').length]).filter(e => e[1] > 0))`))
	if fmt.Sprint(got) != fmt.Sprint(want) {
		t.Errorf("markers per outcome on the demo map: %v, want %v from the store", got, want)
	}
}

func demoMarkerOpensRun(t *testing.T, ctx context.Context, base string) {
	if err := chromedp.Do(ctx, chromedp.Navigate(base+"/map?a=Al&b=Cu&c=Fe"), chromedp.WaitVisible(chromedp.CSS(".marks"))); err != nil {
		t.Fatal(err)
	}
	// The marker on top at the centre of an icosahedral one: markers may
	// overlap, and a click opens the one the pointer is over.
	type hit struct {
		X, Y float64
		Code string
	}
	h := must(t, ctx, chromedp.Evaluate[hit](`(() => {
		const m = document.querySelector('.marks g[data-o="icosahedral"] use');
		m.scrollIntoView({block: 'center'});
		const b = m.getBoundingClientRect();
		const x = b.x + b.width / 2, y = b.y + b.height / 2;
		const top = document.elementFromPoint(x, y).closest('use');
		return {X: x, Y: y, Code: top ? top.dataset.c : ''};
	})()`))
	if h.Code == "" {
		t.Fatal("no marker under the pointer")
	}
	if err := chromedp.Do(ctx, chromedp.MouseEvent(input.DispatchMouseEventTypeMouseMoved, h.X, h.Y)); err != nil {
		t.Fatal(err)
	}
	res, err := chromedp.RunResponse(ctx, chromedp.MouseClickXY(h.X, h.Y))
	if err != nil {
		t.Fatal(err)
	}
	if res.Status != 200 || !strings.HasSuffix(res.URL, "/runs/"+h.Code) {
		t.Errorf("click on %s opened %s (%d)", h.Code, res.URL, res.Status)
	}
	melt := h.Code
	if i := strings.Index(melt, "."); i > 0 {
		melt = melt[:i]
	}
	if h1 := must(t, ctx, chromedp.Text(chromedp.CSS("h1"))); h1 != "Melt "+melt {
		t.Errorf("run page heading %q, want Melt %s", h1, melt)
	}
}

func demoLogForm(t *testing.T, ctx context.Context, base string, st *store.Store) {
	next, err := st.NextMeltCode(ctx, "QR")
	if err != nil {
		t.Fatal(err)
	}
	fill := func(values map[string]string) []chromedp.Action[chromedp.Void] {
		var out []chromedp.Action[chromedp.Void]
		for k, v := range values {
			out = append(out, chromedp.SetValue(chromedp.CSS(`form.log-form [name="`+k+`"]`), v))
		}
		return out
	}
	typed := map[string]string{"prefix": "QR", "composition": "Al62.5Cu25Fe12.5", "mass": "10 g", "operator": "T. Ingram",
		"wheel-speed": "35 m/s", "melt-temperature": "1250 C", "thickness": "-28 um", "notes": "browser test run"}
	if err := chromedp.Do(ctx, append([]chromedp.Action[chromedp.Void]{chromedp.Navigate(base + "/log"), chromedp.WaitVisible(chromedp.CSS("form.log-form"))}, fill(typed)...)...); err != nil {
		t.Fatal(err)
	}
	res, err := chromedp.RunResponse(ctx, chromedp.Click(chromedp.CSS(`form.log-form button[type="submit"]`)))
	if err != nil {
		t.Fatal(err)
	}
	if res.Status != 422 {
		t.Fatalf("a negative thickness: %d, want 422", res.Status)
	}
	msg := must(t, ctx, chromedp.Text(chromedp.CSS("#l-thickness-error")))
	kept := must(t, ctx, chromedp.Value(chromedp.CSS(`#l-notes`)))
	if !strings.Contains(msg, "a length cannot be negative") || kept != "browser test run" {
		t.Errorf("refused form: thickness message %q, notes kept %q", msg, kept)
	}
	if err := chromedp.Do(ctx, fill(map[string]string{"thickness": "28 um"})...); err != nil {
		t.Fatal(err)
	}
	res, err = chromedp.RunResponse(ctx, chromedp.Click(chromedp.CSS(`form.log-form button[type="submit"]`)))
	if err != nil {
		t.Fatal(err)
	}
	if res.Status != 200 || !strings.Contains(res.URL, "/runs/"+next) {
		t.Fatalf("logging opened %s (%d), want /runs/%s", res.URL, res.Status, next)
	}
	if err := chromedp.Do(ctx, chromedp.Navigate(base+"/runs?sort=code&desc=1"), chromedp.WaitVisible(chromedp.CSS("table.runs"))); err != nil {
		t.Fatal(err)
	}
	first := must(t, ctx, chromedp.Text(chromedp.CSS("table.runs tbody tr td a")))
	if first != next {
		t.Errorf("the run table sorted by code, last first, starts with %q, want %s", first, next)
	}
}

func demoUpload(t *testing.T, ctx context.Context, base string, st *store.Store, file, sample, melt string) {
	form := `details.scan-form form:has(input[name="sample"][value="` + sample + `"])`
	if err := chromedp.Do(ctx,
		chromedp.Navigate(base+"/runs/"+melt),
		chromedp.Click(chromedp.CSS(`#s-`+cssEscape(sample)+` details.scan-form summary`)),
		chromedp.WaitVisible(chromedp.CSS(form+` input[type="file"]`)),
		chromedp.SetUploadFiles(chromedp.CSS(form+` input[type="file"]`), []string{file}),
		chromedp.SetValue(chromedp.CSS(form+` input[name="radiation"]`), "Cu"),
	); err != nil {
		t.Fatal(err)
	}
	res, err := chromedp.RunResponse(ctx, chromedp.Click(chromedp.CSS(form+` button[type="submit"]`)))
	if err != nil {
		t.Fatal(err)
	}
	m := regexp.MustCompile(`/scans/(\d+)`).FindStringSubmatch(res.URL)
	if res.Status != 200 || m == nil {
		t.Fatalf("upload opened %s (%d), want the new scan", res.URL, res.Status)
	}
	proposal := must(t, ctx, chromedp.Text(chromedp.CSS("#proposals + ul.outcome-list li")))
	if !strings.Contains(proposal, "icosahedral") || !strings.Contains(proposal, "proposed") {
		t.Fatalf("the new scan shows %q, want an icosahedral proposal", proposal)
	}
	res, err = chromedp.RunResponse(ctx, chromedp.Click(chromedp.CSS(`#proposals + ul.outcome-list li form.decide button[value="confirm"]`)))
	if err != nil {
		t.Fatal(err)
	}
	if res.Status != 200 || !strings.Contains(res.URL, "/scans/"+m[1]) {
		t.Errorf("confirming went to %s (%d)", res.URL, res.Status)
	}
	rec, err := st.MeltRecord(ctx, melt)
	if err != nil {
		t.Fatal(err)
	}
	confirmed := false
	for _, sr := range rec.Samples {
		for _, o := range sr.Outcomes {
			confirmed = confirmed || sr.Code == sample && o.Kind == meltbook.Icosahedral && o.Status == meltbook.Confirmed
		}
	}
	if !confirmed {
		t.Error("confirming in the browser recorded no outcome")
	}
	if got := must(t, ctx, chromedp.Evaluate[int](`document.querySelectorAll('#proposals + ul.outcome-list form.decide').length`)); got != 0 {
		t.Errorf("%d proposals still await a decision after confirming the only one", got)
	}
}

// cssEscape escapes the dots of a sample code for an id selector.
func cssEscape(s string) string { return strings.ReplaceAll(s, ".", `\.`) }

func demoZoom(t *testing.T, ctx context.Context, base string, st *store.Store) {
	scans, err := st.MeltScans(ctx, demoMeltWithScan(t, st))
	if err != nil || len(scans) == 0 {
		t.Fatalf("no demo scan: %v", err)
	}
	sc := scans[0]
	if err := chromedp.Do(ctx, chromedp.Navigate(base+"/scans/"+strconv.FormatInt(sc.ID, 10)), chromedp.WaitVisible(chromedp.CSS("svg.pattern"))); err != nil {
		t.Fatal(err)
	}
	lo, span := visibleRange(t, ctx)
	if math.Abs(lo-sc.FromDeg) > 1e-6 || math.Abs(lo+span-sc.ToDeg) > 1e-6 {
		t.Fatalf("a fresh page shows 2θ %g + %g, want the whole scan %g to %g", lo, span, sc.FromDeg, sc.ToDeg)
	}
	if err := chromedp.Do(ctx, chromedp.Click(chromedp.CSS(`button[data-zoom="in"]`))); err != nil {
		t.Fatal(err)
	}
	lo2, span2 := visibleRange(t, ctx)
	mid := (sc.FromDeg + sc.ToDeg) / 2
	if math.Abs(span2-span/2) > 1e-6 || math.Abs(lo2+span2/2-mid) > 1e-6 {
		t.Errorf("zoom in: %g + %g, want half the range about %g", lo2, span2, mid)
	}
	readout := must(t, ctx, chromedp.Text(chromedp.CSS(".twotheta-range")))
	if want := fmt.Sprintf("2θ %.2f° to %.2f°", lo2, lo2+span2); readout != want {
		t.Errorf("range readout %q, want %q", readout, want)
	}
	if err := chromedp.Do(ctx, chromedp.Click(chromedp.CSS(`button[data-zoom="reset"]`))); err != nil {
		t.Fatal(err)
	}
	if lo3, span3 := visibleRange(t, ctx); math.Abs(lo3-lo) > 1e-6 || math.Abs(span3-span) > 1e-6 {
		t.Errorf("whole scan again: %g + %g", lo3, span3)
	}
}

// demoMeltWithScan returns the first melt of the demo with a scan.
func demoMeltWithScan(t *testing.T, st *store.Store) string {
	t.Helper()
	found, _, err := st.FindMelts(context.Background(), meltbook.MeltFilter{Sort: meltbook.SortCode})
	if err != nil {
		t.Fatal(err)
	}
	for _, m := range found {
		if scans, err := st.MeltScans(context.Background(), m.Code); err == nil && len(scans) > 0 {
			return m.Code
		}
	}
	t.Fatal("the demo has no scan")
	return ""
}

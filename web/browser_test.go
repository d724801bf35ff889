package web_test

import (
	"bytes"
	"context"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/browser"
	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/input"
	cdplog "github.com/chromedp/cdproto/log"
	"github.com/chromedp/cdproto/runtime"
	"github.com/chromedp/chromedp"

	"meltbook/web"
)

// chromiumPath finds Debian's Chromium. Without one the browser tests are
// skipped, except under CI=true, where CI installs it and its absence is a
// failure.
func chromiumPath(t *testing.T) string {
	t.Helper()
	for _, name := range []string{"/usr/bin/chromium", "chromium", "chromium-browser"} {
		if p, err := exec.LookPath(name); err == nil {
			return p
		}
	}
	if os.Getenv("CI") == "true" {
		t.Fatal("CI=true but no Chromium is installed (apt-get install chromium)")
	}
	t.Skip("no Chromium found; install Debian's chromium (apt-get install chromium) to run the browser tests")
	return ""
}

// browserSession starts the server on a free loopback port and a headless
// Chromium with its own profile. Every wait in the test is bounded by the
// context's deadline.
func browserSession(t *testing.T, nb web.Notebook) (ctx context.Context, base string, problems func() []string) {
	t.Helper()
	path := chromiumPath(t)
	s := newServer(t, nb)
	u, err := s.Listen("127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() {
		ctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
		defer cancel()
		s.Shutdown(ctx)
	})
	alloc, cancelAlloc := chromedp.NewExecAllocator(context.Background(),
		chromedp.ExecPath(path),
		chromedp.Headless,
		chromedp.NoSandbox,
		chromedp.DisableGPU,
		chromedp.NoFirstRun,
		chromedp.Flag("disable-quic", true),
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true),
		chromedp.Flag("disable-dev-shm-usage", true),
		chromedp.UserDataDir(t.TempDir()),
		chromedp.WindowSize(1400, 1100),
	)
	tab, cancelTab := chromedp.NewContext(alloc)
	ctx, cancelTimeout := context.WithTimeout(tab, 90*time.Second)
	t.Cleanup(func() { cancelTimeout(); cancelTab(); cancelAlloc() })

	// Collect console errors, CSP refusals and uncaught exceptions.
	var mu sync.Mutex
	var seen []string
	watch, stopWatching := context.WithCancel(ctx)
	t.Cleanup(stopWatching)
	entries := chromedp.Events(watch, cdplog.EntryAdded)
	exceptions := chromedp.Events(watch, runtime.ExceptionThrown)
	if _, err := chromedp.Call(ctx, cdplog.Enable, cdp.Empty{}); err != nil {
		t.Fatalf("start the browser: %v", err)
	}
	if _, err := chromedp.Call(ctx, runtime.Enable, cdp.Empty{}); err != nil {
		t.Fatal(err)
	}
	go func() {
		for ev, err := range entries {
			if err != nil {
				return
			}
			if ev.Entry != nil && (ev.Entry.Level == cdplog.EntryLevelError || strings.Contains(ev.Entry.Text, "Content Security Policy")) {
				mu.Lock()
				seen = append(seen, fmt.Sprintf("%s: %s (%s)", ev.Entry.Level, ev.Entry.Text, ev.Entry.URL))
				mu.Unlock()
			}
		}
	}()
	go func() {
		for ev, err := range exceptions {
			if err != nil {
				return
			}
			mu.Lock()
			seen = append(seen, "exception: "+ev.ExceptionDetails.Text)
			mu.Unlock()
		}
	}()
	return ctx, strings.TrimSuffix(u, "/"), func() []string {
		mu.Lock()
		defer mu.Unlock()
		return append([]string(nil), seen...)
	}
}

type rect struct{ X, Y, Width, Height float64 }

func (r rect) centre() (float64, float64) { return r.X + r.Width/2, r.Y + r.Height/2 }

func must[T any](t *testing.T, ctx context.Context, a chromedp.Action[T]) T {
	t.Helper()
	v, err := chromedp.Run(ctx, a)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

// TestBrowser drives the pages in a real headless Chromium, one browser for
// all parts.
func TestBrowser(t *testing.T) {
	ctx, base, problems := browserSession(t, mapSamples())
	t.Run("map markers, hover and click", func(t *testing.T) { mapMarkersHoverAndClick(t, ctx, base) })
	t.Run("map PNG download", func(t *testing.T) { mapDownloadsPNG(t, ctx, base) })
	t.Run("pattern zoom and pan", func(t *testing.T) { patternZoomAndPan(t, ctx, base) })
	if p := problems(); len(p) > 0 {
		t.Errorf("the browser reported errors: %v", p)
	}
}

func mapMarkersHoverAndClick(t *testing.T, ctx context.Context, base string) {
	if err := chromedp.Do(ctx, chromedp.Navigate(base+"/map?a=Al&b=Cu&c=Fe"), chromedp.WaitVisible(chromedp.CSS(".marks"))); err != nil {
		t.Fatal(err)
	}
	got := must(t, ctx, chromedp.Evaluate[map[string]int](`Object.fromEntries(
		[...document.querySelectorAll('.figure-frame .marks > g')].map(g => [g.dataset.o, g.querySelectorAll('use').length]))`))
	want := map[string]int{"icosahedral": 2, "crystalline": 1, "approximant": 1, "undecided": 2}
	if fmt.Sprint(got) != fmt.Sprint(want) {
		t.Errorf("markers per outcome in the browser: %v, want %v", got, want)
	}

	// ZR-6 (Al70Cu20Fe10) stands apart from the others.
	r := must(t, ctx, chromedp.Evaluate[rect](`(() => {
		const m = document.querySelector('use[data-c="ZR-6"]');
		m.scrollIntoView({block: 'center'});
		const b = m.getBoundingClientRect();
		return {X: b.x, Y: b.y, Width: b.width, Height: b.height};
	})()`))
	x, y := r.centre()
	if err := chromedp.Do(ctx, chromedp.MouseEvent(input.DispatchMouseEventTypeMouseMoved, x, y)); err != nil {
		t.Fatal(err)
	}
	tip := must(t, ctx, chromedp.Poll[string](`(() => { const t = document.querySelector('.tip'); return !t.hidden && t.innerText; })()`, chromedp.WithPollingTimeout(10*time.Second)))
	// e/a of Al70Cu20Fe10 under Raynor: 3·0.70 + 0.20 − 2.66·0.10 = 2.034.
	for _, want := range []string{"ZR-6", "Al70 Cu20 Fe10", "e/a 2.034", "no outcome yet"} {
		if !strings.Contains(tip, want) {
			t.Errorf("hover text %q lacks %q", tip, want)
		}
	}

	res, err := chromedp.RunResponse(ctx, chromedp.MouseClickXY(x, y))
	if err != nil {
		t.Fatal(err)
	}
	if res.Status != 200 || !strings.HasSuffix(res.URL, "/runs/ZR-6") {
		t.Errorf("click opened %s (%d), want /runs/ZR-6", res.URL, res.Status)
	}
	if h1 := must(t, ctx, chromedp.Text(chromedp.CSS("h1"))); h1 != "Melt ZR-6" {
		t.Errorf("run page heading %q", h1)
	}
}

func mapDownloadsPNG(t *testing.T, ctx context.Context, base string) {
	dir := t.TempDir()
	if _, err := chromedp.CallBrowser(ctx, browser.SetDownloadBehavior, browser.SetDownloadBehaviorParams{
		Behavior: browser.SetDownloadBehaviorBehaviorAllowAndName, DownloadPath: dir,
	}); err != nil {
		t.Fatal(err)
	}
	if err := chromedp.Do(ctx,
		chromedp.Navigate(base+"/map?a=Al&b=Cu&c=Fe"),
		chromedp.WaitVisible(chromedp.CSS(".marks")),
		chromedp.Click(chromedp.CSS(`button[data-png="map"]`)),
	); err != nil {
		t.Fatal(err)
	}
	var png []byte
	for deadline := time.Now().Add(20 * time.Second); time.Now().Before(deadline) && png == nil; time.Sleep(200 * time.Millisecond) {
		files, _ := filepath.Glob(filepath.Join(dir, "*"))
		for _, f := range files {
			if strings.HasSuffix(f, ".crdownload") {
				continue
			}
			if b, err := os.ReadFile(f); err == nil && len(b) > 0 {
				png = b
			}
		}
	}
	// PNG signature (ISO/IEC 15948, section 5.2).
	if !bytes.HasPrefix(png, []byte("\x89PNG\r\n\x1a\n")) {
		t.Fatalf("no PNG was saved (%d bytes)", len(png))
	}
	// Width and height from the IHDR chunk: the 760 × 612 map drawn at twice
	// its size.
	w, h := be32(png[16:20]), be32(png[20:24])
	if w != 1520 || h != 1224 {
		t.Errorf("PNG is %d × %d, want 1520 × 1224", w, h)
	}
}

func be32(b []byte) int { return int(b[0])<<24 | int(b[1])<<16 | int(b[2])<<8 | int(b[3]) }

// visibleRange reads the 2θ range the pattern shows, from its viewBox.
func visibleRange(t *testing.T, ctx context.Context) (lo, span float64) {
	t.Helper()
	vb := must(t, ctx, chromedp.Evaluate[string](`document.querySelector('svg.pattern .plot-area').getAttribute('viewBox')`))
	f := strings.Fields(vb)
	if len(f) != 4 {
		t.Fatalf("viewBox %q", vb)
	}
	lo, _ = strconv.ParseFloat(f[0], 64)
	span, _ = strconv.ParseFloat(f[2], 64)
	return lo, span
}

func patternZoomAndPan(t *testing.T, ctx context.Context, base string) {
	if err := chromedp.Do(ctx, chromedp.Navigate(base+"/scans/1"), chromedp.WaitVisible(chromedp.CSS("svg.pattern"))); err != nil {
		t.Fatal(err)
	}
	near := func(a, b float64) bool { return math.Abs(a-b) < 1e-6 }
	if lo, span := visibleRange(t, ctx); !near(lo, 20) || !near(span, 60) {
		t.Fatalf("initial 2θ range %g + %g, want 20 + 60", lo, span)
	}

	// The + button halves the range about its middle: 50 ± 15.
	if err := chromedp.Do(ctx, chromedp.Click(chromedp.CSS(`button[data-zoom="in"]`))); err != nil {
		t.Fatal(err)
	}
	if lo, span := visibleRange(t, ctx); !near(lo, 35) || !near(span, 30) {
		t.Errorf("after zooming in: %g + %g, want 35 + 30", lo, span)
	}
	if got := must(t, ctx, chromedp.Text(chromedp.CSS(".twotheta-range"))); got != "2θ 35.00° to 65.00°" {
		t.Errorf("range readout %q", got)
	}
	ticks := must(t, ctx, chromedp.Evaluate[[]string](`[...document.querySelectorAll('svg.pattern .x-axis text')].map(e => e.textContent)`))
	if len(ticks) == 0 || ticks[0] != "35" || ticks[len(ticks)-1] != "65" {
		t.Errorf("x axis after zoom: %v, want 35 … 65", ticks)
	}

	// The wheel zooms by 0.8 about the 2θ under the pointer.
	// The data area on screen, from the figure's own data-box (x y w h in
	// its viewBox units) and its scale on the page.
	area := must(t, ctx, chromedp.Evaluate[rect](`(() => {
		const svg = document.querySelector('svg.pattern');
		const b = svg.getBoundingClientRect();
		const k = b.width / svg.viewBox.baseVal.width;
		const [x, y, w, h] = svg.dataset.box.split(' ').map(Number);
		return {X: b.x + x * k, Y: b.y + y * k, Width: w * k, Height: h * k};
	})()`))
	x, y := area.centre()
	lo0, span0 := visibleRange(t, ctx)
	pointer := lo0 + (x-area.X)/area.Width*span0
	if err := chromedp.Do(ctx, chromedp.MouseEvent(input.DispatchMouseEventTypeMouseWheel, x, y, func(p *input.DispatchMouseEventParams) {
		// The protocol wants both deltas, and a zero one is left out of the
		// message, so deltaX is a hair off zero.
		p.DeltaX, p.DeltaY = 0.01, -120
	})); err != nil {
		t.Fatal(err)
	}
	lo1, span1 := visibleRange(t, ctx)
	if math.Abs(span1-0.8*span0) > 1e-6 {
		t.Errorf("wheel zoom: span %g, want 0.8 × %g", span1, span0)
	}
	if after := lo1 + (x-area.X)/area.Width*span1; math.Abs(after-pointer) > 1e-6 {
		t.Errorf("wheel zoom moved the 2θ under the pointer from %g to %g", pointer, after)
	}

	// Dragging 100 px to the right shows lower angles by 100 px worth of 2θ.
	if err := chromedp.Do(ctx,
		chromedp.MouseEvent(input.DispatchMouseEventTypeMousePressed, x, y, chromedp.ButtonLeft),
		chromedp.MouseEvent(input.DispatchMouseEventTypeMouseMoved, x+50, y, chromedp.ButtonLeft),
		chromedp.MouseEvent(input.DispatchMouseEventTypeMouseMoved, x+100, y, chromedp.ButtonLeft),
		chromedp.MouseEvent(input.DispatchMouseEventTypeMouseReleased, x+100, y, chromedp.ButtonLeft),
	); err != nil {
		t.Fatal(err)
	}
	lo2, span2 := visibleRange(t, ctx)
	if want := lo1 - 100/area.Width*span1; math.Abs(lo2-want) > 0.01 || !near(span2, span1) {
		t.Errorf("drag: %g + %g, want %g + %g", lo2, span2, want, span1)
	}

	if err := chromedp.Do(ctx, chromedp.Click(chromedp.CSS(`button[data-zoom="reset"]`))); err != nil {
		t.Fatal(err)
	}
	if lo, span := visibleRange(t, ctx); !near(lo, 20) || !near(span, 60) {
		t.Errorf("after reset: %g + %g, want 20 + 60", lo, span)
	}
}

package web_test

import (
	"bytes"
	"compress/gzip"
	"encoding/xml"
	"io"
	"log/slog"
	"net/http"
	"net/http/httptest"
	"net/url"
	"regexp"
	"strings"
	"testing"

	"meltbook"
	"meltbook/web"
)

// mapSamples is a small hand-built notebook whose map classes are known:
//
//	ZR-1     Al63Cu25Fe12        icosahedral   as-spun   1e6 K/s
//	ZR-2     Al62Cu26Fe12        icosahedral   as-spun   5e5 K/s
//	ZR-2.a1  Al62Cu26Fe12        crystalline   annealed  5e5 K/s
//	ZR-3     Al60Cu25Fe10Si5     approximant   as-spun   no rate   (5 at.% outside Al-Cu-Fe)
//	ZR-4     Al55Cu25Fe10B10     decagonal     as-spun   1e6 K/s   (10 at.% outside)
//	ZR-5     Ni50Co50            crystalline   as-spun   1e6 K/s   (no corner element)
//	ZR-6     Al70Cu20Fe10        none          as-spun   2e4 K/s
//	ZR-7     Al65Cu20Fe15        proposal only as-spun   3e5 K/s
func mapSamples() *fakeNotebook {
	proposal := []meltbook.Outcome{{Kind: meltbook.Icosahedral, Source: meltbook.ByAutomatic, Status: meltbook.Proposed, RecordedBy: "peak indexer", At: epoch}}
	return newFake(
		fakeSample{code: "ZR-1", melt: "ZR-1", composition: fractions("Al", .63, "Cu", .25, "Fe", .12), outcomes: decided(meltbook.Icosahedral), rate: ptr(1e6), created: epoch},
		fakeSample{code: "ZR-2", melt: "ZR-2", composition: fractions("Al", .62, "Cu", .26, "Fe", .12), outcomes: decided(meltbook.Icosahedral, meltbook.Crystalline), rate: ptr(5e5), created: epoch.Add(1e9)},
		fakeSample{code: "ZR-2.a1", melt: "ZR-2", composition: fractions("Al", .62, "Cu", .26, "Fe", .12), outcomes: decided(meltbook.Crystalline), rate: ptr(5e5), annealed: true, created: epoch.Add(2e9)},
		fakeSample{code: "ZR-3", melt: "ZR-3", composition: fractions("Al", .60, "Cu", .25, "Fe", .10, "Si", .05), outcomes: decided(meltbook.Approximant), created: epoch.Add(3e9)},
		fakeSample{code: "ZR-4", melt: "ZR-4", composition: fractions("Al", .55, "Cu", .25, "Fe", .10, "B", .10), outcomes: decided(meltbook.Decagonal), rate: ptr(1e6), created: epoch.Add(4e9)},
		fakeSample{code: "ZR-5", melt: "ZR-5", composition: fractions("Ni", .5, "Co", .5), outcomes: decided(meltbook.Crystalline), rate: ptr(1e6), created: epoch.Add(5e9)},
		fakeSample{code: "ZR-6", melt: "ZR-6", composition: fractions("Al", .70, "Cu", .20, "Fe", .10), rate: ptr(2e4), created: epoch.Add(6e9)},
		fakeSample{code: "ZR-7", melt: "ZR-7", composition: fractions("Al", .65, "Cu", .20, "Fe", .15), outcomes: proposal, rate: ptr(3e5), created: epoch.Add(7e9)},
	)
}

func newServer(t testing.TB, nb web.Notebook, change ...func(*web.Config)) *web.Server {
	t.Helper()
	cfg := web.Config{Notebook: nb, SizeMismatch: testSizeMismatch, Author: "T. Ingram", Log: slog.New(slog.NewTextHandler(io.Discard, nil))}
	for _, c := range change {
		c(&cfg)
	}
	s, err := web.NewServer(cfg)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// do serves one request in memory and returns the response with its body
// read (and un-gzipped when compressed).
func do(t testing.TB, h http.Handler, r *http.Request) (*http.Response, string) {
	t.Helper()
	w := httptest.NewRecorder()
	h.ServeHTTP(w, r)
	res := w.Result()
	body := w.Body.Bytes()
	if res.Header.Get("Content-Encoding") == "gzip" {
		zr, err := gzip.NewReader(bytes.NewReader(body))
		if err != nil {
			t.Fatal(err)
		}
		body, err = io.ReadAll(zr)
		if err != nil {
			t.Fatal(err)
		}
	}
	return res, string(body)
}

func get(t testing.TB, h http.Handler, target string) (*http.Response, string) {
	t.Helper()
	return do(t, h, httptest.NewRequest(http.MethodGet, target, nil))
}

// formSession is a browser's form cookie and the key its pages carry.
type formSession struct {
	cookie *http.Cookie
	key    string
}

var formKeyPattern = regexp.MustCompile(`name="form_key" value="([^"]+)"`)

// openForm loads a page with a form and returns the session to post it.
func openForm(t *testing.T, h http.Handler, page string) formSession {
	t.Helper()
	res, body := get(t, h, page)
	if res.StatusCode != http.StatusOK {
		t.Fatalf("GET %s: %d", page, res.StatusCode)
	}
	var fs formSession
	for _, c := range res.Cookies() {
		if c.Name == "meltbook_form" {
			fs.cookie = c
		}
	}
	m := formKeyPattern.FindStringSubmatch(body)
	if fs.cookie == nil || m == nil {
		t.Fatalf("GET %s gave no form cookie or no form key", page)
	}
	fs.key = m[1]
	return fs
}

func (fs formSession) post(t *testing.T, h http.Handler, target string, form url.Values) (*http.Response, string) {
	t.Helper()
	if form.Get("form_key") == "" && fs.key != "" {
		form.Set("form_key", fs.key)
	}
	r := httptest.NewRequest(http.MethodPost, target, strings.NewReader(form.Encode()))
	r.Header.Set("Content-Type", "application/x-www-form-urlencoded")
	if fs.cookie != nil {
		r.AddCookie(fs.cookie)
	}
	return do(t, h, r)
}

// svgElement is a parsed SVG element.
type svgElement struct {
	name     string
	attrs    map[string]string
	children []*svgElement
}

// figures parses every top-level <svg> of an HTML page.
func figures(t testing.TB, html string) []*svgElement {
	t.Helper()
	var out []*svgElement
	for rest := html; ; {
		i := strings.Index(rest, "<svg xmlns=")
		if i < 0 {
			return out
		}
		rest = rest[i:]
		d := xml.NewDecoder(strings.NewReader(rest))
		root := &svgElement{}
		stack := []*svgElement{root}
		for len(stack) > 1 || len(root.children) == 0 {
			tok, err := d.Token()
			if err != nil {
				t.Fatalf("figure is not well-formed: %v", err)
			}
			switch tk := tok.(type) {
			case xml.StartElement:
				e := &svgElement{name: tk.Name.Local, attrs: map[string]string{}}
				for _, a := range tk.Attr {
					e.attrs[a.Name.Local] = a.Value
				}
				top := stack[len(stack)-1]
				top.children = append(top.children, e)
				stack = append(stack, e)
			case xml.EndElement:
				stack = stack[:len(stack)-1]
			}
		}
		out = append(out, root.children[0])
		rest = rest[d.InputOffset():]
	}
}

func (e *svgElement) find(ok func(*svgElement) bool) []*svgElement {
	var out []*svgElement
	for _, c := range e.children {
		if ok(c) {
			out = append(out, c)
		}
		out = append(out, c.find(ok)...)
	}
	return out
}

// markers returns the map markers per outcome class.
func markers(fig *svgElement) map[string][]*svgElement {
	out := map[string][]*svgElement{}
	for _, marks := range fig.find(func(e *svgElement) bool { return e.attrs["class"] == "marks" }) {
		for _, g := range marks.children {
			for _, u := range g.children {
				out[g.attrs["data-o"]] = append(out[g.attrs["data-o"]], u)
			}
		}
	}
	return out
}

func counts(m map[string][]*svgElement) map[string]int {
	out := map[string]int{}
	for k, v := range m {
		out[k] = len(v)
	}
	return out
}

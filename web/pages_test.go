package web_test

import (
	"bytes"
	"compress/gzip"
	"encoding/csv"
	"encoding/json"
	"math"
	"net/http"
	"net/http/httptest"
	"net/url"
	"regexp"
	"strings"
	"testing"

	"meltbook"
	"meltbook/store/query"
	"meltbook/web"
)

func TestMapPageMarkersPerOutcome(t *testing.T) {
	s := newServer(t, mapSamples())
	for _, tc := range []struct {
		name  string
		query string
		want  map[string]int
		note  string
	}{
		// Corners by default are those of the system whose map draws the
		// most samples (Al, Cu, Fe), the major element first. ZR-3 has 5 at.% Si, which is still allowed;
		// ZR-4 (10 at.% B) and ZR-5 (no corner element) are left out.
		{"defaults", "", map[string]int{"icosahedral": 2, "crystalline": 1, "approximant": 1, "undecided": 2}, "6 of 8 samples shown"},
		{"as-spun only", "?a=Al&b=Cu&c=Fe&treatment=as-spun", map[string]int{"icosahedral": 2, "approximant": 1, "undecided": 2}, "5 of 8"},
		{"annealed only", "?a=Al&b=Cu&c=Fe&treatment=annealed", map[string]int{"crystalline": 1}, "1 of 8"},
		// ZR-3 has no cooling rate, ZR-6 was cooled at 2e4 K/s.
		{"cooling rate from 1e5", "?a=Al&b=Cu&c=Fe&rate-min=1e5", map[string]int{"icosahedral": 2, "crystalline": 1, "undecided": 1}, "4 of 8"},
		{"cooling rate up to 4e5", "?a=Al&b=Cu&c=Fe&rate-max=4e5", map[string]int{"undecided": 2}, "2 of 8"},
		// With (Fe+Si) ZR-3 lies wholly inside; with a 1 at.% allowance
		// the Si-bearing sample drops out of Al-Cu-Fe.
		// (Fe+Si) pooled over the six samples: Fe 0.12·3 + 0.10 + 0.10 + 0.15
		// = 0.71, Si 0.05, so Fe 0.71/0.76 = 0.93 and Si 0.07.
		{"grouped corner", "?a=Al&b=Cu&c=Fe%2BSi", map[string]int{"icosahedral": 2, "crystalline": 1, "approximant": 1, "undecided": 2}, "(Fe+Si) = Fe 0.93 + Si 0.07 (pooled over 6 samples shown)"},
		{"strict allowance", "?a=Al&b=Cu&c=Fe&outside=1", map[string]int{"icosahedral": 2, "crystalline": 1, "undecided": 2}, "5 of 8"},
		{"B corner takes ZR-4 in", "?a=Al&b=Cu&c=Fe%2BB", map[string]int{"icosahedral": 2, "crystalline": 1, "approximant": 1, "decagonal": 1, "undecided": 2}, "7 of 8"},
	} {
		res, body := get(t, s, "/map"+tc.query)
		if res.StatusCode != http.StatusOK {
			t.Errorf("%s: %d", tc.name, res.StatusCode)
			continue
		}
		figs := figures(t, body)
		if len(figs) != 1 {
			t.Fatalf("%s: %d figures, want 1", tc.name, len(figs))
		}
		got := counts(markers(figs[0]))
		for _, class := range []string{"icosahedral", "decagonal", "approximant", "amorphous", "crystalline", "undecided"} {
			if got[class] != tc.want[class] {
				t.Errorf("%s: %d %s markers, want %d", tc.name, got[class], class, tc.want[class])
			}
		}
		if !strings.Contains(body, tc.note) {
			t.Errorf("%s: page does not say %q", tc.name, tc.note)
		}
	}

	_, body := get(t, s, "/map?a=Al&b=Cu&c=Fe")
	ico := markers(figures(t, body)[0])["icosahedral"]
	var zr1 map[string]string
	for _, m := range ico {
		if m.attrs["data-c"] == "ZR-1" {
			zr1 = m.attrs
		}
	}
	// Raynor e/a of Al63Cu25Fe12: 3·0.63 + 1·0.25 − 2.66·0.12 = 1.8208
	// (valences Al 3, Cu 1 by group, Fe −2.66 after Raynor 1949).
	if zr1 == nil || zr1["data-e"] != "1.821" || zr1["data-x"] != "Al63Cu25Fe12" {
		t.Errorf("ZR-1 marker %v, want data-e 1.821 and data-x Al63Cu25Fe12", zr1)
	}
}

func TestMapControlsKeepWhatWasTyped(t *testing.T) {
	s := newServer(t, mapSamples())
	res, body := get(t, s, "/map?a=Al&b=Cu&c=Fe%2BFe&rate-min=fast&outside=7")
	if res.StatusCode != http.StatusBadRequest {
		t.Fatalf("bad corner: %d, want 400", res.StatusCode)
	}
	for _, want := range []string{`value="Fe&#43;Fe"`, `value="fast"`, `value="7"`, "names Fe twice", "positive number of K/s"} {
		if !strings.Contains(body, want) {
			t.Errorf("page lacks %q", want)
		}
	}
	if len(figures(t, body)) != 0 {
		t.Error("a map was drawn from bad settings")
	}
	if res, _ := get(t, s, "/map?a=Al&b=Cu&c=Fe&outside=NaN"); res.StatusCode != http.StatusBadRequest {
		t.Errorf("outside=NaN: %d, want 400", res.StatusCode)
	}
}

func TestMapDataAndIsolines(t *testing.T) {
	s := newServer(t, mapSamples())
	res, body := get(t, s, "/api/map?a=Al&b=Cu&c=Fe&ea-step=0.05")
	if res.StatusCode != http.StatusOK {
		t.Fatalf("%d %s", res.StatusCode, body)
	}
	var d struct {
		Corners        [3]string  `json:"corners"`
		Scheme         string     `json:"scheme"`
		CornerValences [3]float64 `json:"corner_valences"`
		Counts         struct {
			Shown, Total int
			Outside      int `json:"too_much_outside_corners"`
			NoCorner     int `json:"no_corner_element"`
		} `json:"counts"`
		Points []struct {
			Code    string     `json:"code"`
			Class   string     `json:"class"`
			Ternary [3]float64 `json:"ternary"`
		} `json:"points"`
		Isolines []struct {
			Level float64        `json:"level"`
			Label string         `json:"label"`
			Lines [][][3]float64 `json:"lines"`
		} `json:"isolines"`
	}
	if err := json.Unmarshal([]byte(body), &d); err != nil {
		t.Fatal(err)
	}
	if d.Corners != [3]string{"Al", "Cu", "Fe"} || d.Scheme != "raynor" || d.CornerValences != [3]float64{3, 1, -2.66} {
		t.Errorf("corners %v scheme %q valences %v", d.Corners, d.Scheme, d.CornerValences)
	}
	if d.Counts.Shown != 6 || d.Counts.Total != 8 || d.Counts.Outside != 1 || d.Counts.NoCorner != 1 {
		t.Errorf("counts %+v", d.Counts)
	}
	// The 1.75 line with valences 3, 1, −2.66 (hand-worked):
	//   A-B edge: 3x + (1 − x) = 1.75 ⇒ x_Al = 0.375
	//   A-C edge: 3x − 2.66(1 − x) = 1.75 ⇒ x_Al = 4.41/5.66 = 0.7791519
	found := false
	for _, iso := range d.Isolines {
		if iso.Label != "1.75" {
			continue
		}
		found = true
		line := iso.Lines[0]
		ends := [][3]float64{line[0], line[len(line)-1]}
		var ab, ac bool
		for _, p := range ends {
			ab = ab || math.Abs(p[2]) < 1e-9 && math.Abs(p[0]-0.375) < 1e-9
			ac = ac || math.Abs(p[1]) < 1e-9 && math.Abs(p[0]-4.41/5.66) < 1e-9
		}
		if !ab || !ac {
			t.Errorf("1.75 line ends at %v, want x_Al 0.375 on A-B and 0.7791519 on A-C", ends)
		}
	}
	if !found {
		t.Errorf("no 1.75 line among %d isolines", len(d.Isolines))
	}
	// ZR-1 sits at its composition.
	for _, p := range d.Points {
		if p.Code == "ZR-1" && (math.Abs(p.Ternary[0]-0.63) > 1e-12 || p.Class != "icosahedral") {
			t.Errorf("ZR-1 at %v as %s", p.Ternary, p.Class)
		}
	}

	// The download is the same figure as a file.
	res, svg := get(t, s, "/map.svg?a=Al&b=Cu&c=Fe")
	if res.Header.Get("Content-Type") != "image/svg+xml" || !strings.Contains(res.Header.Get("Content-Disposition"), "attachment") {
		t.Errorf("download headers %v", res.Header)
	}
	if got := counts(markers(figures(t, svg)[0])); got["icosahedral"] != 2 || got["undecided"] != 2 {
		t.Errorf("downloaded map markers %v", got)
	}
}

func TestMapOf10000SamplesStaysUnderOneMegabyte(t *testing.T) {
	s := newServer(t, inventedNotebook(10000))
	r := httptest.NewRequest(http.MethodGet, "/map?a=Al&b=Cu&c=Fe", nil)
	r.Header.Set("Accept-Encoding", "gzip")
	w := httptest.NewRecorder()
	s.ServeHTTP(w, r)
	if w.Code != http.StatusOK || w.Header().Get("Content-Encoding") != "gzip" {
		t.Fatalf("status %d, encoding %q", w.Code, w.Header().Get("Content-Encoding"))
	}
	sent := w.Body.Len()
	zr, err := gzip.NewReader(bytes.NewReader(w.Body.Bytes()))
	if err != nil {
		t.Fatal(err)
	}
	var raw bytes.Buffer
	raw.ReadFrom(zr)
	t.Logf("map page of 10 000 samples: %d bytes sent, %d bytes of HTML", sent, raw.Len())
	// No page may exceed 1 MB in transfer (meltbook's budget).
	if sent > 1_000_000 || raw.Len() > 1_000_000 {
		t.Errorf("map page: %d bytes sent, %d of HTML; budget 1 000 000", sent, raw.Len())
	}
}

func TestRunTable(t *testing.T) {
	s := newServer(t, mapSamples())
	res, body := get(t, s, "/runs?sort=code")
	if res.StatusCode != http.StatusOK {
		t.Fatal(res.StatusCode)
	}
	codes := regexp.MustCompile(`<td><a href="/runs/(ZR-\d+)">`).FindAllStringSubmatch(body, -1)
	var got []string
	for _, m := range codes {
		got = append(got, m[1])
	}
	if strings.Join(got, " ") != "ZR-1 ZR-2 ZR-3 ZR-4 ZR-5 ZR-6 ZR-7" {
		t.Errorf("melts sorted by code: %v", got)
	}
	// The code column is sorted ascending, so its link reverses it.
	if !strings.Contains(body, `aria-sort="ascending"`) || !strings.Contains(body, `href="/runs?desc=1&amp;sort=code"`) {
		t.Error("sorted column is not marked or does not offer the reverse order")
	}
	if !strings.Contains(body, "7 melts match") {
		t.Error("no total")
	}
	// Filters in the find vocabulary.
	_, body = get(t, s, "/runs?outcome=icosahedral&ea=1.7:1.9")
	if !strings.Contains(body, "2 melts match") || !strings.Contains(body, `value="1.7:1.9"`) {
		t.Error("outcome and e/a filter: want 2 melts and the typed range kept")
	}
	_, body = get(t, s, "/runs?colour=red")
	if !strings.Contains(body, "is not a filter") {
		t.Error("unknown filter not reported")
	}
	if res, _ := get(t, s, "/runs?page=0"); res.StatusCode != http.StatusBadRequest {
		t.Errorf("page 0: %d", res.StatusCode)
	}
	if res, body := get(t, s, "/runs?sort=colour"); res.StatusCode != http.StatusBadRequest || !strings.Contains(body, "not a sort order") {
		t.Errorf("bad sort: %d", res.StatusCode)
	}
}

func TestRunTablePages(t *testing.T) {
	s := newServer(t, inventedNotebook(260)) // 130 melts: three pages of 50
	_, body := get(t, s, "/runs?page=2&sort=code")
	if !strings.Contains(body, "page 2 of 3") || !strings.Contains(body, `href="/runs?page=1&amp;sort=code"`) || !strings.Contains(body, `href="/runs?page=3&amp;sort=code"`) {
		t.Error("page 2 lacks its place or its neighbours")
	}
	if !strings.Contains(body, `href="/runs/ZR-0051"`) || strings.Contains(body, `href="/runs/ZR-0050"`) {
		t.Error("page 2 should start at the 51st melt")
	}
}

func TestFindJSONAndCSVAreTheFindCommands(t *testing.T) {
	nb := mapSamples()
	s := newServer(t, nb)
	const q = "outcome=icosahedral&ea=1.7:1.9"
	res, body := get(t, s, "/api/find?"+q)
	if res.StatusCode != http.StatusOK || res.Header.Get("X-Total-Count") != "2" {
		t.Fatalf("%d, total %q", res.StatusCode, res.Header.Get("X-Total-Count"))
	}
	var rows []query.Row
	if err := json.Unmarshal([]byte(body), &rows); err != nil {
		t.Fatal(err)
	}
	if len(rows) != 2 || rows[0].Code != "ZR-2" || rows[1].Code != "ZR-1" {
		t.Fatalf("rows %+v, want ZR-2 then ZR-1 (newest first)", rows)
	}
	// Byte for byte what package query makes of the same search, which is
	// what the find command prints.
	v, _ := url.ParseQuery(q)
	f, err := query.Parse(query.Terms(v), query.Options{})
	if err != nil {
		t.Fatal(err)
	}
	f.Sort, f.Descending = meltbook.SortCreated, true
	found, _, err := nb.FindMelts(t.Context(), f)
	if err != nil {
		t.Fatal(err)
	}
	want, _ := json.Marshal(query.Rows(found))
	if strings.TrimSpace(body) != string(want) {
		t.Errorf("/api/find differs from query.Rows:\n got %s\nwant %s", body, want)
	}
	_, body = get(t, s, "/api/find?outcome=amorphous")
	if strings.TrimSpace(body) != "[]" {
		t.Errorf("no match gives %s, want []", body)
	}

	res, body = get(t, s, "/runs.csv?"+q)
	if !strings.HasPrefix(res.Header.Get("Content-Type"), "text/csv") {
		t.Errorf("CSV content type %q", res.Header.Get("Content-Type"))
	}
	records, err := csv.NewReader(strings.NewReader(body)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if strings.Join(records[0], ",") != strings.Join(query.CSVHeader, ",") || len(records) != 3 {
		t.Errorf("CSV %v", records)
	}
}

func TestRunPage(t *testing.T) {
	s := newServer(t, mapSamples())
	_, body := get(t, s, "/runs/ZR-2.a1")
	for _, want := range []string{"Melt ZR-2", `class="sample depth-1 focus" id="s-ZR-2.a1"`, "800 °C", "λ-Al13Fe4", "e/a (raynor)"} {
		if !strings.Contains(body, want) {
			t.Errorf("run page lacks %q", want)
		}
	}
	// Al62Cu26Fe12: 3·0.62 + 0.26 − 2.66·0.12 = 1.86 + 0.26 − 0.3192 = 1.8008.
	_, body = get(t, s, "/runs/ZR-2")
	if !strings.Contains(body, "1.801") {
		t.Error("run page lacks e/a 1.801 of Al62Cu26Fe12")
	}
}

func TestNoteFormKeepsWhatWasTyped(t *testing.T) {
	s := newServer(t, mapSamples())
	fs := openForm(t, s, "/runs/ZR-2")
	res, body := fs.post(t, s, "/runs/ZR-2/notes", url.Values{"author": {""}, "sample": {"ZR-2.a1"}, "text": {"Annealed piece <b>crumbled</b> on handling."}})
	if res.StatusCode != http.StatusUnprocessableEntity {
		t.Fatalf("missing author: %d", res.StatusCode)
	}
	for _, want := range []string{
		"Say who is writing the note.", `aria-invalid="true" aria-describedby="note-author-error"`,
		"Annealed piece &lt;b&gt;crumbled&lt;/b&gt; on handling.", `<option value="ZR-2.a1" selected>`,
	} {
		if !strings.Contains(body, want) {
			t.Errorf("failed form lacks %q", want)
		}
	}
	res, body = fs.post(t, s, "/runs/ZR-2/notes", url.Values{"author": {"T. Ingram"}, "sample": {"ZR-9"}, "text": {"x"}})
	if res.StatusCode != http.StatusUnprocessableEntity || !strings.Contains(body, "ZR-9 is not a sample of ZR-2.") {
		t.Errorf("foreign sample: %d", res.StatusCode)
	}
	res, _ = fs.post(t, s, "/runs/ZR-2/notes", url.Values{"author": {"T. Ingram"}, "sample": {"ZR-2.a1"}, "text": {"Annealed piece crumbled."}})
	if res.StatusCode != http.StatusSeeOther {
		t.Fatalf("good note: %d", res.StatusCode)
	}
	if _, body = get(t, s, "/runs/ZR-2"); !strings.Contains(body, "on ZR-2.a1") {
		t.Error("the note does not say which sample it is on")
	}
}

func TestDescriptorMaps(t *testing.T) {
	s := newServer(t, mapSamples())
	res, body := get(t, s, "/descriptors")
	if res.StatusCode != http.StatusOK {
		t.Fatal(res.StatusCode)
	}
	figs := figures(t, body)
	if len(figs) != 2 {
		t.Fatalf("%d figures, want 2", len(figs))
	}
	// δ needs a radius for every element: ZR-5 (Ni, Co) has none in the
	// test table, and its e/a is undefined too (Raynor gives Ni and Co,
	// so it has one). Every other sample has e/a and δ: 7 of 8.
	size, rate := counts(markers(figs[0])), counts(markers(figs[1]))
	total := func(m map[string]int) (n int) {
		for _, v := range m {
			n += v
		}
		return n
	}
	if total(size) != 7 {
		t.Errorf("e/a-δ map has %d markers %v, want 7", total(size), size)
	}
	// Cooling rates: all but ZR-3.
	if total(rate) != 7 || rate["approximant"] != 0 {
		t.Errorf("e/a-rate map has %v, want 7 without the approximant ZR-3", rate)
	}
	_, body = get(t, s, "/descriptors?treatment=annealed")
	if got := counts(markers(figures(t, body)[1])); got["crystalline"] != 1 || len(got) != 1 {
		t.Errorf("annealed only: %v", got)
	}
}

func TestScanPage(t *testing.T) {
	s := newServer(t, mapSamples())
	res, body := get(t, s, "/scans/1")
	if res.StatusCode != http.StatusOK {
		t.Fatal(res.StatusCode)
	}
	figs := figures(t, body)
	if len(figs) != 1 || figs[0].attrs["data-t0"] != "20" || figs[0].attrs["data-t1"] != "80" {
		t.Fatalf("pattern figure %v", figs)
	}
	area := figs[0].find(func(e *svgElement) bool { return e.attrs["class"] == "plot-area" })
	if len(area) != 1 || area[0].attrs["viewBox"] != "20 0 60 1000" {
		t.Errorf("plot area %v", area)
	}
	if res, _ := get(t, s, "/scans/99"); res.StatusCode != http.StatusNotFound {
		t.Errorf("unknown scan: %d", res.StatusCode)
	}
}

func TestAssetsAreEmbeddedAndNothingIsFetchedFromElsewhere(t *testing.T) {
	s := newServer(t, mapSamples())
	_, page := get(t, s, "/map")
	links := regexp.MustCompile(`(?:href|src)="(/static/[^"]+)"`).FindAllStringSubmatch(page, -1)
	if len(links) < 3 {
		t.Fatalf("page links %d assets, want the stylesheet, the script and the icon", len(links))
	}
	for _, l := range links {
		target := strings.ReplaceAll(l[1], "&amp;", "&")
		res, body := get(t, s, target)
		if res.StatusCode != http.StatusOK || !strings.Contains(res.Header.Get("Cache-Control"), "immutable") || len(body) == 0 {
			t.Errorf("%s: %d, cache %q", target, res.StatusCode, res.Header.Get("Cache-Control"))
		}
		if strings.Contains(body, "@import") || strings.Contains(body, "url(http") || strings.Contains(body, "fonts.") {
			t.Errorf("%s refers to something outside", target)
		}
	}
	for _, path := range []string{"/", "/runs", "/map", "/descriptors", "/runs/ZR-1", "/scans/1"} {
		_, body := get(t, s, path)
		rest := strings.ReplaceAll(body, `xmlns="http://www.w3.org/2000/svg"`, "")
		if strings.Contains(rest, "http://") || strings.Contains(rest, "https://") || strings.Contains(rest, "<script>") || strings.Contains(rest, " style=") {
			t.Errorf("%s links outside, or has inline script or style", path)
		}
	}
	if res, _ := get(t, s, "/static/nothing.js"); res.StatusCode != http.StatusNotFound {
		t.Errorf("unknown asset: %d", res.StatusCode)
	}
	res, _ := get(t, s, "/static/meltbook.css")
	if !strings.HasPrefix(res.Header.Get("Content-Type"), "text/css") || res.Header.Get("Cache-Control") != "no-cache" {
		t.Errorf("unversioned stylesheet: %q, cache %q", res.Header.Get("Content-Type"), res.Header.Get("Cache-Control"))
	}
}

func TestOverview(t *testing.T) {
	s := newServer(t, mapSamples())
	_, body := get(t, s, "/")
	for _, want := range []string{"<strong>7</strong> melts", "<strong>8</strong> samples", `href="/runs?outcome=icosahedral"`} {
		if !strings.Contains(body, want) {
			t.Errorf("overview lacks %q", want)
		}
	}
}

func BenchmarkMapPage10000(b *testing.B) {
	s := newServer(b, inventedNotebook(10000))
	b.ReportAllocs()
	for b.Loop() {
		w := httptest.NewRecorder()
		s.ServeHTTP(w, httptest.NewRequest(http.MethodGet, "/map?a=Al&b=Cu&c=Fe", nil))
		if w.Code != http.StatusOK {
			b.Fatal(w.Code)
		}
		b.SetBytes(int64(w.Body.Len()))
	}
}

func BenchmarkMapPage10000Gzip(b *testing.B) {
	s := newServer(b, inventedNotebook(10000))
	b.ReportAllocs()
	for b.Loop() {
		w := httptest.NewRecorder()
		r := httptest.NewRequest(http.MethodGet, "/map?a=Al&b=Cu&c=Fe", nil)
		r.Header.Set("Accept-Encoding", "gzip")
		s.ServeHTTP(w, r)
		if w.Code != http.StatusOK {
			b.Fatal(w.Code)
		}
		b.SetBytes(int64(w.Body.Len()))
	}
}

func TestSizeMismatchFromTheElementTable(t *testing.T) {
	// δ of Al63Cu25Fe12 with CN12 radii Al 1.432, Cu 1.278, Fe 1.274 Å
	// (Teatum, Gschneidner and Waber, LA-4003 (1968), as commonly quoted;
	// from memory):
	//   r̄ = 0.63·1.432 + 0.25·1.278 + 0.12·1.274 = 0.90216 + 0.3195 + 0.15288 = 1.37454
	//   1 − r/r̄: Al −0.0418031, Cu 0.0702344, Fe 0.0731445
	//   Σ x(…)² = 0.63·0.0017475 + 0.25·0.0049329 + 0.12·0.0053501
	//           = 0.0011009 + 0.0012332 + 0.0006420 = 0.0029762
	//   δ = 100·√0.0029762 = 5.4554 %
	d, err := web.SizeMismatchCN12(fractions("Al", .63, "Cu", .25, "Fe", .12))
	if err != nil || math.Abs(d-5.4554) > 0.001 {
		t.Errorf("δ(Al63Cu25Fe12) = %v, %v; want 5.4554 %%", d, err)
	}
	if _, err := web.SizeMismatchCN12(fractions("Al", .5, "Og", .5)); err == nil {
		t.Error("an element without a radius gave a δ")
	}
}

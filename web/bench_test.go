package web_test

import (
	"context"
	"io"
	"log/slog"
	"net/http"
	"net/http/httptest"
	"path/filepath"
	"testing"

	"meltbook/analysis/element"
	"meltbook/store"
	"meltbook/store/storetest"
	"meltbook/web"
)

// storeOptions keeps e/a under the built-in schemes, as the command line
// opens a notebook.
func storeOptions() store.Options {
	valences := map[string]map[string]float64{}
	for _, name := range store.KeptSchemes {
		if s, ok := element.LookupScheme(name); ok {
			valences[name] = s.Valence
		}
	}
	return store.Options{Valences: valences}
}

// generatedServer serves an invented notebook (package storetest) from a
// real store file.
func generatedServer(b *testing.B, opt storetest.Options) (*web.Server, *store.Store) {
	b.Helper()
	ctx := context.Background()
	path := filepath.Join(b.TempDir(), "notebook.db")
	opt.Store = storeOptions()
	if err := storetest.Generate(ctx, path, opt); err != nil {
		b.Fatal(err)
	}
	st, err := store.Open(ctx, path, storeOptions())
	if err != nil {
		b.Fatal(err)
	}
	b.Cleanup(func() { st.Close() })
	s, err := web.NewServer(web.Config{Notebook: st, Log: slog.New(slog.NewTextHandler(io.Discard, nil))})
	if err != nil {
		b.Fatal(err)
	}
	return s, st
}

// serve runs one request through the whole handler, as a browser asks for
// it (gzip accepted), and returns the bytes sent.
func serve(b *testing.B, s http.Handler, target string) int {
	w := httptest.NewRecorder()
	r := httptest.NewRequest(http.MethodGet, target, nil)
	r.Header.Set("Accept-Encoding", "gzip")
	s.ServeHTTP(w, r)
	if w.Code != http.StatusOK {
		b.Fatalf("GET %s: %d %s", target, w.Code, w.Body.String())
	}
	return w.Body.Len()
}

// BenchmarkStoreMapPage draws the composition map of a notebook of about
// 10,000 Al-Cu-Fe samples (6,250 melts, 60 % with an annealed piece), all
// on the map, read from the store: reading the samples, placing them,
// drawing the SVG, the page and its gzip; just after a change to the
// notebook (the samples are read from the file) and with it unchanged (the
// store keeps them). The budget is 150 ms and 1 MB sent.
func BenchmarkStoreMapPage(b *testing.B) {
	s, st := generatedServer(b, storetest.Options{Melts: 6250, AnnealedShare: 0.6, MeasuredShare: 0.33, Systems: [][]string{{"Al", "Cu", "Fe"}}})
	ctx := context.Background()
	samples, err := st.MapSamples(ctx)
	if err != nil {
		b.Fatal(err)
	}
	for _, changed := range []bool{true, false} {
		name := "unchanged"
		if changed {
			name = "after-a-change"
		}
		b.Run(name, func(b *testing.B) {
			var sent int
			b.ReportAllocs()
			for b.Loop() {
				if changed {
					b.StopTimer()
					if _, err := st.AddNote(ctx, "Ines Marlow", "GEN-000001", "weighed again"); err != nil {
						b.Fatal(err)
					}
					b.StartTimer()
				}
				sent = serve(b, s, "/map?a=Al&b=Cu&c=Fe")
			}
			b.ReportMetric(float64(len(samples)), "samples")
			b.ReportMetric(float64(sent), "bytes-sent")
		})
	}
}

// BenchmarkStoreRunList shows one page of the run table over 100,000
// melts, with the filters people use. The budget is 100 ms.
func BenchmarkStoreRunList(b *testing.B) {
	s, _ := generatedServer(b, storetest.Options{Melts: 100_000})
	for _, c := range []struct{ name, query string }{
		{"newest", ""},
		{"icosahedral+e/a+rate", "outcome=icosahedral&ea=1.7:1.9&rate=1e5:1e7"},
		{"system+Cu-range, by e/a", "system=Al-Cu-Fe&content=Cu%3D10:20&sort=e/a"},
		{"made+operator, page 5", "made=2023-01-01:2024-12-31&by=Kai+Ostrow&page=5"},
	} {
		b.Run(c.name, func(b *testing.B) {
			var sent int
			for b.Loop() {
				sent = serve(b, s, "/runs?"+c.query)
			}
			b.ReportMetric(float64(sent), "bytes-sent")
		})
	}
}

// BenchmarkScanPage draws a scan page of 3,001 points: the stored points
// and peaks, and the background and profile of the peak search run again.
func BenchmarkScanPage(b *testing.B) {
	s := newServer(b, mapSamples())
	var sent int
	for b.Loop() {
		sent = serve(b, s, "/scans/1")
	}
	b.ReportMetric(float64(sent), "bytes-sent")
}

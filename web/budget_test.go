package web_test

import (
	"context"
	"net/http"
	"net/http/httptest"
	"strconv"
	"testing"

	"meltbook"
)

// TestNoDemoPageOverOneMegabyte fetches every page of the demonstration
// notebook as a browser does (gzip accepted): none may send more than
// 1 MB (meltbook's budget).
func TestNoDemoPageOverOneMegabyte(t *testing.T) {
	st, _, _ := demoStore(t)
	s := newServer(t, st)
	ctx := context.Background()
	pages := []string{"/", "/runs", "/runs?page=3", "/map", "/descriptors", "/log", "/api/find", "/api/map", "/runs.csv"}
	found, _, err := st.FindMelts(ctx, meltbook.MeltFilter{})
	if err != nil {
		t.Fatal(err)
	}
	for _, m := range found {
		pages = append(pages, "/runs/"+m.Code)
		scans, err := st.MeltScans(ctx, m.Code)
		if err != nil {
			t.Fatal(err)
		}
		for _, sc := range scans {
			pages = append(pages, "/scans/"+strconv.FormatInt(sc.ID, 10), "/api/scans/"+strconv.FormatInt(sc.ID, 10))
		}
	}
	largest, which := 0, ""
	for _, p := range pages {
		w := httptest.NewRecorder()
		r := httptest.NewRequest(http.MethodGet, p, nil)
		r.Header.Set("Accept-Encoding", "gzip")
		s.ServeHTTP(w, r)
		if w.Code != http.StatusOK {
			t.Errorf("GET %s: %d", p, w.Code)
		}
		if n := w.Body.Len(); n > largest {
			largest, which = n, p
		}
		if n := w.Body.Len(); n > 1_000_000 {
			t.Errorf("GET %s sends %d bytes; the budget is 1 000 000", p, n)
		}
	}
	t.Logf("%d pages; the largest, %s, sends %d bytes", len(pages), which, largest)
}

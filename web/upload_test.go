package web_test

import (
	"context"
	"fmt"
	"net/http"
	"regexp"
	"strings"
	"testing"

	"meltbook"
	"meltbook/seed"
	"meltbook/store"
	"meltbook/web"
)

// icosahedralScan picks a demo scan of a sample the lab decided was
// icosahedral, and a sample of the same system without any outcome or scan
// to upload it to.
func icosahedralScan(t *testing.T, st *store.Store, scans []seed.Scan) (seed.Scan, string, string) {
	t.Helper()
	ctx := context.Background()
	samples, err := st.MapSamples(ctx)
	if err != nil {
		t.Fatal(err)
	}
	outcomes := map[string][]meltbook.Outcome{}
	for _, m := range samples {
		outcomes[m.Code] = m.Outcomes
	}
	for _, sc := range scans {
		ico := false
		for _, o := range outcomes[sc.Sample] {
			ico = ico || o.Kind == meltbook.Icosahedral && o.Source == meltbook.ByPerson
		}
		if !ico || sc.System != "Al-Cu-Fe" {
			continue
		}
		melt, _ := st.SampleMelt(ctx, sc.Sample)
		for _, m := range samples {
			if len(m.Outcomes) > 0 || m.Melt == melt {
				continue
			}
			if got, err := st.MeltScans(ctx, m.Melt); err == nil && len(got) == 0 && strings.Contains(m.Melt, "QR-") {
				rec, err := st.MeltRecord(ctx, m.Melt)
				if err == nil && len(rec.Melt.Nominal) == 3 && rec.Melt.Nominal[1].Element == "Cu" {
					return sc, m.Code, m.Melt
				}
			}
		}
	}
	t.Fatal("the demo has no icosahedral Al-Cu-Fe scan and no Al-Cu-Fe sample without outcome and scan")
	return seed.Scan{}, "", ""
}

func TestUploadScan(t *testing.T) {
	st, _, scans := demoStore(t)
	sc, sample, melt := icosahedralScan(t, st, scans)
	s := newServer(t, st)
	fs := openForm(t, s, "/runs/"+melt)
	_, page := get(t, s, "/runs/"+melt)
	if !strings.Contains(page, `action="/runs/`+melt+`/scans#s-`+sample+`" enctype="multipart/form-data"`) {
		t.Fatal("the run page offers no scan upload")
	}
	fields := func(kv ...string) map[string]string {
		f := map[string]string{"sample": sample, "radiation": "Cu", "by": "T. Ingram", "notes": "ground ribbon, back-loaded"}
		for i := 0; i < len(kv); i += 2 {
			f[kv[i]] = kv[i+1]
		}
		return f
	}

	// Refusals keep what was typed and say where.
	res, body := fs.postFile(t, s, "/runs/"+melt+"/scans", fields("by", ""), "upload.xy", sc.Data)
	if res.StatusCode != http.StatusUnprocessableEntity || !strings.Contains(body, "Say who measured or imports the scan.") ||
		!strings.Contains(body, "Choose the file again") || !strings.Contains(body, `value="ground ribbon, back-loaded"`) {
		t.Errorf("no name: %d", res.StatusCode)
	}
	res, body = fs.postFile(t, s, "/runs/"+melt+"/scans", fields(), "notes.xy", []byte("20.00 100\n20.02 nothing\n"))
	// File, line and column: notes.xy:2:7.
	if res.StatusCode != http.StatusUnprocessableEntity || !strings.Contains(body, "notes.xy:2:7") || !strings.Contains(body, "&#34;nothing&#34; is not a number") {
		t.Errorf("a file that does not read: %d, want 422 naming the file, line and column", res.StatusCode)
	}
	res, body = fs.postFile(t, s, "/runs/"+melt+"/scans", fields("standard", "Ge"), "upload.xy", sc.Data)
	if res.StatusCode != http.StatusUnprocessableEntity || !strings.Contains(body, "Choose Si, LaB6 or none.") {
		t.Errorf("unknown standard: %d", res.StatusCode)
	}
	if got, _ := st.MeltScans(context.Background(), melt); len(got) != 0 {
		t.Fatalf("refused uploads stored %d scans", len(got))
	}

	res, _ = fs.postFile(t, s, "/runs/"+melt+"/scans", fields(), "upload.xy", sc.Data)
	loc := res.Header.Get("Location")
	m := regexp.MustCompile(`^/scans/(\d+)#proposals$`).FindStringSubmatch(loc)
	if res.StatusCode != http.StatusSeeOther || m == nil {
		t.Fatalf("upload: %d to %q; want 303 to the new scan's proposals", res.StatusCode, loc)
	}
	_, body = get(t, s, "/scans/"+m[1])
	action := regexp.MustCompile(`action="(/runs/` + melt + `/proposals/(\d+))"`).FindStringSubmatch(body)
	if !strings.Contains(body, "icosahedral") || action == nil || !strings.Contains(body, `name="scan" value="`+m[1]+`"`) {
		t.Fatal("the new scan's page shows no icosahedral proposal to decide")
	}
	res, body = fs.postFile(t, s, "/runs/"+melt+"/scans", fields(), "again.xy", sc.Data)
	if res.StatusCode != http.StatusConflict || !strings.Contains(body, "is already in the notebook for "+sample+", as scan "+m[1]) {
		t.Errorf("the same file again: %d", res.StatusCode)
	}

	res, _ = fs.post(t, s, action[1], map[string][]string{"by": {"T. Ingram"}, "decision": {"confirm"}, "scan": {m[1]}})
	if res.StatusCode != http.StatusSeeOther || res.Header.Get("Location") != "/scans/"+m[1]+"#proposals" {
		t.Fatalf("confirm: %d to %q", res.StatusCode, res.Header.Get("Location"))
	}
	rec, err := st.MeltRecord(context.Background(), melt)
	if err != nil {
		t.Fatal(err)
	}
	found := false
	for _, sr := range rec.Samples {
		for _, o := range sr.Outcomes {
			found = found || sr.Code == sample && o.Kind == meltbook.Icosahedral && o.Source == meltbook.ByAutomatic && o.Status == meltbook.Confirmed
		}
	}
	if !found {
		t.Error("confirming the proposal recorded no confirmed icosahedral outcome")
	}
}

func TestUploadIsSizeLimited(t *testing.T) {
	st, _, scans := demoStore(t)
	sc, sample, melt := icosahedralScan(t, st, scans)
	s := newServer(t, st, func(c *web.Config) { c.MaxUploadBytes = 4096 })
	fs := openForm(t, s, "/runs/"+melt)
	res, _ := fs.postFile(t, s, "/runs/"+melt+"/scans", map[string]string{"sample": sample, "by": "T. Ingram"}, "upload.xy", sc.Data)
	if res.StatusCode != http.StatusRequestEntityTooLarge {
		t.Errorf("a %d-byte scan over a 4096-byte limit: %d, want 413", len(sc.Data), res.StatusCode)
	}
}

// TestDemoMapDefaultsToTheLargestSystem opens the map without corners on
// the demonstration notebook, whose most common elements overall (Al, Zn,
// Cu) make no system of it: the map shows the system with the most
// samples instead, and links to the others.
func TestDemoMapDefaultsToTheLargestSystem(t *testing.T) {
	st, _, _ := demoStore(t)
	samples, err := st.MapSamples(context.Background())
	if err != nil {
		t.Fatal(err)
	}
	// Samples with at most 5 at.% outside Al, Cu and Fe, counted here.
	n := 0
	for _, m := range samples {
		var in, all float64
		for _, ef := range m.Composition {
			all += ef.Fraction
			if ef.Element == "Al" || ef.Element == "Cu" || ef.Element == "Fe" {
				in += ef.Fraction
			}
		}
		if in > 0 && all-in <= 0.05*all+1e-12 {
			n++
		}
	}
	s := newServer(t, st)
	_, body := get(t, s, "/map")
	if !strings.Contains(body, `value="Al"`) || !strings.Contains(body, `value="Cu"`) || !strings.Contains(body, `value="Fe"`) {
		t.Error("the default map is not Al-Cu-Fe")
	}
	if !strings.Contains(body, fmt.Sprintf("%d of %d samples shown", n, len(samples))) {
		t.Errorf("the default map does not show the %d Al-Cu-Fe samples", n)
	}
	for _, link := range []string{`href="/map?a=Al&amp;b=Pd&amp;c=Mn"`, `href="/map?a=Zn&amp;b=Mg&amp;c=Y"`} {
		if !strings.Contains(body, link) {
			t.Errorf("no link %s to another system", link)
		}
	}
}

package web_test

import (
	"context"
	"net/http"
	"net/url"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"meltbook/store"
	"meltbook/web"
)

// logValues is a run as a person types it in the log form.
func logValues(kv ...string) url.Values {
	v := url.Values{"composition": {"Al63Cu25Fe12"}, "mass": {"10 g"}, "operator": {"T. Ingram"}, "prefix": {"ZR"},
		"wheel-speed": {"30 m/s"}, "melt-temperature": {"1250 C"}, "ejection-pressure": {"25 kPa"}, "thickness": {"30 um"},
		"notes": {"first of the series"}}
	for i := 0; i < len(kv); i += 2 {
		v.Set(kv[i], kv[i+1])
	}
	return v
}

func TestLogFormSaysWhereAndKeepsWhatWasTyped(t *testing.T) {
	nb := mapSamples()
	s := newServer(t, nb)
	fs := openForm(t, s, "/log")
	for _, tc := range []struct {
		name    string
		form    url.Values
		field   string
		message string
	}{
		// The message `meltbook log` gives for the same value (README,
		// run files: `field thickness: "-3um": a length cannot be negative`).
		{"negative thickness", logValues("thickness", "-3um"), "thickness", `&#34;-3um&#34;: a length cannot be negative`},
		{"speed without a unit", logValues("wheel-speed", "30"), "wheel-speed", "neither a surface speed (m/s) nor a rotation rate (rpm)"},
		{"rpm without a wheel diameter", logValues("wheel-speed", "3000 rpm"), "wheel-speed", "needs the wheel diameter"},
		{"no composition", logValues("composition", ""), "composition", "missing: give the nominal composition as weighed out"},
		{"bad composition", logValues("composition", "Al63Cu25Xx12"), "composition", "Xx"},
		{"weighed element not in the melt", logValues("weighed", "Al=4.29g, Ni=1g"), "weighed", "Ni is not in the composition"},
		{"code and prefix", logValues("code", "ZR-0100"), "prefix", "give a code or a prefix to generate one, not both"},
		{"nobody", logValues("operator", ""), "operator", "say who made the melt"},
	} {
		res, body := fs.post(t, s, "/log", tc.form)
		if res.StatusCode != http.StatusUnprocessableEntity {
			t.Errorf("%s: %d, want 422", tc.name, res.StatusCode)
			continue
		}
		if !strings.Contains(body, `id="l-`+tc.field+`-error">`) || !strings.Contains(body, tc.message) {
			t.Errorf("%s: no message %q beside %s", tc.name, tc.message, tc.field)
		}
		for key := range tc.form {
			if v := tc.form.Get(key); key != "form_key" && v != "" && !strings.Contains(body, `name="`+key+`" type="text" value="`+strings.ReplaceAll(v, `"`, "&#34;")+`"`) {
				t.Errorf("%s: the form lost %s = %q", tc.name, key, v)
			}
		}
	}
	if len(nb.created) != 0 {
		t.Fatalf("a refused form logged %d melts", len(nb.created))
	}

	res, _ := fs.post(t, s, "/log", logValues("no-default-loss", "yes", "weighed", "Al=4.2941g, Cu=4.0131g"))
	if res.StatusCode != http.StatusSeeOther || res.Header.Get("Location") != "/runs/ZR-0008?logged=1" {
		t.Fatalf("good run: %d to %q; want 303 to the next ZR code, ZR-0008", res.StatusCode, res.Header.Get("Location"))
	}
	got := nb.created[0]
	if got.who != "T. Ingram" || got.melt.Code != "ZR-0008" || got.melt.TargetMassGrams != 10 || len(got.steps) != 1 {
		t.Fatalf("logged %+v", got)
	}
	w := got.melt.WeighOut
	if len(w) != 3 || w[0].WeighedGrams == nil || *w[0].WeighedGrams != 4.2941 || w[2].WeighedGrams != nil {
		t.Errorf("weigh-out %+v; want Al and Cu weighed as typed", w)
	}
	// SI by definition: 30 um = 3e-5 m, 1250 °C = 1523.15 K, 25 kPa =
	// 25 000 Pa; each keeps the unit typed.
	want := map[string][2]any{"wheel-speed": {30.0, "m/s"}, "thickness": {3e-5, "µm"}, "melt-temperature": {1523.15, "°C"}, "ejection-pressure": {25000.0, "kPa"}}
	for name, w := range want {
		p, ok := got.steps[0].Param(name)
		if !ok || p.SI != w[0] || p.Unit != w[1] {
			t.Errorf("%s = %+v, want %v %s", name, p, w[0], w[1])
		}
	}
	if _, ok := got.steps[0].Param("cooling-rate"); !ok {
		t.Error("no cooling-rate estimate for a ribbon with a thickness")
	}
	_, body := get(t, s, "/runs?sort=code")
	if !strings.Contains(body, `href="/runs/ZR-0008"`) {
		t.Error("the run table does not list the melt just logged")
	}
	_, body = get(t, s, "/runs/ZR-0008?logged=1")
	if !strings.Contains(body, "Logged ZR-0008") {
		t.Error("the run page does not confirm the logging")
	}
}

// storeServer serves a new store notebook holding QX-0001, arc-melted and
// spun to a 25 µm ribbon at 30 m/s with its cooling rate estimated.
func storeServer(t *testing.T) (*web.Server, *store.Store) {
	t.Helper()
	ctx := context.Background()
	st, err := store.Init(ctx, filepath.Join(t.TempDir(), "notebook.db"), storeOptions())
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { st.Close() })
	s := newServer(t, st)
	fs := openForm(t, s, "/log")
	res, body := fs.post(t, s, "/log", url.Values{"code": {"QX-0001"}, "composition": {"Al63Cu25Fe12"}, "mass": {"10 g"}, "operator": {"T. Ingram"},
		"arc-remelts": {"4"}, "wheel-speed": {"30 m/s"}, "thickness": {"25 um"}, "made": {"2031-03-02T09:30"}})
	if res.StatusCode != http.StatusSeeOther {
		t.Fatalf("log QX-0001: %d\n%s", res.StatusCode, body)
	}
	return s, st
}

func TestAmendForm(t *testing.T) {
	s, st := storeServer(t)
	ctx := context.Background()
	fs := openForm(t, s, "/runs/QX-0001")
	rateOf := func() float64 {
		rec, err := st.MeltRecord(ctx, "QX-0001")
		if err != nil || rec.CoolingRateKPerS == nil {
			t.Fatalf("QX-0001: %v", err)
		}
		return *rec.CoolingRateKPerS
	}
	before := rateOf()
	amend := func(kv ...string) (*http.Response, string) {
		v := url.Values{"target": {"step:QX-0001:2"}, "field": {"thickness"}, "value": {"32 um"}, "why": {"measured again"}, "by": {"T. Ingram"}}
		for i := 0; i < len(kv); i += 2 {
			v.Set(kv[i], kv[i+1])
		}
		return fs.post(t, s, "/runs/QX-0001/amend", v)
	}
	for _, tc := range []struct {
		name, field, message string
		kv                   []string
	}{
		{"no reason", "why", "An amendment needs a reason.", []string{"why", ""}},
		{"negative thickness", "value", "a length cannot be negative", []string{"value", "-1 um"}},
		{"unknown field", "field", `&#34;colour&#34; is not a field of a melt-spin step`, []string{"field", "colour"}},
		{"computed value", "field", "is not a field of a melt-spin step", []string{"field", "cooling-rate"}},
		{"unknown melt field", "field", "is not a field of a melt", []string{"target", "melt", "field", "thickness"}},
	} {
		res, body := amend(tc.kv...)
		if res.StatusCode != http.StatusUnprocessableEntity || !strings.Contains(body, `id="a-`+tc.field+`-error">`) || !strings.Contains(body, tc.message) {
			t.Errorf("%s: %d, want 422 with %q beside %s", tc.name, res.StatusCode, tc.message, tc.field)
		}
		if !strings.Contains(body, `<details class="amend-form" id="amend" open>`) {
			t.Errorf("%s: the form does not come back open", tc.name)
		}
	}
	if rateOf() != before {
		t.Fatal("a refused amendment changed the notebook")
	}

	res, _ := amend()
	if res.StatusCode != http.StatusSeeOther || res.Header.Get("Location") != "/runs/QX-0001#history" {
		t.Fatalf("amend thickness: %d to %q", res.StatusCode, res.Header.Get("Location"))
	}
	rec, err := st.MeltRecord(ctx, "QX-0001")
	if err != nil {
		t.Fatal(err)
	}
	th, _ := rec.Samples[0].Steps[1].Param("thickness")
	// 32 µm = 3.2e-5 m.
	if th.SI != 3.2e-5 || th.Unit != "µm" {
		t.Errorf("thickness %+v, want 3.2e-5 m typed in µm", th)
	}
	// Newtonian cooling goes as 1/thickness: a thicker ribbon cools slower.
	if after := rateOf(); !(after < before) {
		t.Errorf("cooling rate %g after thickening from 25 to 32 µm, was %g; want it re-estimated lower", after, before)
	}
	last := rec.History[len(rec.History)-1]
	if last.Who != "T. Ingram" || last.Why != "measured again" || last.Action != "amend" {
		t.Errorf("history %+v", last)
	}

	if res, body := amend("target", "melt", "field", "mass", "value", "10.2 g", "why", "weighed again"); res.StatusCode != http.StatusSeeOther {
		t.Fatalf("amend mass: %d\n%s", res.StatusCode, body)
	}
	if m, _ := st.FindMeltByCode(ctx, "QX-0001"); m.TargetMassGrams != 10.2 {
		t.Errorf("target mass %g, want 10.2 g", m.TargetMassGrams)
	}
	_, body := get(t, s, "/runs/QX-0001")
	if !strings.Contains(body, "weighed again") || !strings.Contains(body, "measured again") {
		t.Error("the history on the run page lacks the reasons")
	}
	// The melt was logged with a made time typed in the form, read in the
	// server's location.
	if m, _ := st.FindMeltByCode(ctx, "QX-0001"); !m.CreatedAt.Equal(time.Date(2031, 3, 2, 9, 30, 0, 0, time.Local)) {
		t.Errorf("made %v", m.CreatedAt)
	}
}

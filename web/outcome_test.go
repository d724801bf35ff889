package web_test

import (
	"net/http"
	"net/url"
	"regexp"
	"strings"
	"testing"
)

func TestOutcomeForm(t *testing.T) {
	s := newServer(t, mapSamples())
	fs := openForm(t, s, "/runs/ZR-6")
	form := func(kv ...string) url.Values {
		v := url.Values{"sample": {"ZR-6"}, "by": {"T. Ingram"}, "evidence": {"sharp peaks at 42.9° and 45.0°"}}
		for i := 0; i < len(kv); i += 2 {
			v.Set(kv[i], kv[i+1])
		}
		return v
	}
	// An approximant without its order: the rule of meltbook.Outcome.
	res, body := fs.post(t, s, "/runs/ZR-6/outcomes", form("kind", "approximant"))
	if res.StatusCode != http.StatusUnprocessableEntity {
		t.Fatalf("approximant without order: %d", res.StatusCode)
	}
	for _, want := range []string{"an approximant needs its order", "<option selected>approximant</option>", `value="sharp peaks at 42.9° and 45.0°"`, `<details class="outcome-form" open>`} {
		if !strings.Contains(body, want) {
			t.Errorf("failed outcome form lacks %q", want)
		}
	}
	res, body = fs.post(t, s, "/runs/ZR-6/outcomes", form("kind", "icosahedral", "fraction", "150"))
	if res.StatusCode != http.StatusUnprocessableEntity || !strings.Contains(body, "in percent, 0 to 100") || !strings.Contains(body, `value="150"`) {
		t.Errorf("fraction 150 %%: %d", res.StatusCode)
	}
	res, _ = fs.post(t, s, "/runs/ZR-6/outcomes", form("sample", "ZR-1", "kind", "icosahedral"))
	if res.StatusCode != http.StatusUnprocessableEntity {
		t.Errorf("sample of another melt: %d, want 422", res.StatusCode)
	}
	res, _ = fs.post(t, s, "/runs/ZR-6/outcomes", form("kind", "icosahedral", "lattice", "F", "fraction", "60"))
	if res.StatusCode != http.StatusSeeOther || res.Header.Get("Location") != "/runs/ZR-6#s-ZR-6" {
		t.Fatalf("good outcome: %d to %q", res.StatusCode, res.Header.Get("Location"))
	}
	_, body = get(t, s, "/runs/ZR-6")
	if !strings.Contains(body, "icosahedral (F), 60 %") {
		t.Error("the new outcome is not on the run page")
	}
	_, body = get(t, s, "/map?a=Al&b=Cu&c=Fe")
	if got := counts(markers(figures(t, body)[0])); got["icosahedral"] != 3 || got["undecided"] != 1 {
		t.Errorf("map after the outcome: %v, want 3 icosahedral and 1 undecided", got)
	}
}

func TestProposalDecisions(t *testing.T) {
	s := newServer(t, mapSamples())
	fs := openForm(t, s, "/runs/ZR-7")
	_, body := get(t, s, "/runs/ZR-7")
	m := regexp.MustCompile(`action="(/runs/ZR-7/proposals/\d+)"`).FindStringSubmatch(body)
	if m == nil {
		t.Fatal("the proposal on ZR-7 offers no decision")
	}
	action := m[1]
	if res, _ := fs.post(t, s, action, url.Values{"by": {"T. Ingram"}, "decision": {"perhaps"}}); res.StatusCode != http.StatusUnprocessableEntity {
		t.Errorf("unknown decision: %d, want 422", res.StatusCode)
	}
	if res, _ := fs.post(t, s, action, url.Values{"decision": {"confirm"}}); res.StatusCode != http.StatusUnprocessableEntity {
		t.Errorf("decision without a name: %d, want 422", res.StatusCode)
	}
	res, _ := fs.post(t, s, action, url.Values{"by": {"T. Ingram"}, "decision": {"confirm"}, "why": {"five-fold SAED seen"}})
	if res.StatusCode != http.StatusSeeOther {
		t.Fatalf("confirm: %d", res.StatusCode)
	}
	if res, _ := fs.post(t, s, action, url.Values{"by": {"T. Ingram"}, "decision": {"reject"}}); res.StatusCode != http.StatusConflict {
		t.Errorf("deciding twice: %d, want 409", res.StatusCode)
	}
	_, body = get(t, s, "/map?a=Al&b=Cu&c=Fe")
	if got := counts(markers(figures(t, body)[0])); got["icosahedral"] != 3 {
		t.Errorf("map after confirming: %v, want 3 icosahedral", got)
	}
	// An outcome of another melt cannot be decided from this one.
	if res, _ := fs.post(t, s, "/runs/ZR-1/proposals/"+action[strings.LastIndex(action, "/")+1:], url.Values{"by": {"T. Ingram"}, "decision": {"confirm"}}); res.StatusCode != http.StatusNotFound {
		t.Errorf("proposal of another melt: %d, want 404", res.StatusCode)
	}
}

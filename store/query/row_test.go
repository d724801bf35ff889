package query_test

import (
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"testing"
	"time"

	"meltbook"
	"meltbook/store/query"
)

func summary() meltbook.MeltSummary {
	ea, rate, frac := 1.8208, 1.2e6, 0.9
	return meltbook.MeltSummary{
		Code:      "QX-0007",
		CreatedAt: time.Date(2024, 5, 2, 9, 30, 0, 0, time.UTC),
		Operator:  "adaeze",
		Nominal:   []meltbook.ElementFraction{{Element: "Al", Fraction: 0.63}, {Element: "Cu", Fraction: 0.25}, {Element: "Fe", Fraction: 0.12}},
		Scheme:    "raynor",
		EOverA:    &ea, CoolingRateKPerS: &rate,
		Outcomes: []meltbook.Outcome{
			{SampleCode: "QX-0007.a1", Kind: meltbook.Icosahedral, Lattice: "F", Fraction: &frac, Source: meltbook.ByPerson, Status: meltbook.Confirmed},
			{SampleCode: "QX-0007", Kind: meltbook.Crystalline, Name: "β-AlCuFe", Source: meltbook.ByAutomatic, Status: meltbook.Proposed},
		},
	}
}

func TestRowJSON(t *testing.T) {
	b, err := json.Marshal(query.NewRow(summary()))
	if err != nil {
		t.Fatal(err)
	}
	var got map[string]any
	if err := json.Unmarshal(b, &got); err != nil {
		t.Fatal(err)
	}
	// The keys the find command promises.
	for _, k := range []string{"code", "atomic_fractions", "e_over_a", "cooling_rate_K_s", "outcomes"} {
		if _, ok := got[k]; !ok {
			t.Errorf("JSON lacks %q: %s", k, b)
		}
	}
	if af := got["atomic_fractions"].(map[string]any); af["Cu"] != 0.25 {
		t.Errorf("atomic_fractions %v", af)
	}
	oc := got["outcomes"].([]any)[0].(map[string]any)
	if oc["kind"] != "icosahedral" || oc["fraction"] != 0.9 {
		t.Errorf("first outcome %v", oc)
	}
	if got["composition"] != "Al63Cu25Fe12" {
		t.Errorf("composition %v", got["composition"])
	}
	empty, _ := json.Marshal(query.Rows(nil))
	if string(empty) != "[]" {
		t.Errorf("no rows print as %s, want []", empty)
	}
}

func TestWriteCSV(t *testing.T) {
	var buf bytes.Buffer
	s := summary()
	s.Operator = "=cmd"
	if err := query.WriteCSV(&buf, query.Rows([]meltbook.MeltSummary{s})); err != nil {
		t.Fatal(err)
	}
	want := "code,created_at,operator,composition_at_pct,scheme,e_over_a,cooling_rate_K_s,outcomes\n" +
		"QX-0007,2024-05-02T09:30:00Z,'=cmd,Al63Cu25Fe12,raynor,1.8208,1.2e+06,icosahedral F 90% (QX-0007.a1); crystalline β-AlCuFe (QX-0007) proposed\n"
	if buf.String() != want {
		t.Errorf("CSV\n%s\nwant\n%s", buf.String(), want)
	}
}

func ExampleParse() {
	f, err := query.Parse([]query.Term{
		{Name: "outcome", Value: "icosahedral"},
		{Name: "ea", Value: "1.7:1.8"},
		{Name: "system", Value: "Al-Cu-Fe"},
	}, query.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(f.Outcomes, *f.EOverA.Min, *f.EOverA.Max, f.Scheme, f.Elements, f.OnlyElements)
	// Output: [icosahedral] 1.7 1.8 raynor [Al Cu Fe] true
}

func ExampleWriteCSV() {
	ea := 1.8208
	rows := query.Rows([]meltbook.MeltSummary{{
		Code: "QX-0001", CreatedAt: time.Date(2024, 5, 1, 8, 0, 0, 0, time.UTC), Operator: "adaeze",
		Nominal: []meltbook.ElementFraction{{Element: "Al", Fraction: 0.63}, {Element: "Cu", Fraction: 0.25}, {Element: "Fe", Fraction: 0.12}},
		Scheme:  "raynor", EOverA: &ea,
	}})
	if err := query.WriteCSV(os.Stdout, rows); err != nil {
		fmt.Println(err)
	}
	// Output:
	// code,created_at,operator,composition_at_pct,scheme,e_over_a,cooling_rate_K_s,outcomes
	// QX-0001,2024-05-01T08:00:00Z,adaeze,Al63Cu25Fe12,raynor,1.8208,,
}

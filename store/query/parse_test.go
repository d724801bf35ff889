package query_test

import (
	"errors"
	"math"
	"net/url"
	"reflect"
	"strings"
	"testing"
	"time"

	"meltbook"
	"meltbook/store/query"
)

func f64(v float64) *float64 { return &v }

func sameRange(t *testing.T, what string, got *meltbook.Range, min, max *float64) {
	t.Helper()
	if got == nil {
		t.Fatalf("%s: no range", what)
	}
	for _, end := range []struct {
		name      string
		got, want *float64
	}{{"min", got.Min, min}, {"max", got.Max, max}} {
		switch {
		case end.got == nil && end.want == nil:
		case end.got == nil || end.want == nil:
			t.Errorf("%s %s: got %v, want %v", what, end.name, end.got, end.want)
		case math.Abs(*end.got-*end.want) > 1e-12:
			t.Errorf("%s %s: got %g, want %g", what, end.name, *end.got, *end.want)
		}
	}
}

func TestParse(t *testing.T) {
	cet := time.FixedZone("CET", 3600)
	f, err := query.Parse([]query.Term{
		{"outcome", "icosahedral, Approximant"},
		{"outcome", "icosahedral"},
		{"ea", "1.7:1.8"},
		{"scheme", "group"},
		{"system", "Al-Cu-Fe"},
		{"with", "Cu"},
		{"content", "Cu=20:30"},
		{"content", "Fe=:15%"},
		{"rate", "1e5: K/s"},
		{"made", "2024-01-01:2024-06-30"},
		{"by", "adaeze"},
		{"text", "cracked"},
		{"proposals", "yes"},
		{"ea", ""}, // an empty form field is no filter, even repeated
	}, query.Options{Location: cet})
	if err != nil {
		t.Fatal(err)
	}
	if want := []meltbook.PhaseKind{meltbook.Icosahedral, meltbook.Approximant}; !reflect.DeepEqual(f.Outcomes, want) {
		t.Errorf("outcomes %v, want %v (duplicates dropped, case folded)", f.Outcomes, want)
	}
	sameRange(t, "ea", f.EOverA, f64(1.7), f64(1.8))
	if f.Scheme != "group" {
		t.Errorf("scheme %q", f.Scheme)
	}
	if !reflect.DeepEqual(f.Elements, []string{"Al", "Cu", "Fe"}) || !f.OnlyElements {
		t.Errorf("elements %v only %v, want Al Cu Fe exactly", f.Elements, f.OnlyElements)
	}
	if len(f.Fractions) != 2 || f.Fractions[0].Element != "Cu" || f.Fractions[1].Element != "Fe" {
		t.Fatalf("fractions %+v", f.Fractions)
	}
	// at.% → fraction: 20 % = 0.20 (definition of percent).
	sameRange(t, "Cu", &f.Fractions[0].Range, f64(0.20), f64(0.30))
	sameRange(t, "Fe", &f.Fractions[1].Range, nil, f64(0.15))
	sameRange(t, "rate", f.CoolingRateKPerS, f64(1e5), nil)
	// Dates in the given zone; the end day is included, so the range stops
	// at the next midnight.
	if want := time.Date(2024, 1, 1, 0, 0, 0, 0, cet); f.CreatedFrom == nil || !f.CreatedFrom.Equal(want) {
		t.Errorf("from %v, want %v", f.CreatedFrom, want)
	}
	if want := time.Date(2024, 7, 1, 0, 0, 0, 0, cet); f.CreatedBefore == nil || !f.CreatedBefore.Equal(want) {
		t.Errorf("before %v, want %v", f.CreatedBefore, want)
	}
	if f.Operator != "adaeze" || f.Text != "cracked" || !f.IncludeProposals {
		t.Errorf("operator %q text %q proposals %v", f.Operator, f.Text, f.IncludeProposals)
	}
}

func TestParseDefaults(t *testing.T) {
	f, err := query.Parse(nil, query.Options{})
	if err != nil {
		t.Fatal(err)
	}
	want := meltbook.MeltFilter{Scheme: query.DefaultScheme}
	if !reflect.DeepEqual(f, want) {
		t.Errorf("no terms: %+v, want only the default scheme", f)
	}
	f, err = query.Parse([]query.Term{{"with", "Al Pd,Mn"}, {"made", "2024-03-01T10:00..2024-03-01T12:30"}, {"ea", ":1.9"}}, query.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(f.Elements, []string{"Al", "Pd", "Mn"}) || f.OnlyElements {
		t.Errorf("with: %v only %v", f.Elements, f.OnlyElements)
	}
	sameRange(t, "ea", f.EOverA, nil, f64(1.9))
	// A time ending a range covers its minute.
	if want := time.Date(2024, 3, 1, 12, 31, 0, 0, time.UTC); f.CreatedBefore == nil || !f.CreatedBefore.Equal(want) {
		t.Errorf("before %v, want %v", f.CreatedBefore, want)
	}
}

func TestParseErrors(t *testing.T) {
	tests := []struct {
		terms []query.Term
		field string
		words string
	}{
		{[]query.Term{{"colour", "red"}}, "colour", "not a filter"},
		{[]query.Term{{"outcome", "quasicrystal"}}, "outcome", "not a phase kind"},
		{[]query.Term{{"ea", "1.7"}}, "ea", "MIN:MAX"},
		{[]query.Term{{"ea", ":"}}, "ea", "no ends"},
		{[]query.Term{{"ea", "1.9:1.7"}}, "ea", "lower end exceeds"},
		{[]query.Term{{"ea", "NaN:2"}}, "ea", "not a number"},
		{[]query.Term{{"ea", "1.7:1.8"}, {"ea", "1.6:1.9"}}, "ea", "given twice"},
		{[]query.Term{{"with", "CU"}}, "with", "not an element"},
		{[]query.Term{{"with", ",,"}}, "with", "no element"},
		{[]query.Term{{"system", "Al-Cu-Fe"}, {"with", "Pd"}}, "with", "not in the system"},
		{[]query.Term{{"content", "Cu20:30"}}, "content", "EL=MIN:MAX"},
		{[]query.Term{{"content", "Cu=20:130"}}, "content", "0..100"},
		{[]query.Term{{"content", "Cu=20:30"}, {"content", "Cu=1:2"}}, "content", "twice"},
		{[]query.Term{{"rate", "fast"}}, "rate", "not a range"},
		{[]query.Term{{"made", "2024-13-01:"}}, "made", "not a date"},
		{[]query.Term{{"made", "2024-06-01:2024-01-01"}}, "made", "after the end"},
		{[]query.Term{{"made", "2024-06-01T10:00:2024-06-02"}}, "made", "FROM..TO"},
		{[]query.Term{{"proposals", "perhaps"}}, "proposals", "yes or no"},
		{[]query.Term{{"scheme", "my scheme"}}, "scheme", "not a scheme name"},
	}
	for _, tc := range tests {
		t.Run(tc.field+" "+tc.words, func(t *testing.T) {
			_, err := query.Parse(tc.terms, query.Options{})
			var e *meltbook.Error
			if !errors.As(err, &e) {
				t.Fatalf("got %v, want a *meltbook.Error", err)
			}
			if e.Kind != meltbook.Invalid || e.Field != tc.field || !strings.Contains(e.Message, tc.words) {
				t.Errorf("got %s %q: %q, want invalid %q mentioning %q", e.Kind, e.Field, e.Message, tc.field, tc.words)
			}
		})
	}
}

func TestTerms(t *testing.T) {
	v := url.Values{"ea": {"1.7:1.8"}, "page": {"2"}, "outcome": {"icosahedral", ""}, "sort": {"ea"}}
	got := query.Terms(v)
	want := []query.Term{{"outcome", "icosahedral"}, {"ea", "1.7:1.8"}}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("Terms = %v, want %v (known names in field order, empty values and other keys dropped)", got, want)
	}
}

func TestFieldsDistinct(t *testing.T) {
	seen := map[string]bool{}
	for _, f := range query.Fields() {
		if seen[f.Name] || f.Help == "" || f.Example == "" || f.Label == "" {
			t.Errorf("field %+v repeated or undocumented", f)
		}
		seen[f.Name] = true
		// Every example must read.
		if _, err := query.Parse([]query.Term{{f.Name, f.Example}}, query.Options{}); err != nil {
			t.Errorf("example of %s does not read: %v", f.Name, err)
		}
	}
	for _, fixed := range []string{"outcome", "ea"} {
		if !seen[fixed] {
			t.Errorf("filter %q is missing", fixed)
		}
	}
}

func FuzzParse(f *testing.F) {
	for _, fl := range query.Fields() {
		f.Add(fl.Name, fl.Example)
	}
	f.Add("ea", "-1e308:1e308")
	f.Add("made", "2024-01-01T00:00:00Z..")
	f.Add("content", "Cu=:")
	f.Add("system", "-")
	f.Fuzz(func(t *testing.T, name, value string) {
		fl, err := query.Parse([]query.Term{{name, value}}, query.Options{})
		if err != nil {
			var e *meltbook.Error
			if !errors.As(err, &e) || e.Kind != meltbook.Invalid || e.Field == "" {
				t.Fatalf("error %v is not an Invalid *meltbook.Error naming its filter", err)
			}
			return
		}
		if err := fl.Validate(); err != nil {
			t.Fatalf("Parse(%q=%q) returned a filter that fails Validate: %v", name, value, err)
		}
	})
}

package store_test

import (
	"context"
	"strings"
	"testing"
	"time"

	"meltbook"
	"meltbook/store"
)

// findNotebook holds eight invented runs whose properties the expected
// results below are read from by hand:
//
//	code     composition        e/a (Raynor) made        by   K/s    outcomes
//	QX-0001  Al65Cu20Fe15       1.751        2026-01-05  ana  1e6    person icosahedral F; notes "bright ribbon"
//	QX-0002  Al63Cu25Fe12       1.8208       2026-01-20  ben  5e5    proposed icosahedral
//	QX-0003  Al62Cu25.5Fe12.5   1.7825       2026-02-03  ana  2e6    person approximant 1/1 + proposed icosahedral
//	QX-0004  Al70Pd20Mn10       (no Pd)      2026-02-10  ben  1e6    person icosahedral F
//	QX-0005  Al60Cu30Fe10       1.834        2026-03-01  cara —      derived .a1: person icosahedral; note "Cracked ..."
//	QX-0006  Al70Cu30           2.4          2026-03-15  ana  3e6    person crystalline; notes "wheel at 50% speed"
//	QX-0007  Al64Cu20Fe15Si1    1.761        2026-04-01  ana  8e5    rejected icosahedral
//	QX-0008  Al55Cu25Fe20       1.368        2026-04-10  ben  1.5e6  confirmed automatic icosahedral
//
// e/a by hand from the Raynor valences in testValences, e.g. QX-0002:
// 0.63·3 + 0.25·1 + 0.12·(−2.66) = 1.8208.
func findNotebook(t *testing.T) *store.Store {
	t.Helper()
	ctx := context.Background()
	s := MustOpen(t)
	day := func(m time.Month, d int) time.Time { return time.Date(2026, m, d, 10, 0, 0, 0, time.UTC) }
	type run struct {
		code     string
		nominal  []meltbook.ElementFraction
		made     time.Time
		operator string
		cooling  float64 // 0: no melt-spin step
		notes    string
	}
	runs := []run{
		{"QX-0001", fractions("Al", 0.65, "Cu", 0.20, "Fe", 0.15), day(1, 5), "ana", 1e6, "bright ribbon"},
		{"QX-0002", fractions("Al", 0.63, "Cu", 0.25, "Fe", 0.12), day(1, 20), "ben", 5e5, ""},
		{"QX-0003", fractions("Al", 0.62, "Cu", 0.255, "Fe", 0.125), day(2, 3), "ana", 2e6, ""},
		{"QX-0004", fractions("Al", 0.70, "Pd", 0.20, "Mn", 0.10), day(2, 10), "ben", 1e6, ""},
		{"QX-0005", fractions("Al", 0.60, "Cu", 0.30, "Fe", 0.10), day(3, 1), "cara", 0, ""},
		{"QX-0006", fractions("Al", 0.70, "Cu", 0.30), day(3, 15), "ana", 3e6, "wheel at 50% speed"},
		{"QX-0007", fractions("Al", 0.64, "Cu", 0.20, "Fe", 0.15, "Si", 0.01), day(4, 1), "ana", 8e5, ""},
		{"QX-0008", fractions("Al", 0.55, "Cu", 0.25, "Fe", 0.20), day(4, 10), "ben", 1.5e6, ""},
	}
	for _, r := range runs {
		m := &meltbook.Melt{Code: r.code, Operator: r.operator, CompositionEntered: r.code, Nominal: r.nominal,
			TargetMassGrams: 10, CreatedAt: r.made, Notes: r.notes}
		steps := []meltbook.ProcessStep{arcMelt()}
		if r.cooling > 0 {
			steps = append(steps, meltSpin(r.cooling))
		}
		if err := s.CreateMelt(ctx, r.operator, m, steps...); err != nil {
			t.Fatal(err)
		}
	}
	must := func(_ any, err error) {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
	}
	ico := meltbook.Outcome{Kind: meltbook.Icosahedral}
	icoF := meltbook.Outcome{Kind: meltbook.Icosahedral, Lattice: "F", Fraction: ptr(0.9)}
	must(s.AddOutcome(ctx, "ana", "QX-0001", icoF))
	must(s.ProposeOutcome(ctx, "indexer", "QX-0002", ico))
	must(s.AddOutcome(ctx, "ana", "QX-0003", meltbook.Outcome{Kind: meltbook.Approximant, Order: "1/1"}))
	must(s.ProposeOutcome(ctx, "indexer", "QX-0003", ico))
	must(s.AddOutcome(ctx, "ben", "QX-0004", icoF))
	must(s.DeriveSample(ctx, "cara", "QX-0005", anneal(), ""))
	must(s.AddOutcome(ctx, "cara", "QX-0005.a1", ico))
	must(s.AddNote(ctx, "cara", "QX-0005.a1", "Cracked during the anneal"))
	must(s.AddOutcome(ctx, "ana", "QX-0006", meltbook.Outcome{Kind: meltbook.Crystalline, Name: "θ-Al2Cu"}))
	p, err := s.ProposeOutcome(ctx, "indexer", "QX-0007", ico)
	must(p, err)
	if err := s.RejectProposal(ctx, "ana", p.ID, "no 5-fold lines"); err != nil {
		t.Fatal(err)
	}
	p, err = s.ProposeOutcome(ctx, "indexer", "QX-0008", ico)
	must(p, err)
	if err := s.ConfirmProposal(ctx, "ben", p.ID, ""); err != nil {
		t.Fatal(err)
	}
	return s
}

func codes(rows []meltbook.MeltSummary) string {
	var out []string
	for _, r := range rows {
		out = append(out, strings.TrimPrefix(r.Code, "QX-000"))
	}
	return strings.Join(out, " ")
}

func TestFindMelts(t *testing.T) {
	ctx := context.Background()
	s := findNotebook(t)
	ico := []meltbook.PhaseKind{meltbook.Icosahedral}
	alCuFe := []string{"Al", "Cu", "Fe"}
	// Valences of a user's own scheme: the Raynor table plus Pd 0 (a
	// fixture value for this test). QX-0004: 0.70·3 + 0 − 0.10·3.66 = 1.734.
	own := map[string]float64{"Al": 3, "Cu": 1, "Si": 4, "Fe": -2.66, "Mn": -3.66, "Pd": 0}
	from, before := time.Date(2026, 2, 1, 0, 0, 0, 0, time.UTC), time.Date(2026, 3, 15, 10, 0, 0, 0, time.UTC)
	for _, c := range []struct {
		name   string
		filter meltbook.MeltFilter
		want   string // melt numbers in order
	}{
		{"all, oldest first", meltbook.MeltFilter{}, "1 2 3 4 5 6 7 8"},
		{"icosahedral, standing", meltbook.MeltFilter{Outcomes: ico}, "1 4 5 8"},
		{"icosahedral with proposals", meltbook.MeltFilter{Outcomes: ico, IncludeProposals: true}, "1 2 4 5 8"},
		{"approximant or crystalline", meltbook.MeltFilter{Outcomes: []meltbook.PhaseKind{meltbook.Approximant, meltbook.Crystalline}}, "3 6"},
		{"all of Al Cu Fe", meltbook.MeltFilter{Elements: alCuFe}, "1 2 3 5 7 8"},
		{"only Al Cu Fe", meltbook.MeltFilter{Elements: alCuFe, OnlyElements: true}, "1 2 3 5 8"},
		{"only Al Cu", meltbook.MeltFilter{Elements: []string{"Cu", "Al", "Cu"}, OnlyElements: true}, "6"},
		{"Cu 0.20..0.25", meltbook.MeltFilter{Fractions: []meltbook.FractionRange{{Element: "Cu", Range: *meltbook.Between(0.20, 0.25)}}}, "1 2 7 8"},
		{"Fe at most 0.12, absent counts", meltbook.MeltFilter{Fractions: []meltbook.FractionRange{{Element: "Fe", Range: *meltbook.AtMost(0.12)}}}, "2 4 5 6"},
		{"Fe at least 0.15", meltbook.MeltFilter{Fractions: []meltbook.FractionRange{{Element: "Fe", Range: *meltbook.AtLeast(0.15)}}}, "1 7 8"},
		{"e/a 1.75..1.80 raynor", meltbook.MeltFilter{Scheme: "raynor", EOverA: meltbook.Between(1.75, 1.80)}, "1 3 7"},
		{"e/a defined under group", meltbook.MeltFilter{Scheme: "group", EOverA: &meltbook.Range{}}, "6"},
		{"e/a same table given by hand", meltbook.MeltFilter{Scheme: "mine", Valences: testValences["raynor"], EOverA: meltbook.Between(1.75, 1.80)}, "1 3 7"},
		{"e/a own table with Pd", meltbook.MeltFilter{Scheme: "mine", Valences: own, EOverA: meltbook.Between(1.70, 1.76)}, "1 4"},
		{"cooling at least 1e6 K/s", meltbook.MeltFilter{CoolingRateKPerS: meltbook.AtLeast(1e6)}, "1 3 4 6 8"},
		{"cooling 5e5..1e6", meltbook.MeltFilter{CoolingRateKPerS: meltbook.Between(5e5, 1e6)}, "1 2 4 7"},
		{"made in a date range", meltbook.MeltFilter{CreatedFrom: &from, CreatedBefore: &before}, "3 4 5"},
		{"operator", meltbook.MeltFilter{Operator: "ana"}, "1 3 6 7"},
		{"text in melt notes", meltbook.MeltFilter{Text: "RIBBON"}, "1"},
		{"text in a sample's note", meltbook.MeltFilter{Text: "cracked"}, "5"},
		{"text with a LIKE wildcard", meltbook.MeltFilter{Text: "0%"}, "6"},
		{"underscore is literal", meltbook.MeltFilter{Text: "_"}, ""},
		{"elements, e/a and cooling", meltbook.MeltFilter{Elements: alCuFe, Scheme: "raynor", EOverA: meltbook.Between(1.75, 1.85), CoolingRateKPerS: meltbook.AtLeast(1e6)}, "1 3"},
		{"icosahedral by ben", meltbook.MeltFilter{Outcomes: ico, Operator: "ben"}, "4 8"},
		{"icosahedral, Cu range, cooling, proposals", meltbook.MeltFilter{Outcomes: ico, IncludeProposals: true,
			Fractions: []meltbook.FractionRange{{Element: "Cu", Range: *meltbook.Between(0.2, 0.3)}}, CoolingRateKPerS: meltbook.AtMost(1e6)}, "1 2"},
		{"sorted by e/a, no e/a last", meltbook.MeltFilter{Scheme: "raynor", Sort: meltbook.SortEOverA}, "8 1 7 3 2 5 6 4"},
		{"sorted by e/a descending", meltbook.MeltFilter{Scheme: "raynor", Sort: meltbook.SortEOverA, Descending: true}, "6 5 2 3 7 1 8 4"},
		{"sorted by cooling rate", meltbook.MeltFilter{Sort: meltbook.SortCoolingRate}, "2 7 1 4 8 3 6 5"},
		{"newest first", meltbook.MeltFilter{Descending: true}, "8 7 6 5 4 3 2 1"},
		{"a page", meltbook.MeltFilter{Sort: meltbook.SortCode, Limit: 3, Offset: 3}, "4 5 6"},
		{"past the end", meltbook.MeltFilter{Offset: 8}, ""},
	} {
		t.Run(c.name, func(t *testing.T) {
			rows, total, err := s.FindMelts(ctx, c.filter)
			if err != nil {
				t.Fatal(err)
			}
			if got := codes(rows); got != c.want {
				t.Fatalf("melts %q; want %q", got, c.want)
			}
			wantTotal := len(strings.Fields(c.want))
			if c.filter.Limit > 0 || c.filter.Offset > 0 {
				wantTotal = 8
			}
			if total != wantTotal {
				t.Fatalf("total %d; want %d", total, wantTotal)
			}
		})
	}
}

func TestFindMeltsRows(t *testing.T) {
	ctx := context.Background()
	s := findNotebook(t)
	rows, _, err := s.FindMelts(ctx, meltbook.MeltFilter{Scheme: "raynor", Outcomes: []meltbook.PhaseKind{meltbook.Icosahedral}, IncludeProposals: true})
	if err != nil {
		t.Fatal(err)
	}
	r := rows[0]
	if r.Code != "QX-0001" || r.Operator != "ana" || r.Scheme != "raynor" || r.EOverA == nil || abs(*r.EOverA-1.751) > 1e-12 ||
		r.CoolingRateKPerS == nil || *r.CoolingRateKPerS != 1e6 || !r.CreatedAt.Equal(time.Date(2026, 1, 5, 10, 0, 0, 0, time.UTC)) {
		t.Fatalf("row %+v", r)
	}
	if len(r.Nominal) != 3 || r.Nominal[1] != (meltbook.ElementFraction{Element: "Cu", Fraction: 0.20}) {
		t.Fatalf("nominal %+v", r.Nominal)
	}
	if len(r.Outcomes) != 1 || r.Outcomes[0].Kind != meltbook.Icosahedral || r.Outcomes[0].Lattice != "F" ||
		*r.Outcomes[0].Fraction != 0.9 || r.Outcomes[0].Source != meltbook.ByPerson || r.Outcomes[0].SampleCode != "QX-0001" {
		t.Fatalf("outcomes %+v", r.Outcomes)
	}
	// QX-0002: a pending proposal, shown because proposals were asked for.
	if o := rows[1].Outcomes; len(o) != 1 || o[0].Status != meltbook.Proposed {
		t.Fatalf("QX-0002 outcomes %+v", o)
	}
	// QX-0004 has no e/a under Raynor's table (no Pd).
	if rows[2].Code != "QX-0004" || rows[2].EOverA != nil {
		t.Fatalf("row %+v", rows[2])
	}
	// QX-0005: the outcome is on the derived sample.
	if o := rows[3].Outcomes; len(o) != 1 || o[0].SampleCode != "QX-0005.a1" {
		t.Fatalf("QX-0005 outcomes %+v", o)
	}
	// Without proposals asked for, QX-0003 shows only the person's outcome,
	// and rejected ones never show.
	rows, _, _ = s.FindMelts(ctx, meltbook.MeltFilter{Operator: "ana"})
	for _, r := range rows {
		for _, o := range r.Outcomes {
			if o.Status != meltbook.Confirmed {
				t.Fatalf("%s shows outcome %+v", r.Code, o)
			}
		}
	}
}

func TestFindMeltsRefusesBadFilters(t *testing.T) {
	s := MustOpen(t)
	for _, c := range []struct {
		filter meltbook.MeltFilter
		field  string
	}{
		{meltbook.MeltFilter{EOverA: meltbook.Between(1.7, 1.8)}, "scheme"},
		{meltbook.MeltFilter{Scheme: "hume", EOverA: meltbook.Between(1.7, 1.8)}, "scheme"},
		{meltbook.MeltFilter{Scheme: "raynor", EOverA: meltbook.Between(1.8, 1.7)}, "e/a"},
		{meltbook.MeltFilter{Fractions: []meltbook.FractionRange{{Element: "Cu", Range: *meltbook.Between(0.2, 1.5)}}}, "fraction.Cu"},
		{meltbook.MeltFilter{OnlyElements: true}, "only"},
		{meltbook.MeltFilter{Outcomes: []meltbook.PhaseKind{"quasi"}}, "outcome"},
		{meltbook.MeltFilter{Sort: "colour"}, "sort"},
		{meltbook.MeltFilter{Limit: -1}, "limit"},
	} {
		_, _, err := s.FindMelts(context.Background(), c.filter)
		wantKind(t, err, meltbook.Invalid, c.field)
	}
}

package store_test

import (
	"bytes"
	"context"
	"database/sql"
	"encoding/json"
	"fmt"
	"path/filepath"
	"strings"
	"testing"

	"meltbook"
	"meltbook/store"
)

// fillNotebook writes one of everything the notebook holds.
func fillNotebook(t testing.TB, s *store.Store) {
	t.Helper()
	ctx := context.Background()
	who := "Ines Marlow"
	must := func(err error) {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
	}
	m := newMelt("QX-0001")
	m.MassAfterMeltGrams = ptr(7.97)
	must(s.CreateMelt(ctx, who, m, arcMelt(), meltSpin(1.1e6)))
	m2 := newMelt("QX-0002")
	m2.Nominal = fractions("Al", 0.70, "Pd", 0.20, "Mn", 0.10)
	m2.CompositionEntered = "Al-20Pd-10Mn"
	m2.WeighOut = nil
	must(s.CreateMelt(ctx, "Jon Pell", m2, meltSpin(4e5)))
	a1, err := s.DeriveSample(ctx, who, "QX-0001", anneal(), "ribbon piece")
	must(err)
	a11, err := s.DeriveSample(ctx, who, a1.Code, anneal(), "")
	must(err)
	_, err = s.AddStep(ctx, who, a11.Code, meltbook.ProcessStep{Kind: meltbook.OtherStep, Params: []meltbook.Param{{Name: "description", Text: "crushed for XRD"}}, Notes: "agate mortar"})
	must(err)
	_, err = s.AddMeasuredComposition(ctx, who, a1.Code, meltbook.MeasuredComposition{Method: "ICP-OES",
		Fractions: fractions("Al", 0.651, "Cu", 0.198, "Fe", 0.151), Uncertainty: fractions("Cu", 0.002), Notes: "two digestions"})
	must(err)
	_, err = s.AddSymmetryObservation(ctx, who, a1.Code, meltbook.SymmetryObservation{Folds: []int{5, 3, 2}})
	must(err)
	o, err := s.AddOutcome(ctx, who, a1.Code, meltbook.Outcome{Kind: meltbook.Icosahedral, Lattice: "F", Fraction: ptr(0.95), Evidence: "all peaks indexed"})
	must(err)
	_, err = s.AddOutcome(ctx, who, "QX-0002", meltbook.Outcome{Kind: meltbook.Crystalline, Name: "λ-Al13Fe4"})
	must(err)
	p, err := s.ProposeOutcome(ctx, "meltbook indexing", a11.Code, meltbook.Outcome{Kind: meltbook.Approximant, Order: "2/1", Lattice: "P"})
	must(err)
	must(s.ConfirmProposal(ctx, who, p.ID, "matches the strong lines"))
	_, err = s.ProposeOutcome(ctx, "meltbook indexing", "QX-0002", meltbook.Outcome{Kind: meltbook.Decagonal})
	must(err)
	n, err := s.AddNote(ctx, who, a1.Code, "brittle after anneal")
	must(err)
	_, err = s.AddNote(ctx, "Jon Pell", "QX-0002", "wheel slipped at the start; 50% of the ribbon is thick")
	must(err)
	_, err = s.AmendOutcome(ctx, who, o.ID, meltbook.OutcomeUpdate{Fraction: ptr(0.9)}, "second phase seen")
	must(err)
	_, err = s.AmendNote(ctx, who, n.ID, meltbook.NoteUpdate{Text: ptr("brittle after the anneal")}, "wording")
	must(err)
	_, err = s.AmendMelt(ctx, who, "QX-0001", meltbook.MeltUpdate{WeighOut: []meltbook.WeighOutLine{
		{Element: "Al", PlannedGrams: 3.91, WeighedGrams: ptr(3.912), PurityPercent: 99.99, LossPercent: 0.5},
		{Element: "Cu", PlannedGrams: 2.84, WeighedGrams: ptr(2.841), PurityPercent: 99.99},
		{Element: "Fe", PlannedGrams: 1.87, WeighedGrams: ptr(1.869), PurityPercent: 99.95},
	}}, "weighed")
	must(err)
}

func TestExportImportRoundTrip(t *testing.T) {
	ctx := context.Background()
	src := MustOpen(t)
	fillNotebook(t, src)
	first := export(t, src)

	dst := MustOpen(t)
	if err := dst.Import(ctx, "Kai Ostrow", bytes.NewReader(first)); err != nil {
		t.Fatal(err)
	}
	second := export(t, dst)
	if !bytes.Equal(first, second) {
		t.Fatalf("round trip differs:\n%s\n----\n%s", first, second)
	}
	// What is derived is rebuilt: e/a, cooling rate, the record.
	a, _ := src.MeltRecord(ctx, "QX-0001")
	b, _ := dst.MeltRecord(ctx, "QX-0001")
	ja, _ := json.Marshal(a)
	jb, _ := json.Marshal(b)
	if !bytes.Equal(ja, jb) {
		t.Fatalf("records differ:\n%s\n%s", ja, jb)
	}
	if b.CoolingRateKPerS == nil || *b.CoolingRateKPerS != 1.1e6 || abs(b.EOverA["raynor"]-1.751) > 1e-12 {
		t.Fatalf("derived values after import: %v %v", b.CoolingRateKPerS, b.EOverA)
	}
	// Ids are kept, so a history row still names its row.
	if _, err := dst.AmendNote(ctx, "Kai Ostrow", b.Notes[0].ID, meltbook.NoteUpdate{Text: ptr("brittle")}, "shorter"); err != nil {
		t.Fatal(err)
	}

	// A second import into a notebook that is not empty is refused.
	before := export(t, dst)
	wantKind(t, dst.Import(ctx, "Kai Ostrow", bytes.NewReader(first)), meltbook.Conflict, "notebook")
	if !bytes.Equal(before, export(t, dst)) {
		t.Fatal("a refused import changed the notebook")
	}
}

func TestImportRefusesBadDocuments(t *testing.T) {
	ctx := context.Background()
	src := MustOpen(t)
	fillNotebook(t, src)
	good := string(export(t, src))
	for _, c := range []struct {
		name, doc string
		kind      meltbook.ErrorKind
		field     string
	}{
		{"not JSON", "{\n  \"format\": \"meltbook-notebook\",\n  \"version\": 1,\n  \"melts\": [\n    {,\n", meltbook.Invalid, "document line 5, column 6"},
		{"unknown field", strings.Replace(good, `"label": "ribbon piece"`, `"lable": "ribbon piece"`, 1), meltbook.Invalid, ""},
		{"other format", strings.Replace(good, `"format": "meltbook-notebook"`, `"format": "spreadsheet"`, 1), meltbook.Invalid, "format"},
		{"newer version", strings.Replace(good, fmt.Sprintf(`"version": %d`, store.DocumentVersion), `"version": 7`, 1), meltbook.Conflict, "version"},
		{"bad step", strings.Replace(good, `"name": "wheel-speed",
                  "si": 30`, `"name": "wheel-speed",
                  "si": -30`, 1), meltbook.Invalid, "melts[0].samples[0].steps[1].melt-spin.wheel-speed"},
		{"bad fraction", strings.Replace(good, `"fraction": 0.65`, `"fraction": 0.75`, 1), meltbook.Invalid, "melts[0].composition"},
		{"duplicate id", strings.Replace(good, `"id": 2,
      "code": "QX-0002"`, `"id": 1,
      "code": "QX-0002"`, 1), meltbook.Invalid, "melts[1].id"},
	} {
		t.Run(c.name, func(t *testing.T) {
			if c.doc == good {
				t.Fatal("the test's replacement did not apply")
			}
			dst := MustOpen(t)
			wantKind(t, dst.Import(ctx, "Kai Ostrow", strings.NewReader(c.doc)), c.kind, c.field)
			if _, total, _ := dst.FindMelts(ctx, meltbook.MeltFilter{}); total != 0 {
				t.Fatal("a refused import left melts behind")
			}
		})
	}
}

func TestHistoryIsAppendOnly(t *testing.T) {
	s := MustOpen(t)
	if err := s.CreateMelt(context.Background(), "Ines Marlow", newMelt("QX-0001")); err != nil {
		t.Fatal(err)
	}
	db, err := sql.Open("sqlite", filepath.Clean(s.Path()))
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	if _, err := db.Exec("UPDATE history SET why = 'tidying'"); err == nil {
		t.Fatal("a history row was updated")
	}
	if _, err := db.Exec("DELETE FROM history"); err == nil {
		t.Fatal("history rows were deleted")
	}
}

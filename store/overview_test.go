package store_test

import (
	"context"
	"fmt"
	"path/filepath"
	"testing"
	"time"

	"meltbook"
	"meltbook/store"
	"meltbook/store/storetest"
)

// overviewNotebook records, by the store's own methods:
//
//	QX-0001        arc-melt, melt-spin at 1.2e6 K/s; measured twice (ICP-OES
//	               dated 1 June, recorded first; EDS dated 20 May)
//	QX-0001.a1     annealed piece; a proposal, then a person's outcome
//	QX-0001.a1.s1  that piece spun again, at 3e5 K/s
//	QX-0002        arc-melted only
//	QX-0003        arc-melt, melt-spin without an estimate, anneal, all on
//	               the melt's own sample (as a run sheet records it)
func overviewNotebook(t *testing.T) *store.Store {
	t.Helper()
	ctx := context.Background()
	s := MustOpen(t)
	must := func(err error) {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
	}
	must(s.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001"), arcMelt(), meltSpin(1.2e6)))
	_, err := s.AddMeasuredComposition(ctx, "Jon Pell", "QX-0001", meltbook.MeasuredComposition{Method: "ICP-OES",
		Fractions: fractions("Al", 0.645, "Cu", 0.205, "Fe", 0.15), At: time.Date(2026, 6, 1, 9, 0, 0, 0, time.UTC)})
	must(err)
	_, err = s.AddMeasuredComposition(ctx, "Jon Pell", "QX-0001", meltbook.MeasuredComposition{Method: "EDS",
		Fractions: fractions("Al", 0.64, "Cu", 0.21, "Fe", 0.15), At: time.Date(2026, 5, 20, 9, 0, 0, 0, time.UTC)})
	must(err)
	_, err = s.DeriveSample(ctx, "Ines Marlow", "QX-0001", anneal(), "")
	must(err)
	_, err = s.ProposeOutcome(ctx, "meltbook indexing", "QX-0001.a1", meltbook.Outcome{Kind: meltbook.Icosahedral, Lattice: "F"})
	must(err)
	_, err = s.AddOutcome(ctx, "Ines Marlow", "QX-0001.a1", meltbook.Outcome{Kind: meltbook.Crystalline, Name: "λ-Al13Fe4"})
	must(err)
	_, err = s.DeriveSample(ctx, "Ines Marlow", "QX-0001.a1", meltSpin(3e5), "")
	must(err)
	must(s.CreateMelt(ctx, "Kai Ostrow", newMelt("QX-0002"), arcMelt()))
	spun := meltSpin(0)
	spun.Params = spun.Params[:3] // no cooling-rate estimate
	must(s.CreateMelt(ctx, "Kai Ostrow", newMelt("QX-0003"), arcMelt(), spun, anneal()))
	return s
}

func TestMapSamples(t *testing.T) {
	s := overviewNotebook(t)
	got, err := s.MapSamples(context.Background())
	if err != nil {
		t.Fatal(err)
	}
	type want struct {
		code, melt string
		comp       string
		measured   bool
		rate       string
		annealed   bool
		outcomes   string
	}
	show := func(r *float64) string {
		if r == nil {
			return "none"
		}
		return fmt.Sprint(*r)
	}
	// Values as recorded above; the ICP-OES measurement is the later one by
	// date although it was recorded first.
	icp := "[{Al 0.645} {Cu 0.205} {Fe 0.15}]"
	nominal := "[{Al 0.65} {Cu 0.2} {Fe 0.15}]"
	wants := []want{
		{"QX-0001", "QX-0001", icp, true, "1.2e+06", false, ""},
		{"QX-0001.a1", "QX-0001", icp, true, "1.2e+06", true, "crystalline/person icosahedral/proposed"},
		{"QX-0001.a1.s1", "QX-0001", icp, true, "300000", false, ""},
		{"QX-0002", "QX-0002", nominal, false, "none", false, ""},
		{"QX-0003", "QX-0003", nominal, false, "none", true, ""},
	}
	if len(got) != len(wants) {
		t.Fatalf("%d samples, want %d: %+v", len(got), len(wants), got)
	}
	for i, w := range wants {
		g := got[i]
		outcomes := ""
		for j, o := range g.Outcomes {
			if j > 0 {
				outcomes += " "
			}
			if o.Source == meltbook.ByPerson {
				outcomes += string(o.Kind) + "/person"
			} else {
				outcomes += string(o.Kind) + "/" + string(o.Status)
			}
		}
		if g.Code != w.code || g.Melt != w.melt || fmt.Sprint(g.Composition) != w.comp || g.Measured != w.measured ||
			show(g.CoolingRateKPerS) != w.rate || g.Annealed != w.annealed || outcomes != w.outcomes {
			t.Errorf("sample %d: got %s of %s, %v measured %v, rate %s, annealed %v, outcomes %q\nwant %+v",
				i, g.Code, g.Melt, g.Composition, g.Measured, show(g.CoolingRateKPerS), g.Annealed, outcomes, w)
		}
	}
}

func TestSampleMelt(t *testing.T) {
	s := overviewNotebook(t)
	ctx := context.Background()
	for code, melt := range map[string]string{"QX-0001.a1.s1": "QX-0001", "QX-0001": "QX-0001", "QX-0002": "QX-0002"} {
		if got, err := s.SampleMelt(ctx, code); err != nil || got != melt {
			t.Errorf("SampleMelt(%s) = %q, %v; want %s", code, got, err, melt)
		}
	}
	_, err := s.SampleMelt(ctx, "QX-0001.a9")
	wantKind(t, err, meltbook.NotFound, "sample")
}

func TestSummary(t *testing.T) {
	ctx := context.Background()
	empty, err := MustOpen(t).Summary(ctx)
	if err != nil || empty.Melts != 0 || empty.Samples != 0 || empty.Recent == nil || len(empty.Recent) != 0 {
		t.Fatalf("empty notebook: %+v, %v; want zero counts and an empty list", empty, err)
	}
	s := overviewNotebook(t)
	sum, err := s.Summary(ctx)
	if err != nil {
		t.Fatal(err)
	}
	if sum.Melts != 3 || sum.Samples != 5 {
		t.Errorf("counts %+v; want 3 melts and 5 samples", sum)
	}
	if len(sum.Recent) != store.RecentChanges {
		t.Fatalf("%d recent changes, want %d", len(sum.Recent), store.RecentChanges)
	}
	// The last write was QX-0003 with its sample and three steps: five
	// rows, all "create", listed newest first.
	for i, h := range sum.Recent {
		if i > 0 && h.ID >= sum.Recent[i-1].ID {
			t.Errorf("recent changes not newest first: %d after %d", h.ID, sum.Recent[i-1].ID)
		}
	}
	var last []string
	for _, h := range sum.Recent[:5] {
		last = append(last, h.MeltCode+" "+h.Entity)
	}
	if fmt.Sprint(last) != "[QX-0003 step QX-0003 step QX-0003 step QX-0003 sample QX-0003 melt]" {
		t.Errorf("latest changes %v", last)
	}
}

// TestMapSamplesSeeEveryChange reads the samples, changes the notebook
// through this store and through another one on the same file (as another
// program would), and reads again.
func TestMapSamplesSeeEveryChange(t *testing.T) {
	ctx := context.Background()
	s := overviewNotebook(t)
	before, err := s.MapSamples(ctx)
	if err != nil || len(before[3].Outcomes) != 0 {
		t.Fatalf("QX-0002 before: %+v, %v", before[3], err)
	}
	if _, err := s.AddOutcome(ctx, "Kai Ostrow", "QX-0002", meltbook.Outcome{Kind: meltbook.Amorphous}); err != nil {
		t.Fatal(err)
	}
	after, err := s.MapSamples(ctx)
	if err != nil || len(after[3].Outcomes) != 1 || after[3].Outcomes[0].Kind != meltbook.Amorphous {
		t.Fatalf("QX-0002 after its outcome: %+v, %v", after[3], err)
	}

	other, err := store.Open(ctx, s.Path(), store.Options{Valences: testValences})
	if err != nil {
		t.Fatal(err)
	}
	if err := other.CreateMelt(ctx, "Lena Fitch", newMelt("QX-0004"), arcMelt(), meltSpin(4e5)); err != nil {
		t.Fatal(err)
	}
	if err := other.Close(); err != nil {
		t.Fatal(err)
	}
	again, err := s.MapSamples(ctx)
	if err != nil || len(again) != 6 || again[5].Code != "QX-0004" || again[5].CoolingRateKPerS == nil || *again[5].CoolingRateKPerS != 4e5 {
		t.Fatalf("after another program logged QX-0004: %d samples, %v", len(again), err)
	}
}

// BenchmarkMapSamples reads 10,000 samples (6,250 melts, about 60 % with
// an annealed piece, a third of the samples measured): the store's share of
// drawing a composition map of that size, just after a change (read from
// the file) and with the notebook unchanged (kept from the last read).
func BenchmarkMapSamples(b *testing.B) {
	ctx := context.Background()
	path := filepath.Join(b.TempDir(), "notebook.db")
	if err := storetest.Generate(ctx, path, storetest.Options{Melts: 6250, AnnealedShare: 0.6, MeasuredShare: 0.33,
		Store: store.Options{Valences: testValences}}); err != nil {
		b.Fatal(err)
	}
	s, err := store.Open(ctx, path, store.Options{Valences: testValences})
	if err != nil {
		b.Fatal(err)
	}
	defer s.Close()
	read := func(b *testing.B) {
		got, err := s.MapSamples(ctx)
		if err != nil {
			b.Fatal(err)
		}
		b.ReportMetric(float64(len(got)), "samples")
	}
	b.Run("after-a-change", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			b.StopTimer()
			if _, err := s.AddNote(ctx, "Ines Marlow", "GEN-000001", "weighed again"); err != nil {
				b.Fatal(err)
			}
			b.StartTimer()
			read(b)
		}
	})
	b.Run("unchanged", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			read(b)
		}
	})
}

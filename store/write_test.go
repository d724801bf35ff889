package store_test

import (
	"bytes"
	"context"
	"errors"
	"strings"
	"sync"
	"testing"
	"time"

	"meltbook"
	"meltbook/store"
)

func TestCreateMelt(t *testing.T) {
	ctx := context.Background()
	s := MustOpen(t)
	m := newMelt("QX-0001")
	if err := s.CreateMelt(ctx, "Ines Marlow", m, arcMelt(), meltSpin(1.2e6)); err != nil {
		t.Fatal(err)
	}
	if m.ID == 0 || m.CreatedAt.IsZero() {
		t.Fatalf("CreateMelt did not fill in the id and time: %+v", m)
	}
	r, err := s.MeltRecord(ctx, "QX-0001")
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Samples) != 1 || r.Samples[0].Code != "QX-0001" || r.Samples[0].ParentCode != "" {
		t.Fatalf("samples %+v; want the melt's own sample QX-0001", r.Samples)
	}
	steps := r.Samples[0].Steps
	if len(steps) != 2 || steps[0].Kind != meltbook.ArcMelt || steps[0].Seq != 1 || steps[1].Kind != meltbook.MeltSpin || steps[1].Seq != 2 {
		t.Fatalf("steps %+v; want arc-melt then melt-spin, numbered 1 and 2", steps)
	}
	if p, ok := steps[1].Param("thickness"); !ok || p.SI != 25e-6 || p.Unit != "µm" {
		t.Fatalf("thickness %+v; want 25e-6 m entered in µm", p)
	}
	if p, ok := steps[1].Param("wheel-material"); !ok || p.Text != "Cu" {
		t.Fatalf("wheel material %+v", p)
	}
	if steps[0].Operator != m.Operator || !steps[0].At.Equal(m.CreatedAt) {
		t.Fatalf("step defaults: operator %q at %v", steps[0].Operator, steps[0].At)
	}
	if r.CoolingRateKPerS == nil || *r.CoolingRateKPerS != 1.2e6 {
		t.Fatalf("cooling rate %v; want the melt-spin step's 1.2e6 K/s", r.CoolingRateKPerS)
	}
	if len(r.Melt.WeighOut) != 3 || r.Melt.WeighOut[0].WeighedGrams == nil || *r.Melt.WeighOut[0].WeighedGrams != 3.912 || r.Melt.WeighOut[1].WeighedGrams != nil {
		t.Fatalf("weigh-out %+v", r.Melt.WeighOut)
	}
	// One history row per created thing, all with one time and who.
	var kinds []string
	for _, h := range r.History {
		kinds = append(kinds, h.Entity+" "+h.Action)
		if !h.At.Equal(r.History[0].At) || h.Who != "Ines Marlow" || h.MeltCode != "QX-0001" {
			t.Errorf("history row %+v: want one time, who and melt for the whole write", h)
		}
	}
	if got := strings.Join(kinds, ", "); got != "melt create, sample create, step create, step create" {
		t.Fatalf("history %s", got)
	}
}

func TestCreateMeltRefusesBadInput(t *testing.T) {
	ctx := context.Background()
	s := MustOpen(t)
	before := export(t, s)
	m := newMelt("QX-0001")
	m.Nominal = fractions("Al", 0.65, "Cu", 0.20, "Fe", 0.10)
	wantKind(t, s.CreateMelt(ctx, "Ines Marlow", m), meltbook.Invalid, "composition")
	bad := meltSpin(1e6)
	bad.Params[1].SI = -30
	wantKind(t, s.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001"), arcMelt(), bad), meltbook.Invalid, "melt-spin.wheel-speed")
	wantKind(t, s.CreateMelt(ctx, " ", newMelt("QX-0001")), meltbook.Invalid, "who")
	if !bytes.Equal(before, export(t, s)) {
		t.Fatal("a refused melt changed the notebook")
	}
}

func TestExistingCodeConflictLeavesNotebookUnchanged(t *testing.T) {
	ctx := context.Background()
	s := MustOpen(t)
	if err := s.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001"), meltSpin(1e6)); err != nil {
		t.Fatal(err)
	}
	before := export(t, s)
	wantKind(t, s.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001"), arcMelt()), meltbook.Conflict, "code")
	if !bytes.Equal(before, export(t, s)) {
		t.Fatal("a conflicting melt changed the notebook")
	}
}

func TestBatchFailingMidwayLeavesNothing(t *testing.T) {
	ctx := context.Background()
	s := MustOpen(t)
	if err := s.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001")); err != nil {
		t.Fatal(err)
	}
	derived, err := s.DeriveSample(ctx, "Ines Marlow", "QX-0001", anneal(), "")
	if err != nil {
		t.Fatal(err)
	}
	before := export(t, s)
	// The second melt's code is free among melts but taken by a sample, so
	// the melt row is written and its own sample then fails: the whole
	// batch, including the first, complete melt, must vanish.
	batch := []store.NewMelt{
		{Melt: *newMelt("QX-0002"), Steps: []meltbook.ProcessStep{arcMelt(), meltSpin(1e6)},
			Outcomes: []meltbook.Outcome{{Kind: meltbook.Icosahedral, Lattice: "F"}}},
		{Melt: *newMelt(derived.Code), Steps: []meltbook.ProcessStep{arcMelt()}},
		{Melt: *newMelt("QX-0003")},
	}
	err = s.CreateMelts(ctx, "Ines Marlow", batch)
	wantKind(t, err, meltbook.Conflict, "code")
	var ee *store.EntryError
	if !errors.As(err, &ee) || ee.Index != 1 || ee.Code != derived.Code {
		t.Fatalf("error %v; want entry 1 (%s) named", err, derived.Code)
	}
	if !bytes.Equal(before, export(t, s)) {
		t.Fatal("a failed batch left rows behind")
	}
	if _, err := s.FindMeltByCode(ctx, "QX-0002"); meltbook.KindOf(err) != meltbook.NotFound {
		t.Fatalf("QX-0002 after a failed batch: %v", err)
	}
}

func TestOutcomeForMissingSample(t *testing.T) {
	ctx := context.Background()
	s := MustOpen(t)
	if err := s.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001")); err != nil {
		t.Fatal(err)
	}
	before := export(t, s)
	_, err := s.AddOutcome(ctx, "Ines Marlow", "QX-0009", meltbook.Outcome{Kind: meltbook.Icosahedral})
	wantKind(t, err, meltbook.NotFound, "sample")
	_, err = s.AddStep(ctx, "Ines Marlow", "QX-0009", anneal())
	wantKind(t, err, meltbook.NotFound, "sample")
	_, err = s.MeltRecord(ctx, "QX-0009")
	wantKind(t, err, meltbook.NotFound, "melt")
	if !bytes.Equal(before, export(t, s)) {
		t.Fatal("a failed write changed the notebook")
	}
}

// historyTail returns the entity/action/field of the history rows after
// the first n.
func historyTail(t *testing.T, s *store.Store, code string, n int) ([]meltbook.HistoryEntry, string) {
	t.Helper()
	hs, err := s.History(context.Background(), code)
	if err != nil {
		t.Fatal(err)
	}
	var parts []string
	for _, h := range hs[n:] {
		parts = append(parts, strings.TrimSpace(h.Entity+" "+h.Action+" "+h.Field))
	}
	return hs[n:], strings.Join(parts, "; ")
}

func TestEveryWriteIsRecorded(t *testing.T) {
	ctx := context.Background()
	s := MustOpen(t)
	who := "Ines Marlow"
	if err := s.CreateMelt(ctx, who, newMelt("QX-0001"), arcMelt(), meltSpin(1e6)); err != nil {
		t.Fatal(err)
	}
	n := 4 // melt, sample, two steps
	must := func(err error) {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
	}
	type write struct {
		name string
		do   func() error
		want string // entity action field; ...
	}
	var derived *meltbook.Sample
	var step *meltbook.ProcessStep
	var mc *meltbook.MeasuredComposition
	var obs *meltbook.SymmetryObservation
	var mine, proposal, proposal2 *meltbook.Outcome
	var note *meltbook.Note
	writes := []write{
		{"derive", func() (err error) {
			derived, err = s.DeriveSample(ctx, who, "QX-0001", anneal(), "ribbon piece 1")
			return
		},
			"sample create; step create"},
		{"add step", func() (err error) {
			step, err = s.AddStep(ctx, who, derived.Code, meltbook.ProcessStep{Kind: meltbook.OtherStep,
				Params: []meltbook.Param{{Name: "description", Text: "polished"}}})
			return
		}, "step create"},
		{"measure", func() (err error) {
			mc, err = s.AddMeasuredComposition(ctx, who, derived.Code, meltbook.MeasuredComposition{Method: "EDS",
				Fractions:   fractions("Al", 0.648, "Cu", 0.203, "Fe", 0.149),
				Uncertainty: fractions("Al", 0.005, "Fe", 0.003)})
			return
		}, "measurement create"},
		{"observe", func() (err error) {
			obs, err = s.AddSymmetryObservation(ctx, who, derived.Code, meltbook.SymmetryObservation{Folds: []int{2, 3, 5}})
			return
		}, "observation create"},
		{"outcome", func() (err error) {
			mine, err = s.AddOutcome(ctx, who, derived.Code, meltbook.Outcome{Kind: meltbook.Icosahedral, Lattice: "F", Fraction: ptr(0.9)})
			return
		}, "outcome create"},
		{"propose", func() (err error) {
			proposal, err = s.ProposeOutcome(ctx, "meltbook indexing", derived.Code, meltbook.Outcome{Kind: meltbook.Approximant, Order: "1/1", Evidence: "12 of 14 peaks"})
			return
		}, "outcome create"},
		{"propose again", func() (err error) {
			proposal2, err = s.ProposeOutcome(ctx, "meltbook indexing", "QX-0001", meltbook.Outcome{Kind: meltbook.Icosahedral})
			return
		}, "outcome create"},
		{"confirm", func() error { return s.ConfirmProposal(ctx, who, proposal.ID, "peaks match") }, "outcome confirm status"},
		{"reject", func() error { return s.RejectProposal(ctx, who, proposal2.ID, "") }, "outcome reject status"},
		{"note", func() (err error) { note, err = s.AddNote(ctx, who, derived.Code, "cracked during quench"); return }, "note create"},
		{"melt note", func() (err error) { _, err = s.AddNote(ctx, who, "QX-0001", "button looked clean"); return }, "note create"},
		{"amend melt", func() (err error) {
			_, err = s.AmendMelt(ctx, who, "QX-0001", meltbook.MeltUpdate{MassAfterMeltGrams: ptr(7.96), Notes: ptr("re-weighed")}, "scale recalibrated")
			return
		}, "melt amend notes; melt amend mass-after"},
		{"amend sample", func() (err error) {
			_, err = s.AmendSample(ctx, who, derived.Code, meltbook.SampleUpdate{Label: ptr("ribbon piece A")}, "relabelled")
			return
		}, "sample amend label"},
		{"amend step", func() (err error) {
			_, err = s.AmendStep(ctx, who, step.ID, meltbook.StepUpdate{Notes: ptr("by hand")}, "detail")
			return
		}, "step amend notes"},
		{"amend measurement", func() (err error) {
			_, err = s.AmendMeasuredComposition(ctx, who, mc.ID, meltbook.MeasurementUpdate{Method: ptr("WDS")}, "wrong method typed")
			return
		}, "measurement amend method"},
		{"amend observation", func() (err error) {
			_, err = s.AmendSymmetryObservation(ctx, who, obs.ID, meltbook.ObservationUpdate{Folds: []int{2, 3, 5, 10}}, "10-fold seen too")
			return
		}, "observation amend folds"},
		{"amend outcome", func() (err error) {
			_, err = s.AmendOutcome(ctx, who, mine.ID, meltbook.OutcomeUpdate{Fraction: ptr(0.8)}, "second look")
			return
		}, "outcome amend fraction"},
		{"amend note", func() (err error) {
			_, err = s.AmendNote(ctx, who, note.ID, meltbook.NoteUpdate{Text: ptr("cracked during water quench")}, "detail")
			return
		}, "note amend text"},
	}
	for _, w := range writes {
		must(w.do())
		rows, got := historyTail(t, s, "QX-0001", n)
		if got != w.want {
			t.Fatalf("%s: history %q; want %q", w.name, got, w.want)
		}
		n += len(rows)
	}
}

func TestAmendmentNeedsAReason(t *testing.T) {
	ctx := context.Background()
	s := MustOpen(t)
	if err := s.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001"), meltSpin(1e6)); err != nil {
		t.Fatal(err)
	}
	before := export(t, s)
	check := func(err error) {
		t.Helper()
		wantKind(t, err, meltbook.Invalid, "why")
		if !strings.Contains(err.Error(), "an amendment needs a reason") {
			t.Fatalf("message %q", err)
		}
	}
	_, err := s.AmendMelt(ctx, "Ines Marlow", "QX-0001", meltbook.MeltUpdate{Notes: ptr("x")}, "")
	check(err)
	_, err = s.AmendMelt(ctx, "Ines Marlow", "QX-0001", meltbook.MeltUpdate{Notes: ptr("x")}, "  \t")
	check(err)
	_, err = s.AmendSample(ctx, "Ines Marlow", "QX-0001", meltbook.SampleUpdate{Label: ptr("x")}, "")
	check(err)
	_, err = s.AmendStep(ctx, "Ines Marlow", 1, meltbook.StepUpdate{Notes: ptr("x")}, "")
	check(err)
	_, err = s.AmendOutcome(ctx, "Ines Marlow", 1, meltbook.OutcomeUpdate{}, "")
	check(err)
	_, err = s.AmendMeasuredComposition(ctx, "Ines Marlow", 1, meltbook.MeasurementUpdate{}, "")
	check(err)
	_, err = s.AmendSymmetryObservation(ctx, "Ines Marlow", 1, meltbook.ObservationUpdate{}, "")
	check(err)
	_, err = s.AmendNote(ctx, "Ines Marlow", 1, meltbook.NoteUpdate{}, "")
	check(err)
	if !bytes.Equal(before, export(t, s)) {
		t.Fatal("a refused amendment changed the notebook")
	}
}

func TestAmendMeltRecordsBeforeAndAfter(t *testing.T) {
	ctx := context.Background()
	s := MustOpen(t)
	if err := s.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001"), meltSpin(1e6)); err != nil {
		t.Fatal(err)
	}
	// Same values: nothing to amend.
	_, err := s.AmendMelt(ctx, "Jon Pell", "QX-0001", meltbook.MeltUpdate{TargetMassGrams: ptr(8.0)}, "no change")
	wantKind(t, err, meltbook.Invalid, "melt")

	hs, err := s.AmendMelt(ctx, "Jon Pell", "QX-0001", meltbook.MeltUpdate{
		Nominal:            fractions("Al", 0.63, "Cu", 0.25, "Fe", 0.12),
		CompositionEntered: ptr("Al63Cu25Fe12"),
	}, "typed the wrong plan")
	if err != nil {
		t.Fatal(err)
	}
	want := []meltbook.HistoryEntry{
		{Field: "composition", Before: "Al65Cu20Fe15", After: "Al63Cu25Fe12"},
		{Field: "nominal", Before: "Al 0.65, Cu 0.2, Fe 0.15", After: "Al 0.63, Cu 0.25, Fe 0.12"},
	}
	if len(hs) != len(want) {
		t.Fatalf("history %+v", hs)
	}
	for i, h := range hs {
		if h.Field != want[i].Field || h.Before != want[i].Before || h.After != want[i].After ||
			h.Why != "typed the wrong plan" || h.Who != "Jon Pell" || h.Action != "amend" {
			t.Errorf("row %d: %+v; want %+v", i, h, want[i])
		}
	}
	r, _ := s.MeltRecord(ctx, "QX-0001")
	// Al63Cu25Fe12 under Raynor's valences: 0.63·3 + 0.25·1 + 0.12·(−2.66)
	// = 1.8208 (hand arithmetic).
	if got := r.EOverA["raynor"]; abs(got-1.8208) > 1e-12 {
		t.Fatalf("e/a after the amendment %v; want 1.8208", got)
	}
	// The weigh-out rows survive a composition amendment.
	if len(r.Melt.WeighOut) != 3 {
		t.Fatalf("weigh-out %+v", r.Melt.WeighOut)
	}
	// Weighing one element changes one weigh-out line.
	lines := append([]meltbook.WeighOutLine(nil), r.Melt.WeighOut...)
	lines[1].WeighedGrams = ptr(2.841)
	hs, err = s.AmendMelt(ctx, "Jon Pell", "QX-0001", meltbook.MeltUpdate{WeighOut: lines}, "weighed the copper")
	if err != nil {
		t.Fatal(err)
	}
	if len(hs) != 1 || hs[0].Field != "weigh-out.Cu" || hs[0].Before != "planned 2.84 g, not weighed, purity 99.99 %, loss 0 %" ||
		hs[0].After != "planned 2.84 g, weighed 2.841 g, purity 99.99 %, loss 0 %" {
		t.Fatalf("weigh-out history %+v", hs)
	}
	// An amendment that breaks validation is refused.
	_, err = s.AmendMelt(ctx, "Jon Pell", "QX-0001", meltbook.MeltUpdate{Nominal: fractions("Al", 0.5)}, "oops")
	wantKind(t, err, meltbook.Invalid, "composition")
	_, err = s.AmendMelt(ctx, "Jon Pell", "QX-0404", meltbook.MeltUpdate{Notes: ptr("x")}, "why not")
	wantKind(t, err, meltbook.NotFound, "melt")
}

func TestAmendStepParameters(t *testing.T) {
	ctx := context.Background()
	s := MustOpen(t)
	if err := s.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001"), arcMelt(), meltSpin(1e6)); err != nil {
		t.Fatal(err)
	}
	r, _ := s.MeltRecord(ctx, "QX-0001")
	spin := r.Samples[0].Steps[1]
	hs, err := s.AmendStep(ctx, "Ines Marlow", spin.ID, meltbook.StepUpdate{
		Set:   []meltbook.Param{{Name: "cooling-rate", SI: 2.5e6, Unit: "K/s"}, {Name: "gap", SI: 0.3e-3, Unit: "mm"}},
		Unset: []string{"wheel-material"},
	}, "new thickness estimate")
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, h := range hs {
		got = append(got, h.Field+": "+h.Before+" -> "+h.After)
	}
	want := "melt-spin.wheel-material: Cu -> ; melt-spin.cooling-rate: 1e+06 K/s -> 2.5e+06 K/s; melt-spin.gap:  -> 0.0003 m (entered in mm)"
	if strings.Join(got, "; ") != want {
		t.Fatalf("history\n%s\nwant\n%s", strings.Join(got, "; "), want)
	}
	r, _ = s.MeltRecord(ctx, "QX-0001")
	if *r.CoolingRateKPerS != 2.5e6 {
		t.Fatalf("cooling rate %v after amending the step", *r.CoolingRateKPerS)
	}
	_, err = s.AmendStep(ctx, "Ines Marlow", spin.ID, meltbook.StepUpdate{Unset: []string{"orifice"}}, "x")
	wantKind(t, err, meltbook.Invalid, "melt-spin.orifice")
	_, err = s.AmendStep(ctx, "Ines Marlow", spin.ID, meltbook.StepUpdate{Set: []meltbook.Param{{Name: "colour", Text: "grey"}}}, "x")
	wantKind(t, err, meltbook.Invalid, "melt-spin.colour")
	_, err = s.AmendStep(ctx, "Ines Marlow", 999, meltbook.StepUpdate{Notes: ptr("x")}, "x")
	wantKind(t, err, meltbook.NotFound, "step")
}

func TestProposalsStaySeparateFromAPersonsOutcome(t *testing.T) {
	ctx := context.Background()
	s := MustOpen(t)
	if err := s.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001"), meltSpin(1e6)); err != nil {
		t.Fatal(err)
	}
	p, err := s.ProposeOutcome(ctx, "meltbook indexing", "QX-0001", meltbook.Outcome{Kind: meltbook.Icosahedral, Lattice: "P"})
	if err != nil {
		t.Fatal(err)
	}
	if p.Source != meltbook.ByAutomatic || p.Status != meltbook.Proposed || p.RecordedBy != "meltbook indexing" {
		t.Fatalf("proposal %+v", p)
	}
	mine, err := s.AddOutcome(ctx, "Ines Marlow", "QX-0001", meltbook.Outcome{Kind: meltbook.Icosahedral, Lattice: "F", Source: meltbook.ByAutomatic, Status: meltbook.Rejected})
	if err != nil {
		t.Fatal(err)
	}
	if mine.Source != meltbook.ByPerson || mine.Status != meltbook.Confirmed {
		t.Fatalf("a person's outcome stored as %s/%s", mine.Source, mine.Status)
	}
	r, _ := s.MeltRecord(ctx, "QX-0001")
	if os := r.Samples[0].Outcomes; len(os) != 2 || os[0].ID != mine.ID || os[1].ID != p.ID {
		t.Fatalf("outcomes %+v; want the person's first, then the proposal", os)
	}
	_, err = s.AmendOutcome(ctx, "Ines Marlow", p.ID, meltbook.OutcomeUpdate{Lattice: ptr("F")}, "looks F")
	wantKind(t, err, meltbook.Conflict, "outcome")
	wantKind(t, s.ConfirmProposal(ctx, "Ines Marlow", mine.ID, ""), meltbook.Conflict, "outcome")
	if err := s.RejectProposal(ctx, "Ines Marlow", p.ID, "P lattice does not explain (7,11)"); err != nil {
		t.Fatal(err)
	}
	wantKind(t, s.ConfirmProposal(ctx, "Ines Marlow", p.ID, ""), meltbook.Conflict, "outcome")
	wantKind(t, s.ConfirmProposal(ctx, "Ines Marlow", 999, ""), meltbook.NotFound, "outcome")
	hs, _ := s.History(ctx, "QX-0001")
	last := hs[len(hs)-1]
	if last.Action != "reject" || last.Before != "proposed" || last.After != "rejected" || last.Why != "P lattice does not explain (7,11)" {
		t.Fatalf("last history row %+v", last)
	}
}

func TestDerivedSampleCodes(t *testing.T) {
	ctx := context.Background()
	s := MustOpen(t)
	if err := s.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001"), meltSpin(1e6)); err != nil {
		t.Fatal(err)
	}
	var codes []string
	for _, d := range []struct {
		parent string
		step   meltbook.ProcessStep
	}{{"QX-0001", anneal()}, {"QX-0001", anneal()}, {"QX-0001.a1", anneal()},
		{"QX-0001", meltbook.ProcessStep{Kind: meltbook.OtherStep, Params: []meltbook.Param{{Name: "description", Text: "cut"}}}}} {
		sa, err := s.DeriveSample(ctx, "Ines Marlow", d.parent, d.step, "")
		if err != nil {
			t.Fatal(err)
		}
		codes = append(codes, sa.Code)
	}
	if got := strings.Join(codes, " "); got != "QX-0001.a1 QX-0001.a2 QX-0001.a1.a1 QX-0001.x1" {
		t.Fatalf("codes %s", got)
	}
	sa, err := s.FindSampleByCode(ctx, "QX-0001.a1.a1")
	if err != nil || sa.ParentCode != "QX-0001.a1" {
		t.Fatalf("sample %+v, %v", sa, err)
	}
	r, _ := s.MeltRecord(ctx, "QX-0001")
	var tree []string
	for _, sr := range r.Samples {
		tree = append(tree, strings.Repeat("-", sr.Depth)+sr.Code)
	}
	if got := strings.Join(tree, " "); got != "QX-0001 -QX-0001.a1 --QX-0001.a1.a1 -QX-0001.a2 -QX-0001.x1" {
		t.Fatalf("tree %s", got)
	}
	_, err = s.DeriveSample(ctx, "Ines Marlow", "QX-0002", anneal(), "")
	wantKind(t, err, meltbook.NotFound, "sample")
}

func TestNextMeltCode(t *testing.T) {
	ctx := context.Background()
	s := MustOpen(t)
	code, err := s.NextMeltCode(ctx, "QX")
	if err != nil || code != "QX-0001" {
		t.Fatalf("first code %q, %v", code, err)
	}
	for _, c := range []string{"QX-0001", "QX-0041", "QX-0007", "QXB-0100", "QX-0041.a1", "QX-extra"} {
		if err := s.CreateMelt(ctx, "Ines Marlow", newMelt(c)); err != nil {
			t.Fatal(err)
		}
	}
	if code, _ := s.NextMeltCode(ctx, "QX"); code != "QX-0042" {
		t.Fatalf("next code %q; want QX-0042", code)
	}
	if code, _ := s.NextMeltCode(ctx, "QXB"); code != "QXB-0101" {
		t.Fatalf("next code %q; want QXB-0101", code)
	}
	if err := s.CreateMelt(ctx, "Ines Marlow", newMelt("QX-9999")); err != nil {
		t.Fatal(err)
	}
	if code, _ := s.NextMeltCode(ctx, "QX"); code != "QX-10000" {
		t.Fatalf("next code %q; want QX-10000", code)
	}
	_, err = s.NextMeltCode(ctx, "Q X")
	wantKind(t, err, meltbook.Invalid, "prefix")
}

func TestConcurrentWriters(t *testing.T) {
	ctx := context.Background()
	s := MustOpen(t)
	var wg sync.WaitGroup
	errs := make(chan error, 40)
	for i := range 40 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			m := newMelt("QX-" + string(rune('A'+i%26)) + strings.Repeat("x", i/26))
			errs <- s.CreateMelt(ctx, "Ines Marlow", m, meltSpin(1e6))
		}()
	}
	wg.Wait()
	close(errs)
	for err := range errs {
		if err != nil {
			t.Fatal(err)
		}
	}
	if _, total, err := s.FindMelts(ctx, meltbook.MeltFilter{}); err != nil || total != 40 {
		t.Fatalf("%d melts, %v", total, err)
	}
}

func TestClockAndTimesAreKept(t *testing.T) {
	ctx := context.Background()
	s := MustOpen(t)
	made := time.Date(2025, 11, 3, 14, 30, 0, 0, time.FixedZone("CET", 3600))
	m := newMelt("QX-0001")
	m.CreatedAt = made
	if err := s.CreateMelt(ctx, "Ines Marlow", m); err != nil {
		t.Fatal(err)
	}
	got, err := s.FindMeltByCode(ctx, "QX-0001")
	if err != nil {
		t.Fatal(err)
	}
	if !got.CreatedAt.Equal(made) || got.CreatedAt.Location() != time.UTC {
		t.Fatalf("created %v; want %v in UTC", got.CreatedAt, made)
	}
	hs, _ := s.History(ctx, "QX-0001")
	if hs[0].At.Year() != 2026 {
		t.Fatalf("history time %v is not the clock's", hs[0].At)
	}
}

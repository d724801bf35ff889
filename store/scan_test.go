package store_test

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"math"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"meltbook"
	"meltbook/store"
)

// testRadiation is Cu Kα1/Kα2 as the intake records it: Hölzer et al.,
// Phys. Rev. A 56, 4554 (1997) wavelengths, intensity ratio one half
// (common practice).
var testRadiation = meltbook.ScanRadiation{Anode: "Cu", Kalpha1Angstrom: 1.5405929, Kalpha2Angstrom: 1.5444274,
	Kalpha2Ratio: 0.5, Kalpha2: meltbook.Kalpha2Doublet, Text: "Cu"}

// digest is the SHA-256 of a text, as a scan's file digest.
func digest(s string) string {
	sum := sha256.Sum256([]byte(s))
	return hex.EncodeToString(sum[:])
}

// newScan is an invented scan of sample with three points per degree from
// 20° to 30°; file names its file and its digest.
func newScan(sample, file string) meltbook.Scan {
	sc := meltbook.Scan{SampleCode: sample, FileName: file, SHA256: digest(file), Format: "xy", Radiation: testRadiation}
	for i := 0; i <= 30; i++ {
		sc.TwoThetaDeg = append(sc.TwoThetaDeg, 20+float64(i)/3)
		sc.Counts = append(sc.Counts, 100+float64(i%7))
	}
	return sc
}

// newIndexing is an invented indexing: three peaks, the first two taken by
// a cubic F phase, the third unexplained; one standard uncertainty left
// out (NaN) as a fit may do.
func newIndexing() meltbook.Indexing {
	su := 0.002
	nan := math.NaN()
	return meltbook.Indexing{
		By: "meltbook test", Radiation: testRadiation, ToleranceDeg: 0.1, MaxChance: 0.01,
		Peaks: []meltbook.Peak{
			{TwoThetaDeg: 38.47, TwoThetaSUDeg: &su, DAngstrom: 2.338, Height: 900, Area: 120, FWHMDeg: 0.12, Eta: 0.3, Significance: 40},
			{TwoThetaDeg: 44.72, TwoThetaSUDeg: &nan, DAngstrom: 2.025, Height: 400, Area: 55, FWHMDeg: 0.12, Eta: 0.3, Significance: 20},
			{TwoThetaDeg: 47.10, DAngstrom: 1.928, Height: 60, Area: 8, FWHMDeg: 0.13, Eta: 0.2, Significance: 5},
		},
		Phases: []meltbook.IndexedPhase{{
			Kind: meltbook.ModelCubic, Lattice: "F", ConstantA: 4.0495, ConstantSUA: 0.0003, FigureOfMerit: 9.5,
			Chance: 0.001, ChanceBasis: "invented", ExplainedIntensity: 0.95, RMSResidualDeg: 0.003,
			Assignments: []meltbook.PeakAssignment{
				{Peak: 0, TwoThetaDeg: 38.47, CalculatedTwoThetaDeg: 38.472, ResidualDeg: -0.002, DAngstrom: 2.338, Label: "111"},
				{Peak: 1, TwoThetaDeg: 44.72, CalculatedTwoThetaDeg: 44.718, ResidualDeg: 0.002, DAngstrom: 2.025, Label: "200"},
			},
		}},
		Unexplained: []int{2},
		Models:      []meltbook.ModelTried{{Kind: meltbook.ModelCubic, Lattice: "F", ScaleA: 4.0495, IndexedPeaks: 2, FigureOfMerit: 9.5, Chance: 0.001}},
	}
}

func crystallineProposal() store.Proposal {
	return store.Proposal{Outcome: meltbook.Outcome{Kind: meltbook.Crystalline, Name: "Al (fcc)", Evidence: "invented"}, Phase: 0, Confidence: "medium"}
}

// scanNotebook is a notebook with melt QX-0001 and its annealed piece.
func scanNotebook(t *testing.T) *store.Store {
	t.Helper()
	s := MustOpen(t)
	ctx := context.Background()
	if err := s.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001"), arcMelt(), meltSpin(1e6)); err != nil {
		t.Fatal(err)
	}
	if _, err := s.DeriveSample(ctx, "Ines Marlow", "QX-0001", anneal(), ""); err != nil {
		t.Fatal(err)
	}
	return s
}

func TestAddScanRoundTrip(t *testing.T) {
	ctx := context.Background()
	s := scanNotebook(t)
	sc := newScan("QX-0001.a1", "a1.xy")
	sc.CountErrors = make([]float64, len(sc.Counts))
	for i, c := range sc.Counts {
		sc.CountErrors[i] = math.Sqrt(c)
	}
	rec, err := s.AddScan(ctx, "Ines Marlow", store.NewScan{Scan: sc, Indexing: newIndexing(), Proposals: []store.Proposal{crystallineProposal()}})
	if err != nil {
		t.Fatal(err)
	}
	if rec.Scan.ID == 0 || rec.Scan.MeltCode != "QX-0001" || rec.Scan.ImportedBy != "Ines Marlow" {
		t.Errorf("stored scan %+v", rec.Scan)
	}
	// Points come back bit for bit.
	if !reflect.DeepEqual(rec.Scan.TwoThetaDeg, sc.TwoThetaDeg) || !reflect.DeepEqual(rec.Scan.Counts, sc.Counts) || !reflect.DeepEqual(rec.Scan.CountErrors, sc.CountErrors) {
		t.Error("points changed on the way through the notebook")
	}
	if len(rec.Indexings) != 1 {
		t.Fatalf("%d indexings", len(rec.Indexings))
	}
	x := rec.Indexings[0]
	if x.Version != 1 || len(x.Peaks) != 3 || len(x.Phases) != 1 || !reflect.DeepEqual(x.Unexplained, []int{2}) || len(x.Models) != 1 {
		t.Fatalf("indexing %+v", x)
	}
	if x.Peaks[0].TwoThetaSUDeg == nil || *x.Peaks[0].TwoThetaSUDeg != 0.002 || x.Peaks[1].TwoThetaSUDeg != nil {
		t.Errorf("uncertainties: %v, %v; want 0.002 and none (NaN stored as missing)", x.Peaks[0].TwoThetaSUDeg, x.Peaks[1].TwoThetaSUDeg)
	}
	ph := x.Phases[0]
	if len(ph.Assignments) != 2 || ph.Assignments[1].Peak != 1 || ph.Assignments[1].Label != "200" || ph.Assignments[1].PeakID != x.Peaks[1].ID {
		t.Errorf("assignments %+v", ph.Assignments)
	}
	if len(rec.Proposals) != 1 {
		t.Fatalf("%d proposals", len(rec.Proposals))
	}
	p := rec.Proposals[0]
	if p.Outcome.Source != meltbook.ByAutomatic || p.Outcome.Status != meltbook.Proposed || p.Confidence != "medium" ||
		p.IndexingVersion != 1 || p.Outcome.RecordedBy != "meltbook test" || p.Outcome.SampleCode != "QX-0001.a1" {
		t.Errorf("proposal %+v", p)
	}
	// Every row written is in the history: scan, indexing, outcome.
	var got []string
	for _, h := range rec.History {
		got = append(got, h.Entity+" "+h.Action)
	}
	if want := []string{"scan create", "indexing create", "outcome create"}; !reflect.DeepEqual(got, want) {
		t.Errorf("scan history %v; want %v", got, want)
	}
	hist, err := s.History(ctx, "QX-0001")
	if err != nil {
		t.Fatal(err)
	}
	if last := hist[len(hist)-1]; last.Entity != "outcome" || last.MeltCode != "QX-0001" {
		t.Errorf("the melt's history ends with %+v", last)
	}
	if strings.Contains(hist[len(hist)-3].After, "counts") {
		t.Error("the history keeps the scan's points; it should keep a summary")
	}
	// The lists.
	list, err := s.SampleScans(ctx, "QX-0001.a1")
	if err != nil || len(list) != 1 || list[0].Points != 31 || list[0].FromDeg != 20 || list[0].ToDeg != 30 || list[0].IndexingVersion != 1 {
		t.Fatalf("SampleScans: %+v, %v", list, err)
	}
	if want := "cubic F, a = 4.04950(30) Å, 2 of 3 peaks"; list[0].Indexing != want {
		t.Errorf("brief %q; want %q", list[0].Indexing, want)
	}
	if list, _ := s.SampleScans(ctx, "QX-0001"); len(list) != 0 {
		t.Errorf("the melt's own sample lists %d scans; want 0", len(list))
	}
	if list, _ := s.MeltScans(ctx, "QX-0001"); len(list) != 1 {
		t.Errorf("MeltScans lists %d; want 1", len(list))
	}
	if n, _ := s.CountScans(ctx); n != 1 {
		t.Errorf("CountScans %d", n)
	}
}

func TestAddScanSameFileOnce(t *testing.T) {
	ctx := context.Background()
	s := scanNotebook(t)
	if _, err := s.AddScan(ctx, "Ines Marlow", store.NewScan{Scan: newScan("QX-0001", "x.xy"), Indexing: newIndexing()}); err != nil {
		t.Fatal(err)
	}
	// The same bytes under another name are the same file.
	again := newScan("QX-0001", "renamed.xy")
	again.SHA256 = digest("x.xy")
	_, err := s.AddScan(ctx, "Ines Marlow", store.NewScan{Scan: again, Indexing: newIndexing()})
	wantKind(t, err, meltbook.Conflict, "renamed.xy")
	if !strings.Contains(err.Error(), "already scan 1 of sample QX-0001") {
		t.Errorf("message %q does not name the scan holding the file", err)
	}
	found, err := s.FindScanByFile(ctx, "QX-0001", digest("x.xy"))
	if err != nil || found.ID != 1 {
		t.Fatalf("FindScanByFile: %+v, %v", found, err)
	}
	_, err = s.FindScanByFile(ctx, "QX-0001", digest("other"))
	wantKind(t, err, meltbook.NotFound, "scan")
	// Another sample may hold the same file.
	other := newScan("QX-0001.a1", "x.xy")
	if _, err := s.AddScan(ctx, "Ines Marlow", store.NewScan{Scan: other, Indexing: newIndexing()}); err != nil {
		t.Fatalf("the same file on another sample: %v", err)
	}
	if n, _ := s.CountScans(ctx); n != 2 {
		t.Errorf("%d scans; want 2", n)
	}
}

func TestAddScanFailureLeavesNothing(t *testing.T) {
	ctx := context.Background()
	s := scanNotebook(t)
	before := export(t, s)
	hist, _ := s.History(ctx, "QX-0001")
	twice := newIndexing()
	// Refused by the schema after scan, peaks and phase were written.
	twice.Phases[0].Assignments = append(twice.Phases[0].Assignments, twice.Phases[0].Assignments[0])
	badKind := newIndexing()
	badKind.Phases[0].Kind = "hexagnal"
	cases := []struct {
		name  string
		n     store.NewScan
		kind  meltbook.ErrorKind
		field string
	}{
		{"unknown sample", store.NewScan{Scan: newScan("QX-0404", "a.xy"), Indexing: newIndexing()}, meltbook.NotFound, "sample"},
		{"bad digest", store.NewScan{Scan: func() meltbook.Scan { s := newScan("QX-0001", "a.xy"); s.SHA256 = "xyz"; return s }(), Indexing: newIndexing()}, meltbook.Invalid, "sha256"},
		{"decreasing angle", store.NewScan{Scan: func() meltbook.Scan { s := newScan("QX-0001", "a.xy"); s.TwoThetaDeg[5] = 19; return s }(), Indexing: newIndexing()}, meltbook.Invalid, "a.xy"},
		{"bad confidence", store.NewScan{Scan: newScan("QX-0001", "a.xy"), Indexing: newIndexing(),
			Proposals: []store.Proposal{{Outcome: meltbook.Outcome{Kind: meltbook.Icosahedral}, Confidence: "certain"}}}, meltbook.Invalid, "confidence"},
		{"proposal on a phase not there", store.NewScan{Scan: newScan("QX-0001", "a.xy"), Indexing: newIndexing(),
			Proposals: []store.Proposal{{Outcome: meltbook.Outcome{Kind: meltbook.Icosahedral}, Phase: 3, Confidence: "low"}}}, meltbook.Invalid, "proposal"},
		{"peak assigned twice", store.NewScan{Scan: newScan("QX-0001", "a.xy"), Indexing: twice}, meltbook.Invalid, "indexing"},
		{"unknown kind", store.NewScan{Scan: newScan("QX-0001", "a.xy"), Indexing: badKind}, meltbook.Invalid, "phases[0].kind"},
		{"crystalline without a name", store.NewScan{Scan: newScan("QX-0001", "a.xy"), Indexing: newIndexing(),
			Proposals: []store.Proposal{{Outcome: meltbook.Outcome{Kind: meltbook.Crystalline}, Confidence: "low"}}}, meltbook.Invalid, "name"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := s.AddScan(ctx, "Ines Marlow", c.n)
			wantKind(t, err, c.kind, c.field)
		})
	}
	if n, _ := s.CountScans(ctx); n != 0 {
		t.Errorf("%d scans after failures; want 0", n)
	}
	after, _ := s.History(ctx, "QX-0001")
	if len(after) != len(hist) || string(export(t, s)) != string(before) {
		t.Error("a failed AddScan changed the notebook")
	}
}

func TestAddIndexingKeepsEarlierOnes(t *testing.T) {
	ctx := context.Background()
	s := scanNotebook(t)
	sc := newScan("QX-0001", "x.xy")
	sc.Radiation.Assumed = true
	two := []store.Proposal{crystallineProposal(), {Outcome: meltbook.Outcome{Kind: meltbook.Amorphous}, Phase: -1, Confidence: "low"}}
	rec, err := s.AddScan(ctx, "Ines Marlow", store.NewScan{Scan: sc, Indexing: newIndexing(), Proposals: two})
	if err != nil {
		t.Fatal(err)
	}
	confirmed, pending := rec.Proposals[0].OutcomeID, rec.Proposals[1].OutcomeID
	if err := s.ConfirmProposal(ctx, "Ines Marlow", confirmed, "the lines are Al's"); err != nil {
		t.Fatal(err)
	}

	// Re-indexing needs a reason.
	_, err = s.AddIndexing(ctx, "Ines Marlow", rec.Scan.ID, store.NewIndexing{Indexing: newIndexing()})
	wantKind(t, err, meltbook.Invalid, "reason")

	x := newIndexing()
	x.Reason = "wavelength from the instrument log"
	x.Radiation = testRadiation
	corrected := testRadiation
	x.Phases[0].ConstantA = 4.0493
	rec, err = s.AddIndexing(ctx, "Ines Marlow", rec.Scan.ID, store.NewIndexing{Indexing: x, Proposals: []store.Proposal{crystallineProposal()}, Radiation: &corrected})
	if err != nil {
		t.Fatal(err)
	}
	if len(rec.Indexings) != 2 || rec.Indexings[0].Version != 1 || rec.Current().Version != 2 {
		t.Fatalf("indexings %+v", rec.Indexings)
	}
	if rec.Indexings[0].Phases[0].ConstantA != 4.0495 || rec.Current().Phases[0].ConstantA != 4.0493 || len(rec.Indexings[0].Peaks) != 3 {
		t.Error("the earlier indexing's rows changed")
	}
	if rec.Scan.Radiation.Assumed {
		t.Error("the corrected radiation is still marked assumed")
	}
	status := map[int64]meltbook.ProposalStatus{}
	for _, p := range rec.Proposals {
		status[p.OutcomeID] = p.Outcome.Status
	}
	if status[confirmed] != meltbook.Confirmed || status[pending] != meltbook.Rejected || len(rec.Proposals) != 3 {
		t.Errorf("statuses %v: want the confirmed one kept, the pending one superseded, one new", status)
	}
	var superseded, amended bool
	for _, h := range rec.History {
		if h.Entity == "outcome" && h.EntityID == pending && h.Action == "reject" && strings.HasPrefix(h.Why, "superseded by re-indexing") {
			superseded = true
		}
		if h.Entity == "scan" && h.Action == "amend" && h.Field == "radiation" && h.Before == "Cu (assumed)" && h.After == "Cu" && h.Why == x.Reason {
			amended = true
		}
	}
	if !superseded || !amended {
		t.Errorf("history lacks the superseding (%v) or the radiation amendment (%v): %+v", superseded, amended, rec.History)
	}
	_, err = s.AddIndexing(ctx, "Ines Marlow", 99, store.NewIndexing{Indexing: x})
	wantKind(t, err, meltbook.NotFound, "scan")
}

func TestSamplesNearAndEvidence(t *testing.T) {
	ctx := context.Background()
	s := scanNotebook(t)
	near := newMelt("QX-0002") // Al65Cu20Fe15 as QX-0001
	far := newMelt("QX-0003")
	far.Nominal = fractions("Al", 0.70, "Cu", 0.20, "Fe", 0.10)
	for _, m := range []*meltbook.Melt{near, far} {
		if err := s.CreateMelt(ctx, "Ines Marlow", m); err != nil {
			t.Fatal(err)
		}
		if _, err := s.AddOutcome(ctx, "Ines Marlow", m.Code, meltbook.Outcome{Kind: meltbook.Icosahedral, Lattice: "F"}); err != nil {
			t.Fatal(err)
		}
	}
	// A pending proposal does not stand.
	if _, err := s.ProposeOutcome(ctx, "meltbook test", "QX-0001.a1", meltbook.Outcome{Kind: meltbook.Amorphous}); err != nil {
		t.Fatal(err)
	}
	got, err := s.SamplesNear(ctx, fractions("Al", 0.65, "Cu", 0.20, "Fe", 0.15), 0.02, "QX-0001")
	if err != nil {
		t.Fatal(err)
	}
	if len(got) != 1 || got[0].SampleCode != "QX-0002" || len(got[0].Outcomes) != 1 || len(got[0].Nominal) != 3 {
		t.Fatalf("SamplesNear %+v; want QX-0002 alone (QX-0003 has 5 at.%% less Al, QX-0001 excluded)", got)
	}
	if _, err := s.AddSymmetryObservation(ctx, "Ines Marlow", "QX-0001.a1", meltbook.SymmetryObservation{Folds: []int{2, 3, 5}}); err != nil {
		t.Fatal(err)
	}
	ev, err := s.SampleEvidence(ctx, "QX-0001.a1")
	if err != nil {
		t.Fatal(err)
	}
	if ev.MeltCode != "QX-0001" || len(ev.Nominal) != 3 || len(ev.Symmetry) != 1 || !reflect.DeepEqual(ev.Symmetry[0].Folds, []int{2, 3, 5}) {
		t.Errorf("evidence %+v", ev)
	}
}

// TestNotebookWithoutScansMigrates opens a notebook made with the first
// schema only, holding a melt and an outcome, with today's migrations.
func TestNotebookWithoutScansMigrates(t *testing.T) {
	ctx := context.Background()
	v1, _ := migrationSets(t)
	p := filepath.Join(t.TempDir(), "notebook.db")
	c := newClock()
	s, err := store.InitWith(ctx, p, store.Options{Now: c.Now, Valences: testValences}, v1)
	if err != nil {
		t.Fatal(err)
	}
	if err := s.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001")); err != nil {
		t.Fatal(err)
	}
	if _, err := s.AddOutcome(ctx, "Ines Marlow", "QX-0001", meltbook.Outcome{Kind: meltbook.Icosahedral, Lattice: "F"}); err != nil {
		t.Fatal(err)
	}
	before := export(t, s)
	s.Close()

	s, err = store.Open(ctx, p, store.Options{Now: c.Now, Valences: testValences})
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	if have, known, _ := s.SchemaVersion(ctx); have != known || have < 2 {
		t.Fatalf("schema %d of %d after migrating", have, known)
	}
	if string(export(t, s)) != string(before) {
		t.Error("migrating changed what the notebook held")
	}
	if _, err := s.AddScan(ctx, "Ines Marlow", store.NewScan{Scan: newScan("QX-0001", "x.xy"), Indexing: newIndexing(),
		Proposals: []store.Proposal{crystallineProposal()}}); err != nil {
		t.Fatalf("a scan on the migrated notebook: %v", err)
	}
}

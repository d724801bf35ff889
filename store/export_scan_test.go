package store_test

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"meltbook"
	"meltbook/store"
	"meltbook/store/intake"
)

// Wavelengths of Cu Kα1 and Kα2 in Å: Hölzer et al., Phys. Rev. A 56, 4554
// (1997). fccAlA is the room-temperature lattice constant of fcc aluminium
// in Å (from memory: handbook value).
const (
	exportCuKa1 = 1.5405929
	exportCuKa2 = 1.5444274
	fccAlA      = 4.0495
)

// fccAlFile writes an invented powder pattern of fcc Al from 30° to 90° 2θ
// in 0.02° steps: Gaussian Kα1/Kα2 doublets (Kα2 at half height, common
// practice) at 2θ = 2·asin(λ/2d), d = a/√(h²+k²+l²), on a falling
// background with seeded noise. With errors it is a three-column XYE file
// whose uncertainties are √counts written to 17 digits, so that every bit
// of them matters to the round trip, and it holds one more, invented line
// at d = 2.6 Å that fcc Al does not explain.
func fccAlFile(seed uint64, errors bool) []byte {
	rng := rand.New(rand.NewPCG(seed, 11))
	var b strings.Builder
	b.WriteString("# invented test pattern, fcc Al, Cu Kα1/Kα2\n")
	sigma := 0.12 / (2 * math.Sqrt(2*math.Ln2))
	hkl := []struct{ s, height float64 }{{3, 100}, {4, 47}, {8, 22}, {11, 24}, {12, 7}} // 111 200 220 311 222, heights from memory
	for i := 0; i <= 3000; i++ {
		tt := 30 + 0.02*float64(i)
		y := 80 + 150*math.Exp(-(tt-30)/20)
		lines := hkl
		if errors {
			lines = append(lines, struct{ s, height float64 }{fccAlA * fccAlA / (2.6 * 2.6), 30})
		}
		for _, l := range lines {
			d := fccAlA / math.Sqrt(l.s)
			for _, w := range []struct{ lambda, scale float64 }{{exportCuKa1, 1}, {exportCuKa2, 0.5}} {
				c := 2 * math.Asin(w.lambda/(2*d)) * 180 / math.Pi
				y += w.scale * 5000 * l.height / 100 * math.Exp(-(tt-c)*(tt-c)/(2*sigma*sigma))
			}
		}
		counts := math.Max(0, math.Round(y+math.Sqrt(y)*rng.NormFloat64()))
		if errors {
			fmt.Fprintf(&b, "%.2f %g %.17g\n", tt, counts, math.Sqrt(math.Max(counts, 1)))
		} else {
			fmt.Fprintf(&b, "%.2f %g\n", tt, counts)
		}
	}
	return []byte(b.String())
}

// scanExportNotebook holds two melts, an annealed piece of the first with a
// scan indexed twice (first with the wrong tube, then again with Cu) whose
// proposal a person confirmed, and a scan with uncertainties on the second
// melt whose proposal a person rejected. It returns the two scans' ids.
func scanExportNotebook(t *testing.T) (*store.Store, []int64) {
	t.Helper()
	ctx := context.Background()
	s := MustOpen(t)
	if err := s.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001"), arcMelt(), meltSpin(1e6)); err != nil {
		t.Fatal(err)
	}
	m2 := newMelt("QX-0002")
	m2.Nominal = fractions("Al", 0.99, "Cu", 0.01)
	m2.CompositionEntered = "Al99Cu1"
	m2.WeighOut = nil
	if err := s.CreateMelt(ctx, "Jon Pell", m2, meltSpin(5e5)); err != nil {
		t.Fatal(err)
	}
	a1, err := s.DeriveSample(ctx, "Ines Marlow", "QX-0001", anneal(), "ribbon piece")
	if err != nil {
		t.Fatal(err)
	}
	res, err := intake.Add(ctx, s, "Ines Marlow", intake.File{Sample: a1.Code, Name: "a1.xy", Data: fccAlFile(1, false)},
		intake.Options{Radiation: "Co", Notes: "holder B"})
	if err != nil {
		t.Fatal(err)
	}
	first := res.Record.Scan.ID
	res, err = intake.Reindex(ctx, s, "Ines Marlow", first, "tube was Cu, not Co", intake.Options{Radiation: "Cu"})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Record.Indexings) != 2 {
		t.Fatalf("%d indexings after re-indexing", len(res.Record.Indexings))
	}
	// The test pattern puts fcc Al's lines where a = 4.0495 Å puts them
	// (from memory: handbook value); counting noise and 0.02° steps allow
	// a few thousandths of an ångström.
	if x := res.Record.Current(); len(x.Phases) != 1 || math.Abs(x.Phases[0].ConstantA-fccAlA) > 0.002 {
		t.Fatalf("re-indexed with Cu: %s; want fcc Al", store.IndexingBrief(x))
	}
	confirm := pendingProposal(t, res.Record)
	if err := s.ConfirmProposal(ctx, "Ines Marlow", confirm, "lines match fcc Al"); err != nil {
		t.Fatal(err)
	}
	res, err = intake.Add(ctx, s, "Jon Pell", intake.File{Sample: "QX-0002", Name: "qx2.xye", Data: fccAlFile(2, true)}, intake.Options{Radiation: "Cu"})
	if err != nil {
		t.Fatal(err)
	}
	second := res.Record.Scan.ID
	if res.Record.Scan.CountErrors == nil {
		t.Fatal("the XYE scan was stored without uncertainties")
	}
	if err := s.RejectProposal(ctx, "Jon Pell", pendingProposal(t, res.Record), "holder lines, not the ribbon"); err != nil {
		t.Fatal(err)
	}
	return s, []int64{first, second}
}

// pendingProposal returns the outcome id of a proposal of the current
// indexing still awaiting a decision.
func pendingProposal(t *testing.T, rec *meltbook.ScanRecord) int64 {
	t.Helper()
	for _, p := range rec.Proposals {
		if p.IndexingVersion == rec.Current().Version && p.Outcome.Status == meltbook.Proposed {
			return p.OutcomeID
		}
	}
	t.Fatalf("no pending proposal on scan %d (%s)", rec.Scan.ID, store.IndexingBrief(rec.Current()))
	return 0
}

func TestExportImportScans(t *testing.T) {
	ctx := context.Background()
	src, ids := scanExportNotebook(t)
	first := export(t, src)

	dst := MustOpen(t)
	if err := dst.Import(ctx, "Kai Ostrow", bytes.NewReader(first)); err != nil {
		t.Fatal(err)
	}
	if second := export(t, dst); !bytes.Equal(first, second) {
		t.Fatalf("round trip differs:\n%s\n----\n%s", first, second)
	}

	statuses := map[meltbook.ProposalStatus]int{}
	for _, id := range ids {
		a, err := src.ScanRecord(ctx, id)
		if err != nil {
			t.Fatal(err)
		}
		b, err := dst.ScanRecord(ctx, id)
		if err != nil {
			t.Fatal(err)
		}
		// The points come back bit for bit.
		for _, pair := range [][2][]float64{{a.Scan.TwoThetaDeg, b.Scan.TwoThetaDeg}, {a.Scan.Counts, b.Scan.Counts},
			{a.Scan.CountErrors, b.Scan.CountErrors}} {
			if len(pair[0]) != len(pair[1]) {
				t.Fatalf("scan %d: %d points became %d", id, len(pair[0]), len(pair[1]))
			}
			for i := range pair[0] {
				if math.Float64bits(pair[0][i]) != math.Float64bits(pair[1][i]) {
					t.Fatalf("scan %d point %d: %v became %v", id, i, pair[0][i], pair[1][i])
				}
			}
		}
		// Everything else the record shows, history included: ids are
		// kept, so each history row still names its scan, indexing or
		// outcome.
		ja, _ := json.Marshal(a)
		jb, _ := json.Marshal(b)
		if !bytes.Equal(ja, jb) {
			t.Fatalf("scan %d records differ:\n%s\n%s", id, ja, jb)
		}
		if len(b.History) == 0 {
			t.Errorf("scan %d has no history after the import", id)
		}
		for _, p := range b.Proposals {
			statuses[p.Outcome.Status]++
		}
	}
	if first, err := dst.ScanRecord(ctx, ids[0]); err != nil || len(first.Indexings) != 2 || first.Scan.Notes != "holder B" {
		t.Fatalf("first scan after import: %v", err)
	}
	if statuses[meltbook.Confirmed] != 1 || statuses[meltbook.Rejected] < 1 {
		t.Errorf("proposal statuses after import %v; want one confirmed and at least one rejected", statuses)
	}
	// The restored notebook goes on: a third indexing follows the two kept.
	rec, err := intake.Reindex(ctx, dst, "Kai Ostrow", ids[0], "checking the restored copy", intake.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if rec.Record.Current().Version != 3 {
		t.Errorf("re-indexing the restored scan gave version %d; want 3", rec.Record.Current().Version)
	}
}

// version1Document is a notebook document as version 1 wrote it: one melt
// with its own sample, a melt-spin step and its history; no scans.
const version1Document = `{
  "format": "meltbook-notebook",
  "version": 1,
  "melts": [
    {
      "id": 3, "code": "QV-0001", "operator": "Ines Marlow", "created_at": "2025-03-04T10:00:00Z",
      "composition_entered": "Al65Cu20Fe15",
      "nominal": [{"element": "Al", "fraction": 0.65}, {"element": "Cu", "fraction": 0.2}, {"element": "Fe", "fraction": 0.15}],
      "target_mass_g": 8,
      "samples": [
        {
          "id": 5, "code": "QV-0001", "parent": "", "label": "", "created_at": "2025-03-04T10:00:00Z",
          "steps": [{"id": 7, "seq": 1, "kind": "melt-spin", "at": "2025-03-04T10:30:00Z", "operator": "Ines Marlow",
                     "params": [{"name": "wheel-speed", "si": 30, "unit": "m/s"}, {"name": "chamber-gas", "text": "Ar"}]}],
          "outcomes": [{"id": 2, "kind": "icosahedral", "lattice": "F", "source": "person", "recorded_by": "Ines Marlow",
                        "status": "confirmed", "at": "2025-03-05T09:00:00Z"}]
        }
      ]
    }
  ],
  "history": [{"id": 1, "at": "2025-03-04T10:00:00Z", "who": "Ines Marlow", "melt": "QV-0001", "entity": "melt",
               "entity_id": 3, "action": "create", "after": "{}"}]
}`

func TestImportVersion1Document(t *testing.T) {
	ctx := context.Background()
	s := MustOpen(t)
	if err := s.Import(ctx, "Kai Ostrow", strings.NewReader(version1Document)); err != nil {
		t.Fatal(err)
	}
	d, err := s.ExportDocument(ctx)
	if err != nil {
		t.Fatal(err)
	}
	if d.Version != store.DocumentVersion || len(d.Melts) != 1 || d.Melts[0].ID != 3 || len(d.Melts[0].Samples[0].Outcomes) != 1 ||
		len(d.Melts[0].Samples[0].Scans) != 0 || len(d.History) != 1 || d.History[0].EntityID != 3 {
		t.Fatalf("version 1 document read as %+v", d)
	}

	// Version 1 had no scans; a document that says 1 and holds one is
	// refused.
	src, _ := scanExportNotebook(t)
	withScans, err := src.ExportDocument(ctx)
	if err != nil {
		t.Fatal(err)
	}
	withScans.Version = 1
	wantKind(t, MustOpen(t).ImportDocument(ctx, "Kai Ostrow", withScans), meltbook.Invalid, "melts[0].samples[1].scans")
}

func TestImportRefusesBadScans(t *testing.T) {
	ctx := context.Background()
	src, _ := scanExportNotebook(t)
	good := export(t, src)
	for _, c := range []struct {
		name  string
		spoil func(d *store.Document)
		field string
	}{
		{"angles that do not increase", func(d *store.Document) {
			sc := &d.Melts[0].Samples[1].Scans[0]
			sc.TwoThetaDeg[5] = sc.TwoThetaDeg[4]
		}, "melts[0].samples[1].scans[0].a1.xy"},
		{"counts and angles differ in number", func(d *store.Document) {
			sc := &d.Melts[1].Samples[0].Scans[0]
			sc.CountErrors = sc.CountErrors[1:]
		}, "melts[1].samples[0].scans[0].qx2.xye"},
		{"versions out of order", func(d *store.Document) {
			d.Melts[0].Samples[1].Scans[0].Indexings[1].Version = 3
		}, "melts[0].samples[1].scans[0].indexings[1].version"},
		{"assignment naming another indexing's peak", func(d *store.Document) {
			xs := d.Melts[0].Samples[1].Scans[0].Indexings
			xs[1].Phases[0].Assignments[0].PeakID = xs[0].Peaks[0].ID
		}, "melts[0].samples[1].scans[0].indexings[1].phases[0].assignments[0].peak_id"},
		{"unexplained peak unknown", func(d *store.Document) {
			x := &d.Melts[1].Samples[0].Scans[0].Indexings[0]
			x.Unexplained = []int64{999999}
		}, "melts[1].samples[0].scans[0].indexings[0].unexplained_peaks[0]"},
		{"proposal on a person's outcome", func(d *store.Document) {
			x := &d.Melts[1].Samples[0].Scans[0].Indexings[0]
			d.Melts[1].Samples[0].Outcomes[0].Source = meltbook.ByPerson
			d.Melts[1].Samples[0].Outcomes[0].Status = meltbook.Confirmed
			x.Proposals[0].OutcomeID = d.Melts[1].Samples[0].Outcomes[0].ID
		}, "melts[1].samples[0].scans[0].indexings[0].proposals[0].outcome_id"},
		{"duplicate peak id", func(d *store.Document) {
			x := &d.Melts[1].Samples[0].Scans[0].Indexings[0]
			x.Peaks[1].ID = d.Melts[0].Samples[1].Scans[0].Indexings[0].Peaks[0].ID
		}, "melts[1].samples[0].scans[0].indexings[0].peaks[1].id"},
		{"unknown confidence", func(d *store.Document) {
			d.Melts[1].Samples[0].Scans[0].Indexings[0].Proposals[0].Confidence = "certain"
		}, "melts[1].samples[0].scans[0].indexings[0].proposals[0].confidence"},
	} {
		t.Run(c.name, func(t *testing.T) {
			var d store.Document
			if err := json.Unmarshal(good, &d); err != nil {
				t.Fatal(err)
			}
			c.spoil(&d)
			dst := MustOpen(t)
			wantKind(t, dst.ImportDocument(ctx, "Kai Ostrow", &d), meltbook.Invalid, c.field)
			if n, _ := dst.CountScans(ctx); n != 0 {
				t.Fatal("a refused import left scans behind")
			}
		})
	}
}

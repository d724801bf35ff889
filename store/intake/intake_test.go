package intake_test

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"meltbook"
	"meltbook/analysis/verdict"
	"meltbook/store"
	"meltbook/store/intake"
)

var ctx = context.Background()

// only returns the one phase of the current indexing.
func only(t *testing.T, res *intake.Result) meltbook.IndexedPhase {
	t.Helper()
	x := res.Record.Current()
	if len(x.Phases) != 1 {
		t.Fatalf("%d phases (%s); want 1", len(x.Phases), store.IndexingBrief(x))
	}
	return x.Phases[0]
}

func evidenceKinds(rs []verdict.Reason) string {
	var out []string
	for _, r := range rs {
		out = append(out, r.Evidence)
	}
	return strings.Join(out, ",")
}

func TestAddFccAluminium(t *testing.T) {
	st := mustOpen(t)
	addMelt(t, st, "QA-0001", "Al", 0.99, "Cu", 0.01)
	data := pattern(fccAlLines(), 5000, nil, 1)
	res, err := intake.Add(ctx, st, "Ada Quill", intake.File{Sample: "QA-0001", Name: "/data/run 7/QA-0001_al.xy", Data: data}, intake.Options{})
	if err != nil {
		t.Fatal(err)
	}
	sc := res.Record.Scan
	sum := sha256.Sum256(data)
	if sc.FileName != "QA-0001_al.xy" || sc.SHA256 != hex.EncodeToString(sum[:]) || sc.Points() != 4001 || sc.Format != "xy" {
		t.Errorf("scan %s %s %d points %s", sc.FileName, sc.SHA256, sc.Points(), sc.Format)
	}
	if !sc.Radiation.Assumed || sc.Radiation.Text != "Cu" || !strings.Contains(strings.Join(res.Notes, " "), "assumed") {
		t.Errorf("an XY file states no radiation: Cu should be assumed and said (%+v, %v)", sc.Radiation, res.Notes)
	}
	ph := only(t, res)
	// fcc Al, a = 4.0495 Å (from memory: handbook value); the test pattern
	// puts its lines there by Bragg's law, so the fit must find it within
	// the scatter of 0.02° steps and counting noise.
	if ph.Kind != meltbook.ModelCubic || ph.Lattice != "F" || math.Abs(ph.ConstantA-alA) > 0.002 {
		t.Errorf("phase %s; want cubic F, a = %.4f ± 0.002 Å", ph.Title(), alA)
	}
	// Lines 111 to 400 lie within 20-100° (331 and 420 lie beyond).
	if len(ph.Assignments) != 6 {
		t.Errorf("%d peaks indexed; want the six fcc lines in range", len(ph.Assignments))
	}
	if len(res.Weighed) != 1 || res.Weighed[0].Proposal == nil {
		t.Fatalf("weighed %+v", res.Weighed)
	}
	p := res.Weighed[0].Proposal
	// The built-in phase library holds fcc Al, so the search-match names it.
	if p.Outcome.Kind != meltbook.Crystalline || p.Outcome.Name != "Al" || p.Outcome.Status != meltbook.Proposed ||
		p.Outcome.Source != meltbook.ByAutomatic || p.Outcome.RecordedBy != intake.Program || !strings.HasPrefix(p.Outcome.Evidence, "From QA-0001_al.xy: Al, cubic Fm-3m") {
		t.Errorf("proposal %+v", p.Outcome)
	}
}

// icosahedralNotebook holds melt QI-0001 (Al65Cu20Fe15, e/a 1.751 under
// Raynor valences: 3·0.65 + 1·0.20 − 2.66·0.15, worked by hand, inside the
// Al-Cu-Fe window 1.70-1.80) and QI-0002 (Al64Cu21Fe15, 1.4 at.% away:
// sqrt(0.01² + 0.01²)), on which a person recorded an icosahedral phase.
func icosahedralNotebook(t *testing.T, folds ...int) *store.Store {
	st := mustOpen(t)
	addMelt(t, st, "QI-0001", "Al", 0.65, "Cu", 0.20, "Fe", 0.15)
	addMelt(t, st, "QI-0002", "Al", 0.64, "Cu", 0.21, "Fe", 0.15)
	if _, err := st.AddOutcome(ctx, "Ada Quill", "QI-0002", meltbook.Outcome{Kind: meltbook.Icosahedral, Lattice: "F"}); err != nil {
		t.Fatal(err)
	}
	if len(folds) > 0 {
		if _, err := st.AddSymmetryObservation(ctx, "Ada Quill", "QI-0001", meltbook.SymmetryObservation{Folds: folds}); err != nil {
			t.Fatal(err)
		}
	}
	return st
}

func TestAddIcosahedral(t *testing.T) {
	st := icosahedralNotebook(t, 2, 3, 5)
	res, err := intake.Add(ctx, st, "Ada Quill", intake.File{Sample: "QI-0001", Name: "qi1.xy", Data: pattern(icosahedralFLines(4.46), 4000, nil, 2)},
		intake.Options{Radiation: "Cu"})
	if err != nil {
		t.Fatal(err)
	}
	ph := only(t, res)
	// a_R = 4.46 Å as built (Al-Cu-Fe's quasilattice constant as widely
	// quoted, from memory); the fit must find it within 0.005 Å.
	if ph.Kind != meltbook.ModelIcosahedral || ph.Lattice != "F" || math.Abs(ph.ConstantA-4.46) > 0.005 {
		t.Fatalf("phase %s; want icosahedral F, a_R = 4.46 Å", ph.Title())
	}
	w := res.Weighed[0]
	// The diffraction (+1 or +2, by the indexer's chance: this test weighs
	// the evidence, the indexer's tests its chance) + 1 (5-fold) + 1 (e/a
	// inside) + 1 (the neighbour).
	d := diffractionPoints(t, w.Verdict)
	if w.Proposal == nil || w.Proposal.Outcome.Kind != meltbook.Icosahedral || w.Proposal.Outcome.Lattice != "F" ||
		w.Verdict.Confidence != verdict.High || w.Verdict.Points != d+3 || w.Proposal.Confidence != verdict.High {
		t.Fatalf("weighing %+v\n%s", w.Proposal, w.Verdict.Text())
	}
	if got := evidenceKinds(w.Verdict.Agree); got != "diffraction,symmetry,e/a,neighbours" {
		t.Errorf("agreeing evidence %q", got)
	}

	// find counts the proposal with --proposals only (store/query's
	// IncludeProposals), and the person's outcome on QI-0002 always.
	f := meltbook.MeltFilter{Outcomes: []meltbook.PhaseKind{meltbook.Icosahedral}}
	found, _, err := st.FindMelts(ctx, f)
	if err != nil || len(found) != 1 || found[0].Code != "QI-0002" {
		t.Fatalf("without proposals: %+v, %v", found, err)
	}
	f.IncludeProposals = true
	if found, _, _ = st.FindMelts(ctx, f); len(found) != 2 {
		t.Fatalf("with proposals: %d melts; want 2", len(found))
	}
}

// diffractionPoints returns the points the diffraction evidence earned,
// which must be +1 or +2 for a clearly indexed pattern.
func diffractionPoints(t *testing.T, v verdict.Verdict) int {
	t.Helper()
	for _, r := range v.Agree {
		if r.Evidence == "diffraction" {
			if r.Points < 1 || r.Points > 2 {
				t.Fatalf("diffraction earned %d points: %s", r.Points, r.Text)
			}
			return r.Points
		}
	}
	t.Fatalf("no agreeing diffraction evidence: %s", v.Text())
	return 0
}

func TestAddIcosahedralContradicted(t *testing.T) {
	// 4-fold axes, which the icosahedral point group lacks.
	st := icosahedralNotebook(t, 2, 4)
	res, err := intake.Add(ctx, st, "Ada Quill", intake.File{Sample: "QI-0001", Name: "qi1.xy", Data: pattern(icosahedralFLines(4.46), 4000, nil, 2)},
		intake.Options{Radiation: "Cu"})
	if err != nil {
		t.Fatal(err)
	}
	w := res.Weighed[0]
	// diffraction − 2 + 1 + 1: still proposed, with the contradiction said.
	if w.Proposal == nil || w.Verdict.Points != diffractionPoints(t, w.Verdict) || evidenceKinds(w.Verdict.Disagree) != "symmetry" ||
		!strings.Contains(w.Proposal.Outcome.Evidence, "Disagrees: electron diffraction saw 2- and 4-fold") {
		t.Errorf("weighing %+v: %s", w.Verdict, w.Proposal.Outcome.Evidence)
	}
}

func TestAddNothingBeatsChance(t *testing.T) {
	st := mustOpen(t)
	addMelt(t, st, "QN-0001", "Al", 0.7, "Pd", 0.2, "Mn", 0.1)
	// Twelve lines at random d-spacings (seeded): no lattice.
	rng := rand.New(rand.NewPCG(11, 5))
	var ls []line
	for range 12 {
		ls = append(ls, line{d: 1.1 + 2.5*rng.Float64(), height: 20 + 80*rng.Float64()})
	}
	res, err := intake.Add(ctx, st, "Ada Quill", intake.File{Sample: "QN-0001", Name: "n.xy", Data: pattern(ls, 3000, nil, 3)}, intake.Options{Radiation: "Cu"})
	if err != nil {
		t.Fatal(err)
	}
	x := res.Record.Current()
	if len(x.Phases) != 0 || len(res.Record.Proposals) != 0 || len(res.Weighed) != 0 {
		t.Fatalf("random lines gave %s and %d proposals", store.IndexingBrief(x), len(res.Record.Proposals))
	}
	if len(x.Peaks) < 10 || len(x.Unexplained) != len(x.Peaks) || len(x.Models) == 0 {
		t.Errorf("%d peaks, %d unexplained, %d models tried", len(x.Peaks), len(x.Unexplained), len(x.Models))
	}
	if !strings.Contains(strings.Join(res.Notes, " "), "better than chance: nothing proposed") {
		t.Errorf("notes %v", res.Notes)
	}
}

func TestAddAmorphous(t *testing.T) {
	st := mustOpen(t)
	addMelt(t, st, "QZ-0001", "Zn", 0.55, "Mg", 0.38, "Y", 0.07)
	// A metallic-glass halo at Q = 2.75 Å⁻¹, 2θ = 2 asin(Qλ/4π) = 39.43°
	// for Cu Kα1 (worked by hand).
	glass := &hump{centre: 39.43, fwhm: 6.5, height: 700}
	res, err := intake.Add(ctx, st, "Ada Quill", intake.File{Sample: "QZ-0001", Name: "glass.xy", Data: pattern(nil, 0, glass, 4)}, intake.Options{Radiation: "Cu"})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Weighed) != 1 || res.Weighed[0].Proposal == nil || res.Weighed[0].Proposal.Outcome.Kind != meltbook.Amorphous {
		t.Fatalf("weighed %+v, notes %v", res.Weighed, res.Notes)
	}
	// A hump at Q = 1.54 Å⁻¹ (2θ = 21.8°), where silica glass of a holder
	// scatters: noted, not proposed.
	addMelt(t, st, "QZ-0002", "Zn", 0.55, "Mg", 0.38, "Y", 0.07)
	holder := &hump{centre: 21.8, fwhm: 7, height: 400}
	res, err = intake.Add(ctx, st, "Ada Quill", intake.File{Sample: "QZ-0002", Name: "holder.xy", Data: pattern(nil, 0, holder, 5)}, intake.Options{Radiation: "Cu"})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Record.Proposals) != 0 || !strings.Contains(strings.Join(res.Notes, " "), "not a metallic glass") {
		t.Errorf("holder hump: %d proposals, notes %v", len(res.Record.Proposals), res.Notes)
	}
}

func TestAddSameFileOnce(t *testing.T) {
	st := mustOpen(t)
	addMelt(t, st, "QA-0001", "Al", 1.0)
	data := pattern(fccAlLines(), 5000, nil, 1)
	if _, err := intake.Add(ctx, st, "Ada Quill", intake.File{Sample: "QA-0001", Name: "a.xy", Data: data}, intake.Options{}); err != nil {
		t.Fatal(err)
	}
	res, err := intake.Add(ctx, st, "Ada Quill", intake.File{Sample: "QA-0001", Name: "copy of a.xy", Data: data}, intake.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if res.Duplicate == nil || res.Duplicate.ID != 1 || res.Duplicate.FileName != "a.xy" || res.Record != nil {
		t.Fatalf("duplicate %+v", res)
	}
	if n, _ := st.CountScans(ctx); n != 1 {
		t.Errorf("%d scans; want 1", n)
	}
}

func TestAddRefusesAndLeavesNothing(t *testing.T) {
	st := mustOpen(t)
	addMelt(t, st, "QA-0001", "Al", 1.0)
	before, _ := st.History(ctx, "QA-0001")
	good := pattern(fccAlLines(), 5000, nil, 1)
	bad := strings.Replace(string(good), "\n20.04 ", "\n20.04 x", 1)
	cases := []struct {
		name string
		f    intake.File
		opt  intake.Options
		kind meltbook.ErrorKind
		want string
	}{
		// Line 5: two comment/header lines, then 20.00, 20.02, 20.04.
		{"not a number", intake.File{Sample: "QA-0001", Name: "bad.xy", Data: []byte(bad)}, intake.Options{}, meltbook.Invalid, "bad.xy:5:"},
		{"too few points", intake.File{Sample: "QA-0001", Name: "short.xy", Data: []byte("20 1\n21 2\n")}, intake.Options{}, meltbook.Invalid, "short.xy"},
		{"unknown sample", intake.File{Sample: "QA-0404", Name: "a.xy", Data: good}, intake.Options{}, meltbook.NotFound, "QA-0404"},
		{"no sample", intake.File{Name: "a.xy", Data: good}, intake.Options{}, meltbook.Invalid, "which sample"},
		{"bad radiation", intake.File{Sample: "QA-0001", Name: "a.xy", Data: good}, intake.Options{Radiation: "Xx"}, meltbook.Invalid, "radiation"},
		{"bad standard", intake.File{Sample: "QA-0001", Name: "a.xy", Data: good}, intake.Options{Standard: "quartz"}, meltbook.Invalid, "standard"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := intake.Add(ctx, st, "Ada Quill", c.f, c.opt)
			if meltbook.KindOf(err) != c.kind || !strings.Contains(err.Error(), c.want) {
				t.Errorf("error %v (%s); want %s naming %q", err, meltbook.KindOf(err), c.kind, c.want)
			}
		})
	}
	after, _ := st.History(ctx, "QA-0001")
	if n, _ := st.CountScans(ctx); n != 0 || len(after) != len(before) {
		t.Errorf("%d scans, %d history rows after refusals; want none added", n, len(after)-len(before))
	}
}

func TestReindexCorrectsTheWavelength(t *testing.T) {
	st := mustOpen(t)
	addMelt(t, st, "QA-0001", "Al", 1.0)
	// Measured with Cu but imported as Co Kα: the d-spacings come out
	// 1.79/1.54 times too long, and fcc Al is not recognised.
	res, err := intake.Add(ctx, st, "Ada Quill", intake.File{Sample: "QA-0001", Name: "a.xy", Data: pattern(fccAlLines(), 5000, nil, 1)}, intake.Options{Radiation: "Co"})
	if err != nil {
		t.Fatal(err)
	}
	first := res.Record.Current()
	for _, ph := range first.Phases {
		if math.Abs(ph.ConstantA-alA) < 0.01 {
			t.Fatalf("with the wrong wavelength the phase is %s", ph.Title())
		}
	}
	_, err = intake.Reindex(ctx, st, "Ada Quill", res.Record.Scan.ID, " ", intake.Options{Radiation: "Cu"})
	if meltbook.KindOf(err) != meltbook.Invalid {
		t.Errorf("re-indexing without a reason: %v", err)
	}
	res, err = intake.Reindex(ctx, st, "Ada Quill", res.Record.Scan.ID, "tube was Cu, not Co", intake.Options{Radiation: "Cu"})
	if err != nil {
		t.Fatal(err)
	}
	rec := res.Record
	if len(rec.Indexings) != 2 || rec.Scan.Radiation.Text != "Cu" || rec.Current().Reason != "tube was Cu, not Co" {
		t.Fatalf("after re-indexing: %d indexings, radiation %s", len(rec.Indexings), rec.Scan.Radiation.Text)
	}
	if ph := only(t, res); math.Abs(ph.ConstantA-alA) > 0.002 {
		t.Errorf("re-indexed phase %s; want fcc Al", ph.Title())
	}
	for _, p := range rec.Proposals {
		if p.IndexingVersion == 1 && p.Outcome.Status != meltbook.Rejected {
			t.Errorf("a proposal of the first indexing is still %s", p.Outcome.Status)
		}
	}
	_, err = intake.Reindex(ctx, st, "Ada Quill", 42, "why not", intake.Options{})
	if meltbook.KindOf(err) != meltbook.NotFound {
		t.Errorf("re-indexing scan 42: %v", err)
	}
}

func TestCurves(t *testing.T) {
	st := mustOpen(t)
	addMelt(t, st, "QA-0001", "Al", 1.0)
	res, err := intake.Add(ctx, st, "Ada Quill", intake.File{Sample: "QA-0001", Name: "a.xy", Data: pattern(fccAlLines(), 5000, nil, 1)}, intake.Options{})
	if err != nil {
		t.Fatal(err)
	}
	bg, fit, err := intake.Curves(res.Record)
	if err != nil {
		t.Fatal(err)
	}
	n := res.Record.Scan.Points()
	if len(bg) != n || len(fit) != n {
		t.Fatalf("%d background and %d fitted values for %d points", len(bg), len(fit), n)
	}
	// At the 111 line (38.47°: 2 asin(1.5405929·√3/(2·4.0495)), worked by
	// hand) the fit rises far above the background.
	i := int(math.Round((38.47 - 20) / 0.02))
	if !(fit[i] > bg[i]+2000) {
		t.Errorf("at 38.47°: background %.0f, fit %.0f", bg[i], fit[i])
	}
}

func TestCalibrationFile(t *testing.T) {
	st := mustOpen(t)
	addMelt(t, st, "QA-0001", "Al", 1.0)
	if _, err := intake.Add(ctx, st, "Ada Quill", intake.File{Sample: "QA-0001", Name: "a.xy", Data: pattern(fccAlLines(), 5000, nil, 1)}, intake.Options{}); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "cache", "calibration.json")
	if n, err := intake.LoadCalibration(path); n != 0 || err != nil {
		t.Errorf("a missing file: %d, %v", n, err)
	}
	if err := intake.SaveCalibration(path); err != nil {
		t.Fatal(err)
	}
	first, err := os.ReadFile(path)
	if err != nil || !strings.Contains(string(first), `"version":"indexing-null-`) {
		t.Fatalf("calibration file: %v %.80s", err, first)
	}
	// Nothing new: the file stays as it is.
	if err := intake.SaveCalibration(path); err != nil {
		t.Fatal(err)
	}
	if again, _ := os.ReadFile(path); string(again) != string(first) {
		t.Error("saving again without new scores rewrote the file")
	}
	if err := os.WriteFile(path, []byte("{not json"), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := intake.LoadCalibration(path); err == nil {
		t.Error("a damaged file loads without error")
	}
	if err := intake.SaveCalibration(path); err != nil {
		t.Fatal(err)
	}
	if fixed, _ := os.ReadFile(path); string(fixed) != string(first) {
		t.Error("a damaged file is not replaced")
	}
}

func TestAddWithInternalStandard(t *testing.T) {
	st := mustOpen(t)
	addMelt(t, st, "QA-0001", "Al", 1.0)
	// Si of NIST SRM 640f, a = 5.431144 Å (certificate), diamond lines
	// 111, 220, 311, 400, 331, 422 (h, k, l all odd, or all even with
	// h+k+l = 4n: common practice), mixed with fcc Al, every line moved by
	// a zero error of +0.060°.
	si := cubicLines(5.431144, [][3]int{{1, 1, 1}, {2, 2, 0}, {3, 1, 1}, {4, 0, 0}, {3, 3, 1}, {4, 2, 2}}, []float64{60, 35, 20, 6, 8, 10})
	data := shiftedPattern(append(fccAlLines(), si...), 5000, nil, 0.060, 6)
	res, err := intake.Add(ctx, st, "Ada Quill", intake.File{Sample: "QA-0001", Name: "al+si.xy", Data: data}, intake.Options{Radiation: "Cu", Standard: "Si"})
	if err != nil {
		t.Fatal(err)
	}
	rec := res.Record
	x := rec.Current()
	if rec.Scan.InternalStandard != "Si (NIST SRM 640f)" || x.InternalStandard != rec.Scan.InternalStandard {
		t.Errorf("standard %q, %q", rec.Scan.InternalStandard, x.InternalStandard)
	}
	// The zero shift comes back within 0.01° of the 0.060° put in.
	if x.ZeroShiftDeg == nil || math.Abs(*x.ZeroShiftDeg-0.060) > 0.01 {
		t.Fatalf("zero shift %v; want 0.060 ± 0.01°", x.ZeroShiftDeg)
	}
	standard := 0
	for _, p := range x.Peaks {
		if p.Standard != "" {
			standard++
		}
		if p.CorrectedTwoThetaDeg == nil {
			t.Errorf("peak at %.3f° has no corrected angle", p.TwoThetaDeg)
		}
	}
	if standard < 5 || x.SpecimenPeaks() != 6 {
		t.Errorf("%d standard and %d specimen peaks; want the six Si lines in range (at least five found) and six Al ones", standard, x.SpecimenPeaks())
	}
	// Indexed on the corrected angles, Al comes out at its own a, with
	// the Si lines left out of the indexing.
	if ph := only(t, res); math.Abs(ph.ConstantA-alA) > 0.002 || len(ph.Assignments) != 6 {
		t.Errorf("phase %s with %d peaks; want fcc Al from its six lines", ph.Title(), len(ph.Assignments))
	}
}

package store_test

import (
	"bytes"
	"context"
	"database/sql"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"meltbook"
	"meltbook/store"
)

// θ-Al2Cu: tetragonal, space group I4/mcm (No. 140), a = 6.0670 Å,
// c = 4.8770 Å after Meetsma, de Boer and van Smaalen, J. Solid State
// Chem. 83, 370 (1989) (cell from memory of that publication).
const (
	thetaA = 6.0670
	thetaC = 4.8770
	// thetaReference is the reference text a library call carries.
	thetaReference = "A. Meetsma, J. L. de Boer, S. van Smaalen, J. Solid State Chem. 83, 370 (1989)"
)

// braggTwoThetaDeg is 2θ = 2·asin(λ/2d) in degrees for Cu Kα1 (Hölzer et
// al., Phys. Rev. A 56, 4554 (1997), as testRadiation) at d in Å.
func braggTwoThetaDeg(d float64) float64 {
	return 2 * math.Asin(testRadiation.Kalpha1Angstrom/(2*d)) * 180 / math.Pi
}

// tetragonalD is d of reflection hkl of a tetragonal cell:
//
//	1/d² = (h² + k²)/a² + l²/c²   (common practice)
func tetragonalD(h, k, l int, a, c float64) float64 {
	return 1 / math.Sqrt(float64(h*h+k*k)/(a*a)+float64(l*l)/(c*c))
}

// hexagonalD is d of reflection hkl of a hexagonal cell:
//
//	1/d² = 4(h² + hk + k²)/(3a²) + l²/c²   (common practice)
func hexagonalD(h, k, l int, a, c float64) float64 {
	return 1 / math.Sqrt(4*float64(h*h+h*k+k*k)/(3*a*a)+float64(l*l)/(c*c))
}

// linePeaks makes one invented fitted peak per d-spacing, 2θ by Bragg's
// law, with falling heights.
func linePeaks(ds []float64) []meltbook.Peak {
	var out []meltbook.Peak
	for i, d := range ds {
		su := 0.003
		out = append(out, meltbook.Peak{TwoThetaDeg: braggTwoThetaDeg(d), TwoThetaSUDeg: &su, DAngstrom: d,
			Height: 1000 / float64(i+1), Area: 150 / float64(i+1), FWHMDeg: 0.11, Eta: 0.4, Significance: 60 / float64(i+1)})
	}
	return out
}

// assign makes the assignments of the peaks at positions to labelled
// reflections, calculated 2θ equal to the peak's less residualDeg, each
// with its predicted intensity (nil where predicted is shorter).
func assign(peaks []meltbook.Peak, positions []int, labels []string, predicted []float64, residualDeg float64) []meltbook.PeakAssignment {
	var out []meltbook.PeakAssignment
	for i, at := range positions {
		p := peaks[at]
		a := meltbook.PeakAssignment{Peak: at, TwoThetaDeg: p.TwoThetaDeg, CalculatedTwoThetaDeg: p.TwoThetaDeg - residualDeg,
			ResidualDeg: residualDeg, DAngstrom: p.DAngstrom, Label: labels[i], Detail: "reflection " + labels[i]}
		if i < len(predicted) {
			v := predicted[i]
			a.PredictedIntensity = &v
		}
		out = append(out, a)
	}
	return out
}

// thetaAl2CuIndexing is an invented indexing of θ-Al2Cu: five lines of
// the I-centred cell above (h + k + l even), all explained by a library
// call of kind tetragonal, with invented predicted intensities (one of
// them a computed 0, which must stay 0, and one not computed) and a Le
// Bail Rwp.
func thetaAl2CuIndexing() meltbook.Indexing {
	hkl := [][3]int{{1, 1, 0}, {2, 0, 0}, {2, 1, 1}, {0, 0, 2}, {3, 1, 0}}
	var ds []float64
	var labels []string
	for _, r := range hkl {
		ds = append(ds, tetragonalD(r[0], r[1], r[2], thetaA, thetaC))
		labels = append(labels, fmt.Sprintf("%d%d%d", r[0], r[1], r[2]))
	}
	peaks := linePeaks(ds)
	rwp := 0.118
	return meltbook.Indexing{
		By: "meltbook test", Radiation: testRadiation, ToleranceDeg: 0.1, MaxChance: 0.01,
		Peaks: peaks,
		Phases: []meltbook.IndexedPhase{{
			Kind: meltbook.ModelTetragonal, Lattice: "I", Phase: "θ-Al2Cu", SpaceGroup: "I4/mcm", Reference: thetaReference,
			ConstantA: thetaA, ConstantSUA: 0.0021, ConstantC: thetaC, ConstantSUC: 0.0017,
			ZeroShiftDeg: 0.012, ZeroShiftSUDeg: 0.004, FigureOfMerit: 21.5, Chance: 2e-5, ChanceBasis: "invented",
			ExplainedIntensity: 1, RMSResidualDeg: 0.004, WholePatternRwp: &rwp,
			Assignments: assign(peaks, []int{0, 1, 2, 3, 4}, labels, []float64{37.5, 0, 100, 12.25}, 0.002),
		}},
		Unexplained: []int{},
		Models: []meltbook.ModelTried{
			{Kind: meltbook.ModelTetragonal, Lattice: "I", Phase: "θ-Al2Cu", ScaleA: thetaA, IndexedPeaks: 5, FigureOfMerit: 21.5, Chance: 2e-5},
			{Kind: meltbook.ModelCubic, Lattice: "F", ScaleA: 8.61, IndexedPeaks: 2, FigureOfMerit: 3.1, Chance: 0.4},
		},
	}
}

// hexagonalIndexing is an invented lattice-search call (no library name)
// of a hexagonal P cell, a = 2.95 Å, c = 4.68 Å (invented), with a
// computed α, β, γ left out as the kind fixes them, and no Rwp.
func hexagonalIndexing() meltbook.Indexing {
	const a, c = 2.95, 4.68
	hkl := [][3]int{{1, 0, 0}, {0, 0, 2}, {1, 0, 1}, {1, 0, 2}, {1, 1, 0}}
	var ds []float64
	for _, r := range hkl {
		ds = append(ds, hexagonalD(r[0], r[1], r[2], a, c))
	}
	peaks := linePeaks(ds)
	return meltbook.Indexing{
		By: "meltbook test", Radiation: testRadiation, ToleranceDeg: 0.1, MaxChance: 0.01,
		Peaks: peaks,
		Phases: []meltbook.IndexedPhase{{
			Kind: meltbook.ModelHexagonal, Lattice: "P", ConstantA: a, ConstantSUA: 0.001, ConstantC: c, ConstantSUC: 0,
			ZeroShiftDeg: -0.02, ZeroShiftSUDeg: 0.005, FigureOfMerit: 14, Chance: 0.003, ChanceBasis: "invented",
			ExplainedIntensity: 0.9, RMSResidualDeg: 0.006,
			Assignments: assign(peaks, []int{0, 1, 2, 3}, []string{"100", "002", "101", "102"}, nil, -0.003),
		}},
		Unexplained: []int{4},
		Models:      []meltbook.ModelTried{{Kind: meltbook.ModelHexagonal, Lattice: "P", ScaleA: a, IndexedPeaks: 4, FigureOfMerit: 14, Chance: 0.003}},
	}
}

// icosahedralIndexing is an invented icosahedral F call, a_R = 4.46 Å
// (invented, near i-Al-Cu-Fe), whose assignments carry predicted
// intensities, from six peaks at invented d-spacings.
func icosahedralIndexing() meltbook.Indexing {
	peaks := linePeaks([]float64{3.34, 2.04, 1.98, 1.23, 1.17, 1.02})
	return meltbook.Indexing{
		By: "meltbook test", Radiation: testRadiation, ToleranceDeg: 0.1, MaxChance: 0.01,
		Peaks: peaks,
		Phases: []meltbook.IndexedPhase{{
			Kind: meltbook.ModelIcosahedral, Lattice: "F", ConstantA: 4.46, ConstantSUA: 0.002,
			SixDimensionalConstantA: 4.46 * math.Sqrt2, ZeroShiftDeg: 0.01, ZeroShiftSUDeg: 0.003,
			FigureOfMerit: 30, Chance: 1e-6, ChanceBasis: "invented", ExplainedIntensity: 1, RMSResidualDeg: 0.005,
			PhasonStrain: true,
			Assignments: assign(peaks, []int{0, 1, 2, 3, 4, 5}, []string{"(7,11)", "(18,29)", "(20,32)", "(52,84)", "(60,96)", "(76,123)"},
				[]float64{8.5, 100, 71.25, 20, 24.5, 6.125}, 0.001),
		}},
		Unexplained: []int{},
		Models:      []meltbook.ModelTried{{Kind: meltbook.ModelIcosahedral, Lattice: "F", ScaleA: 4.46, IndexedPeaks: 6, FigureOfMerit: 30, Chance: 1e-6}},
	}
}

// storedPhase is want as the notebook gives it back: with the row ids it
// was stored under.
func storedPhase(want meltbook.IndexedPhase, got *meltbook.Indexing, i int) meltbook.IndexedPhase {
	want.ID = got.Phases[i].ID
	want.Assignments = append([]meltbook.PeakAssignment(nil), want.Assignments...)
	for j := range want.Assignments {
		want.Assignments[j].PeakID = got.Peaks[want.Assignments[j].Peak].ID
	}
	return want
}

func TestThetaAl2CuCallStoredWhole(t *testing.T) {
	ctx := context.Background()
	s := scanNotebook(t)
	x := thetaAl2CuIndexing()
	proposal := store.Proposal{Outcome: meltbook.Outcome{Kind: meltbook.Crystalline, Name: "θ-Al2Cu", Evidence: "invented"}, Phase: 0, Confidence: "high"}
	rec, err := s.AddScan(ctx, "Ines Marlow", store.NewScan{Scan: newScan("QX-0001.a1", "theta.xy"), Indexing: x,
		Proposals: []store.Proposal{proposal}})
	if err != nil {
		t.Fatal(err)
	}
	again, err := s.ScanRecord(ctx, rec.Scan.ID)
	if err != nil {
		t.Fatal(err)
	}
	got := again.Current()
	if len(got.Phases) != 1 {
		t.Fatalf("%d phases read back; want 1", len(got.Phases))
	}
	if want := storedPhase(x.Phases[0], got, 0); !reflect.DeepEqual(got.Phases[0], want) {
		t.Fatalf("phase read back\n%+v\nwant\n%+v", got.Phases[0], want)
	}
	if !reflect.DeepEqual(got.Models, x.Models) {
		t.Errorf("models read back %+v; want %+v", got.Models, x.Models)
	}
	// A computed intensity of 0 stays 0, one not computed stays absent;
	// in the file, the one is 0 and the other NULL.
	as := got.Phases[0].Assignments
	if as[1].PredictedIntensity == nil || *as[1].PredictedIntensity != 0 || as[4].PredictedIntensity != nil {
		t.Errorf("predicted intensities %v, %v; want 0 and none", as[1].PredictedIntensity, as[4].PredictedIntensity)
	}
	db := rawDB(t, s.Path())
	var zero, none sql.NullFloat64
	if err := db.QueryRow(`SELECT (SELECT predicted_intensity FROM peak_assignment WHERE peak_id = ?),
		(SELECT predicted_intensity FROM peak_assignment WHERE peak_id = ?)`, got.Peaks[1].ID, got.Peaks[4].ID).Scan(&zero, &none); err != nil {
		t.Fatal(err)
	}
	if !zero.Valid || zero.Float64 != 0 || none.Valid {
		t.Errorf("stored predicted intensities %v, %v; want 0 and NULL", zero, none)
	}
	var b, bSU, alpha sql.NullFloat64
	if err := db.QueryRow(`SELECT b_angstrom, b_su_angstrom, alpha_deg FROM indexed_phase WHERE id = ?`, got.Phases[0].ID).Scan(&b, &bSU, &alpha); err != nil {
		t.Fatal(err)
	}
	if b.Valid || bSU.Valid || alpha.Valid {
		t.Errorf("b, its uncertainty and α of a tetragonal cell stored as %v, %v, %v; want NULL (fixed by the kind)", b, bSU, alpha)
	}
	if !strings.Contains(store.IndexingBrief(got), "θ-Al2Cu, tetragonal I4/mcm, a = 6.0670(21) Å, c = 4.8770(17) Å") {
		t.Errorf("brief %q does not name the library phase and its cell", store.IndexingBrief(got))
	}
}

func TestPhaseCallRefusedBeforeAnythingIsWritten(t *testing.T) {
	ctx := context.Background()
	s := scanNotebook(t)
	before := export(t, s)
	nan := math.NaN()
	for _, c := range []struct {
		name  string
		spoil func(ph *meltbook.IndexedPhase)
		field string
	}{
		{"misspelt kind", func(ph *meltbook.IndexedPhase) { ph.Kind = "tetragnal" }, "phases[0].kind"},
		{"no kind", func(ph *meltbook.IndexedPhase) { ph.Kind = "" }, "phases[0].kind"},
		{"outcome kind, not a phase call's", func(ph *meltbook.IndexedPhase) { ph.Kind = string(meltbook.Crystalline) }, "phases[0].kind"},
		{"unknown centring", func(ph *meltbook.IndexedPhase) { ph.Lattice = "X" }, "phases[0].lattice"},
		{"negative c", func(ph *meltbook.IndexedPhase) { ph.ConstantC = -4.877 }, "phases[0].c_angstrom"},
		{"angle of 180°", func(ph *meltbook.IndexedPhase) { ph.BetaDeg = 180 }, "phases[0].beta_deg"},
		{"uncertainty of a constant not given", func(ph *meltbook.IndexedPhase) { ph.ConstantSUB = 0.01 }, "phases[0].b_su_angstrom"},
		{"negative uncertainty", func(ph *meltbook.IndexedPhase) { ph.ConstantSUC = -0.01 }, "phases[0].c_su_angstrom"},
		{"Rwp not a number", func(ph *meltbook.IndexedPhase) { ph.WholePatternRwp = &nan }, "phases[0].whole_pattern_rwp"},
		{"negative predicted intensity", func(ph *meltbook.IndexedPhase) {
			v := -3.0
			ph.Assignments[2].PredictedIntensity = &v
		}, "phases[0].assignments[2].predicted_intensity"},
		{"chance above 1", func(ph *meltbook.IndexedPhase) { ph.Chance = 1.5 }, "phases[0].chance"},
		{"calculated 2θ not a number", func(ph *meltbook.IndexedPhase) { ph.Assignments[0].CalculatedTwoThetaDeg = nan }, "phases[0].assignments[0].calculated_two_theta_deg"},
	} {
		t.Run(c.name, func(t *testing.T) {
			x := thetaAl2CuIndexing()
			c.spoil(&x.Phases[0])
			_, err := s.AddScan(ctx, "Ines Marlow", store.NewScan{Scan: newScan("QX-0001.a1", "theta.xy"), Indexing: x})
			wantKind(t, err, meltbook.Invalid, c.field)
			var e *meltbook.Error
			if !errors.As(err, &e) || len(e.Message) < 10 {
				t.Errorf("message %q says too little", err)
			}
		})
	}
	if !bytes.Equal(before, export(t, s)) {
		t.Fatal("a refused call changed the notebook")
	}
}

// threeCallNotebook holds a tetragonal library call, a hexagonal lattice
// call and an icosahedral call with predicted intensities, each a scan of
// its own; it returns the scans' ids.
func threeCallNotebook(t *testing.T) (*store.Store, []int64) {
	t.Helper()
	ctx := context.Background()
	s := scanNotebook(t)
	var ids []int64
	for i, x := range []meltbook.Indexing{thetaAl2CuIndexing(), hexagonalIndexing(), icosahedralIndexing()} {
		name := []string{"theta.xy", "hex.xy", "ico.xy"}[i]
		rec, err := s.AddScan(ctx, "Ines Marlow", store.NewScan{Scan: newScan("QX-0001.a1", name), Indexing: x,
			Proposals: []store.Proposal{{Outcome: meltbook.Outcome{Kind: meltbook.Crystalline, Name: "invented " + name}, Phase: 0, Confidence: "low"}}})
		if err != nil {
			t.Fatal(err)
		}
		ids = append(ids, rec.Scan.ID)
	}
	return s, ids
}

func TestExportRestoreKeepsPhaseCalls(t *testing.T) {
	ctx := context.Background()
	src, ids := threeCallNotebook(t)
	first := export(t, src)
	dst := MustOpen(t)
	if err := dst.Import(ctx, "Kai Ostrow", bytes.NewReader(first)); err != nil {
		t.Fatal(err)
	}
	if second := export(t, dst); !bytes.Equal(first, second) {
		t.Fatalf("round trip differs:\n%s\n----\n%s", first, second)
	}
	// The same bytes could come from a document that drops the new fields
	// on both ways; so the restored calls are compared with what was put in.
	want := []meltbook.Indexing{thetaAl2CuIndexing(), hexagonalIndexing(), icosahedralIndexing()}
	for i, id := range ids {
		rec, err := dst.ScanRecord(ctx, id)
		if err != nil {
			t.Fatal(err)
		}
		got := rec.Current()
		if w := storedPhase(want[i].Phases[0], got, 0); !reflect.DeepEqual(got.Phases[0], w) {
			t.Errorf("scan %d restored phase\n%+v\nwant\n%+v", id, got.Phases[0], w)
		}
		if !reflect.DeepEqual(got.Models, want[i].Models) {
			t.Errorf("scan %d restored models %+v; want %+v", id, got.Models, want[i].Models)
		}
	}
	var d map[string]any
	if err := json.Unmarshal(first, &d); err != nil {
		t.Fatal(err)
	}
	if d["version"] != float64(3) {
		t.Errorf("document version %v; want 3", d["version"])
	}
	for _, field := range []string{`"kind": "tetragonal"`, `"phase": "θ-Al2Cu"`, `"space_group": "I4/mcm"`, `"c_su_angstrom": 0.0017`,
		`"whole_pattern_rwp": 0.118`, "\"predicted_intensity\": 0\n", `"predicted_intensity": 6.125`, `"kind": "hexagonal"`} {
		if !bytes.Contains(first, []byte(field)) {
			t.Errorf("the document lacks %s", field)
		}
	}
}

// rawDB opens the notebook file directly, for what only the file shows.
func rawDB(t *testing.T, path string) *sql.DB {
	t.Helper()
	db, err := sql.Open("sqlite", "file:"+filepath.ToSlash(path)+"?_pragma=foreign_keys(1)&_pragma=busy_timeout(5000)")
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { db.Close() })
	return db
}

package store_test

import (
	"context"
	"errors"
	"reflect"
	"strings"
	"testing"

	"meltbook"
	"meltbook/store"
)

// version2Document is a notebook document as version 2 wrote it, by hand:
// one melt with its own sample, an automatic outcome proposed from a scan
// of three points whose one indexing found three peaks, a cubic F phase
// explaining two, one unexplained, two models tried. The digest is the
// SHA-256 of the text "v2.xy" (sha256sum).
const version2Document = `{
  "format": "meltbook-notebook",
  "version": 2,
  "melts": [
    {
      "id": 2, "code": "QW-0001", "operator": "Jon Pell", "created_at": "2025-09-01T08:00:00Z",
      "composition_entered": "Al99Cu1",
      "nominal": [{"element": "Al", "fraction": 0.99}, {"element": "Cu", "fraction": 0.01}],
      "target_mass_g": 5,
      "samples": [
        {
          "id": 3, "code": "QW-0001", "parent": "", "label": "", "created_at": "2025-09-01T08:00:00Z",
          "outcomes": [{"id": 4, "kind": "crystalline", "name": "Al (fcc)", "fraction": null, "source": "automatic",
                        "recorded_by": "meltbook 0.2", "evidence": "cubic F, a = 4.0495(3) Å", "status": "proposed",
                        "at": "2025-09-02T10:00:00Z"}],
          "scans": [
            {
              "id": 6, "file_name": "v2.xy", "sha256": "a2a7d8d123406a299ea9401eedf0546db6e3d6f778fb7d605eb66760c31f201c",
              "format": "xy",
              "radiation": {"anode": "Cu", "kalpha1_angstrom": 1.5405929, "kalpha2_angstrom": 1.5444274,
                            "kalpha2_ratio": 0.5, "kalpha2": "doublet", "text": "Cu"},
              "imported_at": "2025-09-02T09:59:00Z", "imported_by": "Jon Pell",
              "two_theta_deg": [30, 40, 50], "counts": [120, 990, 130],
              "indexings": [
                {
                  "id": 7, "version": 1, "at": "2025-09-02T10:00:00Z", "by": "meltbook 0.2", "requested_by": "Jon Pell",
                  "radiation": {"anode": "Cu", "kalpha1_angstrom": 1.5405929, "kalpha2_angstrom": 1.5444274,
                                "kalpha2_ratio": 0.5, "kalpha2": "doublet", "text": "Cu"},
                  "tolerance_deg": 0.1, "max_chance": 0.01,
                  "peaks": [
                    {"id": 8, "two_theta_deg": 38.47, "two_theta_su_deg": 0.002, "d_angstrom": 2.338, "height": 900,
                     "area": 120, "fwhm_deg": 0.12, "eta": 0.3, "significance": 40, "found": "automatic"},
                    {"id": 9, "two_theta_deg": 44.72, "d_angstrom": 2.025, "height": 400, "area": 55, "fwhm_deg": 0.12,
                     "eta": 0.3, "significance": 20, "found": "automatic"},
                    {"id": 10, "two_theta_deg": 47.1, "d_angstrom": 1.928, "height": 60, "area": 8, "fwhm_deg": 0.13,
                     "eta": 0.2, "significance": 5, "found": "by hand"}
                  ],
                  "phases": [
                    {"id": 11, "kind": "cubic", "lattice": "F", "constant_angstrom": 4.0495, "constant_su_angstrom": 0.0003,
                     "zero_shift_deg": 0.004, "zero_shift_su_deg": 0.002, "figure_of_merit": 9.5, "chance": 0.001,
                     "chance_basis": "uniform lists", "explained_intensity": 0.95, "rms_residual_deg": 0.003,
                     "assignments": [
                       {"peak_id": 8, "calculated_two_theta_deg": 38.472, "residual_deg": -0.002, "d_angstrom": 2.338,
                        "label": "111", "detail": "h² + k² + l² = 3"},
                       {"peak_id": 9, "calculated_two_theta_deg": 44.718, "residual_deg": 0.002, "d_angstrom": 2.025,
                        "label": "200", "detail": "h² + k² + l² = 4"}
                     ]}
                  ],
                  "unexplained_peaks": [10],
                  "models": [{"kind": "cubic", "lattice": "F", "scale_angstrom": 4.0495, "indexed_peaks": 2,
                              "figure_of_merit": 9.5, "chance": 0.001},
                             {"kind": "icosahedral", "lattice": "P", "scale_angstrom": 4.52, "indexed_peaks": 2,
                              "figure_of_merit": 2.2, "chance": 0.6}],
                  "proposals": [{"outcome_id": 4, "phase_id": 11, "confidence": "medium"}]
                }
              ]
            }
          ]
        }
      ]
    }
  ],
  "history": [{"id": 1, "at": "2025-09-01T08:00:00Z", "who": "Jon Pell", "melt": "QW-0001", "entity": "melt",
               "entity_id": 2, "action": "create", "after": "{}"}]
}`

func TestImportVersion2Document(t *testing.T) {
	ctx := context.Background()
	s := MustOpen(t)
	if err := s.Import(ctx, "Kai Ostrow", strings.NewReader(version2Document)); err != nil {
		t.Fatal(err)
	}
	rec, err := s.ScanRecord(ctx, 6)
	if err != nil {
		t.Fatal(err)
	}
	x := rec.Current()
	// The phase as the document gives it, with nothing of version 3.
	want := meltbook.IndexedPhase{ID: 11, Kind: meltbook.ModelCubic, Lattice: "F", ConstantA: 4.0495, ConstantSUA: 0.0003,
		ZeroShiftDeg: 0.004, ZeroShiftSUDeg: 0.002, FigureOfMerit: 9.5, Chance: 0.001, ChanceBasis: "uniform lists",
		ExplainedIntensity: 0.95, RMSResidualDeg: 0.003, Assignments: []meltbook.PeakAssignment{
			{PeakID: 8, Peak: 0, TwoThetaDeg: 38.47, CalculatedTwoThetaDeg: 38.472, ResidualDeg: -0.002, DAngstrom: 2.338, Label: "111", Detail: "h² + k² + l² = 3"},
			{PeakID: 9, Peak: 1, TwoThetaDeg: 44.72, CalculatedTwoThetaDeg: 44.718, ResidualDeg: 0.002, DAngstrom: 2.025, Label: "200", Detail: "h² + k² + l² = 4"},
		}}
	if len(x.Phases) != 1 || !reflect.DeepEqual(x.Phases[0], want) {
		t.Fatalf("phase of the version 2 document read as\n%+v\nwant\n%+v", x.Phases, want)
	}
	if len(x.Models) != 2 || x.Models[1].Kind != meltbook.ModelIcosahedral || x.Models[1].Phase != "" || !reflect.DeepEqual(x.Unexplained, []int{2}) {
		t.Errorf("models %+v, unexplained %v", x.Models, x.Unexplained)
	}
	if len(rec.Proposals) != 1 || rec.Proposals[0].OutcomeID != 4 || rec.Proposals[0].Outcome.Status != meltbook.Proposed {
		t.Errorf("proposals %+v", rec.Proposals)
	}
	d, err := s.ExportDocument(ctx)
	if err != nil {
		t.Fatal(err)
	}
	if d.Version != 3 {
		t.Errorf("exported as version %d; want 3", d.Version)
	}
}

func TestImportRefusesWhatVersion2DidNotHold(t *testing.T) {
	ctx := context.Background()
	phase := `"kind": "cubic", "lattice": "F", "constant_angstrom": 4.0495`
	const place = "melts[0].samples[0].scans[0].indexings[0]."
	for _, c := range []struct {
		name, old, new, field string
	}{
		{"tetragonal phase", phase, `"kind": "tetragonal", "lattice": "I", "constant_angstrom": 4.0495`, place + "phases[0].kind"},
		{"C-centred phase", phase, `"kind": "cubic", "lattice": "C", "constant_angstrom": 4.0495`, place + "phases[0].lattice"},
		{"library phase", phase, phase + `, "phase": "Al", "space_group": "Fm-3m"`, place + "phases[0].phase"},
		{"c constant", phase, phase + `, "c_angstrom": 4.1`, place + "phases[0].c_angstrom"},
		{"γ", phase, phase + `, "gamma_deg": 120`, place + "phases[0].gamma_deg"},
		{"Rwp", phase, phase + `, "whole_pattern_rwp": 0.1`, place + "phases[0].whole_pattern_rwp"},
		{"predicted intensity", `"label": "200",`, `"label": "200", "predicted_intensity": 47,`, place + "phases[0].assignments[1].predicted_intensity"},
		{"model's library phase", `"kind": "icosahedral", "lattice": "P",`, `"kind": "icosahedral", "lattice": "P", "phase": "i-AlCuFe",`, place + "models[1].phase"},
	} {
		t.Run(c.name, func(t *testing.T) {
			doc := strings.Replace(version2Document, c.old, c.new, 1)
			if doc == version2Document {
				t.Fatal("the test's replacement did not apply")
			}
			s := MustOpen(t)
			wantKind(t, s.Import(ctx, "Kai Ostrow", strings.NewReader(doc)), meltbook.Invalid, c.field)
			// The same as version 3 is a sound document.
			if err := MustOpen(t).Import(ctx, "Kai Ostrow", strings.NewReader(strings.Replace(doc, `"version": 2`, `"version": 3`, 1))); err != nil {
				t.Errorf("as version 3: %v", err)
			}
		})
	}
}

func TestImportRefusesVersion4Document(t *testing.T) {
	ctx := context.Background()
	s := MustOpen(t)
	doc := strings.Replace(version2Document, `"version": 2`, `"version": 4`, 1)
	err := s.Import(ctx, "Kai Ostrow", strings.NewReader(doc))
	wantKind(t, err, meltbook.Conflict, "version")
	var e *meltbook.Error
	if !errors.As(err, &e) || !strings.Contains(e.Message, "newer meltbook (version 4; this one reads up to 3)") {
		t.Errorf("message %q; want it to say a newer meltbook wrote it", err)
	}
	if n, _ := s.CountScans(ctx); n != 0 {
		t.Error("a refused document left scans behind")
	}
	if store.DocumentVersion != 3 {
		t.Errorf("DocumentVersion %d; this test is about version 3 reading a version 4 document", store.DocumentVersion)
	}
}

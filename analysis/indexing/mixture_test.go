package indexing_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"meltbook"
	"meltbook/analysis/indexing"
)

func TestMixtureIcosahedralAndAluminium(t *testing.T) {
	// i-Al-Cu-Fe (F, a_R = 4.46 Å, from memory as above) with fcc Al
	// (a = 4.0495 Å, from memory of the handbook value) as a second phase:
	// both must be found and no peak left over.
	fams := projectFamilies("F", 7, 0.45)
	ico, _ := icosahedralPeaks(fams, 4.46, cuKa1, 0.42, 20, 90, 0)
	tt, _ := cubicPeaks("F", 4.0495, cuKa1, 20, 90)
	peaks := append([]indexing.Peak(nil), ico...)
	for _, x := range tt {
		peaks = append(peaks, indexing.Peak{TwoThetaDeg: x, Intensity: 40})
	}
	res, err := indexing.Index(peaks, cuKa1, indexing.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Phases) != 2 {
		t.Fatalf("%d phases, want 2: %+v", len(res.Phases), res.Phases)
	}
	var gotIco, gotAl bool
	for _, ph := range res.Phases {
		switch {
		case ph.Kind == indexing.Icosahedral && ph.Lattice == "F" && math.Abs(ph.QuasilatticeConstantA-4.46) < 0.001:
			gotIco = true
			if len(ph.Peaks) != len(ico) {
				t.Errorf("icosahedral phase holds %d peaks, want %d", len(ph.Peaks), len(ico))
			}
		case ph.Kind == indexing.Cubic && ph.Lattice == "F" && math.Abs(ph.AA-4.0495) < 0.001:
			gotAl = true
			if len(ph.Peaks) != len(tt) {
				t.Errorf("Al phase holds %d peaks, want %d", len(ph.Peaks), len(tt))
			}
		}
	}
	if !gotIco || !gotAl {
		t.Errorf("phases %+v, want icosahedral F 4.46 Å and cubic F 4.0495 Å", res.Phases)
	}
	if len(res.Unexplained) != 0 {
		t.Errorf("unexplained %v", res.Unexplained)
	}
	if res.Phases[0].ExplainedIntensity < res.Phases[1].ExplainedIntensity {
		t.Error("phases not ordered by explained intensity")
	}
}

func TestUnexplainedPeaksReported(t *testing.T) {
	// fcc Al lines (as above) plus two peaks that fit nothing with them.
	tt, _ := cubicPeaks("F", 4.0495, cuKa1, 20, 120)
	var peaks []indexing.Peak
	for _, x := range tt {
		peaks = append(peaks, indexing.Peak{TwoThetaDeg: x, Intensity: 50})
	}
	extra := []indexing.Peak{{TwoThetaDeg: 31.37, Intensity: 5}, {TwoThetaDeg: 57.91, Intensity: 4}}
	peaks = append(peaks, extra...)
	res, err := indexing.Index(peaks, cuKa1, indexing.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Phases) != 1 || res.Phases[0].Lattice != "F" {
		t.Fatalf("phases %+v", res.Phases)
	}
	if len(res.Unexplained) != 2 || res.Unexplained[0] != extra[0] || res.Unexplained[1] != extra[1] {
		t.Errorf("unexplained %v, want %v", res.Unexplained, extra)
	}
}

func TestBadInput(t *testing.T) {
	good := []indexing.Peak{{TwoThetaDeg: 38.47, Intensity: 100}, {TwoThetaDeg: 44.72, Intensity: 50}, {TwoThetaDeg: 65.10, Intensity: 30}}
	tests := []struct {
		name   string
		peaks  []indexing.Peak
		lambda float64
		opts   indexing.Options
		field  string
	}{
		{"angle", []indexing.Peak{good[0], {TwoThetaDeg: 190, Intensity: 1}, good[2]}, cuKa1, indexing.Options{}, "peak 2"},
		{"zero angle", []indexing.Peak{good[0], good[1], {TwoThetaDeg: 0, Intensity: 1}}, cuKa1, indexing.Options{}, "peak 3"},
		{"intensity", []indexing.Peak{{TwoThetaDeg: 30, Intensity: -1}, good[1], good[2]}, cuKa1, indexing.Options{}, "peak 1"},
		{"NaN intensity", []indexing.Peak{good[0], {TwoThetaDeg: 30, Intensity: math.NaN()}, good[2]}, cuKa1, indexing.Options{}, "peak 2"},
		{"too few", good[:2], cuKa1, indexing.Options{}, "peaks"},
		{"wavelength", good, 0, indexing.Options{}, "wavelength"},
		{"tolerance", good, cuKa1, indexing.Options{ToleranceDeg: -0.1}, "tolerance"},
		{"order", good, cuKa1, indexing.Options{ApproximantOrders: []indexing.Order{{P: 5, Q: 3}}}, "approximant order 1"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := indexing.Index(tt.peaks, tt.lambda, tt.opts)
			var e *meltbook.Error
			if !errors.As(err, &e) || e.Kind != meltbook.Invalid || e.Field != tt.field {
				t.Fatalf("error %v, want invalid %q", err, tt.field)
			}
			if !strings.Contains(err.Error(), tt.field) {
				t.Errorf("message %q does not name %q", err, tt.field)
			}
		})
	}
}

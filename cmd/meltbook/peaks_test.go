package main

import (
	"encoding/json"
	"math"
	"strings"
	"testing"
)

func TestPeaksFindsAluminiumLines(t *testing.T) {
	_, ds := fccAluminiumSpacings()
	path := syntheticScan(t, "al.xy", ds, []float64{4000, 1900, 1100, 1200, 350}, 30, 85, 0.02, 1)
	out, errOut, code := runCLI(t, "", "peaks", path, "--anode", "Cu", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var rep struct {
		Peaks []struct {
			TwoTheta float64 `json:"two_theta_deg"`
			D        float64 `json:"d_angstrom"`
		} `json:"peaks"`
	}
	if err := json.Unmarshal([]byte(out), &rep); err != nil {
		t.Fatalf("not JSON: %v", err)
	}
	if len(rep.Peaks) != len(ds) {
		t.Fatalf("found %d peaks, want %d (the five fcc Al lines in 30-85°)", len(rep.Peaks), len(ds))
	}
	for i, d := range ds {
		want := braggTwoTheta(d, cuKa1)
		if math.Abs(rep.Peaks[i].TwoTheta-want) > 0.02 { // one step
			t.Errorf("peak %d at %.4f°, want %.4f° (Bragg's law, a = 4.0495 Å)", i, rep.Peaks[i].TwoTheta, want)
		}
		if math.Abs(rep.Peaks[i].D-d) > 5e-4 {
			t.Errorf("peak %d d = %.5f Å, want %.5f Å", i, rep.Peaks[i].D, d)
		}
	}
}

func TestPeaksAssumesCopperWhenUnstated(t *testing.T) {
	_, ds := fccAluminiumSpacings()
	path := syntheticScan(t, "al.xy", ds[:2], []float64{3000, 1500}, 30, 50, 0.02, 2)
	out, errOut, code := runCLI(t, "", "peaks", path)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	if !strings.Contains(errOut, "Cu Kα1/Kα2 assumed") {
		t.Errorf("stderr does not say Cu was assumed: %q", errOut)
	}
	if !strings.Contains(out, "2 peaks") {
		t.Errorf("want 2 peaks in:\n%s", out)
	}
}

func TestPeaksBadInput(t *testing.T) {
	tests := []struct {
		args []string
		code int
		want string
	}{
		{[]string{"peaks", "../../analysis/scanfile/testdata/bad_order.xy"}, exitInvalid, "bad_order.xy:"},
		{[]string{"peaks", "../../analysis/scanfile/testdata/bad_nan.xy"}, exitInvalid, "bad_nan.xy:"},
		{[]string{"peaks", "no-such-file.xy"}, exitNotFound, "no-such-file.xy"},
		{[]string{"peaks", "../../analysis/scanfile/testdata/good.xy", "--anode", "Xx"}, exitInvalid, "--anode"},
		{[]string{"peaks", "../../analysis/scanfile/testdata/good.xy", "--standard", "quartz"}, exitInvalid, "--standard"},
	}
	for _, tc := range tests {
		t.Run(strings.Join(tc.args, " "), func(t *testing.T) {
			_, errOut, code := runCLI(t, "", tc.args...)
			if code != tc.code {
				t.Fatalf("exit %d, want %d; stderr %s", code, tc.code, errOut)
			}
			if !strings.Contains(errOut, tc.want) {
				t.Errorf("stderr %q does not mention %q", errOut, tc.want)
			}
		})
	}
}

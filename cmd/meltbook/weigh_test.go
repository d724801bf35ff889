package main

import (
	"encoding/json"
	"math"
	"strings"
	"testing"
)

func TestWeighJSON(t *testing.T) {
	out, errOut, code := runCLI(t, "", "weigh", "Al63Cu25Fe12", "--mass", "10g", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var sheet struct {
		Elements []struct {
			Element string  `json:"element"`
			MassG   float64 `json:"mass_g"`
		} `json:"elements"`
		TotalG float64 `json:"total_g"`
	}
	if err := json.Unmarshal([]byte(out), &sheet); err != nil {
		t.Fatalf("not JSON: %v\n%s", err, out)
	}
	// Hand-worked with IUPAC 2021 standard atomic weights Al 26.9815385, Cu 63.546, Fe 55.845:
	// Σ x·M = 0.63·26.9815385 + 0.25·63.546 + 0.12·55.845 = 16.998369 + 15.8865 + 6.7014 = 39.586269 g/mol;
	// m_i = 10 g · x_i·M_i / Σ x·M.
	want := map[string]float64{"Al": 4.294006, "Cu": 4.013134, "Fe": 1.692860}
	if len(sheet.Elements) != 3 {
		t.Fatalf("got %d elements, want 3", len(sheet.Elements))
	}
	for _, e := range sheet.Elements {
		if math.Abs(e.MassG-want[e.Element]) > 1e-5 {
			t.Errorf("%s: %.6f g, want %.6f g (hand-worked)", e.Element, e.MassG, want[e.Element])
		}
	}
	if math.Abs(sheet.TotalG-10) > 1e-9 {
		t.Errorf("total %.9f g, want 10 g (no purity or loss allowance given)", sheet.TotalG)
	}
}

func TestWeighText(t *testing.T) {
	out, errOut, code := runCLI(t, "", "weigh", "Zn60Mg30Y10", "--mass", "5g", "--purity", "Y=99.9", "--loss", "Zn=2%")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	golden(t, "weigh-ZnMgY.txt", out)
	// Mg burns readily: the sheet must carry that caution and defer to local rules.
	if !strings.Contains(out, "Mg") || !strings.Contains(out, "rules") {
		t.Errorf("sheet lacks the Mg caution or the deferral to the laboratory's rules:\n%s", out)
	}
}

func TestWeighErrors(t *testing.T) {
	tests := []struct {
		args []string
		want string
	}{
		{[]string{"weigh", "Al63Cu25Fe12"}, "--mass"},
		{[]string{"weigh", "Al63Cu25Fe12", "--mass", "10 parsecs"}, "--mass"},
		{[]string{"weigh", "Al63Cu25Fe12", "--mass", "-10g"}, "--mass"},
		{[]string{"weigh", "Al63Cu25Fe12", "--mass", "10g", "--purity", "Al"}, "--purity"},
		{[]string{"weigh", "Al63Cu25Fe12", "--mass", "10g", "--purity", "Al=101"}, "--purity"},
		{[]string{"weigh", "Al63Cu25Fe12", "--mass", "10g", "--loss", "Mg=2%"}, "Mg"},
		{[]string{"weigh", "Al63Cu25Fe12", "--mass", "10g", "--json", "--csv"}, "--json"},
		{[]string{"weigh", "Al-", "--mass", "10g"}, "position"},
	}
	for _, tc := range tests {
		t.Run(strings.Join(tc.args, " "), func(t *testing.T) {
			_, errOut, code := runCLI(t, "", tc.args...)
			if code != exitInvalid {
				t.Fatalf("exit %d, want %d; stderr %s", code, exitInvalid, errOut)
			}
			if !strings.Contains(errOut, tc.want) {
				t.Errorf("stderr %q does not mention %q", errOut, tc.want)
			}
		})
	}
}

func TestCooling(t *testing.T) {
	tests := []struct {
		args   []string
		regime string
		rate   float64 // K/s, hand-worked, 0 to skip
		tol    float64 // relative
	}{
		// Hand-worked Newtonian rate with given properties: h·ΔT/(ρ·c_p·t) =
		// 1e5 · (1473.15 − 293.15) / (4000 · 800 · 30e-6) = 1.18e8 / 96 = 1.229167e6 K/s;
		// Bi = 1e5·30e-6/50 = 0.06 < 0.1.
		{[]string{"--thickness", "30um", "--density", "4g/cm3", "--specific-heat", "800J/kgK", "--conductivity", "50W/mK"}, "newtonian", 1.229167e6, 1e-5},
		// A 2 mm casting with k = 20 W/(m·K): Bi = 1e5·2e-3/20 = 10 ≫ 0.1.
		{[]string{"--thickness", "2mm", "--density", "4g/cm3", "--specific-heat", "800J/kgK", "--conductivity", "20W/mK"}, "conduction-limited", 0, 0},
	}
	for _, tc := range tests {
		t.Run(strings.Join(tc.args, " "), func(t *testing.T) {
			out, errOut, code := runCLI(t, "", append([]string{"cooling", "--json"}, tc.args...)...)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errOut)
			}
			var got struct {
				Rate   float64 `json:"rate_K_s"`
				Regime string  `json:"regime"`
			}
			if err := json.Unmarshal([]byte(out), &got); err != nil {
				t.Fatalf("not JSON: %v", err)
			}
			if got.Regime != tc.regime {
				t.Errorf("regime %q, want %q", got.Regime, tc.regime)
			}
			if tc.rate > 0 && math.Abs(got.Rate/tc.rate-1) > tc.tol {
				t.Errorf("rate %.6g K/s, want %.6g (hand-worked)", got.Rate, tc.rate)
			}
		})
	}
	if _, errOut, code := runCLI(t, "", "cooling", "--thickness", "-35um"); code != exitInvalid || !strings.Contains(errOut, "--thickness") {
		t.Errorf("negative thickness: exit %d, stderr %q", code, errOut)
	}
	if _, errOut, code := runCLI(t, "", "cooling", "--thickness", "35furlongs"); code != exitInvalid || !strings.Contains(errOut, "unknown unit") {
		t.Errorf("unknown unit: exit %d, stderr %q", code, errOut)
	}
}

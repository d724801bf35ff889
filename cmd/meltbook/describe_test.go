package main

import (
	"encoding/json"
	"math"
	"strings"
	"testing"
)

func TestDescribeText(t *testing.T) {
	out, errOut, code := runCLI(t, "", "describe", "Al63Cu25Fe12")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	golden(t, "describe-AlCuFe.txt", out)
}

func TestDescribeJSON(t *testing.T) {
	tests := []struct {
		args   []string
		scheme string
		ea     float64 // expected e/a
		tol    float64
		source string
	}{
		// Hand-worked: 0.65·3 + 0.20·1 + 0.15·(−2.66) = 1.751 (Raynor's Fe valence, as commonly quoted).
		{[]string{"Al65Cu20Fe15"}, "raynor", 1.751, 1e-9, "hand-worked"},
		// Hand-worked: 0.63·3 + 0.25·1 + 0.12·(−2.66) = 1.8208.
		{[]string{"Al-25Cu-12Fe"}, "raynor", 1.8208, 1e-9, "hand-worked"},
		// Hand-worked: 0.6·2 + 0.3·2 + 0.1·3 = 2.10.
		{[]string{"Zn60Mg30Y10", "--scheme", "group"}, "group", 2.10, 1e-9, "hand-worked"},
		// Cd and divalent Yb both give 2 electrons: e/a = 2.00 for any Cd-Yb ratio.
		{[]string{"Cd84Yb16", "--scheme", "group"}, "group", 2.00, 1e-9, "hand-worked"},
	}
	for _, tc := range tests {
		t.Run(strings.Join(tc.args, " "), func(t *testing.T) {
			out, errOut, code := runCLI(t, "", append([]string{"describe", "--json"}, tc.args...)...)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errOut)
			}
			var got map[string]any
			if err := json.Unmarshal([]byte(out), &got); err != nil {
				t.Fatalf("not JSON: %v\n%s", err, out)
			}
			for _, key := range []string{"atomic_fractions", "weight_fractions", "e_over_a", "scheme", "vec", "delta_pct", "delta_chi", "two_kf_inv_A", "flags"} {
				if _, ok := got[key]; !ok {
					t.Errorf("JSON lacks key %q", key)
				}
			}
			if ea := got["e_over_a"].(float64); math.Abs(ea-tc.ea) > tc.tol {
				t.Errorf("e_over_a = %.6f, want %.6f (%s)", ea, tc.ea, tc.source)
			}
			if got["scheme"] != tc.scheme {
				t.Errorf("scheme = %v, want %s", got["scheme"], tc.scheme)
			}
		})
	}
}

func TestDescribeErrors(t *testing.T) {
	tests := []struct {
		args []string
		want string // substring of stderr
	}{
		{[]string{"describe", "Xx50Al50"}, "position 0"},
		{[]string{"describe", "Al-25Cu-"}, "position 8"},
		{[]string{"describe", ""}, "position 0"},
		{[]string{"describe", "Al63Cu25Fe12", "--scheme", "no-such-scheme"}, "--scheme"},
		{[]string{"describe", "Al63Cu25Fe12", "--density", "-3"}, "density"},
		{[]string{"describe"}, "COMPOSITION"},
	}
	for _, tc := range tests {
		t.Run(strings.Join(tc.args, " "), func(t *testing.T) {
			out, errOut, code := runCLI(t, "", tc.args...)
			if code == 0 {
				t.Fatalf("exit 0, want an error; stdout:\n%s", out)
			}
			if !strings.Contains(errOut, tc.want) {
				t.Errorf("stderr %q does not mention %q", errOut, tc.want)
			}
			if strings.Contains(errOut, "goroutine") || strings.Contains(errOut, "panic") {
				t.Errorf("stderr holds a stack trace: %s", errOut)
			}
		})
	}
}

func TestDescribePartial(t *testing.T) {
	// Raynor gave no valence for Ti, and boron has no CN12 radius in the
	// element table: e/a and δ are null, the rest is still given.
	out, errOut, code := runCLI(t, "", "describe", "--json", "(Ti0.5Zr0.5)83Ni17")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var got map[string]any
	if err := json.Unmarshal([]byte(out), &got); err != nil {
		t.Fatal(err)
	}
	if got["e_over_a"] != nil || got["vec"] == nil || got["delta_pct"] == nil {
		t.Errorf("e_over_a %v, vec %v, delta_pct %v", got["e_over_a"], got["vec"], got["delta_pct"])
	}
	if u, _ := got["undefined"].([]any); len(u) != 1 || !strings.Contains(u[0].(string), "Ti") {
		t.Errorf("undefined = %v, want one note naming Ti", got["undefined"])
	}
	out, _, code = runCLI(t, "", "describe", "(Al0.7Pd0.2Mn0.1)99B1")
	if code != 0 || !strings.Contains(out, "δ: no CN12 metallic radius is tabulated for B") {
		t.Errorf("exit %d, output lacks the undefined δ note:\n%s", code, out)
	}
}

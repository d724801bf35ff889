package main

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// fccAluminiumPeakList writes a peak list of fcc Al lines up to 2θ = 140°
// with Cu Kα1, positions from Bragg's law with a = 4.0495 Å (handbook value,
// from memory) and rough relative intensities.
func fccAluminiumPeakList(t *testing.T) string {
	t.Helper()
	const a = 4.0495
	var b strings.Builder
	b.WriteString("# 2theta  I\n")
	for _, r := range []struct{ s, i int }{{3, 100}, {4, 47}, {8, 22}, {11, 24}, {12, 7}, {16, 2}, {19, 8}, {20, 8}} {
		fmt.Fprintf(&b, "%.4f %d\n", braggTwoTheta(a/math.Sqrt(float64(r.s)), cuKa1), r.i)
	}
	path := filepath.Join(t.TempDir(), "al-peaks.txt")
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func TestIndexPeakListCubic(t *testing.T) {
	path := fccAluminiumPeakList(t)
	out, errOut, code := runCLI(t, "", "index", path, "--peaks", "--anode", "Cu", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var res struct {
		Phases []struct {
			Kind    string  `json:"kind"`
			Lattice string  `json:"lattice"`
			A       float64 `json:"a_A"`
			Chance  float64 `json:"chance"`
			Peaks   []struct {
				HKL *[3]int `json:"hkl"`
			} `json:"peaks"`
		} `json:"phases"`
		Unexplained []any `json:"unexplained"`
	}
	if err := json.Unmarshal([]byte(out), &res); err != nil {
		t.Fatalf("not JSON: %v\n%s", err, out)
	}
	if len(res.Phases) != 1 {
		t.Fatalf("got %d phases, want 1:\n%s", len(res.Phases), out)
	}
	p := res.Phases[0]
	if p.Kind != "cubic" || p.Lattice != "F" || math.Abs(p.A-4.0495) > 0.002 {
		t.Errorf("got %s %s a = %.4f Å, want cubic F a = 4.0495 Å (handbook value for Al)", p.Kind, p.Lattice, p.A)
	}
	if len(p.Peaks) != 8 || len(res.Unexplained) != 0 {
		t.Errorf("%d peaks indexed, %d unexplained; want 8 and 0", len(p.Peaks), len(res.Unexplained))
	}
	if p.Peaks[0].HKL == nil || *p.Peaks[0].HKL != [3]int{1, 1, 1} {
		t.Errorf("first peak hkl %v, want 111", p.Peaks[0].HKL)
	}
}

func TestIndexText(t *testing.T) {
	path := fccAluminiumPeakList(t)
	out, errOut, code := runCLI(t, "", "index", path, "--peaks")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	// The built-in phase library holds fcc Al, so the phase is named.
	if !strings.Contains(out, "Al, cubic Fm-3m, a = 4.04") || !strings.Contains(out, "111") {
		t.Errorf("text output lacks Al, cubic Fm-3m, or its 111 line:\n%s", out)
	}
	if !strings.Contains(errOut, "Cu Kα1 assumed") {
		t.Errorf("stderr does not say Cu Kα1 was assumed: %q", errOut)
	}
}

func TestIndexBadInput(t *testing.T) {
	dir := t.TempDir()
	two := filepath.Join(dir, "two.txt")
	if err := os.WriteFile(two, []byte("38.5 100\n44.7 50\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	_, errOut, code := runCLI(t, "", "index", two, "--peaks")
	if code != exitInvalid || !strings.Contains(errOut, "two.txt") {
		t.Errorf("two peaks: exit %d, stderr %q", code, errOut)
	}
	_, errOut, code = runCLI(t, "", "index", fccAluminiumPeakList(t), "--peaks", "--wavelength", "-1")
	if code != exitInvalid || !strings.Contains(errOut, "--wavelength") {
		t.Errorf("negative wavelength: exit %d, stderr %q", code, errOut)
	}
}

package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestPhasesList(t *testing.T) {
	t.Setenv("MELTBOOK_NOTEBOOK", filepath.Join(t.TempDir(), "none.db"))
	out, errOut, code := runCLI(t, "", "phases")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	golden(t, "phases.txt", out)
	out, _, code = runCLI(t, "", "phases", "--composition", "Al62Cu25.5Fe12.5", "--json")
	if code != 0 {
		t.Fatal(out)
	}
	var got []phaseSummary
	if err := json.Unmarshal([]byte(out), &got); err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, p := range got {
		names = append(names, p.Name)
	}
	// The built-in phases whose elements Al, Cu and Fe cover.
	if strings.Join(names, " ") != "Al β-Al(Cu,Fe) θ-Al2Cu" {
		t.Errorf("phases of Al-Cu-Fe: %v", names)
	}
}

func TestPhasesShow(t *testing.T) {
	t.Setenv("MELTBOOK_NOTEBOOK", filepath.Join(t.TempDir(), "none.db"))
	out, errOut, code := runCLI(t, "", "phases", "show", "theta-Al2Cu", "--lines", "6", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var got struct {
		WavelengthA float64     `json:"wavelength_angstrom"`
		Lines       []shownLine `json:"lines"`
	}
	if err := json.Unmarshal([]byte(out), &got); err != nil {
		t.Fatal(err)
	}
	if len(got.Lines) != 6 {
		t.Fatalf("%d lines, want 6", len(got.Lines))
	}
	// θ-Al2Cu's strongest line is (110) at d = a/√2 = 4.290 Å, 2θ = 20.69°
	// at Cu Kα1 (a = 6.067 Å from memory; the line's rank as in pymatgen's
	// pattern of the same structure, see analysis/phaselib's tests).
	first := got.Lines[0]
	if first.HKL != [3]int{1, 1, 0} || first.Relative != 100 || first.DA < 4.289 || first.DA > 4.291 {
		t.Errorf("first line %+v", first)
	}
	_, errOut, code = runCLI(t, "", "phases", "show", "omega-Al7Cu2Fe")
	if code == 0 || !strings.Contains(errOut, "theta-Al2Cu") {
		t.Errorf("unknown phase: exit %d, %q; want an error listing the library", code, errOut)
	}
}

func TestSettingPhaseLibrary(t *testing.T) {
	nb := filepath.Join(t.TempDir(), "nb.db")
	t.Setenv("MELTBOOK_NOTEBOOK", nb)
	if _, e, code := runCLI(t, "", "init"); code != 0 {
		t.Fatal(e)
	}
	dir := t.TempDir()
	// The library folders' test file of analysis/phaselib.
	cifData, err := os.ReadFile(filepath.Join("..", "..", "analysis", "phaselib", "testdata", "user-Cu.cif"))
	if err != nil {
		t.Fatal(err)
	}
	cif := string(cifData)
	if err := os.WriteFile(filepath.Join(dir, "cu.cif"), []byte(cif), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, e, code := runCLI(t, "", "setting", "phase-library", dir); code != 0 {
		t.Fatal(e)
	}
	out, _, _ := runCLI(t, "", "phases")
	if !strings.Contains(out, "Cu   ") || !strings.Contains(out, filepath.Join(dir, "cu.cif")) {
		t.Errorf("phases with the notebook's folder:\n%s", out)
	}
	// A folder whose file does not read is refused before the setting
	// changes.
	bad := t.TempDir()
	if err := os.WriteFile(filepath.Join(bad, "b.cif"), []byte(strings.Replace(cif, "_cell_length_a 3.6149", "_cell_length_a 3,6149", 1)), 0o644); err != nil {
		t.Fatal(err)
	}
	_, errOut, code := runCLI(t, "", "setting", "phase-library", bad)
	if code == 0 || !strings.Contains(errOut, "b.cif:9") {
		t.Errorf("bad folder: exit %d, %q", code, errOut)
	}
	out, _, _ = runCLI(t, "", "setting", "phase-library")
	if strings.TrimSpace(out) != dir {
		t.Errorf("setting after a refused change = %q, want %q", out, dir)
	}
}

// TestIndexWholePattern runs index on a synthetic fcc Al scan (Gaussian
// doublets, a = 4.0495 Å: see fccAluminiumSpacings): the library names Al
// and the Le Bail check refines a to within 0.0005 Å of the scan's, with
// Rwp within 50 % of the expected Rexp (Gaussian lines fitted by
// pseudo-Voigts; the tolerance is this test's choice).
func TestIndexWholePattern(t *testing.T) {
	_, ds := fccAluminiumSpacings()
	path := syntheticScan(t, "al.xy", ds, []float64{4000, 1900, 1100, 1200, 350}, 20, 90, 0.02, 5)
	t.Setenv("MELTBOOK_NOTEBOOK", filepath.Join(t.TempDir(), "none.db"))
	out, errOut, code := runCLI(t, "", "index", path, "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var got struct {
		Phases []struct {
			Phase string `json:"phase"`
		} `json:"phases"`
		WholePattern *wholePatternCheck `json:"whole_pattern"`
	}
	if err := json.Unmarshal([]byte(out), &got); err != nil {
		t.Fatal(err)
	}
	if len(got.Phases) != 1 || got.Phases[0].Phase != "Al" {
		t.Fatalf("phases %+v; want Al", got.Phases)
	}
	w := got.WholePattern
	if w == nil || w.Error != "" || len(w.Cells) != 1 {
		t.Fatalf("whole-pattern check %+v", w)
	}
	if a := w.Cells[0].Cell[0]; a < 4.0490 || a > 4.0500 {
		t.Errorf("refined a = %.5f Å, want 4.0495 ± 0.0005", a)
	}
	if !(w.Rwp > 0 && w.Rwp < 1.5*w.Rexp) {
		t.Errorf("Rwp %.4f, Rexp %.4f", w.Rwp, w.Rexp)
	}
	text, _, _ := runCLI(t, "", "index", path)
	if !strings.Contains(text, "Whole-pattern check (Le Bail): Rwp") {
		t.Errorf("text output lacks the whole-pattern check:\n%s", text)
	}
}

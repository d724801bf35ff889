package intake_test

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"meltbook"
	"meltbook/store"
	"meltbook/store/intake"
)

// cuCIF is fcc copper, a = 3.6149 Å (from memory: handbook value for pure
// copper at room temperature), as a user's own library file: the file the
// tests of analysis/phaselib use.
var cuCIF = func() string {
	b, err := os.ReadFile(filepath.Join("..", "..", "analysis", "phaselib", "testdata", "user-Cu.cif"))
	if err != nil {
		panic(err)
	}
	return string(b)
}()

// fccCuLines are copper's lines 111 to 311 at a = 3.6149 Å with heights
// roughly as a powder pattern of fcc copper has them (from memory).
func fccCuLines() []line {
	return cubicLines(3.6149, [][3]int{{1, 1, 1}, {2, 0, 0}, {2, 2, 0}, {3, 1, 1}, {2, 2, 2}}, []float64{100, 46, 20, 17, 5})
}

func TestLibraryFromSettingAndOptions(t *testing.T) {
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "Cu.cif"), []byte(cuCIF), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, viaSetting := range []bool{true, false} {
		st := mustOpen(t)
		addMelt(t, st, "QC-0001", "Cu", 0.97, "Al", 0.03)
		opt := intake.Options{Radiation: "Cu"}
		if viaSetting {
			if err := st.SetSetting(ctx, "Ada Quill", store.SettingPhaseLibrary, dir); err != nil {
				t.Fatal(err)
			}
		} else {
			opt.LibraryDirs = []string{dir}
		}
		res, err := intake.Add(ctx, st, "Ada Quill", intake.File{Sample: "QC-0001", Name: "cu.xy", Data: pattern(fccCuLines(), 5000, nil, 3)}, opt)
		if err != nil {
			t.Fatal(err)
		}
		if ph := only(t, res); ph.Phase != "Cu" || ph.SpaceGroup != "Fm-3m" {
			t.Errorf("setting %v: phase %s; want the user's Cu", viaSetting, ph.Title())
		}
	}
}

func TestLibraryBadSettingRefusedNothingStored(t *testing.T) {
	st := mustOpen(t)
	addMelt(t, st, "QC-0001", "Cu", 0.97, "Al", 0.03)
	dir := t.TempDir()
	bad := strings.Replace(cuCIF, "_cell_length_a 3.6149", "_cell_length_a -3.6", 1)
	if err := os.WriteFile(filepath.Join(dir, "Cu.cif"), []byte(bad), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := st.SetSetting(ctx, "Ada Quill", store.SettingPhaseLibrary, dir); err != nil {
		t.Fatal(err)
	}
	var before bytes.Buffer
	if err := st.Export(ctx, &before); err != nil {
		t.Fatal(err)
	}
	_, err := intake.Add(ctx, st, "Ada Quill", intake.File{Sample: "QC-0001", Name: "cu.xy", Data: pattern(fccCuLines(), 5000, nil, 3)}, intake.Options{Radiation: "Cu"})
	if meltbook.KindOf(err) != meltbook.Invalid || !strings.Contains(err.Error(), "Cu.cif:") || !strings.Contains(err.Error(), "phase-library") {
		t.Fatalf("error %v; want Invalid naming the file and the setting", err)
	}
	var after bytes.Buffer
	if err := st.Export(ctx, &after); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(before.Bytes(), after.Bytes()) {
		t.Error("a refused scan changed the notebook")
	}
}

package indexing_test

import (
	"encoding/json"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"meltbook/analysis/indexing"
)

// calibrationEnv makes the test binary act as a fresh process that loads a
// calibration file, indexes calibrationList and prints the chances.
const calibrationEnv = "MELTBOOK_TEST_CALIBRATION_FILE"

// calibrationList is fcc Al (a = 4.0495 Å, from memory: handbook value)
// seen with Cu Kα1 at 2θ = 2 asin(λ√(h²+k²+l²)/2a), 111 to 420, with
// lines of a second, unknown phase at 31.7° and 57.3°: a list that no
// other test indexes.
func calibrationList() []indexing.Peak {
	var out []indexing.Peak
	for i, s := range []int{3, 4, 8, 11, 12, 16, 19, 20} {
		tt := 2 * math.Asin(cuKa1*math.Sqrt(float64(s))/(2*4.0495)) * 180 / math.Pi
		out = append(out, indexing.Peak{TwoThetaDeg: tt, Intensity: float64(100 - 10*i)})
	}
	return append(out, indexing.Peak{TwoThetaDeg: 31.7, Intensity: 12}, indexing.Peak{TwoThetaDeg: 57.3, Intensity: 9})
}

// chances lists the chance of every model tried, in the result's order.
func chances(t testing.TB) []float64 {
	res, err := indexing.Index(calibrationList(), cuKa1, indexing.Options{})
	if err != nil {
		t.Fatal(err)
	}
	var out []float64
	for _, m := range res.Models {
		out = append(out, m.Chance)
	}
	for _, p := range res.Phases {
		out = append(out, p.Chance)
	}
	return out
}

// TestCalibrationProcess is the fresh process of TestCalibrationKept.
func TestCalibrationProcess(t *testing.T) {
	path := os.Getenv(calibrationEnv)
	if path == "" {
		t.Skip("runs only as the fresh process of TestCalibrationKept")
	}
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var c indexing.Calibration
	if err := json.Unmarshal(b, &c); err != nil {
		t.Fatal(err)
	}
	loaded := indexing.LoadCalibration(c)
	out, _ := json.Marshal(struct {
		Loaded  int
		Chances []float64
	}{loaded, chances(t)})
	os.Stdout.Write(append([]byte("RESULT "), append(out, '\n')...))
}

// fresh runs the test binary as a fresh process on a calibration file.
func fresh(t *testing.T, path string) (loaded int, chances []float64) {
	t.Helper()
	cmd := exec.Command(os.Args[0], "-test.run=^TestCalibrationProcess$", "-test.v")
	cmd.Env = append(os.Environ(), calibrationEnv+"="+path)
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("fresh process: %v\n%s", err, out)
	}
	for _, line := range strings.Split(string(out), "\n") {
		if rest, ok := strings.CutPrefix(line, "RESULT "); ok {
			var r struct {
				Loaded  int
				Chances []float64
			}
			if err := json.Unmarshal([]byte(rest), &r); err != nil {
				t.Fatal(err)
			}
			return r.Loaded, r.Chances
		}
	}
	t.Fatalf("fresh process printed no result:\n%s", out)
	return 0, nil
}

// A calibration kept in a file and loaded by a fresh process gives the
// same chances as computing them; a file whose scores were altered gives
// the same chances too, because the check on first use throws the altered
// scores away; a file of another version is not loaded.
func TestCalibrationKept(t *testing.T) {
	if testing.Short() {
		t.Skip("starts three processes")
	}
	want := chances(t)
	snap := indexing.SnapshotCalibration()
	if len(snap.Entries) == 0 || snap.Version != indexing.CalibrationVersion {
		t.Fatalf("snapshot of %d entries, version %q", len(snap.Entries), snap.Version)
	}
	dir := t.TempDir()
	write := func(name string, c indexing.Calibration) string {
		b, err := json.Marshal(c)
		if err != nil {
			t.Fatal(err)
		}
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, b, 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	same := func(got []float64) bool {
		if len(got) != len(want) {
			return false
		}
		for i := range got {
			if got[i] != want[i] {
				return false
			}
		}
		return true
	}

	loaded, got := fresh(t, write("kept.json", snap))
	if loaded != len(snap.Entries) || !same(got) {
		t.Errorf("kept: loaded %d of %d entries, chances %v; want %v", loaded, len(snap.Entries), got, want)
	}

	altered := indexing.Calibration{Version: snap.Version}
	for _, e := range snap.Entries {
		e.Scores = append([]float64(nil), e.Scores...)
		for i := range e.Scores {
			e.Scores[i] = e.Scores[i]*1.3 + 0.5
		}
		altered.Entries = append(altered.Entries, e)
	}
	if _, got := fresh(t, write("altered.json", altered)); !same(got) {
		t.Errorf("altered scores: chances %v; want %v (the check should discard them)", got, want)
	}

	old := snap
	old.Version = "indexing-null-0"
	if loaded, got := fresh(t, write("old.json", old)); loaded != 0 || !same(got) {
		t.Errorf("another version: loaded %d entries, chances %v", loaded, got)
	}
}

func TestLoadCalibrationRefusesImpossibleEntries(t *testing.T) {
	c := indexing.Calibration{Version: indexing.CalibrationVersion, Entries: []indexing.CalibrationEntry{
		{Model: "x", Peaks: 0, FromDeg: 20, ToDeg: 40, Scores: []float64{1, 2, 3, 4}},
		{Model: "x", Peaks: 5, FromDeg: 40, ToDeg: 20, Scores: []float64{1, 2, 3, 4}},
		{Model: "x", Peaks: 5, FromDeg: 20, ToDeg: 40, Scores: []float64{1, 2}},
		{Model: "x", Peaks: 5, FromDeg: 20, ToDeg: 40, Scores: []float64{1, 2, -3, 4}},
		{Model: "x", Peaks: 5, FromDeg: 20, ToDeg: 40, Scores: []float64{1, 2, math.Inf(1), 4}},
	}}
	if n := indexing.LoadCalibration(c); n != 0 {
		t.Errorf("took %d impossible entries", n)
	}
}

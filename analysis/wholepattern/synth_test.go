package wholepattern_test

import (
	"encoding/json"
	"os"
	"sync"
	"testing"

	"meltbook/analysis/internal/pyref"
	"meltbook/analysis/wholepattern"
)

// synthModules are the reference libraries testdata/synth.py imports.
var synthModules = []string{"numpy", "scipy.special", "pymatgen.core", "pymatgen.analysis.diffraction.xrd"}

// synthData is what testdata/synth.py prints: the angles, the Poisson
// patterns and pymatgen's reflection lists (h, k, l, multiplicity).
type synthData struct {
	X           []float64            `json:"x"`
	Patterns    map[string][]float64 `json:"patterns"`
	Reflections map[string][][4]int  `json:"reflections"`
}

var (
	synthOnce sync.Once
	synth     *synthData
)

// loadSynth runs testdata/synth.py once for all tests, skipping (or, under
// CI=true, failing) when the reference libraries are missing.
func loadSynth(t testing.TB) *synthData {
	t.Helper()
	pyref.Require(t, synthModules...)
	synthOnce.Do(func() {
		script, err := os.ReadFile("testdata/synth.py")
		if err != nil {
			t.Fatal(err)
		}
		var d synthData
		if err := json.Unmarshal(pyref.Run(t, synthModules, string(script), nil), &d); err != nil {
			t.Fatalf("synth.py output: %v", err)
		}
		synth = &d
	})
	if synth == nil {
		t.Fatal("synthetic patterns unavailable (an earlier test failed to build them)")
	}
	return synth
}

func (d *synthData) reflections(name string) []wholepattern.Reflection {
	var out []wholepattern.Reflection
	for _, r := range d.Reflections[name] {
		out = append(out, wholepattern.Reflection{HKL: [3]int{r[0], r[1], r[2]}, Multiplicity: r[3]})
	}
	return out
}

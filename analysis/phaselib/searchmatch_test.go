package phaselib_test

import (
	"encoding/json"
	"math"
	"path/filepath"
	"sort"
	"strings"
	"testing"

	"meltbook/analysis/indexing"
	"meltbook/analysis/internal/pyref"
	"meltbook/analysis/phaselib"
)

// pymatgenLines reads each CIF with pymatgen's own CIF parser (not this
// project's reader) and prints its XRDCalculator pattern at Cu Kα1 from
// 2θ = 15° to 100°.
const pymatgenLines = `
import sys, json, warnings
warnings.simplefilter("ignore")
from pymatgen.io.cif import CifParser
from pymatgen.analysis.diffraction.xrd import XRDCalculator, WAVELENGTHS
calc = XRDCalculator(wavelength="CuKa1")
out = {}
for path in json.load(sys.stdin):
    s = CifParser(path).get_structures(primitive=False)[0]
    p = calc.get_pattern(s, two_theta_range=(15, 100))
    out[path] = {"wavelength": WAVELENGTHS["CuKa1"], "lines": [[float(x), float(y)] for x, y in zip(p.x, p.y)]}
json.dump(out, sys.stdout)
`

type refPattern struct {
	Wavelength float64      `json:"wavelength"`
	Lines      [][2]float64 `json:"lines"`
}

func referencePatterns(t *testing.T) map[string]refPattern {
	t.Helper()
	files, err := filepath.Glob("phases/*.cif")
	if err != nil || len(files) == 0 {
		t.Fatalf("no phase files: %v", err)
	}
	for i := range files {
		files[i], _ = filepath.Abs(files[i])
	}
	in, _ := json.Marshal(files)
	out := pyref.Run(t, []string{"pymatgen.io.cif", "pymatgen.analysis.diffraction.xrd"}, pymatgenLines, in)
	var got map[string]refPattern
	if err := json.Unmarshal(out, &got); err != nil {
		t.Fatalf("pymatgen output: %v", err)
	}
	return got
}

// strongest keeps the n strongest lines of at least 2 % of the strongest,
// in 2θ order, and shifts each by a small repeatable offset within
// ±0.02° (common practice: a well-aligned diffractometer places lines
// within a few hundredths of a degree).
func strongest(lines [][2]float64, n int) []indexing.Peak {
	var ps []indexing.Peak
	for i, l := range lines {
		if l[1] < 2 {
			continue
		}
		jitter := 0.02 * math.Sin(float64(7*i+3))
		ps = append(ps, indexing.Peak{TwoThetaDeg: l[0] + jitter, Intensity: l[1]})
	}
	sort.Slice(ps, func(i, j int) bool { return ps[i].Intensity > ps[j].Intensity })
	if len(ps) > n {
		ps = ps[:n]
	}
	sort.Slice(ps, func(i, j int) bool { return ps[i].TwoThetaDeg < ps[j].TwoThetaDeg })
	return ps
}

// TestSearchMatchNamesEachPhase indexes pymatgen's pattern of every
// built-in phase (read by pymatgen's CIF parser, its own scattering
// factors) against the whole library, as `meltbook index` does without a
// composition: the phase must be named, and no other library phase.
func TestSearchMatchNamesEachPhase(t *testing.T) {
	lib := builtin(t)
	refs := referencePatterns(t)
	for path, ref := range refs {
		data := ref
		t.Run(filepath.Base(path), func(t *testing.T) {
			known, err := phaselib.KnownPhases(lib.Phases(), data.Wavelength)
			if err != nil {
				t.Fatal(err)
			}
			ps, err := phaselib.Parse(filepath.Base(path), mustRead(t, path))
			if err != nil {
				t.Fatal(err)
			}
			want := ps[0].Name
			peaks := strongest(data.Lines, 14)
			if len(peaks) < 4 {
				t.Skipf("only %d lines ≥ 2 %% from 15° to 100°", len(peaks))
			}
			res, err := indexing.Index(peaks, data.Wavelength, indexing.Options{Library: known})
			if err != nil {
				t.Fatal(err)
			}
			var named []string
			for _, ph := range res.Phases {
				if ph.Phase != "" {
					named = append(named, ph.Phase)
				}
			}
			if len(named) == 0 || named[0] != want {
				t.Fatalf("%d peaks: named %v, want %s first; phases %s", len(peaks), named, want, titles(res))
			}
			for _, n := range named[1:] {
				t.Errorf("also named %s", n)
			}
		})
	}
}

func titles(r indexing.Result) string {
	var s []string
	for _, p := range r.Phases {
		s = append(s, p.Title())
	}
	return strings.Join(s, "; ")
}

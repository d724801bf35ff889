package indexing_test

import (
	"encoding/json"
	"math"
	"math/rand/v2"
	"sort"
	"testing"

	"meltbook/analysis/crystal"
	"meltbook/analysis/indexing"
	"meltbook/analysis/internal/pyref"
)

// anyPatternScript simulates powder patterns of any crystal system with
// pymatgen's XRDCalculator at its "CuKa1" wavelength and prints, per
// structure, the wavelength and each line's 2θ, intensity, d and first hkl
// (the last three Miller–Bravais indices for hexagonal cells).
const anyPatternScript = `
import sys, json
from pymatgen.core import Structure, Lattice
from pymatgen.analysis.diffraction.xrd import XRDCalculator, WAVELENGTHS
specs = json.load(sys.stdin)
calc = XRDCalculator(wavelength="CuKa1")
out = {}
for name, sp in specs.items():
    lat = Lattice.from_parameters(*sp["cell"])
    s = Structure.from_spacegroup(sp["group"], lat, sp["species"], sp["coords"])
    p = calc.get_pattern(s, two_theta_range=tuple(sp["range"]))
    lines = []
    for x, y, hk, d in zip(p.x, p.y, p.hkls, p.d_hkls):
        h = hk[0]["hkl"]
        if len(h) == 4:
            h = (h[0], h[1], h[3])
        lines.append([float(x), float(y), float(d), int(h[0]), int(h[1]), int(h[2])])
    out[name] = {"wavelength": WAVELENGTHS["CuKa1"], "lines": lines}
json.dump(out, sys.stdout)
`

type anySpec struct {
	Group   string       `json:"group"`
	Cell    [6]float64   `json:"cell"`
	Species []string     `json:"species"`
	Coords  [][3]float64 `json:"coords"`
	Range   [2]float64   `json:"range"`
}

type simulated struct {
	Wavelength float64      `json:"wavelength"`
	Lines      [][6]float64 `json:"lines"`
}

func simulate(t *testing.T, specs map[string]anySpec) map[string]simulated {
	t.Helper()
	in, _ := json.Marshal(specs)
	out := pyref.Run(t, []string{"pymatgen.core", "pymatgen.analysis.diffraction.xrd"}, anyPatternScript, in)
	var got map[string]simulated
	if err := json.Unmarshal(out, &got); err != nil {
		t.Fatalf("pymatgen output: %v", err)
	}
	return got
}

// Published cells used below, all from memory of the handbook values
// (Pearson's Handbook, room temperature): Mg P6₃/mmc a = 3.2094,
// c = 5.2108 Å; Zn P6₃/mmc a = 2.6649, c = 4.9468 Å; Al Fm-3m
// a = 4.0495 Å; Si Fd-3m a = 5.4309 Å; θ-Al2Cu I4/mcm a = 6.067,
// c = 4.877 Å with Cu at 4a (0, 0, ¼) and Al at 8h (x, x+½, 0), x = 0.158.
var knownSpecs = map[string]anySpec{
	"Mg":      {"P6_3/mmc", [6]float64{3.2094, 3.2094, 5.2108, 90, 90, 120}, []string{"Mg"}, [][3]float64{{1.0 / 3, 2.0 / 3, 0.25}}, [2]float64{10, 120}},
	"Zn":      {"P6_3/mmc", [6]float64{2.6649, 2.6649, 4.9468, 90, 90, 120}, []string{"Zn"}, [][3]float64{{1.0 / 3, 2.0 / 3, 0.25}}, [2]float64{10, 120}},
	"Al":      {"Fm-3m", [6]float64{4.0495, 4.0495, 4.0495, 90, 90, 90}, []string{"Al"}, [][3]float64{{0, 0, 0}}, [2]float64{10, 120}},
	"Si":      {"Fd-3m", [6]float64{5.4309, 5.4309, 5.4309, 90, 90, 90}, []string{"Si"}, [][3]float64{{0, 0, 0}}, [2]float64{10, 120}},
	"θ-Al2Cu": {"I4/mcm", [6]float64{6.067, 6.067, 4.877, 90, 90, 90}, []string{"Cu", "Al"}, [][3]float64{{0, 0, 0.25}, {0.158, 0.658, 0}}, [2]float64{10, 120}},
}

var knownSystems = map[string]struct {
	kind     indexing.Kind
	centring string
	group    string
}{
	"Mg": {indexing.Hexagonal, "P", "P63/mmc"}, "Zn": {indexing.Hexagonal, "P", "P63/mmc"},
	"Al": {indexing.Cubic, "F", "Fm-3m"}, "Si": {indexing.Cubic, "F", "Fd-3m"},
	"θ-Al2Cu": {indexing.Tetragonal, "I", "I4/mcm"},
}

// library builds the test's library from pymatgen's lines at the published
// cells (the search-match is what is under test, not the pattern).
func library(t *testing.T, sims map[string]simulated) []indexing.KnownPhase {
	var lib []indexing.KnownPhase
	for name, sys := range knownSystems {
		sp := knownSpecs[name]
		k := indexing.KnownPhase{Name: name, System: sys.kind, Centring: sys.centring, SpaceGroup: sys.group,
			Reference: "test", Cell: crystal.Cell{A: sp.Cell[0], B: sp.Cell[1], C: sp.Cell[2], Alpha: sp.Cell[3], Beta: sp.Cell[4], Gamma: sp.Cell[5]}}
		for _, l := range sims[name].Lines {
			k.Lines = append(k.Lines, indexing.KnownLine{DSpacingA: l[2], Intensity: l[1], HKL: [3]int{int(l[3]), int(l[4]), int(l[5])}})
		}
		lib = append(lib, k)
	}
	sort.Slice(lib, func(i, j int) bool { return lib[i].Name < lib[j].Name })
	return lib
}

// observed turns pymatgen's lines into a measured-looking list: lines
// below minRel % dropped, positions moved by a zero shift and a seeded
// jitter of up to ±jitter degrees, intensities scaled by a random factor
// in [0.6, 1.4] (texture of a ribbon).
func observed(lines [][6]float64, minRel, zero, jitter float64, seed uint64) []indexing.Peak {
	rng := rand.New(rand.NewPCG(seed, 1))
	var out []indexing.Peak
	for _, l := range lines {
		if l[1] < minRel {
			continue
		}
		out = append(out, indexing.Peak{TwoThetaDeg: l[0] + zero + jitter*(2*rng.Float64()-1), Intensity: l[1] * (0.6 + 0.8*rng.Float64())})
	}
	return out
}

// strained returns the spec with every edge scaled by f.
func strained(sp anySpec, f float64) anySpec {
	sp.Cell[0] *= f
	sp.Cell[1] *= f
	sp.Cell[2] *= f
	return sp
}

func TestSearchMatchNamesLibraryPhases(t *testing.T) {
	specs := map[string]anySpec{}
	for name, sp := range knownSpecs {
		specs[name] = sp
		// The measured phase: a solid solution 0.8 % larger.
		specs[name+"+"] = strained(sp, 1.008)
	}
	sims := simulate(t, specs)
	lib := library(t, sims)
	for name, sys := range knownSystems {
		t.Run(name, func(t *testing.T) {
			peaks := observed(sims[name+"+"].Lines, 1, 0.03, 0.02, 7)
			res, err := indexing.Index(peaks, sims[name].Wavelength, indexing.Options{Library: lib})
			if err != nil {
				t.Fatal(err)
			}
			if len(res.Phases) == 0 {
				t.Fatalf("%d peaks: no phase; models %+v", len(peaks), res.Models)
			}
			ph := res.Phases[0]
			t.Logf("%s: %d peaks, %d indexed, S = %.1f, C = %.1f, chance %.2g (%s)", ph.Title(), len(peaks), len(ph.Peaks), ph.FigureOfMerit, ph.Evidence, ph.Chance, ph.ChanceBasis)
			if ph.Phase != name || ph.Kind != sys.kind || ph.Lattice != sys.centring || ph.SpaceGroup != sys.group {
				t.Fatalf("first phase %q %s %s %s, want %s %s %s %s", ph.Phase, ph.Kind, ph.Lattice, ph.SpaceGroup, name, sys.kind, sys.centring, sys.group)
			}
			// Cell scale 1.008 as simulated, within 0.1 % (tolerance: jitter
			// ±0.02° on lines at 2θ ≳ 30°).
			if math.Abs(ph.CellScale-1.008) > 0.001 {
				t.Errorf("cell scale %.5f, want 1.008 ± 0.001", ph.CellScale)
			}
			if math.Abs(ph.AA-1.008*knownSpecs[name].Cell[0]) > 0.001*ph.AA {
				t.Errorf("a = %.4f Å, want %.4f", ph.AA, 1.008*knownSpecs[name].Cell[0])
			}
			if sys.kind != indexing.Cubic && math.Abs(ph.CA-1.008*knownSpecs[name].Cell[2]) > 0.001*ph.CA {
				t.Errorf("c = %.4f Å, want %.4f", ph.CA, 1.008*knownSpecs[name].Cell[2])
			}
			// The zero shift of 0.03° is recovered to 0.02° (common practice:
			// comparable with the jitter).
			if math.Abs(ph.ZeroShiftDeg-0.03) > 0.02 {
				t.Errorf("zero shift %.3f°, want 0.03°", ph.ZeroShiftDeg)
			}
			if len(ph.Peaks) < len(peaks)*8/10 {
				t.Errorf("indexed %d of %d peaks", len(ph.Peaks), len(peaks))
			}
			if len(ph.MissingLines) > 0 {
				t.Errorf("missing lines %+v on a complete pattern", ph.MissingLines)
			}
		})
	}
}

// A phase whose strong lines are absent from the scan is not named, even
// when some of its lines fall on peaks: Zn measured, only Mg, Al and Si in
// the library; and θ-Al2Cu measured with the same library.
func TestSearchMatchRefusesAbsentPhases(t *testing.T) {
	sims := simulate(t, knownSpecs)
	var lib []indexing.KnownPhase
	for _, k := range library(t, sims) {
		if k.Name != "Zn" && k.Name != "θ-Al2Cu" {
			lib = append(lib, k)
		}
	}
	for _, name := range []string{"Zn", "θ-Al2Cu"} {
		peaks := observed(sims[name].Lines, 1, 0, 0.02, 3)
		res, err := indexing.Index(peaks, sims[name].Wavelength, indexing.Options{Library: lib})
		if err != nil {
			t.Fatal(err)
		}
		for _, ph := range res.Phases {
			t.Logf("%s measured: %s, chance %.2g", name, ph.Title(), ph.Chance)
			if ph.Phase != "" {
				t.Errorf("%s measured: library phase %s reported (chance %.2g)", name, ph.Phase, ph.Chance)
			}
		}
	}
}

// Two phases in one scan: Al with 25 % Si by intensity; both are named.
func TestSearchMatchMixture(t *testing.T) {
	sims := simulate(t, knownSpecs)
	lib := library(t, sims)
	peaks := observed(sims["Al"].Lines, 1, 0.02, 0.015, 11)
	for _, p := range observed(sims["Si"].Lines, 1, 0.02, 0.015, 12) {
		p.Intensity *= 0.25
		peaks = append(peaks, p)
	}
	res, err := indexing.Index(peaks, sims["Al"].Wavelength, indexing.Options{Library: lib})
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, ph := range res.Phases {
		names = append(names, ph.Phase)
	}
	if len(names) < 2 || names[0] != "Al" || names[1] != "Si" {
		t.Fatalf("phases %q, want Al then Si", names)
	}
}

// Uniform random lists rarely match a library phase: over 60 seeded lists
// of 12 peaks at most 3 report one (MaxChance 1 %, five phases tried;
// binomial 60 × 0.01 = 0.6 expected, P(X ≥ 4) < 0.01).
func TestSearchMatchRandomLists(t *testing.T) {
	sims := simulate(t, knownSpecs)
	lib := library(t, sims)
	hits := 0
	for seed := uint64(1); seed <= 60; seed++ {
		peaks := randomList(1000+seed, 12, 20, 100)
		res, err := indexing.Index(peaks, sims["Al"].Wavelength, indexing.Options{Library: lib})
		if err != nil {
			t.Fatal(err)
		}
		for _, ph := range res.Phases {
			if ph.Phase != "" {
				hits++
				break
			}
		}
	}
	if hits > 3 {
		t.Errorf("%d of 60 random lists matched a library phase", hits)
	}
}

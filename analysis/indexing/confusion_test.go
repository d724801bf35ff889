package indexing_test

import (
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"sort"
	"strings"
	"testing"

	"meltbook/analysis/indexing"
	"meltbook/analysis/internal/pyref"
)

// randomCrystalScript makes seeded random crystals with pymatgen: for each
// request a space group of the crystal system (its general or special
// positions filled by Structure.from_spacegroup from random coordinates),
// a random cell the system allows and one to three elements, and prints
// the XRDCalculator lines (Cu Kα1, 2θ 20–100°). The symmetry expansion,
// the scattering factors and the Lorentz–polarisation factor are all
// pymatgen's, independent of the indexer and of its decoys.
const randomCrystalScript = `
import sys, json, random
from pymatgen.core import Structure, Lattice
from pymatgen.analysis.diffraction.xrd import XRDCalculator, WAVELENGTHS
groups = {
  "cubic": ["Pm-3m", "Im-3m", "Fm-3m", "Fd-3m", "Pm-3n", "Ia-3d"],
  "tetragonal": ["P4/mmm", "I4/mmm", "P4_2/mnm", "I4/mcm", "P4/nmm"],
  "hexagonal": ["P6_3/mmc", "P6/mmm", "P6_3/m", "P-6m2"],
  "rhombohedral": ["R-3m", "R-3", "R3m"],
  "orthorhombic": ["Pnma", "Cmcm", "Immm", "Fmmm", "Pbam"],
  "monoclinic": ["P2_1/c", "C2/m", "P2/m"],
  "triclinic": ["P-1", "P1"],
}
elements = ["Al", "Cu", "Fe", "Mg", "Zn", "Mn", "Si", "Pd", "Ni", "Co"]
calc = XRDCalculator(wavelength="CuKa1")
out = []
for req in json.load(sys.stdin):
    rng = random.Random(req["seed"])
    system = req["system"]
    while True:
        g = rng.choice(groups[system])
        e = lambda: rng.uniform(3.0, 11.0)
        a, b, c = e(), e(), e()
        if system == "cubic":
            lat = Lattice.cubic(a)
        elif system == "tetragonal":
            lat = Lattice.tetragonal(a, c)
        elif system in ("hexagonal", "rhombohedral"):
            lat = Lattice.hexagonal(a, c * (2.0 if system == "rhombohedral" else 1.0))
        elif system == "orthorhombic":
            lat = Lattice.orthorhombic(a, b, c)
        elif system == "monoclinic":
            lat = Lattice.monoclinic(a, b, c, rng.uniform(95, 120))
        else:
            lat = Lattice.from_parameters(a, b, c, rng.uniform(75, 105), rng.uniform(75, 105), rng.uniform(75, 105))
        n = rng.randint(1, 3)
        species = [rng.choice(elements) for _ in range(n)]
        coords = [[rng.random(), rng.random(), rng.random()] for _ in range(n)]
        try:
            s = Structure.from_spacegroup(g, lat, species, coords, tol=0.01)
        except Exception:
            continue
        if len(s) > 200:
            continue
        p = calc.get_pattern(s, two_theta_range=(20, 100))
        if len(p.x) >= req["lines"]:
            break
    out.append({"system": system, "group": g, "cell": list(lat.abc) + list(lat.angles),
                "wavelength": WAVELENGTHS["CuKa1"], "lines": [[float(x), float(y)] for x, y in zip(p.x, p.y)]})
json.dump(out, sys.stdout)
`

// strongestPeaks merges lines closer than sep degrees, keeps the n
// strongest, and jitters them by up to ±jitter degrees (seeded).
func strongestPeaks(lines [][2]float64, n int, sep, jitter float64, seed uint64) []indexing.Peak {
	var merged []indexing.Peak
	sort.Slice(lines, func(i, j int) bool { return lines[i][0] < lines[j][0] })
	for _, l := range lines {
		if k := len(merged); k > 0 && l[0]-merged[k-1].TwoThetaDeg < sep {
			p := &merged[k-1]
			w := p.Intensity + l[1]
			p.TwoThetaDeg = (p.TwoThetaDeg*p.Intensity + l[0]*l[1]) / w
			p.Intensity = w
			continue
		}
		merged = append(merged, indexing.Peak{TwoThetaDeg: l[0], Intensity: l[1]})
	}
	sort.Slice(merged, func(i, j int) bool { return merged[i].Intensity > merged[j].Intensity })
	if len(merged) > n {
		merged = merged[:n]
	}
	rng := rand.New(rand.NewPCG(seed, 99))
	for i := range merged {
		merged[i].TwoThetaDeg += jitter * (2*rng.Float64() - 1)
	}
	return merged
}

// TestConfusionMatrix indexes seeded patterns of known kind, made outside
// the indexer, with the default models and no library, and prints the
// confusion matrix of true kind against reported kind (the first phase, or
// "none"). Bounds (the acceptance figures of the phase calls):
//   - non-cubic crystals called cubic or icosahedral: ≤ 2 %;
//   - icosahedral patterns called cubic: ≤ 2 %;
//   - cubic crystals called icosahedral: ≤ 1 %.
//
// Patterns: 12 strongest lines in 20–100° (Cu Kα1), lines closer than 0.05°
// merged, positions jittered by ±0.02°. Crystals: pymatgen, above.
// Icosahedral: the test's own projection (projectFamilies), a_R uniform in
// [4.2, 5.8] Å, lattice P, F or I, intensities m·(1 + (|G⊥|a6/0.25)²)⁻²·LP,
// a Lorentzian-squared fall-off unlike the indexer's decoys and intensity
// model.
func TestConfusionMatrix(t *testing.T) {
	if testing.Short() {
		t.Skip("confusion matrix: a few hundred indexings")
	}
	const perSystem = 30
	const lines = 12
	systems := []string{"cubic", "tetragonal", "hexagonal", "rhombohedral", "orthorhombic", "monoclinic", "triclinic"}
	type request struct {
		Seed   int    `json:"seed"`
		System string `json:"system"`
		Lines  int    `json:"lines"`
	}
	var reqs []request
	for si, s := range systems {
		for i := 0; i < perSystem; i++ {
			reqs = append(reqs, request{Seed: 1000*si + i, System: s, Lines: lines})
		}
	}
	in, _ := json.Marshal(reqs)
	out := pyref.Run(t, []string{"pymatgen.core", "pymatgen.analysis.diffraction.xrd"}, randomCrystalScript, in)
	var crystals []struct {
		System     string       `json:"system"`
		Group      string       `json:"group"`
		Cell       [6]float64   `json:"cell"`
		Wavelength float64      `json:"wavelength"`
		Lines      [][2]float64 `json:"lines"`
	}
	if err := json.Unmarshal(out, &crystals); err != nil {
		t.Fatalf("pymatgen output: %v", err)
	}
	type trial struct {
		truth, label string
		peaks        []indexing.Peak
		lambda       float64
	}
	var trials []trial
	for i, c := range crystals {
		trials = append(trials, trial{c.System, fmt.Sprintf("%s %s %.3f %.3f %.3f %.1f %.1f %.1f", c.System, c.Group, c.Cell[0], c.Cell[1], c.Cell[2], c.Cell[3], c.Cell[4], c.Cell[5]),
			strongestPeaks(c.Lines, lines, 0.05, 0.02, uint64(i)), c.Wavelength})
	}
	rng := rand.New(rand.NewPCG(5, 5))
	lattices := []string{"P", "F", "I"}
	for i := 0; i < 2*perSystem; i++ {
		lat := lattices[i%3]
		aR := 4.2 + 1.6*rng.Float64()
		a6 := aR * math.Sqrt2
		var raw [][2]float64
		for _, f := range projectFamilies(lat, 8, 0.8) {
			tt, ok := bragg(f.par/a6, cuKa1)
			if !ok || tt < 20 || tt > 100 {
				continue
			}
			x := f.perp / 0.25
			th := tt * math.Pi / 360
			lp := (1 + math.Pow(math.Cos(2*th), 2)) / (math.Pow(math.Sin(th), 2) * math.Cos(th))
			raw = append(raw, [2]float64{tt, float64(f.mult) / math.Pow(1+x*x, 2) * lp})
		}
		trials = append(trials, trial{"icosahedral", fmt.Sprintf("icosahedral %s a_R %.3f", lat, aR), strongestPeaks(raw, lines, 0.05, 0.02, uint64(500+i)), cuKa1})
	}
	matrix := map[string]map[string]int{}
	count := map[string]int{}
	var wrong []string
	for _, tr := range trials {
		res, err := indexing.Index(tr.peaks, tr.lambda, indexing.Options{})
		if err != nil {
			t.Fatal(err)
		}
		got := "none"
		if len(res.Phases) > 0 {
			got = string(res.Phases[0].Kind)
		}
		if matrix[tr.truth] == nil {
			matrix[tr.truth] = map[string]int{}
		}
		matrix[tr.truth][got]++
		count[tr.truth]++
		bad := (tr.truth != "cubic" && tr.truth != "icosahedral" && (got == "cubic" || got == "icosahedral")) ||
			(tr.truth == "icosahedral" && got == "cubic") || (tr.truth == "cubic" && got == "icosahedral")
		if bad {
			var alt []string
			for _, m := range res.Models {
				if m.Chance < 0.5 {
					alt = append(alt, fmt.Sprintf("%s %s %.3f: %d peaks, S %.1f, C %.1f, chance %.2g", m.Kind, m.Lattice, m.ScaleA, m.IndexedPeaks, m.FigureOfMerit, m.Evidence, m.Chance))
				}
			}
			wrong = append(wrong, fmt.Sprintf("%s → %s (chance %.2g, C %.1f); models: %s", tr.label, res.Phases[0].Title(), res.Phases[0].Chance, res.Phases[0].Evidence, strings.Join(alt, "; ")))
		}
	}
	cols := []string{"icosahedral", "approximant", "cubic", "tetragonal", "hexagonal", "rhombohedral", "orthorhombic", "monoclinic", "triclinic", "none"}
	var b strings.Builder
	fmt.Fprintf(&b, "%-13s", "true\\called")
	for _, c := range cols {
		fmt.Fprintf(&b, " %5.5s", c)
	}
	b.WriteString("\n")
	for _, r := range append(systems, "icosahedral") {
		fmt.Fprintf(&b, "%-13s", r)
		for _, c := range cols {
			fmt.Fprintf(&b, " %5d", matrix[r][c])
		}
		b.WriteString("\n")
	}
	t.Logf("confusion matrix (%d patterns):\n%s", len(trials), b.String())
	for _, w := range wrong {
		t.Logf("wrong call: %s", w)
	}
	nonCubic, nonCubicBad := 0, 0
	for _, s := range systems[1:] {
		nonCubic += count[s]
		nonCubicBad += matrix[s]["cubic"] + matrix[s]["icosahedral"]
	}
	if float64(nonCubicBad) > 0.02*float64(nonCubic) {
		t.Errorf("non-cubic crystals called cubic or icosahedral: %d of %d (bound 2 %%)", nonCubicBad, nonCubic)
	}
	if ic := matrix["icosahedral"]["cubic"]; float64(ic) > 0.02*float64(count["icosahedral"]) {
		t.Errorf("icosahedral patterns called cubic: %d of %d (bound 2 %%)", ic, count["icosahedral"])
	}
	if ci := matrix["cubic"]["icosahedral"]; float64(ci) > 0.01*float64(count["cubic"]) {
		t.Errorf("cubic crystals called icosahedral: %d of %d (bound 1 %%)", ci, count["cubic"])
	}
}

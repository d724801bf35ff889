package indexing_test

import (
	"encoding/json"
	"math"
	"testing"

	"meltbook/analysis/indexing"
	"meltbook/analysis/internal/pyref"
)

// patternScript simulates powder patterns with pymatgen's XRDCalculator at
// its "CuKa1" wavelength (1.54056 Å in pymatgen's table, an older value
// than Hölzer's 1.5405929 Å) and prints, per structure, the wavelength and
// each line's 2θ, intensity and the h²+k²+l² of its first hkl.
const patternScript = `
import sys, json
from pymatgen.core import Structure, Lattice
from pymatgen.analysis.diffraction.xrd import XRDCalculator, WAVELENGTHS
specs = json.load(sys.stdin)
calc = XRDCalculator(wavelength="CuKa1")
out = {}
for name, sp in specs.items():
    s = Structure.from_spacegroup(sp["group"], Lattice.cubic(sp["a"]), sp["species"], sp["coords"])
    p = calc.get_pattern(s, two_theta_range=(15, 120))
    out[name] = {"wavelength": WAVELENGTHS["CuKa1"],
                 "lines": [[float(x), float(y), sum(v * v for v in hk[0]["hkl"][-3:])] for x, y, hk in zip(p.x, p.y, p.hkls)]}
json.dump(out, sys.stdout)
`

type structureSpec struct {
	Group   string       `json:"group"`
	A       float64      `json:"a"`
	Species []string     `json:"species"`
	Coords  [][3]float64 `json:"coords"`
}

func TestCubicStandardsMatchPymatgen(t *testing.T) {
	specs := map[string]structureSpec{
		// Al, Fm-3m, a = 4.0495 Å at room temperature (from memory of the
		// handbook value, e.g. Pearson's Handbook / ICDD 04-0787).
		"Al": {"Fm-3m", 4.0495, []string{"Al"}, [][3]float64{{0, 0, 0}}},
		// LaB6, Pm-3m, a = 4.156826 Å: NIST SRM 660c certificate (22.5 °C);
		// boron x = 0.1975 (from memory; positions only change intensities).
		"LaB6": {"Pm-3m", 4.156826, []string{"La", "B"}, [][3]float64{{0, 0, 0}, {0.1975, 0.5, 0.5}}},
		// Si, Fd-3m, a = 5.43123 Å: NIST SRM 640d certificate (revised
		// 26 May 2010), 0.543123(8) nm at 22.5 °C; the certification paper,
		// Black et al., Powder Diffr. 25, 187 (2010), gives 0.543159(20) nm.
		"Si": {"Fd-3m", 5.43123, []string{"Si"}, [][3]float64{{0, 0, 0}}},
	}
	want := map[string]string{"Al": "F", "LaB6": "P", "Si": "F"}
	in, _ := json.Marshal(specs)
	out := pyref.Run(t, []string{"pymatgen.core", "pymatgen.analysis.diffraction.xrd"}, patternScript, in)
	var got map[string]struct {
		Wavelength float64      `json:"wavelength"`
		Lines      [][3]float64 `json:"lines"`
	}
	if err := json.Unmarshal(out, &got); err != nil {
		t.Fatalf("pymatgen output: %v", err)
	}
	for name, spec := range specs {
		t.Run(name, func(t *testing.T) {
			g := got[name]
			var peaks []indexing.Peak
			sOf := map[float64]int{}
			for _, l := range g.Lines {
				peaks = append(peaks, indexing.Peak{TwoThetaDeg: l[0], Intensity: l[1]})
				sOf[l[0]] = int(l[2])
			}
			res, err := indexing.Index(peaks, g.Wavelength, indexing.Options{})
			if err != nil {
				t.Fatal(err)
			}
			if len(res.Phases) != 1 {
				t.Fatalf("%d phases, want 1; models %+v", len(res.Phases), res.Models)
			}
			ph := res.Phases[0]
			if ph.Kind != indexing.Cubic || ph.Lattice != want[name] {
				t.Fatalf("got %s %s a = %.4f, want cubic %s", ph.Kind, ph.Lattice, ph.AA, want[name])
			}
			if math.Abs(ph.AA-spec.A) > 0.002 {
				t.Errorf("a = %.5f Å, want %.6f ± 0.002", ph.AA, spec.A)
			}
			if ph.Chance > 0.01 {
				t.Errorf("chance %g", ph.Chance)
			}
			if len(ph.Peaks) != len(peaks) {
				t.Errorf("%d of %d lines indexed", len(ph.Peaks), len(peaks))
			}
			for _, p := range ph.Peaks {
				h := *p.HKL
				if s := h[0]*h[0] + h[1]*h[1] + h[2]*h[2]; s != sOf[p.TwoThetaDeg] {
					t.Errorf("%.3f°: hkl %v (S = %d); pymatgen's reflection has S = %d", p.TwoThetaDeg, h, s, sOf[p.TwoThetaDeg])
				}
			}
		})
	}
}

func TestDoubledCellIsNotChosen(t *testing.T) {
	// An F lattice's lines are also lines of P and I cells with a doubled
	// constant; the indexer must keep the smallest cell whose allowed set
	// explains them. Lines of fcc Al, a = 4.0495 Å (as above), 20–120°.
	tt, _ := cubicPeaks("F", 4.0495, cuKa1, 20, 120)
	var peaks []indexing.Peak
	for i, x := range tt {
		peaks = append(peaks, indexing.Peak{TwoThetaDeg: x, Intensity: 100 / float64(i+1)})
	}
	res, err := indexing.Index(peaks, cuKa1, indexing.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Phases) != 1 || res.Phases[0].Lattice != "F" || math.Abs(res.Phases[0].AA-4.0495) > 1e-4 {
		t.Fatalf("phases %+v, want one F with a = 4.0495 Å", res.Phases)
	}
}

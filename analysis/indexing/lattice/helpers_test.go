package lattice_test

import (
	"encoding/json"
	"math"
	"math/rand"
	"sort"
	"testing"

	"meltbook/analysis/indexing/lattice"
	"meltbook/analysis/internal/pyref"
)

// wavelength is Cu Kα as pymatgen's XRDCalculator takes it, Å (pymatgen
// WAVELENGTHS["CuKa"]).
const wavelength = 1.54184

// refLine is a line with its d-spacing in Å and relative intensity.
type refLine struct {
	D, I float64
}

// patternScript asks pymatgen for the powder pattern of a structure given
// by space group, lattice constants, species and fractional coordinates.
const patternScript = `
import sys, json
from pymatgen.core import Structure, Lattice
from pymatgen.analysis.diffraction.xrd import XRDCalculator
spec = json.load(sys.stdin)
if spec["kind"] == "hexagonal":
    lat = Lattice.hexagonal(spec["a"], spec["c"])
else:
    lat = Lattice.tetragonal(spec["a"], spec["c"])
s = Structure.from_spacegroup(spec["group"], lat, spec["species"], spec["coords"])
p = XRDCalculator(wavelength="CuKa").get_pattern(s, two_theta_range=(15, 110))
json.dump([[d, y] for d, y in zip(p.d_hkls, p.y)], sys.stdout)
`

type structureSpec struct {
	Kind    string      `json:"kind"`
	Group   string      `json:"group"`
	A       float64     `json:"a"`
	C       float64     `json:"c"`
	Species []string    `json:"species"`
	Coords  [][]float64 `json:"coords"`
}

func pymatgenLines(t *testing.T, spec structureSpec) []refLine {
	t.Helper()
	in, _ := json.Marshal(spec)
	out := pyref.Run(t, []string{"pymatgen.core", "pymatgen.analysis.diffraction.xrd"}, patternScript, in)
	var rows [][2]float64
	if err := json.Unmarshal(out, &rows); err != nil {
		t.Fatalf("pymatgen output: %v", err)
	}
	var lines []refLine
	for _, r := range rows {
		lines = append(lines, refLine{D: r[0], I: r[1]})
	}
	return lines
}

// measured turns reference lines into a peak list as a diffractometer at
// Cu Kα would give it: lines weaker than minI dropped, the lines at the
// given indices (after that) removed, impurity peaks added (d in Å), every
// position shifted by zero (°2θ) and jittered uniformly within ±jitter
// (°2θ), each peak given a tolerance tol (°2θ), converted with
//
//	q = 2 sin θ / λ,   δq = cos θ · δ(2θ) / λ   (δ(2θ) in radians)
//
// (Bragg's law, common practice).
func measured(lines []refLine, minI float64, remove []int, impurities []float64, zero, jitter, tol float64, seed int64) []lattice.Peak {
	rng := rand.New(rand.NewSource(seed))
	var kept []refLine
	for _, ln := range lines {
		if ln.I >= minI {
			kept = append(kept, ln)
		}
	}
	var use []refLine
	for i, ln := range kept {
		drop := false
		for _, r := range remove {
			drop = drop || r == i
		}
		if !drop {
			use = append(use, ln)
		}
	}
	for _, d := range impurities {
		use = append(use, refLine{D: d, I: 15})
	}
	var peaks []lattice.Peak
	for _, ln := range use {
		s := wavelength / (2 * ln.D)
		if s >= 1 {
			continue
		}
		tth := 2*math.Asin(s)*180/math.Pi + zero + jitter*(2*rng.Float64()-1)
		th := tth / 2 * math.Pi / 180
		peaks = append(peaks, lattice.Peak{
			InverseD:  2 * math.Sin(th) / wavelength,
			Tolerance: math.Cos(th) * tol * math.Pi / 180 / wavelength,
			Intensity: ln.I,
		})
	}
	sort.Slice(peaks, func(i, j int) bool { return peaks[i].InverseD < peaks[j].InverseD })
	return peaks
}

// hexagonalLines lists the lines of a hexagonal cell from the textbook
// formula 1/d² = 4(h² + hk + k²)/(3a²) + l²/c² for h ≥ k ≥ 0, l ≥ 0, d ≥ dMin,
// leaving out l odd on hh(−2h)l and 00l (the 6₃ screw and c glide of
// P6₃/mmc; International Tables Vol. A), one line per (h, k, l) triple, with
// intensities drawn from a seeded generator (independent of any model).
func hexagonalLines(a, c, dMin float64, seed int64) []refLine {
	rng := rand.New(rand.NewSource(seed))
	var out []refLine
	for h := 0; h <= 12; h++ {
		for k := 0; k <= h; k++ {
			for l := 0; l <= 12; l++ {
				if h+k+l == 0 || (k == 0 && h == 0 || h == k) && l%2 == 1 {
					continue
				}
				inv := 4*float64(h*h+h*k+k*k)/(3*a*a) + float64(l*l)/(c*c)
				if d := 1 / math.Sqrt(inv); d >= dMin {
					out = append(out, refLine{D: d, I: 5 + 95*rng.Float64()})
				}
			}
		}
	}
	return mergeSorted(out)
}

// orthorhombicCLines lists the lines of a C-centred orthorhombic cell,
// 1/d² = h²/a² + k²/b² + l²/c² with h + k even (International Tables
// Vol. A), h, k, l ≥ 0, seeded intensities.
func orthorhombicCLines(a, b, c, dMin float64, seed int64) []refLine {
	rng := rand.New(rand.NewSource(seed))
	var out []refLine
	for h := 0; h <= 12; h++ {
		for k := 0; k <= 12; k++ {
			for l := 0; l <= 12; l++ {
				if h+k+l == 0 || (h+k)%2 == 1 {
					continue
				}
				inv := float64(h*h)/(a*a) + float64(k*k)/(b*b) + float64(l*l)/(c*c)
				if d := 1 / math.Sqrt(inv); d >= dMin {
					out = append(out, refLine{D: d, I: 5 + 95*rng.Float64()})
				}
			}
		}
	}
	return mergeSorted(out)
}

// cubicLines lists the lines of a cubic cell, d = a/√(h² + k² + l²), with
// the F (unmixed parity) or I (h + k + l even) condition.
func cubicLines(a float64, centring byte, dMin float64) []refLine {
	var out []refLine
	for s := 1; s < 200; s++ {
		ok := false
		for h := 0; h*h <= s && !ok; h++ {
			for k := 0; k <= h && !ok; k++ {
				for l := 0; l <= k; l++ {
					if h*h+k*k+l*l != s {
						continue
					}
					if centring == 'F' && h%2 == k%2 && k%2 == l%2 || centring == 'I' && (h+k+l)%2 == 0 {
						ok = true
					}
				}
			}
		}
		if d := a / math.Sqrt(float64(s)); ok && d >= dMin {
			out = append(out, refLine{D: d, I: 50})
		}
	}
	return mergeSorted(out)
}

// mergeSorted sorts by decreasing d and merges lines closer than 1e-6 Å.
func mergeSorted(ls []refLine) []refLine {
	sort.Slice(ls, func(i, j int) bool { return ls[i].D > ls[j].D })
	var out []refLine
	for _, l := range ls {
		if n := len(out); n > 0 && out[n-1].D-l.D < 1e-6 {
			out[n-1].I += l.I
			continue
		}
		out = append(out, l)
	}
	return out
}

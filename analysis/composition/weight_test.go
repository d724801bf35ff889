package composition_test

import (
	"encoding/json"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"

	"meltbook/analysis/composition"
	"meltbook/analysis/internal/pyref"
)

// qcElements are elements common in quasicrystal and approximant work
// (Al-Cu-Fe/Ru/Os, Al-Pd-Mn/Re, Al-Ni-Co, Al-Mn-Si, Al-Li-Cu, Ti-Zr-Ni,
// Zn-Mg-RE, Cd-Yb, Cd-Ca, Sc-Zn, Ag-In-Yb, Au-Al-Yb, Ga, B as a minor
// addition): common practice.
var qcElements = []string{
	"Al", "Cu", "Fe", "Ru", "Os", "Pd", "Mn", "Re", "Ni", "Co", "Si", "Li",
	"Ti", "Zr", "Zn", "Mg", "Ho", "Y", "Gd", "Tb", "Er", "Cd", "Yb", "Ca",
	"Sc", "Ag", "In", "Au", "Ga", "Cr", "B", "Ir", "Rh",
}

// randomAmounts returns n seeded random compositions of 2 to 5 distinct
// elements with amounts between 0.5 and 100 written to two decimals.
func randomAmounts(n int) [][]composition.Part {
	rng := rand.New(rand.NewPCG(20261201, 7))
	out := make([][]composition.Part, n)
	for i := range out {
		k := 2 + rng.IntN(4)
		picked := rng.Perm(len(qcElements))[:k]
		parts := make([]composition.Part, k)
		for j, e := range picked {
			amount := math.Round((0.5+99.5*rng.Float64())*100) / 100
			parts[j] = composition.Part{Element: qcElements[e], Fraction: amount}
		}
		out[i] = parts
	}
	return out
}

// pymatgenScript reads a JSON list of [[symbol, amount], ...] and, for
// each, prints pymatgen's atomic fractions, weight fractions and mean
// atomic weight when the amounts are atomic, and its atomic fractions
// when the same amounts are weights (moles = mass / Element.atomic_mass).
const pymatgenScript = `
import json, sys
from pymatgen.core import Composition, Element
out = []
for parts in json.load(sys.stdin):
    c = Composition({s: a for s, a in parts})
    moles = Composition({s: a / float(Element(s).atomic_mass) for s, a in parts})
    out.append({
        "atomic": [c.get_atomic_fraction(s) for s, _ in parts],
        "weight": [c.get_wt_fraction(s) for s, _ in parts],
        "mean": float(c.weight) / c.num_atoms,
        "from_weight": [moles.get_atomic_fraction(s) for s, _ in parts],
    })
json.dump(out, sys.stdout)
`

// TestWeightAgainstPymatgen checks at% <-> wt% conversion, parsing of the
// written amounts and the mean atomic weight against pymatgen's
// Composition (python3-pymatgen). pymatgen carries its own atomic weights,
// which may differ slightly from the IUPAC/CIAAW 2021 values of package
// element (up to a few 0.001 g/mol for some lanthanides); the tolerances
// below (1e-4 on fractions, 0.01 g/mol on the mean) cover that.
func TestWeightAgainstPymatgen(t *testing.T) {
	comps := randomAmounts(60)
	input := make([][][2]any, len(comps))
	for i, parts := range comps {
		for _, p := range parts {
			input[i] = append(input[i], [2]any{p.Element, p.Fraction})
		}
	}
	stdin, err := json.Marshal(input)
	if err != nil {
		t.Fatal(err)
	}
	raw := pyref.Run(t, []string{"pymatgen.core"}, pymatgenScript, stdin)
	var ref []struct {
		Atomic     []float64 `json:"atomic"`
		Weight     []float64 `json:"weight"`
		Mean       float64   `json:"mean"`
		FromWeight []float64 `json:"from_weight"`
	}
	if err := json.Unmarshal(raw, &ref); err != nil {
		t.Fatalf("pymatgen output: %v\n%s", err, raw)
	}
	if len(ref) != len(comps) {
		t.Fatalf("pymatgen returned %d results for %d compositions", len(ref), len(comps))
	}
	const tol = 1e-4
	for i, parts := range comps {
		var b strings.Builder
		for _, p := range parts {
			b.WriteString(p.Element)
			b.WriteString(strconv.FormatFloat(p.Fraction, 'f', 2, 64))
		}
		formula := b.String()

		atomic, err := composition.Parse(formula)
		if err != nil {
			t.Fatalf("Parse(%q): %v", formula, err)
		}
		weight, err := atomic.Atomic.ToWeight()
		if err != nil {
			t.Fatal(err)
		}
		byWeight, err := composition.Parse(formula + " wt%")
		if err != nil {
			t.Fatalf("Parse(%q): %v", formula+" wt%", err)
		}
		refWeight := make(composition.Composition, len(parts))
		for j, p := range parts {
			refWeight[j] = composition.Part{Element: p.Element, Fraction: ref[i].Weight[j]}
		}
		back, err := refWeight.FromWeight()
		if err != nil {
			t.Fatal(err)
		}
		for j, p := range parts {
			check := func(what string, got, want float64) {
				if math.Abs(got-want) > tol {
					t.Errorf("%s: %s %s = %.6f, pymatgen %.6f", formula, p.Element, what, got, want)
				}
			}
			check("atomic fraction", atomic.Atomic.Fraction(p.Element), ref[i].Atomic[j])
			check("weight fraction", weight.Fraction(p.Element), ref[i].Weight[j])
			check("atomic fraction from wt%", byWeight.Atomic.Fraction(p.Element), ref[i].FromWeight[j])
			check("atomic fraction back from pymatgen's weight fractions", back.Fraction(p.Element), ref[i].Atomic[j])
		}
		mean, err := atomic.Atomic.MeanAtomicWeight()
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(mean-ref[i].Mean) > 0.01 {
			t.Errorf("%s: mean atomic weight %.4f g/mol, pymatgen %.4f", formula, mean, ref[i].Mean)
		}
	}
}

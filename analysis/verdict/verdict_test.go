package verdict_test

import (
	"strings"
	"testing"

	"meltbook"
	"meltbook/analysis/verdict"
)

// icosahedralF is an F-type icosahedral phase indexed with a chance of
// 1e-6: +2 for diffraction under the package's rules.
func icosahedralF() *verdict.Phase {
	return &verdict.Phase{Kind: meltbook.ModelIcosahedral, Lattice: "F", ConstantA: 4.46, ConstantSUA: 0.002,
		Chance: 1e-6, IndexedPeaks: 14, SpecimenPeaks: 15, ExplainedIntensity: 0.97}
}

func cubicPhase(lattice string, a, chance float64) *verdict.Phase {
	return &verdict.Phase{Kind: meltbook.ModelCubic, Lattice: lattice, ConstantA: a, ConstantSUA: 0.0004,
		Chance: chance, IndexedPeaks: 6, SpecimenPeaks: 6, ExplainedIntensity: 1}
}

// inside is Al65Cu20Fe15's e/a under Raynor valences, 3·0.65 + 0.20 −
// 2.66·0.15 = 1.751 (worked by hand), inside 1.70-1.80.
var inside = verdict.EOverA{Status: verdict.Inside, Value: 1.751, Low: 1.70, High: 1.80, Family: "Al-Cu-(Fe,Ru,Os)", Scheme: "raynor"}

func neighbours(kinds ...meltbook.PhaseKind) []verdict.Neighbour {
	var out []verdict.Neighbour
	for i, k := range kinds {
		out = append(out, verdict.Neighbour{Sample: "QX-" + string(rune('A'+i)), DistanceFraction: 0.01, Kinds: []meltbook.PhaseKind{k}})
	}
	return out
}

// Each expected total is the sum of the documented points, worked by hand
// beside each case.
func TestWeigh(t *testing.T) {
	cases := []struct {
		name       string
		in         verdict.Input
		kind       meltbook.PhaseKind
		points     int
		confidence string
		agree      []string // evidence kinds that agreed
		disagree   []string
	}{
		{"strong pattern alone", verdict.Input{Phase: icosahedralF()},
			meltbook.Icosahedral, 2, verdict.Medium, []string{"diffraction"}, nil}, // 2
		{"everything agrees", verdict.Input{Phase: icosahedralF(), Folds: []int{2, 3, 5}, EOverA: inside,
			Neighbours: neighbours(meltbook.Icosahedral, meltbook.Icosahedral, meltbook.Crystalline)},
			meltbook.Icosahedral, 5, verdict.High, []string{"diffraction", "symmetry", "e/a", "neighbours"}, nil}, // 2+1+1+1
		{"4-fold axes contradict", verdict.Input{Phase: icosahedralF(), Folds: []int{2, 4}, EOverA: inside},
			meltbook.Icosahedral, 1, verdict.Medium, []string{"diffraction", "e/a"}, []string{"symmetry"}}, // 2−2+1
		{"outside the window, neighbours crystalline", verdict.Input{Phase: icosahedralF(),
			EOverA:     verdict.EOverA{Status: verdict.Below, Value: 1.62, Low: 1.70, High: 1.80, Family: "Al-Cu-(Fe,Ru,Os)", Scheme: "raynor"},
			Neighbours: neighbours(meltbook.Crystalline, meltbook.Crystalline, meltbook.Crystalline)},
			meltbook.Icosahedral, 0, verdict.Low, []string{"diffraction"}, []string{"e/a", "neighbours"}}, // 2−1−1
		{"10-fold alone points to decagonal", verdict.Input{Phase: icosahedralF(), Folds: []int{2, 10}},
			meltbook.Icosahedral, 1, verdict.Medium, []string{"diffraction"}, []string{"symmetry"}}, // 2−1
		{"weak chance, no window", verdict.Input{Phase: &verdict.Phase{Kind: meltbook.ModelIcosahedral, Lattice: "P", Chance: 0.004},
			EOverA: verdict.EOverA{Note: "no window"}}, meltbook.Icosahedral, 0, verdict.Low, nil, nil}, // 0
		{"approximant with 5-fold axes", verdict.Input{Phase: &verdict.Phase{Kind: meltbook.ModelApproximant, Lattice: "P", Order: "1/1", ConstantA: 12.28, Chance: 5e-4},
			Folds: []int{2, 3, 5}, EOverA: inside}, meltbook.Approximant, 0, verdict.Low, []string{"diffraction", "e/a"}, []string{"symmetry"}}, // 1−2+1
		{"cubic crystal with 4-fold axes", verdict.Input{Phase: cubicPhase("F", 4.0497, 1e-7), Folds: []int{3, 4}, EOverA: inside,
			Neighbours: neighbours(meltbook.Crystalline)}, meltbook.Crystalline, 4, verdict.High, []string{"diffraction", "symmetry", "neighbours"}, nil}, // 2+1+0+1
		{"one neighbour of three", verdict.Input{Phase: icosahedralF(), Neighbours: neighbours(meltbook.Icosahedral, meltbook.Crystalline, meltbook.Crystalline)},
			meltbook.Icosahedral, 2, verdict.Medium, []string{"diffraction"}, nil}, // 2+0
		{"halo of a metallic glass", verdict.Input{Halo: &verdict.Halo{CentreDeg: 38.4, FWHMDeg: 6, QPerA: 2.70}},
			meltbook.Amorphous, 1, verdict.Medium, []string{"diffraction"}, nil}, // 1
		{"halo of a silica holder, with order seen", verdict.Input{Halo: &verdict.Halo{CentreDeg: 21.8, FWHMDeg: 7, QPerA: 1.54}, Folds: []int{2}},
			meltbook.Amorphous, -2, verdict.Low, nil, []string{"diffraction", "symmetry"}}, // −1−1
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			v := verdict.Weigh(c.in)
			if v.Outcome.Kind != c.kind || v.Points != c.points || v.Confidence != c.confidence {
				t.Fatalf("got %s, %+d, %s; want %s, %+d, %s\n%s", v.Outcome.Kind, v.Points, v.Confidence, c.kind, c.points, c.confidence, v.Text())
			}
			if got := evidence(v.Agree); strings.Join(got, ",") != strings.Join(c.agree, ",") {
				t.Errorf("agreeing %v; want %v", got, c.agree)
			}
			if got := evidence(v.Disagree); strings.Join(got, ",") != strings.Join(c.disagree, ",") {
				t.Errorf("disagreeing %v; want %v", got, c.disagree)
			}
			if n := len(v.Agree) + len(v.Disagree) + len(v.Neutral); n != 4 {
				t.Errorf("%d reasons; every one of the four kinds of evidence is reported", n)
			}
		})
	}
}

func evidence(rs []verdict.Reason) []string {
	var out []string
	for _, r := range rs {
		out = append(out, r.Evidence)
	}
	return out
}

func TestCandidate(t *testing.T) {
	cases := []struct {
		phase *verdict.Phase
		want  meltbook.Outcome
	}{
		{icosahedralF(), meltbook.Outcome{Kind: meltbook.Icosahedral, Lattice: "F"}},
		{&verdict.Phase{Kind: meltbook.ModelApproximant, Lattice: "P", Order: "1/1", ConstantA: 12.68}, meltbook.Outcome{Kind: meltbook.Approximant, Lattice: "P", Order: "1/1"}},
		// fcc Al, a = 4.0495 Å (from memory: handbook value); 4.0497 is
		// within 1.5 %.
		{cubicPhase("F", 4.0497, 1e-6), meltbook.Outcome{Kind: meltbook.Crystalline, Name: "Al (fcc)"}},
		// The same a on a primitive lattice is not fcc Al.
		{cubicPhase("P", 4.0497, 1e-6), meltbook.Outcome{Kind: meltbook.Crystalline, Name: "cubic P, a = 4.04970(40) Å"}},
		// B2 β-Al(Cu,Fe), a ≈ 2.90-2.92 Å (from memory).
		{cubicPhase("P", 2.905, 1e-6), meltbook.Outcome{Kind: meltbook.Crystalline, Name: "β-Al(Cu,Fe) (B2)"}},
		// Si, a = 5.431144 Å (NIST SRM 640f).
		{cubicPhase("F", 5.4312, 1e-6), meltbook.Outcome{Kind: meltbook.Crystalline, Name: "Si (diamond)"}},
	}
	for _, c := range cases {
		v := verdict.Weigh(verdict.Input{Phase: c.phase})
		if v.Outcome != c.want {
			t.Errorf("%s %s a = %g: got %+v; want %+v", c.phase.Kind, c.phase.Lattice, c.phase.ConstantA, v.Outcome, c.want)
		}
	}
}

func TestWeighPanicsWithoutEvidence(t *testing.T) {
	defer func() {
		if recover() == nil {
			t.Error("no panic for an input with neither phase nor halo")
		}
	}()
	verdict.Weigh(verdict.Input{})
}

func TestTextNamesEverything(t *testing.T) {
	v := verdict.Weigh(verdict.Input{Phase: icosahedralF(), Folds: []int{2, 4}, EOverA: inside})
	text := v.Text()
	for _, want := range []string{"Agrees: ", "Disagrees: ", "Not telling: ", "no 4-fold axes", "e/a 1.751", "Confidence medium (+1)."} {
		if !strings.Contains(text, want) {
			t.Errorf("%q lacks %q", text, want)
		}
	}
}

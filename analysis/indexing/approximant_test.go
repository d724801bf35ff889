package indexing_test

import (
	"math"
	"testing"

	"meltbook/analysis/indexing"
)

func TestApproximantFactors(t *testing.T) {
	// a/a_R = 2(q + pτ)/√(2+τ) evaluated by hand: 2.7528 (1/1), 4.4541 (2/1),
	// 7.2069 (3/2) (Elser & Henley, Phys. Rev. Lett. 55, 2883 (1985)
	// relation). As a cross-check, α-AlMnSi a = 12.68 Å (Elser & Henley)
	// over i-Al-Mn a_R = 4.60 Å (from memory) is 2.757, within 0.2 %.
	tests := []struct {
		o    indexing.Order
		want float64
	}{{indexing.Order{P: 1, Q: 1}, 2.7528}, {indexing.Order{P: 2, Q: 1}, 4.4541}, {indexing.Order{P: 3, Q: 2}, 7.2069}}
	for _, tt := range tests {
		if got := indexing.ApproximantFactor(tt.o); math.Abs(got-tt.want) > 1e-4 {
			t.Errorf("%s: %.5f, want %.4f", tt.o, got, tt.want)
		}
	}
	if r := 12.68 / 4.60 / indexing.ApproximantFactor(indexing.Order{P: 1, Q: 1}); math.Abs(r-1) > 0.002 {
		t.Errorf("α-AlMnSi / i-AlMn ratio off the 1/1 factor by %.4f", r-1)
	}
}

// approximantPeaks builds a constructed approximant list: every line of
// the cubic lattice between lo and hi degrees, its intensity high where it
// falls near a strong icosahedral family (|G⊥|·a6 ≤ 0.3) of the
// quasilattice constant a/factor and low elsewhere, keeping lines above 3 %.
func approximantPeaks(lattice string, a, factor float64) []indexing.Peak {
	a6 := a / factor * math.Sqrt2
	fams := projectFamilies("F", 8, 0.3)
	tt, s := cubicPeaks(lattice, a, cuKa1, 20, 90)
	var peaks []indexing.Peak
	for i, x := range tt {
		g := math.Sqrt(float64(s[i])) / a * a6
		best := math.Inf(1)
		for _, f := range fams {
			best = math.Min(best, math.Abs(g/f.par-1))
		}
		in := 100*math.Exp(-math.Pow(best/0.008, 2)) + 4*math.Exp(-float64(s[i])/40)
		if in >= 3 {
			peaks = append(peaks, indexing.Peak{TwoThetaDeg: x, Intensity: in})
		}
	}
	return peaks
}

func TestApproximantsRecognised(t *testing.T) {
	f11 := 2 * (1 + tau) / math.Sqrt(2+tau) // Elser & Henley (1985) relation, 1/1
	tests := []struct {
		name, lattice string
		a             float64
		reference     string
	}{
		// α-AlMnSi, Pm-3, a = 12.68 Å (Elser & Henley, Phys. Rev. Lett. 55,
		// 2883 (1985)): 1/1 approximant of i-Al-Mn(-Si).
		{"alpha-AlMnSi", "P", 12.68, "i-Al-Mn(-Si)"},
		// Cd6Yb, Im-3, a ≈ 15.6 Å (from memory): 1/1 approximant of
		// i-Cd5.7Yb, a_R ≈ 5.69 Å (from memory).
		{"Cd6Yb", "I", 15.6, "i-Cd-Yb"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			peaks := approximantPeaks(tt.lattice, tt.a, f11)
			res, err := indexing.Index(peaks, cuKa1, indexing.Options{})
			if err != nil {
				t.Fatal(err)
			}
			if len(res.Phases) == 0 {
				t.Fatalf("no phase from %d peaks; models %+v", len(peaks), res.Models)
			}
			ph := res.Phases[0]
			if ph.Kind != indexing.Approximant || ph.Lattice != tt.lattice || ph.Order != "1/1" || ph.ApproximantOf != tt.reference {
				t.Fatalf("got %s %s %s of %q a = %.4f, want 1/1 approximant %s of %s; models %+v",
					ph.Kind, ph.Lattice, ph.Order, ph.ApproximantOf, ph.AA, tt.lattice, tt.reference, res.Models)
			}
			if math.Abs(ph.AA-tt.a) > 0.002 {
				t.Errorf("a = %.4f Å, want %.2f", ph.AA, tt.a)
			}
			if len(res.Unexplained) != 0 {
				t.Errorf("%d peaks unexplained", len(res.Unexplained))
			}
		})
	}
}

func TestApproximantOfIcosahedralPhaseInSameList(t *testing.T) {
	// A P-type icosahedral phase with a_R = 5.20 Å, away from every
	// reference constant, next to its own 1/1 approximant (a = 2.7528·a_R
	// = 14.31 Å, primitive): the cubic phase must be named an approximant
	// of the icosahedral phase found in the same list (constructed case).
	const aR = 5.20
	f11 := 2 * (1 + tau) / math.Sqrt(2+tau)
	ico, _ := icosahedralPeaks(projectFamilies("P", 8, 0.45), aR, cuKa1, 0.42, 20, 100, 0)
	approx := approximantPeaks("P", aR*f11, f11)
	peaks := append(append([]indexing.Peak(nil), ico...), approx...)
	res, err := indexing.Index(peaks, cuKa1, indexing.Options{})
	if err != nil {
		t.Fatal(err)
	}
	var gotIco, gotApprox bool
	for _, ph := range res.Phases {
		if ph.Kind == indexing.Icosahedral && math.Abs(ph.QuasilatticeConstantA-aR) < 0.002 {
			gotIco = true
		}
		if ph.Kind == indexing.Approximant && ph.Order == "1/1" && math.Abs(ph.AA-aR*f11) < 0.003 && ph.ApproximantOf == "icosahedral phase in this list" {
			gotApprox = true
		}
	}
	if !gotIco || !gotApprox {
		t.Errorf("phases %+v; want icosahedral a_R = %.2f Å and its 1/1 approximant", res.Phases, aR)
	}
}

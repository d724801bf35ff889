package lattice_test

import (
	"math"
	"math/rand"
	"sort"
	"testing"

	"meltbook/analysis/indexing/lattice"
)

func TestCubicListsComeOutPseudoCubic(t *testing.T) {
	cases := []struct {
		name     string
		a        float64 // Å
		centring byte
	}{
		{"fcc Al", 4.0494, 'F'}, // a of Al at room temperature, from memory
		{"bcc Fe", 2.8665, 'I'}, // a of α-Fe, from memory
		{"bcc 10 Å", 10.0, 'I'}, // a large invented cell
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			peaks := measured(cubicLines(tc.a, tc.centring, 0.8), 0, nil, nil, 0, 0.02, 0.05, 11)
			if len(peaks) > 20 {
				peaks = peaks[:20]
			}
			sols, err := lattice.Search(peaks, lattice.Options{})
			if err != nil {
				t.Fatal(err)
			}
			if len(sols) == 0 {
				t.Fatal("no solution")
			}
			s := sols[0]
			if !s.PseudoCubic || s.Indexed != len(peaks) {
				t.Errorf("best %s %c %s indexed %d/%d, pseudo-cubic %v; want a cubic metric indexing all",
					s.System, s.Centring, s.Cell.String(s.System), s.Indexed, len(peaks), s.PseudoCubic)
			}
			t.Logf("%s %c %s c/a = %.4f M20 %.1f", s.System, s.Centring, s.Cell.String(s.System), s.Cell.C/s.Cell.A, s.M20)
		})
	}
}

// randomPeaks draws n peaks uniform in q over [0.25, 0.95] Å⁻¹, each with
// the tolerance of 0.05° 2θ at Cu Kα.
func randomPeaks(rng *rand.Rand, n int) []lattice.Peak {
	peaks := make([]lattice.Peak, n)
	for i := range peaks {
		q := 0.25 + 0.7*rng.Float64()
		th := math.Asin(q * wavelength / 2)
		peaks[i] = lattice.Peak{InverseD: q, Tolerance: math.Cos(th) * 0.05 * math.Pi / 180 / wavelength, Intensity: 100 * rng.Float64()}
	}
	sort.Slice(peaks, func(i, j int) bool { return peaks[i].InverseD < peaks[j].InverseD })
	return peaks
}

func TestRandomListsRarelyIndex(t *testing.T) {
	if testing.Short() {
		t.Skip("500 searches")
	}
	rng := rand.New(rand.NewSource(2026))
	const lists = 500
	hits := 0
	for n := 0; n < lists; n++ {
		sols, err := lattice.Search(randomPeaks(rng, 15), lattice.Options{})
		if err != nil {
			t.Fatal(err)
		}
		for _, s := range sols {
			if s.Indexed == 15 && s.M20 > 10 {
				hits++
				break
			}
		}
	}
	rate := float64(hits) / lists
	t.Logf("random lists of 15 peaks fully indexed with M20 > 10: %d of %d (%.1f %%)", hits, lists, 100*rate)
	// The allowed rate is a choice of this test: 2 %.
	if rate > 0.02 {
		t.Errorf("rate %.3f above 0.02", rate)
	}
}

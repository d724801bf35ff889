package meltbook_test

import (
	"testing"

	"meltbook"
)

func TestIndexedPhaseTitleCrystalKinds(t *testing.T) {
	for _, c := range []struct {
		phase meltbook.IndexedPhase
		want  string
	}{
		// θ-Al2Cu, I4/mcm, a ≈ 6.067 Å, c ≈ 4.877 Å: common practice (handbook cell
		// of the θ phase, from memory); the s.u. in two digits, written by hand.
		{meltbook.IndexedPhase{Kind: meltbook.ModelTetragonal, Lattice: "I", Phase: "θ-Al2Cu", SpaceGroup: "I4/mcm",
			ConstantA: 6.067, ConstantSUA: 0.0021, ConstantC: 4.877, ConstantSUC: 0.0034},
			"θ-Al2Cu, tetragonal I4/mcm, a = 6.0670(21) Å, c = 4.8770(34) Å"},
		// Mg, a = 3.2094 Å, c = 5.2108 Å: handbook cell of magnesium, from memory.
		{meltbook.IndexedPhase{Kind: meltbook.ModelHexagonal, Lattice: "P",
			ConstantA: 3.2094, ConstantSUA: 0.00052, ConstantC: 5.2108, ConstantSUC: 0.00091},
			"hexagonal P, a = 3.20940(52) Å, c = 5.21080(91) Å"},
		// Al, Fm-3m, a = 4.0495 Å: handbook cell of aluminium, from memory.
		{meltbook.IndexedPhase{Kind: meltbook.ModelCubic, Lattice: "F", Phase: "Al", SpaceGroup: "Fm-3m",
			ConstantA: 4.0495, ConstantSUA: 0.00031},
			"Al, cubic Fm-3m, a = 4.04950(31) Å"},
		// Invented monoclinic cell; the expected text is written by hand.
		{meltbook.IndexedPhase{Kind: meltbook.ModelMonoclinic, Lattice: "C",
			ConstantA: 15.5, ConstantSUA: 0.01, ConstantB: 8.08, ConstantSUB: 0.01, ConstantC: 12.48, ConstantSUC: 0.01,
			BetaDeg: 107.7, BetaSUDeg: 0.1},
			"monoclinic C, a = 15.500(10) Å, b = 8.080(10) Å, c = 12.480(10) Å, β = 107.70(10)°"},
		// The existing cubic form, written by hand.
		{meltbook.IndexedPhase{Kind: meltbook.ModelCubic, Lattice: "F", ConstantA: 4.0496, ConstantSUA: 0.00023},
			"cubic F, a = 4.04960(23) Å"},
	} {
		if got := c.phase.Title(); got != c.want {
			t.Errorf("Title() = %q, want %q", got, c.want)
		}
	}
}

func TestIsCrystalKind(t *testing.T) {
	// The seven crystal systems are common practice; icosahedral and
	// approximant phases are not ordinary crystals here.
	for kind, want := range map[string]bool{"cubic": true, "tetragonal": true, "hexagonal": true, "orthorhombic": true,
		"monoclinic": true, "triclinic": true, "rhombohedral": true, "icosahedral": false, "approximant": false, "": false} {
		if got := meltbook.IsCrystalKind(kind); got != want {
			t.Errorf("IsCrystalKind(%q) = %v, want %v", kind, got, want)
		}
	}
}

package phaselib

// Missing is a phase wanted in the built-in library that it does not hold,
// and why.
type Missing struct {
	Name, Why string
}

// NotBuiltIn lists the phases that compete with quasicrystals in the
// alloy systems meltbook is used for but are left out of the built-in
// library, because no published structure could be checked for them. A
// user who has a structure adds it as a CIF file of their own; until then
// a search-match cannot name them, and their absence from a phase call
// rules nothing out.
var NotBuiltIn = []Missing{
	{"λ-Al13Fe4", "monoclinic C2/m with about 100 atoms in the cell; no published coordinate set could be checked here"},
	{"ω-Al7Cu2Fe", "tetragonal P4/mnc; its coordinates were not at hand to check"},
	{"hexagonal Al–Mn (μ-Al4Mn, Al10Mn3)", "hundreds of atoms in the cell (μ) or coordinates not checked (Al10Mn3)"},
	{"hexagonal Zn–Mg–Y (H phase)", "no published structure known well enough"},
	{"α-Al–Mn–Si (1/1 approximant)", "138 atoms in Pm-3 whose coordinates could not be checked; the indexer's cubic approximant model finds its lattice"},
}

package crystal

// Site is one atom site of the asymmetric unit as a structure file gives
// it.
type Site struct {
	Label     string
	Element   string     // element symbol, e.g. "Al"
	Fract     [3]float64 // fractional coordinates
	Occupancy float64    // 0 < occupancy ≤ 1
	UisoA2    float64    // isotropic displacement U in Å² (B = 8π²U)
}

// Atom is one atom position in the whole cell after the symmetry
// operations are applied.
type Atom struct {
	Site  int        // index of the site it comes from
	Fract [3]float64 // in [0, 1)
}

// Structure is a crystal structure: cell, space group and the sites of the
// asymmetric unit, with what is known of where it was published.
type Structure struct {
	Name      string // phase name, e.g. "theta-Al2Cu"
	Formula   string // e.g. "Al2 Cu"
	Cell      Cell
	Group     SpaceGroup
	Sites     []Site
	Reference string // published source: authors, journal, year
}

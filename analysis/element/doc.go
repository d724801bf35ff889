// Package element holds the per-element data meltbook computes with:
// standard atomic weights, Pauling electronegativities, CN12 metallic radii,
// valence-electron counts for VEC, a few bulk properties used by the cooling
// estimate, hazard classes for bench cautions, and the named valence schemes
// used for the electron-per-atom ratio e/a.
//
// The table covers Z = 1-94 (BySymbol, ByZ, All). Every column names its
// source beside the table in table.go; a zero value means "not tabulated",
// and the Has* methods say so. The tests cross-check the table against
// pymatgen and periodictable and against two physical consistency checks
// (Dulong-Petit heat capacities, density from the CN12 radius).
//
// Valence schemes give each element the electrons it contributes per atom:
//
//	e/a = Σ x_i·v_i
//
// Two are built in (LookupScheme, SchemeNames): "group" gives the
// non-transition elements their group valence, with Eu and Yb divalent,
// and leaves the transition metals of groups 4-10 undefined; "raynor" adds
// Raynor's negative valences for Cr-Ni, the same values for their 4d and 5d
// homologues, and 0 for Pd and Pt. Users may write their own scheme files
// on top of either (ReadScheme, LoadScheme, WriteScheme).
//
// The package imports nothing else of meltbook's.
package element

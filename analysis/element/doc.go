// Package element holds the per-element data meltbook computes with:
// standard atomic weights, Pauling electronegativities, CN12 metallic radii,
// valence-electron counts for VEC, a few bulk properties used by the cooling
// estimate, hazard classes for bench cautions, and the named valence schemes
// used for the electron-per-atom ratio e/a.
//
// Every column names its source beside the table. The package imports
// nothing else of meltbook's.
package element

// Package crystal describes crystal structures: unit cells and their
// metric, space-group symmetry operations, atom sites and their expansion
// to the whole cell. It reads nothing and computes no pattern; the CIF
// reader and the powder-pattern calculator build on these types.
//
// Coordinates are fractional, lengths in Å, angles in degrees, isotropic
// displacement U in Å² (B = 8π²U).
//
// Reference: International Tables for Crystallography Vol. A (space-group
// operations) and Vol. B, ch. 1.1 (the metric tensor).
package crystal

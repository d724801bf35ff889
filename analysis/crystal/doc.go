// Package crystal describes crystal structures: unit cells and their
// metric, space-group symmetry operations, atom sites and their expansion
// to the whole cell, and reads them from CIF files. It computes no
// pattern; the powder-pattern calculator builds on these types.
//
// Space groups come from Hall symbols (HallOperations), which a table of
// the 559 settings of python3-gemmi 0.5.7 names by Hermann–Mauguin symbol
// and number (FindSpaceGroup); a set of operations is matched back to its
// setting by IdentifySpaceGroup. ReadCIF reads the structures of a CIF
// file (data bytes in, structures out; it opens no file).
//
// Coordinates are fractional, lengths in Å, angles in degrees, isotropic
// displacement U in Å² (B = 8π²U).
//
// Reference: International Tables for Crystallography Vol. A (space-group
// operations) and Vol. B, ch. 1.1 (the metric tensor) and 1.4 (Hall
// symbols).
package crystal

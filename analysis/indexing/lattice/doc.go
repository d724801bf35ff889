// Package lattice indexes powder peak lists with lattices of two or three
// free constants: tetragonal (P, I), hexagonal (P, and R in hexagonal axes)
// and orthorhombic (P, C, I, F).
//
// Input is plain values: peak positions q = 1/d in Å⁻¹, sorted ascending,
// each with an absolute tolerance in q and a relative intensity. The caller
// converts its 2θ tolerance and strips Kα2 before.
//
// # Search
//
// In Q = 1/d² every powder line of these lattices is linear in the
// constants:
//
//	tetragonal    Q = A·(h² + k²) + C·l²          A = 1/a², C = 1/c²
//	hexagonal     Q = A·(h² + hk + k²) + C·l²     A = 4/(3a²), C = 1/c²
//	orthorhombic  Q = A·h² + B·k² + C·l²          A = 1/a², B = 1/b², C = 1/c²
//
// The lowest lines (Options.ProposalLines) are taken two at a time (three
// for orthorhombic) and given every small-index hypothesis the centring
// allows (h, k ≤ 3 and l ≤ 4 for two constants, h, k, l ≤ 2 for three);
// each hypothesis fixes the constants by solving the linear equations. A
// solution within the bounds on the cell that explains all but
// Options.ProposalMisses of the lowest lines is matched against every peak
// (each peak takes the allowed reflection nearest to it within its
// tolerance) and refined by weighted linear least squares in Q, matching
// again after each refinement. This is the trial-and-error method of
// indexing in its simplest form.
//
// A solution is scored by de Wolff's figure of merit M20 and ranked by
// M20·(indexed peaks / peaks)⁶: the sixth power makes a cell that leaves
// peaks unexplained give way to one that explains them unless its M20 is
// several times higher (a sub-cell of the strong lines, a supercell that
// also takes in impurity peaks). Among solutions whose indexed peaks are the
// same or a subset of another's, only the one with the smallest cell is
// kept, which drops duplicates, supercells and cells that are metrically
// the same lattice in another setting.
//
// A tetragonal or rhombohedral solution whose metric is cubic (c = a;
// c = a/√2 for P, whose lines hold those of cubic I; c = a√2 for I;
// c/a = √6, √(3/2) or √(3/8) for R in hexagonal axes) is
// kept and marked PseudoCubic: the cubic indexer owns such lines. An
// orthorhombic solution with two equal edges, or a C cell with b = a√3, is
// dropped because the tetragonal or hexagonal search describes it.
//
// No zero shift is fitted: without the wavelength a zero shift in 2θ is no
// linear term in q. The caller refines it, or widens the tolerance.
//
// Reference: P. M. de Wolff, J. Appl. Cryst. 1, 108 (1968),
// doi:10.1107/S002188986800508X (figure of merit M20);
// International Tables for Crystallography Vol. A, Table 2.2.13.1
// (integral reflection conditions of centred cells).
package lattice

// Package icosa holds the reciprocal-space geometry of icosahedral
// quasicrystals: six-index reflections in the notation of Cahn, Shechtman
// and Gratias, their projections onto parallel (physical) and perpendicular
// space, the P, F and I Bravais modules, and reflection families grouped by
// the integer pair (N, M).
//
// Conventions. A reflection is written with six integers (h, h', k, k', l, l')
// along three orthogonal 2-fold axes; its parallel and perpendicular
// components are
//
//	G∥ = (h + h'τ,   k + k'τ,   l + l'τ)   / (a6·√(2(2+τ)))
//	G⊥ = (h'−τh,     k'−τk,     l'−τl)     / (a6·√(2(2+τ)))
//
// with τ = (1+√5)/2 and a6 the edge of the six-dimensional hypercubic cell.
// These come from the six 5-fold basis vectors e1 = (1, τ, 0), e2 = (τ, 0, 1),
// e3 = (0, 1, τ), e4 = (−1, τ, 0), e5 = (τ, 0, −1), e6 = (0, −1, τ), each of
// length a6⁻¹/√2 in either space, so that a basis index vector n = (n1…n6)
// maps to h = n1−n4, h' = n2+n5, k = n3−n6, k' = n1+n4, l = n2−n5, l' = n3+n6.
// The quasilattice constant (rhombohedron edge of the 3D Penrose tiling) is
// a_R = a6/√2.
//
// Bravais modules, in the P setting of a6 throughout:
//
//	P: n integer                        ⇔ h≡k', k≡l', l≡h' (mod 2)
//	I: n integer with Σn even           ⇔ P and h'+k'+l' even
//	F: n all integer or all half-odd    ⇔ P, or h≢k', k≢l', l≢h' (mod 2)
//
// so F reflections with half-odd basis indices have odd N, e.g. (7, 11).
//
// Reference: J. W. Cahn, D. Shechtman, D. Gratias, J. Mater. Res. 1, 13
// (1986), doi:10.1557/JMR.1986.0013.
package icosa

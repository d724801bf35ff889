// Package descriptor computes the Hume-Rothery and size descriptors that
// quasicrystal work is planned with: the electron-per-atom ratio e/a under
// a named valence scheme, the valence-electron concentration VEC, the
// atomic size mismatch δ, the electronegativity spread Δχ, the mean atomic
// mass and atomic volume, and the free-electron Fermi wave number kF with
// the 2kF that is compared with strong reciprocal-lattice vectors.
//
// Describe also compares e/a with the published windows in which stable
// icosahedral phases of a few alloy families formed, and says when the
// comparison cannot be made because the scheme counts electrons
// differently from the window's source. The windows are guides drawn from
// a handful of papers, not phase boundaries.
package descriptor

// Package verdict weighs the evidence for an automatic phase outcome: a
// phase indexed from a powder pattern (or a diffuse halo), the rotational
// symmetries electron diffraction saw on the sample, where the sample's e/a
// lies against a published icosahedral window, and what the notebook found
// in samples of nearby composition. It says which evidence agreed, which
// did not and which could not be weighed, and gives a confidence.
//
// Weigh is pure: plain values in, a Verdict out. The rules are rules of
// thumb, stated here so that a person can check every step; they are not a
// probability model.
//
// # Candidate
//
// The candidate outcome follows the diffraction evidence:
//
//	icosahedral phase   → icosahedral, with its lattice (P, F or I)
//	cubic approximant   → approximant, with its order and lattice
//	cubic phase         → crystalline, named after KnownPhases when its
//	                      lattice type matches and a lies within 1.5 %,
//	                      else "cubic X, a = … Å"
//	diffuse halo        → amorphous
//
// # Points
//
// Each piece of evidence adds or takes away points; a reason is written for
// every one, including those that could not be weighed (zero points).
//
//	diffraction   chance ≤ 1e-4: +2 (strong); ≤ 1e-3: +1; otherwise 0
//	              (significant, but not by much)
//	halo          centre at Q = 4π sin θ/λ in [2.2, 3.4] Å⁻¹ (where the
//	              first maximum of metallic glasses lies): +1; elsewhere −1
//	symmetry      icosahedral: a 5-fold axis +1; a 4-, 6-, 8- or 12-fold
//	              axis −2 (the icosahedral point group has none); 10-fold
//	              with neither 3- nor 5-fold −1 (points to a decagonal
//	              phase); 2- and 3-fold only 0.
//	              approximant or crystal: a 5-, 8-, 10- or 12-fold axis −2
//	              (no periodic crystal has one; twinning can mimic it);
//	              cubic crystal: a 4-fold axis +1; otherwise 0.
//	              amorphous: any axis seen −1 (electron diffraction found
//	              order).
//	e/a           icosahedral or approximant candidates only: inside the
//	              family's window +1, outside −1; no window for the
//	              family, or other valences: 0.
//	neighbours    samples of other melts within the distance, with a
//	              standing outcome: at least half of them (and at least
//	              one) with the candidate's kind +1; none of three or
//	              more −1; otherwise 0. Neighbours may have been cooled or
//	              annealed differently, so they count one point at most.
//
// # Confidence
//
//	points ≥ 3: high;  1 or 2: medium;  ≤ 0: low
//
// A strongly indexed phase alone is therefore of medium confidence; it
// becomes high when something independent of the pattern agrees.
//
// Reference: the crystallographic restriction and the icosahedral point
// group m-35 (six 5-fold, ten 3-fold and fifteen 2-fold axes, no 4-fold) are
// common practice (e.g. C. Janot, Quasicrystals: A Primer, 2nd ed., Oxford
// 1994, ch. 1, from memory); e/a windows as held by analysis/descriptor;
// the weights are this package's own rules of thumb.
package verdict

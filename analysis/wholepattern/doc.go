// Package wholepattern refines the cells of the phases found in a powder
// X-ray scan against the whole profile, Le Bail style: the integrated
// intensity of every reflection is free and is re-extracted from the
// observed counts between least-squares cycles, while the cell constants
// (as the crystal system allows), a 2θ zero shift, the Caglioti width
// parameters U, V, W, one pseudo-Voigt mixing η and a shifted Chebyshev
// background are refined by damped least squares (Levenberg–Marquardt).
//
// Refine takes the scan as two slices, the radiation and the phases with
// their reflection lists (hkl families with multiplicities, free of
// systematic absences) and returns the refined cells with standard
// uncertainties, the profile, Rwp, Rp, Rexp and χ², and the observed,
// calculated, background and difference curves for drawing.
//
// Angles are 2θ in degrees, lengths in Å, intensities in the scan's units
// (counts unless the file says otherwise); an integrated intensity is in
// counts × degrees 2θ.
//
// Reference: A. Le Bail, H. Duroy and J. L. Fourquet, Mat. Res. Bull. 23,
// 447 (1988), doi:10.1016/0025-5408(88)90019-0; R. A. Young (ed.), The
// Rietveld Method (IUCr/Oxford, 1993), ch. 1.
package wholepattern

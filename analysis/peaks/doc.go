// Package peaks finds and measures the peaks of a powder diffraction scan:
// SNIP background, Savitzky-Golay smoothing, Rachinger Kα2 stripping, a
// peak search whose threshold comes from counting statistics, least-squares
// pseudo-Voigt profile fits (with the Kα2 component where the scan holds
// it) with standard uncertainties, and a zero-shift correction from an
// internal standard (silicon or LaB6).
//
// Find runs the whole chain on a scan and Result.Report gives its JSON
// form; the steps are exported for callers that want one of them. Angles are 2θ in degrees, d-spacings in Å,
// intensities in the scan's units (counts unless the file says otherwise),
// areas in intensity × degrees.
package peaks

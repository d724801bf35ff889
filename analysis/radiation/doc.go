// Package radiation describes the X-ray beam of a laboratory powder
// diffractometer: the anode's Kα1 and Kα2 wavelengths, the Kα2/Kα1 intensity
// ratio, and whether Kα2 is still in the scan, was stripped afterwards, or
// never reached the detector (a monochromated beam). It also converts between
// the diffraction angle 2θ, the d-spacing and the scattering vector Q by
// Bragg's law.
//
// Wavelengths are in ångström (Å), angles in degrees, Q in Å⁻¹. The package
// imports nothing else of meltbook's.
package radiation

// Package powder computes the powder diffraction pattern of a crystal
// structure: the families of reflections a space group allows, their
// d-spacings, multiplicities and structure factors, and the line
// positions and intensities for a given X-ray wavelength.
//
// Structure factors use the neutral-atom form factors of International
// Tables for Crystallography Vol. C (1992), Table 6.1.1.4 (four Gaussians
// and a constant), an isotropic displacement factor exp(−B s²) with
// B = 8π²U, and no anomalous dispersion (f′ = f″ = 0), so Friedel's law
// holds and reflections merge by Laue class. Intensities carry the
// Lorentz–polarisation factor of a powder diffractometer with or without a
// crystal monochromator, and no absorption, preferred orientation or
// extinction correction.
//
// Lengths are in Å, angles in degrees, s = sinθ/λ in Å⁻¹, displacement U
// in Å², structure factors in electrons (e).
//
// Reference: International Tables for Crystallography Vol. C, ch. 6.1
// (X-ray scattering factors) and ch. 6.2 (Lorentz and polarisation
// factors); Vol. A, ch. 1.6 (reflection conditions).
package powder

//go:generate /usr/bin/python3 internal/genfactors/genfactors.py formfactors_table.go

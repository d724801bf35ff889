package descriptor

import (
	"errors"
	"fmt"
	"math"

	"meltbook/analysis/composition"
	"meltbook/analysis/element"
)

// AvogadroPerMol is the Avogadro constant, exact since the 2019 SI
// redefinition (SI Brochure, 9th edition).
const AvogadroPerMol = 6.02214076e23

// Options tune Describe.
type Options struct {
	// DensityGPerCm3 is the alloy's measured density in g/cm³. Zero means
	// not measured: the atomic volume is then estimated from the elements'
	// densities.
	DensityGPerCm3 float64
}

// Volume methods, reported in Descriptors.VolumeMethod.
const (
	VolumeFromDensity  = "from the given alloy density: V = M̄/(ρ·N_A)"
	VolumeIdealMixing  = "ideal mixing of the elemental atomic volumes (Zen's law): V = Σ x_i·M_i/(ρ_i·N_A), room-temperature element densities"
	volumeUnknownStart = "unknown: "
)

// Descriptors are the computed values for one composition.
type Descriptors struct {
	// Scheme names the valence scheme e/a was computed with.
	Scheme string
	// ElectronsPerAtom is e/a = Σ x_i·v_i under Scheme; meaningful only
	// when ElectronsPerAtomDefined.
	ElectronsPerAtom float64
	// ElectronsPerAtomDefined is false when the scheme has no valence for
	// an element; Undefined then says which.
	ElectronsPerAtomDefined bool
	// VEC is Σ x_i·VEC_i with the s+d / s+p counts of the element table.
	VEC float64
	// MeanRadiusAngstrom is r̄ = Σ x_i·r_i with CN12 metallic radii, Å.
	MeanRadiusAngstrom float64
	// SizeMismatchPercent is δ in percent; meaningful only when
	// SizeMismatchDefined.
	SizeMismatchPercent float64
	// SizeMismatchDefined is false when an element has no tabulated CN12
	// radius.
	SizeMismatchDefined bool
	// MeanElectronegativity is χ̄ = Σ x_i·χ_i (Pauling scale).
	MeanElectronegativity float64
	// ElectronegativitySpread is Δχ (Pauling scale, dimensionless);
	// meaningful only when ElectronegativityDefined.
	ElectronegativitySpread float64
	// ElectronegativityDefined is false when an element has no tabulated
	// Pauling electronegativity.
	ElectronegativityDefined bool
	// Undefined says, one line each, which descriptors could not be
	// computed and why.
	Undefined []string
	// MeanAtomicMassGPerMol is M̄ = Σ x_i·M_i in g/mol.
	MeanAtomicMassGPerMol float64
	// AtomicVolumeA3 is the mean volume per atom in Å³; zero when unknown.
	AtomicVolumeA3 float64
	// VolumeMethod says how AtomicVolumeA3 was obtained, or why it is
	// unknown.
	VolumeMethod string
	// FermiDefined reports whether kF could be computed (e/a > 0 and a
	// known atomic volume).
	FermiDefined bool
	// ElectronDensityPerA3 is n = (e/a)/V in electrons per Å³ (zero when
	// FermiDefined is false).
	ElectronDensityPerA3 float64
	// FermiWaveNumberPerA is kF = (3π²n)^(1/3) in Å⁻¹.
	FermiWaveNumberPerA float64
	// TwoKFPerA is 2kF in Å⁻¹, to compare with |G| of strong reflections
	// (|G| = 2π/d).
	TwoKFPerA float64
	// FermiNote says why kF is undefined; empty when it is defined.
	FermiNote string
	// Flags compare e/a with published windows; see Windows.
	Flags []Flag
}

// Flag is one remark on the descriptors with its source.
type Flag struct {
	// Code is a stable identifier, e.g. "ea-window-below".
	Code string
	// Text says what was found in words.
	Text string
	// Source cites where the compared value comes from.
	Source string
}

// Flag codes.
const (
	FlagInsideWindow     = "ea-window-inside"
	FlagBelowWindow      = "ea-window-below"
	FlagAboveWindow      = "ea-window-above"
	FlagOtherValences    = "ea-window-other-valences"
	FlagNoWindow         = "ea-no-window"
	FlagFermiUndefined   = "fermi-undefined"
	windowEdgeTolerance  = 5e-4 // e/a is quoted to two or three decimals
	valenceMatchTolerant = 0.01
)

// Describe computes the descriptors of the atomic composition c, with e/a
// under scheme:
//
//	e/a = Σ x_i·v_i                      (v_i from scheme)
//	VEC = Σ x_i·VEC_i
//	r̄   = Σ x_i·r_i,  δ = 100·sqrt(Σ x_i·(1 − r_i/r̄)²)   (%, CN12 radii)
//	χ̄   = Σ x_i·χ_i,  Δχ = sqrt(Σ x_i·(χ_i − χ̄)²)         (Pauling)
//	M̄   = Σ x_i·M_i                      (g/mol)
//	V   = M̄/(ρ·N_A)          when opt.DensityGPerCm3 = ρ is given
//	V   = Σ x_i·M_i/(ρ_i·N_A) otherwise (ideal mixing)      (Å³/atom)
//	n   = (e/a)/V,  kF = (3π²·n)^(1/3),  2kF                 (Å⁻³, Å⁻¹)
//
// c must be a normalised atomic composition (fractions summing to 1); an
// unknown element or a bad fraction is an error. Missing data leaves only
// the descriptors that need it undefined, each said in Undefined: a missing
// valence in the scheme leaves e/a, kF and the window comparison undefined;
// an element without a CN12 radius leaves δ undefined, one without a
// Pauling electronegativity Δχ. An element without a density only leaves
// the volume and kF unknown (VolumeMethod says why), unless the alloy
// density is given. When
// e/a ≤ 0, which Raynor's negative transition-metal valences can produce,
// kF is reported undefined rather than computed.
//
// Reference: δ as defined by Y. Zhang, Y. J. Zhou, J. P. Lin, G. L. Chen,
// P. K. Liaw, Adv. Eng. Mater. 10, 534 (2008), doi:10.1002/adem.200700240;
// Δχ as used by S. Guo, C. T. Liu, Prog. Nat. Sci.: Mater. Int. 21, 433
// (2011); kF of the free-electron gas, N. W. Ashcroft, N. D. Mermin, Solid
// State Physics (1976), ch. 2; the Fermi-sphere/zone condition 2kF ≈ |G|
// after Jones and Mott (common practice in Hume-Rothery phase work).
func Describe(c composition.Composition, scheme element.Scheme, opt Options) (Descriptors, error) {
	if len(c) == 0 {
		return Descriptors{}, errors.New("describe: empty composition")
	}
	if opt.DensityGPerCm3 < 0 || math.IsNaN(opt.DensityGPerCm3) || math.IsInf(opt.DensityGPerCm3, 0) {
		return Descriptors{}, fmt.Errorf("describe: alloy density %g g/cm³ must be positive (or zero when not measured)", opt.DensityGPerCm3)
	}
	d := Descriptors{Scheme: scheme.Name}
	var total, ea, vec, r, r2, chi, chi2, mass, volume float64
	var noDensity, noValence, noRadius, noChi string
	for _, p := range c {
		x := p.Fraction
		if x < 0 || math.IsNaN(x) {
			return Descriptors{}, fmt.Errorf("describe: %s fraction %g is not a non-negative number", p.Element, x)
		}
		e, ok := element.BySymbol(p.Element)
		if !ok {
			return Descriptors{}, fmt.Errorf("describe: unknown element %q", p.Element)
		}
		if v, err := scheme.Require(p.Element); err != nil {
			if noValence == "" {
				noValence = err.Error()
			}
		} else {
			ea += x * v
		}
		if !e.HasMetallicRadius() && noRadius == "" {
			noRadius = p.Element
		}
		if !e.HasElectronegativity() && noChi == "" {
			noChi = p.Element
		}
		total += x
		vec += x * float64(e.ValenceElectrons)
		r += x * e.MetallicRadiusCN12
		r2 += x * e.MetallicRadiusCN12 * e.MetallicRadiusCN12
		chi += x * e.Electronegativity
		chi2 += x * e.Electronegativity * e.Electronegativity
		mass += x * e.AtomicWeight
		if e.Density > 0 {
			// ρ in kg/m³ → g/cm³ is /1000; V_i = M_i/(ρ_i·N_A) in Å³.
			volume += x * e.AtomicWeight / (e.Density / 1000 * AvogadroPerMol) * 1e24
		} else if noDensity == "" {
			noDensity = p.Element
		}
	}
	if !(total > 0) {
		return Descriptors{}, errors.New("describe: composition fractions sum to zero")
	}
	// Divide by the total so that rounding in the fractions does not leak
	// into the means.
	d.VEC = vec / total
	d.MeanAtomicMassGPerMol = mass / total
	if noValence == "" {
		d.ElectronsPerAtom = ea / total
		d.ElectronsPerAtomDefined = true
	} else {
		d.Undefined = append(d.Undefined, "e/a: "+noValence)
	}
	if noRadius == "" {
		d.MeanRadiusAngstrom = r / total
		d.SizeMismatchPercent = 100 * spread(r/total, r2/total) / d.MeanRadiusAngstrom
		d.SizeMismatchDefined = true
	} else {
		d.Undefined = append(d.Undefined, "δ: no CN12 metallic radius is tabulated for "+noRadius)
	}
	if noChi == "" {
		d.MeanElectronegativity = chi / total
		d.ElectronegativitySpread = spread(chi/total, chi2/total)
		d.ElectronegativityDefined = true
	} else {
		d.Undefined = append(d.Undefined, "Δχ: no Pauling electronegativity is tabulated for "+noChi)
	}

	switch {
	case opt.DensityGPerCm3 > 0:
		d.AtomicVolumeA3 = d.MeanAtomicMassGPerMol / (opt.DensityGPerCm3 * AvogadroPerMol) * 1e24
		d.VolumeMethod = VolumeFromDensity
	case noDensity != "":
		d.VolumeMethod = volumeUnknownStart + "no density is tabulated for " + noDensity + "; give the alloy density"
	default:
		d.AtomicVolumeA3 = volume / total
		d.VolumeMethod = VolumeIdealMixing
	}

	if !d.ElectronsPerAtomDefined {
		d.FermiNote = "e/a is undefined under scheme " + scheme.Name
		return d, nil
	}
	kf, note := FermiWaveNumber(d.ElectronsPerAtom, d.AtomicVolumeA3)
	if note == "" {
		d.FermiDefined = true
		d.ElectronDensityPerA3 = d.ElectronsPerAtom / d.AtomicVolumeA3
		d.FermiWaveNumberPerA = kf
		d.TwoKFPerA = 2 * kf
	} else {
		d.FermiNote = note
		if d.AtomicVolumeA3 == 0 {
			d.FermiNote = "the atomic volume is " + d.VolumeMethod
		}
		d.Flags = append(d.Flags, Flag{Code: FlagFermiUndefined, Text: "kF is undefined: " + d.FermiNote,
			Source: "free-electron model, Ashcroft & Mermin (1976), ch. 2"})
	}
	d.Flags = append(d.Flags, windowFlag(c, scheme, d.ElectronsPerAtom))
	return d, nil
}

// spread returns sqrt(<y²> − <y>²), the composition-weighted standard
// deviation, from the weighted mean and mean square; rounding can make
// the difference slightly negative for a pure element, which counts as 0.
func spread(mean, meanSquare float64) float64 {
	v := meanSquare - mean*mean
	if v <= 0 {
		return 0
	}
	return math.Sqrt(v)
}

// SizeMismatchPercent returns the atomic size mismatch
//
//	r̄ = Σ x_i·r_i,  δ = 100·sqrt(Σ x_i·(1 − r_i/r̄)²)
//
// in percent for atomic fractions x (summing to 1) and radii r in any one
// unit. It panics when the slices differ in length or r̄ is not positive.
// Use it to reproduce a published δ with that paper's own radii.
//
// Reference: Y. Zhang et al., Adv. Eng. Mater. 10, 534 (2008),
// doi:10.1002/adem.200700240.
func SizeMismatchPercent(x, r []float64) float64 {
	if len(x) != len(r) {
		panic("descriptor: SizeMismatchPercent: fractions and radii differ in length")
	}
	var mean float64
	for i := range x {
		mean += x[i] * r[i]
	}
	if !(mean > 0) {
		panic("descriptor: SizeMismatchPercent: mean radius is not positive")
	}
	var s float64
	for i := range x {
		d := 1 - r[i]/mean
		s += x[i] * d * d
	}
	return 100 * math.Sqrt(s)
}

// ElectronegativitySpread returns
//
//	χ̄ = Σ x_i·χ_i,  Δχ = sqrt(Σ x_i·(χ_i − χ̄)²)
//
// for atomic fractions x (summing to 1) and electronegativities chi. It
// panics when the slices differ in length.
//
// Reference: S. Guo, C. T. Liu, Prog. Nat. Sci.: Mater. Int. 21, 433 (2011).
func ElectronegativitySpread(x, chi []float64) float64 {
	if len(x) != len(chi) {
		panic("descriptor: ElectronegativitySpread: fractions and electronegativities differ in length")
	}
	var mean float64
	for i := range x {
		mean += x[i] * chi[i]
	}
	var s float64
	for i := range x {
		d := chi[i] - mean
		s += x[i] * d * d
	}
	return math.Sqrt(s)
}

// FermiWaveNumber returns the free-electron Fermi wave number
//
//	n = (e/a)/V,  kF = (3π²·n)^(1/3)
//
// in Å⁻¹ for electronsPerAtom = e/a and atomicVolumeA3 = V in Å³ per atom.
// When kF is undefined (e/a ≤ 0, or V not positive) it returns 0 and a
// note saying why.
//
// Reference: N. W. Ashcroft, N. D. Mermin, Solid State Physics (1976),
// eq. (2.21).
func FermiWaveNumber(electronsPerAtom, atomicVolumeA3 float64) (kF float64, note string) {
	switch {
	case !(atomicVolumeA3 > 0) || math.IsInf(atomicVolumeA3, 0):
		return 0, "the atomic volume is not known"
	case !(electronsPerAtom > 0):
		return 0, fmt.Sprintf("e/a = %.3f is not positive (negative transition-metal valences outweigh the rest), so there is no free-electron sphere", electronsPerAtom)
	}
	n := electronsPerAtom / atomicVolumeA3
	return math.Cbrt(3 * math.Pi * math.Pi * n), ""
}

package cooling

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"meltbook/analysis/composition"
	"meltbook/analysis/element"
)

// Regime names the heat-flow regime an estimate was made in.
type Regime string

// Regimes.
const (
	// Newtonian: Bi ≤ 0.1, the ribbon is nearly isothermal through its
	// thickness and the wheel interface controls the heat flow.
	Newtonian Regime = "newtonian"
	// ConductionLimited: Bi > 0.1, conduction through the ribbon matters
	// and the Newtonian estimate does not hold.
	ConductionLimited Regime = "conduction-limited"
)

// DefaultHeatTransferWPerM2K is the interface heat-transfer coefficient
// used when none is given, in W/(m²·K). Measured melt-spinning values lie
// around 5×10⁴ to 3×10⁵ W/(m²·K) for wheel speeds of 4-36 m/s, with
// near-Newtonian cooling.
//
// Reference: A. G. Gillen, B. Cantor, Acta Metall. 33, 1813 (1985) (range
// read from the abstract; authors and volume from memory).
const DefaultHeatTransferWPerM2K = 1e5

// BiotLimit is the Biot number up to which a body may be treated as
// isothermal (lumped), the usual engineering criterion.
//
// Reference: F. P. Incropera, D. P. DeWitt, Fundamentals of Heat and Mass
// Transfer, section 5.1 (common practice).
const BiotLimit = 0.1

// Material holds the thermal properties the estimate needs.
type Material struct {
	DensityKgPerM3            float64
	SpecificHeatJPerKgK       float64
	ThermalConductivityWPerMK float64
	// Sources says, one line per property, where the values came from.
	Sources []string
	// Missing names elements whose values were not tabulated and were
	// left out of the weighting, with the properties they lacked.
	Missing []string
}

// MaterialFromComposition estimates ρ, c_p and k of an alloy from the
// element table's room-temperature values, weighted as
//
//	w_i = x_i·M_i / Σ x_j·M_j                  (mass fractions)
//	1/ρ = Σ w_i/ρ_i                            (ideal mixing of volumes)
//	c_p = Σ w_i·c_p,i                          (Neumann-Kopp, per mass)
//	φ_i = (w_i/ρ_i)·ρ,  k = Σ φ_i·k_i          (volume-fraction rule of mixtures)
//
// Elements lacking a value are left out of that property's weighting (the
// remaining weights are renormalised) and named in Missing. It fails when
// an element is unknown or no element has a value for some property.
//
// The conductivity from the rule of mixtures is an upper bound: alloys,
// and quasicrystals above all (about 1-2 W/(m·K) for icosahedral Al-Cu-Fe,
// from memory), conduct far less than their elements, so a Biot number
// computed from it is a lower bound. Room-temperature properties also
// differ from those of the melt.
//
// Reference: rule-of-mixtures estimates, common practice.
func MaterialFromComposition(c composition.Composition) (Material, error) {
	if len(c) == 0 {
		return Material{}, errors.New("thermal properties: empty composition")
	}
	type part struct {
		el element.Element
		w  float64
	}
	parts := make([]part, 0, len(c))
	var mass float64
	for _, p := range c {
		e, ok := element.BySymbol(p.Element)
		if !ok {
			return Material{}, fmt.Errorf("thermal properties: unknown element %q", p.Element)
		}
		parts = append(parts, part{e, p.Fraction * e.AtomicWeight})
		mass += p.Fraction * e.AtomicWeight
	}
	if !(mass > 0) {
		return Material{}, errors.New("thermal properties: composition has no mass")
	}
	var m Material
	var wRho, specificVolume, wCp, cp float64
	for i := range parts {
		parts[i].w /= mass
		p := parts[i]
		var lacks []string
		if p.el.Density > 0 {
			wRho += p.w
			specificVolume += p.w / p.el.Density
		} else {
			lacks = append(lacks, "density")
		}
		if p.el.SpecificHeat > 0 {
			wCp += p.w
			cp += p.w * p.el.SpecificHeat
		} else {
			lacks = append(lacks, "specific heat")
		}
		if p.el.ThermalConductivity <= 0 {
			lacks = append(lacks, "thermal conductivity")
		}
		if len(lacks) > 0 {
			m.Missing = append(m.Missing, p.el.Symbol+" ("+strings.Join(lacks, ", ")+")")
		}
	}
	if wRho == 0 || wCp == 0 {
		return Material{}, errors.New("thermal properties: no element of the composition has a tabulated density and specific heat; give ρ, c_p and k")
	}
	m.DensityKgPerM3 = wRho / specificVolume
	m.SpecificHeatJPerKgK = cp / wCp
	// Volume fractions over the elements with both a density and a
	// conductivity.
	var vK, k float64
	for _, p := range parts {
		if p.el.Density > 0 && p.el.ThermalConductivity > 0 {
			v := p.w / p.el.Density
			vK += v
			k += v * p.el.ThermalConductivity
		}
	}
	if vK == 0 {
		return Material{}, errors.New("thermal properties: no element of the composition has a tabulated thermal conductivity; give k")
	}
	m.ThermalConductivityWPerMK = k / vK
	m.Sources = []string{
		"ρ = " + num(m.DensityKgPerM3) + " kg/m³ from the elements' room-temperature densities, ideal mixing of volumes (1/ρ = Σ w_i/ρ_i)",
		"c_p = " + num(m.SpecificHeatJPerKgK) + " J/(kg·K), mass-fraction average of the elements' values at 25 °C (Neumann-Kopp)",
		"k = " + num(m.ThermalConductivityWPerMK) + " W/(m·K), volume-fraction average of the elements' values at 300 K: an upper bound, real alloys conduct less",
	}
	if len(m.Missing) > 0 {
		m.Sources = append(m.Sources, "left out for lack of data: "+strings.Join(m.Missing, "; "))
	}
	return m, nil
}

// Input describes one ribbon.
type Input struct {
	// ThicknessMetres is the measured ribbon thickness t, m.
	ThicknessMetres float64
	// MeltTemperatureK is the melt (ejection) temperature, K.
	MeltTemperatureK float64
	// WheelTemperatureK is the wheel or substrate temperature, K.
	WheelTemperatureK float64
	// HeatTransferWPerM2K is h at the wheel interface in W/(m²·K); zero
	// means DefaultHeatTransferWPerM2K.
	HeatTransferWPerM2K float64
	// Material holds ρ, c_p and k, given or from MaterialFromComposition.
	Material Material
	// WheelSpeedMPerS is the wheel surface speed, m/s; recorded in the
	// assumptions as context, not used in the estimate. Zero: not given.
	WheelSpeedMPerS float64
}

// Estimate is a cooling-rate estimate with its assumptions.
type Estimate struct {
	// RateKPerS is the estimated mean cooling rate, K/s.
	RateKPerS float64
	// Regime says which formula applied.
	Regime Regime
	// Biot is h·t/k.
	Biot float64
	// HeatTransferWPerM2K is the h used.
	HeatTransferWPerM2K float64
	// Assumptions lists every assumption in words: h and whether it was
	// the default, property sources, ΔT, the regime and its validity.
	Assumptions []string
}

// Rate estimates the cooling rate of a ribbon chilled from one side:
//
//	ΔT = T_melt − T_wheel
//	Bi = h·t/k
//	Bi ≤ 0.1:  dT/dt = h·ΔT/(ρ·c_p·t)                       (Newtonian)
//	Bi > 0.1:  dT/dt ≈ min(α·ΔT/t², h·ΔT/(ρ·c_p·t)),  α = k/(ρ·c_p)
//
// The second line is the conduction-limited scaling (no numerical
// prefactor, an order of magnitude), capped by the rate the interface can
// carry, since heat crosses the interface and the ribbon in series.
// Units: m, K, W/(m²·K), kg/m³, J/(kg·K), W/(m·K); result in K/s.
// Latent heat and superheat are not treated separately: ΔT is the whole
// driving difference. Non-positive thickness or properties, a melt not
// hotter than the wheel, and negative h are errors.
//
// Reference: Newtonian cooling of melt-spun ribbons and the Biot criterion,
// e.g. H. Jones, Rapid Solidification of Metals and Alloys (Institution of
// Metallurgists, 1982) (from memory); lumped-body limit Bi < 0.1,
// Incropera & DeWitt (common practice); t⁻² conduction scaling, common
// practice.
func Rate(in Input) (Estimate, error) {
	if err := check(in); err != nil {
		return Estimate{}, err
	}
	h := in.HeatTransferWPerM2K
	hDefault := h == 0
	if hDefault {
		h = DefaultHeatTransferWPerM2K
	}
	m := in.Material
	t := in.ThicknessMetres
	dT := in.MeltTemperatureK - in.WheelTemperatureK
	rhoC := m.DensityKgPerM3 * m.SpecificHeatJPerKgK
	newtonian := h * dT / (rhoC * t)
	e := Estimate{Biot: h * t / m.ThermalConductivityWPerMK, HeatTransferWPerM2K: h}

	if hDefault {
		e.Assumptions = append(e.Assumptions, "h = "+num(h)+" W/(m²·K) at the wheel interface: the default, not measured "+
			"(melt-spinning measurements give about 5e4 to 3e5 W/(m²·K); Gillen & Cantor 1985)")
	} else {
		e.Assumptions = append(e.Assumptions, "h = "+num(h)+" W/(m²·K) at the wheel interface, as given")
	}
	e.Assumptions = append(e.Assumptions,
		"ΔT = T_melt − T_wheel = "+num(in.MeltTemperatureK)+" K − "+num(in.WheelTemperatureK)+" K = "+num(dT)+
			" K, the whole driving difference (superheat and latent heat not treated separately)",
		"ribbon thickness t = "+num(t*1e6)+" µm, cooled through the wheel contact only",
		"ρ = "+num(m.DensityKgPerM3)+" kg/m³, c_p = "+num(m.SpecificHeatJPerKgK)+" J/(kg·K), k = "+
			num(m.ThermalConductivityWPerMK)+" W/(m·K)")
	if len(m.Sources) == 0 {
		e.Assumptions = append(e.Assumptions, "thermal properties as given by the caller")
	}
	e.Assumptions = append(e.Assumptions, m.Sources...)

	biot := "Bi = h·t/k = " + strconv.FormatFloat(e.Biot, 'g', 3, 64)
	if e.Biot <= BiotLimit {
		e.Regime = Newtonian
		e.RateKPerS = newtonian
		e.Assumptions = append(e.Assumptions, biot+" ≤ 0.1: the ribbon is nearly isothermal through its thickness, "+
			"so Newtonian cooling h·ΔT/(ρ·c_p·t) applies")
	} else {
		e.Regime = ConductionLimited
		alpha := m.ThermalConductivityWPerMK / rhoC
		conduction := alpha * dT / (t * t)
		if conduction <= newtonian {
			e.RateKPerS = conduction
			e.Assumptions = append(e.Assumptions, biot+" > 0.1: the Newtonian estimate is not valid; conduction through "+
				"the thickness limits the rate, estimated as α·ΔT/t² with α = k/(ρ·c_p) = "+num(alpha)+
				" m²/s (an order of magnitude, prefactor omitted)")
		} else {
			e.RateKPerS = newtonian
			e.Assumptions = append(e.Assumptions, biot+" > 0.1: the Newtonian estimate is not valid; the conduction scaling "+
				"α·ΔT/t² ("+num(conduction)+" K/s) exceeds what the interface can carry, so the interface value "+
				"h·ΔT/(ρ·c_p·t) is reported as an upper bound")
		}
	}
	if in.WheelSpeedMPerS > 0 {
		e.Assumptions = append(e.Assumptions, "wheel surface speed "+num(in.WheelSpeedMPerS)+
			" m/s recorded as context; it enters only through the measured thickness and h")
	}
	return e, nil
}

func check(in Input) error {
	bad := func(x float64) bool { return !(x > 0) || math.IsInf(x, 0) }
	switch {
	case bad(in.ThicknessMetres):
		return fmt.Errorf("cooling rate: ribbon thickness must be a positive length, got %g m", in.ThicknessMetres)
	case bad(in.MeltTemperatureK):
		return fmt.Errorf("cooling rate: melt temperature must be above 0 K, got %g K", in.MeltTemperatureK)
	case bad(in.WheelTemperatureK):
		return fmt.Errorf("cooling rate: wheel temperature must be above 0 K, got %g K", in.WheelTemperatureK)
	case in.MeltTemperatureK <= in.WheelTemperatureK:
		return fmt.Errorf("cooling rate: melt temperature %g K is not above the wheel temperature %g K", in.MeltTemperatureK, in.WheelTemperatureK)
	case in.HeatTransferWPerM2K < 0 || math.IsNaN(in.HeatTransferWPerM2K) || math.IsInf(in.HeatTransferWPerM2K, 0):
		return fmt.Errorf("cooling rate: heat-transfer coefficient must be positive (or zero for the default), got %g W/(m²·K)", in.HeatTransferWPerM2K)
	case bad(in.Material.DensityKgPerM3):
		return fmt.Errorf("cooling rate: density must be positive, got %g kg/m³", in.Material.DensityKgPerM3)
	case bad(in.Material.SpecificHeatJPerKgK):
		return fmt.Errorf("cooling rate: specific heat must be positive, got %g J/(kg·K)", in.Material.SpecificHeatJPerKgK)
	case bad(in.Material.ThermalConductivityWPerMK):
		return fmt.Errorf("cooling rate: thermal conductivity must be positive, got %g W/(m·K)", in.Material.ThermalConductivityWPerMK)
	case in.WheelSpeedMPerS < 0 || math.IsNaN(in.WheelSpeedMPerS):
		return fmt.Errorf("cooling rate: wheel speed must not be negative, got %g m/s", in.WheelSpeedMPerS)
	}
	return nil
}

// num formats a value with four significant digits for the assumption
// lines.
func num(x float64) string { return strconv.FormatFloat(x, 'g', 4, 64) }

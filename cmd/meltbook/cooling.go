package main

import (
	"fmt"

	"github.com/spf13/cobra"

	"meltbook/analysis/cooling"
	"meltbook/analysis/quantity"
	"meltbook/store/runform"
)

func init() { addCommand(newCoolingCommand) }

// Defaults of the cooling command, each printed among the assumptions.
const (
	defaultCoolingComposition = "Al63Cu25Fe12"
	defaultMeltTemperature    = runform.DefaultMeltTemperature
	defaultWheelTemperature   = runform.DefaultWheelTemperature
)

// coolingJSON is the stable machine-readable form of `cooling`.
type coolingJSON struct {
	RateKPerS       float64  `json:"rate_K_s"`
	Regime          string   `json:"regime"`
	Biot            float64  `json:"biot"`
	HeatTransfer    float64  `json:"h_W_m2K"`
	ThicknessM      float64  `json:"thickness_m"`
	MeltK           float64  `json:"melt_temperature_K"`
	WheelK          float64  `json:"wheel_temperature_K"`
	WheelSpeedMPerS float64  `json:"wheel_speed_m_s,omitempty"`
	Material        string   `json:"material"`
	Assumptions     []string `json:"assumptions"`
}

func newCoolingCommand(a *app) *cobra.Command {
	var (
		thickness, melt, wheel, h, speed, diameter string
		comp, density, specificHeat, conductivity  string
		asJSON                                     bool
	)
	cmd := &cobra.Command{
		Use:   "cooling --thickness 35um",
		Short: "Cooling-rate estimate of a melt-spun ribbon, with its regime",
		Long: `Estimates the mean cooling rate of a ribbon chilled on one side from its
thickness, the melt and wheel temperatures and the interface heat-transfer
coefficient h. When the Biot number h·t/k is below 0.1 the Newtonian estimate
h·ΔT/(ρ·c_p·t) applies; above it the result is conduction-limited and says so.
Thermal properties come from --composition (element values weighted by
composition) unless given with --density, --specific-heat and --conductivity.`,
		Args: exactArgs(0, "no arguments"),
		RunE: func(cmd *cobra.Command, args []string) error {
			in := cooling.Input{}
			if thickness == "" {
				return invalidFlag("--thickness", "give the ribbon thickness, e.g. --thickness 35um")
			}
			t, err := parseQuantity("--thickness", thickness, quantity.Length)
			if err != nil {
				return err
			}
			in.ThicknessMetres = t.SI
			mt, err := parseQuantity("--melt-temperature", melt, quantity.Temperature)
			if err != nil {
				return err
			}
			wt, err := parseQuantity("--wheel-temperature", wheel, quantity.Temperature)
			if err != nil {
				return err
			}
			in.MeltTemperatureK, in.WheelTemperatureK = mt.SI, wt.SI
			if h != "" {
				hv, err := parseQuantity("--h", h, quantity.HeatTransferCoefficient)
				if err != nil {
					return err
				}
				in.HeatTransferWPerM2K = hv.SI
			}
			if speed != "" {
				var d *quantity.Value
				if diameter != "" {
					dv, err := parseQuantity("--wheel-diameter", diameter, quantity.Length)
					if err != nil {
						return err
					}
					d = &dv
				}
				v, err := quantity.ParseWheelSpeed(speed, d)
				if err != nil {
					return invalidFlag("--wheel-speed", err.Error())
				}
				in.WheelSpeedMPerS = v.SI
			}
			parsed, err := parseComposition("--composition", comp, false)
			if err != nil {
				return err
			}
			mat, err := cooling.MaterialFromComposition(parsed.Atomic)
			if err != nil {
				return invalid(err)
			}
			for _, o := range []struct {
				flag string
				s    string
				dim  quantity.Dimension
				dst  *float64
			}{
				{"--density", density, quantity.Density, &mat.DensityKgPerM3},
				{"--specific-heat", specificHeat, quantity.SpecificHeat, &mat.SpecificHeatJPerKgK},
				{"--conductivity", conductivity, quantity.ThermalConductivity, &mat.ThermalConductivityWPerMK},
			} {
				if o.s == "" {
					continue
				}
				v, err := parseQuantity(o.flag, o.s, o.dim)
				if err != nil {
					return err
				}
				*o.dst = v.SI
				mat.Sources = append(mat.Sources, fmt.Sprintf("%s given as %s", o.flag[2:], o.s))
			}
			in.Material = mat
			est, err := cooling.Rate(in)
			if err != nil {
				return invalid(err)
			}
			material := parsed.Atomic.Format(2)
			if !cmd.Flags().Changed("composition") {
				material += " (default; give --composition)"
			}
			assumptions := append([]string{"material properties of " + material}, est.Assumptions...)
			if !cmd.Flags().Changed("melt-temperature") {
				assumptions = append(assumptions, "melt temperature "+defaultMeltTemperature+" (default; give --melt-temperature)")
			}
			if !cmd.Flags().Changed("wheel-temperature") {
				assumptions = append(assumptions, "wheel temperature "+defaultWheelTemperature+" (default; give --wheel-temperature)")
			}
			if asJSON {
				return writeJSON(a.stdout, coolingJSON{
					RateKPerS: est.RateKPerS, Regime: string(est.Regime), Biot: est.Biot,
					HeatTransfer: est.HeatTransferWPerM2K, ThicknessM: in.ThicknessMetres,
					MeltK: in.MeltTemperatureK, WheelK: in.WheelTemperatureK,
					WheelSpeedMPerS: in.WheelSpeedMPerS, Material: material, Assumptions: assumptions,
				})
			}
			w := a.stdout
			fmt.Fprintf(w, "cooling rate  %.3g K/s\n", est.RateKPerS)
			fmt.Fprintf(w, "regime        %s (Biot number h·t/k = %.3g)\n\n", est.Regime, est.Biot)
			fmt.Fprintln(w, "Assumptions:")
			for _, s := range assumptions {
				fmt.Fprintf(w, "  - %s\n", s)
			}
			return nil
		},
	}
	f := cmd.Flags()
	f.StringVar(&thickness, "thickness", "", "ribbon thickness with unit: 35um, 0.04mm")
	f.StringVar(&melt, "melt-temperature", defaultMeltTemperature, "melt temperature at ejection")
	f.StringVar(&wheel, "wheel-temperature", defaultWheelTemperature, "wheel surface temperature")
	f.StringVar(&h, "h", "", fmt.Sprintf("interface heat-transfer coefficient (default %.0e W/m2K)", cooling.DefaultHeatTransferWPerM2K))
	f.StringVar(&speed, "wheel-speed", "", "wheel surface speed (m/s), or rpm with --wheel-diameter; recorded as context")
	f.StringVar(&diameter, "wheel-diameter", "", "wheel diameter, to turn rpm into a surface speed")
	f.StringVar(&comp, "composition", defaultCoolingComposition, "alloy whose element properties are weighted")
	f.StringVar(&density, "density", "", "alloy density, e.g. 4.5g/cm3 (overrides the weighted value)")
	f.StringVar(&specificHeat, "specific-heat", "", "alloy specific heat, e.g. 800J/kgK")
	f.StringVar(&conductivity, "conductivity", "", "alloy thermal conductivity, e.g. 20W/mK")
	f.BoolVar(&asJSON, "json", false, "print JSON")
	return cmd
}

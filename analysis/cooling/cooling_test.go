package cooling_test

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"meltbook/analysis/composition"
	"meltbook/analysis/cooling"
)

// aluminium holds handbook values for pure Al near room temperature:
// ρ = 2700 kg/m³, c_p = 897 J/(kg·K), k = 237 W/(m·K) (CRC Handbook of
// Chemistry and Physics, common values).
var aluminium = cooling.Material{DensityKgPerM3: 2700, SpecificHeatJPerKgK: 897, ThermalConductivityWPerMK: 237}

func within(got, want, rel float64) bool { return math.Abs(got-want) <= rel*math.Abs(want) }

func TestRate(t *testing.T) {
	tests := []struct {
		name   string
		in     cooling.Input
		rate   float64
		biot   float64
		regime cooling.Regime
	}{
		{
			// Thin Al ribbon, 30 µm, melt 1273.15 K (1000 °C), wheel 293.15 K,
			// default h = 1e5 W/(m²·K):
			//   ΔT = 980 K
			//   ρ·c_p·t = 2700 × 897 × 30e-6 = 72.657 J/(m²·K)
			//   dT/dt = 1e5 × 980 / 72.657 = 1.3488e6 K/s
			//   Bi = 1e5 × 30e-6 / 237 = 0.012658 ≤ 0.1 → Newtonian.
			// The order, 10⁶ K/s, is the usual melt-spinning range
			// (10⁴-10⁷ K/s, common practice).
			name:   "30 µm Al ribbon",
			in:     cooling.Input{ThicknessMetres: 30e-6, MeltTemperatureK: 1273.15, WheelTemperatureK: 293.15, Material: aluminium},
			rate:   1.3488e6,
			biot:   0.012658,
			regime: cooling.Newtonian,
		},
		{
			// 2 mm cast at h = 1e6 W/(m²·K):
			//   Bi = 1e6 × 2e-3 / 237 = 8.439 > 0.1 → conduction-limited
			//   α = 237 / (2700 × 897) = 9.7856e-5 m²/s
			//   dT/dt ≈ α·ΔT/t² = 9.7856e-5 × 980 / 4e-6 = 2.3975e4 K/s,
			//   below the interface value 1e6 × 980 / (2700 × 897 × 2e-3) = 2.023e5.
			name:   "2 mm cast, high h",
			in:     cooling.Input{ThicknessMetres: 2e-3, MeltTemperatureK: 1273.15, WheelTemperatureK: 293.15, HeatTransferWPerM2K: 1e6, Material: aluminium},
			rate:   2.3975e4,
			biot:   8.439,
			regime: cooling.ConductionLimited,
		},
		{
			// 2 mm cast at the default h: Bi = 1e5 × 2e-3 / 237 = 0.8439 > 0.1,
			// conduction-limited; α·ΔT/t² = 2.3975e4 exceeds the interface value
			// 1e5 × 980 / (2700 × 897 × 2e-3) = 2.0232e4 K/s, which is reported.
			name:   "2 mm cast, default h",
			in:     cooling.Input{ThicknessMetres: 2e-3, MeltTemperatureK: 1273.15, WheelTemperatureK: 293.15, Material: aluminium},
			rate:   2.0232e4,
			biot:   0.8439,
			regime: cooling.ConductionLimited,
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			e, err := cooling.Rate(tt.in)
			if err != nil {
				t.Fatal(err)
			}
			if !within(e.RateKPerS, tt.rate, 1e-3) {
				t.Errorf("rate %.5g K/s, want %.5g", e.RateKPerS, tt.rate)
			}
			if !within(e.Biot, tt.biot, 1e-3) {
				t.Errorf("Bi %.5g, want %.5g", e.Biot, tt.biot)
			}
			if e.Regime != tt.regime {
				t.Errorf("regime %q, want %q", e.Regime, tt.regime)
			}
			all := strings.Join(e.Assumptions, "\n")
			for _, w := range []string{"h = ", "ΔT = T_melt − T_wheel", "Bi = h·t/k", "ρ = "} {
				if !strings.Contains(all, w) {
					t.Errorf("assumptions lack %q:\n%s", w, all)
				}
			}
			if tt.in.HeatTransferWPerM2K == 0 && !strings.Contains(all, "the default") {
				t.Errorf("default h not declared:\n%s", all)
			}
			if tt.regime == cooling.ConductionLimited && !strings.Contains(all, "not valid") {
				t.Errorf("conduction-limited estimate does not say the Newtonian one is invalid:\n%s", all)
			}
		})
	}
}

func TestRateWheelSpeedIsContext(t *testing.T) {
	in := cooling.Input{ThicknessMetres: 30e-6, MeltTemperatureK: 1273.15, WheelTemperatureK: 293.15, Material: aluminium}
	a, _ := cooling.Rate(in)
	in.WheelSpeedMPerS = 30
	b, err := cooling.Rate(in)
	if err != nil {
		t.Fatal(err)
	}
	if a.RateKPerS != b.RateKPerS || !strings.Contains(strings.Join(b.Assumptions, "\n"), "30 m/s recorded") {
		t.Errorf("wheel speed changed the rate or was not recorded: %v", b.Assumptions)
	}
}

func TestRateErrors(t *testing.T) {
	good := cooling.Input{ThicknessMetres: 30e-6, MeltTemperatureK: 1273.15, WheelTemperatureK: 293.15, Material: aluminium}
	tests := []struct {
		name string
		edit func(*cooling.Input)
		want string
	}{
		{"negative thickness", func(in *cooling.Input) { in.ThicknessMetres = -30e-6 }, "thickness must be a positive length"},
		{"zero thickness", func(in *cooling.Input) { in.ThicknessMetres = 0 }, "thickness must be a positive length"},
		{"NaN thickness", func(in *cooling.Input) { in.ThicknessMetres = math.NaN() }, "thickness"},
		{"melt below wheel", func(in *cooling.Input) { in.MeltTemperatureK = 250 }, "not above the wheel temperature"},
		{"negative h", func(in *cooling.Input) { in.HeatTransferWPerM2K = -1 }, "heat-transfer coefficient"},
		{"no density", func(in *cooling.Input) { in.Material.DensityKgPerM3 = 0 }, "density must be positive"},
		{"no conductivity", func(in *cooling.Input) { in.Material.ThermalConductivityWPerMK = 0 }, "conductivity must be positive"},
		{"wheel at 0 K", func(in *cooling.Input) { in.WheelTemperatureK = 0 }, "wheel temperature must be above 0 K"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			in := good
			tt.edit(&in)
			_, err := cooling.Rate(in)
			if err == nil || !strings.Contains(err.Error(), tt.want) {
				t.Errorf("err = %v, want %q", err, tt.want)
			}
		})
	}
}

func TestMaterialFromComposition(t *testing.T) {
	// Pure elements must give back the handbook values (CRC Handbook,
	// common values): Al ρ 2698-2700 kg/m³, c_p 897 J/(kg·K), k 237 W/(m·K);
	// Cu 8960, 385, 401.
	for _, tt := range []struct {
		el         string
		rho, cp, k float64
	}{
		{"Al", 2700, 897, 237},
		{"Cu", 8960, 385, 401},
	} {
		m, err := cooling.MaterialFromComposition(composition.Composition{{Element: tt.el, Fraction: 1}})
		if err != nil {
			t.Fatal(err)
		}
		if !within(m.DensityKgPerM3, tt.rho, 0.002) || !within(m.SpecificHeatJPerKgK, tt.cp, 0.005) || !within(m.ThermalConductivityWPerMK, tt.k, 0.01) {
			t.Errorf("%s: ρ %g c_p %g k %g", tt.el, m.DensityKgPerM3, m.SpecificHeatJPerKgK, m.ThermalConductivityWPerMK)
		}
	}
	// Al50Cu50 (at.), hand-worked with the handbook values above and
	// atomic weights Al 26.982, Cu 63.546 (CIAAW 2021):
	//   w_Al = 26.982/90.528 = 0.29805, w_Cu = 0.70195
	//   1/ρ = 0.29805/2700 + 0.70195/8960 = 1.10389e-4 + 7.8343e-5
	//       = 1.88732e-4 → ρ = 5298.5 kg/m³
	//   c_p = 0.29805·897 + 0.70195·385 = 267.35 + 270.25 = 537.6 J/(kg·K)
	//   φ_Al = 1.10389e-4/1.88732e-4 = 0.58490, φ_Cu = 0.41510
	//   k = 0.58490·237 + 0.41510·401 = 138.62 + 166.46 = 305.1 W/(m·K)
	c, _ := composition.Normalise([]composition.Part{{Element: "Al", Fraction: 50}, {Element: "Cu", Fraction: 50}})
	m, err := cooling.MaterialFromComposition(c)
	if err != nil {
		t.Fatal(err)
	}
	if !within(m.DensityKgPerM3, 5298.5, 0.002) || !within(m.SpecificHeatJPerKgK, 537.6, 0.005) || !within(m.ThermalConductivityWPerMK, 305.1, 0.01) {
		t.Errorf("Al50Cu50: ρ %g c_p %g k %g", m.DensityKgPerM3, m.SpecificHeatJPerKgK, m.ThermalConductivityWPerMK)
	}
	src := strings.Join(m.Sources, "\n")
	for _, w := range []string{"ideal mixing", "mass-fraction", "volume-fraction", "upper bound"} {
		if !strings.Contains(src, w) {
			t.Errorf("sources lack %q:\n%s", w, src)
		}
	}
	if len(m.Missing) != 0 {
		t.Errorf("missing %v", m.Missing)
	}
	// An element without data is named: polonium has no tabulated
	// density, heat capacity or conductivity in the table.
	c, _ = composition.Normalise([]composition.Part{{Element: "Al", Fraction: 99}, {Element: "Po", Fraction: 1}})
	m, err = cooling.MaterialFromComposition(c)
	if err != nil {
		t.Fatal(err)
	}
	if len(m.Missing) != 1 || !strings.HasPrefix(m.Missing[0], "Po (") {
		t.Errorf("missing %v, want Po", m.Missing)
	}
	if _, err := cooling.MaterialFromComposition(composition.Composition{{Element: "Qq", Fraction: 1}}); err == nil {
		t.Error("unknown element accepted")
	}
}

func ExampleRate() {
	est, err := cooling.Rate(cooling.Input{
		ThicknessMetres:   35e-6,
		MeltTemperatureK:  1473.15,
		WheelTemperatureK: 293.15,
		Material:          cooling.Material{DensityKgPerM3: 4500, SpecificHeatJPerKgK: 600, ThermalConductivityWPerMK: 40},
	})
	if err != nil {
		panic(err)
	}
	fmt.Printf("%.2g K/s, %s, Bi = %.2f\n", est.RateKPerS, est.Regime, est.Biot)
	// Output:
	// 1.2e+06 K/s, newtonian, Bi = 0.09
}

package quantity_test

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"meltbook/analysis/quantity"
)

func TestParse(t *testing.T) {
	tests := []struct {
		in   string
		dim  quantity.Dimension
		want float64 // SI
		unit string  // canonical unit kept for display
	}{
		// Prefixes: SI Brochure, 9th ed. (BIPM 2019), Table 7.
		{"35um", quantity.Length, 35e-6, "µm"},
		{"35 µm", quantity.Length, 35e-6, "µm"},
		{"35 μm", quantity.Length, 35e-6, "µm"}, // Greek mu typed for the micro sign
		{"0.8 mm", quantity.Length, 0.8e-3, "mm"},
		{"2 m", quantity.Length, 2, "m"},
		{"120nm", quantity.Length, 120e-9, "nm"},
		{"40 microns", quantity.Length, 40e-6, "µm"},
		{"10g", quantity.Mass, 0.010, "g"},
		{"500mg", quantity.Mass, 500e-6, "mg"},
		{"0.02 kg", quantity.Mass, 0.02, "kg"},
		// T/K = t/°C + 273.15: SI Brochure, 9th ed., section 2.3.1.
		{"1250 °C", quantity.Temperature, 1523.15, "°C"},
		{"1250C", quantity.Temperature, 1523.15, "°C"},
		{"20 degC", quantity.Temperature, 293.15, "°C"},
		{"-40 °C", quantity.Temperature, 233.15, "°C"},
		{"1523 K", quantity.Temperature, 1523, "K"},
		{"40 kPa", quantity.Pressure, 40e3, "kPa"},
		{"0.4 bar", quantity.Pressure, 40e3, "bar"}, // 1 bar = 1e5 Pa (SI Brochure, Table 8)
		{"250 mbar", quantity.Pressure, 25e3, "mbar"},
		{"760 Torr", quantity.Pressure, 101325, "Torr"}, // 1 Torr = 101325/760 Pa by definition
		{"1 atm", quantity.Pressure, 101325, "atm"},     // standard atmosphere, by definition
		{"0.05 MPa", quantity.Pressure, 5e4, "MPa"},
		{"25 m/s", quantity.Speed, 25, "m/s"},
		{"3000 rpm", quantity.RotationRate, 50, "rpm"}, // 3000/60 rev/s
		{"30 min", quantity.Time, 1800, "min"},
		{"2h", quantity.Time, 7200, "h"},
		{"45 s", quantity.Time, 45, "s"},
		{"1e5 W/m2K", quantity.HeatTransferCoefficient, 1e5, "W/(m²·K)"},
		{"1e5 W/(m²·K)", quantity.HeatTransferCoefficient, 1e5, "W/(m²·K)"},
		{"1E5 W m^-2 K^-1", quantity.HeatTransferCoefficient, 1e5, "W/(m²·K)"},
		{"300 kW/m2K", quantity.HeatTransferCoefficient, 3e5, "kW/(m²·K)"},
		{"99.95%", quantity.Fraction, 0.9995, "%"},
		{"99.95 %", quantity.Fraction, 0.9995, "%"},
		{"0.999", quantity.Fraction, 0.999, ""},
		{"50 ppm", quantity.Fraction, 50e-6, "ppm"},
		{"+.5 mm", quantity.Length, 0.5e-3, "mm"},
		{"4.5 g/cm3", quantity.Density, 4500, "g/cm³"},
		{"2700 kg/m³", quantity.Density, 2700, "kg/m³"},
		{"897 J/(kg·K)", quantity.SpecificHeat, 897, "J/(kg·K)"},
		{"0.897 J/gK", quantity.SpecificHeat, 897, "J/(g·K)"},
		{"237 W/mK", quantity.ThermalConductivity, 237, "W/(m·K)"},
	}
	for _, tt := range tests {
		t.Run(tt.in, func(t *testing.T) {
			v, err := quantity.Parse(tt.in, tt.dim)
			if err != nil {
				t.Fatalf("Parse(%q): %v", tt.in, err)
			}
			if math.Abs(v.SI-tt.want) > 1e-12*math.Max(1, math.Abs(tt.want)) {
				t.Errorf("SI = %.15g, want %.15g", v.SI, tt.want)
			}
			if v.Unit != tt.unit || v.Dimension != tt.dim {
				t.Errorf("unit %q dim %v, want %q %v", v.Unit, v.Dimension, tt.unit, tt.dim)
			}
		})
	}
}

func TestParseErrors(t *testing.T) {
	tests := []struct {
		in   string
		dim  quantity.Dimension
		want string // fragment of the message
	}{
		{"", quantity.Length, "empty value"},
		{"abc", quantity.Length, "does not start with a number"},
		{"35", quantity.Length, `has no unit; give the length in m, mm, µm, um or nm`},
		{"3 kg/s", quantity.Length, `unknown unit "kg/s" for a length; use m, mm, µm`},
		{"35 g", quantity.Length, "is a mass, not a length"},
		{"10 mm", quantity.Mass, "is a length, not a mass"},
		{"1,5 mm", quantity.Length, "decimal mark"},
		{"-3 mm", quantity.Length, "cannot be negative"},
		{"-300 °C", quantity.Temperature, "below absolute zero"},
		{"-1 K", quantity.Temperature, "below absolute zero"},
		{"99.9", quantity.Fraction, "write 99.9% for a percentage"},
		{"101%", quantity.Fraction, "more than 100%"},
		{"3000 rpm", quantity.Speed, "rotation rate, not a surface speed"},
		{"1e999 m", quantity.Length, "out of range"},
		{"20 F", quantity.Temperature, `unknown unit "F"`},
		{"4.5 g/cm3", quantity.Mass, "is a density, not a mass"},
	}
	for _, tt := range tests {
		t.Run(tt.in, func(t *testing.T) {
			_, err := quantity.Parse(tt.in, tt.dim)
			if err == nil {
				t.Fatalf("Parse(%q) succeeded, want error containing %q", tt.in, tt.want)
			}
			if !strings.Contains(err.Error(), tt.want) {
				t.Errorf("error %q does not contain %q", err, tt.want)
			}
		})
	}
}

func TestFormat(t *testing.T) {
	tests := []struct {
		in, unit, want string
		dim            quantity.Dimension
	}{
		{"35um", "µm", "35 µm", quantity.Length},
		{"35um", "mm", "0.035 mm", quantity.Length},
		{"1523.15 K", "°C", "1250 °C", quantity.Temperature},
		{"1250 C", "K", "1523.15 K", quantity.Temperature},
		{"101325 Pa", "Torr", "760 Torr", quantity.Pressure},
		{"0.9995", "%", "99.95%", quantity.Fraction},
		{"1e5 W/m2K", "W/m2K", "100000 W/(m²·K)", quantity.HeatTransferCoefficient},
		{"2e6 W/m2K", "W/m2K", "2e6 W/(m²·K)", quantity.HeatTransferCoefficient},
		{"3 nm", "m", "3e-9 m", quantity.Length},
		{"0 K", "K", "0 K", quantity.Temperature},
	}
	for _, tt := range tests {
		v, err := quantity.Parse(tt.in, tt.dim)
		if err != nil {
			t.Fatal(err)
		}
		got, err := quantity.Format(v, tt.unit)
		if err != nil {
			t.Fatal(err)
		}
		if got != tt.want {
			t.Errorf("Format(%q, %q) = %q, want %q", tt.in, tt.unit, got, tt.want)
		}
	}
	v, _ := quantity.Parse("1 mm", quantity.Length)
	if _, err := quantity.Format(v, "kg"); err == nil || !strings.Contains(err.Error(), "for a length") {
		t.Errorf("Format in a mass unit: err = %v", err)
	}
	if x, err := v.In("µm"); err != nil || math.Abs(x-1000) > 1e-9 {
		t.Errorf("In(µm) = %v, %v; want 1000", x, err)
	}
}

func TestSurfaceSpeed(t *testing.T) {
	// Hand-worked: v = π·D·n = π × 0.200 m × (3000/60) s⁻¹ = 31.4159 m/s.
	rate, _ := quantity.Parse("3000 rpm", quantity.RotationRate)
	d, _ := quantity.Parse("200 mm", quantity.Length)
	v, err := quantity.SurfaceSpeed(rate, d)
	if err != nil {
		t.Fatal(err)
	}
	if want := 31.41592653589793; math.Abs(v.SI-want) > 1e-9 {
		t.Errorf("surface speed %g m/s, want %g", v.SI, want)
	}
	v2, err := quantity.ParseWheelSpeed("3000rpm", &d)
	if err != nil || v2.SI != v.SI {
		t.Errorf("ParseWheelSpeed = %v, %v", v2, err)
	}
	if _, err := quantity.ParseWheelSpeed("3000rpm", nil); err == nil || !strings.Contains(err.Error(), "wheel diameter") {
		t.Errorf("rpm without diameter: err = %v", err)
	}
	if v3, err := quantity.ParseWheelSpeed("25 m/s", nil); err != nil || v3.SI != 25 {
		t.Errorf("ParseWheelSpeed(25 m/s) = %v, %v", v3, err)
	}
	zero := quantity.Value{Dimension: quantity.Length, Unit: "m"}
	if _, err := quantity.SurfaceSpeed(rate, zero); err == nil {
		t.Error("zero diameter accepted")
	}
	if _, err := quantity.SurfaceSpeed(d, d); err == nil {
		t.Error("length accepted as a rotation rate")
	}
}

func FuzzParse(f *testing.F) {
	for _, s := range []string{"35um", "10 g", "1250 °C", "40kPa", "25 m/s", "3000 rpm", "1e5 W/m2K",
		"99.9%", "0.5", "-3 mm", "1,5", "  7.e3 Torr ", "1e-7 nm", "5e", "°C", "+.5"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		for d := quantity.Length; d <= quantity.ThermalConductivity; d++ {
			v, err := quantity.Parse(s, d)
			if err != nil {
				continue
			}
			if math.IsNaN(v.SI) || math.IsInf(v.SI, 0) {
				t.Fatalf("Parse(%q, %v) gave %v", s, d, v.SI)
			}
			// Formatting in the typed unit and reading back must land on
			// the same value to the six digits shown.
			text, err := quantity.Format(v, v.Unit)
			if err != nil {
				t.Fatalf("Format(%v, %q): %v", v, v.Unit, err)
			}
			back, err := quantity.Parse(text, d)
			if err != nil {
				t.Fatalf("Parse(Format(%q)) = Parse(%q): %v", s, text, err)
			}
			x, _ := v.In(v.Unit)
			y, _ := back.In(v.Unit)
			if math.Abs(x-y) > 1e-5*math.Abs(x) {
				t.Fatalf("round trip %q → %q: %g became %g", s, text, x, y)
			}
		}
	})
}

func ExampleParse() {
	thickness, err := quantity.Parse("35um", quantity.Length)
	if err != nil {
		panic(err)
	}
	melt, _ := quantity.Parse("1250 °C", quantity.Temperature)
	fmt.Printf("%.3g m, %.2f K\n", thickness.SI, melt.SI)
	fmt.Println(thickness)
	_, err = quantity.Parse("35 kg/s", quantity.Length)
	fmt.Println(err)
	// Output:
	// 3.5e-05 m, 1523.15 K
	// 35 µm
	// "35 kg/s": unknown unit "kg/s" for a length; use m, mm, µm, um or nm
}

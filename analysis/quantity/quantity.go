package quantity

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Dimension is the kind of physical quantity a value must have.
type Dimension int

// The dimensions meltbook reads from users.
const (
	Length Dimension = iota + 1
	Mass
	Temperature
	Pressure
	Speed
	RotationRate
	Time
	HeatTransferCoefficient
	Fraction
	Density
	SpecificHeat
	ThermalConductivity
)

var dimensionNames = map[Dimension]string{
	Length:                  "length",
	Mass:                    "mass",
	Temperature:             "temperature",
	Pressure:                "pressure",
	Speed:                   "speed",
	RotationRate:            "rotation rate",
	Time:                    "time",
	HeatTransferCoefficient: "heat-transfer coefficient",
	Fraction:                "fraction",
	Density:                 "density",
	SpecificHeat:            "specific heat",
	ThermalConductivity:     "thermal conductivity",
}

// String returns the dimension's name in words, e.g. "length".
func (d Dimension) String() string {
	if n, ok := dimensionNames[d]; ok {
		return n
	}
	return fmt.Sprintf("dimension(%d)", int(d))
}

// SIUnit returns the unit Value.SI is expressed in for the dimension.
func (d Dimension) SIUnit() string {
	u := unitsOf(d)
	for _, x := range u {
		if x.scale == 1 && x.offset == 0 {
			return x.names[0]
		}
	}
	panic(fmt.Sprintf("quantity: no SI unit for %v", d))
}

// Value is a parsed quantity.
type Value struct {
	// SI is the value in the SI unit of its dimension: m, kg, K, Pa, m/s,
	// rev/s, s, W/(m²·K), a plain fraction (1 = 100 %), kg/m³, J/(kg·K)
	// or W/(m·K).
	SI        float64
	Dimension Dimension
	// Unit is the canonical spelling of the unit the value was written in
	// ("µm" for "um", "°C" for "C"), so it can be shown back the same way.
	Unit string
}

// String formats the value in the unit it was written in.
func (v Value) String() string {
	s, err := Format(v, v.Unit)
	if err != nil {
		return fmt.Sprintf("%g %s", v.SI, v.Dimension.SIUnit())
	}
	return s
}

// In returns the value expressed in unit, which must belong to the value's
// dimension.
func (v Value) In(unit string) (float64, error) {
	u, ok := lookup(v.Dimension, unit)
	if !ok {
		return 0, unknownUnitError(unit, v.Dimension)
	}
	return (v.SI - u.offset) / u.scale, nil
}

type unit struct {
	names   []string // spellings shown in error messages; the first is canonical
	aliases []string // further accepted spellings, not shown
	scale   float64  // SI = number·scale + offset
	offset  float64
	listed  bool // shown in error messages
}

const (
	torrPa = 101325.0 / 760 // Pa per Torr: 1 atm = 760 Torr exactly
	atmPa  = 101325.0
	psiPa  = 6894.757293168361 // 1 lbf/in² = 4.4482216152605 N / (0.0254 m)²
)

// The unit tables. Reference: SI Brochure, 9th edition (BIPM 2019) for SI
// prefixes and the degree Celsius (T/K = t/°C + 273.15); 1 atm = 101325 Pa
// and 1 Torr = 1/760 atm by definition; 1 bar = 10⁵ Pa.
var units = map[Dimension][]unit{
	Length: {
		{names: []string{"m"}, scale: 1, listed: true},
		{names: []string{"mm"}, scale: 1e-3, listed: true},
		{names: []string{"µm", "um"}, aliases: []string{"micron", "microns"}, scale: 1e-6, listed: true},
		{names: []string{"nm"}, scale: 1e-9, listed: true},
		{names: []string{"cm"}, scale: 1e-2},
		{names: []string{"Å"}, scale: 1e-10},
	},
	Mass: {
		{names: []string{"kg"}, scale: 1, listed: true},
		{names: []string{"g"}, scale: 1e-3, listed: true},
		{names: []string{"mg"}, scale: 1e-6, listed: true},
		{names: []string{"µg"}, aliases: []string{"ug"}, scale: 1e-9},
	},
	Temperature: {
		{names: []string{"K"}, scale: 1, listed: true},
		{names: []string{"°C", "C"}, aliases: []string{"degC", "℃"}, scale: 1, offset: 273.15, listed: true},
	},
	Pressure: {
		{names: []string{"Pa"}, scale: 1, listed: true},
		{names: []string{"kPa"}, scale: 1e3, listed: true},
		{names: []string{"MPa"}, scale: 1e6, listed: true},
		{names: []string{"hPa"}, scale: 1e2},
		{names: []string{"bar"}, scale: 1e5, listed: true},
		{names: []string{"mbar"}, scale: 1e2, listed: true},
		{names: []string{"Torr"}, aliases: []string{"torr"}, scale: torrPa, listed: true},
		{names: []string{"mTorr"}, aliases: []string{"mtorr"}, scale: torrPa / 1000},
		{names: []string{"atm"}, scale: atmPa},
		{names: []string{"psi"}, scale: psiPa},
	},
	Speed: {
		{names: []string{"m/s"}, scale: 1, listed: true},
		{names: []string{"mm/s"}, scale: 1e-3},
		{names: []string{"cm/s"}, scale: 1e-2},
		{names: []string{"km/h"}, scale: 1000.0 / 3600},
	},
	RotationRate: {
		{names: []string{"rev/s"}, aliases: []string{"rps"}, scale: 1, listed: true},
		{names: []string{"rpm", "rev/min"}, aliases: []string{"r/min"}, scale: 1.0 / 60, listed: true},
	},
	Time: {
		{names: []string{"s"}, aliases: []string{"sec"}, scale: 1, listed: true},
		{names: []string{"ms"}, scale: 1e-3},
		{names: []string{"min"}, scale: 60, listed: true},
		{names: []string{"h"}, aliases: []string{"hr"}, scale: 3600, listed: true},
	},
	HeatTransferCoefficient: {
		{names: []string{"W/(m²·K)", "W/m2K"}, aliases: []string{"W/m2/K", "Wm-2K-1"}, scale: 1, listed: true},
		{names: []string{"kW/(m²·K)", "kW/m2K"}, aliases: []string{"kW/m2/K", "kWm-2K-1"}, scale: 1e3, listed: true},
		{names: []string{"MW/(m²·K)", "MW/m2K"}, aliases: []string{"MW/m2/K", "MWm-2K-1"}, scale: 1e6},
	},
	Density: {
		{names: []string{"kg/m³", "kg/m3"}, aliases: []string{"kgm-3"}, scale: 1, listed: true},
		{names: []string{"g/cm³", "g/cm3"}, aliases: []string{"g/cc", "gcm-3"}, scale: 1000, listed: true},
	},
	SpecificHeat: {
		{names: []string{"J/(kg·K)", "J/kgK"}, aliases: []string{"J/kg/K", "Jkg-1K-1"}, scale: 1, listed: true},
		{names: []string{"J/(g·K)", "J/gK"}, aliases: []string{"J/g/K", "Jg-1K-1"}, scale: 1000, listed: true},
	},
	ThermalConductivity: {
		{names: []string{"W/(m·K)", "W/mK"}, aliases: []string{"W/m/K", "Wm-1K-1"}, scale: 1, listed: true},
	},
	Fraction: {
		{names: []string{""}, scale: 1, listed: true},
		{names: []string{"%"}, scale: 1e-2, listed: true},
		{names: []string{"ppm"}, scale: 1e-6},
	},
}

func unitsOf(d Dimension) []unit {
	u, ok := units[d]
	if !ok {
		panic(fmt.Sprintf("quantity: unknown dimension %d", int(d)))
	}
	return u
}

// normaliseUnit maps the many ways a unit gets typed onto the spellings in
// the tables: micro signs, superscripts, spaces, dots and brackets.
func normaliseUnit(s string) string {
	s = strings.TrimSpace(s)
	if s == "" {
		return s
	}
	s = unitSpellings.Replace(s)
	switch s {
	case "°C", "°c", "oC", "C", "℃":
		return "°C"
	}
	return s
}

// unitSpellings folds the variants people type onto one spelling.
var unitSpellings = strings.NewReplacer(
	"μ", "µ", // Greek mu → micro sign
	"²", "2", "^2", "2", "⁻¹", "-1", "⁻²", "-2", "^-1", "-1", "^-2", "-2",
	"·", "", "⋅", "", "*", "", " ", "", "(", "", ")", "",
	"º", "°", // ordinal indicator typed for a degree sign
	"deg", "°",
)

func lookup(d Dimension, typed string) (unit, bool) {
	unitsOf(d) // panics on an unknown dimension
	u, ok := unitIndex[d][normaliseUnit(typed)]
	return u, ok
}

// unitIndex maps each dimension's normalised unit names and aliases to the
// unit, first listed first.
var unitIndex = func() map[Dimension]map[string]unit {
	idx := make(map[Dimension]map[string]unit, len(units))
	for d, us := range units {
		m := make(map[string]unit)
		for _, u := range us {
			for _, names := range [][]string{u.names, u.aliases} {
				for _, name := range names {
					if _, seen := m[normaliseUnit(name)]; !seen {
						m[normaliseUnit(name)] = u
					}
				}
			}
		}
		idx[d] = m
	}
	return idx
}()

func listedNames(d Dimension) string {
	var names []string
	for _, u := range unitsOf(d) {
		if !u.listed {
			continue
		}
		for _, n := range u.names {
			if n == "" {
				n = "a plain number from 0 to 1"
			}
			names = append(names, n)
		}
	}
	if len(names) == 1 {
		return names[0]
	}
	return strings.Join(names[:len(names)-1], ", ") + " or " + names[len(names)-1]
}

func unknownUnitError(typed string, d Dimension) error {
	return fmt.Errorf("unknown unit %q for a %s; use %s", typed, d, listedNames(d))
}

var examples = map[Dimension]string{
	Length:                  "35 µm",
	Mass:                    "10 g",
	Temperature:             "1250 °C",
	Pressure:                "40 kPa",
	Speed:                   "25 m/s",
	RotationRate:            "3000 rpm",
	Time:                    "30 min",
	HeatTransferCoefficient: "1e5 W/(m²·K)",
	Fraction:                "99.95%",
	Density:                 "4.5 g/cm³",
	SpecificHeat:            "600 J/(kg·K)",
	ThermalConductivity:     "20 W/(m·K)",
}

// Parse reads s, a number followed by a unit (spaces between them are
// optional), as a quantity of dimension dim and converts it to SI:
//
//	SI = number·scale + offset
//
// with offset non-zero only for °C (273.15 K). Accepted units per
// dimension:
//
//	length       m, mm, µm (um, micron), nm, cm, Å
//	mass         kg, g, mg, µg
//	temperature  K, °C (C, degC)
//	pressure     Pa, kPa, MPa, hPa, bar, mbar, Torr, mTorr, atm, psi
//	speed        m/s, mm/s, cm/s, km/h
//	rotation     rev/s, rpm (rev/min)
//	time         s, ms, min, h
//	heat transfer W/(m²·K) (W/m2K), kW/(m²·K), MW/(m²·K)
//	fraction     a plain number 0-1, %, ppm
//	density      kg/m³ (kg/m3), g/cm³ (g/cm3, g/cc)
//	specific heat J/(kg·K) (J/kgK), J/(g·K)
//	conductivity W/(m·K) (W/mK)
//
// Negative values, temperatures below 0 K and fractions above 1 are
// errors, as is a missing unit (except for a plain fraction). The error
// says what was wrong and which units would do.
//
// Reference: SI Brochure, 9th edition (BIPM 2019).
func Parse(s string, dim Dimension) (Value, error) {
	unitsOf(dim) // panics on an undefined dimension: programmer misuse
	text := strings.TrimSpace(s)
	if text == "" {
		return Value{}, fmt.Errorf("empty value; expected a %s such as %q", dim, examples[dim])
	}
	numEnd := scanNumber(text)
	if numEnd == 0 {
		return Value{}, fmt.Errorf("%q does not start with a number; expected a %s such as %q", s, dim, examples[dim])
	}
	number, err := strconv.ParseFloat(text[:numEnd], 64)
	if err != nil {
		if errors.Is(err, strconv.ErrRange) {
			return Value{}, fmt.Errorf("%q: number out of range", s)
		}
		return Value{}, fmt.Errorf("%q: %v", s, err)
	}
	rest := strings.TrimSpace(text[numEnd:])
	if strings.HasPrefix(rest, ",") && len(rest) > 1 && rest[1] >= '0' && rest[1] <= '9' {
		return Value{}, fmt.Errorf("%q: use a point, not a comma, for the decimal mark", s)
	}
	if rest == "" && dim != Fraction {
		return Value{}, fmt.Errorf("%q has no unit; give the %s in %s", s, dim, listedNames(dim))
	}
	u, ok := lookup(dim, rest)
	if !ok {
		return Value{}, wrongUnitError(s, rest, dim)
	}
	if dim == Fraction && rest == "" && number > 1 {
		return Value{}, fmt.Errorf("%q is more than 1; write %s%% for a percentage", s, text[:numEnd])
	}
	v := Value{SI: number*u.scale + u.offset, Dimension: dim, Unit: u.names[0]}
	if math.IsInf(v.SI, 0) || math.IsNaN(v.SI) {
		return Value{}, fmt.Errorf("%q: number out of range", s)
	}
	switch {
	case dim == Temperature && v.SI < 0:
		return Value{}, fmt.Errorf("%q is below absolute zero (0 K = -273.15 °C)", s)
	case dim != Temperature && number < 0:
		return Value{}, fmt.Errorf("%q: a %s cannot be negative", s, dim)
	case dim == Fraction && v.SI > 1:
		return Value{}, fmt.Errorf("%q is more than 100%%", s)
	}
	if v.SI == 0 {
		v.SI = 0 // no negative zero
	}
	return v, nil
}

func wrongUnitError(s, typed string, dim Dimension) error {
	if dim == Speed {
		if _, ok := lookup(RotationRate, typed); ok {
			return fmt.Errorf("%q is a rotation rate, not a surface speed; give the speed in m/s, or the rate together with the wheel diameter (v = π·D·n)", s)
		}
	}
	for d := Length; d <= ThermalConductivity; d++ {
		if d == dim || d == Fraction {
			continue
		}
		if _, ok := lookup(d, typed); ok {
			return fmt.Errorf("%q is a %s, not a %s; use %s", s, d, dim, listedNames(dim))
		}
	}
	return fmt.Errorf("%q: %w", s, unknownUnitError(typed, dim))
}

// scanNumber returns the length of the decimal number at the start of s
// (optional sign, digits with at most one point, optional exponent), or 0.
func scanNumber(s string) int {
	i := 0
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		i++
	}
	digits := 0
	for i < len(s) && s[i] >= '0' && s[i] <= '9' {
		i++
		digits++
	}
	if i < len(s) && s[i] == '.' {
		i++
		for i < len(s) && s[i] >= '0' && s[i] <= '9' {
			i++
			digits++
		}
	}
	if digits == 0 {
		return 0
	}
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		j := i + 1
		if j < len(s) && (s[j] == '+' || s[j] == '-') {
			j++
		}
		k := j
		for k < len(s) && s[k] >= '0' && s[k] <= '9' {
			k++
		}
		if k > j {
			i = k
		}
	}
	return i
}

// Format shows v in unit (which must belong to v's dimension) with six
// significant digits, e.g. "35 µm", "1250 °C", "99.95%". The unit is
// written in its canonical spelling.
func Format(v Value, unit string) (string, error) {
	u, ok := lookup(v.Dimension, unit)
	if !ok {
		return "", unknownUnitError(unit, v.Dimension)
	}
	x := (v.SI - u.offset) / u.scale
	num := formatNumber(x)
	switch u.names[0] {
	case "":
		return num, nil
	case "%":
		return num + "%", nil
	}
	return num + " " + u.names[0], nil
}

// formatNumber writes x with six significant digits, without trailing
// zeros, and with a short exponent ("1e5") outside 1e-4 ≤ |x| < 1e6.
func formatNumber(x float64) string {
	if x == 0 {
		return "0"
	}
	a := math.Abs(x)
	if a >= 1e-4 && a < 1e6 {
		s := strconv.FormatFloat(x, 'g', 6, 64)
		if !strings.ContainsAny(s, "e") {
			return s
		}
		// 'g' chose an exponent (e.g. 999999.7 rounds to 1e+06); fall through.
	}
	s := strconv.FormatFloat(x, 'e', 5, 64)
	mant, exp, _ := strings.Cut(s, "e")
	if strings.Contains(mant, ".") {
		mant = strings.TrimRight(strings.TrimRight(mant, "0"), ".")
	}
	n, _ := strconv.Atoi(exp)
	return mant + "e" + strconv.Itoa(n)
}

// SurfaceSpeed converts a wheel rotation rate and the wheel diameter into
// the surface (rim) speed:
//
//	v = π·D·n
//
// with n in revolutions per second (rpm/60), D in metres and v in m/s.
// Both inputs must be positive and of the right dimension.
//
// Reference: common practice.
func SurfaceSpeed(rate, diameter Value) (Value, error) {
	if rate.Dimension != RotationRate {
		return Value{}, fmt.Errorf("surface speed: rate is a %s, not a rotation rate", rate.Dimension)
	}
	if diameter.Dimension != Length {
		return Value{}, fmt.Errorf("surface speed: wheel diameter is a %s, not a length", diameter.Dimension)
	}
	if !(diameter.SI > 0) {
		return Value{}, fmt.Errorf("surface speed: wheel diameter must be positive, got %s", diameter)
	}
	if rate.SI < 0 || math.IsNaN(rate.SI) {
		return Value{}, fmt.Errorf("surface speed: rotation rate must not be negative, got %s", rate)
	}
	return Value{SI: math.Pi * diameter.SI * rate.SI, Dimension: Speed, Unit: "m/s"}, nil
}

// ParseWheelSpeed reads a wheel surface speed given either as a speed
// ("25 m/s") or as a rotation rate ("3000 rpm"); a rate needs the wheel
// diameter, which may be nil when only speeds are expected.
func ParseWheelSpeed(s string, diameter *Value) (Value, error) {
	v, err := Parse(s, Speed)
	if err == nil {
		return v, nil
	}
	rate, rerr := Parse(s, RotationRate)
	if rerr != nil {
		return Value{}, err
	}
	if diameter == nil {
		return Value{}, fmt.Errorf("%q is a rotation rate; give the wheel diameter as well, or the surface speed in m/s", s)
	}
	return SurfaceSpeed(rate, *diameter)
}

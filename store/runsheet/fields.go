package runsheet

import (
	"strings"
	"unicode"

	"meltbook"
	"meltbook/analysis/quantity"
)

// kind is how a field's cells are read.
type kind int

const (
	textCell kind = iota
	codeCell
	compositionCell
	quantityCell
	wheelSpeedCell
	countCell
	currentCell
	dateCell
	annealCell
	outcomeCell
)

// Field is one thing a column of a run sheet can hold.
type Field struct {
	// Key names the field in --map and in reports, e.g. "wheel-speed".
	Key string
	// Help says what the field holds.
	Help string
	// Headings are the column headings recognised for the field, written
	// as they are compared: lower case, words separated by single spaces,
	// without a unit.
	Headings []string
	// Unit is the dimension of a quantity field; its cells need a unit,
	// in the cell ("35 um") or in the heading ("thickness (um)").
	Unit quantity.Dimension
	// Step and Param name the process parameter the field records, if any.
	Step  meltbook.StepKind
	Param string
	// Required fields must have a value on every row.
	Required bool

	kind kind
}

// Fields lists every field a run sheet column can map to, in report order.
var Fields = []Field{
	{Key: "code", Help: "melt code, unique in the notebook", kind: codeCell,
		Headings: []string{"code", "melt", "melt code", "melt no", "melt id", "run", "run no", "run code", "run id", "id", "sample", "sample code", "sample id", "no", "number", "#", "batch"}},
	{Key: "composition", Help: "nominal composition, e.g. Al63Cu25Fe12 or Al-25Cu-12Fe", kind: compositionCell, Required: true,
		Headings: []string{"composition", "nominal", "nominal composition", "nominal comp", "comp", "alloy", "formula", "target composition"}},
	{Key: "mass", Help: "target button mass", kind: quantityCell, Unit: quantity.Mass, Required: true,
		Headings: []string{"mass", "target mass", "button mass", "charge", "charge mass", "batch mass", "weight", "m"}},
	{Key: "mass-after", Help: "button mass weighed after arc melting", kind: quantityCell, Unit: quantity.Mass,
		Headings: []string{"mass after", "mass after melting", "mass after melt", "final mass", "button mass after", "after melting", "mass after arc"}},
	{Key: "operator", Help: "who made the melt", kind: textCell,
		Headings: []string{"operator", "by", "who", "made by", "melted by", "name", "initials", "user"}},
	{Key: "date", Help: "day (and time) the melt was made", kind: dateCell,
		Headings: []string{"date", "made", "day", "melt date", "date made", "when"}},
	{Key: "remelts", Help: "times the button was flipped and remelted", kind: countCell, Step: meltbook.ArcMelt, Param: "remelts",
		Headings: []string{"remelts", "remelt", "flips", "arc remelts", "number of remelts"}},
	{Key: "arc-current", Help: "arc current in A", kind: currentCell, Step: meltbook.ArcMelt, Param: "current",
		Headings: []string{"arc current", "current"}},
	{Key: "arc-atmosphere", Help: "arc furnace gas, e.g. Ar after Ti getter", kind: textCell, Step: meltbook.ArcMelt, Param: "atmosphere",
		Headings: []string{"arc atmosphere", "arc gas", "melting atmosphere"}},
	{Key: "wheel-material", Help: "wheel material, e.g. Cu or CuBe", kind: textCell, Step: meltbook.MeltSpin, Param: "wheel-material",
		Headings: []string{"wheel", "wheel material", "wheel mat"}},
	{Key: "wheel-speed", Help: "wheel surface speed, or a rotation rate in rpm with wheel-diameter", kind: wheelSpeedCell, Unit: quantity.Speed, Step: meltbook.MeltSpin, Param: "wheel-speed",
		Headings: []string{"wheel speed", "speed", "surface speed", "wheel velocity", "velocity", "v", "vs", "wheel v"}},
	{Key: "wheel-diameter", Help: "wheel diameter, for speeds given in rpm", kind: quantityCell, Unit: quantity.Length, Step: meltbook.MeltSpin,
		Headings: []string{"wheel diameter", "wheel dia", "diameter"}},
	{Key: "orifice", Help: "nozzle orifice diameter", kind: quantityCell, Unit: quantity.Length, Step: meltbook.MeltSpin, Param: "orifice",
		Headings: []string{"orifice", "nozzle", "nozzle diameter", "nozzle dia", "orifice diameter", "nozzle orifice"}},
	{Key: "gap", Help: "nozzle-to-wheel gap", kind: quantityCell, Unit: quantity.Length, Step: meltbook.MeltSpin, Param: "gap",
		Headings: []string{"gap", "wheel gap", "nozzle gap", "nozzle wheel gap"}},
	{Key: "ejection-pressure", Help: "ejection over-pressure", kind: quantityCell, Unit: quantity.Pressure, Step: meltbook.MeltSpin, Param: "ejection-pressure",
		Headings: []string{"ejection pressure", "ejection", "overpressure", "over pressure", "ejection overpressure", "dp", "delta p", "injection pressure"}},
	{Key: "melt-temperature", Help: "melt temperature at ejection", kind: quantityCell, Unit: quantity.Temperature, Step: meltbook.MeltSpin, Param: "melt-temperature",
		Headings: []string{"melt temperature", "melt temp", "melt t", "t melt", "tmelt", "temperature", "temp", "casting temperature", "ejection temperature", "t"}},
	{Key: "chamber-gas", Help: "melt-spinning chamber gas", kind: textCell, Step: meltbook.MeltSpin, Param: "chamber-gas",
		Headings: []string{"chamber gas", "gas", "atmosphere", "spin gas"}},
	{Key: "chamber-pressure", Help: "melt-spinning chamber pressure", kind: quantityCell, Unit: quantity.Pressure, Step: meltbook.MeltSpin, Param: "chamber-pressure",
		Headings: []string{"chamber pressure", "chamber p", "p chamber"}},
	{Key: "thickness", Help: "ribbon thickness", kind: quantityCell, Unit: quantity.Length, Step: meltbook.MeltSpin, Param: "thickness",
		Headings: []string{"thickness", "ribbon thickness", "thick", "t"}},
	{Key: "width", Help: "ribbon width", kind: quantityCell, Unit: quantity.Length, Step: meltbook.MeltSpin, Param: "width",
		Headings: []string{"width", "ribbon width", "w"}},
	{Key: "anneal", Help: "heat treatment after spinning, e.g. 800 °C 4 h water quench, or none", kind: annealCell, Step: meltbook.Anneal,
		Headings: []string{"anneal", "annealing", "heat treatment", "ht", "treatment", "post anneal"}},
	{Key: "anneal-temperature", Help: "anneal temperature, when the sheet gives it in its own column", kind: quantityCell, Unit: quantity.Temperature, Step: meltbook.Anneal, Param: "temperature",
		Headings: []string{"anneal temperature", "anneal temp", "annealing temperature", "ht temperature", "ht temp", "anneal t"}},
	{Key: "anneal-time", Help: "anneal time, when the sheet gives it in its own column", kind: quantityCell, Unit: quantity.Time, Step: meltbook.Anneal, Param: "time",
		Headings: []string{"anneal time", "annealing time", "ht time", "anneal duration"}},
	{Key: "outcome", Help: "phases found, written loosely: i-phase, QC, decagonal, approximant 1/1, amorphous, λ + β, ...", kind: outcomeCell,
		Headings: []string{"outcome", "result", "results", "phase", "phases", "phases found", "xrd", "xrd result", "structure", "verdict"}},
	{Key: "notes", Help: "remarks on the melt", kind: textCell,
		Headings: []string{"notes", "note", "remarks", "remark", "comment", "comments"}},
}

// FieldByKey returns the field with the given key.
func FieldByKey(key string) (Field, bool) {
	key = strings.ToLower(strings.TrimSpace(key))
	for _, f := range Fields {
		if f.Key == key {
			return f, true
		}
	}
	return Field{}, false
}

// FieldKeys lists the field keys, comma-separated, for messages.
func FieldKeys() string {
	keys := make([]string, len(Fields))
	for i, f := range Fields {
		keys[i] = f.Key
	}
	return strings.Join(keys, ", ")
}

// headingIndex maps a normalised heading to the fields it may name, most
// likely first; a unit in the heading chooses among several ("T (°C)" is a
// temperature, "t (µm)" a thickness).
var headingIndex = func() map[string][]int {
	m := map[string][]int{}
	add := func(h string, i int) {
		for _, j := range m[h] {
			if j == i {
				return
			}
		}
		m[h] = append(m[h], i)
	}
	for i, f := range Fields {
		for _, h := range f.Headings {
			add(h, i)
		}
		add(f.Key, i)
		add(strings.ReplaceAll(f.Key, "-", " "), i)
	}
	return m
}()

// fieldForHeading returns the field a normalised heading names, using the
// unit written with it to choose among fields sharing the heading. A
// heading that several fields share and no unit settles names none; others
// lists the candidates then.
func fieldForHeading(words, unit string) (field int, ok bool, others []string) {
	cands := headingIndex[words]
	if len(cands) == 1 {
		return cands[0], true, nil
	}
	if unit != "" {
		for _, i := range cands {
			if Fields[i].Unit != 0 && unitFits(unit, Fields[i].Unit) {
				return i, true, nil
			}
		}
	}
	for _, i := range cands {
		others = append(others, Fields[i].Key)
	}
	return 0, false, others
}

// splitHeading separates a heading into its normalised words and the unit
// written with it: in brackets ("Thickness (µm)", "speed [m/s]") or, when
// the words alone name no field, as the last word ("thickness_um",
// "mass g"). unit is "" when none was written.
func splitHeading(h string) (words, unit string) {
	h = strings.TrimSpace(h)
	for _, br := range [][2]string{{"(", ")"}, {"[", "]"}} {
		if i := strings.LastIndex(h, br[0]); i >= 0 {
			if j := strings.LastIndex(h, br[1]); j > i && strings.TrimSpace(h[j+1:]) == "" {
				unit = strings.TrimSpace(h[i+1 : j])
				h = h[:i]
				break
			}
		}
	}
	words = normaliseWords(h)
	if unit != "" {
		return words, unit
	}
	if _, ok := headingIndex[words]; ok {
		return words, ""
	}
	if i := strings.LastIndexAny(strings.TrimSpace(h), " _"); i > 0 {
		last := strings.TrimSpace(h)[i+1:]
		rest := normaliseWords(strings.TrimSpace(h)[:i])
		for _, f := range headingIndex[rest] {
			if Fields[f].Unit != 0 && unitFits(last, Fields[f].Unit) {
				return rest, last
			}
		}
	}
	return words, ""
}

// normaliseWords lower-cases a heading and turns every run of spaces,
// underscores, hyphens, dots, slashes and colons into one space.
func normaliseWords(s string) string {
	var b strings.Builder
	space := false
	for _, r := range strings.ToLower(s) {
		switch {
		case unicode.IsSpace(r) || strings.ContainsRune("_-./:\u00a0", r):
			space = true
		default:
			if space && b.Len() > 0 {
				b.WriteByte(' ')
			}
			space = false
			b.WriteRune(r)
		}
	}
	return b.String()
}

// unitFits reports whether unit is a unit of dimension d (for wheel
// speeds, also of rotation rate).
func unitFits(unit string, d quantity.Dimension) bool {
	if _, err := quantity.Parse("1 "+unit, d); err == nil {
		return true
	}
	if d == quantity.Speed {
		_, err := quantity.Parse("1 "+unit, quantity.RotationRate)
		return err == nil
	}
	return false
}

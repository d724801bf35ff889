// Package runform reads a melt-spinning run as people type it, field by
// field, and turns it into what the store writes: a melt with its
// weigh-out, its arc-melting and melt-spinning steps in SI units, and the
// cooling-rate estimate when the ribbon thickness is given. The command
// line's flags, run files and prompts and the web page's form all speak its
// field names (Fields) and share its checks, so a value refused in one is
// refused in the others with the same message, naming where it was typed.
//
// Values carry their units (10g, 30um, 1250C, 25kPa, 30m/s, or 3000rpm with
// wheel-diameter); they are stored in SI with the unit typed, for showing
// back. Build reads no notebook: a code to be generated is left empty, with
// the prefix to generate it from.
package runform

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"

	"meltbook"
	"meltbook/analysis/composition"
	"meltbook/analysis/cooling"
	"meltbook/analysis/quantity"
	"meltbook/analysis/weighout"
	"meltbook/store"
)

// Defaults of the cooling estimate, written into its regime text as
// assumed.
const (
	DefaultMeltTemperature  = "1200°C"
	DefaultWheelTemperature = "20°C"
)

// A run is what `meltbook log` records: a melt with its arc-melting and
// melt-spinning steps. Flags, run files, prompts and the web form all speak
// the same field names, listed in Fields; a flag is --NAME, a file line
// NAME: VALUE, a form field NAME.

// Field is one field of a run.
type Field struct {
	Key     string
	Help    string
	Example string
	// Repeat fields may be given more than once (or as a comma-separated
	// list); their values add up.
	Repeat bool
	// Step and StepParam name the process step and parameter the field
	// records, when it records one.
	Step      meltbook.StepKind
	StepParam string
}

// Prefixes turning step parameter names into field names: arc-melting
// fields start with "arc-", melt-spinning fields are the parameter names.
var stepFieldPrefix = map[meltbook.StepKind]string{meltbook.ArcMelt: "arc-", meltbook.MeltSpin: ""}

// DefaultPrefix starts generated melt codes when no prefix is given.
const DefaultPrefix = "M"

// fields lists every field of a run in the order help and prompts use.
var fields = buildFields()

// Fields returns every field of a run in the order help, prompts and forms
// list them.
func Fields() []Field { return append([]Field(nil), fields...) }

func buildFields() []Field {
	fs := []Field{
		{Key: "code", Help: "melt code, unique in the notebook; without one the next free code with the prefix is used", Example: "QX-0042"},
		{Key: "prefix", Help: "prefix of a generated code", Example: DefaultPrefix},
		{Key: "composition", Help: "nominal composition as weighed out", Example: "Al63Cu25Fe12"},
		{Key: "mass", Help: "target button mass", Example: "10g"},
		{Key: "operator", Help: "who made the melt (default: --as, else $USER)", Example: "adaeze"},
		{Key: "made", Help: "when the melt was made, local time (default: now)", Example: "2024-05-02T09:30"},
		{Key: "weighed", Help: "mass actually weighed of an element, EL=MASS", Example: "Al=4.2941g", Repeat: true},
		{Key: "purity", Help: "purity of an element's pieces in percent, EL=PERCENT (default 100)", Example: "Al=99.99", Repeat: true},
		{Key: "loss", Help: "evaporation allowance planned for an element, EL=PERCENT", Example: "Mg=3%", Repeat: true},
		{Key: "no-default-loss", Help: "yes: plan no rule-of-thumb allowances for Mg, Zn, Mn, Li, Ca", Example: "yes"},
		{Key: "mass-after", Help: "button mass weighed after arc melting", Example: "9.98g"},
		{Key: "notes", Help: "remarks on the melt", Example: "button cracked on the third flip"},
	}
	for _, kind := range []meltbook.StepKind{meltbook.ArcMelt, meltbook.MeltSpin} {
		for _, spec := range meltbook.StepParams[kind] {
			if spec.Name == "cooling-rate" || spec.Name == "cooling-regime" {
				continue // computed, not typed
			}
			fs = append(fs, Field{Key: stepFieldPrefix[kind] + spec.Name, Help: spec.Help, Example: paramExample(spec), Step: kind, StepParam: spec.Name})
		}
		if kind == meltbook.ArcMelt {
			fs = append(fs, Field{Key: "arc-notes", Help: "remarks on the arc melting", Example: "Ti getter melted first", Step: kind})
			continue
		}
		fs = append(fs,
			Field{Key: "wheel-diameter", Help: "wheel diameter, needed when the wheel speed is given in rpm", Example: "200mm", Step: kind},
			Field{Key: "spin-notes", Help: "remarks on the melt spinning", Example: "ribbon brittle", Step: kind},
			Field{Key: "heat-transfer", Help: fmt.Sprintf("wheel heat-transfer coefficient h for the cooling estimate (default %.0e W/(m²·K))", cooling.DefaultHeatTransferWPerM2K), Example: "2e5W/m2K", Step: kind},
			Field{Key: "wheel-temperature", Help: "wheel temperature for the cooling estimate (default " + DefaultWheelTemperature + ")", Example: "20C", Step: kind},
			Field{Key: "density", Help: "alloy density for the cooling estimate (default: from the elements)", Example: "4.5g/cm3", Step: kind},
			Field{Key: "specific-heat", Help: "alloy specific heat for the cooling estimate (default: from the elements)", Example: "800J/kgK", Step: kind},
			Field{Key: "conductivity", Help: "alloy thermal conductivity for the cooling estimate (default: from the elements)", Example: "20W/mK", Step: kind},
		)
	}
	return fs
}

func paramExample(spec meltbook.ParamSpec) string {
	examples := map[string]string{
		"remelts": "4", "current": "150A", "atmosphere": "Ar after Ti getter", "chamber-pressure": "60kPa",
		"wheel-material": "Cu", "wheel-speed": "30m/s", "orifice": "0.8mm", "gap": "0.3mm",
		"ejection-pressure": "25kPa", "melt-temperature": "1250C", "chamber-gas": "He",
		"thickness": "30um", "width": "2mm",
	}
	return examples[spec.Name]
}

// HelpText is the field's help with an example, unless the help already
// carries one.
func (f Field) HelpText() string {
	if strings.Contains(f.Help, "e.g.") {
		return f.Help
	}
	return f.Help + ", e.g. " + f.Example
}

func FieldByKey(key string) (Field, bool) {
	for _, f := range fields {
		if f.Key == key {
			return f, true
		}
	}
	return Field{}, false
}

// CoolingInputKeys feed the cooling estimate without being stored as step
// parameters; the estimate's regime text records them.
var CoolingInputKeys = []string{"heat-transfer", "wheel-temperature", "density", "specific-heat", "conductivity"}

var coolingInputDimension = map[string]quantity.Dimension{
	"heat-transfer": quantity.HeatTransferCoefficient, "wheel-temperature": quantity.Temperature,
	"density": quantity.Density, "specific-heat": quantity.SpecificHeat, "conductivity": quantity.ThermalConductivity,
}

// coolingInputSymbol names each input in the regime text.
var coolingInputSymbol = map[string]string{
	"heat-transfer": "h", "wheel-temperature": "wheel", "density": "ρ", "specific-heat": "c_p", "conductivity": "k",
}

// givenMark follows an input of the estimate that the user gave.
const givenMark = " (given)"

// GivenCoolingInputs reads back the inputs a cooling-regime text says were
// given, so that a re-estimate keeps them.
func GivenCoolingInputs(regime string) []Value {
	var out []Value
	for _, part := range strings.Split(regime, "; ") {
		for _, item := range strings.Split(part, ", ") {
			if !strings.HasSuffix(item, givenMark) {
				continue
			}
			symbol, value, _ := strings.Cut(strings.TrimSuffix(item, givenMark), " ")
			for _, key := range CoolingInputKeys {
				if coolingInputSymbol[key] == symbol {
					out = append(out, Value{key, value, key})
				}
			}
		}
	}
	return out
}

// Value is one field value as typed, with where it was typed for error
// messages: "--thickness", "runs.txt line 12, field thickness".
type Value struct {
	Key, Value, Where string
}

// Input is one run's values, in the order typed.
type Input struct {
	Values []Value
	// Where names the run as a whole, for fields that are missing.
	Where string
	// Missing says where a missing field should have been given, e.g.
	// "--%s" or "runs.txt run at line 3, field %s".
	Missing func(key string) string
}

// Add appends a value.
func (in *Input) Add(key, value, where string) {
	in.Values = append(in.Values, Value{key, value, where})
}

// Has reports whether a value was given for key.
func (in *Input) Has(key string) bool {
	for _, v := range in.Values {
		if v.Key == key {
			return true
		}
	}
	return false
}

// Run is a run checked and turned into what the store writes.
type Run struct {
	New store.NewMelt
	// Prefix is set when the code is to be generated.
	Prefix string
	// Parsed is the nominal composition as read.
	Parsed composition.Parsed
	// Estimate is the cooling-rate estimate, nil without a thickness.
	Estimate *cooling.Estimate
	// Where maps field keys (and "run") to where they were typed.
	Where map[string]string
}

// Build checks a run and turns it into a melt with its steps. It reads
// no notebook; codes to generate are left empty with prefix set.
func Build(in Input, operator string, loc *time.Location) (*Run, error) {
	b := &Run{Where: map[string]string{"run": in.Where}}
	one := map[string]Value{}
	many := map[string][]Value{}
	for _, v := range in.Values {
		f, ok := FieldByKey(v.Key)
		if !ok {
			return nil, meltbook.Errorf(meltbook.Invalid, v.Where, "%q is not a field of a run; the fields are %s", v.Key, fieldKeys())
		}
		if _, dup := one[v.Key]; dup && !f.Repeat {
			return nil, meltbook.Errorf(meltbook.Invalid, v.Where, "%s given twice", v.Key)
		}
		v.Value = strings.TrimSpace(v.Value)
		one[v.Key] = v
		b.Where[v.Key] = v.Where
		if f.Repeat {
			for _, item := range strings.Split(v.Value, ",") {
				if item = strings.TrimSpace(item); item != "" {
					many[v.Key] = append(many[v.Key], Value{v.Key, item, v.Where})
				}
			}
		}
	}
	need := func(key string) (Value, error) {
		v, ok := one[key]
		if !ok || v.Value == "" {
			f, _ := FieldByKey(key)
			return v, meltbook.Errorf(meltbook.Invalid, in.Missing(key), "missing: give the %s, e.g. %s", f.Help, f.Example)
		}
		return v, nil
	}
	m := &b.New.Melt

	cv, err := need("composition")
	if err != nil {
		return nil, err
	}
	if b.Parsed, err = ParseComposition(cv); err != nil {
		return nil, err
	}
	m.CompositionEntered = cv.Value
	for _, p := range b.Parsed.Atomic {
		m.Nominal = append(m.Nominal, meltbook.ElementFraction{Element: p.Element, Fraction: p.Fraction})
	}

	mv, err := need("mass")
	if err != nil {
		return nil, err
	}
	mass, err := ParsePositive(mv, quantity.Mass)
	if err != nil {
		return nil, err
	}
	m.TargetMassGrams = Tidy(mass.SI * 1000)

	if v, ok := one["code"]; ok && v.Value != "" {
		m.Code = v.Value
		if _, ok := one["prefix"]; ok {
			return nil, meltbook.Errorf(meltbook.Invalid, one["prefix"].Where, "give a code or a prefix to generate one, not both")
		}
	} else {
		b.Prefix = DefaultPrefix
		if v, ok := one["prefix"]; ok && v.Value != "" {
			b.Prefix = v.Value
		}
	}
	m.Operator = operator
	if v, ok := one["operator"]; ok && v.Value != "" {
		m.Operator = v.Value
	}
	if v, ok := one["made"]; ok && v.Value != "" {
		if m.CreatedAt, err = ParseWhen(v, loc); err != nil {
			return nil, err
		}
	}
	if v, ok := one["mass-after"]; ok && v.Value != "" {
		after, err := ParsePositive(v, quantity.Mass)
		if err != nil {
			return nil, err
		}
		g := Tidy(after.SI * 1000)
		m.MassAfterMeltGrams = &g
	}
	if v, ok := one["notes"]; ok {
		m.Notes = v.Value
	}
	if m.WeighOut, err = b.weighOut(m.TargetMassGrams, one, many); err != nil {
		return nil, err
	}

	for _, kind := range []meltbook.StepKind{meltbook.ArcMelt, meltbook.MeltSpin} {
		step, err := b.step(kind, one)
		if err != nil {
			return nil, err
		}
		if step != nil {
			step.Operator = m.Operator
			step.At = m.CreatedAt
			b.New.Steps = append(b.New.Steps, *step)
		}
	}
	if err := b.validate(); err != nil {
		return nil, err
	}
	return b, nil
}

func fieldKeys() string {
	keys := make([]string, len(fields))
	for i, f := range fields {
		keys[i] = f.Key
	}
	return strings.Join(keys, ", ")
}

// ParseComposition reads a composition, keeping the parser's position in
// the message and naming where it was typed.
func ParseComposition(v Value) (composition.Parsed, error) {
	p, err := composition.ParseWith(v.Value, composition.Options{})
	if err != nil {
		var pe *composition.ParseError
		if errors.As(err, &pe) {
			return p, &meltbook.Error{Kind: meltbook.Invalid, Field: v.Where, Message: pe.Error()}
		}
		return p, meltbook.Errorf(meltbook.Invalid, v.Where, "%v", err)
	}
	return p, nil
}

// ParsePositive reads a quantity that must be above zero.
func ParsePositive(v Value, dim quantity.Dimension) (quantity.Value, error) {
	q, err := quantity.Parse(v.Value, dim)
	if err != nil {
		return q, meltbook.Errorf(meltbook.Invalid, v.Where, "%v", err)
	}
	if !(q.SI > 0) {
		return q, meltbook.Errorf(meltbook.Invalid, v.Where, "%q: must be more than zero", v.Value)
	}
	q.SI = Tidy(q.SI)
	return q, nil
}

// Tidy rounds a converted value to 12 significant digits, dropping the
// binary noise of unit scaling (30 µm is 3e-05 m, not 2.9999999999999997e-05);
// no bench measurement carries more digits.
func Tidy(x float64) float64 {
	y, err := strconv.ParseFloat(strconv.FormatFloat(x, 'g', 12, 64), 64)
	if err != nil {
		return x
	}
	return y
}

// timeLayouts are the accepted forms of a time typed at the bench, read in
// the local zone unless the text gives one.
var timeLayouts = []string{"2006-01-02T15:04:05", "2006-01-02T15:04", "2006-01-02 15:04", "2006-01-02"}

func ParseWhen(v Value, loc *time.Location) (time.Time, error) {
	if t, err := time.Parse(time.RFC3339, v.Value); err == nil {
		return t, nil
	}
	for _, l := range timeLayouts {
		if t, err := time.ParseInLocation(l, v.Value, loc); err == nil {
			return t, nil
		}
	}
	return time.Time{}, meltbook.Errorf(meltbook.Invalid, v.Where, "%q is not a time; write YYYY-MM-DD or YYYY-MM-DDTHH:MM", v.Value)
}

// elementAmounts reads EL=AMOUNT items.
func elementAmounts(items []Value, read func(Value, string) (float64, error)) (map[string]float64, error) {
	out := map[string]float64{}
	for _, it := range items {
		el, amount, ok := strings.Cut(it.Value, "=")
		el, amount = strings.TrimSpace(el), strings.TrimSpace(amount)
		if !ok || el == "" || amount == "" {
			f, _ := FieldByKey(it.Key)
			return nil, meltbook.Errorf(meltbook.Invalid, it.Where, "%q is not ELEMENT=VALUE, e.g. %s", it.Value, f.Example)
		}
		if _, dup := out[el]; dup {
			return nil, meltbook.Errorf(meltbook.Invalid, it.Where, "%s given twice", el)
		}
		x, err := read(it, amount)
		if err != nil {
			return nil, err
		}
		out[el] = x
	}
	return out, nil
}

func PercentAmount(it Value, amount string) (float64, error) {
	if !strings.HasSuffix(amount, "%") && !strings.HasSuffix(amount, "ppm") {
		amount += "%"
	}
	q, err := quantity.Parse(amount, quantity.Fraction)
	if err != nil {
		return 0, meltbook.Errorf(meltbook.Invalid, it.Where, "%v", err)
	}
	return q.SI, nil
}

// weighOut plans the weigh-out as `meltbook weigh` would, with the
// weighed masses beside the planned ones.
func (b *Run) weighOut(targetGrams float64, one map[string]Value, many map[string][]Value) ([]meltbook.WeighOutLine, error) {
	opt := weighout.Options{TotalMassGrams: targetGrams}
	var err error
	if opt.Purity, err = elementAmounts(many["purity"], PercentAmount); err != nil {
		return nil, err
	}
	if opt.Loss, err = elementAmounts(many["loss"], PercentAmount); err != nil {
		return nil, err
	}
	if v, ok := one["no-default-loss"]; ok {
		if opt.NoDefaultLoss, err = parseYes(v); err != nil {
			return nil, err
		}
	}
	weighed, err := elementAmounts(many["weighed"], func(it Value, amount string) (float64, error) {
		q, err := ParsePositive(Value{it.Key, amount, it.Where}, quantity.Mass)
		return Tidy(q.SI * 1000), err
	})
	if err != nil {
		return nil, err
	}
	for _, key := range []string{"purity", "loss", "weighed"} {
		for _, it := range many[key] {
			el, _, _ := strings.Cut(it.Value, "=")
			if el = strings.TrimSpace(el); b.Parsed.Atomic.Fraction(el) == 0 {
				return nil, meltbook.Errorf(meltbook.Invalid, it.Where, "%s is not in the composition %s", el, b.Parsed.Atomic.Format(2))
			}
		}
	}
	sheet, err := weighout.Plan(b.Parsed.Atomic, opt)
	if err != nil {
		return nil, meltbook.Errorf(meltbook.Invalid, b.Where["run"], "weigh-out: %v", err)
	}
	lines := make([]meltbook.WeighOutLine, len(sheet.Lines))
	for i, l := range sheet.Lines {
		lines[i] = meltbook.WeighOutLine{Element: l.Element, PlannedGrams: l.MassGrams, PurityPercent: 100 * l.Purity, LossPercent: 100 * l.Loss}
		if g, ok := weighed[l.Element]; ok {
			lines[i].WeighedGrams = &g
		}
	}
	return lines, nil
}

func parseYes(v Value) (bool, error) {
	switch strings.ToLower(v.Value) {
	case "yes", "y", "true", "1", "":
		return true, nil
	case "no", "n", "false", "0":
		return false, nil
	}
	return false, meltbook.Errorf(meltbook.Invalid, v.Where, "%q is not yes or no", v.Value)
}

// QuantityDimension maps a step parameter's dimension to the one quantity
// parses; false for dimensions quantity does not know.
func QuantityDimension(d meltbook.Dimension) (quantity.Dimension, bool) {
	switch d {
	case meltbook.Length:
		return quantity.Length, true
	case meltbook.Speed:
		return quantity.Speed, true
	case meltbook.Pressure:
		return quantity.Pressure, true
	case meltbook.Temperature:
		return quantity.Temperature, true
	case meltbook.Duration:
		return quantity.Time, true
	case meltbook.Mass:
		return quantity.Mass, true
	}
	return 0, false
}

// ParseParam reads one typed value of a step parameter into SI with the
// unit it was typed in. Wheel speeds in rpm go through ParseWheelSpeed.
func ParseParam(spec meltbook.ParamSpec, v Value) (meltbook.Param, error) {
	p := meltbook.Param{Name: spec.Name}
	s := strings.TrimSpace(v.Value)
	switch spec.Dimension {
	case meltbook.Text:
		if s == "" {
			return p, meltbook.Errorf(meltbook.Invalid, v.Where, "empty")
		}
		p.Text = s
		return p, nil
	case meltbook.Count:
		n, err := strconv.Atoi(s)
		if err != nil || n < 0 {
			return p, meltbook.Errorf(meltbook.Invalid, v.Where, "%q is not a whole number of zero or more", s)
		}
		p.SI = float64(n)
		return p, nil
	case meltbook.Current:
		return numberWithUnit(p, v, s, "A")
	case meltbook.CoolingRate:
		return numberWithUnit(p, v, s, "K/s")
	}
	dim, ok := QuantityDimension(spec.Dimension)
	if !ok {
		return p, meltbook.Errorf(meltbook.Internal, v.Where, "no reader for %s values", spec.Dimension)
	}
	q, err := ParsePositive(Value{v.Key, s, v.Where}, dim)
	if err != nil {
		return p, err
	}
	p.SI, p.Unit = q.SI, q.Unit
	return p, nil
}

// numberWithUnit reads a positive number followed by the one unit a
// dimension quantity does not know is written in.
func numberWithUnit(p meltbook.Param, v Value, s, unit string) (meltbook.Param, error) {
	num := strings.TrimSpace(strings.TrimSuffix(s, unit))
	x, err := strconv.ParseFloat(num, 64)
	if err != nil || num == s || math.IsNaN(x) || math.IsInf(x, 0) || x <= 0 {
		return p, meltbook.Errorf(meltbook.Invalid, v.Where, "%q is not a positive number in %s, e.g. 150 %s", s, unit, unit)
	}
	p.SI, p.Unit = x, unit
	return p, nil
}

// ParseWheelSpeed reads a surface speed, or a rotation rate with the
// wheel diameter; for a rate it also returns a remark to keep with the step.
func ParseWheelSpeed(v, diameter Value) (meltbook.Param, string, error) {
	p := meltbook.Param{Name: "wheel-speed"}
	if q, err := quantity.Parse(v.Value, quantity.Speed); err == nil {
		if !(q.SI > 0) {
			return p, "", meltbook.Errorf(meltbook.Invalid, v.Where, "%q: must be more than zero", v.Value)
		}
		p.SI, p.Unit = Tidy(q.SI), q.Unit
		return p, "", nil
	}
	rate, err := quantity.Parse(v.Value, quantity.RotationRate)
	if err != nil {
		return p, "", meltbook.Errorf(meltbook.Invalid, v.Where, "%q is neither a surface speed (m/s) nor a rotation rate (rpm): %v", v.Value, err)
	}
	if diameter.Value == "" {
		return p, "", meltbook.Errorf(meltbook.Invalid, v.Where, "a wheel speed in %s needs the wheel diameter (wheel-diameter) to give the surface speed", rate.Unit)
	}
	d, err := ParsePositive(diameter, quantity.Length)
	if err != nil {
		return p, "", err
	}
	speed, err := quantity.SurfaceSpeed(rate, d)
	if err != nil {
		return p, "", meltbook.Errorf(meltbook.Invalid, v.Where, "%v", err)
	}
	p.SI, p.Unit = Tidy(speed.SI), "m/s"
	return p, fmt.Sprintf("wheel speed given as %s on a %s wheel", rate, d), nil
}

// step builds the arc-melting or melt-spinning step from its fields; nil
// when none was given.
func (b *Run) step(kind meltbook.StepKind, one map[string]Value) (*meltbook.ProcessStep, error) {
	given := false
	for _, f := range fields {
		if _, ok := one[f.Key]; ok && f.Step == kind {
			given = true
		}
	}
	if !given {
		return nil, nil
	}
	st := &meltbook.ProcessStep{Kind: kind}
	var notes []string
	prefix := stepFieldPrefix[kind]
	for _, spec := range meltbook.StepParams[kind] {
		v, ok := one[prefix+spec.Name]
		if !ok {
			continue
		}
		var p meltbook.Param
		var err error
		if spec.Name == "wheel-speed" {
			var remark string
			p, remark, err = ParseWheelSpeed(v, one["wheel-diameter"])
			if remark != "" {
				notes = append(notes, remark)
			}
		} else {
			p, err = ParseParam(spec, v)
		}
		if err != nil {
			return nil, err
		}
		st.Params = append(st.Params, p)
	}
	if kind == meltbook.ArcMelt {
		if v, ok := one["arc-notes"]; ok && v.Value != "" {
			notes = append(notes, v.Value)
		}
		st.Notes = strings.Join(notes, "; ")
		return st, nil
	}
	if d, ok := one["wheel-diameter"]; ok {
		dv, err := ParsePositive(d, quantity.Length)
		if err != nil {
			return nil, err
		}
		if _, rpm := one["wheel-speed"]; !rpm || len(notes) == 0 {
			notes = append(notes, "wheel diameter "+dv.String())
		}
	}
	if v, ok := one["spin-notes"]; ok && v.Value != "" {
		notes = append(notes, v.Value)
	}
	st.Notes = strings.Join(notes, "; ")
	var extra []Value
	for _, key := range CoolingInputKeys {
		if v, ok := one[key]; ok {
			extra = append(extra, v)
		}
	}
	est, params, err := EstimateCooling(b.Parsed.Atomic, st, extra, b.Where["thickness"])
	if err != nil {
		return nil, err
	}
	if est != nil {
		b.Estimate = est
		st.Params = append(st.Params, params...)
	}
	return st, nil
}

// EstimateCooling estimates the cooling rate of a melt-spin step that
// records a ribbon thickness, returning the cooling-rate and
// cooling-regime parameters to store; nil without a thickness. extra holds
// the estimate's inputs that are not step parameters (CoolingInputKeys);
// where names the thickness as typed, for an estimate that cannot be made.
func EstimateCooling(c composition.Composition, st *meltbook.ProcessStep, extra []Value, where string) (*cooling.Estimate, []meltbook.Param, error) {
	thickness, ok := st.Param("thickness")
	if !ok {
		if len(extra) > 0 {
			v := extra[0]
			return nil, nil, meltbook.Errorf(meltbook.Invalid, v.Where, "%s only feeds the cooling estimate, which needs the ribbon thickness", v.Key)
		}
		return nil, nil, nil
	}
	in := cooling.Input{ThicknessMetres: thickness.SI}
	mat, err := cooling.MaterialFromComposition(c)
	if err != nil {
		return nil, nil, meltbook.Errorf(meltbook.Invalid, where, "cooling estimate: %v", err)
	}
	meltK, _ := quantity.Parse(DefaultMeltTemperature, quantity.Temperature)
	meltText := "melt " + meltK.String() + " (assumed)"
	if p, ok := st.Param("melt-temperature"); ok {
		meltK = quantity.Value{SI: p.SI, Dimension: quantity.Temperature, Unit: p.Unit}
		meltText = "melt " + meltK.String()
	}
	wheelK, _ := quantity.Parse(DefaultWheelTemperature, quantity.Temperature)
	given := map[string]quantity.Value{}
	for _, v := range extra {
		q, err := ParsePositive(v, coolingInputDimension[v.Key])
		if err != nil {
			return nil, nil, err
		}
		given[v.Key] = q
	}
	if q, ok := given["heat-transfer"]; ok {
		in.HeatTransferWPerM2K = q.SI
	}
	if q, ok := given["wheel-temperature"]; ok {
		wheelK = q
	}
	for key, dst := range map[string]*float64{"density": &mat.DensityKgPerM3, "specific-heat": &mat.SpecificHeatJPerKgK, "conductivity": &mat.ThermalConductivityWPerMK} {
		if q, ok := given[key]; ok {
			*dst = q.SI
		}
	}
	in.MeltTemperatureK, in.WheelTemperatureK, in.Material = meltK.SI, wheelK.SI, mat
	if p, ok := st.Param("wheel-speed"); ok {
		in.WheelSpeedMPerS = p.SI
	}
	est, err := cooling.Rate(in)
	if err != nil {
		return nil, nil, meltbook.Errorf(meltbook.Invalid, where, "cooling estimate: %v", err)
	}
	// Each input is written with where it came from; given ones read back
	// (GivenCoolingInputs) when an amendment re-estimates the rate.
	input := func(key, fallback string) string {
		if q, ok := given[key]; ok {
			return coolingInputSymbol[key] + " " + q.String() + givenMark
		}
		return coolingInputSymbol[key] + " " + fallback
	}
	regime := strings.Join([]string{
		fmt.Sprintf("%s, Biot number %.3g", est.Regime, est.Biot),
		input("heat-transfer", fmt.Sprintf("%.3g W/(m²·K) (default)", est.HeatTransferWPerM2K)),
		meltText + ", " + input("wheel-temperature", wheelK.String()+" (assumed)"),
		input("density", fmt.Sprintf("%.4g kg/m³ (from the elements)", mat.DensityKgPerM3)) + ", " +
			input("specific-heat", fmt.Sprintf("%.4g J/(kg·K) (from the elements)", mat.SpecificHeatJPerKgK)) + ", " +
			input("conductivity", fmt.Sprintf("%.4g W/(m·K) (from the elements)", mat.ThermalConductivityWPerMK)),
	}, "; ")
	return &est, []meltbook.Param{
		{Name: "cooling-rate", SI: est.RateKPerS, Unit: "K/s"},
		{Name: "cooling-regime", Text: regime},
	}, nil
}

// validate runs the domain checks, naming the field as the user typed it.
func (b *Run) validate() error {
	m := &b.New.Melt
	code := m.Code
	if code == "" {
		m.Code = b.Prefix + "-0001" // stands in for the generated code
	}
	err := m.Validate()
	m.Code = code
	if err != nil {
		return b.Retarget(err)
	}
	for i := range b.New.Steps {
		if err := b.New.Steps[i].Validate(); err != nil {
			return b.Retarget(err)
		}
	}
	return nil
}

// Retarget replaces a domain field name ("mass", "melt-spin.gap",
// "weigh-out.Al") in err with where the user typed it.
func (b *Run) Retarget(err error) error {
	var e *meltbook.Error
	if !errors.As(err, &e) {
		return err
	}
	key := e.Field
	if kind, stepParam, ok := strings.Cut(e.Field, "."); ok {
		if prefix, isStep := stepFieldPrefix[meltbook.StepKind(kind)]; isStep {
			key = prefix + stepParam
		} else if kind == "weigh-out" {
			key = "weighed"
		}
	}
	if where, ok := b.Where[key]; ok {
		return &meltbook.Error{Kind: e.Kind, Field: where, Message: e.Message}
	}
	if where, ok := b.Where["run"]; ok && where != "" {
		return &meltbook.Error{Kind: e.Kind, Field: strings.TrimSpace(where + " " + e.Field), Message: e.Message}
	}
	return err
}

// RetargetPrefix names the prefix as typed in err, an error about
// generating a code from it (the store's NextMeltCode refusing it).
func (b *Run) RetargetPrefix(err error) error {
	var e *meltbook.Error
	if errors.As(err, &e) {
		where := b.Where["prefix"]
		if where == "" {
			where = b.Where["run"]
		}
		return &meltbook.Error{Kind: e.Kind, Field: strings.TrimSpace(where + " prefix"), Message: e.Message}
	}
	return err
}

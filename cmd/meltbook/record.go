package main

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

// A run is what `meltbook log` records: a melt with its arc-melting and
// melt-spinning steps. Flags, run files and prompts all speak the same
// field names, listed in runFields; a flag is --NAME, a file line NAME: VALUE.

// runField is one field of a run.
type runField struct {
	key     string
	help    string
	example string
	// repeat fields may be given more than once (or as a comma-separated
	// list); their values add up.
	repeat bool
	// step and param name the process parameter the field records, when
	// it records one.
	step      meltbook.StepKind
	stepParam string
}

// Prefixes turning step parameter names into field names: arc-melting
// fields start with "arc-", melt-spinning fields are the parameter names.
var stepFieldPrefix = map[meltbook.StepKind]string{meltbook.ArcMelt: "arc-", meltbook.MeltSpin: ""}

// defaultCodePrefix starts generated melt codes when no prefix is given.
const defaultCodePrefix = "M"

// runFields lists every field of a run in the order help and prompts use.
var runFields = buildRunFields()

func buildRunFields() []runField {
	fs := []runField{
		{key: "code", help: "melt code, unique in the notebook; without one the next free code with the prefix is used", example: "QX-0042"},
		{key: "prefix", help: "prefix of a generated code", example: defaultCodePrefix},
		{key: "composition", help: "nominal composition as weighed out", example: "Al63Cu25Fe12"},
		{key: "mass", help: "target button mass", example: "10g"},
		{key: "operator", help: "who made the melt (default: --as, else $USER)", example: "adaeze"},
		{key: "made", help: "when the melt was made, local time (default: now)", example: "2024-05-02T09:30"},
		{key: "weighed", help: "mass actually weighed of an element, EL=MASS", example: "Al=4.2941g", repeat: true},
		{key: "purity", help: "purity of an element's pieces in percent, EL=PERCENT (default 100)", example: "Al=99.99", repeat: true},
		{key: "loss", help: "evaporation allowance planned for an element, EL=PERCENT", example: "Mg=3%", repeat: true},
		{key: "no-default-loss", help: "yes: plan no rule-of-thumb allowances for Mg, Zn, Mn, Li, Ca", example: "yes"},
		{key: "mass-after", help: "button mass weighed after arc melting", example: "9.98g"},
		{key: "notes", help: "remarks on the melt", example: "button cracked on the third flip"},
	}
	for _, kind := range []meltbook.StepKind{meltbook.ArcMelt, meltbook.MeltSpin} {
		for _, spec := range meltbook.StepParams[kind] {
			if spec.Name == "cooling-rate" || spec.Name == "cooling-regime" {
				continue // computed, not typed
			}
			fs = append(fs, runField{key: stepFieldPrefix[kind] + spec.Name, help: spec.Help, example: paramExample(spec), step: kind, stepParam: spec.Name})
		}
		if kind == meltbook.ArcMelt {
			fs = append(fs, runField{key: "arc-notes", help: "remarks on the arc melting", example: "Ti getter melted first", step: kind})
			continue
		}
		fs = append(fs,
			runField{key: "wheel-diameter", help: "wheel diameter, needed when the wheel speed is given in rpm", example: "200mm", step: kind},
			runField{key: "spin-notes", help: "remarks on the melt spinning", example: "ribbon brittle", step: kind},
			runField{key: "heat-transfer", help: fmt.Sprintf("wheel heat-transfer coefficient h for the cooling estimate (default %.0e W/(m²·K))", cooling.DefaultHeatTransferWPerM2K), example: "2e5W/m2K", step: kind},
			runField{key: "wheel-temperature", help: "wheel temperature for the cooling estimate (default " + defaultWheelTemperature + ")", example: "20C", step: kind},
			runField{key: "density", help: "alloy density for the cooling estimate (default: from the elements)", example: "4.5g/cm3", step: kind},
			runField{key: "specific-heat", help: "alloy specific heat for the cooling estimate (default: from the elements)", example: "800J/kgK", step: kind},
			runField{key: "conductivity", help: "alloy thermal conductivity for the cooling estimate (default: from the elements)", example: "20W/mK", step: kind},
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

// helpText is the field's help with an example, unless the help already
// carries one.
func (f runField) helpText() string {
	if strings.Contains(f.help, "e.g.") {
		return f.help
	}
	return f.help + ", e.g. " + f.example
}

func runFieldByKey(key string) (runField, bool) {
	for _, f := range runFields {
		if f.key == key {
			return f, true
		}
	}
	return runField{}, false
}

// coolingInputKeys feed the cooling estimate without being stored as step
// parameters; the estimate's regime text records them.
var coolingInputKeys = []string{"heat-transfer", "wheel-temperature", "density", "specific-heat", "conductivity"}

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

// givenCoolingInputs reads back the inputs a cooling-regime text says were
// given, so that a re-estimate keeps them.
func givenCoolingInputs(regime string) []runValue {
	var out []runValue
	for _, part := range strings.Split(regime, "; ") {
		for _, item := range strings.Split(part, ", ") {
			if !strings.HasSuffix(item, givenMark) {
				continue
			}
			symbol, value, _ := strings.Cut(strings.TrimSuffix(item, givenMark), " ")
			for _, key := range coolingInputKeys {
				if coolingInputSymbol[key] == symbol {
					out = append(out, runValue{key, value, key})
				}
			}
		}
	}
	return out
}

// runValue is one field value as typed, with where it was typed for error
// messages: "--thickness", "runs.txt line 12, field thickness".
type runValue struct {
	key, value, where string
}

// runInput is one run's values, in the order typed.
type runInput struct {
	values []runValue
	// where names the run as a whole, for fields that are missing.
	where string
	// missing says where a missing field should have been given, e.g.
	// "--%s" or "runs.txt run at line 3, field %s".
	missing func(key string) string
}

func (in *runInput) add(key, value, where string) {
	in.values = append(in.values, runValue{key, value, where})
}

func (in *runInput) has(key string) bool {
	for _, v := range in.values {
		if v.key == key {
			return true
		}
	}
	return false
}

// builtRun is a run checked and turned into what the store writes.
type builtRun struct {
	new store.NewMelt
	// prefix is set when the code is to be generated.
	prefix   string
	parsed   composition.Parsed
	estimate *cooling.Estimate
	// where maps field keys (and "run") to where they were typed.
	where map[string]string
}

// buildRun checks a run and turns it into a melt with its steps. It reads
// no notebook; codes to generate are left empty with prefix set.
func buildRun(in runInput, operator string, loc *time.Location) (*builtRun, error) {
	b := &builtRun{where: map[string]string{"run": in.where}}
	one := map[string]runValue{}
	many := map[string][]runValue{}
	for _, v := range in.values {
		f, ok := runFieldByKey(v.key)
		if !ok {
			return nil, meltbook.Errorf(meltbook.Invalid, v.where, "%q is not a field of a run; the fields are %s", v.key, runFieldKeys())
		}
		if _, dup := one[v.key]; dup && !f.repeat {
			return nil, meltbook.Errorf(meltbook.Invalid, v.where, "%s given twice", v.key)
		}
		v.value = strings.TrimSpace(v.value)
		one[v.key] = v
		b.where[v.key] = v.where
		if f.repeat {
			for _, item := range strings.Split(v.value, ",") {
				if item = strings.TrimSpace(item); item != "" {
					many[v.key] = append(many[v.key], runValue{v.key, item, v.where})
				}
			}
		}
	}
	need := func(key string) (runValue, error) {
		v, ok := one[key]
		if !ok || v.value == "" {
			f, _ := runFieldByKey(key)
			return v, meltbook.Errorf(meltbook.Invalid, in.missing(key), "missing: give the %s, e.g. %s", f.help, f.example)
		}
		return v, nil
	}
	m := &b.new.Melt

	cv, err := need("composition")
	if err != nil {
		return nil, err
	}
	if b.parsed, err = parseCompositionAt(cv); err != nil {
		return nil, err
	}
	m.CompositionEntered = cv.value
	for _, p := range b.parsed.Atomic {
		m.Nominal = append(m.Nominal, meltbook.ElementFraction{Element: p.Element, Fraction: p.Fraction})
	}

	mv, err := need("mass")
	if err != nil {
		return nil, err
	}
	mass, err := parsePositive(mv, quantity.Mass)
	if err != nil {
		return nil, err
	}
	m.TargetMassGrams = tidy(mass.SI * 1000)

	if v, ok := one["code"]; ok && v.value != "" {
		m.Code = v.value
		if _, ok := one["prefix"]; ok {
			return nil, meltbook.Errorf(meltbook.Invalid, one["prefix"].where, "give a code or a prefix to generate one, not both")
		}
	} else {
		b.prefix = defaultCodePrefix
		if v, ok := one["prefix"]; ok && v.value != "" {
			b.prefix = v.value
		}
	}
	m.Operator = operator
	if v, ok := one["operator"]; ok && v.value != "" {
		m.Operator = v.value
	}
	if v, ok := one["made"]; ok && v.value != "" {
		if m.CreatedAt, err = parseWhen(v, loc); err != nil {
			return nil, err
		}
	}
	if v, ok := one["mass-after"]; ok && v.value != "" {
		after, err := parsePositive(v, quantity.Mass)
		if err != nil {
			return nil, err
		}
		g := tidy(after.SI * 1000)
		m.MassAfterMeltGrams = &g
	}
	if v, ok := one["notes"]; ok {
		m.Notes = v.value
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
			b.new.Steps = append(b.new.Steps, *step)
		}
	}
	if err := b.validate(); err != nil {
		return nil, err
	}
	return b, nil
}

func runFieldKeys() string {
	keys := make([]string, len(runFields))
	for i, f := range runFields {
		keys[i] = f.key
	}
	return strings.Join(keys, ", ")
}

// parseCompositionAt reads a composition, keeping the parser's position in
// the message and naming where it was typed.
func parseCompositionAt(v runValue) (composition.Parsed, error) {
	p, err := parseComposition(v.where, v.value, false)
	var e *meltbook.Error
	if errors.As(err, &e) && e.Field == "" {
		e.Field = v.where
	}
	return p, err
}

// parsePositive reads a quantity that must be above zero.
func parsePositive(v runValue, dim quantity.Dimension) (quantity.Value, error) {
	q, err := quantity.Parse(v.value, dim)
	if err != nil {
		return q, meltbook.Errorf(meltbook.Invalid, v.where, "%v", err)
	}
	if !(q.SI > 0) {
		return q, meltbook.Errorf(meltbook.Invalid, v.where, "%q: must be more than zero", v.value)
	}
	q.SI = tidy(q.SI)
	return q, nil
}

// tidy rounds a converted value to 12 significant digits, dropping the
// binary noise of unit scaling (30 µm is 3e-05 m, not 2.9999999999999997e-05);
// no bench measurement carries more digits.
func tidy(x float64) float64 {
	y, err := strconv.ParseFloat(strconv.FormatFloat(x, 'g', 12, 64), 64)
	if err != nil {
		return x
	}
	return y
}

// timeLayouts are the accepted forms of a time typed at the bench, read in
// the local zone unless the text gives one.
var timeLayouts = []string{"2006-01-02T15:04:05", "2006-01-02T15:04", "2006-01-02 15:04", "2006-01-02"}

func parseWhen(v runValue, loc *time.Location) (time.Time, error) {
	if t, err := time.Parse(time.RFC3339, v.value); err == nil {
		return t, nil
	}
	for _, l := range timeLayouts {
		if t, err := time.ParseInLocation(l, v.value, loc); err == nil {
			return t, nil
		}
	}
	return time.Time{}, meltbook.Errorf(meltbook.Invalid, v.where, "%q is not a time; write YYYY-MM-DD or YYYY-MM-DDTHH:MM", v.value)
}

// elementAmounts reads EL=AMOUNT items.
func elementAmounts(items []runValue, read func(runValue, string) (float64, error)) (map[string]float64, error) {
	out := map[string]float64{}
	for _, it := range items {
		el, amount, ok := strings.Cut(it.value, "=")
		el, amount = strings.TrimSpace(el), strings.TrimSpace(amount)
		if !ok || el == "" || amount == "" {
			f, _ := runFieldByKey(it.key)
			return nil, meltbook.Errorf(meltbook.Invalid, it.where, "%q is not ELEMENT=VALUE, e.g. %s", it.value, f.example)
		}
		if _, dup := out[el]; dup {
			return nil, meltbook.Errorf(meltbook.Invalid, it.where, "%s given twice", el)
		}
		x, err := read(it, amount)
		if err != nil {
			return nil, err
		}
		out[el] = x
	}
	return out, nil
}

func percentAmount(it runValue, amount string) (float64, error) {
	if !strings.HasSuffix(amount, "%") && !strings.HasSuffix(amount, "ppm") {
		amount += "%"
	}
	q, err := quantity.Parse(amount, quantity.Fraction)
	if err != nil {
		return 0, meltbook.Errorf(meltbook.Invalid, it.where, "%v", err)
	}
	return q.SI, nil
}

// weighOut plans the weigh-out as `meltbook weigh` would, with the
// weighed masses beside the planned ones.
func (b *builtRun) weighOut(targetGrams float64, one map[string]runValue, many map[string][]runValue) ([]meltbook.WeighOutLine, error) {
	opt := weighout.Options{TotalMassGrams: targetGrams}
	var err error
	if opt.Purity, err = elementAmounts(many["purity"], percentAmount); err != nil {
		return nil, err
	}
	if opt.Loss, err = elementAmounts(many["loss"], percentAmount); err != nil {
		return nil, err
	}
	if v, ok := one["no-default-loss"]; ok {
		if opt.NoDefaultLoss, err = parseYes(v); err != nil {
			return nil, err
		}
	}
	weighed, err := elementAmounts(many["weighed"], func(it runValue, amount string) (float64, error) {
		q, err := parsePositive(runValue{it.key, amount, it.where}, quantity.Mass)
		return tidy(q.SI * 1000), err
	})
	if err != nil {
		return nil, err
	}
	for _, key := range []string{"purity", "loss", "weighed"} {
		for _, it := range many[key] {
			el, _, _ := strings.Cut(it.value, "=")
			if el = strings.TrimSpace(el); b.parsed.Atomic.Fraction(el) == 0 {
				return nil, meltbook.Errorf(meltbook.Invalid, it.where, "%s is not in the composition %s", el, b.parsed.Atomic.Format(2))
			}
		}
	}
	sheet, err := weighout.Plan(b.parsed.Atomic, opt)
	if err != nil {
		return nil, meltbook.Errorf(meltbook.Invalid, b.where["run"], "weigh-out: %v", err)
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

func parseYes(v runValue) (bool, error) {
	switch strings.ToLower(v.value) {
	case "yes", "y", "true", "1", "":
		return true, nil
	case "no", "n", "false", "0":
		return false, nil
	}
	return false, meltbook.Errorf(meltbook.Invalid, v.where, "%q is not yes or no", v.value)
}

// quantityDimension maps a step parameter's dimension to the one quantity
// parses; false for dimensions quantity does not know.
func quantityDimension(d meltbook.Dimension) (quantity.Dimension, bool) {
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

// parseParam reads one typed value of a step parameter into SI with the
// unit it was typed in. Wheel speeds in rpm go through parseWheelSpeed.
func parseParam(spec meltbook.ParamSpec, v runValue) (meltbook.Param, error) {
	p := meltbook.Param{Name: spec.Name}
	s := strings.TrimSpace(v.value)
	switch spec.Dimension {
	case meltbook.Text:
		if s == "" {
			return p, meltbook.Errorf(meltbook.Invalid, v.where, "empty")
		}
		p.Text = s
		return p, nil
	case meltbook.Count:
		n, err := strconv.Atoi(s)
		if err != nil || n < 0 {
			return p, meltbook.Errorf(meltbook.Invalid, v.where, "%q is not a whole number of zero or more", s)
		}
		p.SI = float64(n)
		return p, nil
	case meltbook.Current:
		return numberWithUnit(p, v, s, "A")
	case meltbook.CoolingRate:
		return numberWithUnit(p, v, s, "K/s")
	}
	dim, ok := quantityDimension(spec.Dimension)
	if !ok {
		return p, meltbook.Errorf(meltbook.Internal, v.where, "no reader for %s values", spec.Dimension)
	}
	q, err := parsePositive(runValue{v.key, s, v.where}, dim)
	if err != nil {
		return p, err
	}
	p.SI, p.Unit = q.SI, q.Unit
	return p, nil
}

// numberWithUnit reads a positive number followed by the one unit a
// dimension quantity does not know is written in.
func numberWithUnit(p meltbook.Param, v runValue, s, unit string) (meltbook.Param, error) {
	num := strings.TrimSpace(strings.TrimSuffix(s, unit))
	x, err := strconv.ParseFloat(num, 64)
	if err != nil || num == s || math.IsNaN(x) || math.IsInf(x, 0) || x <= 0 {
		return p, meltbook.Errorf(meltbook.Invalid, v.where, "%q is not a positive number in %s, e.g. 150 %s", s, unit, unit)
	}
	p.SI, p.Unit = x, unit
	return p, nil
}

// parseWheelSpeed reads a surface speed, or a rotation rate with the
// wheel diameter; for a rate it also returns a remark to keep with the step.
func parseWheelSpeed(v, diameter runValue) (meltbook.Param, string, error) {
	p := meltbook.Param{Name: "wheel-speed"}
	if q, err := quantity.Parse(v.value, quantity.Speed); err == nil {
		if !(q.SI > 0) {
			return p, "", meltbook.Errorf(meltbook.Invalid, v.where, "%q: must be more than zero", v.value)
		}
		p.SI, p.Unit = tidy(q.SI), q.Unit
		return p, "", nil
	}
	rate, err := quantity.Parse(v.value, quantity.RotationRate)
	if err != nil {
		return p, "", meltbook.Errorf(meltbook.Invalid, v.where, "%q is neither a surface speed (m/s) nor a rotation rate (rpm): %v", v.value, err)
	}
	if diameter.value == "" {
		return p, "", meltbook.Errorf(meltbook.Invalid, v.where, "a wheel speed in %s needs the wheel diameter (wheel-diameter) to give the surface speed", rate.Unit)
	}
	d, err := parsePositive(diameter, quantity.Length)
	if err != nil {
		return p, "", err
	}
	speed, err := quantity.SurfaceSpeed(rate, d)
	if err != nil {
		return p, "", meltbook.Errorf(meltbook.Invalid, v.where, "%v", err)
	}
	p.SI, p.Unit = tidy(speed.SI), "m/s"
	return p, fmt.Sprintf("wheel speed given as %s on a %s wheel", rate, d), nil
}

// step builds the arc-melting or melt-spinning step from its fields; nil
// when none was given.
func (b *builtRun) step(kind meltbook.StepKind, one map[string]runValue) (*meltbook.ProcessStep, error) {
	given := false
	for _, f := range runFields {
		if _, ok := one[f.key]; ok && f.step == kind {
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
			p, remark, err = parseWheelSpeed(v, one["wheel-diameter"])
			if remark != "" {
				notes = append(notes, remark)
			}
		} else {
			p, err = parseParam(spec, v)
		}
		if err != nil {
			return nil, err
		}
		st.Params = append(st.Params, p)
	}
	if kind == meltbook.ArcMelt {
		if v, ok := one["arc-notes"]; ok && v.value != "" {
			notes = append(notes, v.value)
		}
		st.Notes = strings.Join(notes, "; ")
		return st, nil
	}
	if d, ok := one["wheel-diameter"]; ok {
		dv, err := parsePositive(d, quantity.Length)
		if err != nil {
			return nil, err
		}
		if _, rpm := one["wheel-speed"]; !rpm || len(notes) == 0 {
			notes = append(notes, "wheel diameter "+dv.String())
		}
	}
	if v, ok := one["spin-notes"]; ok && v.value != "" {
		notes = append(notes, v.value)
	}
	st.Notes = strings.Join(notes, "; ")
	var extra []runValue
	for _, key := range coolingInputKeys {
		if v, ok := one[key]; ok {
			extra = append(extra, v)
		}
	}
	est, params, err := estimateCooling(b.parsed.Atomic, st, extra, b.where["thickness"])
	if err != nil {
		return nil, err
	}
	if est != nil {
		b.estimate = est
		st.Params = append(st.Params, params...)
	}
	return st, nil
}

// estimateCooling estimates the cooling rate of a melt-spin step that
// records a ribbon thickness, returning the cooling-rate and
// cooling-regime parameters to store; nil without a thickness. extra holds
// the estimate's inputs that are not step parameters (coolingInputKeys);
// where names the thickness as typed, for an estimate that cannot be made.
func estimateCooling(c composition.Composition, st *meltbook.ProcessStep, extra []runValue, where string) (*cooling.Estimate, []meltbook.Param, error) {
	thickness, ok := st.Param("thickness")
	if !ok {
		if len(extra) > 0 {
			v := extra[0]
			return nil, nil, meltbook.Errorf(meltbook.Invalid, v.where, "%s only feeds the cooling estimate, which needs the ribbon thickness", v.key)
		}
		return nil, nil, nil
	}
	in := cooling.Input{ThicknessMetres: thickness.SI}
	mat, err := cooling.MaterialFromComposition(c)
	if err != nil {
		return nil, nil, meltbook.Errorf(meltbook.Invalid, where, "cooling estimate: %v", err)
	}
	meltK, _ := quantity.Parse(defaultMeltTemperature, quantity.Temperature)
	meltText := "melt " + meltK.String() + " (assumed)"
	if p, ok := st.Param("melt-temperature"); ok {
		meltK = quantity.Value{SI: p.SI, Dimension: quantity.Temperature, Unit: p.Unit}
		meltText = "melt " + meltK.String()
	}
	wheelK, _ := quantity.Parse(defaultWheelTemperature, quantity.Temperature)
	given := map[string]quantity.Value{}
	for _, v := range extra {
		q, err := parsePositive(v, coolingInputDimension[v.key])
		if err != nil {
			return nil, nil, err
		}
		given[v.key] = q
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
	// (givenCoolingInputs) when an amendment re-estimates the rate.
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
func (b *builtRun) validate() error {
	m := &b.new.Melt
	code := m.Code
	if code == "" {
		m.Code = b.prefix + "-0001" // stands in for the generated code
	}
	err := m.Validate()
	m.Code = code
	if err != nil {
		return b.retarget(err)
	}
	for i := range b.new.Steps {
		if err := b.new.Steps[i].Validate(); err != nil {
			return b.retarget(err)
		}
	}
	return nil
}

// retarget replaces a domain field name ("mass", "melt-spin.gap",
// "weigh-out.Al") in err with where the user typed it.
func (b *builtRun) retarget(err error) error {
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
	if where, ok := b.where[key]; ok {
		return &meltbook.Error{Kind: e.Kind, Field: where, Message: e.Message}
	}
	if where, ok := b.where["run"]; ok && where != "" {
		return &meltbook.Error{Kind: e.Kind, Field: strings.TrimSpace(where + " " + e.Field), Message: e.Message}
	}
	return err
}

// formatParam shows a stored parameter in the unit it was typed in.
func formatParam(kind meltbook.StepKind, p meltbook.Param) string {
	spec, ok := meltbook.ParamSpecFor(kind, p.Name)
	if !ok || spec.Dimension == meltbook.Text || p.Text != "" {
		return p.Text
	}
	switch spec.Dimension {
	case meltbook.Count:
		return strconv.FormatFloat(p.SI, 'g', -1, 64)
	case meltbook.Current:
		return strconv.FormatFloat(p.SI, 'g', 6, 64) + " A"
	case meltbook.CoolingRate:
		return strconv.FormatFloat(p.SI, 'g', 3, 64) + " K/s"
	}
	return formatSI(spec, p.SI, p.Unit)
}

// formatSI shows an SI value of a parameter in unit, else in the
// parameter's display unit, else in SI.
func formatSI(spec meltbook.ParamSpec, si float64, unit string) string {
	dim, ok := quantityDimension(spec.Dimension)
	if ok {
		for _, u := range []string{unit, spec.DisplayUnit} {
			if u == "" {
				continue
			}
			if s, err := quantity.Format(quantity.Value{SI: si, Dimension: dim}, u); err == nil {
				return s
			}
		}
	}
	return strconv.FormatFloat(si, 'g', 6, 64) + " " + spec.Dimension.SIUnit()
}

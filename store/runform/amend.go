package runform

import (
	"fmt"
	"strings"
	"time"

	"meltbook"
	"meltbook/analysis/composition"
	"meltbook/analysis/quantity"
)

// Change is one field of an amendment as typed, FIELD=VALUE.
type Change struct {
	Name, Value string
}

// The fields MeltUpdate and StepUpdate take, for help and messages.
const (
	MeltFields = "operator, made, composition, mass, mass-after, notes, weighed (EL=MASS), purity (EL=PERCENT), label"
	StepFields = "the step's parameters by name (e.g. thickness, remelts, temperature; empty to remove), notes, operator, at"
)

// invalidField is a bad-input error about one field.
func invalidField(name, msg string) error {
	return meltbook.Errorf(meltbook.Invalid, name, "%s", msg)
}

// MeltUpdate turns changes to a melt's own values into the store's
// update: operator, made, composition, mass, mass-after, notes, and the
// weighed mass or purity of one element of the weigh-out (EL=VALUE). Times
// without a zone are read in loc. The label belongs to the melt's sample:
// the caller amends it apart.
func MeltUpdate(m *meltbook.Melt, fields []Change, loc *time.Location) (meltbook.MeltUpdate, error) {
	var u meltbook.MeltUpdate
	weighOut := append([]meltbook.WeighOutLine(nil), m.WeighOut...)
	weighOutChanged := false
	line := func(f Change) (*meltbook.WeighOutLine, string, error) {
		el, amount, ok := strings.Cut(f.Value, "=")
		el = strings.TrimSpace(el)
		if !ok {
			return nil, "", invalidField(f.Name, fmt.Sprintf("%q is not EL=VALUE", f.Value))
		}
		for i := range weighOut {
			if weighOut[i].Element == el {
				return &weighOut[i], strings.TrimSpace(amount), nil
			}
		}
		return nil, "", invalidField(f.Name, el+" is not in the melt's weigh-out")
	}
	for _, f := range fields {
		v := Value{Key: f.Name, Value: f.Value, Where: f.Name}
		switch f.Name {
		case "operator":
			if f.Value == "" {
				return u, invalidField(f.Name, "a melt needs an operator")
			}
			op := f.Value
			u.Operator = &op
		case "made":
			t, err := ParseWhen(v, loc)
			if err != nil {
				return u, err
			}
			u.CreatedAt = &t
		case "composition":
			p, err := ParseComposition(v)
			if err != nil {
				return u, err
			}
			entered := f.Value
			u.CompositionEntered = &entered
			u.Nominal = Fractions(p.Atomic)
		case "mass", "mass-after":
			q, err := ParsePositive(v, quantity.Mass)
			if err != nil {
				return u, err
			}
			g := Tidy(q.SI * 1000)
			if f.Name == "mass" {
				u.TargetMassGrams = &g
			} else {
				u.MassAfterMeltGrams = &g
			}
		case "notes":
			notes := f.Value
			u.Notes = &notes
		case "weighed":
			l, amount, err := line(f)
			if err != nil {
				return u, err
			}
			q, err := ParsePositive(Value{Key: f.Name, Value: amount, Where: f.Name}, quantity.Mass)
			if err != nil {
				return u, err
			}
			g := Tidy(q.SI * 1000)
			l.WeighedGrams, weighOutChanged = &g, true
		case "purity":
			l, amount, err := line(f)
			if err != nil {
				return u, err
			}
			x, err := PercentAmount(v, amount)
			if err != nil {
				return u, err
			}
			l.PurityPercent, weighOutChanged = 100*x, true
		default:
			return u, invalidField(f.Name, "not a field of a melt; the fields are "+MeltFields)
		}
	}
	if weighOutChanged {
		u.WeighOut = weighOut
	}
	return u, nil
}

// Fractions turns a parsed composition into the notebook's fractions.
func Fractions(c composition.Composition) []meltbook.ElementFraction {
	out := make([]meltbook.ElementFraction, len(c))
	for i, p := range c {
		out[i] = meltbook.ElementFraction{Element: p.Element, Fraction: p.Fraction}
	}
	return out
}

// StepUpdate turns changes to a recorded step of the melt rec into the
// store's update: the step's parameters by name (an empty value removes
// one), notes, operator and at. A melt-spin step's wheel speed may be given
// in rpm with wheel-diameter; changing its thickness, melt temperature or
// wheel speed re-estimates the cooling rate, keeping the estimate's inputs
// given when it was logged unless the changes give them anew.
func StepUpdate(rec *meltbook.MeltRecord, step *meltbook.ProcessStep, fields []Change, loc *time.Location) (meltbook.StepUpdate, error) {
	var err error
	u := meltbook.StepUpdate{}
	var diameter Value
	speedGiven := false
	for _, f := range fields {
		speedGiven = speedGiven || f.Name == "wheel-speed"
		if f.Name == "wheel-diameter" {
			diameter = Value{Key: f.Name, Value: f.Value, Where: f.Name}
		}
	}
	if diameter.Value != "" && !speedGiven {
		return u, invalidField("wheel-diameter", "only turns a wheel-speed given in rpm into a surface speed; give wheel-speed too")
	}
	var extra []Value
	recompute := false
	for _, f := range fields {
		v := Value{Key: f.Name, Value: f.Value, Where: f.Name}
		switch f.Name {
		case "notes":
			notes := f.Value
			u.Notes = &notes
			continue
		case "operator":
			op := f.Value
			u.Operator = &op
			continue
		case "at":
			t, err := ParseWhen(v, loc)
			if err != nil {
				return u, err
			}
			u.At = &t
			continue
		case "wheel-diameter":
			continue
		}
		if step.Kind == meltbook.MeltSpin && hasString(CoolingInputKeys, f.Name) {
			extra, recompute = append(extra, v), true
			continue
		}
		spec, ok := meltbook.ParamSpecFor(step.Kind, f.Name)
		if !ok || f.Name == "cooling-rate" || f.Name == "cooling-regime" {
			return u, invalidField(f.Name, fmt.Sprintf("not a parameter of a %s step you can set; it records %s", step.Kind, paramNames(step.Kind)))
		}
		if f.Name == "thickness" || f.Name == "melt-temperature" || f.Name == "wheel-speed" {
			recompute = true
		}
		if f.Value == "" {
			u.Unset = append(u.Unset, f.Name)
			continue
		}
		var p meltbook.Param
		if f.Name == "wheel-speed" {
			var remark string
			p, remark, err = ParseWheelSpeed(v, diameter)
			if err == nil && remark != "" {
				notes := strings.TrimPrefix(step.Notes+"; "+remark, "; ")
				if u.Notes != nil {
					notes = strings.TrimPrefix(*u.Notes+"; "+remark, "; ")
				}
				u.Notes = &notes
			}
		} else {
			p, err = ParseParam(spec, v)
		}
		if err != nil {
			return u, err
		}
		u.Set = append(u.Set, p)
	}
	if recompute && step.Kind == meltbook.MeltSpin {
		if err := recomputeCooling(rec, step, &u, extra); err != nil {
			return u, err
		}
	}
	return u, nil
}

func hasString(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

func paramNames(kind meltbook.StepKind) string {
	var names []string
	for _, s := range meltbook.StepParams[kind] {
		if s.Name != "cooling-rate" && s.Name != "cooling-regime" {
			names = append(names, s.Name)
		}
	}
	return strings.Join(names, ", ")
}

// recomputeCooling re-estimates the cooling rate of a melt-spin step as it
// will be after the update, and adds the change to the update. Inputs of
// the estimate given when the step was logged are kept unless extra gives
// them anew.
func recomputeCooling(rec *meltbook.MeltRecord, step *meltbook.ProcessStep, u *meltbook.StepUpdate, extra []Value) error {
	after := meltbook.ProcessStep{Kind: step.Kind}
	for _, p := range step.Params {
		if !hasString(u.Unset, p.Name) && p.Name != "cooling-rate" && p.Name != "cooling-regime" {
			after.Params = append(after.Params, p)
		}
	}
	for _, p := range u.Set {
		replaced := false
		for i := range after.Params {
			if after.Params[i].Name == p.Name {
				after.Params[i], replaced = p, true
			}
		}
		if !replaced {
			after.Params = append(after.Params, p)
		}
	}
	c := make(composition.Composition, len(rec.Melt.Nominal))
	for i, ef := range rec.Melt.Nominal {
		c[i] = composition.Part{Element: ef.Element, Fraction: ef.Fraction}
	}
	_, thick := after.Param("thickness")
	if regime, ok := step.Param("cooling-regime"); ok && thick {
		for _, v := range GivenCoolingInputs(regime.Text) {
			again := false
			for _, e := range extra {
				again = again || e.Key == v.Key
			}
			if !again {
				extra = append(extra, v)
			}
		}
	}
	_, params, err := EstimateCooling(c, &after, extra, "thickness")
	if err != nil {
		return err
	}
	if params == nil {
		for _, name := range []string{"cooling-rate", "cooling-regime"} {
			if _, had := step.Param(name); had {
				u.Unset = append(u.Unset, name)
			}
		}
		return nil
	}
	u.Set = append(u.Set, params...)
	return nil
}

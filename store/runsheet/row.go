package runsheet

import (
	"errors"
	"fmt"
	"strconv"
	"strings"
	"time"

	"meltbook"
	"meltbook/analysis/composition"
	"meltbook/analysis/cooling"
	"meltbook/analysis/quantity"
)

// The cooling estimate's assumptions when the sheet does not say: the melt
// temperature and the wheel temperature, as `meltbook cooling` assumes.
const (
	assumedMeltTemperature  = "1200 °C"
	assumedWheelTemperature = "20 °C"
)

// cell is one field's value on a row.
type cell struct {
	value   string
	heading string // column heading, or "--fill KEY"
	line    int
	unit    string // unit from the heading or --map
	field   Field
}

// cellOf returns the row's value for a field, from its column or Fill;
// ok is false when there is none.
func (b *builder) cellOf(rec record, key string) (cell, bool) {
	f, _ := FieldByKey(key)
	if j, ok := b.byField[key]; ok {
		col := b.sheet.Columns[j]
		c := cell{heading: col.Heading, line: rec.lines[0], unit: col.Unit, field: f}
		if j < len(rec.cells) {
			c.value, c.line = strings.TrimSpace(rec.cells[j]), rec.lines[j]
		}
		if !isBlank(c.value) {
			return c, true
		}
	}
	if v, ok := b.opt.Fill[key]; ok {
		return cell{value: strings.TrimSpace(v), heading: "--fill " + key, line: rec.lines[0], field: f}, true
	}
	return cell{}, false
}

// quantityOf reads a quantity cell: a number with its unit, or a plain
// number in the unit of the heading.
func (b *builder) quantityOf(r *Row, c cell, dim quantity.Dimension) (quantity.Value, bool) {
	s, err := decimalPoint(c.value, b.sheet.DecimalComma)
	if err != nil {
		r.Refuse(c.heading, "%v", err)
		return quantity.Value{}, false
	}
	if isPlainNumber(s) {
		if c.unit == "" {
			r.Refuse(c.heading, "%q has no unit, and neither has the heading; write e.g. \"%s %s\" or put the unit in the heading", c.value, s, exampleUnit(c.field, dim))
			return quantity.Value{}, false
		}
		s += " " + c.unit
	}
	q, err := quantity.Parse(s, dim)
	if err != nil {
		r.Refuse(c.heading, "%s", unitMessage(c.value, err))
		return q, false
	}
	if !(q.SI > 0) {
		r.Refuse(c.heading, "%q: must be more than zero", c.value)
		return q, false
	}
	return q, true
}

// unitMessage turns a quantity error into the sheet's wording.
func unitMessage(value string, err error) string {
	msg := err.Error()
	if strings.Contains(msg, "unit") && !strings.Contains(msg, value) {
		return fmt.Sprintf("%q: %s", value, msg)
	}
	return msg
}

// exampleUnit is the unit to suggest for a field's numbers: the unit the
// notebook shows the parameter in, else a common one for the dimension.
func exampleUnit(f Field, d quantity.Dimension) string {
	if spec, ok := meltbook.ParamSpecFor(f.Step, f.Param); ok && spec.DisplayUnit != "" {
		return spec.DisplayUnit
	}
	switch d {
	case quantity.Mass:
		return "g"
	case quantity.Length:
		return "µm"
	case quantity.Temperature:
		return "°C"
	case quantity.Pressure:
		return "kPa"
	case quantity.Speed:
		return "m/s"
	case quantity.Time:
		return "h"
	}
	return d.SIUnit()
}

// row reads one record.
func (b *builder) row(rec record) Row {
	r := Row{Line: rec.lines[0], sheet: b.sheet.Name}
	for j, v := range rec.cells {
		v = strings.TrimSpace(v)
		switch {
		case v == "":
		case j >= len(b.sheet.Columns):
			r.guess("cell %d (%q) lies beyond the last heading and is not read", j+1, v)
		case b.sheet.Columns[j].Heading == "":
			r.guess("cell %d (%q) has no heading and is not read", j+1, v)
		}
	}
	m := &r.Melt
	if c, ok := b.cellOf(rec, "code"); ok {
		m.Code = c.value
	}
	if c, ok := b.cellOf(rec, "composition"); ok {
		b.readComposition(&r, c)
	} else {
		r.Refuse(b.heading("composition"), "no composition")
	}
	if c, ok := b.cellOf(rec, "mass"); ok {
		if q, ok := b.quantityOf(&r, c, quantity.Mass); ok {
			m.TargetMassGrams = q.SI * 1000
		}
	} else {
		r.Refuse(b.heading("mass"), "no target mass")
	}
	if c, ok := b.cellOf(rec, "mass-after"); ok {
		if q, ok := b.quantityOf(&r, c, quantity.Mass); ok {
			g := q.SI * 1000
			m.MassAfterMeltGrams = &g
		}
	}
	m.Operator = b.opt.Operator
	if c, ok := b.cellOf(rec, "operator"); ok {
		m.Operator = c.value
	} else if _, col := b.byField["operator"]; col && b.opt.Operator != "" {
		r.guess("no operator; recorded as made by %s", b.opt.Operator)
	}
	if c, ok := b.cellOf(rec, "date"); ok {
		b.readDate(&r, c)
	} else if _, col := b.byField["date"]; col {
		r.guess("no date; dated when imported")
	}
	if c, ok := b.cellOf(rec, "notes"); ok {
		m.Notes = c.value
	}
	b.readSteps(&r, rec)
	if c, ok := b.cellOf(rec, "outcome"); ok {
		where := fmt.Sprintf("%s line %d", b.sheet.Name, c.line)
		res, err := readOutcome(c.value, where)
		if err != nil {
			r.Refuse(c.heading, "%v", err)
		}
		r.Outcomes = res.outcomes
		r.Guesses = append(r.Guesses, res.guesses...)
		for i := range r.Outcomes {
			r.Outcomes[i].At = m.CreatedAt
		}
	}
	b.validate(&r)
	return r
}

// heading returns the heading of a field's column, "" when it has none.
func (b *builder) heading(key string) string {
	if j, ok := b.byField[key]; ok {
		return b.sheet.Columns[j].Heading
	}
	return ""
}

func (b *builder) readComposition(r *Row, c cell) {
	s := c.value
	if b.sheet.DecimalComma {
		s = strings.ReplaceAll(s, ",", ".")
	}
	p, err := composition.Parse(s)
	if err != nil {
		r.Refuse(c.heading, "%v", err)
		return
	}
	for _, w := range p.Warnings {
		r.guess("composition %s: %s", c.value, w)
	}
	if p.Scale == composition.Proportions {
		r.guess("composition %s: the amounts add up to %g, not 100, so they are read as proportions: %s", c.value, p.Total, p.Atomic.Format(2))
	}
	r.Melt.CompositionEntered = c.value
	for _, part := range p.Atomic {
		r.Melt.Nominal = append(r.Melt.Nominal, meltbook.ElementFraction{Element: part.Element, Fraction: part.Fraction})
	}
}

func (b *builder) readDate(r *Row, c cell) {
	if t, err := time.Parse(time.RFC3339, c.value); err == nil {
		r.Melt.CreatedAt = t
		return
	}
	p, err := splitDate(c.value)
	if err != nil {
		r.Refuse(c.heading, "%v", err)
		return
	}
	t, err := p.date(b.sheet.Dates, b.opt.Location)
	if err != nil {
		r.Refuse(c.heading, "%q: %v", c.value, err)
		return
	}
	if p.twoDigitYear {
		r.guess("date %q read as %s", c.value, t.Format("2006-01-02"))
	}
	r.Melt.CreatedAt = t
}

// readSteps builds the arc-melting, melt-spinning and anneal steps from
// the fields that record them.
func (b *builder) readSteps(r *Row, rec record) {
	for _, kind := range []meltbook.StepKind{meltbook.ArcMelt, meltbook.MeltSpin} {
		st := meltbook.ProcessStep{Kind: kind, At: r.Melt.CreatedAt}
		var notes []string
		for _, f := range Fields {
			if f.Step != kind || f.Param == "" {
				continue
			}
			c, ok := b.cellOf(rec, f.Key)
			if !ok {
				continue
			}
			p := meltbook.Param{Name: f.Param}
			switch f.kind {
			case textCell:
				p.Text = c.value
			case countCell:
				n, err := strconv.Atoi(strings.TrimSuffix(strings.TrimSuffix(c.value, "x"), "×"))
				if err != nil || n < 0 {
					r.Refuse(c.heading, "%q is not a whole number of zero or more", c.value)
					continue
				}
				p.SI = float64(n)
			case currentCell:
				s, err := decimalPoint(strings.TrimSpace(strings.TrimSuffix(c.value, "A")), b.sheet.DecimalComma)
				x, perr := strconv.ParseFloat(s, 64)
				if err != nil || perr != nil || !(x > 0) || (c.unit != "" && c.unit != "A") {
					r.Refuse(c.heading, "%q is not a current in A, e.g. 150 A", c.value)
					continue
				}
				p.SI, p.Unit = x, "A"
			case wheelSpeedCell:
				q, note, ok := b.wheelSpeed(r, rec, c)
				if !ok {
					continue
				}
				p.SI, p.Unit = q.SI, q.Unit
				if note != "" {
					notes = append(notes, note)
				}
			case quantityCell:
				q, ok := b.quantityOf(r, c, f.Unit)
				if !ok {
					continue
				}
				p.SI, p.Unit = q.SI, q.Unit
			}
			st.Params = append(st.Params, p)
		}
		if len(st.Params) == 0 {
			continue
		}
		st.Notes = strings.Join(notes, "; ")
		if kind == meltbook.MeltSpin {
			b.estimateCooling(r, &st)
		}
		r.Steps = append(r.Steps, st)
	}
	b.readAnnealStep(r, rec)
}

// wheelSpeed reads a surface speed, or a rotation rate with the wheel
// diameter; for a rate it also returns a note for the step.
func (b *builder) wheelSpeed(r *Row, rec record, c cell) (quantity.Value, string, bool) {
	s, err := decimalPoint(c.value, b.sheet.DecimalComma)
	if err != nil {
		r.Refuse(c.heading, "%v", err)
		return quantity.Value{}, "", false
	}
	if isPlainNumber(s) {
		if c.unit == "" {
			r.Refuse(c.heading, "%q has no unit, and neither has the heading; write e.g. \"%s m/s\" or put the unit in the heading", c.value, s)
			return quantity.Value{}, "", false
		}
		s += " " + c.unit
	}
	if q, err := quantity.Parse(s, quantity.Speed); err == nil {
		if !(q.SI > 0) {
			r.Refuse(c.heading, "%q: must be more than zero", c.value)
			return q, "", false
		}
		return q, "", true
	}
	rate, err := quantity.Parse(s, quantity.RotationRate)
	if err != nil {
		_, serr := quantity.Parse(s, quantity.Speed)
		r.Refuse(c.heading, "%s (or a rotation rate in rpm, with the wheel diameter)", unitMessage(c.value, serr))
		return rate, "", false
	}
	dc, ok := b.cellOf(rec, "wheel-diameter")
	if !ok {
		r.Refuse(c.heading, "%q is a rotation rate; the surface speed needs the wheel diameter (a wheel-diameter column, or --fill wheel-diameter=200mm)", c.value)
		return rate, "", false
	}
	d, ok := b.quantityOf(r, dc, quantity.Length)
	if !ok {
		return rate, "", false
	}
	v, err := quantity.SurfaceSpeed(rate, d)
	if err != nil {
		r.Refuse(c.heading, "%v", err)
		return v, "", false
	}
	v.Unit = "m/s"
	return v, fmt.Sprintf("wheel speed given as %s on a %s wheel", rate, d), true
}

// estimateCooling adds the cooling-rate estimate to a melt-spin step that
// records a ribbon thickness, as `meltbook log` does: the interface
// coefficient's default, the melt temperature given or assumed, the wheel
// at 20 °C, and the alloy's properties from its elements.
func (b *builder) estimateCooling(r *Row, st *meltbook.ProcessStep) {
	t, ok := st.Param("thickness")
	if !ok || len(r.Melt.Nominal) == 0 {
		return
	}
	c := make(composition.Composition, len(r.Melt.Nominal))
	for i, f := range r.Melt.Nominal {
		c[i] = composition.Part{Element: f.Element, Fraction: f.Fraction}
	}
	mat, err := cooling.MaterialFromComposition(c)
	if err != nil {
		r.guess("no cooling estimate: %v", err)
		return
	}
	melt, _ := quantity.Parse(assumedMeltTemperature, quantity.Temperature)
	meltNote := " (assumed)"
	if p, ok := st.Param("melt-temperature"); ok {
		melt, meltNote = quantity.Value{SI: p.SI, Dimension: quantity.Temperature, Unit: p.Unit}, ""
	}
	wheel, _ := quantity.Parse(assumedWheelTemperature, quantity.Temperature)
	in := cooling.Input{ThicknessMetres: t.SI, MeltTemperatureK: melt.SI, WheelTemperatureK: wheel.SI, Material: mat}
	if p, ok := st.Param("wheel-speed"); ok {
		in.WheelSpeedMPerS = p.SI
	}
	est, err := cooling.Rate(in)
	if err != nil {
		r.guess("no cooling estimate: %v", err)
		return
	}
	st.Params = append(st.Params,
		meltbook.Param{Name: "cooling-rate", SI: est.RateKPerS, Unit: "K/s"},
		meltbook.Param{Name: "cooling-regime", Text: fmt.Sprintf("%s, Biot number %.3g; h %.3g W/(m²·K) (default); melt %s%s, wheel %s (assumed); ρ %.4g kg/m³, c_p %.4g J/(kg·K), k %.4g W/(m·K) from the elements",
			est.Regime, est.Biot, est.HeatTransferWPerM2K, melt, meltNote, wheel, mat.DensityKgPerM3, mat.SpecificHeatJPerKgK, mat.ThermalConductivityWPerMK)})
}

// readAnnealStep reads the anneal from its one column or from the
// temperature and time columns.
func (b *builder) readAnnealStep(r *Row, rec record) {
	one, hasOne := b.cellOf(rec, "anneal")
	tc, hasT := b.cellOf(rec, "anneal-temperature")
	dc, hasTime := b.cellOf(rec, "anneal-time")
	if hasOne && (hasT || hasTime) {
		r.Refuse(one.heading, "the anneal is given twice, here and in the anneal temperature or time column")
		return
	}
	var st *meltbook.ProcessStep
	switch {
	case hasOne:
		var err error
		if st, err = readAnneal(one.value, b.sheet.DecimalComma); err != nil {
			r.Refuse(one.heading, "%v", err)
			return
		}
	case hasT && hasTime:
		t, ok1 := b.quantityOf(r, tc, quantity.Temperature)
		d, ok2 := b.quantityOf(r, dc, quantity.Time)
		if !ok1 || !ok2 {
			return
		}
		st = &meltbook.ProcessStep{Kind: meltbook.Anneal, Params: []meltbook.Param{
			{Name: "temperature", SI: t.SI, Unit: t.Unit}, {Name: "time", SI: d.SI, Unit: d.Unit}}}
	case hasT:
		r.Refuse(tc.heading, "an anneal temperature without its time")
		return
	case hasTime:
		r.Refuse(dc.heading, "an anneal time without its temperature")
		return
	}
	if st != nil {
		st.At = r.Melt.CreatedAt
		r.Steps = append(r.Steps, *st)
	}
}

// validate runs the domain checks and names the column at fault.
func (b *builder) validate(r *Row) {
	if !r.OK() {
		return
	}
	m := r.Melt
	if m.Code == "" {
		m.Code = "X-0001" // stands in for a code made from a prefix
	}
	if err := m.Validate(); err != nil {
		r.Refuse(b.headingOf(err), "%s", messageOf(err))
		return
	}
	for i := range r.Steps {
		st := r.Steps[i]
		st.Operator = m.Operator
		if err := st.Validate(); err != nil {
			r.Refuse(b.headingOf(err), "%s", messageOf(err))
			return
		}
	}
	for i := range r.Outcomes {
		o := r.Outcomes[i]
		o.Source, o.RecordedBy = meltbook.ByPerson, "importer"
		if err := o.Validate(); err != nil {
			r.Refuse(b.heading("outcome"), "%s", messageOf(err))
			return
		}
	}
}

// headingOf finds the column of the field a domain error names
// ("mass", "melt-spin.thickness").
func (b *builder) headingOf(err error) string {
	var e *meltbook.Error
	if !errors.As(err, &e) {
		return ""
	}
	key := e.Field
	if kind, param, ok := strings.Cut(e.Field, "."); ok {
		for _, f := range Fields {
			if string(f.Step) == kind && f.Param == param {
				key = f.Key
			}
		}
	}
	return b.heading(key)
}

func messageOf(err error) string {
	var e *meltbook.Error
	if errors.As(err, &e) {
		return e.Message
	}
	return err.Error()
}

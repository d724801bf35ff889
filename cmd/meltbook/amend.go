package main

import (
	"context"
	"fmt"
	"strconv"
	"strings"
	"time"

	"github.com/spf13/cobra"

	"meltbook"
	"meltbook/store"
	"meltbook/store/runform"
)

func init() {
	addCommand(newAmendCommand)
	addCommand(newHistoryCommand)
}

// amendField is one FIELD=VALUE argument of amend.
type amendField struct {
	name, value string
}

// amendFields lists, per target, the fields amend accepts, for help and
// error messages.
var amendFields = map[string]string{
	"melt":        runform.MeltFields,
	"sample":      "label, made",
	"step":        runform.StepFields,
	"outcome":     "kind, lattice, order, name, fraction, evidence",
	"measurement": "method, composition, uncertainty (at.%, one value or EL=VALUE), notes, operator, at",
	"symmetry":    "folds, notes, operator, at",
	"note":        "text",
}

func newAmendCommand(a *app) *cobra.Command {
	var reason string
	cmd := &cobra.Command{
		Use:   "amend TARGET FIELD=VALUE... --reason TEXT",
		Short: "Correct a recorded value, with the reason, kept in the history",
		Long: `Changes recorded values. Nothing is overwritten silently: every changed field
is kept in the history with its value before and after, who changed it, when
and why; --reason is required.

TARGET is what 'meltbook show' prints beside each record:
  QX-0042              a melt: ` + amendFields["melt"] + `
  QX-0042.a1           a derived sample: ` + amendFields["sample"] + `
  step:QX-0042:2       step 2 of a sample: ` + amendFields["step"] + `
  outcome:12           a person's outcome: ` + amendFields["outcome"] + `
  measurement:3        a measured composition: ` + amendFields["measurement"] + `
  symmetry:4           an electron-diffraction observation: ` + amendFields["symmetry"] + `
  note:7               a dated note: ` + amendFields["note"] + `

Values take units as when logging (thickness=32um). Changing a melt-spinning
step's thickness, melt temperature or wheel speed re-estimates its cooling
rate (the cooling-estimate fields heat-transfer, wheel-temperature, density,
specific-heat and conductivity may be given too; otherwise the defaults
apply).`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) < 2 {
				return &usageError{fmt.Errorf("amend takes a TARGET and at least one FIELD=VALUE; see meltbook amend --help")}
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			if strings.TrimSpace(reason) == "" {
				return invalidFlag("--reason", "an amendment needs a reason")
			}
			var fields []amendField
			seen := map[string]bool{}
			for _, arg := range args[1:] {
				name, value, ok := strings.Cut(arg, "=")
				name = strings.TrimSpace(name)
				if !ok || name == "" {
					return invalidFlag(arg, "write each change as FIELD=VALUE, e.g. mass=10.2g")
				}
				if seen[name] && name != "weighed" && name != "purity" && name != "uncertainty" {
					return invalidFlag(name, "given twice")
				}
				seen[name] = true
				fields = append(fields, amendField{name, strings.TrimSpace(value)})
			}
			st, err := a.openNotebook(cmd.Context())
			if err != nil {
				return err
			}
			defer st.Close()
			changes, err := a.amend(cmd.Context(), st, args[0], fields, reason)
			if err != nil {
				return err
			}
			for _, h := range changes {
				fmt.Fprintf(a.stdout, "amended %s %s: %s → %s\n", args[0], h.Field, orNone(h.Before), orNone(h.After))
			}
			return nil
		},
	}
	cmd.Flags().StringVar(&reason, "reason", "", "why the value changes (required)")
	return cmd
}

func orNone(s string) string {
	if s == "" {
		return "(none)"
	}
	return s
}

// amend dispatches on the target's form.
func (a *app) amend(ctx context.Context, st *store.Store, target string, fields []amendField, why string) ([]meltbook.HistoryEntry, error) {
	who := a.operator()
	kind, ref, isHandle := strings.Cut(target, ":")
	if !isHandle {
		return a.amendCode(ctx, st, target, fields, why)
	}
	if kind == "step" {
		return a.amendStep(ctx, st, ref, fields, why)
	}
	if _, known := amendFields[kind]; !known || kind == "melt" || kind == "sample" {
		return nil, invalidFlag("TARGET", fmt.Sprintf("%q is not a melt or sample code, step:CODE:N, outcome:ID, measurement:ID, symmetry:ID or note:ID", target))
	}
	id, err := strconv.ParseInt(ref, 10, 64)
	if err != nil || id <= 0 {
		return nil, invalidFlag("TARGET", fmt.Sprintf("%q: after %s: comes the number 'meltbook show' prints", target, kind))
	}
	switch kind {
	case "outcome":
		u, err := outcomeUpdate(fields)
		if err != nil {
			return nil, err
		}
		return st.AmendOutcome(ctx, who, id, u, why)
	case "measurement":
		u, err := measurementUpdate(fields)
		if err != nil {
			return nil, err
		}
		return st.AmendMeasuredComposition(ctx, who, id, u, why)
	case "symmetry":
		u, err := observationUpdate(fields)
		if err != nil {
			return nil, err
		}
		return st.AmendSymmetryObservation(ctx, who, id, u, why)
	}
	var u meltbook.NoteUpdate
	for _, f := range fields {
		if f.name != "text" {
			return nil, unknownAmendField("note", f)
		}
		text := f.value
		u.Text = &text
	}
	return st.AmendNote(ctx, who, id, u, why)
}

// changes turns FIELD=VALUE arguments into runform's changes.
func changes(fields []amendField) []runform.Change {
	out := make([]runform.Change, len(fields))
	for i, f := range fields {
		out[i] = runform.Change{Name: f.name, Value: f.value}
	}
	return out
}

func unknownAmendField(target string, f amendField) error {
	return invalidFlag(f.name, fmt.Sprintf("not a field of a %s; the fields are %s", target, amendFields[target]))
}

// amendCode amends a melt (its code) or a derived sample.
func (a *app) amendCode(ctx context.Context, st *store.Store, code string, fields []amendField, why string) ([]meltbook.HistoryEntry, error) {
	who := a.operator()
	var su meltbook.SampleUpdate
	var sampleFields, meltFields []amendField
	for _, f := range fields {
		switch f.name {
		case "label":
			label := f.value
			su.Label = &label
			sampleFields = append(sampleFields, f)
		default:
			meltFields = append(meltFields, f)
		}
	}
	m, err := st.FindMeltByCode(ctx, code)
	if meltbook.KindOf(err) == meltbook.NotFound {
		if _, err := st.FindSampleByCode(ctx, code); err != nil {
			return nil, meltbook.Errorf(meltbook.NotFound, "TARGET", "no melt or sample %s in the notebook", code)
		}
		for _, f := range meltFields {
			if f.name != "made" {
				return nil, unknownAmendField("sample", f)
			}
			t, err := runform.ParseWhen(runform.Value{Key: f.name, Value: f.value, Where: f.name}, time.Local)
			if err != nil {
				return nil, err
			}
			su.CreatedAt = &t
		}
		return st.AmendSample(ctx, who, code, su, why)
	}
	if err != nil {
		return nil, err
	}
	if len(sampleFields) > 0 {
		if len(meltFields) > 0 {
			return nil, invalidFlag("label", "amend the label on its own: it belongs to the melt's sample, the other fields to the melt")
		}
		return st.AmendSample(ctx, who, code, su, why)
	}
	u, err := runform.MeltUpdate(m, changes(meltFields), time.Local)
	if err != nil {
		return nil, err
	}
	return st.AmendMelt(ctx, who, code, u, why)
}

// meltOfSample finds the melt a sample belongs to and the sample's record.
func meltOfSample(ctx context.Context, st *store.Store, code string) (*meltbook.MeltRecord, *meltbook.SampleRecord, error) {
	root := code
	for i := 0; ; i++ {
		sa, err := st.FindSampleByCode(ctx, root)
		if err != nil {
			return nil, nil, err
		}
		if sa.ParentCode == "" {
			break
		}
		if i > 1000 {
			return nil, nil, fmt.Errorf("sample %s: parent chain does not end", code)
		}
		root = sa.ParentCode
	}
	rec, err := st.MeltRecord(ctx, root)
	if err != nil {
		return nil, nil, err
	}
	for i := range rec.Samples {
		if rec.Samples[i].Code == code {
			return rec, &rec.Samples[i], nil
		}
	}
	return nil, nil, meltbook.Errorf(meltbook.NotFound, "TARGET", "no sample %s in melt %s", code, root)
}

// amendStep amends step:CODE:N.
func (a *app) amendStep(ctx context.Context, st *store.Store, ref string, fields []amendField, why string) ([]meltbook.HistoryEntry, error) {
	i := strings.LastIndex(ref, ":")
	n, err := strconv.Atoi(ref[i+1:])
	if i <= 0 || err != nil || n < 1 {
		return nil, invalidFlag("TARGET", fmt.Sprintf("%q: write a step as step:CODE:N, e.g. step:QX-0042:2", "step:"+ref))
	}
	rec, sample, err := meltOfSample(ctx, st, ref[:i])
	if err != nil {
		return nil, err
	}
	var step *meltbook.ProcessStep
	for j := range sample.Steps {
		if sample.Steps[j].Seq == n {
			step = &sample.Steps[j]
		}
	}
	if step == nil {
		return nil, meltbook.Errorf(meltbook.NotFound, "TARGET", "sample %s has no step %d", sample.Code, n)
	}
	u, err := runform.StepUpdate(rec, step, changes(fields), time.Local)
	if err != nil {
		return nil, err
	}
	return st.AmendStep(ctx, a.operator(), step.ID, u, why)
}

func hasString(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

func outcomeUpdate(fields []amendField) (meltbook.OutcomeUpdate, error) {
	var u meltbook.OutcomeUpdate
	for _, f := range fields {
		v := f.value
		switch f.name {
		case "kind":
			k := meltbook.PhaseKind(strings.ToLower(v))
			u.Kind = &k
		case "lattice":
			l := strings.ToUpper(v)
			u.Lattice = &l
		case "order":
			u.Order = &v
		case "name":
			u.Name = &v
		case "fraction":
			fr, err := parseFraction(f.name, v)
			if err != nil {
				return u, err
			}
			if fr == nil {
				return u, invalidFlag(f.name, "give a fraction, e.g. fraction=80%")
			}
			u.Fraction = fr
		case "evidence":
			u.Evidence = &v
		default:
			return u, unknownAmendField("outcome", f)
		}
	}
	return u, nil
}

func measurementUpdate(fields []amendField) (meltbook.MeasurementUpdate, error) {
	var u meltbook.MeasurementUpdate
	var uncertainty []string
	var elements []string
	for _, f := range fields {
		v := f.value
		switch f.name {
		case "method":
			found := false
			for _, m := range meltbook.MeasurementMethods {
				if strings.EqualFold(m, v) {
					m := m
					u.Method, found = &m, true
				}
			}
			if !found {
				return u, invalidFlag(f.name, fmt.Sprintf("%q is not one of %s", v, strings.Join(meltbook.MeasurementMethods, ", ")))
			}
		case "composition":
			p, err := runform.ParseComposition(runform.Value{Key: f.name, Value: v, Where: f.name})
			if err != nil {
				return u, err
			}
			u.Fractions = runform.Fractions(p.Atomic)
			elements = p.Atomic.Elements()
		case "uncertainty":
			uncertainty = append(uncertainty, v)
		case "notes":
			u.Notes = &v
		case "operator":
			u.Operator = &v
		case "at":
			t, err := runform.ParseWhen(runform.Value{Key: f.name, Value: v, Where: f.name}, time.Local)
			if err != nil {
				return u, err
			}
			u.At = &t
		default:
			return u, unknownAmendField("measurement", f)
		}
	}
	if len(uncertainty) > 0 {
		if elements == nil {
			return u, invalidFlag("uncertainty", "amend the uncertainty together with the composition it belongs to")
		}
		var err error
		if u.Uncertainty, err = parseUncertainty(uncertainty, elements); err != nil {
			return u, err
		}
	}
	return u, nil
}

func observationUpdate(fields []amendField) (meltbook.ObservationUpdate, error) {
	var u meltbook.ObservationUpdate
	for _, f := range fields {
		v := f.value
		switch f.name {
		case "folds":
			folds, err := parseFolds(f.name, v)
			if err != nil {
				return u, err
			}
			u.Folds = folds
		case "notes":
			u.Notes = &v
		case "operator":
			u.Operator = &v
		case "at":
			t, err := runform.ParseWhen(runform.Value{Key: f.name, Value: v, Where: f.name}, time.Local)
			if err != nil {
				return u, err
			}
			u.At = &t
		default:
			return u, unknownAmendField("symmetry", f)
		}
	}
	return u, nil
}

func newHistoryCommand(a *app) *cobra.Command {
	var asJSON bool
	cmd := &cobra.Command{
		Use:   "history CODE",
		Short: "Every change recorded about a melt, oldest first",
		Args:  exactArgs(1, "CODE"),
		RunE: func(cmd *cobra.Command, args []string) error {
			st, err := a.openNotebook(cmd.Context())
			if err != nil {
				return err
			}
			defer st.Close()
			hs, err := st.History(cmd.Context(), args[0])
			if err != nil {
				return err
			}
			if asJSON {
				if hs == nil {
					hs = []meltbook.HistoryEntry{}
				}
				return writeJSON(a.stdout, hs)
			}
			printHistory(a.stdout, hs)
			return nil
		},
	}
	cmd.Flags().BoolVar(&asJSON, "json", false, "print JSON")
	return cmd
}

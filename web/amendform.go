package web

import (
	"errors"
	"fmt"
	"net/http"
	"net/url"
	"slices"
	"strconv"
	"strings"

	"meltbook"
	"meltbook/store/runform"
)

// The amend form corrects one recorded value of a melt or of one of its
// steps, with a reason, as `meltbook amend` does: package runform reads the
// value for both, so units, checks and the cooling re-estimate of a
// melt-spin step are the same. The store keeps the value before and after
// in the history.

// amendForm is the amend form as typed.
type amendForm struct {
	Target, Field, Value, Why, By string
	Errors                        map[string]string
	Error                         string
	// Open is set when the form comes back, so that it shows.
	Open bool
}

// amendTarget is one choice of what to amend.
type amendTarget struct {
	Value, Label string
}

// amendTargets lists the melt and each recorded step of its samples.
func amendTargets(rec *meltbook.MeltRecord) []amendTarget {
	out := []amendTarget{{"melt", "Melt " + rec.Melt.Code}}
	for _, sr := range rec.Samples {
		for _, st := range sr.Steps {
			out = append(out, amendTarget{fmt.Sprintf("step:%s:%d", sr.Code, st.Seq), fmt.Sprintf("%s step %d, %s", sr.Code, st.Seq, st.Kind)})
		}
	}
	return out
}

// meltFieldNames are what the amend form takes for a melt; stepFieldNames
// what it takes for any step besides its parameters (the cooling inputs
// only for a melt-spin step).
var (
	meltFieldNames = []string{"operator", "made", "composition", "mass", "mass-after", "notes", "weighed", "purity", "label"}
	stepFieldNames = append([]string{"notes", "operator", "at"}, runform.CoolingInputKeys...)
)

// amendFieldNames are the names the field input suggests: the melt's
// fields and every step parameter a person sets.
func amendFieldNames() []string {
	names := []string{"operator", "made", "composition", "mass", "mass-after", "notes", "weighed", "purity", "label", "at"}
	seen := map[string]bool{}
	for _, n := range names {
		seen[n] = true
	}
	for _, kind := range []meltbook.StepKind{meltbook.ArcMelt, meltbook.MeltSpin, meltbook.Anneal, meltbook.OtherStep} {
		for _, sp := range meltbook.StepParams[kind] {
			if !seen[sp.Name] && sp.Name != "cooling-rate" && sp.Name != "cooling-regime" {
				seen[sp.Name] = true
				names = append(names, sp.Name)
			}
		}
	}
	return names
}

// amend corrects one value; a form that does not hold up comes back with
// what was typed and the message beside its field.
func (s *Server) amend(w http.ResponseWriter, r *http.Request) {
	p, ok := s.postedRun(w, r)
	if !ok {
		return
	}
	pf := r.PostForm
	form := amendForm{Target: pf.Get("target"), Field: strings.TrimSpace(pf.Get("field")), Value: strings.TrimSpace(pf.Get("value")),
		Why: strings.TrimSpace(pf.Get("why")), By: strings.TrimSpace(pf.Get("by")), Errors: map[string]string{}, Open: true}
	if form.Field == "" {
		form.Errors["field"] = "Name the field to correct, e.g. thickness."
	}
	if form.Why == "" {
		form.Errors["why"] = "An amendment needs a reason."
	}
	if form.By == "" {
		form.Errors["by"] = "Say who makes the correction."
	}
	if len(form.Errors) == 0 {
		err := s.amendOne(r, p.Run, form)
		if err == nil {
			http.Redirect(w, r, "/runs/"+url.PathEscape(p.Run.Melt.Code)+"#history", http.StatusSeeOther)
			return
		}
		var e *meltbook.Error
		if kind := kindOf(err); kind != meltbook.Invalid && kind != meltbook.NotFound && kind != meltbook.Conflict || !errors.As(err, &e) {
			s.fail(w, r, err)
			return
		}
		switch {
		case e.Field == "why" || e.Field == "by" || e.Field == "target" || e.Field == "field":
			form.Errors[e.Field] = e.Message
		case e.Field == form.Field || e.Field == "wheel-diameter":
			form.Errors["value"] = e.Message
		default:
			form.Error = e.Error()
		}
	}
	status, _ := statusOf(meltbook.Errorf(meltbook.Invalid, "", "amend"), r)
	p.Amend = form
	p.Note = noteForm{Author: s.cfg.Author}
	s.render(w, r, status, "run", p.Run.Melt.Code, p)
}

// amendOne reads the value with runform and writes the amendment.
func (s *Server) amendOne(r *http.Request, rec *meltbook.MeltRecord, f amendForm) error {
	ctx := r.Context()
	change := []runform.Change{{Name: f.Field, Value: f.Value}}
	if f.Target == "melt" {
		if !slices.Contains(meltFieldNames, f.Field) {
			return meltbook.Errorf(meltbook.Invalid, "field", "%q is not a field of a melt; the fields are %s", f.Field, runform.MeltFields)
		}
		if f.Field == "label" {
			_, err := s.nb.AmendSample(ctx, f.By, rec.Melt.Code, meltbook.SampleUpdate{Label: &f.Value}, f.Why)
			return err
		}
		u, err := runform.MeltUpdate(&rec.Melt, change, s.location)
		if err != nil {
			return err
		}
		_, err = s.nb.AmendMelt(ctx, f.By, rec.Melt.Code, u, f.Why)
		return err
	}
	step := findStep(rec, f.Target)
	if step == nil {
		return meltbook.Errorf(meltbook.Invalid, "target", "%q is not the melt or one of its steps", f.Target)
	}
	if spec, ok := meltbook.ParamSpecFor(step.Kind, f.Field); !ok && !slices.Contains(stepFieldNames, f.Field) ||
		ok && (spec.Name == "cooling-rate" || spec.Name == "cooling-regime") ||
		step.Kind != meltbook.MeltSpin && slices.Contains(runform.CoolingInputKeys, f.Field) {
		return meltbook.Errorf(meltbook.Invalid, "field", "%q is not a field of a %s step you can set; it takes %s", f.Field, step.Kind, runform.StepFields)
	}
	u, err := runform.StepUpdate(rec, step, change, s.location)
	if err != nil {
		return err
	}
	_, err = s.nb.AmendStep(ctx, f.By, step.ID, u, f.Why)
	return err
}

// findStep finds "step:CODE:N" among the melt's samples.
func findStep(rec *meltbook.MeltRecord, target string) *meltbook.ProcessStep {
	ref, ok := strings.CutPrefix(target, "step:")
	i := strings.LastIndex(ref, ":")
	if !ok || i <= 0 {
		return nil
	}
	seq, err := strconv.Atoi(ref[i+1:])
	if err != nil {
		return nil
	}
	for si := range rec.Samples {
		sr := &rec.Samples[si]
		if sr.Code != ref[:i] {
			continue
		}
		for j := range sr.Steps {
			if sr.Steps[j].Seq == seq {
				return &sr.Steps[j]
			}
		}
	}
	return nil
}

package web

import (
	"errors"
	"net/http"
	"net/url"
	"slices"
	"strings"

	"meltbook"
	"meltbook/analysis/hazard"
	"meltbook/store/runform"
)

// The log form records a melt with its weigh-out, arc melting and melt
// spinning, field for field as `meltbook log` takes them: package runform
// reads both, so the checks, the SI units and the messages are the same.
// A form field is named as the command's flag, without the dashes.

// logGroup is one fieldset of the log form.
type logGroup struct {
	Title string
	Note  string
	// Open is set for a collapsed group that holds a typed value or an
	// error, so that nothing typed is hidden.
	Collapsed, Open bool
	Fields          []logField
}

// logField is one input of the log form, as typed.
type logField struct {
	runform.Field
	Label string
	Value string
	Error string
	// Kind is the input type: "text", "checkbox" or "datetime-local".
	Kind     string
	Required bool
}

// logGroups lays out runform's fields: the melt, the weigh-out, arc
// melting, melt spinning and the cooling estimate's inputs.
var logGroups = []struct {
	title, note string
	collapsed   bool
	keys        func(runform.Field) bool
}{
	{"Melt", "Give a code, or leave it empty for the next free one with the prefix.", false, func(f runform.Field) bool {
		return slices.Contains([]string{"code", "prefix", "composition", "mass", "operator", "made", "notes"}, f.Key)
	}},
	{"Weigh-out", "Planned as meltbook weigh plans it; give the masses actually weighed beside it.", false, func(f runform.Field) bool {
		return slices.Contains([]string{"weighed", "purity", "loss", "no-default-loss", "mass-after"}, f.Key)
	}},
	{"Arc melting", "", false, func(f runform.Field) bool { return f.Step == meltbook.ArcMelt }},
	{"Melt spinning", "With a ribbon thickness the cooling rate is estimated and stored with its regime.", false, func(f runform.Field) bool {
		return f.Step == meltbook.MeltSpin && !slices.Contains(runform.CoolingInputKeys, f.Key)
	}},
	{"Cooling estimate", "Only needed to override the defaults.", true, func(f runform.Field) bool {
		return slices.Contains(runform.CoolingInputKeys, f.Key)
	}},
}

// logHelp replaces the help of fields whose command-line wording does not
// fit a form.
var logHelp = map[string]string{
	"operator":        "who made the melt",
	"no-default-loss": "plan no rule-of-thumb evaporation allowances for Mg, Zn, Mn, Li, Ca",
	"made":            "when the melt was made, local time (empty: now)",
	"weighed":         "masses actually weighed, EL=MASS, comma-separated",
	"purity":          "purity of the pieces in percent, EL=PERCENT (default 100)",
	"loss":            "evaporation allowance planned, EL=PERCENT",
}

// logLabels name fields whose key reads badly as a label.
var logLabels = map[string]string{
	"mass": "Target mass", "made": "Made", "no-default-loss": "No rule-of-thumb loss allowances",
	"mass-after": "Mass after melting", "prefix": "Prefix for a new code", "notes": "Remarks",
	"arc-notes": "Remarks", "spin-notes": "Remarks", "arc-remelts": "Remelts",
}

type logPage struct {
	Groups []logGroup
	// Error is a message that belongs to no single field; Problem is the
	// first field with a message, named at the top of a refused form.
	Error   string
	Problem *logField
	// Cautions are the bench cautions of melting and spinning.
	Cautions []hazard.Caution
}

// newLogPage lays out the form with the values typed and the errors per
// field.
func newLogPage(typed url.Values, errs map[string]string, author string) logPage {
	p := logPage{Cautions: runCautions(nil)}
	for _, g := range logGroups {
		lg := logGroup{Title: g.title, Note: g.note, Collapsed: g.collapsed}
		for _, f := range runform.Fields() {
			if !g.keys(f) {
				continue
			}
			if h, ok := logHelp[f.Key]; ok {
				f.Help = h
			}
			lf := logField{Field: f, Label: logLabels[f.Key], Value: typed.Get(f.Key), Error: errs[f.Key], Kind: "text"}
			if lf.Label == "" {
				name := strings.TrimPrefix(f.Key, "arc-")
				lf.Label = strings.ToUpper(name[:1]) + strings.ReplaceAll(name[1:], "-", " ")
			}
			switch f.Key {
			case "no-default-loss":
				lf.Kind = "checkbox"
			case "made":
				lf.Kind = "datetime-local"
			case "composition", "mass", "operator":
				lf.Required = true
			}
			if f.Key == "operator" && typed == nil {
				lf.Value = author
			}
			lg.Open = lg.Open || lf.Value != "" || lf.Error != ""
			if lf.Error != "" && p.Problem == nil {
				problem := lf
				p.Problem = &problem
			}
			lg.Fields = append(lg.Fields, lf)
		}
		p.Groups = append(p.Groups, lg)
	}
	return p
}

// runCautions are the cautions of arc melting and melt spinning and of the
// elements given, and once, last, the deferral to local rules, as
// `meltbook log` prints them.
func runCautions(elements []string) []hazard.Caution {
	var out []hazard.Caution
	for _, c := range append(hazard.Cautions(elements), hazard.ProcessCautions()...) {
		if c.Kind != hazard.LocalRules {
			out = append(out, c)
		}
	}
	for _, c := range hazard.ProcessCautions() {
		if c.Kind == hazard.LocalRules {
			out = append(out, c)
		}
	}
	return out
}

func (s *Server) logForm(w http.ResponseWriter, r *http.Request) {
	s.render(w, r, http.StatusOK, "log", "Log a melt", newLogPage(nil, nil, s.cfg.Author))
}

// logRun checks the form as `meltbook log` checks its flags, logs the melt
// and opens its page; a form that does not hold up comes back with every
// value as typed and each message beside its field.
func (s *Server) logRun(w http.ResponseWriter, r *http.Request) {
	if err := r.ParseForm(); err != nil {
		s.fail(w, r, bodyError(err))
		return
	}
	typed := url.Values{}
	in := runform.Input{Where: "the form", Missing: func(key string) string { return key }}
	for _, f := range runform.Fields() {
		v := strings.TrimSpace(r.PostForm.Get(f.Key))
		if v == "" {
			continue
		}
		typed.Set(f.Key, v)
		if f.Key == "no-default-loss" {
			v = "yes"
		}
		in.Add(f.Key, v, f.Key)
	}
	errs := map[string]string{}
	code, err := s.createRun(r, in, typed, errs)
	if err == nil {
		http.Redirect(w, r, "/runs/"+url.PathEscape(code)+"?logged=1", http.StatusSeeOther)
		return
	}
	var e *meltbook.Error
	if kind := kindOf(err); kind != meltbook.Invalid && kind != meltbook.Conflict || !errors.As(err, &e) {
		s.fail(w, r, err)
		return
	}
	p := newLogPage(typed, errs, s.cfg.Author)
	if len(errs) == 0 {
		p.Error = e.Error()
	}
	status, _ := statusOf(meltbook.Errorf(meltbook.Invalid, "", "log"), r)
	if kindOf(err) == meltbook.Conflict {
		status = http.StatusConflict
	}
	s.render(w, r, status, "log", "Log a melt", p)
}

// createRun builds the run and logs it, returning its code; a user's
// error about one field goes in errs under the field's key.
func (s *Server) createRun(r *http.Request, in runform.Input, typed url.Values, errs map[string]string) (string, error) {
	place := func(err error) error {
		var e *meltbook.Error
		if errors.As(err, &e) {
			if _, ok := runform.FieldByKey(e.Field); ok {
				errs[e.Field] = e.Message
			}
		}
		return err
	}
	who := typed.Get("operator")
	if who == "" {
		return "", place(meltbook.Errorf(meltbook.Invalid, "operator", "say who made the melt"))
	}
	run, err := runform.Build(in, who, s.location)
	if err != nil {
		return "", place(err)
	}
	m := &run.New.Melt
	if run.Prefix != "" {
		if m.Code, err = s.nb.NextMeltCode(r.Context(), run.Prefix); err != nil {
			return "", place(run.RetargetPrefix(err))
		}
	}
	if err := s.nb.CreateMelt(r.Context(), who, m, run.New.Steps...); err != nil {
		var e *meltbook.Error
		if errors.As(err, &e) && e.Field == "code" && typed.Get("code") == "" {
			// A generated code taken meanwhile: say so where the prefix is.
			return "", place(meltbook.Errorf(e.Kind, "prefix", "%s; send the form again for the next code", e.Message))
		}
		return "", place(run.Retarget(err))
	}
	return m.Code, nil
}

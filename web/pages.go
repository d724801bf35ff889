package web

import (
	"errors"
	"html/template"
	"math"
	"net/http"
	"net/url"
	"slices"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/go-chi/chi/v5"

	"meltbook"
	"meltbook/analysis/hazard"
	"meltbook/store"
	"meltbook/store/query"
	"meltbook/web/plot"
)

// PageSize is the number of rows on one page of the run table.
const PageSize = 50

type overviewPage struct {
	Summary store.Summary
	Classes []classCount
	Mapped  int
}

type classCount struct {
	Class plot.Class
	Count int
	// Href lists the melts with this outcome, for classes that are one
	// phase kind.
	Href string
}

func (s *Server) overview(w http.ResponseWriter, r *http.Request) {
	sum, err := s.nb.Summary(r.Context())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	samples, err := s.nb.MapSamples(r.Context())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	counts := map[plot.Class]int{}
	for _, m := range samples {
		counts[plot.ClassOf(m.Outcomes)]++
	}
	p := overviewPage{Summary: sum, Mapped: len(samples)}
	for _, c := range plot.Classes {
		cc := classCount{Class: c, Count: counts[c]}
		switch c {
		case plot.ClassIcosahedral, plot.ClassDecagonal, plot.ClassApproximant, plot.ClassAmorphous:
			cc.Href = "/runs?" + query.Outcome + "=" + url.QueryEscape(c.Slug())
		}
		p.Classes = append(p.Classes, cc)
	}
	s.render(w, r, http.StatusOK, "overview", "Notebook", p)
}

// Query parameters of the run table besides the filters.
const (
	paramSort = "sort"
	paramDesc = "desc"
	paramPage = "page"
)

// mainFilters are shown at once on the run page; the others sit under
// "more filters" unless one of them is in use.
var mainFilters = map[string]bool{query.Outcome: true, query.EA: true, query.Rate: true, query.System: true, query.With: true}

// parseFind reads the find filters (the vocabulary of package query, as
// the find command takes them), sort order and page from a query. Unknown
// parameters are errors so that a mistyped filter is not silently ignored.
func (s *Server) parseFind(q url.Values) (meltbook.MeltFilter, error) {
	known := map[string]bool{paramSort: true, paramDesc: true, paramPage: true, tokenParam: true}
	var names []string
	for _, f := range query.Fields() {
		known[f.Name] = true
		names = append(names, f.Name)
	}
	for name := range q {
		if !known[name] {
			return meltbook.MeltFilter{}, meltbook.Errorf(meltbook.Invalid, name, "%q is not a filter; the filters are %s", name, strings.Join(names, ", "))
		}
	}
	f, err := query.Parse(query.Terms(q), query.Options{Location: s.location})
	if err != nil {
		return f, err
	}
	f.Sort, f.Descending = meltbook.SortCreated, true
	if v := q.Get(paramSort); v != "" {
		f.Sort, f.Descending = meltbook.MeltSort(v), false
	}
	if v := q.Get(paramDesc); v != "" {
		f.Descending = v == "1" || v == "true"
	}
	f.Limit = PageSize
	if v := q.Get(paramPage); v != "" {
		n, err := strconv.Atoi(v)
		if err != nil || n < 1 {
			return f, meltbook.Errorf(meltbook.Invalid, paramPage, "%q is not a page number", v)
		}
		f.Offset = (n - 1) * PageSize
	}
	return f, f.Validate()
}

type filterInput struct {
	query.Field
	// Values as typed; one input each (at least one).
	Values []string
	Error  string
}

type runsPage struct {
	// Valid is set when the filters were understood and the search ran.
	Valid     bool
	Filters   []filterInput
	More      []filterInput
	MoreOpen  bool
	FormError string
	Rows      []meltbook.MeltSummary
	Total     int
	Scheme    string
	Columns   []column
	PageNo    int
	Pages     int
	Prev      string
	Next      string
	CSV       string
	JSON      string
	Filtered  bool
}

type column struct {
	Label string
	Href  string // sort link; empty when the column does not sort
	// Sorted is "ascending" or "descending" for the current sort column.
	Sorted string
}

func (s *Server) runs(w http.ResponseWriter, r *http.Request) {
	q := r.URL.Query()
	f, err := s.parseFind(q)
	p := runsPage{Filtered: len(query.Terms(q)) > 0}
	var found []meltbook.MeltSummary
	if err == nil {
		found, p.Total, err = s.nb.FindMelts(r.Context(), f)
	}
	errField, errMessage := "", ""
	if err != nil {
		var e *meltbook.Error
		if kindOf(err) != meltbook.Invalid || !errors.As(err, &e) {
			s.fail(w, r, err)
			return
		}
		errField, errMessage = e.Field, e.Message
	}
	placed := false
	for _, fd := range query.Fields() {
		in := filterInput{Field: fd, Values: q[fd.Name]}
		if len(in.Values) == 0 {
			in.Values = []string{""}
		}
		if fd.Name == errField {
			in.Error, placed = errMessage, true
		}
		if mainFilters[fd.Name] {
			p.Filters = append(p.Filters, in)
		} else {
			p.More = append(p.More, in)
			p.MoreOpen = p.MoreOpen || in.Error != "" || strings.Join(in.Values, "") != ""
		}
	}
	if err != nil {
		if !placed {
			p.FormError = err.Error()
		}
		s.render(w, r, http.StatusBadRequest, "runs", "Runs", p)
		return
	}
	p.Valid, p.Rows, p.Scheme = true, found, f.Scheme
	p.Columns = runColumns(q, f)
	p.PageNo = f.Offset/PageSize + 1
	p.Pages = max(1, (p.Total+PageSize-1)/PageSize)
	link := func(page int) string {
		v := cloneValues(q)
		v.Set(paramPage, strconv.Itoa(page))
		return "/runs?" + v.Encode()
	}
	if p.PageNo > 1 {
		p.Prev = link(p.PageNo - 1)
	}
	if p.PageNo < p.Pages {
		p.Next = link(p.PageNo + 1)
	}
	v := cloneValues(q)
	v.Del(paramPage)
	p.CSV = "/runs.csv?" + v.Encode()
	p.JSON = "/api/find?" + v.Encode()
	s.render(w, r, http.StatusOK, "runs", "Runs", p)
}

func cloneValues(q url.Values) url.Values {
	v := url.Values{}
	for k, vs := range q {
		if k != tokenParam {
			v[k] = append([]string(nil), vs...)
		}
	}
	return v
}

// runColumns builds the table header: clicking the sorted column reverses
// it; dates start newest first.
func runColumns(q url.Values, f meltbook.MeltFilter) []column {
	cols := []struct {
		label string
		key   meltbook.MeltSort
	}{
		{"Melt", meltbook.SortCode}, {"Made", meltbook.SortCreated}, {"Operator", ""}, {"Nominal composition (at.%)", ""},
		{"e/a (" + f.Scheme + ")", meltbook.SortEOverA}, {"Cooling rate", meltbook.SortCoolingRate}, {"Outcomes", ""},
	}
	out := make([]column, len(cols))
	for i, c := range cols {
		out[i].Label = c.label
		if c.key == "" {
			continue
		}
		v := cloneValues(q)
		v.Del(paramPage)
		v.Set(paramSort, string(c.key))
		v.Del(paramDesc)
		switch {
		case c.key == f.Sort && f.Descending:
			out[i].Sorted = "descending"
		case c.key == f.Sort:
			out[i].Sorted = "ascending"
			v.Set(paramDesc, "1")
		case c.key == meltbook.SortCreated:
			v.Set(paramDesc, "1")
		}
		out[i].Href = "/runs?" + v.Encode()
	}
	return out
}

// MaxExportRows caps a CSV export or an /api/find answer.
const MaxExportRows = 100_000

// findAll runs the query's search without paging, up to MaxExportRows.
func (s *Server) findAll(r *http.Request) ([]meltbook.MeltSummary, int, error) {
	f, err := s.parseFind(r.URL.Query())
	if err != nil {
		return nil, 0, err
	}
	f.Offset, f.Limit = 0, MaxExportRows
	return s.nb.FindMelts(r.Context(), f)
}

// runsCSV writes the search as the find command's CSV.
func (s *Server) runsCSV(w http.ResponseWriter, r *http.Request) {
	found, _, err := s.findAll(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	w.Header().Set("Content-Type", "text/csv; charset=utf-8")
	w.Header().Set("Content-Disposition", `attachment; filename="meltbook-melts.csv"`)
	if err := query.WriteCSV(w, query.Rows(found)); err != nil {
		s.log.Error("write CSV", "err", err)
	}
}

type runPage struct {
	Run *meltbook.MeltRecord
	// Scans of the melt's samples, by sample code.
	Scans map[string][]meltbook.ScanSummary
	// Focus is the sample code the page was opened for, if any.
	Focus string
	Note  noteForm
	// Outcome is the outcome form of the sample it names, as typed; the
	// other samples' forms start empty.
	Outcome outcomeForm
	// Author fills "recorded by" in fresh forms.
	Author string
	// PhaseKinds and Lattices fill the outcome form's choices.
	PhaseKinds []meltbook.PhaseKind
	Lattices   []string
	// Amend is the amend form as typed; AmendTargets and AmendNames fill
	// its choices.
	Amend        amendForm
	AmendTargets []amendTarget
	AmendNames   []string
	// Upload is the scan upload form of the sample it names, as typed;
	// CanUpload says whether the server takes uploads at all.
	Upload     scanForm
	CanUpload  bool
	Radiations []struct{ Value, Label string }
	Standards  []string
	// Logged is set on the page opened right after logging the melt.
	Logged bool
	// Cautions are the bench cautions for the melt's elements and its
	// process.
	Cautions []hazard.Caution
}

type outcomeForm struct {
	Sample, Kind, Lattice, Order, Name, Fraction, Evidence, By string
	Errors                                                     map[string]string
	Error                                                      string
}

type noteForm struct {
	Author, Sample, Text string
	Errors               map[string]string
	// Error is a message that belongs to no single field.
	Error string
}

// loadRun reads a melt's record and scans; code may name the melt or one
// of its samples, in which case focus is that sample.
// postedRun parses a form posted to a run's page and loads the run; on
// failure it has answered the request and returns false.
func (s *Server) postedRun(w http.ResponseWriter, r *http.Request) (runPage, bool) {
	if err := r.ParseForm(); err != nil {
		s.fail(w, r, bodyError(err))
		return runPage{}, false
	}
	p, err := s.loadRun(r, chi.URLParam(r, "code"))
	if err != nil {
		s.fail(w, r, err)
		return runPage{}, false
	}
	return p, true
}

func (s *Server) loadRun(r *http.Request, code string) (p runPage, err error) {
	rec, err := s.nb.MeltRecord(r.Context(), code)
	if kindOf(err) == meltbook.NotFound {
		melt, sampleErr := s.nb.SampleMelt(r.Context(), code)
		if kindOf(sampleErr) == meltbook.NotFound {
			return p, meltbook.Errorf(meltbook.NotFound, "code", "there is no melt or sample %s in the notebook", code)
		}
		if sampleErr != nil {
			return p, sampleErr
		}
		p.Focus = code
		rec, err = s.nb.MeltRecord(r.Context(), melt)
	}
	if err != nil {
		return p, err
	}
	p.Run = rec
	p.Author = s.cfg.Author
	p.PhaseKinds = meltbook.PhaseKinds
	p.Lattices = []string{"P", "I", "F"}
	p.Amend = amendForm{Target: "melt", By: s.cfg.Author}
	p.AmendTargets = amendTargets(rec)
	p.AmendNames = amendFieldNames()
	var elements []string
	for _, ef := range rec.Melt.Nominal {
		elements = append(elements, ef.Element)
	}
	p.Cautions = runCautions(elements)
	p.CanUpload, p.Radiations, p.Standards = s.cfg.AddScan != nil, scanRadiations, scanStandards
	scans, err := s.nb.MeltScans(r.Context(), rec.Melt.Code)
	if err != nil {
		return p, err
	}
	p.Scans = map[string][]meltbook.ScanSummary{}
	for _, sc := range scans {
		p.Scans[sc.SampleCode] = append(p.Scans[sc.SampleCode], sc)
	}
	return p, nil
}

func (s *Server) run(w http.ResponseWriter, r *http.Request) {
	p, err := s.loadRun(r, chi.URLParam(r, "code"))
	if err != nil {
		s.fail(w, r, err)
		return
	}
	p.Note = noteForm{Author: s.cfg.Author}
	p.Logged = r.URL.Query().Get("logged") == "1"
	s.render(w, r, http.StatusOK, "run", p.Run.Melt.Code, p)
}

// MaxNoteRunes is the longest note the form accepts.
const MaxNoteRunes = 20000

func (s *Server) addNote(w http.ResponseWriter, r *http.Request) {
	p, ok := s.postedRun(w, r)
	if !ok {
		return
	}
	melt := p.Run.Melt.Code
	form := noteForm{
		Author: strings.TrimSpace(r.PostForm.Get("author")),
		Sample: r.PostForm.Get("sample"),
		Text:   r.PostForm.Get("text"),
		Errors: map[string]string{},
	}
	if form.Author == "" {
		form.Errors["author"] = "Say who is writing the note."
	}
	switch n := utf8.RuneCountInString(strings.TrimSpace(form.Text)); {
	case n == 0:
		form.Errors["text"] = "The note is empty."
	case n > MaxNoteRunes:
		form.Errors["text"] = "The note has " + strconv.Itoa(n) + " characters; at most " + strconv.Itoa(MaxNoteRunes) + " fit."
	}
	target := melt
	if form.Sample != "" && form.Sample != melt {
		found := false
		for _, sr := range p.Run.Samples {
			found = found || sr.Code == form.Sample
		}
		if !found {
			form.Errors["sample"] = form.Sample + " is not a sample of " + melt + "."
		}
		target = form.Sample
	}
	if len(form.Errors) == 0 {
		_, err := s.nb.AddNote(r.Context(), form.Author, target, strings.TrimSpace(form.Text))
		if err == nil {
			http.Redirect(w, r, "/runs/"+url.PathEscape(melt)+"#notes", http.StatusSeeOther)
			return
		}
		var e *meltbook.Error
		if kind := kindOf(err); kind != meltbook.Invalid && kind != meltbook.Conflict || !errors.As(err, &e) {
			s.fail(w, r, err)
			return
		}
		switch e.Field {
		case "author", "text", "sample":
			form.Errors[e.Field] = e.Message
		default:
			form.Error = e.Error()
		}
		status, _ := statusOf(err, r)
		p.Note = form
		s.render(w, r, status, "run", melt, p)
		return
	}
	status, _ := statusOf(meltbook.Errorf(meltbook.Invalid, "", "note"), r)
	p.Note = form
	s.render(w, r, status, "run", melt, p)
}

// addOutcome records a person's outcome on one of the run's samples.
func (s *Server) addOutcome(w http.ResponseWriter, r *http.Request) {
	p, ok := s.postedRun(w, r)
	if !ok {
		return
	}
	melt := p.Run.Melt.Code
	pf := r.PostForm
	form := outcomeForm{
		Sample: pf.Get("sample"), Kind: pf.Get("kind"), Lattice: pf.Get("lattice"), Order: strings.TrimSpace(pf.Get("order")),
		Name: strings.TrimSpace(pf.Get("name")), Fraction: strings.TrimSpace(pf.Get("fraction")),
		Evidence: strings.TrimSpace(pf.Get("evidence")), By: strings.TrimSpace(pf.Get("by")), Errors: map[string]string{},
	}
	if !slices.ContainsFunc(p.Run.Samples, func(sr meltbook.SampleRecord) bool { return sr.Code == form.Sample }) {
		s.fail(w, r, meltbook.Errorf(meltbook.Invalid, "sample", "%q is not a sample of %s", form.Sample, melt))
		return
	}
	o := meltbook.Outcome{Kind: meltbook.PhaseKind(form.Kind), Lattice: form.Lattice, Order: form.Order, Name: form.Name,
		Evidence: form.Evidence, RecordedBy: form.By, Source: meltbook.ByPerson, Status: meltbook.Confirmed}
	if form.Fraction != "" {
		v, err := strconv.ParseFloat(strings.TrimSuffix(form.Fraction, "%"), 64)
		if err != nil || !(v >= 0 && v <= 100) {
			form.Errors["fraction"] = "Give the fraction in percent, 0 to 100, or leave it empty."
		} else {
			f := v / 100
			o.Fraction = &f
		}
	}
	var err error
	if len(form.Errors) == 0 {
		err = o.Validate()
		if err == nil {
			_, err = s.nb.AddOutcome(r.Context(), form.By, form.Sample, o)
			if err == nil {
				http.Redirect(w, r, "/runs/"+url.PathEscape(melt)+"#s-"+url.PathEscape(form.Sample), http.StatusSeeOther)
				return
			}
		}
		var e *meltbook.Error
		if kind := kindOf(err); kind != meltbook.Invalid && kind != meltbook.Conflict || !errors.As(err, &e) {
			s.fail(w, r, err)
			return
		}
		switch e.Field {
		case "kind", "lattice", "order", "name", "fraction", "by", "evidence":
			form.Errors[e.Field] = e.Message
		default:
			form.Error = e.Error()
		}
	}
	status, _ := statusOf(meltbook.Errorf(meltbook.Invalid, "", "outcome"), r)
	if len(form.Errors) == 0 {
		status, _ = statusOf(err, r)
	}
	p.Outcome, p.Focus = form, form.Sample
	p.Note = noteForm{Author: s.cfg.Author}
	s.render(w, r, status, "run", melt, p)
}

// decideProposal confirms or rejects an automatic proposal on one of the
// run's samples.
func (s *Server) decideProposal(w http.ResponseWriter, r *http.Request) {
	p, ok := s.postedRun(w, r)
	if !ok {
		return
	}
	id, err := strconv.ParseInt(chi.URLParam(r, "id"), 10, 64)
	var sample string
	for _, sr := range p.Run.Samples {
		for _, o := range sr.Outcomes {
			if o.ID == id && err == nil {
				sample = sr.Code
			}
		}
	}
	if sample == "" {
		s.fail(w, r, meltbook.Errorf(meltbook.NotFound, "outcome", "%s has no outcome %s", p.Run.Melt.Code, chi.URLParam(r, "id")))
		return
	}
	who, why := strings.TrimSpace(r.PostForm.Get("by")), strings.TrimSpace(r.PostForm.Get("why"))
	if who == "" {
		s.fail(w, r, meltbook.Errorf(meltbook.Invalid, "by", "say who decides the proposal"))
		return
	}
	switch r.PostForm.Get("decision") {
	case "confirm":
		err = s.nb.ConfirmProposal(r.Context(), who, id, why)
	case "reject":
		err = s.nb.RejectProposal(r.Context(), who, id, why)
	default:
		err = meltbook.Errorf(meltbook.Invalid, "decision", "choose confirm or reject")
	}
	if err != nil {
		s.fail(w, r, err)
		return
	}
	// A decision taken on a scan's page goes back there.
	if scan, err := strconv.ParseInt(r.PostForm.Get("scan"), 10, 64); err == nil && scan > 0 {
		http.Redirect(w, r, "/scans/"+strconv.FormatInt(scan, 10)+"#proposals", http.StatusSeeOther)
		return
	}
	http.Redirect(w, r, "/runs/"+url.PathEscape(p.Run.Melt.Code)+"#s-"+url.PathEscape(sample), http.StatusSeeOther)
}

type scanPage struct {
	Scan ScanView
	SVG  template.HTML
	// Peaks of the current indexing, for the table under the figure.
	Peaks []peakRow
	// Author fills "by" in the proposal decisions.
	Author string
}

// peakRow is one peak of the current indexing as the table lists it.
type peakRow struct {
	meltbook.Peak
	// Assigned is the phase letter and reflection, or the standard line;
	// empty when unexplained.
	Assigned string
}

func (s *Server) scan(w http.ResponseWriter, r *http.Request) {
	id, err := scanID(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	rec, err := s.nb.ScanRecord(r.Context(), id)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	sv := scanView(rec)
	pp := plot.PatternPlot{Title: sv.Scan.SampleCode + " · " + sv.Scan.FileName, Pattern: sv.Pattern}
	svg, err := pp.SVG()
	if err != nil {
		s.fail(w, r, err)
		return
	}
	p := scanPage{Scan: sv, SVG: template.HTML(svg), Author: s.cfg.Author}
	if sv.Current != nil {
		labels := peakLabels(sv.Current)
		for i, pk := range sv.Current.Peaks {
			p.Peaks = append(p.Peaks, peakRow{Peak: pk, Assigned: labels[i]})
		}
	}
	// The SVG is built by plot from numbers and escaped text.
	s.render(w, r, http.StatusOK, "scan", sv.Scan.SampleCode+" · "+sv.Scan.FileName, p)
}

func scanID(r *http.Request) (int64, error) {
	v := chi.URLParam(r, "id")
	id, err := strconv.ParseInt(v, 10, 64)
	if err != nil || id < 1 {
		return 0, meltbook.Errorf(meltbook.Invalid, "id", "%q is not a scan number", v)
	}
	return id, nil
}

// finite reports whether v is an ordinary number.
func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

package web

import (
	"encoding/csv"
	"errors"
	"html/template"
	"math"
	"net/http"
	"net/url"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/go-chi/chi/v5"

	"meltbook"
	"meltbook/web/plot"
)

// PageSize is the number of rows on one page of the run table.
const PageSize = 50

type overviewPage struct {
	Summary Summary
	Classes []classCount
	Mapped  int
}

type classCount struct {
	Class plot.Class
	Count int
	// Href lists the class's runs when the find vocabulary can say so.
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
	hasOutcomeFilter := false
	for _, f := range s.nb.FilterFields() {
		hasOutcomeFilter = hasOutcomeFilter || f.Name == "outcome"
	}
	p := overviewPage{Summary: sum, Mapped: len(samples)}
	for _, c := range plot.Classes {
		cc := classCount{Class: c, Count: counts[c]}
		// Only classes that are one phase kind have a find term.
		switch c {
		case plot.ClassIcosahedral, plot.ClassDecagonal, plot.ClassApproximant, plot.ClassAmorphous:
			if hasOutcomeFilter {
				cc.Href = "/runs?outcome=" + url.QueryEscape(c.Slug())
			}
		}
		p.Classes = append(p.Classes, cc)
	}
	s.render(w, r, http.StatusOK, "overview", "Notebook", p)
}

// reservedParams are query parameters of the run table that are not filters.
var reservedParams = map[string]bool{"sort": true, "desc": true, "page": true, tokenParam: true}

// parseRunQuery reads filters, sort order and page from a query. Unknown
// parameters are errors so that a mistyped filter is not silently ignored.
func (s *Server) parseRunQuery(q url.Values) (RunQuery, []filterInput, error) {
	fields := s.nb.FilterFields()
	known := map[string]bool{}
	inputs := make([]filterInput, len(fields))
	rq := RunQuery{Sort: SortCreated, Descending: true, Limit: PageSize}
	for i, f := range fields {
		known[f.Name] = true
		inputs[i] = filterInput{FilterField: f, Value: q.Get(f.Name)}
		for _, v := range q[f.Name] {
			if v = strings.TrimSpace(v); v != "" {
				rq.Filters = append(rq.Filters, FilterTerm{Name: f.Name, Value: v})
			}
		}
	}
	for name := range q {
		if !known[name] && !reservedParams[name] {
			return rq, inputs, meltbook.Errorf(meltbook.Invalid, name, "%q is not a filter; the filters are %s", name, filterNames(fields))
		}
	}
	if v := q.Get("sort"); v != "" {
		switch v {
		case SortCreated, SortSample, SortMelt, SortEA, SortRate, SortOutcome:
			rq.Sort = v
			rq.Descending = false
		default:
			return rq, inputs, meltbook.Errorf(meltbook.Invalid, "sort", "cannot sort by %q; choose created, sample, melt, ea, rate or outcome", v)
		}
	}
	if v := q.Get("desc"); v != "" {
		rq.Descending = v == "1" || v == "true"
	}
	if v := q.Get("page"); v != "" {
		n, err := strconv.Atoi(v)
		if err != nil || n < 1 {
			return rq, inputs, meltbook.Errorf(meltbook.Invalid, "page", "%q is not a page number", v)
		}
		rq.Offset = (n - 1) * PageSize
	}
	return rq, inputs, nil
}

func filterNames(fields []FilterField) string {
	names := make([]string, len(fields))
	for i, f := range fields {
		names[i] = f.Name
	}
	return strings.Join(names, ", ")
}

type filterInput struct {
	FilterField
	Value string
	Error string
}

type runsPage struct {
	// Valid is set when the filters were understood and the search ran.
	Valid     bool
	Filters   []filterInput
	FormError string
	Result    RunPage
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
	rq, inputs, err := s.parseRunQuery(q)
	p := runsPage{Filters: inputs, Filtered: len(rq.Filters) > 0}
	if err == nil {
		p.Result, err = s.nb.FindRuns(r.Context(), rq)
	}
	if err != nil {
		if kindOf(err) != meltbook.Invalid {
			s.fail(w, r, err)
			return
		}
		// Say what is wrong next to the filter at fault.
		var e *meltbook.Error
		if !errors.As(err, &e) {
			s.fail(w, r, err)
			return
		}
		placed := false
		for i := range p.Filters {
			if p.Filters[i].Name == e.Field {
				p.Filters[i].Error, placed = e.Message, true
			}
		}
		if !placed {
			p.FormError = e.Error()
		}
		s.render(w, r, http.StatusBadRequest, "runs", "Runs", p)
		return
	}
	p.Valid = true
	p.Columns = runColumns(q, rq)
	p.PageNo = rq.Offset/PageSize + 1
	p.Pages = max(1, (p.Result.Total+PageSize-1)/PageSize)
	link := func(page int) string {
		v := cloneValues(q)
		v.Set("page", strconv.Itoa(page))
		return "/runs?" + v.Encode()
	}
	if p.PageNo > 1 {
		p.Prev = link(p.PageNo - 1)
	}
	if p.PageNo < p.Pages {
		p.Next = link(p.PageNo + 1)
	}
	v := cloneValues(q)
	v.Del("page")
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

// runColumns builds the table header: clicking a sorted column reverses it.
func runColumns(q url.Values, rq RunQuery) []column {
	cols := []struct{ label, key string }{
		{"Sample", SortSample}, {"Melt", SortMelt}, {"Made", SortCreated}, {"Composition (at.%)", ""},
		{"Treatment", ""}, {"Cooling rate", SortRate}, {"e/a", SortEA}, {"Outcome", SortOutcome},
	}
	out := make([]column, len(cols))
	for i, c := range cols {
		out[i].Label = c.label
		if c.key == "" {
			continue
		}
		v := cloneValues(q)
		v.Del("page")
		v.Set("sort", c.key)
		v.Del("desc")
		if c.key == rq.Sort {
			if rq.Descending {
				out[i].Sorted = "descending"
			} else {
				out[i].Sorted = "ascending"
				v.Set("desc", "1")
			}
		} else if c.key == SortCreated {
			v.Set("desc", "1")
		}
		out[i].Href = "/runs?" + v.Encode()
	}
	return out
}

// allRuns pages through every row matching rq, up to limit rows.
func (s *Server) allRuns(r *http.Request, rq RunQuery, limit int) (RunPage, error) {
	var all RunPage
	rq.Offset, rq.Limit = 0, MaxPageSize
	for {
		page, err := s.nb.FindRuns(r.Context(), rq)
		if err != nil {
			return all, err
		}
		all.Total = page.Total
		all.Runs = append(all.Runs, page.Runs...)
		if len(page.Runs) == 0 || len(all.Runs) >= page.Total || len(all.Runs) >= limit {
			return all, nil
		}
		rq.Offset += len(page.Runs)
	}
}

// MaxExportRows caps a CSV export or /api/find answer.
const MaxExportRows = 100_000

func (s *Server) runsCSV(w http.ResponseWriter, r *http.Request) {
	rq, _, err := s.parseRunQuery(r.URL.Query())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	all, err := s.allRuns(r, rq, MaxExportRows)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	w.Header().Set("Content-Type", "text/csv; charset=utf-8")
	w.Header().Set("Content-Disposition", `attachment; filename="meltbook-runs.csv"`)
	cw := csv.NewWriter(w)
	cw.Write([]string{"sample", "melt", "made", "operator", "composition_at_pct", "composition_basis", "treatment", "cooling_rate_K_per_s", "ea", "outcome_class", "outcomes"})
	for _, row := range all.Runs {
		basis := "nominal"
		if row.Measured {
			basis = "measured"
		}
		rate, ea := "", ""
		if row.CoolingRateKPerS != nil {
			rate = strconv.FormatFloat(*row.CoolingRateKPerS, 'g', 4, 64)
		}
		if row.ElectronsPerAtom != nil {
			ea = strconv.FormatFloat(*row.ElectronsPerAtom, 'f', 3, 64)
		}
		outcomes := make([]string, len(row.Outcomes))
		for i, o := range row.Outcomes {
			outcomes[i] = outcomeText(o)
		}
		cw.Write([]string{
			cell(row.Sample), cell(row.Melt), row.CreatedAt.Format("2006-01-02T15:04:05Z07:00"), cell(row.Operator),
			plot.FormatComposition(row.Composition), basis, cell(row.Treatment), rate, ea,
			plot.ClassOf(row.Outcomes).Slug(), cell(strings.Join(outcomes, "; ")),
		})
	}
	cw.Flush()
}

// cell guards a text cell against being read as a formula by a spreadsheet:
// one starting with =, +, -, @, tab or carriage return gets a leading
// apostrophe (common practice, OWASP "CSV injection").
func cell(s string) string {
	if s != "" && strings.ContainsRune("=+-@\t\r", rune(s[0])) {
		return "'" + s
	}
	return s
}

type runPage struct {
	Run RunDetail
	// Focus is the sample code the page was opened for, if any.
	Focus string
	Note  noteForm
}

type noteForm struct {
	Author, Sample, Text string
	Errors               map[string]string
	// Error is a message that belongs to no single field.
	Error string
}

func (s *Server) run(w http.ResponseWriter, r *http.Request) {
	code := chi.URLParam(r, "code")
	d, err := s.nb.Run(r.Context(), code)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	p := runPage{Run: d, Note: noteForm{Author: s.cfg.Author}}
	if code != d.Melt.Code {
		p.Focus = code
	}
	s.render(w, r, http.StatusOK, "run", d.Melt.Code, p)
}

// MaxNoteRunes is the longest note the form accepts.
const MaxNoteRunes = 20000

func (s *Server) addNote(w http.ResponseWriter, r *http.Request) {
	code := chi.URLParam(r, "code")
	if err := r.ParseForm(); err != nil {
		s.fail(w, r, bodyError(err))
		return
	}
	d, err := s.nb.Run(r.Context(), code)
	if err != nil {
		s.fail(w, r, err)
		return
	}
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
	if form.Sample != "" {
		found := false
		for _, sd := range d.Samples {
			found = found || sd.Sample.Code == form.Sample
		}
		if !found {
			form.Errors["sample"] = form.Sample + " is not a sample of " + d.Melt.Code + "."
		}
	}
	if len(form.Errors) == 0 {
		_, err = s.nb.AddNote(r.Context(), d.Melt.Code, meltbook.Note{Author: form.Author, SampleCode: form.Sample, Text: strings.TrimSpace(form.Text)})
		if err == nil {
			http.Redirect(w, r, "/runs/"+url.PathEscape(d.Melt.Code)+"#notes", http.StatusSeeOther)
			return
		}
		var e *meltbook.Error
		if kindOf(err) != meltbook.Invalid || !errors.As(err, &e) {
			s.fail(w, r, err)
			return
		}
		switch e.Field {
		case "author", "text", "sample":
			form.Errors[e.Field] = e.Message
		default:
			form.Error = e.Error()
		}
	}
	status, _ := statusOf(meltbook.Errorf(meltbook.Invalid, "", ""), r)
	s.render(w, r, status, "run", d.Melt.Code, runPage{Run: d, Note: form})
}

type scanPage struct {
	Scan ScanView
	SVG  template.HTML
}

func (s *Server) scan(w http.ResponseWriter, r *http.Request) {
	id, err := scanID(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	sv, err := s.nb.Scan(r.Context(), id)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	pp := plot.PatternPlot{Title: sv.Sample + " · " + sv.Name, Pattern: sv.Pattern}
	svg, err := pp.SVG()
	if err != nil {
		s.fail(w, r, err)
		return
	}
	// The SVG is built by plot from numbers and escaped text.
	s.render(w, r, http.StatusOK, "scan", sv.Sample+" · "+sv.Name, scanPage{Scan: sv, SVG: template.HTML(svg)})
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

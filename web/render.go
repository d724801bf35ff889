package web

import (
	"bytes"
	"crypto/sha256"
	"embed"
	"encoding/hex"
	"fmt"
	"html/template"
	"io/fs"
	"math"
	"mime"
	"net/http"
	"path"
	"strconv"
	"strings"
	"sync"
	"time"
	"unicode"
	"unicode/utf8"

	"github.com/go-chi/chi/v5"

	"meltbook"
	"meltbook/analysis/quantity"
	"meltbook/web/plot"
)

//go:embed templates/*.html
var templateFiles embed.FS

//go:embed static
var staticFiles embed.FS

// pages holds the parsed templates, one set per page, and the static
// assets with their content hashes.
type pages struct {
	byName map[string]*template.Template
	assets map[string]asset
}

type asset struct {
	body        []byte
	hash        string
	contentType string
}

// view is what every page template receives.
type view struct {
	Title   string
	Section string
	// FormKey goes in every form as the hidden field form_key.
	FormKey string
	Page    any
}

func loadPages() (*pages, error) {
	p := &pages{byName: map[string]*template.Template{}, assets: map[string]asset{}}
	err := fs.WalkDir(staticFiles, "static", func(name string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		body, err := staticFiles.ReadFile(name)
		if err != nil {
			return err
		}
		sum := sha256.Sum256(body)
		ct := mime.TypeByExtension(path.Ext(name))
		if ct == "" {
			ct = "application/octet-stream"
		}
		p.assets[path.Base(name)] = asset{body: body, hash: hex.EncodeToString(sum[:6]), contentType: ct}
		return nil
	})
	if err != nil {
		return nil, fmt.Errorf("web: read assets: %w", err)
	}
	funcs := template.FuncMap{
		"asset": func(name string) (string, error) {
			a, ok := p.assets[name]
			if !ok {
				return "", fmt.Errorf("no asset %q", name)
			}
			return "/static/" + name + "?v=" + a.hash, nil
		},
		"formula":     formulaHTML,
		"date":        func(t time.Time) string { return formatDate(t) },
		"datetime":    func(t time.Time) string { return formatDateTime(t) },
		"ea":          formatEA,
		"rate":        formatRate,
		"classMark":   classMark,
		"classOf":     plot.ClassOf,
		"outcomeText": outcomeText,
		"param":       formatParam,
		"grams":       func(g float64) string { return strconv.FormatFloat(g, 'f', -1, 64) + " g" },
		"percent":     func(f float64) string { return strconv.FormatFloat(100*f, 'f', 1, 64) + " %" },
		"deref":       func(v *float64) float64 { return *v },
		"massLoss": func(m meltbook.Melt) string {
			if loss, ok := m.MassLossGrams(); ok {
				return strconv.FormatFloat(loss, 'f', 3, 64) + " g"
			}
			return ""
		},
		"blankOutcome":  func() outcomeForm { return outcomeForm{} },
		"deg":           func(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) },
		"chance":        chanceText,
		"phaseLetter":   phaseLetter,
		"radiationText": radiationText,
		"sentence":      sentence,
		"cornerField": func(name, label, value string, errs map[string]string) cornerInput {
			return cornerInput{Name: name, Label: label, Value: value, Error: errs[name]}
		},
	}
	names, err := fs.Glob(templateFiles, "templates/*.html")
	if err != nil {
		return nil, err
	}
	for _, name := range names {
		base := strings.TrimSuffix(path.Base(name), ".html")
		if base == "layout" || base == "partials" {
			continue
		}
		t, err := template.New("layout").Funcs(funcs).ParseFS(templateFiles, "templates/layout.html", "templates/partials.html", name)
		if err != nil {
			return nil, fmt.Errorf("web: parse %s: %w", name, err)
		}
		p.byName[base] = t
	}
	return p, nil
}

// cornerInput is one corner field of the map form.
type cornerInput struct{ Name, Label, Value, Error string }

// render writes page name with data, or a 500 page if the template fails;
// the page is built in memory first so that a failure never leaves half a
// page.
func (s *Server) render(w http.ResponseWriter, r *http.Request, status int, name, title string, data any) {
	t, ok := s.pages.byName[name]
	if !ok {
		s.log.Error("no such page template", "name", name)
		http.Error(w, "meltbook: no page template "+name, http.StatusInternalServerError)
		return
	}
	buf := pageBuffers.Get().(*bytes.Buffer)
	buf.Reset()
	defer pageBuffers.Put(buf)
	v := view{Title: title, Section: name, FormKey: formKeyOf(r), Page: data}
	if err := t.ExecuteTemplate(buf, "layout", v); err != nil {
		s.log.Error("render page", "name", name, "err", err)
		if name != "error" {
			s.fail(w, r, fmt.Errorf("render %s: %w", name, err))
			return
		}
		http.Error(w, "meltbook: the error page failed to render", http.StatusInternalServerError)
		return
	}
	w.Header().Set("Content-Type", "text/html; charset=utf-8")
	w.WriteHeader(status)
	w.Write(buf.Bytes())
}

// pageBuffers keeps page buffers between requests: a map page of many
// samples is most of a megabyte.
var pageBuffers = sync.Pool{New: func() any { return new(bytes.Buffer) }}

// serveAsset serves an embedded file. With the current ?v= hash it may be
// cached for good; otherwise it must be checked again.
func (s *Server) serveAsset(w http.ResponseWriter, r *http.Request) {
	a, ok := s.pages.assets[chi.URLParam(r, "name")]
	if !ok {
		s.fail(w, r, meltbook.Errorf(meltbook.NotFound, "", "There is no file %s.", r.URL.Path))
		return
	}
	if r.URL.Query().Get("v") == a.hash {
		w.Header().Set("Cache-Control", "public, max-age=31536000, immutable")
	} else {
		w.Header().Set("Cache-Control", "no-cache")
	}
	w.Header().Set("Content-Type", a.contentType)
	w.Header().Set("ETag", `"`+a.hash+`"`)
	if r.Header.Get("If-None-Match") == `"`+a.hash+`"` {
		w.WriteHeader(http.StatusNotModified)
		return
	}
	w.Write(a.body)
}

// formulaHTML writes a composition in at.% with subscripts: Al₆₃Cu₂₅Fe₁₂.
func formulaHTML(comp []meltbook.ElementFraction) template.HTML {
	var b strings.Builder
	for _, ef := range comp {
		b.WriteString(template.HTMLEscapeString(ef.Element))
		b.WriteString("<sub>")
		b.WriteString(strconv.FormatFloat(math.Round(ef.Fraction*1000)/10, 'f', -1, 64))
		b.WriteString("</sub>")
	}
	return template.HTML(b.String())
}

func formatDate(t time.Time) string {
	if t.IsZero() {
		return "—"
	}
	return t.Local().Format("2006-01-02")
}

func formatDateTime(t time.Time) string {
	if t.IsZero() {
		return "—"
	}
	return t.Local().Format("2006-01-02 15:04")
}

// formatEA writes e/a with two decimals, "—" when unknown.
func formatEA(v *float64) string {
	if v == nil || math.IsNaN(*v) {
		return "—"
	}
	return strconv.FormatFloat(*v, 'f', 2, 64)
}

// formatRate writes a cooling rate as "3.2 × 10⁵ K/s", "—" when unknown.
func formatRate(v *float64) string {
	if v == nil || !(*v > 0) {
		return "—"
	}
	return scientific(*v) + " K/s"
}

// scientific writes v as "m × 10ⁿ" with two significant digits.
func scientific(v float64) string {
	exp := math.Floor(math.Log10(v))
	m := v / math.Pow(10, exp)
	if math.Round(m*10)/10 >= 10 {
		m /= 10
		exp++
	}
	sup := strings.NewReplacer("-", "⁻", "0", "⁰", "1", "¹", "2", "²", "3", "³", "4", "⁴", "5", "⁵", "6", "⁶", "7", "⁷", "8", "⁸", "9", "⁹")
	return strconv.FormatFloat(m, 'f', 1, 64) + " × 10" + sup.Replace(strconv.Itoa(int(exp)))
}

// classMark draws a class's marker as a small inline SVG for tables and
// legends.
func classMark(c plot.Class) template.HTML {
	return template.HTML(`<svg class="mark" viewBox="-7 -7 14 14" width="14" height="14" aria-hidden="true">` + plot.MarkerPath(c) + `</svg>`)
}

// outcomeText names one outcome for a table: "icosahedral (F), 60 %",
// "approximant 1/1", "crystalline λ-Al13Fe4".
func outcomeText(o meltbook.Outcome) string {
	s := string(o.Kind)
	switch {
	case o.Kind == meltbook.Approximant && o.Order != "":
		s += " " + o.Order
	case o.Kind == meltbook.Crystalline && o.Name != "":
		s = o.Name
	}
	if o.Lattice != "" {
		s += " (" + o.Lattice + ")"
	}
	if o.Fraction != nil {
		s += fmt.Sprintf(", %.0f %%", 100**o.Fraction)
	}
	switch {
	case o.Source == meltbook.ByAutomatic && o.Status == meltbook.Proposed:
		s += " — proposed, not yet confirmed"
	case o.Status == meltbook.Rejected:
		s += " — rejected"
	}
	return s
}

// paramDimension links the notebook's parameter dimensions to the units
// package, which formats a value in the unit it was entered in.
var paramDimension = map[meltbook.Dimension]quantity.Dimension{
	meltbook.Length:      quantity.Length,
	meltbook.Speed:       quantity.Speed,
	meltbook.Pressure:    quantity.Pressure,
	meltbook.Temperature: quantity.Temperature,
	meltbook.Duration:    quantity.Time,
	meltbook.Mass:        quantity.Mass,
}

// formatParam shows a step parameter as it was entered: "25 m/s",
// "1250 °C", "Ar".
func formatParam(kind meltbook.StepKind, p meltbook.Param) string {
	var spec *meltbook.ParamSpec
	for i, sp := range meltbook.StepParams[kind] {
		if sp.Name == p.Name {
			spec = &meltbook.StepParams[kind][i]
		}
	}
	if spec == nil || spec.Dimension == meltbook.Text {
		return p.Text
	}
	if d, ok := paramDimension[spec.Dimension]; ok {
		unit := p.Unit
		if unit == "" {
			unit = spec.DisplayUnit
		}
		if s, err := quantity.Format(quantity.Value{SI: p.SI, Dimension: d}, unit); err == nil {
			return s
		}
		return fmt.Sprintf("%g %s", p.SI, d.SIUnit())
	}
	switch spec.Dimension {
	case meltbook.CoolingRate:
		return formatRate(&p.SI)
	case meltbook.Current:
		return strconv.FormatFloat(p.SI, 'f', -1, 64) + " A"
	}
	return strconv.FormatFloat(p.SI, 'f', -1, 64)
}

// sentence starts a message with a capital letter and ends it with a
// full stop: the store's messages are written to follow a colon.
func sentence(s string) string {
	s = strings.TrimSpace(s)
	if s == "" {
		return s
	}
	r, n := utf8.DecodeRuneInString(s)
	s = string(unicode.ToUpper(r)) + s[n:]
	if !strings.HasSuffix(s, ".") && !strings.HasSuffix(s, "?") && !strings.HasSuffix(s, "!") {
		s += "."
	}
	return s
}

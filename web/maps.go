package web

import (
	"fmt"
	"html/template"
	"math"
	"net/http"
	"net/url"
	"sort"
	"strconv"
	"strings"

	"meltbook"
	"meltbook/analysis/element"
	"meltbook/store"
	"meltbook/web/plot"
)

// mapGridDivisions is the isoline grid: 48 divisions per side, about
// 2 at.% per cell, fine enough for curved fields and cheap to compute.
const mapGridDivisions = 48

// mapControls are the map settings as typed, with a message per field
// that is wrong. Field names are the query parameters.
type mapControls struct {
	A, B, C   string
	Scheme    string
	RateMin   string // K/s
	RateMax   string
	Treatment string // "", "as-spun" or "annealed"
	Outside   string // largest share outside the corners, at.%
	EAStep    string // spacing of e/a lines; empty for automatic
	Errors    map[string]string
}

func (c *mapControls) fail(field, format string, args ...any) {
	if c.Errors == nil {
		c.Errors = map[string]string{}
	}
	if _, ok := c.Errors[field]; !ok {
		c.Errors[field] = fmt.Sprintf(format, args...)
	}
}

// firstError returns one field error as a *meltbook.Error, in form order.
func (c *mapControls) firstError() error {
	for _, f := range []string{"a", "b", "c", "scheme", "treatment", "rate-min", "rate-max", "outside", "ea-step"} {
		if m, ok := c.Errors[f]; ok {
			return meltbook.Errorf(meltbook.Invalid, f, "%s", m)
		}
	}
	return nil
}

// sampleFilter is the parsed selection shared by the composition and
// descriptor maps.
type sampleFilter struct {
	scheme      *element.Scheme
	treatment   string
	rateLo      float64 // K/s; 0 for none
	rateHi      float64 // K/s; +Inf for none
	rateLimited bool
	outside     float64 // fraction
	eaStep      float64 // 0 for automatic
	triangle    plot.Triangle
	hasTriangle bool
}

// readControls parses the settings common to both kinds of map; corners
// are read only when withCorners is set.
func (s *Server) readControls(q url.Values, samples []store.MapSample, withCorners bool) (mapControls, sampleFilter) {
	c := mapControls{
		A: q.Get("a"), B: q.Get("b"), C: q.Get("c"),
		Scheme: q.Get("scheme"), RateMin: q.Get("rate-min"), RateMax: q.Get("rate-max"),
		Treatment: q.Get("treatment"), Outside: q.Get("outside"), EAStep: q.Get("ea-step"),
	}
	f := sampleFilter{rateHi: math.Inf(1), outside: plot.DefaultMaxIgnored}

	if len(s.cfg.Schemes) > 0 {
		f.scheme = &s.cfg.Schemes[0]
		if c.Scheme != "" {
			f.scheme = nil
			for i := range s.cfg.Schemes {
				if s.cfg.Schemes[i].Name == c.Scheme {
					f.scheme = &s.cfg.Schemes[i]
				}
			}
			if f.scheme == nil {
				c.fail("scheme", "%q is not a valence scheme here", c.Scheme)
			}
		}
		if f.scheme != nil {
			c.Scheme = f.scheme.Name
		}
	}
	switch c.Treatment {
	case "", "as-spun", "annealed":
		f.treatment = c.Treatment
	default:
		c.fail("treatment", "choose as-spun, annealed or both")
	}
	readRate := func(field, typed string) (float64, bool) {
		typed = strings.TrimSpace(typed)
		if typed == "" {
			return 0, false
		}
		v, err := strconv.ParseFloat(typed, 64)
		if err != nil || !(v > 0) || math.IsInf(v, 0) {
			c.fail(field, "write a positive number of K/s, e.g. 1e5")
			return 0, false
		}
		return v, true
	}
	if v, ok := readRate("rate-min", c.RateMin); ok {
		f.rateLo, f.rateLimited = v, true
	}
	if v, ok := readRate("rate-max", c.RateMax); ok {
		f.rateHi, f.rateLimited = v, true
	}
	if f.rateLo > f.rateHi {
		c.fail("rate-max", "the upper end is below the lower one")
	}
	if t := strings.TrimSpace(c.Outside); t != "" {
		v, err := strconv.ParseFloat(t, 64)
		if err != nil || !(v >= 0 && v <= 100) {
			c.fail("outside", "write a share between 0 and 100 at.%%")
		} else {
			f.outside = v / 100
		}
	} else {
		c.Outside = strconv.FormatFloat(100*plot.DefaultMaxIgnored, 'f', -1, 64)
	}
	if t := strings.TrimSpace(c.EAStep); t != "" {
		v, err := strconv.ParseFloat(t, 64)
		if err != nil || !(v >= 0.005) || v > 10 {
			c.fail("ea-step", "write a spacing between 0.005 and 10, or leave it empty")
		} else {
			f.eaStep = v
		}
	}
	if !withCorners {
		return c, f
	}
	if c.A == "" && c.B == "" && c.C == "" {
		if systems := systemTriangles(samples, f.outside); len(systems) > 0 {
			c.A, c.B, c.C = systems[0].Corners[0], systems[0].Corners[1], systems[0].Corners[2]
		} else {
			corners := commonElements(samples, 3)
			if len(corners) < 3 {
				c.fail("a", "the notebook holds fewer than three elements; a ternary map needs three corners")
				return c, f
			}
			c.A, c.B, c.C = corners[0], corners[1], corners[2]
		}
	}
	var corners [3]plot.Corner
	ok := true
	for i, typed := range []string{c.A, c.B, c.C} {
		field := string(rune('a' + i))
		corner, err := plot.ParseCorner(typed)
		if err != nil {
			c.fail(field, "%v", err)
			ok = false
			continue
		}
		for _, e := range corner.Elements {
			if _, known := element.BySymbol(e); !known {
				c.fail(field, "%s is not an element", e)
				ok = false
			}
		}
		corners[i] = corner
	}
	if ok {
		tri, err := plot.NewTriangle(corners[0], corners[1], corners[2])
		if err != nil {
			c.fail("c", "%v", err)
		} else {
			f.triangle, f.hasTriangle = tri, true
		}
	}
	return c, f
}

// systemTriangle is a ternary map that draws many of the samples.
type systemTriangle struct {
	Corners [3]string
	// Samples is how many samples the map draws.
	Samples int
}

// maxSystemTriangles caps the triangles systemTriangles weighs.
const maxSystemTriangles = 12

// systemTriangles proposes single-element corners for the notebook's
// alloy systems: each sample's three largest elements make a candidate,
// the most frequent candidates are counted over every sample (one is drawn
// when at most outside of it lies beyond the corners), and the corners of
// each are ordered by their summed fraction over the samples drawn, the
// major element first. Most samples drawn first.
func systemTriangles(samples []store.MapSample, outside float64) []systemTriangle {
	type key [3]string
	freq := map[key]int{}
	for i := range samples {
		c := samples[i].Composition
		if len(c) < 3 {
			continue
		}
		// The three largest fractions, first listed first among equals.
		var top [3]int
		for j := range top {
			top[j] = -1
		}
		for j, ef := range c {
			for r := range top {
				if top[r] < 0 || ef.Fraction > c[top[r]].Fraction {
					copy(top[r+1:], top[r:2])
					top[r] = j
					break
				}
			}
		}
		k := key{c[top[0]].Element, c[top[1]].Element, c[top[2]].Element}
		sort.Strings(k[:])
		freq[k]++
	}
	keys := make([]key, 0, len(freq))
	for k := range freq {
		keys = append(keys, k)
	}
	sort.Slice(keys, func(i, j int) bool {
		if freq[keys[i]] != freq[keys[j]] {
			return freq[keys[i]] > freq[keys[j]]
		}
		return strings.Join(keys[i][:], "") < strings.Join(keys[j][:], "")
	})
	if len(keys) > maxSystemTriangles {
		keys = keys[:maxSystemTriangles]
	}
	var out []systemTriangle
	for _, k := range keys {
		sum := map[string]float64{}
		n := 0
		for i := range samples {
			var in, all float64
			for _, ef := range samples[i].Composition {
				all += ef.Fraction
				if ef.Element == k[0] || ef.Element == k[1] || ef.Element == k[2] {
					in += ef.Fraction
				}
			}
			if !(in > 0) || all-in > outside*all+1e-12 {
				continue
			}
			n++
			for _, ef := range samples[i].Composition {
				sum[ef.Element] += ef.Fraction / all
			}
		}
		if n == 0 {
			continue
		}
		corners := k
		sort.SliceStable(corners[:], func(i, j int) bool { return sum[corners[i]] > sum[corners[j]] })
		out = append(out, systemTriangle{Corners: corners, Samples: n})
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].Samples > out[j].Samples })
	return out
}

// commonElements returns the n elements with the largest summed fraction
// over the samples, most common first.
func commonElements(samples []store.MapSample, n int) []string {
	sum := map[string]float64{}
	for _, m := range samples {
		for _, ef := range m.Composition {
			sum[ef.Element] += ef.Fraction
		}
	}
	names := make([]string, 0, len(sum))
	for e := range sum {
		names = append(names, e)
	}
	sort.Slice(names, func(i, j int) bool {
		if sum[names[i]] != sum[names[j]] {
			return sum[names[i]] > sum[names[j]]
		}
		return names[i] < names[j]
	})
	if len(names) > n {
		names = names[:n]
	}
	return names
}

// selectCounts says why samples are not on a map.
type selectCounts struct {
	Total        int `json:"total"`
	Shown        int `json:"shown"`
	Treatment    int `json:"other_treatment"`
	NoRate       int `json:"no_cooling_rate"`
	OutsideRange int `json:"cooling_rate_outside_range"`
	NoCorner     int `json:"no_corner_element"`
	Outside      int `json:"too_much_outside_corners"`
}

// keep applies the treatment and cooling-rate filters.
func (f *sampleFilter) keep(m *store.MapSample, n *selectCounts) bool {
	switch {
	case f.treatment == "as-spun" && m.Annealed, f.treatment == "annealed" && !m.Annealed:
		n.Treatment++
		return false
	}
	if f.rateLimited {
		if m.CoolingRateKPerS == nil {
			n.NoRate++
			return false
		}
		if r := *m.CoolingRateKPerS; r < f.rateLo || r > f.rateHi {
			n.OutsideRange++
			return false
		}
	}
	return true
}

func (f *sampleFilter) ea(comp []meltbook.ElementFraction) float64 {
	if f.scheme == nil {
		return math.NaN()
	}
	v, err := plot.ElectronsPerAtom(comp, f.scheme.Valence)
	if err != nil {
		return math.NaN()
	}
	return v
}

// mapPoint is one sample on the composition map, as /api/map gives it.
type mapPoint struct {
	Code        string                     `json:"code"`
	Melt        string                     `json:"melt"`
	Class       string                     `json:"class"`
	Ternary     plot.Ternary               `json:"ternary"`
	Ignored     float64                    `json:"ignored"`
	EA          *float64                   `json:"ea"`
	Composition []meltbook.ElementFraction `json:"composition"`
	Measured    bool                       `json:"measured"`
}

// compositionMapData is a composition map worked out: the page, the SVG
// download and /api/map all come from it.
type compositionMapData struct {
	Controls       mapControls                   `json:"-"`
	Corners        [3]string                     `json:"corners"`
	Scheme         string                        `json:"scheme,omitempty"`
	ShareRule      plot.ShareRule                `json:"share_rule"`
	Shares         [3][]meltbook.ElementFraction `json:"shares"`
	CornerValences *[3]float64                   `json:"corner_valences,omitempty"`
	// LinesNote says why there are no e/a lines, when there are none.
	LinesNote string         `json:"lines_note,omitempty"`
	Counts    selectCounts   `json:"counts"`
	Points    []mapPoint     `json:"points"`
	Isolines  []plot.Isoline `json:"isolines"`
	markers   []plot.TernaryMarker
	notes     []string
	title     string
	triangle  plot.Triangle
	pooled    int // samples that set the shares of grouped corners
	// systems are the notebook's alloy systems as ternary maps.
	systems []systemTriangle
}

// buildCompositionMap reads the request's settings and places the samples.
// When a setting is wrong the data carry the messages and no map.
func (s *Server) buildCompositionMap(r *http.Request) (*compositionMapData, error) {
	samples, err := s.nb.MapSamples(r.Context())
	if err != nil {
		return nil, err
	}
	c, f := s.readControls(r.URL.Query(), samples, true)
	d := &compositionMapData{Controls: c, Points: []mapPoint{}, Isolines: []plot.Isoline{}, systems: systemTriangles(samples, plot.DefaultMaxIgnored)}
	if len(c.Errors) > 0 {
		return d, nil
	}
	d.Points = make([]mapPoint, 0, len(samples))
	d.markers = make([]plot.TernaryMarker, 0, len(samples))
	tri := f.triangle
	d.triangle = tri
	d.Corners = tri.Labels()
	d.title = strings.Join(d.Corners[:], "–")
	d.Counts.Total = len(samples)
	shown := make([][]meltbook.ElementFraction, 0, len(samples))
	eaMin, eaMax := math.Inf(1), math.Inf(-1)
	for i := range samples {
		m := &samples[i]
		if !f.keep(m, &d.Counts) {
			continue
		}
		proj, err := tri.Project(m.Composition)
		if err != nil {
			d.Counts.NoCorner++
			continue
		}
		if proj.Ignored > f.outside+1e-12 {
			d.Counts.Outside++
			continue
		}
		ea := f.ea(m.Composition)
		class := plot.ClassOf(m.Outcomes)
		pt := mapPoint{Code: m.Code, Melt: m.Melt, Class: class.Slug(), Ternary: proj.Point, Ignored: proj.Ignored, Composition: m.Composition, Measured: m.Measured}
		if finite(ea) {
			pt.EA = &ea
			eaMin, eaMax = math.Min(eaMin, ea), math.Max(eaMax, ea)
		}
		d.Points = append(d.Points, pt)
		d.markers = append(d.markers, plot.TernaryMarker{Point: proj.Point, Class: class, Code: m.Code, Composition: plot.FormatComposition(m.Composition), ElectronsPerAtom: ea})
		shown = append(shown, m.Composition)
	}
	d.Counts.Shown = len(d.Points)

	shares := tri.GroupShares(plot.PooledShares, shown)
	d.ShareRule, d.Shares, d.pooled = shares.Rule, shares.Corner, shares.Pooled
	switch {
	case f.scheme == nil:
		d.LinesNote = "no valence scheme is set up, so there are no e/a lines"
	default:
		d.Scheme = f.scheme.Name
		cv, err := shares.CornerValences(f.scheme.Valence)
		if err != nil {
			d.LinesNote = "no e/a lines: " + err.Error()
			break
		}
		d.CornerValences = &cv
		d.Isolines = electronLines(cv, eaMin, eaMax, f.eaStep)
	}
	d.notes = d.svgNotes(f)
	return d, nil
}

// electronLines draws e/a isolines over the triangle. The levels span the
// e/a of the samples shown (or the whole triangle when none has one) at a
// round spacing, unless the user chose the spacing.
func electronLines(cv [3]float64, lo, hi, step float64) []plot.Isoline {
	triLo := math.Min(cv[0], math.Min(cv[1], cv[2]))
	triHi := math.Max(cv[0], math.Max(cv[1], cv[2]))
	if !(hi >= lo) {
		lo, hi = triLo, triHi
	}
	var levels []float64
	if step > 0 {
		// One line beyond the samples on each side frames them.
		for k := math.Floor(lo/step + 1e-9); len(levels) < 60; k++ {
			v := roundLevel(k*step, step)
			if v > math.Ceil(hi/step-1e-9)*step+step/2 {
				break
			}
			if v > triLo && v < triHi {
				levels = append(levels, v)
			}
		}
	} else {
		if hi-lo < 0.1 {
			lo, hi = lo-0.05, hi+0.05
		}
		// Lines just beyond the samples' range frame them.
		ticks, st := plot.NiceTicks(lo, hi, 7)
		step = st
		for _, t := range ticks {
			if t > triLo && t < triHi {
				levels = append(levels, t)
			}
		}
	}
	g := plot.SampleField(mapGridDivisions, plot.ElectronField(cv))
	lines := g.Contours(levels)
	dec := plot.Decimals(step)
	out := lines[:0]
	for _, iso := range lines {
		if len(iso.Lines) == 0 {
			continue
		}
		iso.Label = strconv.FormatFloat(iso.Level, 'f', dec, 64)
		out = append(out, iso)
	}
	return out
}

// roundLevel removes floating-point noise from a multiple of step
// (1.7500000000000002 becomes 1.75).
func roundLevel(v, step float64) float64 {
	p := math.Pow(10, float64(plot.Decimals(step)+2))
	return math.Round(v*p) / p
}

// svgNotes are the lines written into the figure so that a saved copy says
// what it shows.
func (d *compositionMapData) svgNotes(f sampleFilter) []string {
	var notes []string
	if d.Scheme != "" && len(d.Isolines) > 0 {
		notes = append(notes, "dashed lines: e/a, "+d.Scheme)
		if desc := (plot.Shares{Rule: d.ShareRule, Corner: d.Shares}).Describe(); desc != "" {
			notes = append(notes, fmt.Sprintf("%s (pooled over %d samples shown)", desc, d.pooled))
		}
	} else if d.LinesNote != "" {
		notes = append(notes, d.LinesNote)
	}
	if sel := f.describe(); sel != "" {
		notes = append(notes, sel)
	}
	notes = append(notes, fmt.Sprintf("%d of %d samples shown", d.Counts.Shown, d.Counts.Total))
	return notes
}

// describe says which samples the filter keeps, "" for all.
func (f *sampleFilter) describe() string {
	var parts []string
	if f.treatment != "" {
		parts = append(parts, f.treatment+" only")
	}
	switch {
	case f.rateLimited && math.IsInf(f.rateHi, 1):
		parts = append(parts, "cooling rate ≥ "+scientific(f.rateLo)+" K/s")
	case f.rateLimited && f.rateLo == 0:
		parts = append(parts, "cooling rate ≤ "+scientific(f.rateHi)+" K/s")
	case f.rateLimited:
		parts = append(parts, "cooling rate "+scientific(f.rateLo)+" to "+scientific(f.rateHi)+" K/s")
	}
	return strings.Join(parts, ", ")
}

func (d *compositionMapData) svg() []byte {
	m := plot.TernaryMap{Triangle: d.triangle, Title: d.title, Notes: d.notes, Markers: d.markers, Isolines: d.Isolines}
	return m.SVG()
}

type mapPage struct {
	// Systems link to the maps of the notebook's alloy systems.
	Systems  []systemLink
	Data     *compositionMapData
	Controls mapControls
	Schemes  []string
	SVG      template.HTML
	Download string
	JSON     string
	Classes  []classCount
}

func (s *Server) schemeNames() []string {
	names := make([]string, len(s.cfg.Schemes))
	for i, sc := range s.cfg.Schemes {
		names[i] = sc.Name
	}
	return names
}

// systemLink is one alloy system's map, as the map page offers it.
type systemLink struct {
	Name    string
	Href    string
	Samples int
	Current bool
}

func (s *Server) compositionMap(w http.ResponseWriter, r *http.Request) {
	d, err := s.buildCompositionMap(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	p := mapPage{Data: d, Controls: d.Controls, Schemes: s.schemeNames()}
	for _, st := range d.systems {
		q := url.Values{"a": {st.Corners[0]}, "b": {st.Corners[1]}, "c": {st.Corners[2]}}
		p.Systems = append(p.Systems, systemLink{Name: strings.Join(st.Corners[:], "–"), Href: "/map?" + q.Encode(), Samples: st.Samples,
			Current: st.Corners == [3]string{d.Controls.A, d.Controls.B, d.Controls.C}})
	}
	if len(d.Controls.Errors) > 0 {
		s.render(w, r, http.StatusBadRequest, "map", "Composition map", p)
		return
	}
	// The SVG is built by plot from numbers and escaped text.
	p.SVG = template.HTML(d.svg())
	q := cloneValues(r.URL.Query())
	q.Set("a", d.Controls.A)
	q.Set("b", d.Controls.B)
	q.Set("c", d.Controls.C)
	p.Download = "/map.svg?" + q.Encode()
	p.JSON = "/api/map?" + q.Encode()
	counts := map[string]int{}
	for _, pt := range d.Points {
		counts[pt.Class]++
	}
	for _, c := range plot.Classes {
		p.Classes = append(p.Classes, classCount{Class: c, Count: counts[c.Slug()]})
	}
	s.render(w, r, http.StatusOK, "map", "Composition map "+d.title, p)
}

func (s *Server) compositionMapSVG(w http.ResponseWriter, r *http.Request) {
	d, err := s.buildCompositionMap(r)
	if err == nil {
		err = d.Controls.firstError()
	}
	if err != nil {
		s.fail(w, r, err)
		return
	}
	name := strings.NewReplacer("(", "", ")", "", "+", "", "–", "-").Replace(d.title)
	w.Header().Set("Content-Type", "image/svg+xml")
	w.Header().Set("Content-Disposition", `attachment; filename="meltbook-map-`+name+`.svg"`)
	w.Write([]byte(`<?xml version="1.0" encoding="UTF-8"?>` + "\n"))
	w.Write(d.svg())
}

type descriptorPage struct {
	Controls  mapControls
	Schemes   []string
	SizeSVG   template.HTML
	SizeNote  string
	RateSVG   template.HTML
	RateNote  string
	Selection string
}

// descriptorMaps draws e/a against δ and against cooling rate, with e/a on
// the x axis of both so that the two plots line up.
func (s *Server) descriptorMaps(w http.ResponseWriter, r *http.Request) {
	samples, err := s.nb.MapSamples(r.Context())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	c, f := s.readControls(r.URL.Query(), samples, false)
	p := descriptorPage{Controls: c, Schemes: s.schemeNames()}
	if len(c.Errors) > 0 {
		s.render(w, r, http.StatusBadRequest, "descriptors", "Descriptor maps", p)
		return
	}
	p.Selection = f.describe()
	eaLabel := "e/a"
	if f.scheme != nil {
		eaLabel = "e/a (" + f.scheme.Name + ")"
	}
	size := plot.Scatter{Title: "Size mismatch δ against e/a", X: plot.Axis{Label: eaLabel}, Y: plot.Axis{Label: "δ (%)"}}
	rate := plot.Scatter{Title: "Cooling rate against e/a", X: plot.Axis{Label: eaLabel}, Y: plot.Axis{Label: "cooling rate (K/s)", Log: true}}
	var counts selectCounts
	noEA, noDelta, noRate := 0, 0, 0
	for i := range samples {
		m := &samples[i]
		if !f.keep(m, &counts) {
			continue
		}
		counts.Shown++
		ea := f.ea(m.Composition)
		if !finite(ea) {
			noEA++
			continue
		}
		mk := plot.ScatterMarker{X: ea, Class: plot.ClassOf(m.Outcomes), Code: m.Code, Composition: plot.FormatComposition(m.Composition), ElectronsPerAtom: ea}
		if d, err := s.cfg.SizeMismatch(m.Composition); err == nil && finite(d) {
			mk.Y, mk.Hover = d, "δ "+strconv.FormatFloat(d, 'f', 2, 64)+" %"
			size.Markers = append(size.Markers, mk)
		} else {
			noDelta++
		}
		if m.CoolingRateKPerS != nil && *m.CoolingRateKPerS > 0 {
			mk.Y, mk.Hover = *m.CoolingRateKPerS, scientific(*m.CoolingRateKPerS)+" K/s"
			rate.Markers = append(rate.Markers, mk)
		} else {
			noRate++
		}
	}
	missing := func(n int, what string) string {
		if n == 0 {
			return ""
		}
		return fmt.Sprintf("%d without %s", n, what)
	}
	join := func(parts ...string) string {
		var keep []string
		for _, p := range parts {
			if p != "" {
				keep = append(keep, p)
			}
		}
		return strings.Join(keep, "; ")
	}
	eaMissing := missing(noEA, "e/a under this scheme")
	if f.scheme == nil {
		eaMissing = "no valence scheme is set up, so no sample has an e/a"
	}
	p.SizeNote = join(fmt.Sprintf("%d of %d samples", len(size.Markers), counts.Shown), eaMissing, missing(noDelta, "δ"))
	size.Notes = []string{p.SizeNote}
	p.SizeSVG = template.HTML(size.SVG())
	p.RateNote = join(fmt.Sprintf("%d of %d samples", len(rate.Markers), counts.Shown), eaMissing, missing(noRate, "an estimated cooling rate"))
	rate.Notes = []string{p.RateNote}
	p.RateSVG = template.HTML(rate.SVG())
	s.render(w, r, http.StatusOK, "descriptors", "Descriptor maps", p)
}

package plot

import (
	"math"
	"strconv"
	"strings"
)

// Axis describes one axis of a scatter plot.
type Axis struct {
	// Label names the quantity with its unit, e.g. "δ (%)".
	Label string
	// Log draws the axis on a base-10 logarithmic scale; values ≤ 0 are
	// then left out.
	Log bool
	// Min and Max fix the range; when both are zero it is taken from the
	// data and widened to round values.
	Min, Max float64
}

// ScatterMarker is one sample on a scatter plot.
type ScatterMarker struct {
	X, Y  float64
	Class Class
	// Code, Composition and ElectronsPerAtom are written as data-c, data-x
	// and data-e for the page, as on the composition map.
	Code             string
	Composition      string
	ElectronsPerAtom float64
	// Hover is extra text shown on hover (data-h), e.g. "δ 4.31 %".
	Hover string
}

// Scatter is a plot of samples against two descriptors.
type Scatter struct {
	Title   string
	X, Y    Axis
	Markers []ScatterMarker
	Notes   []string
}

// Geometry of scatter plots in SVG pixels.
const (
	scatterWidth  = 800.0
	scatterHeight = 430.0
	scatterLeft   = 72.0
	scatterRight  = 560.0 // right end of the plotting area; the legend sits beyond
	scatterTop    = 44.0
	scatterBottom = 376.0
)

// axisScale maps data values to pixels along one axis.
type axisScale struct {
	log          bool
	lo, hi       float64 // data range (log10 of it on a log axis)
	pixLo, pixHi float64
	ticks        []float64 // data values
	minor        []float64
	decimals     int
	label        string
}

func newAxisScale(a Axis, values []float64, pixLo, pixHi float64) axisScale {
	s := axisScale{log: a.Log, pixLo: pixLo, pixHi: pixHi, label: a.Label}
	lo, hi := a.Min, a.Max
	fixed := !(lo == 0 && hi == 0)
	if !fixed {
		lo, hi = math.Inf(1), math.Inf(-1)
		for _, v := range values {
			if !usable(v, a.Log) {
				continue
			}
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
		if lo > hi { // no data
			lo, hi = 0, 1
			if a.Log {
				lo, hi = 1, 10
			}
		}
	}
	if a.Log {
		l0, l1 := math.Floor(math.Log10(lo)), math.Ceil(math.Log10(hi))
		if l1 == l0 {
			l1++
		}
		s.lo, s.hi = l0, l1
		for k := l0; k <= l1; k++ {
			s.ticks = append(s.ticks, math.Pow(10, k))
			if k < l1 && l1-l0 <= 4 {
				for m := 2.0; m <= 9; m++ {
					s.minor = append(s.minor, m*math.Pow(10, k))
				}
			}
		}
		return s
	}
	ticks, step := NiceTicks(lo, hi, 7)
	if fixed {
		s.lo, s.hi = lo, hi
		for _, t := range ticks {
			if t >= lo-step*1e-9 && t <= hi+step*1e-9 {
				s.ticks = append(s.ticks, t)
			}
		}
	} else {
		s.lo, s.hi = ticks[0], ticks[len(ticks)-1]
		s.ticks = ticks
	}
	s.decimals = Decimals(step)
	return s
}

func usable(v float64, log bool) bool {
	return !math.IsNaN(v) && !math.IsInf(v, 0) && (!log || v > 0)
}

func (s *axisScale) pixel(v float64) float64 {
	if s.log {
		v = math.Log10(v)
	}
	return s.pixLo + (v-s.lo)/(s.hi-s.lo)*(s.pixHi-s.pixLo)
}

func (s *axisScale) inside(v float64) bool {
	if !usable(v, s.log) {
		return false
	}
	if s.log {
		v = math.Log10(v)
	}
	const slack = 1e-9
	return v >= s.lo-slack && v <= s.hi+slack
}

// tickLabel writes a tick value: decades as 10ⁿ on a log axis.
func (s *axisScale) tickLabel(v float64) string {
	if s.log {
		return "10" + superscript(int(math.Round(math.Log10(v))))
	}
	return strconv.FormatFloat(v, 'f', s.decimals, 64)
}

func superscript(n int) string {
	digits := []rune("⁰¹²³⁴⁵⁶⁷⁸⁹")
	var out []rune
	if n < 0 {
		out = append(out, '⁻')
		n = -n
	}
	for _, d := range strconv.Itoa(n) {
		out = append(out, digits[d-'0'])
	}
	return string(out)
}

// SVG renders the plot as a stand-alone SVG document, markers grouped by
// class as on the composition map. Markers outside a fixed range or with
// values a log axis cannot show are left out; Plotted counts the rest.
func (p *Scatter) SVG() []byte {
	x, y := p.scales()

	w := &svg{b: make([]byte, 0, 4096+100*len(p.Markers))}
	w.open(scatterWidth, scatterHeight, p.Title)
	w.markerDefs()
	w.raw(`<rect width="100%" height="100%" fill="#fff"/>`)
	w.raw(`<text x="12" y="22" font-size="15" font-weight="600" fill="#1f2933">`)
	w.text(p.Title)
	w.raw("</text>")
	p.axes(w, &x, &y)

	counts := make(map[Class]int, len(Classes))
	byClass := make(map[Class][]int, len(Classes))
	for i, m := range p.Markers {
		if x.inside(m.X) && y.inside(m.Y) {
			byClass[m.Class] = append(byClass[m.Class], i)
		}
	}
	w.raw(`<g class="marks">`)
	for k := len(Classes) - 1; k >= 0; k-- {
		c := Classes[k]
		counts[c] = len(byClass[c])
		if counts[c] == 0 {
			continue
		}
		w.raw(`<g data-o="` + c.Slug() + `" aria-label="` + c.Label() + `">`)
		for _, i := range byClass[c] {
			m := &p.Markers[i]
			w.use(c, x.pixel(m.X), y.pixel(m.Y))
			w.dataAttrs(m.Code, m.ElectronsPerAtom, m.Composition)
			if m.Hover != "" {
				w.attr("data-h", m.Hover)
			}
			w.raw("/>")
		}
		w.raw("</g>")
	}
	w.raw("</g>")
	h := w.legend(scatterRight+24, scatterTop+8, counts)
	// Notes go one clause a line ("; " separates clauses) beside the plot.
	row := 0
	for _, note := range p.Notes {
		for _, line := range strings.Split(note, "; ") {
			w.raw(`<text font-size="11" fill="#3b4450"`)
			w.numAttr("x", scatterRight+18, 0)
			w.numAttr("y", scatterTop+h+24+float64(row)*15, 0)
			w.raw(">")
			w.text(line)
			w.raw("</text>")
			row++
		}
	}
	w.raw("</svg>")
	return w.b
}

// Plotted returns how many markers SVG draws.
func (p *Scatter) Plotted() int {
	x, y := p.scales()
	n := 0
	for _, m := range p.Markers {
		if x.inside(m.X) && y.inside(m.Y) {
			n++
		}
	}
	return n
}

// scales sets both axes from the markers that both axes can show.
func (p *Scatter) scales() (x, y axisScale) {
	xs := make([]float64, 0, len(p.Markers))
	ys := make([]float64, 0, len(p.Markers))
	for _, m := range p.Markers {
		if usable(m.X, p.X.Log) && usable(m.Y, p.Y.Log) {
			xs, ys = append(xs, m.X), append(ys, m.Y)
		}
	}
	return newAxisScale(p.X, xs, scatterLeft, scatterRight), newAxisScale(p.Y, ys, scatterBottom, scatterTop)
}

func (p *Scatter) axes(w *svg, x, y *axisScale) {
	// Grid lines at the ticks, then the frame.
	w.raw(`<path fill="none" stroke="#e6e9ed" stroke-width=".8" d="`)
	for _, t := range x.ticks {
		px := x.pixel(t)
		w.raw("M")
		w.num(px, 1)
		w.raw(" ")
		w.num(scatterTop, 1)
		w.raw("V")
		w.num(scatterBottom, 1)
	}
	for _, t := range y.ticks {
		py := y.pixel(t)
		w.raw("M")
		w.num(scatterLeft, 1)
		w.raw(" ")
		w.num(py, 1)
		w.raw("H")
		w.num(scatterRight, 1)
	}
	w.raw(`"/>`)
	w.raw(`<path fill="none" stroke="#9aa2ab" stroke-width=".8" d="`)
	for _, t := range x.minor {
		if x.inside(t) {
			w.raw("M")
			w.num(x.pixel(t), 1)
			w.raw(" ")
			w.num(scatterBottom, 1)
			w.raw("v4")
		}
	}
	for _, t := range y.minor {
		if y.inside(t) {
			w.raw("M")
			w.num(scatterLeft, 1)
			w.raw(" ")
			w.num(y.pixel(t), 1)
			w.raw("h-4")
		}
	}
	w.raw(`"/>`)
	w.raw(`<rect fill="none" stroke="#3b4450" stroke-width="1"`)
	w.numAttr("x", scatterLeft, 0)
	w.numAttr("y", scatterTop, 0)
	w.numAttr("width", scatterRight-scatterLeft, 0)
	w.numAttr("height", scatterBottom-scatterTop, 0)
	w.raw("/>")
	w.raw(`<g font-size="11" fill="#4a535d">`)
	for _, t := range x.ticks {
		w.label(x.pixel(t), scatterBottom+17, "middle", x.tickLabel(t))
	}
	for _, t := range y.ticks {
		w.label(scatterLeft-7, y.pixel(t)+4, "end", y.tickLabel(t))
	}
	w.raw(`</g><g font-size="12" fill="#1f2933">`)
	w.label((scatterLeft+scatterRight)/2, scatterBottom+40, "middle", x.label)
	cx, cy := 18.0, (scatterTop+scatterBottom)/2
	w.raw(`<text text-anchor="middle" transform="rotate(-90 `)
	w.num(cx, 0)
	w.raw(" ")
	w.num(cy, 0)
	w.raw(`)"`)
	w.numAttr("x", cx, 0)
	w.numAttr("y", cy, 0)
	w.raw(">")
	w.text(y.label)
	w.raw("</text></g>")
}

package plot

import (
	"fmt"
	"math"
	"sort"
	"unicode/utf8"
)

// Pattern is a powder diffraction pattern with what analysis made of it.
type Pattern struct {
	// TwoThetaDeg are the scan's 2θ positions in degrees, increasing.
	TwoThetaDeg []float64 `json:"two_theta_deg"`
	// Counts are the measured intensities at each position.
	Counts []float64 `json:"counts"`
	// Background and Fit, when given, have one value per position: the
	// estimated background and the fitted profile (background included).
	Background []float64  `json:"background,omitempty"`
	Fit        []float64  `json:"fit,omitempty"`
	Peaks      []PeakMark `json:"peaks"`
}

// PeakMark is one peak found in the pattern.
type PeakMark struct {
	TwoThetaDeg float64 `json:"two_theta_deg"`
	// Label is the assigned index, e.g. "(7,11)" or "422"; empty when the
	// peak was not indexed.
	Label string `json:"label,omitempty"`
	// Explained is false for a peak that no indexed phase accounts for.
	Explained bool `json:"explained"`
}

// PatternPlot draws a pattern so that a page can zoom and pan along 2θ.
type PatternPlot struct {
	Title   string
	Pattern Pattern
}

// Geometry of the pattern plot in SVG pixels.
const (
	patternWidth  = 960.0
	patternHeight = 430.0
	patternLeft   = 74.0
	patternRight  = 944.0
	patternTop    = 34.0
	patternBottom = 370.0
	// patternUnits is the height of the data area in its own units.
	patternUnits = 1000.0
)

// Validate checks that the arrays agree and 2θ increases.
func (p *Pattern) Validate() error {
	n := len(p.TwoThetaDeg)
	if n < 2 {
		return fmt.Errorf("a pattern needs at least two points, got %d", n)
	}
	if len(p.Counts) != n {
		return fmt.Errorf("%d counts for %d 2θ positions", len(p.Counts), n)
	}
	if p.Background != nil && len(p.Background) != n {
		return fmt.Errorf("%d background values for %d 2θ positions", len(p.Background), n)
	}
	if p.Fit != nil && len(p.Fit) != n {
		return fmt.Errorf("%d fitted values for %d 2θ positions", len(p.Fit), n)
	}
	for i := 1; i < n; i++ {
		if !(p.TwoThetaDeg[i] > p.TwoThetaDeg[i-1]) {
			return fmt.Errorf("2θ does not increase at point %d (%g after %g)", i+1, p.TwoThetaDeg[i], p.TwoThetaDeg[i-1])
		}
	}
	return nil
}

// SVG renders the pattern. The data sit in a nested
// <svg class="plot-area" viewBox="2θ₀ 0 Δ2θ 1000" preserveAspectRatio="none">
// whose x units are degrees 2θ, so a page zooms or pans by changing the
// viewBox alone; lines keep their width with vector-effect. The x axis
// (<g class="x-axis">) and the peak labels (<g class="peak-labels">, each
// with data-t = 2θ) sit outside it so that text is not stretched; the page
// redraws and moves them. The root carries data-t0 and data-t1, the full
// 2θ range, and the data area's pixel box as data-box="x y w h".
func (pp *PatternPlot) SVG() ([]byte, error) {
	p := &pp.Pattern
	if err := p.Validate(); err != nil {
		return nil, err
	}
	n := len(p.TwoThetaDeg)
	t0, t1 := p.TwoThetaDeg[0], p.TwoThetaDeg[n-1]
	top := 0.0
	for _, series := range [][]float64{p.Counts, p.Fit} {
		for _, v := range series {
			if !math.IsNaN(v) && !math.IsInf(v, 0) {
				top = math.Max(top, v)
			}
		}
	}
	// Headroom of a quarter above the highest point for the peak labels.
	yTicks, yStep := NiceTicks(0, math.Max(top*1.25, 1), 6)
	yMax := yTicks[len(yTicks)-1]
	scaleY := func(v float64) float64 { return patternUnits * (1 - v/yMax) }
	pixY := func(v float64) float64 {
		return patternTop + (patternBottom-patternTop)*(1-v/yMax)
	}
	// Enough decimals for 2θ to resolve a tenth of the step.
	tPrec := Decimals((t1-t0)/float64(n-1)) + 1

	w := &svg{b: make([]byte, 0, 8192+40*n)}
	w.raw(`<svg xmlns="http://www.w3.org/2000/svg" class="pattern"`)
	w.raw(` viewBox="0 0 `)
	w.num(patternWidth, 0)
	w.raw(" ")
	w.num(patternHeight, 0)
	w.raw(`"`)
	w.numAttr("width", patternWidth, 0)
	w.numAttr("height", patternHeight, 0)
	w.numAttr("data-t0", t0, tPrec)
	w.numAttr("data-t1", t1, tPrec)
	w.raw(` data-box="`)
	w.num(patternLeft, 0)
	w.raw(" ")
	w.num(patternTop, 0)
	w.raw(" ")
	w.num(patternRight-patternLeft, 0)
	w.raw(" ")
	w.num(patternBottom-patternTop, 0)
	w.raw(`"`)
	w.attr("font-family", fontFamily)
	w.raw(` font-size="12" role="img"`)
	w.attr("aria-label", pp.Title)
	w.raw(`><defs><clipPath id="pattern-clip"><rect`)
	w.numAttr("x", patternLeft, 0)
	w.numAttr("y", 0, 0)
	w.numAttr("width", patternRight-patternLeft, 0)
	w.numAttr("height", patternBottom, 0)
	w.raw(`/></clipPath></defs><rect width="100%" height="100%" fill="#fff"/>`)
	w.raw(`<text x="12" y="20" font-size="14" font-weight="600" fill="#1f2933">`)
	w.text(pp.Title)
	w.raw("</text>")

	// y axis: grid lines and labels, fixed under zoom.
	w.raw(`<path fill="none" stroke="#e6e9ed" stroke-width=".8" d="`)
	for _, v := range yTicks {
		w.raw("M")
		w.num(patternLeft, 0)
		w.raw(" ")
		w.num(pixY(v), 1)
		w.raw("H")
		w.num(patternRight, 0)
	}
	w.raw(`"/><g font-size="11" fill="#4a535d" text-anchor="end">`)
	yDec := Decimals(yStep)
	for _, v := range yTicks {
		w.raw("<text")
		w.numAttr("x", patternLeft-6, 0)
		w.numAttr("y", pixY(v)+4, 1)
		w.raw(">")
		w.b = appendNum(w.b, v, yDec)
		w.raw("</text>")
	}
	w.raw(`</g><text text-anchor="middle" font-size="12" fill="#1f2933" transform="rotate(-90 16 202)" x="16" y="202">counts</text>`)

	// x axis: drawn here for the full range, redrawn by the page on zoom.
	w.raw(`<g class="x-axis" font-size="11" fill="#4a535d" text-anchor="middle">`)
	xTicks, xStep := NiceTicks(t0, t1, 10)
	xDec := Decimals(xStep)
	w.raw(`<path stroke="#3b4450" d="`)
	for _, t := range xTicks {
		if t < t0 || t > t1 {
			continue
		}
		w.raw("M")
		w.num(patternPixel(t, t0, t1), 1)
		w.raw(" ")
		w.num(patternBottom, 0)
		w.raw("v5")
	}
	w.raw(`"/>`)
	for _, t := range xTicks {
		if t < t0 || t > t1 {
			continue
		}
		w.label(patternPixel(t, t0, t1), patternBottom+19, "middle", string(appendNum(nil, t, xDec)))
	}
	w.raw(`</g><text text-anchor="middle" font-size="12" fill="#1f2933"`)
	w.numAttr("x", (patternLeft+patternRight)/2, 0)
	w.numAttr("y", patternBottom+42, 0)
	w.raw(">2θ (°)</text>")

	// Data area in 2θ units.
	w.raw(`<svg class="plot-area" preserveAspectRatio="none"`)
	w.numAttr("x", patternLeft, 0)
	w.numAttr("y", patternTop, 0)
	w.numAttr("width", patternRight-patternLeft, 0)
	w.numAttr("height", patternBottom-patternTop, 0)
	w.raw(` viewBox="`)
	w.num(t0, tPrec)
	w.raw(" 0 ")
	w.num(t1-t0, tPrec)
	w.raw(" ")
	w.num(patternUnits, 0)
	w.raw(`">`)
	// A clear sheet under the curves so that the whole area takes the
	// pointer, for zooming and dragging.
	w.raw(`<rect class="pointer-sheet" fill="#fff" fill-opacity="0"`)
	w.numAttr("x", t0, tPrec)
	w.raw(` y="0"`)
	w.numAttr("width", t1-t0, tPrec)
	w.numAttr("height", patternUnits, 0)
	w.raw(`/>`)
	if p.Background != nil {
		w.series(`fill="none" stroke="#0072B2" stroke-width="1.2" stroke-dasharray="5 3" class="background"`, p.TwoThetaDeg, p.Background, scaleY, tPrec)
	}
	// The fit goes under the counts, wider, so that both stay visible
	// where they agree.
	if p.Fit != nil {
		w.series(`fill="none" stroke="#009E73" stroke-width="2.6" stroke-opacity=".75" class="fit"`, p.TwoThetaDeg, p.Fit, scaleY, tPrec)
	}
	w.series(`fill="none" stroke="#000" stroke-width=".9" class="counts"`, p.TwoThetaDeg, p.Counts, scaleY, tPrec)
	// Peak ticks: a short line above the pattern at each peak.
	w.raw(`<path fill="none" stroke="#1f2933" stroke-width="1.2" vector-effect="non-scaling-stroke" class="peak-ticks" d="`)
	peaks := append([]PeakMark(nil), p.Peaks...)
	sort.Slice(peaks, func(i, j int) bool { return peaks[i].TwoThetaDeg < peaks[j].TwoThetaDeg })
	heights := make([]float64, len(peaks))
	for i, pk := range peaks {
		heights[i] = p.countsAt(pk.TwoThetaDeg)
		if !pk.Explained {
			continue
		}
		w.raw("M")
		w.num(pk.TwoThetaDeg, tPrec)
		w.raw(" ")
		w.num(scaleY(heights[i])-15, 1)
		w.raw("v-45")
	}
	w.raw(`"/></svg>`)

	// Peak labels and unexplained-peak markers, placed in pixels. A label
	// that would run into the one before it (closer than labelGap across)
	// is stacked above it, so that close peaks stay readable at full range.
	w.raw(`<g class="peak-labels" clip-path="url(#pattern-clip)" font-size="10.5" fill="#1f2933">`)
	prevX, prevTop := math.Inf(-1), 0.0
	for i, pk := range peaks {
		if pk.TwoThetaDeg < t0 || pk.TwoThetaDeg > t1 {
			continue
		}
		x := patternPixel(pk.TwoThetaDeg, t0, t1)
		y := pixY(heights[i]) - (patternBottom-patternTop)*60/patternUnits - 4
		if x-prevX < labelGap {
			y = math.Min(y, prevTop-4)
		}
		prevX, prevTop = x, y-labelLength(pk)
		w.raw(`<g data-t="`)
		w.num(pk.TwoThetaDeg, tPrec)
		w.raw(`"`)
		if !pk.Explained {
			w.raw(` class="unexplained"`)
		}
		w.raw(` transform="translate(`)
		w.num(x, 1)
		w.raw(" ")
		w.num(y, 1)
		w.raw(`)">`)
		if pk.Explained {
			w.raw(`<text transform="rotate(-90)" dy=".35em">`)
			w.text(pk.Label)
			w.raw("</text>")
		} else {
			// An open downward triangle with a question mark above it.
			w.raw(`<path d="M-5-10h10L0 0Z" fill="#fff" stroke="#D55E00" stroke-width="1.6"/><text y="-14" text-anchor="middle" fill="#D55E00" font-weight="600">?</text>`)
		}
		w.raw("</g>")
	}
	w.raw("</g>")
	w.raw(`<rect fill="none" stroke="#3b4450"`)
	w.numAttr("x", patternLeft, 0)
	w.numAttr("y", patternTop, 0)
	w.numAttr("width", patternRight-patternLeft, 0)
	w.numAttr("height", patternBottom-patternTop, 0)
	w.raw("/>")
	pp.legend(w, p)
	w.raw("</svg>")
	return w.b, nil
}

// labelGap is the least distance across, in pixels, between two peak
// labels side by side: a line of 10.5 px text and a little air.
const labelGap = 12

// labelLength is how far a peak's label reaches up from its foot, in
// pixels: rotated text at about 6.2 px a character (10.5 px system font),
// or the unexplained-peak marker with its question mark.
func labelLength(pk PeakMark) float64 {
	if !pk.Explained {
		return 26
	}
	return 6.2 * float64(utf8.RuneCountInString(pk.Label))
}

func patternPixel(t, t0, t1 float64) float64 {
	return patternLeft + (t-t0)/(t1-t0)*(patternRight-patternLeft)
}

// series writes one curve as a path in data units, breaking it at values
// that are not finite.
func (w *svg) series(attrs string, t, v []float64, scaleY func(float64) float64, tPrec int) {
	w.raw(`<path vector-effect="non-scaling-stroke" ` + attrs + ` d="`)
	const penUp, moved, drawing = 0, 1, 2
	state := penUp
	for i := range t {
		if math.IsNaN(v[i]) || math.IsInf(v[i], 0) {
			state = penUp
			continue
		}
		switch state {
		case penUp:
			w.raw("M")
			state = moved
		case moved:
			// Later pairs after L are implicit line-tos.
			w.raw("L")
			state = drawing
		default:
			w.raw(" ")
		}
		w.num(t[i], tPrec)
		w.raw(" ")
		w.num(scaleY(v[i]), 1)
	}
	w.raw(`"/>`)
}

// countsAt interpolates the counts linearly at 2θ t.
func (p *Pattern) countsAt(t float64) float64 {
	tt := p.TwoThetaDeg
	i := sort.SearchFloat64s(tt, t)
	switch {
	case i <= 0:
		return p.Counts[0]
	case i >= len(tt):
		return p.Counts[len(tt)-1]
	}
	f := (t - tt[i-1]) / (tt[i] - tt[i-1])
	return p.Counts[i-1] + f*(p.Counts[i]-p.Counts[i-1])
}

// legend writes the key at the top right, laid out from its right end; the
// width of a label is estimated at 6.6 px a character (11 px system font).
func (pp *PatternPlot) legend(w *svg, p *Pattern) {
	type item struct{ sample, label string }
	items := []item{{`<path d="M0 0h20" stroke="#000"/>`, "counts"}}
	if p.Background != nil {
		items = append(items, item{`<path d="M0 0h20" stroke="#0072B2" stroke-width="1.2" stroke-dasharray="5 3"/>`, "background"})
	}
	if p.Fit != nil {
		items = append(items, item{`<path d="M0 0h20" stroke="#009E73" stroke-width="2.6" stroke-opacity=".75"/>`, "fit"})
	}
	items = append(items,
		item{`<path d="M10 6V-6" stroke="#1f2933" stroke-width="1.2"/>`, "indexed peak"},
		item{`<path d="M5-4h10L10 6Z" fill="#fff" stroke="#D55E00" stroke-width="1.6"/>`, "unexplained peak"})
	width := func(it item) float64 { return 26 + 6.6*float64(len([]rune(it.label))) + 16 }
	x := patternRight
	for _, it := range items {
		x -= width(it)
	}
	w.raw(`<g class="legend" font-size="11" fill="#1f2933">`)
	for _, it := range items {
		w.raw(`<g transform="translate(`)
		w.num(x, 0)
		w.raw(` 16)">` + it.sample + `<text x="26" y="4">`)
		w.text(it.label)
		w.raw("</text></g>")
		x += width(it)
	}
	w.raw("</g>")
}

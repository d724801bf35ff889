package plot

import (
	"math"
	"strconv"

	"meltbook"
)

// TernaryMarker is one sample on a composition map.
type TernaryMarker struct {
	Point Ternary
	Class Class
	// Code names the sample; it is written as data-c for the page to link.
	Code string
	// Composition is shown on hover (data-x), e.g. "Al63 Cu25 Fe12".
	Composition string
	// ElectronsPerAtom is written as data-e; NaN when unknown.
	ElectronsPerAtom float64
}

// TernaryMap is a composition map on a Gibbs triangle.
type TernaryMap struct {
	Triangle Triangle
	Title    string
	// Notes are short lines written at the top right, e.g. the valence
	// scheme of the isolines and the shares of grouped corners.
	Notes    []string
	Markers  []TernaryMarker
	Isolines []Isoline
}

// Geometry of the map in SVG pixels: the triangle's side, where corner A
// sits, and the whole figure.
const (
	mapSide   = 560.0
	mapLeft   = 100.0
	mapBase   = 560.0 // y of the A-B edge
	mapWidth  = 760.0
	mapHeight = 612.0
)

// MapPixel maps a ternary point to the map's SVG pixels (y down).
func MapPixel(p Ternary) (x, y float64) {
	q := p.Cartesian()
	return mapLeft + q.X*mapSide, mapBase - q.Y*mapSide
}

// SVG renders the map as a stand-alone SVG document. Markers are grouped
// by class in <g data-o="slug"> inside <g class="marks">, each a
// <use href="#id" x y data-c data-e data-x>; decided classes are drawn last
// so that they stay on top.
func (m *TernaryMap) SVG() []byte {
	w := &svg{b: make([]byte, 0, 4096+95*len(m.Markers))}
	w.open(mapWidth, mapHeight, m.Title)
	w.markerDefs()
	w.raw(`<rect width="100%" height="100%" fill="#fff"/>`)
	m.grid(w)
	m.isolines(w, newOccupancy(m.Markers))
	m.frame(w)
	counts := m.markers(w)

	w.raw(`<text x="12" y="24" font-size="15" font-weight="600" fill="#1f2933">`)
	w.text(m.Title)
	w.raw("</text>")
	w.legend(12, 50, counts)
	for i, line := range m.Notes {
		w.raw(`<text text-anchor="end" font-size="11" fill="#3b4450"`)
		w.numAttr("x", mapWidth-12, 0)
		w.numAttr("y", 22+float64(i)*15, 0)
		w.raw(">")
		w.text(line)
		w.raw("</text>")
	}
	w.raw("</svg>")
	return w.b
}

// grid draws lines every 10 at.% parallel to each edge and their labels:
// the A-B edge carries B's share, B-C carries C's and C-A carries A's,
// each increasing towards its corner.
func (m *TernaryMap) grid(w *svg) {
	w.raw(`<path fill="none" stroke="#dfe3e8" stroke-width=".7" d="`)
	for k := 1; k <= 9; k++ {
		f := float64(k) / 10
		for corner := 0; corner < 3; corner++ {
			var p, q Ternary
			// Line where corner's share is f, from one edge to the other.
			p[corner], q[corner] = f, f
			p[(corner+1)%3] = 1 - f
			q[(corner+2)%3] = 1 - f
			w.moveLine(p, q)
		}
	}
	w.raw(`"/>`)
	w.raw(`<g font-size="10" fill="#6b7480">`)
	for k := 1; k <= 9; k++ {
		f := float64(k) / 10
		label := strconv.Itoa(k * 10)
		// B share on the bottom edge, below it.
		x, y := MapPixel(Ternary{1 - f, f, 0})
		w.label(x, y+15, "middle", label)
		// C share on the right edge, to its right.
		x, y = MapPixel(Ternary{0, 1 - f, f})
		w.label(x+8, y+4, "start", label)
		// A share on the left edge, to its left.
		x, y = MapPixel(Ternary{f, 0, 1 - f})
		w.label(x-8, y+4, "end", label)
	}
	w.raw("</g>")
}

func (w *svg) moveLine(p, q Ternary) {
	x, y := MapPixel(p)
	w.raw("M")
	w.num(x, 1)
	w.raw(" ")
	w.num(y, 1)
	x, y = MapPixel(q)
	w.raw("L")
	w.num(x, 1)
	w.raw(" ")
	w.num(y, 1)
}

func (w *svg) label(x, y float64, anchor, s string) {
	w.raw("<text")
	w.numAttr("x", x, 1)
	w.numAttr("y", y, 1)
	if anchor != "start" {
		w.raw(` text-anchor="` + anchor + `"`)
	}
	w.raw(">")
	w.text(s)
	w.raw("</text>")
}

func (m *TernaryMap) frame(w *svg) {
	w.raw(`<path fill="none" stroke="#3b4450" stroke-width="1.2" stroke-linejoin="round" d="`)
	w.moveLine(Ternary{1, 0, 0}, Ternary{0, 1, 0})
	x, y := MapPixel(Ternary{0, 0, 1})
	w.raw("L")
	w.num(x, 1)
	w.raw(" ")
	w.num(y, 1)
	w.raw(`Z"/>`)
	labels := m.Triangle.Labels()
	w.raw(`<g font-size="15" font-weight="600" fill="#1f2933" class="corners">`)
	x, y = MapPixel(Ternary{1, 0, 0})
	w.label(x, y+36, "middle", labels[0])
	x, y = MapPixel(Ternary{0, 1, 0})
	w.label(x, y+36, "middle", labels[1])
	x, y = MapPixel(Ternary{0, 0, 1})
	w.label(x, y-12, "middle", labels[2])
	w.raw(`</g><text font-size="10" fill="#6b7480"`)
	w.numAttr("x", mapLeft+mapSide+14, 0)
	w.numAttr("y", mapBase+36, 0)
	w.raw(`>at.%</text>`)
}

func (m *TernaryMap) isolines(w *svg, occ *occupancy) {
	if len(m.Isolines) == 0 {
		return
	}
	w.raw(`<g class="iso" fill="none" stroke="#56606b" stroke-width="1" stroke-dasharray="6 3">`)
	for _, iso := range m.Isolines {
		if len(iso.Lines) == 0 {
			continue
		}
		w.raw(`<path data-level="`)
		w.num(iso.Level, 6)
		w.raw(`" d="`)
		for _, line := range iso.Lines {
			for i, p := range line {
				x, y := MapPixel(p)
				if i == 0 {
					w.raw("M")
				} else {
					w.raw("L")
				}
				w.num(x, 1)
				w.raw(" ")
				w.num(y, 1)
			}
		}
		w.raw(`"/>`)
	}
	w.raw(`</g><g class="iso-labels" font-size="11" fill="#2f3740" stroke="#fff" stroke-width="3" paint-order="stroke" text-anchor="middle">`)
	for _, iso := range m.Isolines {
		x, y, angle, ok := labelPlace(iso.Lines, occ)
		if !ok {
			continue
		}
		occ.reserve(x, y)
		w.raw("<text")
		w.numAttr("x", x, 1)
		w.numAttr("y", y, 1)
		w.raw(` dy="-3" transform="rotate(`)
		w.num(angle, 1)
		w.raw(" ")
		w.num(x, 1)
		w.raw(" ")
		w.num(y, 1)
		w.raw(`)">`)
		w.text(iso.Label)
		w.raw("</text>")
	}
	w.raw("</g>")
}

// labelPlace puts a label on the longest polyline, in pixels, turned to
// read left to right: of eleven places spread along its middle 80 %, the one
// with fewest markers near it, and of equals the one nearest the middle. A
// place next to another label is never taken; when every place is, the line
// goes without a label (dense lines are then labelled every so often).
func labelPlace(lines [][]Ternary, occ *occupancy) (x, y, angleDeg float64, ok bool) {
	var best []Ternary
	bestLen := 0.0
	for _, line := range lines {
		if l := pixelLength(line); l > bestLen {
			best, bestLen = line, l
		}
	}
	if bestLen < 40 {
		return 0, 0, 0, false
	}
	bestScore := math.MaxInt
	bestOff := math.Inf(1)
	for k := 0; k <= 10; k++ {
		f := 0.1 + 0.08*float64(k)
		px, py, a := pointAlong(best, f*bestLen)
		score := occ.near(px, py)
		if off := math.Abs(f - 0.5); score < bestScore || score == bestScore && off < bestOff {
			x, y, angleDeg, bestScore, bestOff = px, py, a, score, off
		}
	}
	return x, y, angleDeg, bestScore < labelTaken
}

// pointAlong returns the pixel point at distance along a polyline and the
// line's direction there, turned to read left to right.
func pointAlong(line []Ternary, along float64) (x, y, angleDeg float64) {
	for i := 1; i < len(line); i++ {
		x0, y0 := MapPixel(line[i-1])
		x1, y1 := MapPixel(line[i])
		d := math.Hypot(x1-x0, y1-y0)
		if d < along && i < len(line)-1 {
			along -= d
			continue
		}
		t := 0.0
		if d > 0 {
			t = math.Min(along/d, 1)
		}
		angleDeg = math.Atan2(y1-y0, x1-x0) * 180 / math.Pi
		if angleDeg > 90 {
			angleDeg -= 180
		} else if angleDeg < -90 {
			angleDeg += 180
		}
		return x0 + t*(x1-x0), y0 + t*(y1-y0), angleDeg
	}
	x, y = MapPixel(line[0])
	return x, y, 0
}

// occupancy counts markers in square cells of the map, to find room for
// labels; cells next to a placed label count as labelTaken.
type occupancy struct {
	cols, rows int
	count      []int
}

const (
	occupancyCell = 16.0 // pixels
	labelTaken    = 1 << 30
)

func newOccupancy(markers []TernaryMarker) *occupancy {
	o := &occupancy{cols: int(math.Ceil(mapWidth / occupancyCell)), rows: int(math.Ceil(mapHeight / occupancyCell))}
	o.count = make([]int, o.cols*o.rows)
	for _, m := range markers {
		x, y := MapPixel(m.Point)
		if c, r := int(x/occupancyCell), int(y/occupancyCell); c >= 0 && c < o.cols && r >= 0 && r < o.rows {
			o.count[r*o.cols+c]++
		}
	}
	return o
}

// reserve marks the cell of a label at (x, y) and the eight around it. As
// near looks one cell each way, no later label lands within two cells
// (32 px) of it along either axis.
func (o *occupancy) reserve(x, y float64) {
	c0, r0 := int(x/occupancyCell), int(y/occupancyCell)
	for r := r0 - 1; r <= r0+1; r++ {
		for c := c0 - 1; c <= c0+1; c++ {
			if c >= 0 && c < o.cols && r >= 0 && r < o.rows {
				o.count[r*o.cols+c] = labelTaken
			}
		}
	}
}

// near counts the markers in the cell of (x, y) and the eight around it.
func (o *occupancy) near(x, y float64) int {
	c0, r0 := int(x/occupancyCell), int(y/occupancyCell)
	n := 0
	for r := r0 - 1; r <= r0+1; r++ {
		for c := c0 - 1; c <= c0+1; c++ {
			if c >= 0 && c < o.cols && r >= 0 && r < o.rows {
				n += o.count[r*o.cols+c]
			}
		}
	}
	return n
}

func pixelLength(line []Ternary) float64 {
	var l float64
	for i := 1; i < len(line); i++ {
		x0, y0 := MapPixel(line[i-1])
		x1, y1 := MapPixel(line[i])
		l += math.Hypot(x1-x0, y1-y0)
	}
	return l
}

// markers draws the markers, undecided first, and counts them per class.
func (m *TernaryMap) markers(w *svg) map[Class]int {
	byClass := make(map[Class][]int, len(Classes))
	for i, mk := range m.Markers {
		byClass[mk.Class] = append(byClass[mk.Class], i)
	}
	counts := make(map[Class]int, len(Classes))
	w.raw(`<g class="marks">`)
	for k := len(Classes) - 1; k >= 0; k-- {
		c := Classes[k]
		idx := byClass[c]
		counts[c] = len(idx)
		if len(idx) == 0 {
			continue
		}
		w.raw(`<g data-o="` + c.Slug() + `" aria-label="` + c.Label() + `">`)
		for _, i := range idx {
			mk := &m.Markers[i]
			x, y := MapPixel(mk.Point)
			w.use(c, x, y)
			w.dataAttrs(mk.Code, mk.ElectronsPerAtom, mk.Composition)
			w.raw("/>")
		}
		w.raw("</g>")
	}
	w.raw("</g>")
	return counts
}

// dataAttrs writes data-c (code), data-e (e/a, omitted when unknown) and
// data-x (composition).
func (w *svg) dataAttrs(code string, ea float64, composition string) {
	w.attr("data-c", code)
	if !math.IsNaN(ea) {
		w.raw(` data-e="`)
		w.num(ea, 3)
		w.raw(`"`)
	}
	if composition != "" {
		w.attr("data-x", composition)
	}
}

// FormatComposition writes atomic fractions compactly for a marker, in
// at.% with at most one decimal, elements in the given order: "Al63Cu25Fe12".
func FormatComposition(comp []meltbook.ElementFraction) string {
	b := make([]byte, 0, 6*len(comp))
	for _, ef := range comp {
		b = append(b, ef.Element...)
		b = appendNum(b, ef.Fraction*100, 1)
	}
	return string(b)
}

package plot

import (
	"math"
	"strconv"
)

// svg accumulates SVG text. Numbers are written with few decimals and no
// trailing zeros to keep large figures small.
type svg struct{ b []byte }

func (w *svg) raw(s string) { w.b = append(w.b, s...) }

// num writes v rounded to prec decimals, trimming trailing zeros.
func (w *svg) num(v float64, prec int) { w.b = appendNum(w.b, v, prec) }

// attr writes ` name="value"` with value escaped.
func (w *svg) attr(name, value string) {
	w.b = append(w.b, ' ')
	w.b = append(w.b, name...)
	w.b = append(w.b, '=', '"')
	w.b = appendEscaped(w.b, value)
	w.b = append(w.b, '"')
}

// numAttr writes ` name="v"`.
func (w *svg) numAttr(name string, v float64, prec int) {
	w.b = append(w.b, ' ')
	w.b = append(w.b, name...)
	w.b = append(w.b, '=', '"')
	w.b = appendNum(w.b, v, prec)
	w.b = append(w.b, '"')
}

// text writes escaped character data.
func (w *svg) text(s string) { w.b = appendEscaped(w.b, s) }

func appendNum(b []byte, v float64, prec int) []byte {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return append(b, '0')
	}
	start := len(b)
	b = strconv.AppendFloat(b, v, 'f', prec, 64)
	if prec > 0 {
		for b[len(b)-1] == '0' {
			b = b[:len(b)-1]
		}
		if b[len(b)-1] == '.' {
			b = b[:len(b)-1]
		}
	}
	if string(b[start:]) == "-0" {
		b = append(b[:start], '0')
	}
	return b
}

func appendEscaped(b []byte, s string) []byte {
	for i := 0; i < len(s); i++ {
		switch c := s[i]; c {
		case '&':
			b = append(b, "&amp;"...)
		case '<':
			b = append(b, "&lt;"...)
		case '>':
			b = append(b, "&gt;"...)
		case '"':
			b = append(b, "&#34;"...)
		case '\'':
			b = append(b, "&#39;"...)
		default:
			b = append(b, c)
		}
	}
	return b
}

// fontFamily is a system font stack: meltbook ships no fonts and fetches none.
const fontFamily = "system-ui, -apple-system, 'Segoe UI', Roboto, 'Noto Sans', 'DejaVu Sans', sans-serif"

// open writes the root element of a stand-alone SVG of the given size.
func (w *svg) open(width, height float64, label string) {
	w.raw(`<svg xmlns="http://www.w3.org/2000/svg"`)
	w.raw(` viewBox="0 0 `)
	w.num(width, 0)
	w.raw(" ")
	w.num(height, 0)
	w.raw(`"`)
	w.numAttr("width", width, 0)
	w.numAttr("height", height, 0)
	w.attr("font-family", fontFamily)
	w.raw(` font-size="12" role="img"`)
	w.attr("aria-label", label)
	w.raw(">")
}

// markerDefs writes one <defs> entry per class, each centred on (0, 0), for
// markers drawn with <use href="#id" x y>.
func (w *svg) markerDefs() {
	w.raw("<defs>")
	for _, c := range Classes {
		st := classStyles[c]
		w.raw(`<path id="` + st.id + `" d="` + shapePath[st.shape] + `"`)
		if st.shape == ShapeCross {
			w.raw(` fill="none" stroke="` + st.colour + `" stroke-width="1.6"`)
		} else {
			w.raw(` fill="` + st.colour + `" stroke="#fff" stroke-width=".8"`)
		}
		w.raw("/>")
	}
	w.raw("</defs>")
}

// shapePath draws each marker shape centred on (0, 0), about 11 px across,
// with areas chosen to look alike in weight.
var shapePath = map[Shape]string{
	// Regular pentagon of circumradius 5.6, point up.
	ShapePentagon: "M0-5.6L5.33-1.73 3.29 4.53-3.29 4.53-5.33-1.73Z",
	ShapeDiamond:  "M0-5.6L5.6 0 0 5.6-5.6 0Z",
	// Equilateral triangle of circumradius 6, point up.
	ShapeTriangle: "M0-6L5.2 3-5.2 3Z",
	// Circle of radius 4.6 as two arcs.
	ShapeCircle: "M-4.6 0A4.6 4.6 0 1 0 4.6 0A4.6 4.6 0 1 0-4.6 0Z",
	ShapeSquare: "M-4.2-4.2h8.4v8.4h-8.4Z",
	ShapeCross:  "M-4-4L4 4M-4 4L4-4",
}

// MarkerPath returns a class's marker as an SVG <path> centred on (0, 0),
// for drawing it outside a figure (tables, legends in HTML).
func MarkerPath(c Class) string {
	st := classStyles[c]
	if st.shape == ShapeCross {
		return `<path d="` + shapePath[st.shape] + `" fill="none" stroke="` + st.colour + `" stroke-width="1.6"/>`
	}
	return `<path d="` + shapePath[st.shape] + `" fill="` + st.colour + `"/>`
}

// use writes a marker of class c at (x, y), rounded to whole pixels: half a
// pixel is 0.09 at.% on a composition map, finer than any measured
// composition, and it keeps a map of 10 000 samples small.
func (w *svg) use(c Class, x, y float64) {
	w.raw(`<use href="#` + classStyles[c].id + `" x="`)
	w.num(x, 0)
	w.raw(`" y="`)
	w.num(y, 0)
	w.raw(`"`)
}

// legend writes the class legend with counts at (x, y), one row per class
// that has markers, and returns the height used.
func (w *svg) legend(x, y float64, counts map[Class]int) float64 {
	w.raw(`<g class="legend">`)
	row := 0.0
	for _, c := range Classes {
		if counts[c] == 0 {
			continue
		}
		w.raw(`<g data-o="` + c.Slug() + `">`)
		w.use(c, x+6, y+row*18)
		w.raw("/>")
		w.raw(`<text`)
		w.numAttr("x", x+18, 1)
		w.numAttr("y", y+row*18+4, 1)
		w.raw(">")
		w.text(c.Label())
		w.raw(` <tspan fill="#5b6470">`)
		w.b = strconv.AppendInt(w.b, int64(counts[c]), 10)
		w.raw("</tspan></text></g>")
		row++
	}
	w.raw("</g>")
	return row * 18
}

package plot_test

import (
	"bytes"
	"compress/gzip"
	"encoding/xml"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"

	"meltbook/web/plot"
)

// element is a parsed SVG element, enough to check structure.
type element struct {
	name     string
	attrs    map[string]string
	children []*element
	text     string
}

func parseSVG(t testing.TB, b []byte) *element {
	t.Helper()
	d := xml.NewDecoder(bytes.NewReader(b))
	root := &element{}
	stack := []*element{root}
	for {
		tok, err := d.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("SVG is not well-formed XML: %v", err)
		}
		switch tk := tok.(type) {
		case xml.StartElement:
			e := &element{name: tk.Name.Local, attrs: map[string]string{}}
			for _, a := range tk.Attr {
				e.attrs[a.Name.Local] = a.Value
			}
			top := stack[len(stack)-1]
			top.children = append(top.children, e)
			stack = append(stack, e)
		case xml.EndElement:
			stack = stack[:len(stack)-1]
		case xml.CharData:
			stack[len(stack)-1].text += string(tk)
		}
	}
	if len(root.children) != 1 || root.children[0].name != "svg" {
		t.Fatalf("document root is not one <svg>")
	}
	return root.children[0]
}

// find returns every element below e (depth first) for which ok holds.
func (e *element) find(ok func(*element) bool) []*element {
	var out []*element
	for _, c := range e.children {
		if ok(c) {
			out = append(out, c)
		}
		out = append(out, c.find(ok)...)
	}
	return out
}

func hasClass(name string) func(*element) bool {
	return func(e *element) bool { return e.attrs["class"] == name }
}

// markersByOutcome counts <use> markers in the marks group per data-o.
func markersByOutcome(root *element) map[string][]*element {
	out := map[string][]*element{}
	for _, marks := range root.find(hasClass("marks")) {
		for _, g := range marks.children {
			for _, u := range g.children {
				if u.name == "use" {
					out[g.attrs["data-o"]] = append(out[g.attrs["data-o"]], u)
				}
			}
		}
	}
	return out
}

// fakeMarkers spreads n invented samples over the Al-rich part of a
// triangle, with classes in a fixed rotation.
func fakeMarkers(n int) []plot.TernaryMarker {
	r := rand.New(rand.NewPCG(7, 11))
	out := make([]plot.TernaryMarker, n)
	for i := range out {
		al := 0.55 + 0.2*r.Float64()
		fe := 0.05 + 0.15*r.Float64()
		cu := 1 - al - fe
		out[i] = plot.TernaryMarker{
			Point:            plot.Ternary{al, cu, fe},
			Class:            plot.Classes[i%len(plot.Classes)],
			Code:             "ZR-" + strconv.Itoa(10000+i),
			Composition:      plot.FormatComposition(comp("Al", al, "Cu", cu, "Fe", fe)),
			ElectronsPerAtom: 3*al + cu - 2.66*fe,
		}
	}
	return out
}

func TestTernaryMapSVG(t *testing.T) {
	tri := triangle(t, "Al", "Cu", "Fe+Si")
	markers := []plot.TernaryMarker{
		{Point: plot.Ternary{.63, .25, .12}, Class: plot.ClassIcosahedral, Code: `ZR-1 "a"&b`, Composition: "Al63Cu25Fe12", ElectronsPerAtom: 1.8208},
		{Point: plot.Ternary{.6, .3, .1}, Class: plot.ClassIcosahedral, Code: "ZR-2", ElectronsPerAtom: math.NaN()},
		{Point: plot.Ternary{.7, .2, .1}, Class: plot.ClassCrystalline, Code: "ZR-3", ElectronsPerAtom: 2},
		{Point: plot.Ternary{1.0 / 3, 1.0 / 3, 1.0 / 3}, Class: plot.ClassUndecided, Code: "ZR-4", ElectronsPerAtom: 1},
	}
	g := plot.SampleField(30, plot.ElectronField(alCuFe))
	iso := g.Contours([]float64{1.75})
	iso[0].Label = "1.75"
	m := &plot.TernaryMap{Triangle: tri, Title: "Al-Cu-(Fe+Si)", Notes: []string{"e/a lines: test scheme"}, Markers: markers, Isolines: iso}
	root := parseSVG(t, m.SVG())

	got := markersByOutcome(root)
	for slug, want := range map[string]int{"icosahedral": 2, "crystalline": 1, "undecided": 1, "decagonal": 0} {
		if len(got[slug]) != want {
			t.Errorf("%d %s markers, want %d", len(got[slug]), slug, want)
		}
	}
	first := got["icosahedral"][0]
	if first.attrs["data-c"] != `ZR-1 "a"&b` || first.attrs["data-e"] != "1.821" || first.attrs["data-x"] != "Al63Cu25Fe12" {
		t.Errorf("marker attributes %v", first.attrs)
	}
	// The centroid lands at (100 + 0.5·560, 560 − (√3/6)·560) = (380, 398.3)
	// in the map's pixels (A at x = 100, base at y = 560, side 560), drawn
	// at the nearest whole pixel.
	u := got["undecided"][0]
	if u.attrs["x"] != "380" || u.attrs["y"] != "398" {
		t.Errorf("centroid drawn at (%s, %s), want (380, 398)", u.attrs["x"], u.attrs["y"])
	}
	if x, y := plot.MapPixel(plot.Ternary{1.0 / 3, 1.0 / 3, 1.0 / 3}); math.Abs(x-380) > 1e-9 || math.Abs(y-(560-560*math.Sqrt(3)/6)) > 1e-9 {
		t.Errorf("MapPixel(centroid) = (%g, %g), want (380, 398.3)", x, y)
	}
	if _, ok := got["icosahedral"][1].attrs["data-e"]; ok {
		t.Error("unknown e/a was written")
	}
	// Corner labels and isoline label are present.
	var texts []string
	for _, e := range root.find(func(e *element) bool { return e.name == "text" }) {
		texts = append(texts, e.text)
	}
	joined := strings.Join(texts, "|")
	for _, want := range []string{"Al", "Cu", "(Fe+Si)", "1.75", "e/a lines: test scheme"} {
		if !strings.Contains(joined, want) {
			t.Errorf("no text %q in %q", want, joined)
		}
	}
	if paths := root.find(func(e *element) bool { return e.attrs["data-level"] == "1.75" }); len(paths) != 1 {
		t.Errorf("%d isoline paths at 1.75, want 1", len(paths))
	}
	// No style attributes: pages forbid inline styles.
	for _, e := range root.find(func(*element) bool { return true }) {
		if _, ok := e.attrs["style"]; ok {
			t.Fatalf("<%s> has a style attribute", e.name)
		}
	}
}

func TestTernaryMapOf10000SamplesStaysSmall(t *testing.T) {
	tri := triangle(t, "Al", "Cu", "Fe")
	m := &plot.TernaryMap{Triangle: tri, Title: "Al-Cu-Fe", Markers: fakeMarkers(10000)}
	b := m.SVG()
	// No page may exceed 1 MB in transfer. meltbook's own limits for the
	// map: 950 000 bytes as written (every invented composition here has a
	// decimal on each element, the worst case) and 300 000 gzipped, as the
	// server sends it.
	var z bytes.Buffer
	zw := gzip.NewWriter(&z)
	zw.Write(b)
	zw.Close()
	if len(b) > 950_000 || z.Len() > 300_000 {
		t.Errorf("map of 10 000 samples is %d bytes, %d gzipped; limits 950 000 and 300 000", len(b), z.Len())
	}
	t.Logf("map of 10 000 samples: %d bytes, %d gzipped", len(b), z.Len())
	got := markersByOutcome(parseSVG(t, b))
	total := 0
	for _, c := range plot.Classes {
		total += len(got[c.Slug()])
	}
	if total != 10000 {
		t.Errorf("%d markers drawn, want 10000", total)
	}
}

func TestScatterSVG(t *testing.T) {
	s := &plot.Scatter{
		Title: "e/a against cooling rate",
		X:     plot.Axis{Label: "e/a"},
		Y:     plot.Axis{Label: "cooling rate (K/s)", Log: true},
		Markers: []plot.ScatterMarker{
			{X: 1.75, Y: 3e5, Class: plot.ClassIcosahedral, Code: "ZR-1", ElectronsPerAtom: 1.75, Hover: "3×10⁵ K/s"},
			{X: 1.62, Y: 2e6, Class: plot.ClassAmorphous, Code: "ZR-2", ElectronsPerAtom: 1.62},
			{X: 1.91, Y: 0, Class: plot.ClassCrystalline, Code: "no rate on a log axis"},
			{X: math.NaN(), Y: 1e6, Class: plot.ClassCrystalline, Code: "no e/a"},
		},
	}
	if s.Plotted() != 2 {
		t.Errorf("Plotted = %d, want 2", s.Plotted())
	}
	root := parseSVG(t, s.SVG())
	got := markersByOutcome(root)
	if len(got["icosahedral"]) != 1 || len(got["amorphous"]) != 1 || len(got["crystalline"]) != 0 {
		t.Errorf("markers %v", got)
	}
	if h := got["icosahedral"][0].attrs["data-h"]; h != "3×10⁵ K/s" {
		t.Errorf("data-h = %q", h)
	}
	var texts []string
	for _, e := range root.find(func(e *element) bool { return e.name == "text" }) {
		texts = append(texts, e.text)
	}
	joined := strings.Join(texts, "|")
	// Only the two plottable markers set the ranges. y: decades from 10⁵
	// (⌊log 3e5⌋) to 10⁷ (⌈log 2e6⌉). x by Heckbert over 1.62 … 1.75:
	// range nice(0.13) = 0.2, step nice(0.2/6 = 0.033) = 0.05, so ticks
	// 1.60, 1.65, 1.70, 1.75.
	for _, want := range []string{"10⁵", "10⁶", "10⁷", "1.60", "1.65", "1.75", "e/a", "cooling rate (K/s)"} {
		if !strings.Contains(joined, want) {
			t.Errorf("no tick or label %q in %q", want, joined)
		}
	}
}

func TestPatternSVG(t *testing.T) {
	// A synthetic pattern: flat background 100 with two Gaussian peaks.
	var p plot.Pattern
	for i := 0; i <= 3000; i++ {
		tt := 20 + 0.02*float64(i)
		bg := 100.0
		peak := 900*math.Exp(-math.Pow((tt-42.9)/0.08, 2)) + 300*math.Exp(-math.Pow((tt-62.4)/0.1, 2))
		p.TwoThetaDeg = append(p.TwoThetaDeg, tt)
		p.Counts = append(p.Counts, bg+peak)
		p.Background = append(p.Background, bg)
		p.Fit = append(p.Fit, bg+peak)
	}
	p.Peaks = []plot.PeakMark{{TwoThetaDeg: 62.4, Label: "(20,32)", Explained: true}, {TwoThetaDeg: 42.9, Label: "(18,29)", Explained: true}, {TwoThetaDeg: 55.1}}
	pp := &plot.PatternPlot{Title: "ZR-1 scan", Pattern: p}
	b, err := pp.SVG()
	if err != nil {
		t.Fatal(err)
	}
	root := parseSVG(t, b)
	if root.attrs["data-t0"] != "20" || root.attrs["data-t1"] != "80" {
		t.Errorf("data-t0/t1 = %s/%s, want 20/80", root.attrs["data-t0"], root.attrs["data-t1"])
	}
	area := root.find(hasClass("plot-area"))
	if len(area) != 1 || area[0].attrs["viewBox"] != "20 0 60 1000" {
		t.Fatalf("plot area %v", area)
	}
	labels := root.find(func(e *element) bool { return e.attrs["data-t"] != "" })
	if len(labels) != 3 {
		t.Fatalf("%d peak labels, want 3", len(labels))
	}
	if labels[0].attrs["data-t"] != "42.9" || labels[2].attrs["class"] != "" || labels[1].attrs["class"] != "unexplained" {
		t.Errorf("peak labels not sorted by 2θ or unexplained peak not marked: %v %v %v", labels[0].attrs, labels[1].attrs, labels[2].attrs)
	}
	for _, series := range []string{"counts", "background", "fit"} {
		if len(root.find(hasClass(series))) != 1 {
			t.Errorf("no %s curve", series)
		}
	}
	// Two labelled peaks 0.1° apart (1.5 px at 60° over 870 px) cannot
	// stand side by side: the second stands above the first, its foot at
	// least the first's length ("(18,29)", 7 characters at 6.2 px, 43.4 px)
	// higher.
	close := p
	close.Peaks = []plot.PeakMark{{TwoThetaDeg: 42.9, Label: "(18,29)", Explained: true}, {TwoThetaDeg: 43.0, Label: "(20,32)", Explained: true}}
	b, err = (&plot.PatternPlot{Pattern: close}).SVG()
	if err != nil {
		t.Fatal(err)
	}
	feet := []float64{}
	for _, g := range parseSVG(t, b).find(func(e *element) bool { return e.attrs["data-t"] != "" }) {
		var x, y float64
		fmt.Sscanf(g.attrs["transform"], "translate(%g %g)", &x, &y)
		feet = append(feet, y)
	}
	if len(feet) != 2 || feet[0]-feet[1] < 43.4 {
		t.Errorf("label feet at %v px: the second should stand at least 43.4 px above the first", feet)
	}

	bad := p
	bad.Counts = bad.Counts[:10]
	if _, err := (&plot.PatternPlot{Pattern: bad}).SVG(); err == nil {
		t.Error("mismatched arrays were drawn")
	}
	bad = p
	bad.TwoThetaDeg = append([]float64{30}, p.TwoThetaDeg[1:]...)
	if _, err := (&plot.PatternPlot{Pattern: bad}).SVG(); err == nil {
		t.Error("decreasing 2θ was drawn")
	}
}

func BenchmarkTernaryMapSVG10000(b *testing.B) {
	tri, _ := plot.NewTriangle(plot.Corner{Elements: []string{"Al"}}, plot.Corner{Elements: []string{"Cu"}}, plot.Corner{Elements: []string{"Fe"}})
	markers := fakeMarkers(10000)
	b.ReportAllocs()
	for b.Loop() {
		g := plot.SampleField(48, plot.ElectronField(alCuFe))
		levels, _ := plot.Levels(-2.66, 3, 8)
		m := &plot.TernaryMap{Triangle: tri, Title: "Al-Cu-Fe", Markers: markers, Isolines: g.Contours(levels)}
		b.SetBytes(int64(len(m.SVG())))
	}
}

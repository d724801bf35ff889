package intake_test

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"meltbook"
	"meltbook/analysis/element"
	"meltbook/store"
)

// Wavelengths of Cu Kα1 and Kα2 in Å: Hölzer et al., Phys. Rev. A 56,
// 4554 (1997).
const (
	cuKa1 = 1.5405929
	cuKa2 = 1.5444274
)

// alA is the lattice constant of fcc aluminium at room temperature, Å
// (from memory: handbook value).
const alA = 4.0495

// line is one powder line of a test pattern: a d-spacing (Å) and a relative
// height.
type line struct {
	d, height float64
}

// cubicLines lists the lines of a cubic cell a (Å) for the given hkl with
// relative heights.
func cubicLines(a float64, hkl [][3]int, heights []float64) []line {
	out := make([]line, len(hkl))
	for i, h := range hkl {
		out[i] = line{d: a / math.Sqrt(float64(h[0]*h[0]+h[1]*h[1]+h[2]*h[2])), height: heights[i]}
	}
	return out
}

// fccAlLines are the first eight fcc reflections (h, k, l all odd or all
// even) with rough relative heights (from memory; their exact values do not
// matter to the indexing, which weighs positions).
func fccAlLines() []line {
	return cubicLines(alA,
		[][3]int{{1, 1, 1}, {2, 0, 0}, {2, 2, 0}, {3, 1, 1}, {2, 2, 2}, {4, 0, 0}, {3, 3, 1}, {4, 2, 0}},
		[]float64{100, 47, 22, 24, 7, 2, 8, 8})
}

// pattern builds an XY scan from 20° to 100° 2θ in steps of 0.02° with Cu
// Kα1 and Kα2 (half the height, at its own Bragg angle), Gaussian peaks of
// 0.12° FWHM scaled to peakCounts, a background falling from about 300
// counts, an optional broad hump, and Poisson noise from seed. Every
// position follows Bragg's law, 2θ = 2 asin(λ/2d), computed here.
func pattern(lines []line, peakCounts float64, hump *hump, seed uint64) []byte {
	return shiftedPattern(lines, peakCounts, hump, 0, seed)
}

// shiftedPattern is pattern with every line moved by zeroDeg in 2θ, as a
// diffractometer's zero error moves them.
func shiftedPattern(lines []line, peakCounts float64, hump *hump, zeroDeg float64, seed uint64) []byte {
	rng := rand.New(rand.NewPCG(seed, 7))
	var b strings.Builder
	b.WriteString("# invented test pattern, Cu Kα1/Kα2\n2Theta Counts\n")
	const fwhm = 0.12
	sigma := fwhm / (2 * math.Sqrt(2*math.Ln2))
	for i := 0; i <= 4000; i++ {
		tt := 20 + 0.02*float64(i)
		y := 60 + 240*math.Exp(-(tt-20)/25)
		for _, l := range lines {
			for _, w := range []struct{ lambda, scale float64 }{{cuKa1, 1}, {cuKa2, 0.5}} {
				s := w.lambda / (2 * l.d)
				if s >= 1 {
					continue
				}
				c := 2*math.Asin(s)*180/math.Pi + zeroDeg
				y += w.scale * peakCounts * l.height / 100 * math.Exp(-(tt-c)*(tt-c)/(2*sigma*sigma))
			}
		}
		if hump != nil {
			hs := hump.fwhm / (2 * math.Sqrt(2*math.Ln2))
			y += hump.height * math.Exp(-(tt-hump.centre)*(tt-hump.centre)/(2*hs*hs))
		}
		fmt.Fprintf(&b, "%.2f %d\n", tt, poisson(rng, y))
	}
	return []byte(b.String())
}

// hump is a broad Gaussian maximum: centre and FWHM in degrees 2θ, height
// in counts.
type hump struct{ centre, fwhm, height float64 }

// poisson draws a Poisson count of mean mu (normal approximation above 50).
func poisson(rng *rand.Rand, mu float64) int {
	if mu > 50 {
		return max(0, int(math.Round(mu+math.Sqrt(mu)*rng.NormFloat64())))
	}
	l, k, p := math.Exp(-mu), 0, 1.0
	for {
		p *= rng.Float64()
		if p <= l {
			return k
		}
		k++
	}
}

// clock moves on one second per reading.
type clock struct{ t time.Time }

func (c *clock) now() time.Time {
	c.t = c.t.Add(time.Second)
	return c.t
}

// mustOpen creates a notebook with the built-in valence schemes.
func mustOpen(tb testing.TB) *store.Store {
	tb.Helper()
	valences := map[string]map[string]float64{}
	for _, name := range element.SchemeNames() {
		if s, ok := element.LookupScheme(name); ok {
			valences[name] = s.Valence
		}
	}
	c := &clock{t: time.Date(2026, 6, 1, 9, 0, 0, 0, time.UTC)}
	st, err := store.Init(context.Background(), filepath.Join(tb.TempDir(), "notebook.db"), store.Options{Now: c.now, Valences: valences})
	if err != nil {
		tb.Fatal(err)
	}
	tb.Cleanup(func() { st.Close() })
	return st
}

// addMelt logs an invented melt with its own sample.
func addMelt(tb testing.TB, st *store.Store, code string, fractions ...any) {
	tb.Helper()
	m := &meltbook.Melt{Code: code, Operator: "Ada Quill", CompositionEntered: code, TargetMassGrams: 10}
	for i := 0; i < len(fractions); i += 2 {
		m.Nominal = append(m.Nominal, meltbook.ElementFraction{Element: fractions[i].(string), Fraction: fractions[i+1].(float64)})
	}
	if err := st.CreateMelt(context.Background(), "Ada Quill", m); err != nil {
		tb.Fatal(err)
	}
}

// icosahedralFLines are F-type icosahedral lines of quasilattice constant
// aR (Å), for the reflection families (N, M) usually indexed in powder
// patterns of i-Al-Cu-Fe (from memory), with invented relative heights. d
// follows from Cahn, Shechtman and Gratias, J. Mater. Res. 1, 13 (1986):
//
//	1/d = |G∥| = (1/a6)·sqrt((N + Mτ)/(2(2+τ))),  a6 = √2·a_R
func icosahedralFLines(aR float64) []line {
	tau := (1 + math.Sqrt(5)) / 2
	a6 := math.Sqrt2 * aR
	fams := []struct {
		n, m   int
		height float64
	}{{6, 9, 15}, {7, 11, 25}, {15, 24, 8}, {18, 29, 100}, {20, 32, 75}, {38, 61, 12}, {47, 76, 10}, {52, 84, 25}, {70, 113, 10}}
	out := make([]line, len(fams))
	for i, f := range fams {
		g := math.Sqrt((float64(f.n)+float64(f.m)*tau)/(2*(2+tau))) / a6
		out[i] = line{d: 1 / g, height: f.height}
	}
	return out
}

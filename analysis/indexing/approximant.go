package indexing

import (
	"fmt"
	"math"
	"sort"

	"meltbook/analysis/indexing/icosa"
)

// Reference is a quasilattice constant that cubic approximants are sought
// around.
type Reference struct {
	Name                  string  `json:"name"`
	QuasilatticeConstantA float64 `json:"quasilattice_constant_A"` // a_R = a6/√2, Å
	Source                string  `json:"source"`
}

// ReferenceFamilies are typical quasilattice constants of the icosahedral
// alloy families most often made by melt spinning. The values are rounded
// figures widely quoted in the quasicrystal literature; each Source says
// where the value was taken from.
var ReferenceFamilies = []Reference{
	{Name: "i-Al-Cu-Fe", QuasilatticeConstantA: 4.46, Source: "from memory: a6 ≈ 6.31 Å as widely quoted for the F-type phase found by Tsai, Inoue, Masumoto (1987)"},
	{Name: "i-Al-Pd-Mn", QuasilatticeConstantA: 4.56, Source: "from memory: a6 ≈ 6.45 Å as widely quoted for the F-type phase"},
	{Name: "i-Al-Mn(-Si)", QuasilatticeConstantA: 4.60, Source: "from memory; consistent with α-AlMnSi a = 12.68 Å divided by the 1/1 factor 2.7528 (Elser & Henley, Phys. Rev. Lett. 55, 2883 (1985))"},
	{Name: "i-Cd-Yb", QuasilatticeConstantA: 5.69, Source: "from memory: a6 ≈ 8.05 Å as widely quoted for i-Cd5.7Yb (Tsai et al., Nature 408, 537 (2000))"},
}

// Order is a cubic approximant order p/q: the rational p/q stands in for τ.
type Order struct{ P, Q int }

// String writes "p/q".
func (o Order) String() string { return fmt.Sprintf("%d/%d", o.P, o.Q) }

// DefaultOrders are the approximant orders searched unless Options says
// otherwise. Order 3/2 is left out: its cells (a ≈ 32–41 Å) put a powder
// line every 0.06–0.12° of 2θ for Cu Kα, so at the default tolerance any
// peak list indexes on them and the search has no power; add it for
// high-resolution data with a tolerance of a few hundredths of a degree.
var DefaultOrders = []Order{{1, 1}, {2, 1}}

// ApproximantFactor returns the ratio of the cubic lattice constant of a
// p/q approximant to the quasilattice constant:
//
//	a / a_R = 2 (q + pτ) / √(2 + τ)
//
// (2.7528 for 1/1, 4.4541 for 2/1, 7.2068 for 3/2). It panics unless
// p ≥ 1 and q ≥ 1.
//
// Reference: V. Elser, C. L. Henley, Phys. Rev. Lett. 55, 2883 (1985),
// doi:10.1103/PhysRevLett.55.2883.
func ApproximantFactor(o Order) float64 {
	if o.P < 1 || o.Q < 1 {
		panic(fmt.Sprintf("indexing: approximant order %d/%d", o.P, o.Q))
	}
	return 2 * (float64(o.Q) + float64(o.P)*icosa.Tau) / math.Sqrt(2+icosa.Tau)
}

// approxWindow is the cubic constant range of one order of one reference.
type approxWindow struct {
	window
	order     Order
	reference string
	ideal     float64 // ideal cubic constant, Å
}

// approximantWindows lists the windows of every order around every
// reference a_R, merged where they overlap, sorted by lower edge.
func approximantWindows(refs []Reference, orders []Order, tol float64) []approxWindow {
	var out []approxWindow
	for _, r := range refs {
		for _, o := range orders {
			ideal := ApproximantFactor(o) * r.QuasilatticeConstantA
			out = append(out, approxWindow{window{ideal * (1 - tol), ideal * (1 + tol)}, o, r.Name, ideal})
		}
	}
	sort.Slice(out, func(i, j int) bool { return out[i].lo < out[j].lo })
	return out
}

// mergedWindows returns the union of the approximant windows as plain
// windows for the search.
func mergedWindows(ws []approxWindow) []window {
	var out []window
	for _, w := range ws {
		if n := len(out); n > 0 && w.lo <= out[n-1].hi {
			out[n-1].hi = math.Max(out[n-1].hi, w.hi)
			continue
		}
		out = append(out, w.window)
	}
	return out
}

// approximantWindow returns the index of the window whose ideal constant
// lies nearest a among those containing a, or -1.
func (m *model) approximantWindow(a float64) int {
	best, bestDist := -1, math.Inf(1)
	for i, w := range m.approx {
		if a < w.lo || a > w.hi {
			continue
		}
		if d := math.Abs(a/w.ideal - 1); d < bestDist {
			best, bestDist = i, d
		}
	}
	return best
}

// strongLinesIcosahedral checks that the strongest indexed peaks of an
// approximant solution sit within strongShift (relative, in q) of an
// icosahedral family with |G⊥|·a6 ≤ strongPerp, for the a6 the cubic
// constant implies through the solution's order.
func (m *model) strongLinesIcosahedral(peaks []Peak, sol solution, lambda float64) bool {
	w := m.approx[sol.approx]
	a6 := sol.a / ApproximantFactor(w.order) * math.Sqrt2
	var idx []int
	for i, j := range sol.assign {
		if j >= 0 {
			idx = append(idx, i)
		}
	}
	sort.SliceStable(idx, func(i, j int) bool { return peaks[idx[i]].Intensity > peaks[idx[j]].Intensity })
	if len(idx) > strongPeaks {
		idx = idx[:strongPeaks]
	}
	fams := allFamilies(icosa.FaceCentred)
	for _, i := range idx {
		g := qAt(peaks[i].TwoThetaDeg-sol.z, lambda) * a6
		near := false
		for _, f := range fams {
			if f.Perp <= strongPerp && math.Abs(f.Parallel/g-1) <= strongShift {
				near = true
				break
			}
		}
		if !near {
			return false
		}
	}
	return true
}

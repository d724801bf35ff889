package plot

import (
	"math"
	"sort"
)

// Grid holds a scalar field sampled at the nodes of a triangular grid that
// divides each side of the Gibbs triangle into N parts. Node (i, j), with
// i + j ≤ N, is the point (a, b, c) = ((N−i−j)/N, i/N, j/N).
type Grid struct {
	N      int
	values []float64
}

// SampleField evaluates f at every node of a grid with n divisions per side.
// f may return NaN where the field is undefined; triangles touching such a
// node draw no isoline. It panics when n < 1.
func SampleField(n int, f func(Ternary) float64) *Grid {
	if n < 1 {
		panic("plot: SampleField needs at least one division per side")
	}
	g := &Grid{N: n, values: make([]float64, (n+1)*(n+2)/2)}
	for j := 0; j <= n; j++ {
		for i := 0; i+j <= n; i++ {
			g.values[g.index(i, j)] = f(g.node(i, j))
		}
	}
	return g
}

// index numbers node (i, j) row by row: row j holds N+1−j nodes.
func (g *Grid) index(i, j int) int { return j*(g.N+1) - j*(j-1)/2 + i }

func (g *Grid) node(i, j int) Ternary {
	n := float64(g.N)
	b, c := float64(i)/n, float64(j)/n
	return Ternary{1 - b - c, b, c}
}

// Range returns the smallest and largest finite values on the grid; both are
// NaN when there is none.
func (g *Grid) Range() (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, v := range g.values {
		if math.IsNaN(v) {
			continue
		}
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	if lo > hi {
		return math.NaN(), math.NaN()
	}
	return lo, hi
}

// Isoline is the set of curves on which a field equals Level.
type Isoline struct {
	Level float64 `json:"level"`
	// Label is written beside the curve, e.g. "1.75".
	Label string `json:"label"`
	// Lines are polylines in ternary coordinates; a closed curve repeats
	// its first point at the end.
	Lines [][]Ternary `json:"lines"`
}

// Isolines returns the curve where the field equals level, by marching
// triangles: in each small triangle of the grid the field is taken as the
// linear interpolant of its three node values, so the curve crosses an edge
// whose ends lie on opposite sides of the level at
//
//	t = (level − v_p) / (v_q − v_p),  point = p + t·(q − p)
//
// and joins the two crossings of the triangle by a straight segment. A node
// exactly at the level counts as below it. Segments are then chained into
// polylines. For a field that is linear in composition the curve is exact;
// otherwise its error shrinks with the grid spacing 1/N.
//
// Reference: common practice (marching triangles, the triangular analogue of
// marching squares: Lorensen & Cline, SIGGRAPH 1987, doi:10.1145/37402.37422).
func (g *Grid) Isolines(level float64) [][]Ternary {
	var segs [][2]Ternary
	n := g.N
	for j := 0; j < n; j++ {
		for i := 0; i+j < n; i++ {
			// Upward triangle and, where it fits, the downward one beside it.
			segs = g.march(segs, level, [3][2]int{{i, j}, {i + 1, j}, {i, j + 1}})
			if i+j < n-1 {
				segs = g.march(segs, level, [3][2]int{{i + 1, j}, {i + 1, j + 1}, {i, j + 1}})
			}
		}
	}
	return chain(segs)
}

// Contours returns one Isoline per level, without labels.
func (g *Grid) Contours(levels []float64) []Isoline {
	out := make([]Isoline, 0, len(levels))
	for _, l := range levels {
		out = append(out, Isoline{Level: l, Lines: g.Isolines(l)})
	}
	return out
}

func (g *Grid) march(segs [][2]Ternary, level float64, tri [3][2]int) [][2]Ternary {
	var idx [3]int
	var val [3]float64
	for k, v := range tri {
		idx[k] = g.index(v[0], v[1])
		val[k] = g.values[idx[k]]
		if math.IsNaN(val[k]) {
			return segs
		}
	}
	var pts [2]Ternary
	found := 0
	for _, e := range [3][2]int{{0, 1}, {1, 2}, {2, 0}} {
		p, q := e[0], e[1]
		if (val[p] > level) == (val[q] > level) {
			continue
		}
		// Interpolate from the lower-numbered node so that the two
		// triangles sharing an edge compute the same crossing bit for bit.
		if idx[p] > idx[q] {
			p, q = q, p
		}
		pts[found] = g.crossing(tri[p], tri[q], val[p], val[q], level)
		found++
	}
	// A node on (or within rounding of) the level can yield a segment of
	// no length; it would only split curves, so it is dropped.
	if found == 2 && keyOf(pts[0]) != keyOf(pts[1]) {
		segs = append(segs, [2]Ternary{pts[0], pts[1]})
	}
	return segs
}

func (g *Grid) crossing(p, q [2]int, vp, vq, level float64) Ternary {
	t := (level - vp) / (vq - vp)
	a, b := g.node(p[0], p[1]), g.node(q[0], q[1])
	switch {
	case t <= 0:
		return a
	case t >= 1:
		return b
	}
	return Ternary{a[0] + t*(b[0]-a[0]), a[1] + t*(b[1]-a[1]), a[2] + t*(b[2]-a[2])}
}

type pointKey [2]int64

func keyOf(p Ternary) pointKey {
	return pointKey{int64(math.Round(p[1] * 1e9)), int64(math.Round(p[2] * 1e9))}
}

// chain joins segments that share end points into polylines, starting from
// loose ends so that open curves come out whole, then closing loops.
func chain(segs [][2]Ternary) [][]Ternary {
	ends := make(map[pointKey][]int, 2*len(segs))
	for s, seg := range segs {
		for _, p := range seg {
			k := keyOf(p)
			ends[k] = append(ends[k], s)
		}
	}
	used := make([]bool, len(segs))
	next := func(at Ternary) (Ternary, bool) {
		for _, s := range ends[keyOf(at)] {
			if used[s] {
				continue
			}
			used[s] = true
			if keyOf(segs[s][0]) == keyOf(at) {
				return segs[s][1], true
			}
			return segs[s][0], true
		}
		return Ternary{}, false
	}
	walk := func(start Ternary) []Ternary {
		line := []Ternary{start}
		for at := start; ; {
			p, ok := next(at)
			if !ok {
				return line
			}
			line = append(line, p)
			at = p
		}
	}
	var lines [][]Ternary
	// Loose ends first: an end shared with no other segment.
	starts := make([]pointKey, 0)
	for k, ss := range ends {
		if len(ss) == 1 {
			starts = append(starts, k)
		}
	}
	sort.Slice(starts, func(i, j int) bool {
		if starts[i][0] != starts[j][0] {
			return starts[i][0] < starts[j][0]
		}
		return starts[i][1] < starts[j][1]
	})
	for _, k := range starts {
		s := ends[k][0]
		if used[s] {
			continue
		}
		p := segs[s][0]
		if keyOf(p) != k {
			p = segs[s][1]
		}
		lines = append(lines, walk(p))
	}
	for s := range segs {
		if !used[s] {
			lines = append(lines, walk(segs[s][0]))
		}
	}
	return lines
}

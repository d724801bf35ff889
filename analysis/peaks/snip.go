package peaks

import "math"

// SNIP estimates the background under the peaks of y by the Statistics-
// sensitive Non-linear Iterative Peak-clipping algorithm. With lls true the
// data first pass through the log-log-square-root operator, which makes the
// clipping act alike on weak and strong peaks:
//
//	v = ln(ln(√(y + 1) + 1) + 1)
//	for p = 1 … m:  v_i ← min(v_i, (v_{i−p} + v_{i+p}) / 2)
//	y_bg = (exp(exp(v) − 1) − 1)² − 1
//
// m is halfWindowPoints: it should be about the full width of the broadest
// peak, in points. Near the ends the window shrinks to what the data allow,
// and the two end points are kept.
// Negative values of y are taken as zero under the operator. The result
// has the length of y; y is not changed.
//
// Reference: C. G. Ryan, E. Clayton, W. L. Griffin, S. H. Sie and D. R.
// Cousens, Nucl. Instrum. Methods B 34, 396 (1988),
// doi:10.1016/0168-583X(88)90063-8 (SNIP and the LLS operator); the
// increasing clipping window follows M. Morháč, J. Kliman, V. Matoušek,
// M. Veselský and I. Turzo, Nucl. Instrum. Methods A 401, 113 (1997),
// doi:10.1016/S0168-9002(97)01023-1.
func SNIP(y []float64, halfWindowPoints int, lls bool) []float64 {
	v := make([]float64, len(y))
	snipInto(v, make([]float64, len(y)), y, halfWindowPoints, lls)
	return v
}

// snipInto writes the SNIP background of y into v, using w as scratch.
func snipInto(v, w, y []float64, m int, lls bool) {
	n := len(y)
	if n == 0 {
		return
	}
	for i, yi := range y {
		if lls {
			v[i] = math.Log(math.Log(math.Sqrt(math.Max(yi, 0)+1)+1) + 1)
		} else {
			v[i] = yi
		}
	}
	cur, next := v, w
	clip := func(i, q int) {
		if a := 0.5 * (cur[i-q] + cur[i+q]); a < cur[i] {
			next[i] = a
		} else {
			next[i] = cur[i]
		}
	}
	for p := 1; p <= m && p < n; p++ {
		next[0], next[n-1] = cur[0], cur[n-1]
		e1 := min(p, n-1)
		for i := 1; i < e1; i++ {
			clip(i, min(i, n-1-i))
		}
		lo, mid, hi := cur[:max(n-2*p, 0)], cur[p:max(n-p, p)], cur[min(2*p, n):]
		out := next[p:max(n-p, p)]
		for i := range mid {
			a := 0.5 * (lo[i] + hi[i])
			if c := mid[i]; c < a {
				a = c
			}
			out[i] = a
		}
		for i := max(n-p, e1); i < n-1; i++ {
			clip(i, min(p, i, n-1-i))
		}
		cur, next = next, cur
	}
	if &cur[0] != &v[0] {
		copy(v, cur)
	}
	if lls {
		for i, vi := range v {
			t := math.Exp(math.Exp(vi)-1) - 1
			v[i] = t*t - 1
		}
	}
}

package plot

import "math"

// NiceTicks returns evenly spaced round values covering [lo, hi], about
// want of them, by Heckbert's rule: the range is rounded to a "nice" number
// (1, 2, 5 or 10 times a power of ten), the step to the nearest nice number
// of range/(want−1), and the ends outward to whole steps:
//
//	step = nice(nice(hi − lo)/(want − 1), rounded)
//	first = ⌊lo/step⌋·step,  last = ⌈hi/step⌉·step
//
// It returns the ticks and the step. When lo = hi the range is widened by
// one unit around the value (or ±1 around 0). It panics when want < 2 or an
// end is not finite.
//
// Reference: P. S. Heckbert, "Nice numbers for graph labels", in Graphics
// Gems (Academic Press, 1990), pp. 61-63, doi:10.1016/B978-0-08-050753-8.50020-5.
func NiceTicks(lo, hi float64, want int) (ticks []float64, step float64) {
	if want < 2 || math.IsNaN(lo) || math.IsNaN(hi) || math.IsInf(lo, 0) || math.IsInf(hi, 0) {
		panic("plot: NiceTicks needs finite ends and want ≥ 2")
	}
	if lo > hi {
		lo, hi = hi, lo
	}
	if lo == hi {
		d := math.Abs(lo)
		if d == 0 {
			d = 1
		}
		lo, hi = lo-d, hi+d
	}
	step = niceNumber(niceNumber(hi-lo, false)/float64(want-1), true)
	first := math.Floor(lo/step) * step
	last := math.Ceil(hi/step) * step
	for k := 0; ; k++ {
		v := first + float64(k)*step
		if v > last+step/2 {
			break
		}
		// Snap values like 0.30000000000000004 to the step's decimals.
		ticks = append(ticks, roundTo(v, step))
	}
	return ticks, step
}

// niceNumber rounds x to 1, 2, 5 or 10 times a power of ten: to the nearest
// when round is set, else up.
func niceNumber(x float64, round bool) float64 {
	exp := math.Floor(math.Log10(x))
	f := x / math.Pow(10, exp)
	var nf float64
	switch {
	case round && f < 1.5:
		nf = 1
	case round && f < 3:
		nf = 2
	case round && f < 7:
		nf = 5
	case round:
		nf = 10
	case f <= 1:
		nf = 1
	case f <= 2:
		nf = 2
	case f <= 5:
		nf = 5
	default:
		nf = 10
	}
	return nf * math.Pow(10, exp)
}

// Decimals is the number of decimals needed to write multiples of step.
func Decimals(step float64) int {
	if !(step > 0) {
		return 0
	}
	d := int(math.Ceil(-math.Log10(step) - 1e-9))
	if d < 0 {
		return 0
	}
	return d
}

func roundTo(v, step float64) float64 {
	p := math.Pow(10, float64(Decimals(step)))
	return math.Round(v*p) / p
}

// Levels returns the nice values strictly inside (lo, hi), about want of
// them, for isolines of a field whose range over the triangle is [lo, hi].
func Levels(lo, hi float64, want int) (levels []float64, step float64) {
	if !(hi > lo) {
		return nil, 0
	}
	ticks, step := NiceTicks(lo, hi, want+2)
	for _, t := range ticks {
		if t > lo && t < hi {
			levels = append(levels, t)
		}
	}
	return levels, step
}

package halo

import (
	"math"
)

// Criteria a hump must meet to count as a halo.
const (
	// BlockDeg is the width of the blocks the scan is averaged over, 2θ.
	BlockDeg = 0.5
	// MinFWHMDeg and MaxFWHMDeg bound the halo's width, 2θ: narrower is a
	// (broadened) peak, wider is background.
	MinFWHMDeg = 3.0
	MaxFWHMDeg = 30.0
	// MinSignificance is the least height over the standard uncertainty of
	// a block mean from counting statistics.
	MinSignificance = 10.0
	// MinRelativeHeight is the least height as a fraction of the baseline
	// under the maximum.
	MinRelativeHeight = 0.1
)

// Halo is a diffuse maximum found in a scan.
type Halo struct {
	// CentreDeg is 2θ of the maximum, FWHMDeg its full width at half
	// maximum above the baseline, both in degrees.
	CentreDeg, FWHMDeg float64
	// HeightCounts is the maximum above the baseline, BaselineCounts the
	// baseline under it, in the scan's intensity units.
	HeightCounts, BaselineCounts float64
	// AreaCountsDeg is the net area of the hump between its half-maximum
	// points scaled to the whole of a Gaussian of that width,
	// 1.0645·height·FWHM, in intensity units × degrees.
	AreaCountsDeg float64
	// Significance is HeightCounts over the standard uncertainty of the
	// block mean at the maximum.
	Significance float64
	// QPerA is the scattering vector of the centre, 4π sin θ/λ, in Å⁻¹.
	QPerA float64
}

// Find looks for a halo in a scan of angles twoThetaDeg (degrees, strictly
// increasing) and intensities counts (counts per point, so that their
// variance is their value), measured with wavelength lambdaA (Å):
//
//  1. the scan is averaged over blocks of BlockDeg: ȳ_b over k_b points;
//  2. the baseline is the lower convex hull of the block means, so that a
//     smooth background falling or rising towards the ends lies under it
//     and a hump rises above it;
//  3. the highest net block mean N = ȳ_b − baseline is the candidate, with
//     significance N / sqrt(ȳ_b / k_b) (counting statistics);
//  4. its width is measured where the net curve falls to N/2 on both sides
//     (linear interpolation between blocks); a hump that does not fall to
//     half on both sides inside the scan is not taken.
//
// It reports a halo when the width lies in [MinFWHMDeg, MaxFWHMDeg], the
// significance is at least MinSignificance and N is at least
// MinRelativeHeight of the baseline. It needs at least ten blocks; ok is
// false otherwise and when nothing meets the criteria. It panics when the
// slices differ in length.
//
// Reference: the lower-hull baseline and counting statistics are common
// practice; the criteria are meltbook's own. Q = 4π sin θ/λ, common practice.
func Find(twoThetaDeg, counts []float64, lambdaA float64) (h Halo, ok bool) {
	if len(twoThetaDeg) != len(counts) {
		panic("halo: angles and counts differ in length")
	}
	xs, ys, ks := blocks(twoThetaDeg, counts)
	if len(xs) < 10 || !(lambdaA > 0) {
		return h, false
	}
	base := lowerHull(xs, ys)
	net := make([]float64, len(xs))
	top := 0
	for i := range xs {
		net[i] = ys[i] - base[i]
		if net[i] > net[top] {
			top = i
		}
	}
	height := net[top]
	if !(height > 0) {
		return h, false
	}
	left, okL := crossing(xs, net, top, -1, height/2)
	right, okR := crossing(xs, net, top, +1, height/2)
	if !okL || !okR {
		return h, false
	}
	h = Halo{
		CentreDeg:      xs[top],
		FWHMDeg:        right - left,
		HeightCounts:   height,
		BaselineCounts: base[top],
		Significance:   height / math.Sqrt(math.Max(ys[top], 1)/float64(ks[top])),
	}
	h.AreaCountsDeg = 1.0645 * h.HeightCounts * h.FWHMDeg
	h.QPerA = 4 * math.Pi * math.Sin(h.CentreDeg*math.Pi/360) / lambdaA
	ok = h.FWHMDeg >= MinFWHMDeg && h.FWHMDeg <= MaxFWHMDeg &&
		h.Significance >= MinSignificance && h.HeightCounts >= MinRelativeHeight*h.BaselineCounts
	return h, ok
}

// blocks averages the scan over BlockDeg-wide blocks.
func blocks(tt, y []float64) (xs, ys []float64, ks []int) {
	if len(tt) == 0 {
		return nil, nil, nil
	}
	start := tt[0]
	var sx, sy float64
	k := 0
	flush := func() {
		if k > 0 {
			xs = append(xs, sx/float64(k))
			ys = append(ys, sy/float64(k))
			ks = append(ks, k)
		}
		sx, sy, k = 0, 0, 0
	}
	for i := range tt {
		if tt[i]-start >= BlockDeg {
			flush()
			start += BlockDeg * math.Floor((tt[i]-start)/BlockDeg)
		}
		sx += tt[i]
		sy += y[i]
		k++
	}
	flush()
	return xs, ys, ks
}

// lowerHull returns, at every x, the lower convex hull of the points
// (Andrew's monotone chain), interpolated linearly.
func lowerHull(xs, ys []float64) []float64 {
	var hull []int
	for i := range xs {
		for len(hull) >= 2 {
			a, b := hull[len(hull)-2], hull[len(hull)-1]
			// Drop b when it lies on or above the line from a to i.
			if (xs[b]-xs[a])*(ys[i]-ys[a])-(ys[b]-ys[a])*(xs[i]-xs[a]) <= 0 {
				hull = hull[:len(hull)-1]
				continue
			}
			break
		}
		hull = append(hull, i)
	}
	out := make([]float64, len(xs))
	j := 0
	for i := range xs {
		for j < len(hull)-2 && xs[hull[j+1]] <= xs[i] {
			j++
		}
		a, b := hull[j], hull[min(j+1, len(hull)-1)]
		if a == b || xs[b] == xs[a] {
			out[i] = ys[a]
			continue
		}
		out[i] = ys[a] + (ys[b]-ys[a])*(xs[i]-xs[a])/(xs[b]-xs[a])
	}
	return out
}

// crossing walks from top in direction dir until net falls below level and
// returns the interpolated x of the crossing.
func crossing(xs, net []float64, top, dir int, level float64) (float64, bool) {
	for i := top; i+dir >= 0 && i+dir < len(xs); i += dir {
		j := i + dir
		if net[j] < level {
			f := (net[i] - level) / (net[i] - net[j])
			return xs[i] + f*(xs[j]-xs[i]), true
		}
	}
	return 0, false
}

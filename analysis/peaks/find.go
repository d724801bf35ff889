package peaks

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"meltbook/analysis/radiation"
	"meltbook/analysis/scanfile"
)

// Peak is one fitted diffraction peak (the Kα1 component where the scan
// holds the doublet). Every SU is a standard uncertainty from the fit
// covariance scaled by the reduced χ² of its group; NaN when the fit could
// not give one.
type Peak struct {
	TwoThetaDeg, TwoThetaSUDeg float64
	DAngstrom, DSUAngstrom     float64
	// Height is the net maximum above background, in intensity units.
	Height, HeightSU float64
	// Area is the integrated net intensity, in intensity units × degrees.
	Area, AreaSU float64
	// FWHMDeg is the full width at half maximum in degrees 2θ.
	FWHMDeg, FWHMSUDeg float64
	// Eta is the Lorentzian fraction of the pseudo-Voigt (0 Gaussian,
	// 1 Lorentzian).
	Eta, EtaSU float64
	// Significance is the net height of the searched signal over its
	// standard uncertainty at the search stage.
	Significance float64
	// Group indexes Result.Groups: the window this peak was fitted in.
	Group int
	// Standard names the internal-standard line the peak was matched to
	// ("Si (NIST SRM 640f) 111"), empty for specimen peaks.
	Standard string
}

// Group is one least-squares window.
type Group struct {
	// First and Last are the scan indices of the window's ends.
	First, Last int
	// Peaks counts the peaks fitted together.
	Peaks            int
	ReducedChiSquare float64
	Iterations       int
	Converged        bool
	// BackgroundLevel and BackgroundSlope are the straight line fitted on
	// top of the SNIP background: level at the window middle, slope per
	// degree.
	BackgroundLevel, BackgroundSlope float64
	MiddleDeg                        float64
}

// Options tune Find. The zero value gives the defaults.
type Options struct {
	// SmoothingHalfWidth is the Savitzky-Golay half-width m in points
	// (window 2m+1). Zero chooses round(0.05° / step), clamped to 2 … 12.
	SmoothingHalfWidth int
	// SmoothingOrder is the Savitzky-Golay polynomial order; zero means 2.
	SmoothingOrder int
	// BackgroundHalfWidthDeg is the largest SNIP clipping half-window in
	// degrees 2θ; zero means 1°. It should exceed the widest peak's FWHM.
	BackgroundHalfWidthDeg float64
	// Significance is the factor k of the search threshold; zero means 3.
	Significance float64
	// WindowFWHM sets each fit window to the peak ± WindowFWHM × FWHM;
	// zero means 2.5.
	WindowFWHM float64
	// MaxIterations caps Levenberg-Marquardt steps per window; zero means 40.
	MaxIterations int
	// Standard, when set, is the internal standard mixed into the
	// specimen: its peaks give the zero shift.
	Standard *Standard
	// FitDisplacement adds the specimen-displacement term D cos θ to the
	// zero-shift fit.
	FitDisplacement bool
	// MatchToleranceDeg is how far a peak may lie from a standard line to
	// be matched to it; zero means 0.3°.
	MatchToleranceDeg float64
}

func (o Options) withDefaults(step float64) Options {
	if o.SmoothingHalfWidth == 0 {
		o.SmoothingHalfWidth = min(max(int(math.Round(0.05/step)), 2), 12)
	}
	if o.SmoothingOrder == 0 {
		o.SmoothingOrder = 2
	}
	if o.BackgroundHalfWidthDeg == 0 {
		o.BackgroundHalfWidthDeg = 1
	}
	if o.Significance == 0 {
		o.Significance = 3
	}
	if o.WindowFWHM == 0 {
		o.WindowFWHM = 2.5
	}
	if o.MaxIterations == 0 {
		o.MaxIterations = 40
	}
	if o.MatchToleranceDeg == 0 {
		o.MatchToleranceDeg = 0.3
	}
	return o
}

// Result is everything Find computed, enough to plot the scan with its
// background, fit and peaks.
type Result struct {
	Radiation radiation.Radiation
	// StepDeg is the mean 2θ step.
	StepDeg float64
	// Options are the options used, defaults filled in.
	Options Options
	// Background is the SNIP background at each point.
	Background []float64
	// Smoothed is the Savitzky-Golay smoothed intensity.
	Smoothed []float64
	// Searched is the signal the peak search ran on: smoothed minus
	// background, Kα2-stripped (Rachinger) when the scan holds Kα2.
	Searched []float64
	// Profile is the background plus every fitted peak (Kα1 and Kα2
	// components) and each window's straight-line correction.
	Profile []float64
	Peaks   []Peak
	Groups  []Group
	// ZeroShift is set when Options.Standard was given and enough of its
	// lines were found.
	ZeroShift *ZeroShift
	// Corrected holds the peaks after the zero-shift correction, nil
	// without one.
	Corrected []Peak
	// Dropped lists the search's candidates that the fit did not confirm.
	Dropped []Dropped
	// Notes say what else Find could not do, in plain words.
	Notes []string
}

// Dropped is a search candidate the fit refused, and why.
type Dropped struct {
	TwoThetaDeg float64
	Reason      string
}

// ErrBadScan is wrapped by Find's error for a scan that breaks the input
// contract.
var ErrBadScan = errors.New("bad scan")

// candidate is a peak found by the search, with starting values for the
// fit.
type candidate struct {
	index        int
	center       float64
	height       float64
	fwhm         float64
	significance float64
}

// Find runs the whole chain on a scan measured with the given radiation:
//
//  1. Savitzky-Golay smoothing of the intensity (order 2 by default);
//
//  2. SNIP background (LLS operator) of the smoothed intensity, computed
//     on block means when the window is long (see coarseBackground) and
//     raised by the clipping bias measured on the scan (see
//     raiseBackground);
//
//  3. net signal = smoothed − background, Kα2-stripped by Rachinger's
//     method when the radiation says Kα2 is in the scan;
//
//  4. peak search: local maxima of the net signal N whose height and
//     prominence both exceed k·σ_N, with
//
//     σ_N² = g · V · (1 + B/S)
//
//     where g = Σc² is the smoothing filter's variance factor, S the
//     smoothed and B the background intensity at the maximum, and V the
//     variance of one reading: the file's uncertainty squared, else
//     max(S, 1) for counting (Poisson) statistics. k = 3 by default: a
//     peak must stand three standard uncertainties clear of both the
//     background and the dip that separates it from its neighbour;
//
//  5. pseudo-Voigt least-squares fits of raw minus background intensities
//     in windows of ± WindowFWHM × FWHM around each peak, overlapping
//     windows fitted together, with a straight-line correction per window,
//     Kα2 components at their Bragg angles when the scan holds Kα2, and
//     weights 1/V;
//
//  6. with a Standard, the zero shift (and optionally displacement) from
//     its matched lines, and corrected peaks.
//
// The scan must hold at least scanfile.MinPoints points with finite,
// strictly increasing 2θ in (0°, 180°), finite non-negative intensities,
// and uncertainties (if any) finite and non-negative, as scanfile.Read
// guarantees.
//
// Reference: the steps' own functions (SNIP, NewSavitzkyGolay,
// StripKalpha2, PseudoVoigt, FitZeroShift); the detection threshold
// follows L. A. Currie, Anal. Chem. 40, 586 (1968), doi:10.1021/ac60259a007,
// with k = 3 by common practice.
func Find(scan scanfile.Scan, rad radiation.Radiation, opts Options) (Result, error) {
	if err := rad.Validate(); err != nil {
		return Result{}, err
	}
	x, y := scan.TwoThetaDeg, scan.Counts
	n := len(x)
	if err := checkScan(scan); err != nil {
		return Result{}, err
	}
	step := (x[n-1] - x[0]) / float64(n-1)
	o := opts.withDefaults(step)
	if o.SmoothingHalfWidth < 1 || o.SmoothingOrder < 0 || o.SmoothingOrder >= 2*o.SmoothingHalfWidth+1 ||
		!(o.BackgroundHalfWidthDeg > 0) || !(o.Significance > 0) || !(o.WindowFWHM > 0) || o.MaxIterations < 1 ||
		!(o.MatchToleranceDeg > 0) {
		return Result{}, fmt.Errorf("peaks: options out of range: %+v", opts)
	}
	if n < 2*o.SmoothingHalfWidth+1 {
		return Result{}, fmt.Errorf("peaks: %w: %d points, fewer than the %d-point smoothing window", ErrBadScan, n, 2*o.SmoothingHalfWidth+1)
	}
	sg, err := NewSavitzkyGolay(o.SmoothingHalfWidth, o.SmoothingOrder)
	if err != nil {
		return Result{}, err
	}
	res := Result{Radiation: rad, StepDeg: step, Options: o,
		Background: make([]float64, n), Smoothed: make([]float64, n), Searched: make([]float64, n), Profile: make([]float64, n)}
	if err := sg.smoothInto(res.Smoothed, y); err != nil {
		return Result{}, err
	}
	bgHalf := max(int(math.Round(o.BackgroundHalfWidthDeg/step)), 1)
	coarseBackground(res.Background, res.Profile, x, res.Smoothed, bgHalf)

	variance := make([]float64, n)
	for i := range variance {
		if scan.Errors != nil {
			variance[i] = math.Max(scan.Errors[i]*scan.Errors[i], 1e-12)
		} else {
			variance[i] = math.Max(res.Smoothed[i], 1)
		}
	}
	g := sg.VarianceFactor()
	raiseBackground(res.Background, res.Smoothed, variance, g, res.Searched)
	net := res.Profile // scratch until the profile is built
	for i := range net {
		net[i] = res.Smoothed[i] - res.Background[i]
	}
	if rad.HasKalpha2() {
		stripInto(res.Searched, x, net, rad.Kalpha1Angstrom, rad.Kalpha2Angstrom, rad.Kalpha2Ratio)
	} else {
		copy(res.Searched, net)
	}

	cands := search(res.Searched, res.Smoothed, res.Background, variance, x, g, o.Significance, bgHalf)
	fitAll(&res, scan, cands, variance, step, o)
	if o.Standard != nil && len(res.Peaks) > 0 {
		z, err := FitZeroShift(res.Peaks, *o.Standard, rad.Kalpha1Angstrom, o.MatchToleranceDeg, o.FitDisplacement)
		if err != nil {
			res.Notes = append(res.Notes, err.Error())
		} else {
			res.ZeroShift = &z
			for _, m := range z.Matches {
				res.Peaks[m.Peak].Standard = m.Reflection.Label(*o.Standard)
			}
			res.Corrected = make([]Peak, len(res.Peaks))
			for i, p := range res.Peaks {
				res.Corrected[i] = z.Correct(p, rad.Kalpha1Angstrom)
			}
		}
	}
	return res, nil
}

func checkScan(s scanfile.Scan) error {
	x, y := s.TwoThetaDeg, s.Counts
	n := len(x)
	bad := func(format string, args ...any) error {
		return fmt.Errorf("peaks: %w: %s", ErrBadScan, fmt.Sprintf(format, args...))
	}
	switch {
	case len(y) != n:
		return bad("%d angles but %d intensities", n, len(y))
	case s.Errors != nil && len(s.Errors) != n:
		return bad("%d angles but %d uncertainties", n, len(s.Errors))
	case n < scanfile.MinPoints:
		return bad("%d points; need at least %d", n, scanfile.MinPoints)
	}
	for i := 0; i < n; i++ {
		if !(x[i] > 0 && x[i] < 180) {
			return bad("point %d: 2θ = %v° outside (0°, 180°)", i+1, x[i])
		}
		if i > 0 && !(x[i] > x[i-1]) {
			return bad("point %d: 2θ = %v° does not increase", i+1, x[i])
		}
		if !(y[i] >= 0) || math.IsInf(y[i], 0) {
			return bad("point %d: intensity %v is not a finite non-negative number", i+1, y[i])
		}
		if s.Errors != nil && (!(s.Errors[i] >= 0) || math.IsInf(s.Errors[i], 0)) {
			return bad("point %d: uncertainty %v is not a finite non-negative number", i+1, s.Errors[i])
		}
	}
	return nil
}

// search returns the significant local maxima of z; see Find.
func search(z, smoothed, bg, variance, x []float64, g, k float64, wlen int) []candidate {
	n := len(z)
	var out []candidate
	for i := 1; i < n-1; i++ {
		if !(z[i] > z[i-1] && z[i] >= z[i+1]) || z[i] <= 0 {
			continue
		}
		sigma := math.Sqrt(g * variance[i] * (1 + bg[i]/math.Max(smoothed[i], 1e-9)))
		if z[i] < k*sigma {
			continue
		}
		if prominence(z, i, wlen) < k*sigma {
			continue
		}
		c := candidate{index: i, center: x[i], height: z[i], significance: z[i] / sigma}
		// Parabola through the three points around the maximum.
		if den := z[i-1] - 2*z[i] + z[i+1]; den < 0 {
			off := 0.5 * (z[i-1] - z[i+1]) / den
			c.center = x[i] + off*(x[i+1]-x[i-1])/2
			c.height = z[i] - 0.25*(z[i-1]-z[i+1])*off
		}
		// A peak wider than the background window is background.
		c.fwhm = math.Min(halfWidth(z, x, i, wlen), x[min(i+wlen, n-1)]-x[max(i-wlen, 0)])
		out = append(out, c)
	}
	return out
}

// prominence returns how far z[i] rises above the higher of the lowest
// points on either side before a higher point (or wlen points, or the end)
// is reached.
func prominence(z []float64, i, wlen int) float64 {
	left, right := z[i], z[i]
	for j := i - 1; j >= 0 && j >= i-wlen && z[j] <= z[i]; j-- {
		left = math.Min(left, z[j])
	}
	for j := i + 1; j < len(z) && j <= i+wlen && z[j] <= z[i]; j++ {
		right = math.Min(right, z[j])
	}
	return z[i] - math.Max(left, right)
}

// halfWidth estimates the FWHM of the peak at i from where z falls to half
// its height, interpolating between points; a side that never falls to half
// within wlen points (a shoulder) is replaced by the other side.
func halfWidth(z, x []float64, i, wlen int) float64 {
	half := z[i] / 2
	side := func(dir int) float64 {
		for j := i + dir; j >= 0 && j < len(z) && abs(j-i) <= wlen; j += dir {
			if z[j] <= half {
				prev := j - dir
				f := (z[prev] - half) / (z[prev] - z[j])
				return math.Abs(x[prev] + f*(x[j]-x[prev]) - x[i])
			}
			if z[j] > z[i] {
				break
			}
		}
		return math.NaN()
	}
	l, r := side(-1), side(1)
	switch {
	case math.IsNaN(l) && math.IsNaN(r):
		return 2 * math.Abs(x[min(i+1, len(x)-1)]-x[max(i-1, 0)])
	case math.IsNaN(l):
		return 2 * r
	case math.IsNaN(r):
		return 2 * l
	}
	return l + r
}

func abs(a int) int {
	if a < 0 {
		return -a
	}
	return a
}

// raiseBackground corrects the SNIP background b for its bias: clipping
// follows the low side of the counting noise, leaving the background
// below the mean. The noise of the smoothed background level is
// σ_i = √(g·V_i·B_i/S_i) (for counts, √(g·B_i)). The residuals
// r_i = (S_i − B_i)/σ_i of background points scatter about the bias; their
// mean, taken over the points within 2.5 of the running centre (starting
// from the median, refined twice) so that peaks do not count, is added
// back: B_i += c·σ_i when c > 0. Because σ_i follows the background level,
// not the peaks, the correction adds no peak-shaped bump. scratch must
// have len(b).
//
// Reference: the clipping bias of SNIP on noisy data is noted by Morháč et
// al. (1997); this sigma-clipped-mean correction is common practice for
// robust baseline offsets.
func raiseBackground(b, smoothed, variance []float64, g float64, scratch []float64) {
	r := scratch
	sigma := func(i int) float64 {
		return math.Sqrt(g * variance[i] * math.Max(b[i], 1e-9) / math.Max(smoothed[i], 1e-9))
	}
	for i := range b {
		r[i] = (smoothed[i] - b[i]) / sigma(i)
	}
	// The median of at most 1024 evenly spaced residuals starts the
	// clipping; it only has to land inside the noise band.
	stride := max(len(r)/1024, 1)
	sample := make([]float64, 0, len(r)/stride+1)
	for i := 0; i < len(r); i += stride {
		sample = append(sample, r[i])
	}
	c := median(sample)
	for pass := 0; pass < 2; pass++ {
		sum, k := 0.0, 0
		for _, v := range r {
			if math.Abs(v-c) < 2.5 {
				sum += v
				k++
			}
		}
		if k == 0 {
			return
		}
		c = sum / float64(k)
	}
	if !(c > 0) {
		return
	}
	for i := range b {
		b[i] += c * sigma(i)
	}
}

// median returns the median of v, reordering v.
func median(v []float64) float64 {
	sort.Float64s(v)
	n := len(v)
	if n%2 == 1 {
		return v[n/2]
	}
	return 0.5 * (v[n/2-1] + v[n/2])
}

// coarseWindow is the longest SNIP window, in blocks, that coarseBackground
// clips with.
const coarseWindow = 16

// coarseBackground writes into b the SNIP background (LLS) of smoothed with
// a half-window of m points. When m exceeds coarseWindow, SNIP runs on the
// means of blocks of f = ⌈m/coarseWindow⌉ points (block centres at the mean
// angle of their points) with a half-window of ⌈m/f⌉ blocks, and the result
// is interpolated linearly back to every point: the background varies over
// the window, not over a block, and the cost falls by f². scratch must have
// len(b).
func coarseBackground(b, scratch, x, smoothed []float64, m int) {
	n := len(smoothed)
	f := (m + coarseWindow - 1) / coarseWindow
	if f <= 1 || n/f < 3 {
		snipInto(b, scratch, smoothed, m, true)
		return
	}
	nb := (n + f - 1) / f
	bx, by := make([]float64, nb), make([]float64, nb)
	for k := 0; k < nb; k++ {
		lo, hi := k*f, min((k+1)*f, n)
		var sx, sy float64
		for i := lo; i < hi; i++ {
			sx += x[i]
			sy += smoothed[i]
		}
		bx[k], by[k] = sx/float64(hi-lo), sy/float64(hi-lo)
	}
	bb := make([]float64, nb)
	snipInto(bb, scratch[:nb], by, (m+f-1)/f, true)
	k := 0
	for i, xi := range x {
		for k+1 < nb-1 && bx[k+1] < xi {
			k++
		}
		t := (xi - bx[k]) / (bx[k+1] - bx[k])
		b[i] = bb[k] + t*(bb[k+1]-bb[k])
	}
}

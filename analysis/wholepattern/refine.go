package wholepattern

import (
	"fmt"
	"math"

	"meltbook"
	"meltbook/analysis/crystal"
	"meltbook/analysis/radiation"
)

// Phase is one phase to refine: its name, the crystal system that ties its
// cell constants, the start cell and its reflections.
type Phase struct {
	Name string
	// System constrains the cell: cubic refines a; tetragonal a, c;
	// hexagonal and trigonal on hexagonal axes a, c (γ = 120°); trigonal on
	// rhombohedral axes (three equal angles other than 120°) a, α;
	// orthorhombic a, b, c; monoclinic a, b, c and the one angle that is not
	// 90° (β when none is); triclinic all six.
	System crystal.System
	// Cell is the start cell. Only the constants the system leaves free are
	// read; the others follow from the system.
	Cell crystal.Cell
	// Reflections are the hkl families to place, one representative each,
	// with their multiplicities, already free of systematic absences.
	Reflections []Reflection
}

// Reflection is one family of symmetry-equivalent reflections: a
// representative hkl and the number of reflections in the family. The
// multiplicity sets the starting share of reflections that fall at one
// angle; the refined intensity is free.
type Reflection struct {
	HKL          [3]int
	Multiplicity int
}

// Options tune a refinement. The zero value asks for the defaults.
type Options struct {
	// MinTwoThetaDeg and MaxTwoThetaDeg bound the part of the scan that is
	// fitted, in degrees 2θ; both zero takes the whole scan.
	MinTwoThetaDeg, MaxTwoThetaDeg float64
	// BackgroundTerms is the number of shifted Chebyshev terms of the
	// background (degree BackgroundTerms − 1); 0 means 6, at most 20.
	BackgroundTerms int
	// MaxCycles caps the extraction and least-squares cycles of the final,
	// full-width stage; 0 means 100.
	MaxCycles int
	// HoldZeroShift keeps the zero shift at StartZeroShiftDeg instead of
	// refining it.
	HoldZeroShift bool
	// StartZeroShiftDeg is the starting zero shift in degrees 2θ (see
	// Result.ZeroShiftDeg for the sign).
	StartZeroShiftDeg float64
	// StartFWHMDeg is the starting full width at half maximum in degrees 2θ,
	// taken as constant over the scan (W = FWHM², U = V = 0); 0 estimates it
	// from the strongest peak of the scan.
	StartFWHMDeg float64
	// StartErrorFraction is how far, as a fraction, the start cell
	// constants may be off: it sets the widening of the first stages (see
	// Refine) and the bounds of the cell (four times this fraction either
	// side of the start). 0 means 0.006; at most 0.05.
	StartErrorFraction float64
}

// Profile is the refined peak shape: every reflection of every phase is a
// pseudo-Voigt with the Caglioti width
//
//	FWHM² = U tan²θ + V tanθ + W
//
// in degrees² 2θ, and the Lorentzian fraction Eta, with their standard
// uncertainties.
//
// Reference: G. Caglioti, A. Paoletti and F. P. Ricci, Nucl. Instrum. 3,
// 223 (1958), doi:10.1016/0369-643X(58)90029-X.
type Profile struct {
	U, V, W              float64 // degrees²
	Eta                  float64 // Lorentzian fraction, 0..1
	USU, VSU, WSU, EtaSU float64 // standard uncertainties
}

// FWHMDeg returns the Caglioti FWHM in degrees at 2θ twoThetaDeg (the
// Bragg angle, before the zero shift), NaN where FWHM² is not positive.
func (p Profile) FWHMDeg(twoThetaDeg float64) float64 {
	t := math.Tan(twoThetaDeg / 2 * degree)
	f2 := p.U*t*t + p.V*t + p.W
	if !(f2 > 0) {
		return math.NaN()
	}
	return math.Sqrt(f2)
}

// ReflectionFit is one reflection as placed and extracted.
type ReflectionFit struct {
	HKL          [3]int
	Multiplicity int
	// DSpacingA is d in Å in the refined cell.
	DSpacingA float64
	// TwoThetaDeg is where the Kα1 (or single-wavelength) line sits in the
	// scan, zero shift included; NaN when d is shorter than λ/2.
	TwoThetaDeg float64
	// FWHMDeg is the line's width in degrees 2θ.
	FWHMDeg float64
	// Intensity is the Le Bail integrated intensity of the Kα1 line in
	// counts × degrees 2θ (the Kα2 line carries Kalpha2Ratio of it); zero
	// for a reflection outside the fitted range.
	Intensity float64
	// InRange reports whether the line falls inside the fitted range.
	InRange bool
}

// RefinedCell is one phase after refinement.
type RefinedCell struct {
	Name   string
	System crystal.System
	// Cell is the refined cell (the start cell when Refined is false).
	Cell crystal.Cell
	// SU holds the standard uncertainty of every constant: a constant tied
	// to a free one (b = a in a cubic cell) carries its uncertainty, one
	// fixed by the system carries zero.
	SU crystal.Cell
	// Free names the refined constants ("a", "c", "beta", ...).
	Free []string
	// Refined is false when the phase had no reflection in the range and
	// its cell was held.
	Refined     bool
	Reflections []ReflectionFit
}

// Result is a finished refinement.
type Result struct {
	// Rwp, Rp and Rexp are fractions (multiply by 100 for per cent) and
	// Chi2 is the reduced χ² = (Rwp/Rexp)²; see Refine for the formulas.
	Rwp, Rp, Rexp, Chi2 float64
	// Points is N, the number of points fitted; Parameters is P, the
	// refined parameters counted in Rexp, Le Bail intensities included.
	Points, Parameters int
	// ZeroShiftDeg is Z in 2θ_observed = 2θ_Bragg + Z, in degrees, with its
	// standard uncertainty (zero when held).
	ZeroShiftDeg, ZeroShiftSUDeg float64
	// Cells holds the phases in the order given.
	Cells   []RefinedCell
	Profile Profile
	// BackgroundCoefficients are the shifted Chebyshev coefficients c_m of
	// the background b(2θ) = Σ c_m T_m(t), t = 2(2θ − lo)/(hi − lo) − 1,
	// with lo and hi the first and last fitted angles.
	BackgroundCoefficients []float64
	// TwoThetaDeg, Observed, Calculated, Background and Difference
	// (observed − calculated) are the curves over the fitted points.
	TwoThetaDeg, Observed, Calculated, Background, Difference []float64
	// Cycles counts the extraction and least-squares cycles of all stages.
	Cycles int
	// Converged reports whether the final stage met its convergence test
	// before MaxCycles.
	Converged bool
	// Warnings says what the caller should know: phases held or without
	// intensity, a cell at its bound, no convergence.
	Warnings []string
}

const (
	degree = math.Pi / 180

	defaultBackgroundTerms = 6
	maxBackgroundTerms     = 20
	defaultMaxCycles       = 100
	defaultStartError      = 0.006
	maxStartError          = 0.05
	// zeroBoundDeg bounds the refined zero shift, in degrees 2θ.
	zeroBoundDeg = 1.0
)

// Refine refines the cells of phases against the scan (twoThetaDeg,
// counts) measured with rad, Le Bail style.
//
// The calculated pattern at point i is
//
//	y_calc,i = b(2θ_i) + Σ_k I_k Ω_ik
//	Ω_ik = pV(2θ_i; 2θ_k,1, Γ_k,1, η) + R · pV(2θ_i; 2θ_k,2, Γ_k,2, η)
//	2θ_k,j = 2 arcsin(λ_j / 2d_k) + Z,   1/d_k² = hᵀ G* h
//
// with pV the unit-area pseudo-Voigt of peaks.PseudoVoigt, Γ the Caglioti
// width (see Profile), R the Kα2/Kα1 ratio (the Kα2 term only when the
// radiation says the scan holds Kα2), G* the reciprocal metric of the cell
// and b a shifted Chebyshev polynomial. Each profile is cut off 25 FWHM
// either side of its center.
//
// Each cycle first re-extracts the intensities with the Le Bail formula
//
//	I_k ← I_k · Σ_i Ω_ik (y_obs,i / y_calc,i) / Σ_i Ω_ik
//
// which shares the observed counts of each point among the reflections in
// proportion to their calculated contributions (dividing by Σ_i Ω_ik turns
// the sum over points into an integrated intensity and allows for profiles
// cut by the range ends). Its fixed point sets Σ_i Ω_ik (y_obs,i −
// y_calc,i)/y_calc,i = 0 for every k, the least-squares condition for the
// intensities with weights 1/y_calc, so the background is not drained into
// the peaks. The passes only re-sum stored line values and are repeated
// until no intensity changes by more than 10⁻⁴ of itself (at most 30; 3 in
// the widened stages below); an intensity is kept at or above 10⁻⁶ of the
// strongest so that it can recover. Then one damped least-squares step
// (Levenberg–Marquardt on the normal equations with the Marquardt diagonal
// scaling) moves the cell constants, Z, U, V, W, η and the
// background coefficients with the intensities held, minimising
//
//	S = Σ_i w_i (y_obs,i − y_calc,i)²,   w_i = 1/σ_i²,   σ_i² = max(y_obs,i, 1)
//
// (Poisson counting statistics, floored at one count). Derivatives are
// analytic for the background, U, V, W and η (the pseudo-Voigt is linear
// in η), forward differences of peaks.PseudoVoigt for the line center and
// width, and forward differences of Bragg's law for the cell constants.
//
// A start cell that is off moves lines by 2 tanθ·ε radians, further than a
// line width for ε of a few 10⁻³; the least squares then see no overlap to
// follow. So the first stages widen every line in quadrature by
// 2 tanθ·e·(180/π) degrees, the displacement of a cell error e, for
// e = StartErrorFraction, e/2, e/4, ... down to 4·10⁻⁴, with Gaussian
// lines (η = 0, cut off at 3 FWHM, so that no long tail stands in for the
// background), refining only the cells, Z and the background, each stage
// for at most 10 cycles or until a cycle changes χ² by less than 10⁻³ of
// itself. The final stage drops the widening, restores η and frees
// everything until a cycle changes χ² by less than 10⁻⁷ of itself or, with
// the damping back near zero, moves every parameter by less than 10⁻² of
// its standard uncertainty.
//
// The agreement factors over the N fitted points, with P the refined
// parameters plus the intensities of the reflections in range:
//
//	Rwp  = √(Σ w (y_obs − y_calc)² / Σ w y_obs²)
//	Rp   = Σ |y_obs − y_calc| / Σ |y_obs|
//	Rexp = √((N − P) / Σ w y_obs²)
//	χ²   = (Rwp/Rexp)²
//
// Standard uncertainties are √(C_jj · χ²) with C the inverse of the
// weighted normal matrix at the minimum, intensities held (so they leave
// out the correlation with the intensities, as is usual for Le Bail fits).
//
// twoThetaDeg must be finite, strictly increasing and within (0°, 180°);
// counts must be finite and as many. A phase with no reflection in the
// range is held and named in a warning, as is one whose lines carry no
// intensity above the counting noise.
//
// Reference: A. Le Bail, H. Duroy and J. L. Fourquet, Mat. Res. Bull. 23,
// 447 (1988), doi:10.1016/0025-5408(88)90019-0 (intensity extraction);
// D. W. Marquardt, J. Soc. Ind. Appl. Math. 11, 431 (1963),
// doi:10.1137/0111030 (damped least squares); R. A. Young (ed.), The
// Rietveld Method (IUCr/Oxford, 1993), ch. 1, and B. H. Toby, Powder
// Diffr. 21, 67 (2006), doi:10.1154/1.2179804 (R factors).
func Refine(twoThetaDeg, counts []float64, rad radiation.Radiation, phases []Phase, opt Options) (Result, error) {
	if err := validateScan(twoThetaDeg, counts); err != nil {
		return Result{}, err
	}
	if err := rad.Validate(); err != nil {
		return Result{}, meltbook.Errorf(meltbook.Invalid, "radiation", "%v", err)
	}
	opt, err := withDefaults(opt, twoThetaDeg)
	if err != nil {
		return Result{}, err
	}
	if len(phases) == 0 {
		return Result{}, meltbook.Errorf(meltbook.Invalid, "phases", "no phase to refine")
	}
	kinds := make([]cellKind, len(phases))
	for p, ph := range phases {
		if kinds[p], err = validatePhase(p, ph); err != nil {
			return Result{}, err
		}
	}
	e, err := newEngine(twoThetaDeg, counts, rad, phases, kinds, opt)
	if err != nil {
		return Result{}, err
	}
	e.run()
	return e.result(), nil
}

func validateScan(x, y []float64) error {
	if len(x) == 0 {
		return meltbook.Errorf(meltbook.Invalid, "two theta", "no points")
	}
	if len(x) != len(y) {
		return meltbook.Errorf(meltbook.Invalid, "counts", "%d counts for %d angles", len(y), len(x))
	}
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) || !(v > 0 && v < 180) {
			return meltbook.Errorf(meltbook.Invalid, fmt.Sprintf("two theta[%d]", i), "%g° is not an angle in (0°, 180°)", v)
		}
		if i > 0 && !(v > x[i-1]) {
			return meltbook.Errorf(meltbook.Invalid, fmt.Sprintf("two theta[%d]", i), "%g° does not follow %g°: angles must increase", v, x[i-1])
		}
	}
	for i, v := range y {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return meltbook.Errorf(meltbook.Invalid, fmt.Sprintf("counts[%d]", i), "%g is not a finite intensity", v)
		}
	}
	return nil
}

func withDefaults(opt Options, x []float64) (Options, error) {
	finite := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	if !finite(opt.MinTwoThetaDeg) || !finite(opt.MaxTwoThetaDeg) {
		return opt, meltbook.Errorf(meltbook.Invalid, "options.range", "range %g° to %g° is not finite", opt.MinTwoThetaDeg, opt.MaxTwoThetaDeg)
	}
	if opt.MinTwoThetaDeg == 0 && opt.MaxTwoThetaDeg == 0 {
		opt.MinTwoThetaDeg, opt.MaxTwoThetaDeg = x[0], x[len(x)-1]
	}
	if !(opt.MaxTwoThetaDeg > opt.MinTwoThetaDeg) {
		return opt, meltbook.Errorf(meltbook.Invalid, "options.range", "range %g° to %g° is empty", opt.MinTwoThetaDeg, opt.MaxTwoThetaDeg)
	}
	switch {
	case opt.BackgroundTerms == 0:
		opt.BackgroundTerms = defaultBackgroundTerms
	case opt.BackgroundTerms < 1 || opt.BackgroundTerms > maxBackgroundTerms:
		return opt, meltbook.Errorf(meltbook.Invalid, "options.background terms", "%d is not between 1 and %d", opt.BackgroundTerms, maxBackgroundTerms)
	}
	switch {
	case opt.MaxCycles == 0:
		opt.MaxCycles = defaultMaxCycles
	case opt.MaxCycles < 0:
		return opt, meltbook.Errorf(meltbook.Invalid, "options.max cycles", "%d is negative", opt.MaxCycles)
	}
	if !finite(opt.StartZeroShiftDeg) || math.Abs(opt.StartZeroShiftDeg) > zeroBoundDeg {
		return opt, meltbook.Errorf(meltbook.Invalid, "options.start zero shift", "%g° is not within ±%g°", opt.StartZeroShiftDeg, zeroBoundDeg)
	}
	if !finite(opt.StartFWHMDeg) || opt.StartFWHMDeg < 0 || opt.StartFWHMDeg > 5 {
		return opt, meltbook.Errorf(meltbook.Invalid, "options.start FWHM", "%g° is not a width between 0° and 5°", opt.StartFWHMDeg)
	}
	switch {
	case opt.StartErrorFraction == 0:
		opt.StartErrorFraction = defaultStartError
	case !(opt.StartErrorFraction > 0 && opt.StartErrorFraction <= maxStartError):
		return opt, meltbook.Errorf(meltbook.Invalid, "options.start error fraction", "%g is not in (0, %g]", opt.StartErrorFraction, maxStartError)
	}
	return opt, nil
}

func validatePhase(p int, ph Phase) (cellKind, error) {
	field := fmt.Sprintf("phases[%d]", p)
	k, err := kindOf(ph.System, ph.Cell, field+".system")
	if err != nil {
		return 0, err
	}
	c := cellFrom(k, freeConstants(k, ph.Cell))
	if err := c.Validate(); err != nil {
		return 0, meltbook.Errorf(meltbook.Invalid, field+".cell", "%v", err)
	}
	if len(ph.Reflections) == 0 {
		return 0, meltbook.Errorf(meltbook.Invalid, field+".reflections", "phase %q has no reflections", ph.Name)
	}
	for r, rf := range ph.Reflections {
		rfield := fmt.Sprintf("%s.reflections[%d]", field, r)
		if rf.HKL == [3]int{} {
			return 0, meltbook.Errorf(meltbook.Invalid, rfield+".hkl", "(000) is not a reflection")
		}
		if rf.Multiplicity <= 0 {
			return 0, meltbook.Errorf(meltbook.Invalid, rfield+".multiplicity", "%d is not a positive multiplicity", rf.Multiplicity)
		}
	}
	return k, nil
}

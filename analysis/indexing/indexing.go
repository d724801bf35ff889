package indexing

import (
	"fmt"
	"math"
	"sort"

	"meltbook"
)

// Peak is one observed powder line.
type Peak struct {
	TwoThetaDeg float64 `json:"two_theta_deg"` // position 2θ, degrees
	Intensity   float64 `json:"intensity"`     // relative height or area, any positive scale
}

// Kind names the kind of model a phase was indexed with.
type Kind string

// The model kinds.
const (
	Icosahedral Kind = "icosahedral"
	Approximant Kind = "approximant"
	Cubic       Kind = "cubic"
)

// Options tunes the indexing. The zero value of every field selects the
// default given beside it.
type Options struct {
	// ToleranceDeg is the largest |2θobs − 2θcalc| for a peak to count as
	// indexed, after the zero shift. Default 0.10°.
	ToleranceDeg float64
	// MaxChance is the largest chance for a phase to be reported.
	// Default 0.01.
	MaxChance float64
	// MaxPhases bounds the number of phases taken from a mixture. Default 3.
	MaxPhases int
	// MaxZeroShiftDeg bounds the fitted zero shift; a larger fitted value is
	// dropped and the constant refitted with no shift. Default 0.25°.
	MaxZeroShiftDeg float64
	// PerpCutoff is the largest |G⊥|·a6 (dimensionless) of an icosahedral
	// reflection family kept in the models, an upper bound only: which
	// family may explain which peak is decided by the families' predicted
	// intensities (see the package documentation). Default and largest
	// value 0.8, the extent of the family tables; at least 0.2.
	PerpCutoff float64
	// References are the icosahedral quasilattice constants that cubic
	// approximants are sought around. Default ReferenceFamilies.
	References []Reference
	// ApproximantTolerance is the largest relative difference between a
	// cubic constant and the ideal approximant constant. Default 0.025.
	ApproximantTolerance float64
	// ApproximantOrders are the approximant orders sought. Default
	// DefaultOrders (1/1 and 2/1).
	ApproximantOrders []Order
	// Library holds the phases of known structure to search-match, with
	// their lines computed at the scan's wavelength. Default none.
	Library []KnownPhase
}

func (o Options) withDefaults() Options {
	if o.ToleranceDeg == 0 {
		o.ToleranceDeg = 0.10
	}
	if o.MaxChance == 0 {
		o.MaxChance = 0.01
	}
	if o.MaxPhases == 0 {
		o.MaxPhases = 3
	}
	if o.MaxZeroShiftDeg == 0 {
		o.MaxZeroShiftDeg = 0.25
	}
	if o.PerpCutoff == 0 {
		o.PerpCutoff = maxFamilyPerp
	}
	if o.References == nil {
		o.References = ReferenceFamilies
	}
	if o.ApproximantTolerance == 0 {
		o.ApproximantTolerance = 0.025
	}
	if o.ApproximantOrders == nil {
		o.ApproximantOrders = DefaultOrders
	}
	return o
}

func (o Options) validate() error {
	bad := func(field string, v float64, want string) error {
		return meltbook.Errorf(meltbook.Invalid, field, "%g is not %s", v, want)
	}
	switch {
	case !(o.ToleranceDeg > 0 && o.ToleranceDeg <= 1):
		return bad("tolerance", o.ToleranceDeg, "in (0°, 1°]")
	case !(o.MaxChance > 0 && o.MaxChance <= 1):
		return bad("max chance", o.MaxChance, "in (0, 1]")
	case o.MaxPhases < 1:
		return bad("max phases", float64(o.MaxPhases), "at least 1")
	case !(o.MaxZeroShiftDeg > 0 && o.MaxZeroShiftDeg <= 2):
		return bad("max zero shift", o.MaxZeroShiftDeg, "in (0°, 2°]")
	case !(o.PerpCutoff >= 0.2 && o.PerpCutoff <= maxFamilyPerp):
		return bad("perpendicular cut-off", o.PerpCutoff, fmt.Sprintf("in [0.2, %g]", maxFamilyPerp))
	case !(o.ApproximantTolerance > 0 && o.ApproximantTolerance <= 0.1):
		return bad("approximant tolerance", o.ApproximantTolerance, "in (0, 0.1]")
	}
	for i, ord := range o.ApproximantOrders {
		if ord != (Order{1, 1}) && ord != (Order{2, 1}) && ord != (Order{3, 2}) {
			return meltbook.Errorf(meltbook.Invalid, fmt.Sprintf("approximant order %d", i+1), "%d/%d is not one of 1/1, 2/1, 3/2", ord.P, ord.Q)
		}
	}
	for i, k := range o.Library {
		if err := k.validate(i); err != nil {
			return err
		}
	}
	for i, r := range o.References {
		if !(r.QuasilatticeConstantA >= minQuasilatticeA && r.QuasilatticeConstantA <= maxQuasilatticeA) {
			return meltbook.Errorf(meltbook.Invalid, fmt.Sprintf("reference %d (%s)", i+1, r.Name),
				"quasilattice constant %g Å is outside [%g, %g] Å", r.QuasilatticeConstantA, minQuasilatticeA, maxQuasilatticeA)
		}
	}
	return nil
}

// Result is the outcome of indexing one peak list.
type Result struct {
	WavelengthA float64 `json:"wavelength_A"`
	// Phases found, the one explaining the most intensity first.
	Phases []Phase `json:"phases"`
	// Unexplained lists the peaks no reported phase indexes.
	Unexplained []Peak `json:"unexplained"`
	// Models gives, for the first round (all peaks), the best solution of
	// every model tried with its chance, reported or not.
	Models []ModelSummary `json:"models"`
}

// Phase is one indexed phase.
type Phase struct {
	// Kind is the model (icosahedral, approximant) or the crystal system
	// (cubic, tetragonal, hexagonal, orthorhombic, monoclinic, triclinic,
	// rhombohedral).
	Kind    Kind   `json:"kind"`
	Lattice string `json:"lattice"` // centring: P, I, F, A, B, C or R
	// Phase is the library phase's name (search-match), empty otherwise.
	Phase      string `json:"phase,omitempty"`
	Formula    string `json:"formula,omitempty"`
	SpaceGroup string `json:"space_group,omitempty"` // Hermann–Mauguin symbol
	Reference  string `json:"reference,omitempty"`   // the published structure
	// QuasilatticeConstantA is a_R = a6/√2 in Å (icosahedral phases).
	QuasilatticeConstantA            float64 `json:"quasilattice_constant_A,omitempty"`
	QuasilatticeConstantUncertaintyA float64 `json:"quasilattice_constant_uncertainty_A,omitempty"`
	// SixDimensionalConstantA is a6 in Å (icosahedral phases), P setting.
	SixDimensionalConstantA float64 `json:"a6_A,omitempty"`
	// AA is the cubic lattice constant a in Å (cubic phases and approximants).
	AA            float64 `json:"a_A,omitempty"`
	AUncertaintyA float64 `json:"a_uncertainty_A,omitempty"`
	Order         string  `json:"order,omitempty"` // approximant order p/q, e.g. "1/1"
	ApproximantOf string  `json:"approximant_of,omitempty"`
	IdealAA       float64 `json:"ideal_a_A,omitempty"` // 2·a_R·(q+pτ)/√(2+τ) of the reference
	// The other cell constants, where the crystal system leaves them free
	// or fixes them at other than a and 90°.
	BA                  float64 `json:"b_A,omitempty"`
	BUncertaintyA       float64 `json:"b_uncertainty_A,omitempty"`
	CA                  float64 `json:"c_A,omitempty"`
	CUncertaintyA       float64 `json:"c_uncertainty_A,omitempty"`
	AlphaDeg            float64 `json:"alpha_deg,omitempty"`
	AlphaUncertaintyDeg float64 `json:"alpha_uncertainty_deg,omitempty"`
	BetaDeg             float64 `json:"beta_deg,omitempty"`
	BetaUncertaintyDeg  float64 `json:"beta_uncertainty_deg,omitempty"`
	GammaDeg            float64 `json:"gamma_deg,omitempty"`
	GammaUncertaintyDeg float64 `json:"gamma_uncertainty_deg,omitempty"`
	// CellScale is the fitted cell over the published one (library phases).
	CellScale               float64 `json:"cell_scale,omitempty"`
	ZeroShiftDeg            float64 `json:"zero_shift_deg"` // 2θobs = 2θcalc + zero shift
	ZeroShiftUncertaintyDeg float64 `json:"zero_shift_uncertainty_deg"`
	// FigureOfMerit is S = Σ −ln pᵢ in nats (see the package documentation).
	FigureOfMerit float64 `json:"figure_of_merit"`
	// Evidence is the model-choice criterion C in nats (see the package
	// documentation).
	Evidence float64 `json:"evidence"`
	// Chance is the probability that a random peak list of the same count
	// and range scores at least as well with this kind of model.
	Chance      float64 `json:"chance"`
	ChanceBasis string  `json:"chance_basis"`
	// ExplainedIntensity is the share of the whole list's intensity in this
	// phase's peaks, 0..1.
	ExplainedIntensity float64       `json:"explained_intensity"`
	RMSResidualDeg     float64       `json:"rms_residual_deg"`
	Peaks              []IndexedPeak `json:"peaks"`
	// PhasonTrend is the fit of |Δq| against |G⊥| (icosahedral phases).
	PhasonTrend *PhasonTrend `json:"phason_trend,omitempty"`
	// MissingLines are the strong lines the phase predicts within the
	// scan's peaks' range where no peak lies (library phases).
	MissingLines []PredictedLine `json:"missing_lines,omitempty"`
}

// PredictedLine is a computed line of a phase.
type PredictedLine struct {
	TwoThetaDeg float64 `json:"two_theta_deg"`
	DSpacingA   float64 `json:"d_A"`
	HKL         [3]int  `json:"hkl"`
	// Intensity is relative to the phase's strongest line in the range of
	// the scan's peaks (100).
	Intensity float64 `json:"intensity"`
}

// IndexedPeak is one peak with the reflection that explains it.
type IndexedPeak struct {
	TwoThetaDeg           float64 `json:"two_theta_deg"`
	Intensity             float64 `json:"intensity"`
	DSpacingA             float64 `json:"d_A"`
	CalculatedTwoThetaDeg float64 `json:"calculated_two_theta_deg"`
	ResidualDeg           float64 `json:"residual_deg"` // observed − calculated, after the zero shift
	// Icosahedral labels.
	Icosahedral *IcosahedralLabel `json:"icosahedral,omitempty"`
	// HKL is the representative reflection (crystalline phases and approximants).
	HKL *[3]int `json:"hkl,omitempty"`
	// PredictedIntensity is the computed intensity of the line, relative to
	// the phase's strongest line in the range of the scan's peaks (100):
	// library phases from their structure, icosahedral phases from the
	// spherical-atomic-surface model (icosa.Intensity, with the
	// Lorentz–polarisation factor).
	PredictedIntensity *float64 `json:"predicted_intensity,omitempty"`
}

// IcosahedralLabel indexes a peak by an icosahedral reflection family.
type IcosahedralLabel struct {
	N int `json:"n"`
	M int `json:"m"`
	// Index is one reflection of the family in Cahn-Shechtman-Gratias
	// notation (h, h', k, k', l, l').
	Index        [6]int  `json:"index6"`
	Multiplicity int     `json:"multiplicity"`
	PerpPerA     float64 `json:"g_perp_per_A"` // |G⊥| in Å⁻¹
	Perp         float64 `json:"g_perp_a6"`    // |G⊥|·a6, dimensionless
}

// PhasonTrend is a straight-line fit of the absolute residual |Δq| (Å⁻¹,
// q = 1/d) against |G⊥| (Å⁻¹) over the indexed peaks of an icosahedral
// phase. Residuals that grow with |G⊥| are the powder signature of phason
// strain.
type PhasonTrend struct {
	Slope            float64 `json:"slope"` // d|Δq|/d|G⊥|, dimensionless
	SlopeUncertainty float64 `json:"slope_uncertainty"`
	// Flagged is true when the slope is positive by more than three standard
	// uncertainties over at least five peaks.
	Flagged bool `json:"flagged"`
}

// ModelSummary is the best solution one model found on the full list.
type ModelSummary struct {
	Kind          Kind    `json:"kind"`
	Lattice       string  `json:"lattice"`
	Order         string  `json:"order,omitempty"`
	Phase         string  `json:"phase,omitempty"` // library phase
	ScaleA        float64 `json:"scale_A"`         // a_R for icosahedral models, a otherwise
	IndexedPeaks  int     `json:"indexed_peaks"`
	FigureOfMerit float64 `json:"figure_of_merit"`
	Evidence      float64 `json:"evidence"`
	Chance        float64 `json:"chance"`
}

// Index indexes peaks measured with one wavelength wavelengthA (Å).
//
// Models tried: icosahedral P, F, I with a_R in [3.9, 6.1] Å; cubic P, I,
// F with a in [2.5, 16] Å; cubic P and I approximants of the orders in
// Options (1/1 and 2/1 by default) of every reference quasilattice constant
// and of an icosahedral phase found earlier in the same list. The best significant model takes its peaks and the
// rest is indexed again, up to Options.MaxPhases times.
//
// Peaks need 2θ in (0°, 180°) and a finite intensity ≥ 0; at least three
// peaks are needed. Peaks need not be sorted; those in the result are in
// increasing 2θ. An icosahedral phase needs at least five indexed peaks, a
// cubic one three.
//
// Reference: see the package documentation.
func Index(peaks []Peak, wavelengthA float64, opts Options) (Result, error) {
	opts = opts.withDefaults()
	if err := opts.validate(); err != nil {
		return Result{}, err
	}
	if !(wavelengthA > 0.1 && wavelengthA < 5) {
		return Result{}, meltbook.Errorf(meltbook.Invalid, "wavelength", "%g Å is not an X-ray or neutron wavelength in (0.1, 5) Å", wavelengthA)
	}
	if len(peaks) < 3 {
		return Result{}, meltbook.Errorf(meltbook.Invalid, "peaks", "%d peaks given; indexing needs at least 3", len(peaks))
	}
	if len(peaks) > maxPeaks {
		return Result{}, meltbook.Errorf(meltbook.Invalid, "peaks", "%d peaks given; at most %d can be indexed at once", len(peaks), maxPeaks)
	}
	for i, p := range peaks {
		field := fmt.Sprintf("peak %d", i+1)
		if !(p.TwoThetaDeg > 0 && p.TwoThetaDeg < 180) {
			return Result{}, meltbook.Errorf(meltbook.Invalid, field, "2θ = %g° is outside (0°, 180°)", p.TwoThetaDeg)
		}
		if !(p.Intensity >= 0) || math.IsInf(p.Intensity, 0) {
			return Result{}, meltbook.Errorf(meltbook.Invalid, field, "intensity %g is not a finite number ≥ 0", p.Intensity)
		}
	}
	sorted := append([]Peak(nil), peaks...)
	sort.SliceStable(sorted, func(i, j int) bool { return sorted[i].TwoThetaDeg < sorted[j].TwoThetaDeg })
	return run(sorted, wavelengthA, opts), nil
}

package meltbook

import (
	"math"
	"strconv"
	"strings"
	"time"
)

// Kα2 states of a scan's radiation, as analysis/radiation writes them.
const (
	Kalpha2Doublet  = "doublet"  // the scan holds the Kα1/Kα2 doublet
	Kalpha2Stripped = "stripped" // Kα2 was removed from the data after measuring
	Kalpha2Mono     = "mono"     // monochromated beam or a single wavelength: no Kα2
)

// ScanRadiation is the X-ray beam a scan was measured with.
type ScanRadiation struct {
	// Anode is the tube anode's element symbol ("Cu"), empty when the
	// wavelengths were given explicitly.
	Anode string `json:"anode,omitempty"`
	// Kalpha1Angstrom is the wavelength d-spacings are computed with (Kα1,
	// or the single wavelength), in Å.
	Kalpha1Angstrom float64 `json:"kalpha1_angstrom"`
	// Kalpha2Angstrom is the Kα2 wavelength in Å, zero when not known.
	Kalpha2Angstrom float64 `json:"kalpha2_angstrom,omitempty"`
	// Kalpha2Ratio is the intensity ratio I(Kα2)/I(Kα1).
	Kalpha2Ratio float64 `json:"kalpha2_ratio,omitempty"`
	// Kalpha2 is Kalpha2Doublet, Kalpha2Stripped or Kalpha2Mono.
	Kalpha2 string `json:"kalpha2"`
	// Text is the radiation as analysis/radiation writes and reads it back
	// ("Cu", "Co:stripped", "0.70932:mono").
	Text string `json:"text"`
	// Assumed is set when neither the file nor the person stated the
	// radiation and a default was taken; a re-indexing can correct it.
	Assumed bool `json:"assumed,omitempty"`
}

// Validate checks the wavelengths and the Kα2 state.
func (r *ScanRadiation) Validate() error {
	if !(r.Kalpha1Angstrom > 0) || math.IsInf(r.Kalpha1Angstrom, 0) {
		return Errorf(Invalid, "radiation", "the wavelength must be a positive number of ångström, not %g", r.Kalpha1Angstrom)
	}
	switch r.Kalpha2 {
	case Kalpha2Doublet, Kalpha2Stripped:
		if !(r.Kalpha2Angstrom > r.Kalpha1Angstrom) || math.IsInf(r.Kalpha2Angstrom, 0) {
			return Errorf(Invalid, "radiation", "a Kα doublet needs a Kα2 wavelength longer than Kα1 (%g Å), not %g Å", r.Kalpha1Angstrom, r.Kalpha2Angstrom)
		}
	case Kalpha2Mono:
	default:
		return Errorf(Invalid, "radiation", "Kα2 state %q is not doublet, stripped or mono", r.Kalpha2)
	}
	if !(r.Kalpha2Ratio >= 0 && r.Kalpha2Ratio <= 1) {
		return Errorf(Invalid, "radiation", "the Kα2/Kα1 intensity ratio %g is outside 0..1", r.Kalpha2Ratio)
	}
	if strings.TrimSpace(r.Text) == "" {
		return Errorf(Invalid, "radiation", "the radiation needs its text form")
	}
	return nil
}

// Scan is one powder diffraction scan of a sample, as imported from a file.
type Scan struct {
	ID         int64  `json:"id"`
	SampleID   int64  `json:"-"`
	SampleCode string `json:"sample"`
	// MeltCode is the melt the sample belongs to, filled in when read.
	MeltCode string `json:"melt,omitempty"`
	// FileName is the source file's base name; SHA256 the hexadecimal
	// SHA-256 digest of its bytes.
	FileName string `json:"file_name"`
	SHA256   string `json:"sha256"`
	// Format is the file format as read, as analysis/scanfile names it:
	// "xy", "xye" or "pdcif".
	Format    string        `json:"format"`
	Radiation ScanRadiation `json:"radiation"`
	// InternalStandard names the line-position standard mixed into the
	// specimen ("Si (NIST SRM 640f)"), empty when none was declared.
	InternalStandard string `json:"internal_standard,omitempty"`
	// TwoThetaDeg are the diffraction angles in degrees, strictly
	// increasing; Counts the intensities at them, in the file's units;
	// CountErrors their standard uncertainties, nil when the file gives
	// none.
	TwoThetaDeg []float64 `json:"two_theta_deg"`
	Counts      []float64 `json:"counts"`
	CountErrors []float64 `json:"count_errors,omitempty"`
	ImportedAt  time.Time `json:"imported_at"`
	ImportedBy  string    `json:"imported_by"`
	Notes       string    `json:"notes,omitempty"`
}

// Points returns the number of points of the scan.
func (s *Scan) Points() int { return len(s.TwoThetaDeg) }

// Validate checks the scan before it is stored: a sample, a file name, a
// SHA-256 digest, a valid radiation, and at least two points with finite,
// strictly increasing 2θ in [0°, 180°) and finite, non-negative
// intensities and uncertainties.
func (s *Scan) Validate() error {
	if strings.TrimSpace(s.SampleCode) == "" && s.SampleID == 0 {
		return Errorf(Invalid, "sample", "a scan needs the sample it was taken of")
	}
	if strings.TrimSpace(s.FileName) == "" {
		return Errorf(Invalid, "file", "a scan needs the name of the file it came from")
	}
	if len(s.SHA256) != 64 || strings.Trim(s.SHA256, "0123456789abcdef") != "" {
		return Errorf(Invalid, "sha256", "%q is not a lower-case hexadecimal SHA-256 digest", s.SHA256)
	}
	if err := s.Radiation.Validate(); err != nil {
		return err
	}
	n := len(s.TwoThetaDeg)
	if n < 2 {
		return Errorf(Invalid, s.FileName, "a scan needs at least two points, not %d", n)
	}
	if len(s.Counts) != n || (s.CountErrors != nil && len(s.CountErrors) != n) {
		return Errorf(Invalid, s.FileName, "%d angles, %d intensities and %d uncertainties do not match", n, len(s.Counts), len(s.CountErrors))
	}
	for i, t := range s.TwoThetaDeg {
		if !(t >= 0 && t < 180) {
			return Errorf(Invalid, s.FileName, "point %d: 2θ %g° is outside [0°, 180°)", i+1, t)
		}
		if i > 0 && !(t > s.TwoThetaDeg[i-1]) {
			return Errorf(Invalid, s.FileName, "point %d: 2θ %g° does not increase", i+1, t)
		}
		if c := s.Counts[i]; !(c >= 0) || math.IsInf(c, 0) {
			return Errorf(Invalid, s.FileName, "point %d: intensity %g is not a finite, non-negative number", i+1, c)
		}
		if s.CountErrors != nil {
			if e := s.CountErrors[i]; !(e >= 0) || math.IsInf(e, 0) {
				return Errorf(Invalid, s.FileName, "point %d: uncertainty %g is not a finite, non-negative number", i+1, e)
			}
		}
	}
	return nil
}

// ScanSummary names a scan without its points, with its current indexing
// in brief.
type ScanSummary struct {
	ID               int64         `json:"id"`
	SampleCode       string        `json:"sample"`
	MeltCode         string        `json:"melt"`
	FileName         string        `json:"file_name"`
	SHA256           string        `json:"sha256"`
	Format           string        `json:"format"`
	Radiation        ScanRadiation `json:"radiation"`
	InternalStandard string        `json:"internal_standard,omitempty"`
	Points           int           `json:"points"`
	FromDeg          float64       `json:"from_deg"`
	ToDeg            float64       `json:"to_deg"`
	ImportedAt       time.Time     `json:"imported_at"`
	ImportedBy       string        `json:"imported_by"`
	// IndexingVersion is the version of the current indexing (0: none);
	// Indexing sums it up, e.g. "icosahedral F a_R = 4.462(2) Å, 14 of 15
	// peaks", or "no phase beats chance (15 peaks)".
	IndexingVersion int    `json:"indexing_version"`
	Indexing        string `json:"indexing"`
}

// PeakOrigin says how a peak came into the notebook.
type PeakOrigin string

// Peak origins.
const (
	PeakAutomatic PeakOrigin = "automatic" // found by the peak search
	PeakByHand    PeakOrigin = "by hand"   // placed by a person
)

// Peak is one fitted diffraction peak of a scan (the Kα1 component where the
// scan holds the doublet). Standard uncertainties are nil when the fit could
// not give one.
type Peak struct {
	ID            int64    `json:"id"`
	TwoThetaDeg   float64  `json:"two_theta_deg"`
	TwoThetaSUDeg *float64 `json:"two_theta_su_deg,omitempty"`
	DAngstrom     float64  `json:"d_angstrom"`
	DSUAngstrom   *float64 `json:"d_su_angstrom,omitempty"`
	// Height is the net maximum above background, in intensity units;
	// Area the integrated net intensity, intensity units × degrees.
	Height    float64  `json:"height"`
	HeightSU  *float64 `json:"height_su,omitempty"`
	Area      float64  `json:"area"`
	AreaSU    *float64 `json:"area_su,omitempty"`
	FWHMDeg   float64  `json:"fwhm_deg"`
	FWHMSUDeg *float64 `json:"fwhm_su_deg,omitempty"`
	// Eta is the pseudo-Voigt Lorentzian fraction (0 Gaussian, 1 Lorentzian).
	Eta   float64  `json:"eta"`
	EtaSU *float64 `json:"eta_su,omitempty"`
	// Significance is the net height over its standard uncertainty at the
	// search.
	Significance float64 `json:"significance"`
	// Standard names the internal-standard line the peak was matched to,
	// empty for the specimen's own peaks.
	Standard string `json:"standard,omitempty"`
	// CorrectedTwoThetaDeg and CorrectedDAngstrom are the position after the
	// zero shift found from the internal standard; nil without one.
	CorrectedTwoThetaDeg *float64   `json:"corrected_two_theta_deg,omitempty"`
	CorrectedDAngstrom   *float64   `json:"corrected_d_angstrom,omitempty"`
	Found                PeakOrigin `json:"found"`
}

// Indexing model kinds, as analysis/indexing names them.
const (
	ModelIcosahedral = "icosahedral"
	ModelApproximant = "approximant"
	ModelCubic       = "cubic"
	// The other crystal systems of a lattice search or a library phase.
	ModelTetragonal   = "tetragonal"
	ModelHexagonal    = "hexagonal"
	ModelOrthorhombic = "orthorhombic"
	ModelMonoclinic   = "monoclinic"
	ModelTriclinic    = "triclinic"
	ModelRhombohedral = "rhombohedral"
)

// IsCrystalKind reports whether kind is an ordinary crystalline phase:
// cubic or one of the six other crystal systems.
func IsCrystalKind(kind string) bool {
	switch kind {
	case ModelCubic, ModelTetragonal, ModelHexagonal, ModelOrthorhombic, ModelMonoclinic, ModelTriclinic, ModelRhombohedral:
		return true
	}
	return false
}

// PeakAssignment says which reflection explains one peak.
type PeakAssignment struct {
	// PeakID is the peak's row; Peak its position in Indexing.Peaks.
	PeakID                int64   `json:"peak_id"`
	Peak                  int     `json:"peak"`
	TwoThetaDeg           float64 `json:"two_theta_deg"`
	CalculatedTwoThetaDeg float64 `json:"calculated_two_theta_deg"`
	ResidualDeg           float64 `json:"residual_deg"`
	DAngstrom             float64 `json:"d_angstrom"`
	// Label is the reflection in short: "(7,11)" for an icosahedral family
	// (N, M), "422" for a cubic reflection; Detail adds the full index.
	Label  string `json:"label"`
	Detail string `json:"detail,omitempty"`
	// PredictedIntensity is the reflection's relative predicted intensity,
	// the strongest predicted line of the phase = 100; nil when not known.
	PredictedIntensity *float64 `json:"predicted_intensity,omitempty"`
}

// IndexedPhase is one phase an indexing found.
type IndexedPhase struct {
	ID int64 `json:"id"`
	// Kind is ModelIcosahedral, ModelApproximant or ModelCubic; Lattice P,
	// I or F.
	Kind    string `json:"kind"`
	Lattice string `json:"lattice"`
	// Order and ApproximantOf describe an approximant: "1/1" of "i-Al-Cu-Fe";
	// IdealAA is the ideal approximant constant 2·a_R·(q+pτ)/√(2+τ).
	Order         string  `json:"order,omitempty"`
	ApproximantOf string  `json:"approximant_of,omitempty"`
	IdealAA       float64 `json:"ideal_a_angstrom,omitempty"`
	// ConstantA is the quasilattice constant a_R (icosahedral) or the cubic
	// lattice constant a, in Å, with its standard uncertainty.
	ConstantA   float64 `json:"constant_angstrom"`
	ConstantSUA float64 `json:"constant_su_angstrom"`
	// SixDimensionalConstantA is a6 = √2·a_R (icosahedral phases), in Å.
	SixDimensionalConstantA float64 `json:"a6_angstrom,omitempty"`
	ZeroShiftDeg            float64 `json:"zero_shift_deg"`
	ZeroShiftSUDeg          float64 `json:"zero_shift_su_deg"`
	// FigureOfMerit is S = Σ −ln pᵢ in nats; Chance the probability that
	// random peaks score as well (see analysis/indexing).
	FigureOfMerit float64 `json:"figure_of_merit"`
	Chance        float64 `json:"chance"`
	ChanceBasis   string  `json:"chance_basis"`
	// ExplainedIntensity is the share of all peaks' intensity in this
	// phase's peaks, 0..1.
	ExplainedIntensity float64 `json:"explained_intensity"`
	RMSResidualDeg     float64 `json:"rms_residual_deg"`
	// PhasonStrain is set when residuals grow with |G⊥| (icosahedral).
	PhasonStrain bool `json:"phason_strain,omitempty"`
	// Phase is a library phase's name as displayed ("θ-Al2Cu"), empty for a
	// lattice-search solution; SpaceGroup its short Hermann–Mauguin symbol
	// ("I4/mcm"); Reference where its structure was published.
	Phase      string `json:"phase,omitempty"`
	SpaceGroup string `json:"space_group,omitempty"`
	Reference  string `json:"reference,omitempty"`
	// ConstantB and ConstantC (Å) and Alpha, Beta, Gamma (degrees), with
	// their standard uncertainties, are the cell constants the kind does
	// not fix; zero when it fixes them.
	ConstantB   float64 `json:"b_angstrom,omitempty"`
	ConstantSUB float64 `json:"b_su_angstrom,omitempty"`
	ConstantC   float64 `json:"c_angstrom,omitempty"`
	ConstantSUC float64 `json:"c_su_angstrom,omitempty"`
	AlphaDeg    float64 `json:"alpha_deg,omitempty"`
	AlphaSUDeg  float64 `json:"alpha_su_deg,omitempty"`
	BetaDeg     float64 `json:"beta_deg,omitempty"`
	BetaSUDeg   float64 `json:"beta_su_deg,omitempty"`
	GammaDeg    float64 `json:"gamma_deg,omitempty"`
	GammaSUDeg  float64 `json:"gamma_su_deg,omitempty"`
	// WholePatternRwp is the Le Bail check's Rwp, a fraction 0..1; nil when
	// none was run.
	WholePatternRwp *float64         `json:"whole_pattern_rwp,omitempty"`
	Assignments     []PeakAssignment `json:"assignments"`
}

// Title writes the phase in short, e.g. "icosahedral F, a_R = 4.4621(8) Å",
// "cubic P approximant 1/1, a = 12.271(3) Å" or "cubic F, a = 4.0496(2) Å".
func (p *IndexedPhase) Title() string {
	switch p.Kind {
	case ModelIcosahedral:
		return "icosahedral " + p.Lattice + ", a_R = " + WithUncertainty(p.ConstantA, p.ConstantSUA) + " Å"
	case ModelApproximant:
		return "cubic " + p.Lattice + " approximant " + p.Order + ", a = " + WithUncertainty(p.ConstantA, p.ConstantSUA) + " Å"
	}
	kind := p.Kind
	if kind == "" {
		kind = ModelCubic
	}
	t := kind + " " + p.Lattice
	if p.SpaceGroup != "" {
		t = kind + " " + p.SpaceGroup
	}
	if p.Phase != "" {
		t = p.Phase + ", " + t
	}
	t += ", a = " + WithUncertainty(p.ConstantA, p.ConstantSUA) + " Å"
	if p.ConstantB > 0 {
		t += ", b = " + WithUncertainty(p.ConstantB, p.ConstantSUB) + " Å"
	}
	if p.ConstantC > 0 {
		t += ", c = " + WithUncertainty(p.ConstantC, p.ConstantSUC) + " Å"
	}
	if p.AlphaDeg > 0 {
		t += ", α = " + WithUncertainty(p.AlphaDeg, p.AlphaSUDeg) + "°"
	}
	if p.BetaDeg > 0 {
		t += ", β = " + WithUncertainty(p.BetaDeg, p.BetaSUDeg) + "°"
	}
	if p.GammaDeg > 0 {
		t += ", γ = " + WithUncertainty(p.GammaDeg, p.GammaSUDeg) + "°"
	}
	return t
}

// ModelTried is the best solution one model reached on all the peaks,
// significant or not.
type ModelTried struct {
	Kind          string  `json:"kind"`
	Lattice       string  `json:"lattice"`
	Order         string  `json:"order,omitempty"`
	Phase         string  `json:"phase,omitempty"`
	ScaleA        float64 `json:"scale_angstrom"` // a_R (icosahedral) or a, Å
	IndexedPeaks  int     `json:"indexed_peaks"`
	FigureOfMerit float64 `json:"figure_of_merit"`
	Chance        float64 `json:"chance"`
}

// Indexing is one run of the peak search and indexing on a scan. A scan's
// indexings are numbered 1, 2, ... (Version); the newest is the current one,
// and earlier ones stay in the notebook.
type Indexing struct {
	ID      int64 `json:"id"`
	ScanID  int64 `json:"scan_id"`
	Version int   `json:"version"`
	// At is when it ran; By names the program and version that ran it,
	// RequestedBy the person who asked; Reason says why it was run again
	// (empty for the first).
	At          time.Time `json:"at"`
	By          string    `json:"by"`
	RequestedBy string    `json:"requested_by"`
	Reason      string    `json:"reason,omitempty"`
	// Radiation and InternalStandard are those the analysis used.
	Radiation        ScanRadiation `json:"radiation"`
	InternalStandard string        `json:"internal_standard,omitempty"`
	// ZeroShiftDeg is the zero shift found from the internal standard (2θ,
	// degrees) with its standard uncertainty; nil without one.
	ZeroShiftDeg   *float64 `json:"standard_zero_shift_deg,omitempty"`
	ZeroShiftSUDeg *float64 `json:"standard_zero_shift_su_deg,omitempty"`
	// ToleranceDeg and MaxChance are the indexing settings used.
	ToleranceDeg float64        `json:"tolerance_deg"`
	MaxChance    float64        `json:"max_chance"`
	Peaks        []Peak         `json:"peaks"`
	Phases       []IndexedPhase `json:"phases"`
	// Unexplained are the positions in Peaks of the specimen peaks no phase
	// explains.
	Unexplained []int        `json:"unexplained"`
	Models      []ModelTried `json:"models"`
	// Notes say what the peak search or the indexing could not do.
	Notes []string `json:"notes,omitempty"`
}

// SpecimenPeaks counts the peaks that are not internal-standard lines.
func (x *Indexing) SpecimenPeaks() int {
	n := 0
	for _, p := range x.Peaks {
		if p.Standard == "" {
			n++
		}
	}
	return n
}

// ScanRecord is everything the notebook holds about one scan: the scan with
// its points, its indexings oldest first (the last is current), the
// automatic proposals they made (any status) and the scan's history.
type ScanRecord struct {
	Scan      Scan           `json:"scan"`
	Indexings []Indexing     `json:"indexings"`
	Proposals []ScanProposal `json:"proposals"`
	History   []HistoryEntry `json:"history"`
}

// Current returns the current (newest) indexing, nil when there is none.
func (r *ScanRecord) Current() *Indexing {
	if len(r.Indexings) == 0 {
		return nil
	}
	return &r.Indexings[len(r.Indexings)-1]
}

// ScanProposal is an automatic outcome proposed from a scan's indexing.
type ScanProposal struct {
	Outcome Outcome `json:"outcome"`
	// OutcomeID is the outcome's row, the handle confirm and reject take.
	OutcomeID       int64 `json:"outcome_id"`
	IndexingVersion int   `json:"indexing_version"`
	// Confidence is "high", "medium" or "low" (see analysis/verdict).
	Confidence string `json:"confidence"`
}

// WithUncertainty writes a value with its standard uncertainty in the
// concise notation, two significant digits of uncertainty: 4.46213 ± 0.00081
// gives "4.46213(81)"; a zero or non-finite uncertainty writes the value to
// four decimals.
func WithUncertainty(v, su float64) string {
	if !(su > 0) || math.IsInf(su, 0) || math.IsNaN(v) {
		return trimFloat(v, 4)
	}
	decimals := int(math.Ceil(-math.Log10(su))) + 1
	if decimals < 0 {
		decimals = 0
	}
	if decimals > 12 {
		decimals = 12
	}
	scaled := math.Round(su * math.Pow(10, float64(decimals)))
	if scaled >= 100 && decimals > 0 {
		decimals--
		scaled = math.Round(su * math.Pow(10, float64(decimals)))
	}
	return trimFloat(v, decimals) + "(" + trimFloat(scaled, 0) + ")"
}

func trimFloat(v float64, decimals int) string { return strconv.FormatFloat(v, 'f', decimals, 64) }

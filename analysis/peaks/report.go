package peaks

import (
	"math"
	"strconv"
)

// Number is a float64 that encodes as JSON null when it is NaN or
// infinite (an uncertainty the fit could not give), since JSON has no such
// numbers.
type Number float64

// MarshalJSON writes the number, or null when it is not finite.
func (n Number) MarshalJSON() ([]byte, error) {
	f := float64(n)
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return []byte("null"), nil
	}
	return strconv.AppendFloat(nil, f, 'g', -1, 64), nil
}

// Report is the JSON form of a Result: what was measured, without the
// per-point curves.
type Report struct {
	Radiation          string           `json:"radiation"`
	WavelengthAngstrom float64          `json:"wavelength_angstrom"`
	StepDeg            float64          `json:"step_deg"`
	Points             int              `json:"points"`
	Peaks              []PeakReport     `json:"peaks"`
	ZeroShift          *ZeroShiftReport `json:"zero_shift,omitempty"`
	Dropped            []Dropped        `json:"dropped,omitempty"`
	Notes              []string         `json:"notes,omitempty"`
}

// PeakReport is one peak in a Report. The corrected fields are present
// only when a zero shift was found.
type PeakReport struct {
	TwoThetaDeg          Number  `json:"two_theta_deg"`
	TwoThetaSUDeg        Number  `json:"two_theta_su_deg"`
	DAngstrom            Number  `json:"d_angstrom"`
	DSUAngstrom          Number  `json:"d_su_angstrom"`
	Height               Number  `json:"height"`
	HeightSU             Number  `json:"height_su"`
	Area                 Number  `json:"area"`
	AreaSU               Number  `json:"area_su"`
	FWHMDeg              Number  `json:"fwhm_deg"`
	FWHMSUDeg            Number  `json:"fwhm_su_deg"`
	Eta                  Number  `json:"eta"`
	EtaSU                Number  `json:"eta_su"`
	Significance         Number  `json:"significance"`
	Standard             string  `json:"standard,omitempty"`
	CorrectedTwoThetaDeg *Number `json:"corrected_two_theta_deg,omitempty"`
	CorrectedDAngstrom   *Number `json:"corrected_d_angstrom,omitempty"`
}

// ZeroShiftReport is the zero-shift part of a Report.
type ZeroShiftReport struct {
	Standard          string `json:"standard"`
	ZeroDeg           Number `json:"zero_deg"`
	ZeroSUDeg         Number `json:"zero_su_deg"`
	DisplacementDeg   Number `json:"displacement_deg"`
	DisplacementSUDeg Number `json:"displacement_su_deg"`
	DisplacementFit   bool   `json:"displacement_fitted"`
	Lines             int    `json:"lines_matched"`
	ReducedChiSquare  Number `json:"reduced_chi_square"`
}

// Report summarises the result for JSON output.
func (r Result) Report() Report {
	rep := Report{
		Radiation:          r.Radiation.String(),
		WavelengthAngstrom: r.Radiation.Kalpha1Angstrom,
		StepDeg:            r.StepDeg,
		Points:             len(r.Background),
		Peaks:              make([]PeakReport, len(r.Peaks)),
		Dropped:            r.Dropped,
		Notes:              r.Notes,
	}
	for i, p := range r.Peaks {
		pr := PeakReport{
			TwoThetaDeg: Number(p.TwoThetaDeg), TwoThetaSUDeg: Number(p.TwoThetaSUDeg),
			DAngstrom: Number(p.DAngstrom), DSUAngstrom: Number(p.DSUAngstrom),
			Height: Number(p.Height), HeightSU: Number(p.HeightSU),
			Area: Number(p.Area), AreaSU: Number(p.AreaSU),
			FWHMDeg: Number(p.FWHMDeg), FWHMSUDeg: Number(p.FWHMSUDeg),
			Eta: Number(p.Eta), EtaSU: Number(p.EtaSU),
			Significance: Number(p.Significance),
			Standard:     p.Standard,
		}
		if r.Corrected != nil {
			tt, d := Number(r.Corrected[i].TwoThetaDeg), Number(r.Corrected[i].DAngstrom)
			pr.CorrectedTwoThetaDeg, pr.CorrectedDAngstrom = &tt, &d
		}
		rep.Peaks[i] = pr
	}
	if z := r.ZeroShift; z != nil {
		rep.ZeroShift = &ZeroShiftReport{
			Standard: z.Standard, ZeroDeg: Number(z.ZeroDeg), ZeroSUDeg: Number(z.ZeroSUDeg),
			DisplacementDeg: Number(z.DisplacementDeg), DisplacementSUDeg: Number(z.DisplacementSUDeg),
			DisplacementFit: z.Fitted, Lines: len(z.Matches), ReducedChiSquare: Number(z.ReducedChiSquare),
		}
	}
	return rep
}

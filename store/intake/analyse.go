package intake

import (
	"fmt"
	"math"

	"meltbook"
	"meltbook/analysis/halo"
	"meltbook/analysis/indexing"
	"meltbook/analysis/peaks"
	"meltbook/analysis/radiation"
	"meltbook/analysis/scanfile"
)

// analysis is what the peak search and indexing made of a scan.
type analysis struct {
	indexing meltbook.Indexing
	// halo is set when the pattern holds a diffuse halo that carries at
	// least ten times the integrated intensity of the specimen peaks.
	halo *halo.Halo
	// haloNote describes a halo that was seen beside crystalline peaks.
	haloNote string
}

// haloDominance is how many times the specimen peaks' total area a halo's
// area must reach for the pattern to be weighed as amorphous.
const haloDominance = 10

// analyse runs the peak search and the indexing on a scan.
// lib holds the phases of known structure offered to the search-match.
func analyse(sc *meltbook.Scan, rad radiation.Radiation, std *peaks.Standard, toleranceDeg float64, lib []indexing.KnownPhase) (*analysis, error) {
	sf := scanfile.Scan{TwoThetaDeg: sc.TwoThetaDeg, Counts: sc.Counts, Errors: sc.CountErrors}
	popt := peaks.Options{Standard: std}
	found, err := peaks.Find(sf, rad, popt)
	if err != nil {
		return nil, meltbook.Errorf(meltbook.Invalid, sc.FileName, "peak search: %v", err)
	}
	an := &analysis{}
	x := &an.indexing
	x.Radiation = sc.Radiation
	x.InternalStandard = sc.InternalStandard
	x.Notes = append(x.Notes, found.Notes...)
	if z := found.ZeroShift; z != nil {
		x.ZeroShiftDeg, x.ZeroShiftSUDeg = ptr(z.ZeroDeg), finitePtr(z.ZeroSUDeg)
	}
	var list []indexing.Peak
	var listPeak []int // position in x.Peaks of each indexing input
	specimenArea := 0.0
	for i, p := range found.Peaks {
		mp := meltbook.Peak{
			TwoThetaDeg: p.TwoThetaDeg, TwoThetaSUDeg: finitePtr(p.TwoThetaSUDeg),
			DAngstrom: p.DAngstrom, DSUAngstrom: finitePtr(p.DSUAngstrom),
			Height: p.Height, HeightSU: finitePtr(p.HeightSU), Area: p.Area, AreaSU: finitePtr(p.AreaSU),
			FWHMDeg: p.FWHMDeg, FWHMSUDeg: finitePtr(p.FWHMSUDeg), Eta: p.Eta, EtaSU: finitePtr(p.EtaSU),
			Significance: p.Significance, Standard: p.Standard, Found: meltbook.PeakAutomatic,
		}
		pos := p.TwoThetaDeg
		if found.Corrected != nil {
			c := found.Corrected[i]
			mp.CorrectedTwoThetaDeg, mp.CorrectedDAngstrom = ptr(c.TwoThetaDeg), ptr(c.DAngstrom)
			pos = c.TwoThetaDeg
		}
		x.Peaks = append(x.Peaks, mp)
		if p.Standard != "" {
			continue
		}
		specimenArea += math.Max(p.Area, 0)
		if pos > 0 && pos < 180 && p.Area >= 0 && !math.IsNaN(p.Area) {
			list = append(list, indexing.Peak{TwoThetaDeg: pos, Intensity: p.Area})
			listPeak = append(listPeak, len(x.Peaks)-1)
		}
	}
	iopt := indexing.Options{ToleranceDeg: toleranceDeg, Library: lib}
	// The settings recorded are those Index uses: its defaults, 0.10° and
	// a chance of 0.01, unless a tolerance is given.
	x.ToleranceDeg, x.MaxChance = 0.10, 0.01
	if toleranceDeg > 0 {
		x.ToleranceDeg = toleranceDeg
	}
	x.Phases, x.Unexplained, x.Models = []meltbook.IndexedPhase{}, []int{}, []meltbook.ModelTried{}
	if len(list) >= 3 {
		res, err := indexing.Index(list, rad.Kalpha1Angstrom, iopt)
		if err != nil {
			return nil, meltbook.Errorf(meltbook.Invalid, sc.FileName, "indexing: %v", err)
		}
		at := map[float64]int{}
		for i, p := range list {
			at[p.TwoThetaDeg] = listPeak[i]
		}
		for _, ph := range res.Phases {
			x.Phases = append(x.Phases, phase(ph, at))
		}
		for _, p := range res.Unexplained {
			if i, ok := at[p.TwoThetaDeg]; ok {
				x.Unexplained = append(x.Unexplained, i)
			}
		}
		for _, m := range res.Models {
			x.Models = append(x.Models, meltbook.ModelTried{Kind: string(m.Kind), Lattice: m.Lattice, Order: m.Order,
				Phase: m.Phase, ScaleA: m.ScaleA, IndexedPeaks: m.IndexedPeaks, FigureOfMerit: m.FigureOfMerit, Chance: m.Chance})
		}
	} else {
		for _, i := range listPeak {
			x.Unexplained = append(x.Unexplained, i)
		}
		x.Notes = append(x.Notes, fmt.Sprintf("%d specimen peaks: indexing needs at least three", len(list)))
	}
	if len(x.Phases) == 0 {
		if h, ok := halo.Find(sc.TwoThetaDeg, sc.Counts, rad.Kalpha1Angstrom); ok {
			if h.AreaCountsDeg >= haloDominance*specimenArea {
				an.halo = &h
			} else {
				an.haloNote = fmt.Sprintf("a diffuse hump at 2θ = %.1f° beside peaks no phase explains", h.CentreDeg)
			}
		}
	}
	return an, nil
}

// phase converts an indexed phase, finding each peak's position in the
// stored peak list by its 2θ.
func phase(ph indexing.Phase, at map[float64]int) meltbook.IndexedPhase {
	out := meltbook.IndexedPhase{
		Kind: string(ph.Kind), Lattice: ph.Lattice, Order: ph.Order, ApproximantOf: ph.ApproximantOf, IdealAA: ph.IdealAA,
		ZeroShiftDeg: ph.ZeroShiftDeg, ZeroShiftSUDeg: ph.ZeroShiftUncertaintyDeg, FigureOfMerit: ph.FigureOfMerit,
		Chance: ph.Chance, ChanceBasis: ph.ChanceBasis, ExplainedIntensity: ph.ExplainedIntensity,
		RMSResidualDeg: ph.RMSResidualDeg, PhasonStrain: ph.PhasonTrend != nil && ph.PhasonTrend.Flagged,
		Assignments: []meltbook.PeakAssignment{},
		Phase:       ph.Phase, SpaceGroup: ph.SpaceGroup, Reference: ph.Reference,
		ConstantB: ph.BA, ConstantSUB: ph.BUncertaintyA, ConstantC: ph.CA, ConstantSUC: ph.CUncertaintyA,
		AlphaDeg: ph.AlphaDeg, AlphaSUDeg: ph.AlphaUncertaintyDeg, BetaDeg: ph.BetaDeg, BetaSUDeg: ph.BetaUncertaintyDeg,
		GammaDeg: ph.GammaDeg, GammaSUDeg: ph.GammaUncertaintyDeg,
	}
	if ph.Kind == indexing.Icosahedral {
		out.ConstantA, out.ConstantSUA = ph.QuasilatticeConstantA, ph.QuasilatticeConstantUncertaintyA
		out.SixDimensionalConstantA = ph.SixDimensionalConstantA
	} else {
		out.ConstantA, out.ConstantSUA = ph.AA, ph.AUncertaintyA
	}
	for _, p := range ph.Peaks {
		i, ok := at[p.TwoThetaDeg]
		if !ok {
			continue
		}
		a := meltbook.PeakAssignment{Peak: i, TwoThetaDeg: p.TwoThetaDeg, CalculatedTwoThetaDeg: p.CalculatedTwoThetaDeg,
			ResidualDeg: p.ResidualDeg, DAngstrom: p.DSpacingA, PredictedIntensity: p.PredictedIntensity}
		switch {
		case p.Icosahedral != nil:
			l := p.Icosahedral
			a.Label = fmt.Sprintf("(%d,%d)", l.N, l.M)
			a.Detail = fmt.Sprintf("N = %d, M = %d, index %v, multiplicity %d, |G⊥|·a6 = %.3f", l.N, l.M, l.Index, l.Multiplicity, l.Perp)
		case p.HKL != nil:
			h := p.HKL
			a.Label = fmt.Sprintf("%d%d%d", h[0], h[1], h[2])
			if h[0] > 9 || h[1] > 9 || h[2] > 9 {
				a.Label = fmt.Sprintf("%d %d %d", h[0], h[1], h[2])
			}
			a.Detail = fmt.Sprintf("h² + k² + l² = %d", h[0]*h[0]+h[1]*h[1]+h[2]*h[2])
			if ph.Kind != indexing.Cubic && ph.Kind != indexing.Approximant {
				a.Detail = fmt.Sprintf("reflection %d %d %d", h[0], h[1], h[2])
			}
		}
		out.Assignments = append(out.Assignments, a)
	}
	return out
}

func ptr(v float64) *float64 { return &v }

// finitePtr returns nil for a value the fit could not give.
func finitePtr(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
}

package intake

import (
	"meltbook"
	"meltbook/analysis/peaks"
	"meltbook/analysis/scanfile"
)

// Curves recomputes, for drawing, the background and the fitted profile
// (background included) of a stored scan with the radiation and internal
// standard of its current indexing; each has one value per point. The peak
// search is deterministic, so the curves are those the stored peaks came
// from, unless meltbook's peak search changed since.
func Curves(rec *meltbook.ScanRecord) (background, profile []float64, err error) {
	sc := rec.Scan
	r, std := sc.Radiation, sc.InternalStandard
	if x := rec.Current(); x != nil {
		r, std = x.Radiation, x.InternalStandard
	}
	rad, err := storedRadiation(r)
	if err != nil {
		return nil, nil, err
	}
	s, err := standard("", std)
	if err != nil {
		return nil, nil, err
	}
	res, err := peaks.Find(scanfile.Scan{TwoThetaDeg: sc.TwoThetaDeg, Counts: sc.Counts, Errors: sc.CountErrors}, rad, peaks.Options{Standard: s})
	if err != nil {
		return nil, nil, meltbook.Errorf(meltbook.Invalid, sc.FileName, "peak search: %v", err)
	}
	return res.Background, res.Profile, nil
}

package scanfile

import (
	"errors"
	"fmt"

	"meltbook/analysis/radiation"
)

// ErrNoRadiation is returned by Scan.Radiation when the file states neither
// a wavelength nor an anode.
var ErrNoRadiation = errors.New("the file states no wavelength or anode")

// Radiation returns the radiation the file states:
//
//   - two or more wavelengths: the first is Kα1, the second Kα2, with the
//     intensity ratio of their weights (DefaultKalpha2Ratio when a weight is
//     missing), Kα2 in the scan;
//   - one wavelength: a monochromatic beam of it;
//   - no wavelength but an anode (_diffrn_source_target): that anode's
//     doublet, Kα2 in the scan.
//
// The anode symbol is kept when it names a known anode. XY files state
// nothing, so the caller must say (radiation.ParseRadiation).
func (s Scan) Radiation() (radiation.Radiation, error) {
	anode := ""
	if a, err := radiation.Lookup(s.Anode); err == nil {
		anode = a.Symbol
	}
	var r radiation.Radiation
	switch {
	case len(s.Wavelengths) >= 2:
		w1, w2 := s.Wavelengths[0], s.Wavelengths[1]
		ratio := radiation.DefaultKalpha2Ratio
		if w1.Weight > 0 && w2.Weight > 0 {
			ratio = w2.Weight / w1.Weight
		}
		r = radiation.Radiation{Anode: anode, Kalpha1Angstrom: w1.Angstrom, Kalpha2Angstrom: w2.Angstrom,
			Kalpha2Ratio: ratio, Kalpha2: radiation.Kalpha2Present}
	case len(s.Wavelengths) == 1:
		r = radiation.Radiation{Anode: anode, Kalpha1Angstrom: s.Wavelengths[0].Angstrom, Kalpha2: radiation.Kalpha2Absent}
	case anode != "":
		return radiation.FromAnode(anode, radiation.Kalpha2Present)
	case s.Anode != "":
		return radiation.Radiation{}, fmt.Errorf("%w: anode %q is not one meltbook knows", ErrNoRadiation, s.Anode)
	default:
		return radiation.Radiation{}, ErrNoRadiation
	}
	if err := r.Validate(); err != nil {
		return radiation.Radiation{}, fmt.Errorf("wavelengths stated in the file: %w", err)
	}
	return r, nil
}

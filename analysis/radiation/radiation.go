package radiation

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
)

// Anode is the characteristic Kα doublet of an X-ray tube anode.
type Anode struct {
	// Symbol is the element symbol of the anode ("Cu").
	Symbol string
	// Kalpha1Angstrom and Kalpha2Angstrom are the Kα1 (K-L3) and Kα2 (K-L2)
	// wavelengths in Å.
	Kalpha1Angstrom float64
	Kalpha2Angstrom float64
}

// DefaultKalpha2Ratio is the intensity ratio I(Kα2)/I(Kα1) used unless the
// caller gives another: one half, the ratio of the 2p3/2 and 2p1/2 level
// occupancies.
//
// Reference: common practice.
const DefaultKalpha2Ratio = 0.5

// anodes holds the Kα1 and Kα2 wavelengths in Å.
//
// Cr, Fe, Co, Cu: G. Hölzer, M. Fritsch, M. Deutsch, J. Härtwig and
// E. Förster, Phys. Rev. A 56, 4554 (1997), doi:10.1103/PhysRevA.56.4554,
// as tabulated in International Tables for Crystallography Vol. C (2004),
// Table 4.2.2.1. Hölzer et al. measured the 3d transition metals only (from
// memory); Mo is from the same Table 4.2.2.1 (Deslattes et al.), on the same
// scale.
var anodes = []Anode{
	{Symbol: "Cr", Kalpha1Angstrom: 2.2897260, Kalpha2Angstrom: 2.2936510},
	{Symbol: "Fe", Kalpha1Angstrom: 1.9360410, Kalpha2Angstrom: 1.9399730},
	{Symbol: "Co", Kalpha1Angstrom: 1.7889960, Kalpha2Angstrom: 1.7928350},
	{Symbol: "Cu", Kalpha1Angstrom: 1.5405929, Kalpha2Angstrom: 1.5444274},
	{Symbol: "Mo", Kalpha1Angstrom: 0.70931715, Kalpha2Angstrom: 0.713607},
}

// Anodes returns the anodes meltbook knows, in order of decreasing
// wavelength.
func Anodes() []Anode {
	return append([]Anode(nil), anodes...)
}

// ErrUnknownAnode is wrapped by the error Lookup returns for an anode it
// does not know.
var ErrUnknownAnode = errors.New("unknown anode")

// Lookup returns the anode with the given element symbol, ignoring case
// ("Cu", "cu" and "CU" are copper).
func Lookup(symbol string) (Anode, error) {
	s := strings.TrimSpace(symbol)
	for _, a := range anodes {
		if strings.EqualFold(a.Symbol, s) {
			return a, nil
		}
	}
	names := make([]string, len(anodes))
	for i, a := range anodes {
		names[i] = a.Symbol
	}
	sort.Strings(names)
	return Anode{}, fmt.Errorf("%w %q (known: %s)", ErrUnknownAnode, symbol, strings.Join(names, ", "))
}

// Kalpha2State says what became of the Kα2 line in a scan.
type Kalpha2State int

// The Kα2 states. The zero value is not a state: a Radiation must say.
const (
	// Kalpha2Present: the scan holds the Kα1/Kα2 doublet.
	Kalpha2Present Kalpha2State = iota + 1
	// Kalpha2Stripped: the doublet was measured but Kα2 was removed from
	// the data afterwards, by the instrument software or by hand.
	Kalpha2Stripped
	// Kalpha2Absent: a monochromator kept Kα2 out of the beam, or the
	// source has one wavelength.
	Kalpha2Absent
)

var stateWords = map[Kalpha2State]string{
	Kalpha2Present:  "doublet",
	Kalpha2Stripped: "stripped",
	Kalpha2Absent:   "mono",
}

// String returns the word ParseRadiation reads for the state: "doublet",
// "stripped" or "mono".
func (s Kalpha2State) String() string {
	if w, ok := stateWords[s]; ok {
		return w
	}
	return fmt.Sprintf("Kalpha2State(%d)", int(s))
}

// Radiation is the beam a scan was measured with.
type Radiation struct {
	// Anode is the element symbol of the tube anode, or empty when the
	// wavelengths were given explicitly.
	Anode string
	// Kalpha1Angstrom is the Kα1 wavelength in Å: the wavelength d-spacings
	// are computed with. For a single-wavelength source it is that
	// wavelength.
	Kalpha1Angstrom float64
	// Kalpha2Angstrom is the Kα2 wavelength in Å, zero when not known.
	Kalpha2Angstrom float64
	// Kalpha2Ratio is the intensity ratio I(Kα2)/I(Kα1).
	Kalpha2Ratio float64
	// Kalpha2 says whether Kα2 is in the scan.
	Kalpha2 Kalpha2State
}

// FromAnode returns the radiation of the named anode with the given Kα2
// state and the default Kα2/Kα1 intensity ratio.
func FromAnode(symbol string, state Kalpha2State) (Radiation, error) {
	a, err := Lookup(symbol)
	if err != nil {
		return Radiation{}, err
	}
	r := Radiation{
		Anode:           a.Symbol,
		Kalpha1Angstrom: a.Kalpha1Angstrom,
		Kalpha2Angstrom: a.Kalpha2Angstrom,
		Kalpha2Ratio:    DefaultKalpha2Ratio,
		Kalpha2:         state,
	}
	return r, r.Validate()
}

// Monochromatic returns a single-wavelength radiation of lambdaA Å.
func Monochromatic(lambdaA float64) (Radiation, error) {
	r := Radiation{Kalpha1Angstrom: lambdaA, Kalpha2: Kalpha2Absent}
	return r, r.Validate()
}

// Validate reports the first thing wrong with r: a wavelength that is not
// positive and finite (Kα2 must exceed Kα1), a Kα2 state that is not one of
// the three, a doublet without a Kα2 wavelength, or a ratio outside [0, 1].
func (r Radiation) Validate() error {
	if !(r.Kalpha1Angstrom > 0) || math.IsInf(r.Kalpha1Angstrom, 0) {
		return fmt.Errorf("radiation: Kα1 wavelength %v Å is not a positive number", r.Kalpha1Angstrom)
	}
	if _, ok := stateWords[r.Kalpha2]; !ok {
		return fmt.Errorf("radiation: Kα2 state %d is not doublet, stripped or mono", int(r.Kalpha2))
	}
	if r.Kalpha2Angstrom != 0 || r.Kalpha2 != Kalpha2Absent {
		if !(r.Kalpha2Angstrom > r.Kalpha1Angstrom) || math.IsInf(r.Kalpha2Angstrom, 0) {
			return fmt.Errorf("radiation: Kα2 wavelength %v Å must be a number above Kα1 (%v Å)", r.Kalpha2Angstrom, r.Kalpha1Angstrom)
		}
		if !(r.Kalpha2Ratio >= 0 && r.Kalpha2Ratio <= 1) {
			return fmt.Errorf("radiation: Kα2/Kα1 intensity ratio %v is outside [0, 1]", r.Kalpha2Ratio)
		}
	}
	return nil
}

// HasKalpha2 reports whether the scan still holds the Kα2 line.
func (r Radiation) HasKalpha2() bool { return r.Kalpha2 == Kalpha2Present }

// D returns the d-spacing in Å of a peak at twoThetaDeg, taken as Kα1.
func (r Radiation) D(twoThetaDeg float64) float64 {
	return TwoThetaToD(twoThetaDeg, r.Kalpha1Angstrom)
}

// TwoTheta returns the Kα1 angle in degrees of planes of spacing dA.
func (r Radiation) TwoTheta(dA float64) (twoThetaDeg float64, ok bool) {
	return DToTwoTheta(dA, r.Kalpha1Angstrom)
}

// String returns the canonical text ParseRadiation reads back: the anode
// symbol or the wavelength(s), then ":" and the Kα2 state where it differs
// from the default.
func (r Radiation) String() string {
	var b strings.Builder
	if r.Anode != "" {
		b.WriteString(r.Anode)
	} else {
		b.WriteString(strconv.FormatFloat(r.Kalpha1Angstrom, 'g', -1, 64))
		if r.Kalpha2Angstrom != 0 {
			b.WriteByte('/')
			b.WriteString(strconv.FormatFloat(r.Kalpha2Angstrom, 'g', -1, 64))
		}
	}
	if r.Kalpha2 != defaultState(r.Anode != "" || r.Kalpha2Angstrom != 0) {
		b.WriteByte(':')
		b.WriteString(r.Kalpha2.String())
	}
	return b.String()
}

func defaultState(doublet bool) Kalpha2State {
	if doublet {
		return Kalpha2Present
	}
	return Kalpha2Absent
}

// ParseError reports text that ParseRadiation cannot read.
type ParseError struct {
	Input  string
	Column int // 1-based byte position of the fault in Input
	Msg    string
	Err    error // wrapped cause, if any
}

func (e *ParseError) Error() string {
	return fmt.Sprintf("radiation %q: column %d: %s", e.Input, e.Column, e.Msg)
}

func (e *ParseError) Unwrap() error { return e.Err }

// ParseRadiation reads a radiation written as
//
//	source[:state]
//
// where source is an anode symbol (Cr, Fe, Co, Cu, Mo; any case) or one
// wavelength in Å ("0.7093") or two separated by a slash ("1.5406/1.5444"),
// and state is "doublet" (Kα2 in the scan), "stripped" (Kα2 removed from the
// data) or "mono" (monochromated: no Kα2). An anode or two wavelengths
// default to "doublet", one wavelength to "mono". The Kα2/Kα1 intensity
// ratio is DefaultKalpha2Ratio. Spaces around the parts are ignored.
func ParseRadiation(s string) (Radiation, error) {
	perr := func(col int, err error, format string, args ...any) (Radiation, error) {
		return Radiation{}, &ParseError{Input: s, Column: col, Msg: fmt.Sprintf(format, args...), Err: err}
	}
	source, stateText, hasState := strings.Cut(s, ":")
	stateCol := len(source) + 2
	srcCol := 1 + len(source) - len(strings.TrimLeft(source, " \t"))
	source = strings.TrimSpace(source)
	if source == "" {
		return perr(srcCol, nil, "missing anode or wavelength")
	}

	var r Radiation
	if c := source[0]; c >= '0' && c <= '9' || c == '.' {
		first, second, two := strings.Cut(source, "/")
		l1, err := parseWavelength(first)
		if err != nil {
			return perr(srcCol, err, "%v", err)
		}
		r = Radiation{Kalpha1Angstrom: l1, Kalpha2: Kalpha2Absent}
		if two {
			l2, err := parseWavelength(second)
			if err != nil {
				return perr(srcCol+len(first)+1, err, "%v", err)
			}
			r.Kalpha2Angstrom, r.Kalpha2Ratio, r.Kalpha2 = l2, DefaultKalpha2Ratio, Kalpha2Present
		}
	} else {
		var err error
		if r, err = FromAnode(source, Kalpha2Present); err != nil {
			return perr(srcCol, err, "%v", err)
		}
	}

	if hasState {
		word := strings.ToLower(strings.TrimSpace(stateText))
		col := stateCol + len(stateText) - len(strings.TrimLeft(stateText, " \t"))
		var state Kalpha2State
		for st, w := range stateWords {
			if w == word {
				state = st
			}
		}
		switch {
		case state == 0:
			return perr(col, nil, "unknown Kα2 state %q (want doublet, stripped or mono)", strings.TrimSpace(stateText))
		case state != Kalpha2Absent && r.Kalpha2Angstrom == 0:
			return perr(col, nil, "state %q needs a Kα2 wavelength: give two wavelengths, λ1/λ2", word)
		}
		r.Kalpha2 = state
	}
	if err := r.Validate(); err != nil {
		return perr(srcCol, err, "%v", err)
	}
	return r, nil
}

func parseWavelength(text string) (float64, error) {
	t := strings.TrimSpace(text)
	for _, c := range t {
		if !(c >= '0' && c <= '9' || c == '.' || c == 'e' || c == 'E' || c == '-' || c == '+') {
			return 0, fmt.Errorf("wavelength %q is not a number in Å", t)
		}
	}
	v, err := strconv.ParseFloat(t, 64)
	if err != nil || !(v > 0) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("wavelength %q is not a positive number in Å", t)
	}
	return v, nil
}

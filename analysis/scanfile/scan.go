package scanfile

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
)

// MinPoints is the fewest points a scan may have. Background estimation,
// smoothing and a profile fit each need a few points per feature; twenty is
// the least that makes any of them meaningful.
const MinPoints = 20

// MaxBytes is the largest file Read accepts (64 MiB): far above any
// laboratory scan, low enough to keep a mistaken upload from filling memory.
const MaxBytes = 64 << 20

// Format is the kind of file a scan was read from.
type Format int

// The formats Read knows.
const (
	FormatXY Format = iota + 1
	FormatXYE
	FormatPowderCIF
)

func (f Format) String() string {
	switch f {
	case FormatXY:
		return "xy"
	case FormatXYE:
		return "xye"
	case FormatPowderCIF:
		return "pdcif"
	}
	return fmt.Sprintf("Format(%d)", int(f))
}

// Wavelength is one wavelength a file states for its radiation.
type Wavelength struct {
	Angstrom float64
	// Weight is the relative weight (_diffrn_radiation_wavelength_wt), zero
	// when not given.
	Weight float64
}

// Scan is a powder diffraction scan as read from a file.
type Scan struct {
	// TwoThetaDeg holds the diffraction angles in degrees, strictly
	// increasing, within [0, 180).
	TwoThetaDeg []float64
	// Counts holds the intensity at each angle, non-negative, in the file's
	// units (counts, or counts per second where the file says so).
	Counts []float64
	// Errors holds the standard uncertainty of each intensity, or is nil
	// when the file gives none.
	Errors []float64
	// Format is the format the file was read as.
	Format Format
	// Wavelengths are the wavelengths the file states, in file order; empty
	// when it states none (XY files never do).
	Wavelengths []Wavelength
	// Anode is the anode element the file states (_diffrn_source_target),
	// or empty.
	Anode string
	// Header holds the comment and header lines of an XY file, trimmed.
	Header []string
	// Items holds the single-valued data items of the CIF pattern block,
	// keyed by lower-case tag.
	Items map[string]string
	// Raw is the file exactly as read.
	Raw []byte
}

// Len returns the number of points.
func (s Scan) Len() int { return len(s.TwoThetaDeg) }

// SHA256 returns the hexadecimal SHA-256 digest of the raw file bytes.
func (s Scan) SHA256() string {
	sum := sha256.Sum256(s.Raw)
	return hex.EncodeToString(sum[:])
}

// Sum returns the hexadecimal SHA-256 digest of everything r yields.
func Sum(r io.Reader) (string, error) {
	h := sha256.New()
	if _, err := io.Copy(h, r); err != nil {
		return "", err
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}

// The kinds of fault an *Error reports; test with errors.Is.
var (
	ErrTooLarge      = errors.New("file too large")
	ErrBinary        = errors.New("not a text file")
	ErrSyntax        = errors.New("syntax error")
	ErrNoData        = errors.New("no data")
	ErrNotNumber     = errors.New("not a number")
	ErrNotFinite     = errors.New("not a finite number")
	ErrMissing       = errors.New("missing value")
	ErrNegative      = errors.New("negative value")
	ErrOutOfRange    = errors.New("value out of range")
	ErrNotIncreasing = errors.New("2θ not strictly increasing")
	ErrColumns       = errors.New("wrong number of fields")
	ErrTooFewPoints  = errors.New("too few points")
)

// Error is a fault in a scan file.
type Error struct {
	File   string
	Line   int // 1-based line, 0 when the fault concerns the whole file
	Column int // 1-based byte column on the line, 0 when none applies
	Msg    string
	Err    error // one of the Err* kinds
}

func (e *Error) Error() string {
	switch {
	case e.Line == 0:
		return fmt.Sprintf("%s: %s", e.File, e.Msg)
	case e.Column == 0:
		return fmt.Sprintf("%s:%d: %s", e.File, e.Line, e.Msg)
	}
	return fmt.Sprintf("%s:%d:%d: %s", e.File, e.Line, e.Column, e.Msg)
}

func (e *Error) Unwrap() error { return e.Err }

// pos locates a value in the file.
type pos struct{ line, col int }

// point is one data row with the positions of its values, kept for error
// messages.
type point struct {
	twoTheta, counts, esd             float64
	twoThetaAt, countsAt, esdAt       pos
	twoThetaName, countsName, esdName string
}

// finish checks the points and builds the scan's columns.
func finish(file string, pts []point, hasESD bool, s *Scan) error {
	s.TwoThetaDeg = make([]float64, len(pts))
	s.Counts = make([]float64, len(pts))
	if hasESD {
		s.Errors = make([]float64, len(pts))
	}
	for i, p := range pts {
		at := func(q pos, kind error, format string, args ...any) error {
			return &Error{File: file, Line: q.line, Column: q.col, Err: kind, Msg: fmt.Sprintf(format, args...)}
		}
		if !(p.twoTheta >= 0 && p.twoTheta < 180) {
			return at(p.twoThetaAt, ErrOutOfRange, "%s: 2θ = %v° is outside [0°, 180°)", p.twoThetaName, p.twoTheta)
		}
		if i > 0 && !(p.twoTheta > pts[i-1].twoTheta) {
			return at(p.twoThetaAt, ErrNotIncreasing, "%s: 2θ = %v° does not increase from %v° (line %d); 2θ must strictly increase",
				p.twoThetaName, p.twoTheta, pts[i-1].twoTheta, pts[i-1].twoThetaAt.line)
		}
		if p.counts < 0 {
			return at(p.countsAt, ErrNegative, "%s: intensity %v is negative", p.countsName, p.counts)
		}
		if hasESD && p.esd < 0 {
			return at(p.esdAt, ErrNegative, "%s: standard uncertainty %v is negative", p.esdName, p.esd)
		}
		s.TwoThetaDeg[i] = p.twoTheta
		s.Counts[i] = p.counts
		if hasESD {
			s.Errors[i] = p.esd
		}
	}
	if len(pts) < MinPoints {
		return &Error{File: file, Err: ErrTooFewPoints,
			Msg: fmt.Sprintf("%d points; a scan needs at least %d", len(pts), MinPoints)}
	}
	return nil
}

// parseDecimal reads a plain decimal number: optional sign, digits with an
// optional fraction, optional exponent. It refuses NaN, Inf, hexadecimal
// and underscores, which strconv.ParseFloat would take.
func parseDecimal(s string) (float64, error) {
	i, n := 0, len(s)
	if i < n && (s[i] == '+' || s[i] == '-') {
		i++
	}
	digits := 0
	for i < n && s[i] >= '0' && s[i] <= '9' {
		i++
		digits++
	}
	if i < n && s[i] == '.' {
		i++
		for i < n && s[i] >= '0' && s[i] <= '9' {
			i++
			digits++
		}
	}
	if digits == 0 {
		return 0, notNumber(s)
	}
	if i < n && (s[i] == 'e' || s[i] == 'E') {
		i++
		if i < n && (s[i] == '+' || s[i] == '-') {
			i++
		}
		exp := 0
		for i < n && s[i] >= '0' && s[i] <= '9' {
			i++
			exp++
		}
		if exp == 0 {
			return 0, notNumber(s)
		}
	}
	if i != n {
		return 0, notNumber(s)
	}
	v, err := parseFloat(s)
	if err != nil || math.IsInf(v, 0) {
		return 0, &valueError{s, ErrNotFinite}
	}
	return v, nil
}

func notNumber(s string) error {
	switch lower := toLower(s); lower {
	case "nan", "+nan", "-nan", "inf", "+inf", "-inf", "infinity", "+infinity", "-infinity":
		return &valueError{s, ErrNotFinite}
	}
	return &valueError{s, ErrNotNumber}
}

// valueError says that a text is not an acceptable number.
type valueError struct {
	text string
	kind error
}

func (e *valueError) Error() string {
	if e.kind == ErrMissing {
		return fmt.Sprintf("missing value %q", e.text)
	}
	return fmt.Sprintf("%q is %v", e.text, e.kind)
}
func (e *valueError) Unwrap() error { return e.kind }

func toLower(s string) string {
	b := []byte(s)
	for i, c := range b {
		if c >= 'A' && c <= 'Z' {
			b[i] = c + 'a' - 'A'
		}
	}
	return string(b)
}

func parseFloat(s string) (float64, error) {
	v, err := strconv.ParseFloat(s, 64)
	if err != nil && v == 0 {
		return 0, nil // underflow to zero
	}
	return v, err
}

// kindOf returns the Err* kind err wraps, or ErrSyntax.
func kindOf(err error) error {
	for _, k := range []error{ErrNotFinite, ErrNotNumber, ErrMissing} {
		if errors.Is(err, k) {
			return k
		}
	}
	return ErrSyntax
}

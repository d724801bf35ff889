package scanfile

import (
	"bytes"
	"fmt"
	"io"
	"sort"
	"strings"
)

// PeakLine is one line of a peak list: a position and a relative intensity.
type PeakLine struct {
	TwoThetaDeg float64
	// Intensity is the relative intensity, any positive scale; 100 when the
	// list gives positions only.
	Intensity float64
	// Line is the 1-based line of the file it came from.
	Line int
}

// MinPeakLines is the fewest peaks a peak list may hold.
const MinPeakLines = 3

// ReadPeakList reads a peak list: one peak a row, 2θ in degrees and
// optionally a relative intensity, separated like an XY file (spaces,
// commas, or semicolons with decimal commas allowed); comment lines start
// with #, ! or ; and lines before the first numeric row are headers. Rows
// may come in any order; they are returned sorted by 2θ. A position given
// twice, 2θ outside (0, 180), an intensity that is not positive, mixed row
// lengths and fewer than MinPeakLines peaks are refused with the file, line
// and column.
func ReadPeakList(file string, r io.Reader) ([]PeakLine, error) {
	data, err := io.ReadAll(io.LimitReader(r, MaxBytes+1))
	if err != nil {
		return nil, &Error{File: file, Err: err, Msg: err.Error()}
	}
	if len(data) > MaxBytes {
		return nil, &Error{File: file, Err: ErrTooLarge, Msg: fmt.Sprintf("larger than %d MiB", MaxBytes>>20)}
	}
	if bytes.IndexByte(data, 0) >= 0 {
		return nil, &Error{File: file, Err: ErrBinary, Msg: "holds NUL bytes: not a text peak list"}
	}
	data = bytes.TrimPrefix(data, []byte("\ufeff"))
	var (
		out     []PeakLine
		sep     byte
		nFields int
	)
	for n, raw := range lines(data) {
		lineNo := n + 1
		line := raw
		if i := strings.IndexByte(line, '#'); i >= 0 {
			line = line[:i]
		}
		trimmed := strings.TrimSpace(line)
		if trimmed == "" || trimmed[0] == '!' || trimmed[0] == ';' {
			continue
		}
		if nFields == 0 {
			sep = separatorOf(line)
		}
		fields := splitFields(line, sep)
		if nFields == 0 {
			if _, err := numberField(fields[0].text, sep); err != nil {
				continue // header line
			}
			nFields = len(fields)
			if nFields > 2 {
				return nil, &Error{File: file, Line: lineNo, Err: ErrColumns,
					Msg: fmt.Sprintf("first peak row has %d fields; want 2θ and optionally a relative intensity", nFields)}
			}
		} else if len(fields) != nFields {
			return nil, &Error{File: file, Line: lineNo, Err: ErrColumns,
				Msg: fmt.Sprintf("row has %d fields; earlier rows have %d", len(fields), nFields)}
		}
		p := PeakLine{Intensity: 100, Line: lineNo}
		for k, f := range fields {
			v, err := numberField(f.text, sep)
			if err != nil {
				name := [2]string{"2θ", "intensity"}[k]
				return nil, &Error{File: file, Line: lineNo, Column: f.col, Err: kindOf(err),
					Msg: fmt.Sprintf("field %d (%s): %v", k+1, name, err)}
			}
			if k == 0 {
				if !(v > 0 && v < 180) {
					return nil, &Error{File: file, Line: lineNo, Column: f.col, Err: ErrOutOfRange,
						Msg: fmt.Sprintf("2θ %g° is outside (0, 180)", v)}
				}
				p.TwoThetaDeg = v
			} else {
				if !(v > 0) {
					return nil, &Error{File: file, Line: lineNo, Column: f.col, Err: ErrOutOfRange,
						Msg: fmt.Sprintf("intensity %g is not positive", v)}
				}
				p.Intensity = v
			}
		}
		out = append(out, p)
	}
	if len(out) < MinPeakLines {
		return nil, &Error{File: file, Err: ErrTooFewPoints,
			Msg: fmt.Sprintf("%d peaks; a peak list needs at least %d", len(out), MinPeakLines)}
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].TwoThetaDeg < out[j].TwoThetaDeg })
	for i := 1; i < len(out); i++ {
		if out[i].TwoThetaDeg == out[i-1].TwoThetaDeg {
			return nil, &Error{File: file, Line: out[i].Line, Err: ErrNotIncreasing,
				Msg: fmt.Sprintf("2θ %g° is given twice (also on line %d)", out[i].TwoThetaDeg, out[i-1].Line)}
		}
	}
	return out, nil
}

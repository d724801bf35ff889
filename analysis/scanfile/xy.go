package scanfile

import (
	"bytes"
	"fmt"
	"strings"
)

// lines splits data into lines at LF, CRLF or CR, returning each line
// without its terminator.
func lines(data []byte) []string {
	var out []string
	start := 0
	for i := 0; i < len(data); i++ {
		switch data[i] {
		case '\n':
			out = append(out, string(data[start:i]))
			start = i + 1
		case '\r':
			out = append(out, string(data[start:i]))
			if i+1 < len(data) && data[i+1] == '\n' {
				i++
			}
			start = i + 1
		}
	}
	if start < len(data) {
		out = append(out, string(data[start:]))
	}
	return out
}

// field is one field of a data row and its 1-based byte column.
type field struct {
	text string
	col  int
}

// splitFields splits line by sep (0 meaning runs of spaces and tabs),
// trimming spaces around each field.
func splitFields(line string, sep byte) []field {
	var out []field
	if sep == 0 {
		i := 0
		for i < len(line) {
			for i < len(line) && (line[i] == ' ' || line[i] == '\t') {
				i++
			}
			if i == len(line) {
				break
			}
			j := i
			for j < len(line) && line[j] != ' ' && line[j] != '\t' {
				j++
			}
			out = append(out, field{line[i:j], i + 1})
			i = j
		}
		return out
	}
	start := 0
	for i := 0; i <= len(line); i++ {
		if i == len(line) || line[i] == sep {
			part := line[start:i]
			lead := len(part) - len(strings.TrimLeft(part, " \t"))
			out = append(out, field{strings.TrimSpace(part), start + lead + 1})
			start = i + 1
		}
	}
	return out
}

func separatorOf(line string) byte {
	switch {
	case strings.IndexByte(line, ';') >= 0:
		return ';'
	case strings.IndexByte(line, ',') >= 0:
		return ','
	}
	return 0
}

func separatorName(sep byte) string {
	switch sep {
	case ';':
		return "semicolons"
	case ',':
		return "commas"
	}
	return "spaces"
}

var xyFieldNames = [3]string{"2θ", "intensity", "standard uncertainty"}

// readXY reads two- or three-column text; see the package documentation
// for the rules.
func readXY(file string, data []byte) (Scan, error) {
	data = bytes.TrimPrefix(data, []byte("\ufeff"))
	var (
		s       Scan
		pts     []point
		sep     byte
		nFields int
	)
	for n, raw := range lines(data) {
		lineNo := n + 1
		trimmed := strings.TrimSpace(raw)
		if trimmed == "" {
			continue
		}
		if c := trimmed[0]; c == '#' || c == '!' || c == ';' {
			s.Header = append(s.Header, trimmed)
			continue
		}
		line := raw
		if i := strings.IndexByte(line, '#'); i >= 0 {
			line = line[:i]
		}
		if strings.TrimSpace(line) == "" {
			continue
		}
		if nFields == 0 {
			sep = separatorOf(line)
		}
		fields := splitFields(line, sep)
		if nFields == 0 {
			if _, err := numberField(fields[0].text, sep); err != nil {
				s.Header = append(s.Header, trimmed)
				continue
			}
			nFields = len(fields)
			if nFields != 2 && nFields != 3 {
				return Scan{}, &Error{File: file, Line: lineNo, Err: ErrColumns,
					Msg: fmt.Sprintf("first data row has %d fields separated by %s; want 2 (2θ, intensity) or 3 (2θ, intensity, standard uncertainty)",
						nFields, separatorName(sep))}
			}
		} else if len(fields) != nFields {
			return Scan{}, &Error{File: file, Line: lineNo, Err: ErrColumns,
				Msg: fmt.Sprintf("row has %d fields separated by %s; earlier rows have %d", len(fields), separatorName(sep), nFields)}
		}
		var vals [3]float64
		for k, f := range fields {
			v, err := numberField(f.text, sep)
			if err != nil {
				return Scan{}, &Error{File: file, Line: lineNo, Column: f.col, Err: kindOf(err),
					Msg: fmt.Sprintf("field %d (%s): %v", k+1, xyFieldNames[k], err)}
			}
			vals[k] = v
		}
		p := point{twoTheta: vals[0], counts: vals[1], esd: vals[2],
			twoThetaAt: pos{lineNo, fields[0].col}, countsAt: pos{lineNo, fields[1].col},
			twoThetaName: "field 1 (2θ)", countsName: "field 2 (intensity)", esdName: "field 3 (standard uncertainty)"}
		if nFields == 3 {
			p.esdAt = pos{lineNo, fields[2].col}
		}
		pts = append(pts, p)
	}
	if nFields == 0 {
		return Scan{}, &Error{File: file, Err: ErrNoData, Msg: "no data rows (lines of 2θ and intensity numbers)"}
	}
	s.Format = FormatXY
	if nFields == 3 {
		s.Format = FormatXYE
	}
	if err := finish(file, pts, nFields == 3, &s); err != nil {
		return Scan{}, err
	}
	return s, nil
}

// numberField reads one field; with the semicolon separator a single
// decimal comma is allowed.
func numberField(text string, sep byte) (float64, error) {
	if text == "" {
		return 0, &valueError{text, ErrNotNumber}
	}
	if sep == ';' && strings.Count(text, ",") == 1 && strings.IndexByte(text, '.') < 0 {
		text = strings.Replace(text, ",", ".", 1)
	}
	return parseDecimal(text)
}

package intake

import (
	"bufio"
	"bytes"
	"fmt"
	"io"
	"path/filepath"
	"strings"
	"unicode/utf8"

	"meltbook"
)

// Mapping says which sample each scan file belongs to: file name (as
// written in the mapping, usually a base name) to sample code.
type Mapping struct {
	samples map[string]string
	lines   map[string]int
}

// Sample returns the sample of a file, looked up by its path as given, then
// by its base name.
func (m *Mapping) Sample(path string) (string, bool) {
	if m == nil {
		return "", false
	}
	if s, ok := m.samples[filepath.ToSlash(path)]; ok {
		return s, true
	}
	s, ok := m.samples[filepath.Base(path)]
	return s, ok
}

// Len returns the number of files mapped.
func (m *Mapping) Len() int { return len(m.samples) }

// maxMappingBytes bounds a mapping file (16 MiB: far above any library of
// scans).
const maxMappingBytes = 16 << 20

// ReadMapping reads a file-to-sample mapping: a CSV-like text whose first
// row that is not blank or a comment (#) is a heading naming a "file"
// column and a "sample" column (any case, any order, other columns
// ignored), and whose later rows give a file name and its sample code.
// Fields are separated by commas, semicolons or tabs (the heading's
// separator holds for the whole file) and may be quoted with double quotes
// ("" for a quote inside). A UTF-8 byte-order mark is skipped; lines end in
// LF or CRLF.
//
// A row without a file name or sample code, a file named twice, text that
// is not UTF-8, or a heading without both columns is refused with an
// Invalid *meltbook.Error naming the file, line and column.
func ReadMapping(name string, r io.Reader) (*Mapping, error) {
	data, err := io.ReadAll(io.LimitReader(r, maxMappingBytes+1))
	if err != nil {
		return nil, meltbook.Errorf(meltbook.Invalid, name, "cannot read: %v", err)
	}
	if len(data) > maxMappingBytes {
		return nil, meltbook.Errorf(meltbook.Invalid, name, "larger than %d MiB; is this the mapping file?", maxMappingBytes>>20)
	}
	data = bytes.TrimPrefix(data, []byte("\xef\xbb\xbf"))
	m := &Mapping{samples: map[string]string{}, lines: map[string]int{}}
	sc := bufio.NewScanner(bytes.NewReader(data))
	sc.Buffer(make([]byte, 0, 64*1024), maxMappingBytes)
	var sep byte
	fileCol, sampleCol := -1, -1
	for line := 1; sc.Scan(); line++ {
		text := strings.TrimSuffix(sc.Text(), "\r")
		at := func(col int) string { return fmt.Sprintf("%s line %d, column %d", name, line, col) }
		if !utf8.ValidString(text) {
			return nil, meltbook.Errorf(meltbook.Invalid, fmt.Sprintf("%s line %d", name, line), "not UTF-8 text")
		}
		trimmed := strings.TrimSpace(text)
		if trimmed == "" || strings.HasPrefix(trimmed, "#") {
			continue
		}
		if sep == 0 {
			sep = separator(text)
		}
		fields, cols, err := splitFields(text, sep)
		if err != nil {
			return nil, meltbook.Errorf(meltbook.Invalid, at(err.col), "%s", err.msg)
		}
		if fileCol < 0 {
			for i, f := range fields {
				switch strings.ToLower(strings.TrimSpace(f)) {
				case "file", "file name", "filename":
					fileCol = i
				case "sample", "sample code":
					sampleCol = i
				}
			}
			if fileCol < 0 || sampleCol < 0 {
				return nil, meltbook.Errorf(meltbook.Invalid, fmt.Sprintf("%s line %d", name, line),
					"the heading must name a file column and a sample column, e.g. \"file,sample\"; found %q", trimmed)
			}
			continue
		}
		get := func(i int) (string, int) {
			if i < len(fields) {
				return strings.TrimSpace(fields[i]), cols[i]
			}
			return "", len(text) + 1
		}
		file, fc := get(fileCol)
		sample, scol := get(sampleCol)
		switch {
		case file == "":
			return nil, meltbook.Errorf(meltbook.Invalid, at(fc), "no file name")
		case sample == "":
			return nil, meltbook.Errorf(meltbook.Invalid, at(scol), "no sample code for %s", file)
		}
		key := filepath.ToSlash(file)
		if first, ok := m.lines[key]; ok {
			return nil, meltbook.Errorf(meltbook.Invalid, at(fc), "%s is mapped twice (first on line %d)", file, first)
		}
		m.samples[key], m.lines[key] = sample, line
	}
	if err := sc.Err(); err != nil {
		return nil, meltbook.Errorf(meltbook.Invalid, name, "cannot read: %v", err)
	}
	if fileCol < 0 {
		return nil, meltbook.Errorf(meltbook.Invalid, name, "empty: a mapping needs a heading \"file,sample\" and one row per file")
	}
	return m, nil
}

// separator picks the heading's field separator: a tab, else a semicolon,
// else a comma.
func separator(heading string) byte {
	switch {
	case strings.Contains(heading, "\t"):
		return '\t'
	case strings.Contains(heading, ";"):
		return ';'
	}
	return ','
}

type fieldError struct {
	col int
	msg string
}

// splitFields splits one line at sep, honouring double quotes, and returns
// each field with its 1-based starting byte column.
func splitFields(line string, sep byte) ([]string, []int, *fieldError) {
	var fields []string
	var cols []int
	i := 0
	for {
		start := i
		var b strings.Builder
		// Skip blanks before an opening quote.
		j := i
		for j < len(line) && (line[j] == ' ' || (line[j] == '\t' && sep != '\t')) {
			j++
		}
		if j < len(line) && line[j] == '"' {
			j++
			closed := false
			for j < len(line) {
				if line[j] == '"' {
					if j+1 < len(line) && line[j+1] == '"' {
						b.WriteByte('"')
						j += 2
						continue
					}
					closed = true
					j++
					break
				}
				b.WriteByte(line[j])
				j++
			}
			if !closed {
				return nil, nil, &fieldError{start + 1, "a quoted field is not closed"}
			}
			for j < len(line) && line[j] != sep {
				if line[j] != ' ' && line[j] != '\t' {
					return nil, nil, &fieldError{j + 1, "text after a closing quote"}
				}
				j++
			}
			i = j
		} else {
			for i < len(line) && line[i] != sep {
				b.WriteByte(line[i])
				i++
			}
		}
		fields = append(fields, b.String())
		cols = append(cols, start+1)
		if i >= len(line) {
			return fields, cols, nil
		}
		i++ // the separator
	}
}

// SampleFromFileName returns the sample code a file name carries by the
// naming rule: the base name without its last extension, up to the first
// underscore or space. "QR-0042.a1_xrd.xy" and "QR-0042.a1 second.xye" give
// "QR-0042.a1"; "QR-0042.xy" gives "QR-0042". ok is false when nothing is
// left or the name starts with a dot.
func SampleFromFileName(path string) (code string, ok bool) {
	base := filepath.Base(filepath.ToSlash(path))
	if ext := filepath.Ext(base); ext != "" && ext != base {
		base = strings.TrimSuffix(base, ext)
	}
	if i := strings.IndexAny(base, "_ "); i >= 0 {
		base = base[:i]
	}
	base = strings.TrimSpace(base)
	if base == "" || strings.HasPrefix(base, ".") {
		return "", false
	}
	return base, true
}

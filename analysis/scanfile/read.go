package scanfile

import (
	"bytes"
	"fmt"
	"io"
	"path/filepath"
	"strings"
)

// Read reads a scan from r; name is the file name, used to choose the
// format and in error messages. A name ending in ".cif" (any case), or
// content whose first line that is neither blank nor a '#' comment starts
// with "data_", is read as powder CIF; anything else as XY or XYE text.
// The raw bytes are kept in Scan.Raw.
func Read(name string, r io.Reader) (Scan, error) {
	data, err := io.ReadAll(io.LimitReader(r, MaxBytes+1))
	if err != nil {
		return Scan{}, fmt.Errorf("read %s: %w", name, err)
	}
	if len(data) > MaxBytes {
		return Scan{}, &Error{File: name, Err: ErrTooLarge, Msg: fmt.Sprintf("larger than %d MiB", MaxBytes>>20)}
	}
	if i := bytes.IndexByte(data, 0); i >= 0 {
		line := 1 + bytes.Count(data[:i], []byte{'\n'})
		return Scan{}, &Error{File: name, Line: line, Err: ErrBinary, Msg: "NUL byte: a binary file, not a text scan"}
	}
	var s Scan
	if IsPowderCIF(name, data) {
		s, err = readPowderCIF(name, data)
	} else {
		s, err = readXY(name, data)
	}
	if err != nil {
		return Scan{}, err
	}
	s.Raw = data
	return s, nil
}

// IsPowderCIF reports whether Read would take the file for CIF.
func IsPowderCIF(name string, data []byte) bool {
	if strings.EqualFold(filepath.Ext(name), ".cif") {
		return true
	}
	data = bytes.TrimPrefix(data, []byte("\ufeff"))
	for len(data) > 0 {
		line := data
		if i := bytes.IndexAny(data, "\r\n"); i >= 0 {
			line, data = data[:i], data[i+1:]
		} else {
			data = nil
		}
		t := bytes.TrimSpace(line)
		if len(t) == 0 || t[0] == '#' {
			continue
		}
		return len(t) >= 5 && strings.EqualFold(string(t[:5]), "data_")
	}
	return false
}

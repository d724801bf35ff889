package main

import (
	"bytes"
	"fmt"
	"io"
	"strings"
	"unicode/utf8"

	"meltbook"
	"meltbook/store/runform"
)

// Run files hold one or more runs for `meltbook log --file`:
//
//	# Al-Cu-Fe series, week 18
//	code:         QX-0042
//	composition:  Al63Cu25Fe12
//	mass:         10 g
//	weighed:      Al=4.2940g, Cu=4.0131g, Fe=1.6929g
//	arc-remelts:  4
//	wheel-speed:  30 m/s
//	thickness:    32 um
//	notes:        first of the series;
//	    button cracked on the third flip
//
//	composition:  Al62Cu26Fe12
//	mass:         10 g
//
// Each line is FIELD: VALUE with the field names of the log command's
// flags (without the dashes); the value runs to the end of the line and may
// hold colons. A blank line ends a run. A line that begins with a space or
// a tab continues the value above it, joined with one space. A line whose
// first non-blank character is # is a comment. The file is UTF-8.

// maxRunFileBytes caps the size of a run file read into memory.
const maxRunFileBytes = 16 << 20

// readRunFile splits a run file into runs. It checks the layout only;
// buildRun checks the fields. Errors name the file and line.
func readRunFile(name string, r io.Reader) ([]runform.Input, error) {
	data, err := io.ReadAll(io.LimitReader(r, maxRunFileBytes+1))
	if err != nil {
		return nil, meltbook.Errorf(meltbook.Invalid, name, "cannot read: %v", err)
	}
	if len(data) > maxRunFileBytes {
		return nil, meltbook.Errorf(meltbook.Invalid, name, "larger than %d MiB; split it", maxRunFileBytes>>20)
	}
	data = bytes.TrimPrefix(data, []byte("\uFEFF"))
	var runs []runform.Input
	var cur *runform.Input
	for i, raw := range strings.Split(string(data), "\n") {
		line := i + 1
		text := strings.TrimSuffix(raw, "\r")
		at := fmt.Sprintf("%s line %d", name, line)
		if !utf8.ValidString(text) {
			return nil, meltbook.Errorf(meltbook.Invalid, at, "not UTF-8 text")
		}
		trimmed := strings.TrimSpace(text)
		switch {
		case trimmed == "":
			cur = nil
			continue
		case strings.HasPrefix(trimmed, "#"):
			continue
		case text[0] == ' ' || text[0] == '\t':
			if cur == nil || len(cur.Values) == 0 {
				return nil, meltbook.Errorf(meltbook.Invalid, at, "an indented line continues the value above it, but there is none")
			}
			last := &cur.Values[len(cur.Values)-1]
			last.Value = strings.TrimSpace(last.Value + " " + trimmed)
			continue
		}
		key, value, ok := strings.Cut(text, ":")
		key = strings.TrimSpace(key)
		if !ok || !isFieldName(key) {
			return nil, meltbook.Errorf(meltbook.Invalid, at, "expected FIELD: VALUE (e.g. composition: Al63Cu25Fe12), got %q", clip(trimmed))
		}
		if cur == nil {
			start := line
			runs = append(runs, runform.Input{
				Where: fmt.Sprintf("%s run starting at line %d", name, start),
				Missing: func(key string) string {
					return fmt.Sprintf("%s run starting at line %d, field %s", name, start, key)
				},
			})
			cur = &runs[len(runs)-1]
		}
		cur.Add(key, strings.TrimSpace(value), fmt.Sprintf("%s, field %s", at, key))
	}
	if len(runs) == 0 {
		return nil, meltbook.Errorf(meltbook.Invalid, name, "no runs in the file; write FIELD: VALUE lines, one block per run")
	}
	return runs, nil
}

// isFieldName reports whether s looks like a field name: lower-case
// letters, digits and inner hyphens.
func isFieldName(s string) bool {
	if s == "" || s[0] == '-' || s[len(s)-1] == '-' {
		return false
	}
	for _, r := range s {
		if !(r >= 'a' && r <= 'z' || r >= '0' && r <= '9' || r == '-') {
			return false
		}
	}
	return true
}

// clip shortens text quoted in an error message.
func clip(s string) string {
	const n = 60
	if utf8.RuneCountInString(s) <= n {
		return s
	}
	return string([]rune(s)[:n]) + "…"
}

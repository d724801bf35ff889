package main

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"

	"meltbook"
	"meltbook/analysis/composition"
	"meltbook/analysis/element"
)

// parseComposition reads a composition argument, turning parse failures into
// user errors that keep the position.
func parseComposition(field, s string, weight bool) (composition.Parsed, error) {
	opt := composition.Options{}
	if weight {
		opt.Basis = composition.Weight
	}
	p, err := composition.ParseWith(s, opt)
	if err != nil {
		var pe *composition.ParseError
		if errors.As(err, &pe) {
			return p, &meltbook.Error{Kind: meltbook.Invalid, Message: pe.Error()}
		}
		return p, meltbook.Errorf(meltbook.Invalid, field, "%v", err)
	}
	return p, nil
}

// loadScheme resolves --scheme: a built-in name or a scheme file.
func loadScheme(nameOrPath string) (element.Scheme, error) {
	s, err := element.LoadScheme(nameOrPath)
	if err != nil {
		return s, meltbook.Errorf(meltbook.Invalid, "--scheme", "%v", err)
	}
	return s, nil
}

// writeJSON writes v as indented JSON followed by a newline.
func writeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(v)
}

// warn prints parse warnings to stderr, one per line.
func (a *app) warn(warnings []string) {
	for _, w := range warnings {
		fmt.Fprintln(a.stderr, "warning:", w)
	}
}

// invalid marks an analysis error, whose message already says what is wrong,
// as bad input.
func invalid(err error) error {
	return &meltbook.Error{Kind: meltbook.Invalid, Message: err.Error()}
}

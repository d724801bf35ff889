package meltbook

import (
	"errors"
	"fmt"
)

// ErrorKind classifies an Error so that the command line can choose an exit
// code and the web layer a status from one table.
type ErrorKind string

// The error kinds.
const (
	Invalid  ErrorKind = "invalid"   // bad input from the user
	NotFound ErrorKind = "not found" // a named thing does not exist
	Conflict ErrorKind = "conflict"  // the input clashes with what the notebook holds
	Internal ErrorKind = "internal"  // a fault of meltbook or its environment
)

// Error is an error meant for the user: it says what is wrong and where.
type Error struct {
	Kind ErrorKind
	// Field names the input at fault ("composition", "melt-spin.thickness",
	// "runs.csv line 14, column wheel_speed"); empty when none applies.
	Field   string
	Message string
}

func (e *Error) Error() string {
	if e.Field == "" {
		return e.Message
	}
	return e.Field + ": " + e.Message
}

// Errorf returns an *Error of the given kind about field.
func Errorf(kind ErrorKind, field, format string, args ...any) *Error {
	return &Error{Kind: kind, Field: field, Message: fmt.Sprintf(format, args...)}
}

// KindOf returns the kind of the first *Error in err's chain, Internal when
// there is none, and "" for a nil error.
func KindOf(err error) ErrorKind {
	if err == nil {
		return ""
	}
	var e *Error
	if errors.As(err, &e) {
		return e.Kind
	}
	return Internal
}

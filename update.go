package meltbook

import "time"

// The update types below describe amendments: a nil field is left as it is,
// a set field replaces the stored value. Every amendment needs a reason and
// is recorded in the history with the value before and after, field by
// field, under the field names given beside each.

// MeltUpdate amends a melt. Its code cannot change: codes are the keys
// other records and files use.
type MeltUpdate struct {
	Operator           *string           // "operator"
	CreatedAt          *time.Time        // "created"
	CompositionEntered *string           // "composition"
	Nominal            []ElementFraction // "nominal"; nil: unchanged
	TargetMassGrams    *float64          // "mass"
	MassAfterMeltGrams *float64          // "mass-after"
	// WeighOut, when not nil, replaces the whole weigh-out; each element
	// that changes is recorded as "weigh-out.<element>".
	WeighOut []WeighOutLine
	Notes    *string // "notes"
}

// SampleUpdate amends a sample.
type SampleUpdate struct {
	Label     *string    // "label"
	CreatedAt *time.Time // "created"
}

// StepUpdate amends a process step; its kind cannot change.
type StepUpdate struct {
	At       *time.Time // "at"
	Operator *string    // "operator"
	Notes    *string    // "notes"
	// Set adds or replaces parameters by name ("<kind>.<name>").
	Set []Param
	// Unset removes parameters by name.
	Unset []string
}

// OutcomeUpdate amends a person's outcome. Automatic proposals are not
// amended: they are confirmed or rejected, and a person records their own.
type OutcomeUpdate struct {
	Kind     *PhaseKind // "kind"
	Lattice  *string    // "lattice"
	Order    *string    // "order"
	Name     *string    // "name"
	Fraction *float64   // "fraction"
	Evidence *string    // "evidence"
}

// MeasurementUpdate amends a measured composition.
type MeasurementUpdate struct {
	Method      *string           // "method"
	Fractions   []ElementFraction // "fractions"; nil: unchanged
	Uncertainty []ElementFraction // "uncertainty"; nil: unchanged
	At          *time.Time        // "at"
	Operator    *string           // "operator"
	Notes       *string           // "notes"
}

// ObservationUpdate amends a symmetry observation.
type ObservationUpdate struct {
	Folds    []int      // "folds"; nil: unchanged
	At       *time.Time // "at"
	Operator *string    // "operator"
	Notes    *string    // "notes"
}

// NoteUpdate amends a note's text ("text").
type NoteUpdate struct {
	Text *string
}

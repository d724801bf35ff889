package meltbook

import (
	"strings"
	"time"
)

// MeasurementMethods are the accepted methods for a measured composition.
var MeasurementMethods = []string{"EDS", "WDS", "ICP-OES", "XRF"}

// MeasuredComposition is a composition measured on a sample.
type MeasuredComposition struct {
	ID        int64             `json:"-"`
	SampleID  int64             `json:"-"`
	Method    string            `json:"method"`
	Fractions []ElementFraction `json:"fractions"`
	// Uncertainty is the standard uncertainty per element, as an atomic
	// fraction (0.005 = 0.5 at.%); elements without one are omitted.
	Uncertainty []ElementFraction `json:"uncertainty,omitempty"`
	At          time.Time         `json:"at"`
	Operator    string            `json:"operator"`
	Notes       string            `json:"notes,omitempty"`
}

// Validate checks the method and fractions.
func (m *MeasuredComposition) Validate() error {
	ok := false
	for _, k := range MeasurementMethods {
		ok = ok || k == m.Method
	}
	if !ok {
		return Errorf(Invalid, "method", "%q is not one of %s", m.Method, strings.Join(MeasurementMethods, ", "))
	}
	for _, u := range m.Uncertainty {
		if !(u.Fraction >= 0 && u.Fraction <= 1) {
			return Errorf(Invalid, "uncertainty", "%s uncertainty %g is outside 0..1", u.Element, u.Fraction)
		}
	}
	return validateFractions("fractions", m.Fractions)
}

// SymmetryObservation records the rotational symmetries seen in electron
// diffraction patterns of a sample (2-, 3-, 5- or 10-fold axes).
type SymmetryObservation struct {
	ID       int64     `json:"-"`
	SampleID int64     `json:"-"`
	Folds    []int     `json:"folds"`
	At       time.Time `json:"at"`
	Operator string    `json:"operator"`
	Notes    string    `json:"notes,omitempty"`
}

// Validate checks the folds.
func (o *SymmetryObservation) Validate() error {
	if len(o.Folds) == 0 {
		return Errorf(Invalid, "folds", "name at least one symmetry seen (2, 3, 4, 5, 6, 8, 10 or 12)")
	}
	for _, f := range o.Folds {
		switch f {
		case 2, 3, 4, 5, 6, 8, 10, 12:
		default:
			return Errorf(Invalid, "folds", "%d-fold is not a rotational symmetry meltbook records", f)
		}
	}
	return nil
}

// PhaseKind is the trade's name for a kind of phase.
type PhaseKind string

// The phase kinds.
const (
	Icosahedral PhaseKind = "icosahedral"
	Decagonal   PhaseKind = "decagonal"
	Approximant PhaseKind = "approximant" // cubic approximant, with Order
	Crystalline PhaseKind = "crystalline" // a named ordinary crystalline phase
	Amorphous   PhaseKind = "amorphous"
)

// PhaseKinds lists the phase kinds in display order.
var PhaseKinds = []PhaseKind{Icosahedral, Decagonal, Approximant, Crystalline, Amorphous}

// OutcomeSource says who made an outcome.
type OutcomeSource string

// Outcome sources: a person's decision always ranks above an automatic one.
const (
	ByPerson    OutcomeSource = "person"
	ByAutomatic OutcomeSource = "automatic"
)

// ProposalStatus is the state of an automatic outcome.
type ProposalStatus string

// Proposal states.
const (
	Proposed  ProposalStatus = "proposed"
	Confirmed ProposalStatus = "confirmed"
	Rejected  ProposalStatus = "rejected"
)

// Outcome is one phase found in a sample, with a rough fraction.
type Outcome struct {
	ID       int64 `json:"-"`
	SampleID int64 `json:"-"`
	// SampleCode names the sample the outcome is about, filled in when
	// read from the notebook.
	SampleCode string    `json:"sample,omitempty"`
	Kind       PhaseKind `json:"kind"`
	// Lattice is P, F or I for icosahedral phases and P, I or F for cubic ones.
	Lattice string `json:"lattice,omitempty"`
	// Order is the approximant order p/q, e.g. "1/1".
	Order string `json:"order,omitempty"`
	// Name of a crystalline phase, e.g. "λ-Al13Fe4" or "β-AlCuFe (B2)".
	Name string `json:"name,omitempty"`
	// Fraction is the rough volume fraction 0..1; nil when not estimated.
	Fraction   *float64      `json:"fraction"`
	Source     OutcomeSource `json:"source"`
	RecordedBy string        `json:"recorded_by"`
	Evidence   string        `json:"evidence,omitempty"`
	// Status applies to automatic outcomes; a person's outcome is Confirmed.
	Status ProposalStatus `json:"status"`
	At     time.Time      `json:"at"`
}

// Validate checks an outcome.
func (o *Outcome) Validate() error {
	ok := false
	for _, k := range PhaseKinds {
		ok = ok || k == o.Kind
	}
	if !ok {
		return Errorf(Invalid, "kind", "%q is not a phase kind (icosahedral, decagonal, approximant, crystalline, amorphous)", o.Kind)
	}
	switch o.Lattice {
	case "", "P", "I", "F":
	default:
		return Errorf(Invalid, "lattice", "%q is not P, I or F", o.Lattice)
	}
	if o.Kind == Approximant && o.Order == "" {
		return Errorf(Invalid, "order", "an approximant needs its order, e.g. 1/1")
	}
	if o.Kind == Crystalline && strings.TrimSpace(o.Name) == "" {
		return Errorf(Invalid, "name", "a crystalline phase needs a name")
	}
	if o.Fraction != nil && !(*o.Fraction >= 0 && *o.Fraction <= 1) {
		return Errorf(Invalid, "fraction", "%g is outside 0..1", *o.Fraction)
	}
	if strings.TrimSpace(o.RecordedBy) == "" {
		return Errorf(Invalid, "by", "an outcome needs who recorded it")
	}
	switch o.Source {
	case ByPerson, ByAutomatic:
	default:
		return Errorf(Invalid, "source", "%q is not person or automatic", o.Source)
	}
	return nil
}

// Note is a dated remark on a melt or one of its samples.
type Note struct {
	ID         int64     `json:"-"`
	MeltID     int64     `json:"-"`
	SampleID   *int64    `json:"-"`
	SampleCode string    `json:"sample,omitempty"`
	Author     string    `json:"author"`
	At         time.Time `json:"at"`
	Text       string    `json:"text"`
}

// HistoryEntry is one append-only record of a change to the notebook.
type HistoryEntry struct {
	ID       int64     `json:"-"`
	At       time.Time `json:"at"`
	Who      string    `json:"who"`
	MeltCode string    `json:"melt,omitempty"`
	// Entity is what changed ("melt", "sample", "step", "outcome", ...),
	// EntityID its row.
	Entity   string `json:"entity"`
	EntityID int64  `json:"entity_id"`
	// Action is "create", "amend", "confirm", "reject" or "import".
	Action string `json:"action"`
	Field  string `json:"field,omitempty"`
	Before string `json:"before,omitempty"`
	After  string `json:"after,omitempty"`
	Why    string `json:"why,omitempty"`
}

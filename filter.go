package meltbook

import (
	"math"
	"time"
)

// Range is a closed interval [Min, Max]; a nil end leaves that side open.
type Range struct {
	Min *float64 `json:"min,omitempty"`
	Max *float64 `json:"max,omitempty"`
}

// Between returns the closed range [min, max].
func Between(min, max float64) *Range { return &Range{Min: &min, Max: &max} }

// AtLeast returns the range [min, ∞).
func AtLeast(min float64) *Range { return &Range{Min: &min} }

// AtMost returns the range (−∞, max].
func AtMost(max float64) *Range { return &Range{Max: &max} }

// Contains reports whether v lies in the range, ends included.
func (r Range) Contains(v float64) bool {
	return (r.Min == nil || v >= *r.Min) && (r.Max == nil || v <= *r.Max)
}

func (r Range) validate(field string) error {
	for _, end := range []*float64{r.Min, r.Max} {
		if end != nil && (math.IsNaN(*end) || math.IsInf(*end, 0)) {
			return Errorf(Invalid, field, "range ends must be finite numbers")
		}
	}
	if r.Min != nil && r.Max != nil && *r.Min > *r.Max {
		return Errorf(Invalid, field, "range %g..%g is empty: the lower end exceeds the upper", *r.Min, *r.Max)
	}
	return nil
}

// FractionRange limits one element's nominal atomic fraction. A range that
// includes 0 also admits melts without the element.
type FractionRange struct {
	Element string `json:"element"`
	Range
}

// MeltSort names the order of FindMelts results.
type MeltSort string

// The sort orders. Every order breaks ties by melt code; melts without a
// value (no e/a under the scheme, no cooling rate) come last either way.
const (
	SortCreated     MeltSort = "created" // the default
	SortCode        MeltSort = "code"
	SortEOverA      MeltSort = "e/a"
	SortCoolingRate MeltSort = "cooling-rate"
)

// MeltFilter selects melts. Every field that is set narrows the result (the
// conditions combine with AND); a zero field does not filter. Compositions
// are the melts' nominal (as weighed-out) compositions.
type MeltFilter struct {
	// Outcomes keeps melts with at least one sample whose standing outcome
	// is one of these phase kinds. A standing outcome is a person's outcome
	// or an automatic proposal a person confirmed.
	Outcomes []PhaseKind `json:"outcomes,omitempty"`
	// IncludeProposals also counts automatic proposals still awaiting a
	// decision, but only on samples for which no person has recorded an
	// outcome: a person's word on a sample ranks above any proposal.
	// Rejected proposals never count. It also adds pending proposals to the
	// outcomes listed in each result row.
	IncludeProposals bool `json:"include_proposals,omitempty"`

	// Elements keeps melts containing all of these elements (fraction > 0).
	Elements []string `json:"elements,omitempty"`
	// OnlyElements further drops melts with any element not in Elements.
	OnlyElements bool `json:"only_elements,omitempty"`
	// Fractions limits element fractions, e.g. Cu in 0.20..0.30.
	Fractions []FractionRange `json:"fractions,omitempty"`

	// Scheme names the valence scheme for e/a: a scheme the notebook keeps
	// ("group" or "raynor"), or any name when Valences is given. When empty,
	// rows carry no e/a and EOverA and SortEOverA are refused.
	Scheme string `json:"scheme,omitempty"`
	// Valences is a user's own valence table (element -> electrons per
	// atom); when set, e/a is computed from it instead of a kept scheme.
	Valences map[string]float64 `json:"valences,omitempty"`
	// EOverA limits the nominal e/a under Scheme; melts with an element the
	// scheme has no valence for have no e/a and never match.
	EOverA *Range `json:"e_over_a,omitempty"`

	// CoolingRateKPerS limits the melt's estimated cooling rate in K/s
	// (the cooling-rate of its melt-spin step).
	CoolingRateKPerS *Range `json:"cooling_rate_k_per_s,omitempty"`

	// CreatedFrom keeps melts made at or after this instant.
	CreatedFrom *time.Time `json:"created_from,omitempty"`
	// CreatedBefore keeps melts made strictly before this instant.
	CreatedBefore *time.Time `json:"created_before,omitempty"`
	// Operator keeps melts made by this operator (exact match).
	Operator string `json:"operator,omitempty"`
	// Text keeps melts whose notes or any note on the melt or its samples
	// contain this text, ignoring the case of ASCII letters.
	Text string `json:"text,omitempty"`

	Sort       MeltSort `json:"sort,omitempty"`
	Descending bool     `json:"descending,omitempty"`
	// Limit caps the rows returned (0: all); Offset skips rows first.
	Limit  int `json:"limit,omitempty"`
	Offset int `json:"offset,omitempty"`
}

// Validate checks the filter for contradictions and bad values.
func (f *MeltFilter) Validate() error {
	for _, k := range f.Outcomes {
		if !isPhaseKind(k) {
			return Errorf(Invalid, "outcome", "%q is not a phase kind (icosahedral, decagonal, approximant, crystalline, amorphous)", k)
		}
	}
	for _, e := range f.Elements {
		if !looksLikeSymbol(e) {
			return Errorf(Invalid, "elements", "%q is not an element symbol such as Al or Cu", e)
		}
	}
	if f.OnlyElements && len(f.Elements) == 0 {
		return Errorf(Invalid, "only", "only-these-elements needs a list of elements")
	}
	for _, fr := range f.Fractions {
		field := "fraction." + fr.Element
		if !looksLikeSymbol(fr.Element) {
			return Errorf(Invalid, "fraction", "%q is not an element symbol such as Al or Cu", fr.Element)
		}
		if err := fr.validate(field); err != nil {
			return err
		}
		if (fr.Min != nil && (*fr.Min < 0 || *fr.Min > 1)) || (fr.Max != nil && (*fr.Max < 0 || *fr.Max > 1)) {
			return Errorf(Invalid, field, "atomic fractions lie in 0..1")
		}
	}
	if f.Scheme == "" && (f.EOverA != nil || f.Sort == SortEOverA || f.Valences != nil) {
		return Errorf(Invalid, "scheme", "e/a needs a valence scheme")
	}
	for el, v := range f.Valences {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return Errorf(Invalid, "valences."+el, "not a finite number")
		}
	}
	if f.EOverA != nil {
		if err := f.EOverA.validate("e/a"); err != nil {
			return err
		}
	}
	if f.CoolingRateKPerS != nil {
		if err := f.CoolingRateKPerS.validate("cooling-rate"); err != nil {
			return err
		}
	}
	if f.CreatedFrom != nil && f.CreatedBefore != nil && !f.CreatedFrom.Before(*f.CreatedBefore) {
		return Errorf(Invalid, "created", "the date range is empty: %s is not before %s",
			f.CreatedFrom.Format(time.RFC3339), f.CreatedBefore.Format(time.RFC3339))
	}
	switch f.Sort {
	case "", SortCreated, SortCode, SortEOverA, SortCoolingRate:
	default:
		return Errorf(Invalid, "sort", "%q is not a sort order (created, code, e/a, cooling-rate)", f.Sort)
	}
	if f.Limit < 0 || f.Offset < 0 {
		return Errorf(Invalid, "limit", "limit and offset must not be negative")
	}
	return nil
}

// looksLikeSymbol reports whether s has the shape of an element symbol: a
// capital letter and up to two small ones.
func looksLikeSymbol(s string) bool {
	if len(s) == 0 || len(s) > 3 || s[0] < 'A' || s[0] > 'Z' {
		return false
	}
	for i := 1; i < len(s); i++ {
		if s[i] < 'a' || s[i] > 'z' {
			return false
		}
	}
	return true
}

func isPhaseKind(k PhaseKind) bool {
	for _, p := range PhaseKinds {
		if p == k {
			return true
		}
	}
	return false
}

// MeltSummary is one row of a FindMelts result.
type MeltSummary struct {
	Code      string            `json:"code"`
	CreatedAt time.Time         `json:"created_at"`
	Operator  string            `json:"operator"`
	Nominal   []ElementFraction `json:"nominal"`
	// Scheme is the filter's valence scheme; EOverA is nil when the scheme
	// was not asked for or lacks a valence for one of the elements.
	Scheme           string   `json:"scheme,omitempty"`
	EOverA           *float64 `json:"e_over_a"`
	CoolingRateKPerS *float64 `json:"cooling_rate_k_per_s"`
	// Outcomes of all the melt's samples, a person's first, then confirmed
	// proposals, then (with IncludeProposals) pending ones; never rejected
	// ones. Each carries its SampleCode.
	Outcomes []Outcome `json:"outcomes"`
}

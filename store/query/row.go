package query

import (
	"encoding/csv"
	"fmt"
	"io"
	"strconv"
	"strings"
	"time"

	"meltbook"
	"meltbook/analysis/composition"
)

// Row is one melt found, as the find command's --json and the web's
// /api/find print it.
type Row struct {
	Code      string    `json:"code"`
	CreatedAt time.Time `json:"created_at"`
	Operator  string    `json:"operator"`
	// Composition is the nominal composition as an at.% formula.
	Composition string `json:"composition"`
	// AtomicFractions maps element to nominal atomic fraction (0..1).
	AtomicFractions map[string]float64 `json:"atomic_fractions"`
	// Scheme names the valence scheme of EOverA.
	Scheme string   `json:"scheme"`
	EOverA *float64 `json:"e_over_a"`
	// CoolingRateKPerS is the estimated cooling rate in K/s.
	CoolingRateKPerS *float64     `json:"cooling_rate_K_s"`
	Outcomes         []RowOutcome `json:"outcomes"`
}

// RowOutcome is one phase outcome of one of the melt's samples.
type RowOutcome struct {
	Sample  string `json:"sample"`
	Kind    string `json:"kind"`
	Lattice string `json:"lattice,omitempty"`
	Order   string `json:"order,omitempty"`
	Name    string `json:"name,omitempty"`
	// Fraction is the rough volume fraction 0..1; null when not estimated.
	Fraction *float64 `json:"fraction"`
	// Source is "person" or "automatic"; Status is "confirmed" for a
	// person's outcome and a confirmed proposal, "proposed" for one still
	// awaiting a decision.
	Source string `json:"source"`
	Status string `json:"status"`
}

// NewRow builds the row of one melt found.
func NewRow(s meltbook.MeltSummary) Row {
	r := Row{
		Code:             s.Code,
		CreatedAt:        s.CreatedAt,
		Operator:         s.Operator,
		AtomicFractions:  make(map[string]float64, len(s.Nominal)),
		Scheme:           s.Scheme,
		EOverA:           s.EOverA,
		CoolingRateKPerS: s.CoolingRateKPerS,
		Outcomes:         make([]RowOutcome, 0, len(s.Outcomes)),
	}
	parts := make(composition.Composition, len(s.Nominal))
	for i, ef := range s.Nominal {
		r.AtomicFractions[ef.Element] = ef.Fraction
		parts[i] = composition.Part{Element: ef.Element, Fraction: ef.Fraction}
	}
	r.Composition = parts.Format(2)
	for _, o := range s.Outcomes {
		r.Outcomes = append(r.Outcomes, RowOutcome{
			Sample: o.SampleCode, Kind: string(o.Kind), Lattice: o.Lattice, Order: o.Order, Name: o.Name,
			Fraction: o.Fraction, Source: string(o.Source), Status: string(o.Status),
		})
	}
	return r
}

// Rows builds the rows of a FindMelts result; never nil, so that JSON shows
// an empty list as [].
func Rows(found []meltbook.MeltSummary) []Row {
	out := make([]Row, len(found))
	for i, s := range found {
		out[i] = NewRow(s)
	}
	return out
}

// String writes the outcome briefly: kind, lattice or order or name, the
// fraction in percent, the sample, and "proposed" for an undecided
// proposal, e.g. "icosahedral F 90% (QX-0003.a1)".
func (o RowOutcome) String() string {
	var b strings.Builder
	b.WriteString(o.Kind)
	for _, s := range []string{o.Lattice, o.Order, o.Name} {
		if s != "" {
			b.WriteString(" " + s)
		}
	}
	if o.Fraction != nil {
		b.WriteString(" " + strconv.FormatFloat(100**o.Fraction, 'f', -1, 64) + "%")
	}
	if o.Sample != "" {
		b.WriteString(" (" + o.Sample + ")")
	}
	if o.Status == string(meltbook.Proposed) {
		b.WriteString(" proposed")
	}
	return b.String()
}

// CSVHeader names the columns WriteCSV writes.
var CSVHeader = []string{"code", "created_at", "operator", "composition_at_pct", "scheme", "e_over_a", "cooling_rate_K_s", "outcomes"}

// WriteCSV writes rows as CSV with CSVHeader. Numbers are written in full
// precision; outcomes are joined with "; ".
func WriteCSV(w io.Writer, rows []Row) error {
	cw := csv.NewWriter(w)
	if err := cw.Write(CSVHeader); err != nil {
		return err
	}
	for _, r := range rows {
		outcomes := make([]string, len(r.Outcomes))
		for i, o := range r.Outcomes {
			outcomes[i] = o.String()
		}
		rec := []string{
			safeCell(r.Code), r.CreatedAt.UTC().Format(time.RFC3339), safeCell(r.Operator), r.Composition, r.Scheme,
			optional(r.EOverA), optional(r.CoolingRateKPerS), safeCell(strings.Join(outcomes, "; ")),
		}
		if err := cw.Write(rec); err != nil {
			return err
		}
	}
	cw.Flush()
	if err := cw.Error(); err != nil {
		return fmt.Errorf("write CSV: %w", err)
	}
	return nil
}

func optional(v *float64) string {
	if v == nil {
		return ""
	}
	return strconv.FormatFloat(*v, 'g', -1, 64)
}

// safeCell keeps a spreadsheet from reading a text cell as a formula.
func safeCell(s string) string {
	if s != "" && strings.ContainsRune("=+-@\t\r", rune(s[0])) {
		return "'" + s
	}
	return s
}

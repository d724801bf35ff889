package web

import (
	"context"
	"time"

	"meltbook"
	"meltbook/web/plot"
)

// Notebook is what the pages need from the notebook store. Errors should be
// *meltbook.Error where the user is at fault (a bad filter is Invalid with
// the filter's name as Field; an unknown code is NotFound) so that the page
// can say what and where; anything else is shown as an internal error.
type Notebook interface {
	// Summary counts what the notebook holds and lists recent changes.
	Summary(ctx context.Context) (Summary, error)
	// FilterFields lists the filters FindRuns accepts: the same names and
	// value syntax as the find command, e.g. outcome=icosahedral, ea=1.7:1.8.
	FilterFields() []FilterField
	// FindRuns returns the samples matching q.Filters, sorted and paged,
	// with the total number that match.
	FindRuns(ctx context.Context, q RunQuery) (RunPage, error)
	// MapSamples returns every sample with a composition, for the maps.
	MapSamples(ctx context.Context) ([]MapSample, error)
	// Run returns a melt with all that is recorded about it. code may name
	// the melt or any of its samples.
	Run(ctx context.Context, code string) (RunDetail, error)
	// Scan returns one diffraction scan ready to draw.
	Scan(ctx context.Context, id int64) (ScanView, error)
	// AddNote records a note on a melt (or, when note.SampleCode is set, on
	// one of its samples) and returns it as stored.
	AddNote(ctx context.Context, meltCode string, note meltbook.Note) (meltbook.Note, error)
}

// Summary is the notebook at a glance.
type Summary struct {
	Melts   int `json:"melts"`
	Samples int `json:"samples"`
	Scans   int `json:"scans"`
	// Recent are the latest history entries, newest first.
	Recent []meltbook.HistoryEntry `json:"recent"`
}

// FilterField describes one filter of the find vocabulary.
type FilterField struct {
	Name    string `json:"name"`    // query and flag name, e.g. "ea"
	Label   string `json:"label"`   // form label, e.g. "e/a"
	Help    string `json:"help"`    // value syntax, e.g. "range lo:hi, either end may be left out"
	Example string `json:"example"` // e.g. "1.7:1.8"
}

// FilterTerm is one filter given by the user, unparsed.
type FilterTerm struct {
	Name  string `json:"name"`
	Value string `json:"value"`
}

// Sort keys for FindRuns. The store must accept each of them.
const (
	SortCreated = "created"
	SortSample  = "sample"
	SortMelt    = "melt"
	SortEA      = "ea"
	SortRate    = "rate"
	SortOutcome = "outcome"
)

// RunQuery asks for one page of samples.
type RunQuery struct {
	Filters    []FilterTerm
	Sort       string // one of the Sort constants
	Descending bool
	Offset     int
	Limit      int // at most MaxPageSize
}

// MaxPageSize is the largest Limit the pages ask for.
const MaxPageSize = 1000

// RunPage is one page of FindRuns, and the JSON of /api/runs and
// /api/find. The find command's JSON output is meant to be this same shape.
type RunPage struct {
	Total int      `json:"total"`
	Runs  []RunRow `json:"runs"`
}

// RunRow is one sample as the run table shows it.
type RunRow struct {
	Sample    string    `json:"sample"`
	Melt      string    `json:"melt"`
	CreatedAt time.Time `json:"created_at"`
	Operator  string    `json:"operator"`
	// Composition is the measured composition when there is one, else the
	// melt's nominal composition; Measured says which.
	Composition []meltbook.ElementFraction `json:"composition"`
	Measured    bool                       `json:"measured"`
	// Treatment is "as-spun", "annealed", "as-cast" or "other".
	Treatment        string   `json:"treatment"`
	CoolingRateKPerS *float64 `json:"cooling_rate_k_per_s,omitempty"`
	// ElectronsPerAtom is e/a under the notebook's default valence scheme.
	ElectronsPerAtom *float64           `json:"ea,omitempty"`
	Outcomes         []meltbook.Outcome `json:"outcomes"`
}

// MapSample is one sample as the composition and descriptor maps need it.
type MapSample struct {
	Code string `json:"code"`
	Melt string `json:"melt"`
	// Composition is measured when Measured is set, else nominal.
	Composition []meltbook.ElementFraction `json:"composition"`
	Measured    bool                       `json:"measured"`
	Outcomes    []meltbook.Outcome         `json:"outcomes"`
	// CoolingRateKPerS is the estimated cooling rate of the melt-spin step
	// the sample came from; nil when not estimated.
	CoolingRateKPerS *float64 `json:"cooling_rate_k_per_s,omitempty"`
	// Annealed is set when a heat treatment followed spinning.
	Annealed bool `json:"annealed"`
}

// RunDetail is a melt with everything recorded about it.
type RunDetail struct {
	Melt    meltbook.Melt           `json:"melt"`
	Samples []SampleDetail          `json:"samples"`
	Notes   []meltbook.Note         `json:"notes"`
	History []meltbook.HistoryEntry `json:"history"`
}

// SampleDetail is one sample of a run.
type SampleDetail struct {
	Sample   meltbook.Sample                `json:"sample"`
	Steps    []meltbook.ProcessStep         `json:"steps"`
	Measured []meltbook.MeasuredComposition `json:"measured,omitempty"`
	Symmetry []meltbook.SymmetryObservation `json:"symmetry,omitempty"`
	Outcomes []meltbook.Outcome             `json:"outcomes"`
	Scans    []ScanSummary                  `json:"scans,omitempty"`
}

// ScanSummary names a scan in a run.
type ScanSummary struct {
	ID        int64   `json:"id"`
	Name      string  `json:"name"` // source file name
	Radiation string  `json:"radiation"`
	FromDeg   float64 `json:"from_deg"`
	ToDeg     float64 `json:"to_deg"`
	Points    int     `json:"points"`
}

// ScanView is a scan with what analysis made of it, ready to draw.
type ScanView struct {
	ScanSummary
	Sample     string    `json:"sample"`
	Melt       string    `json:"melt"`
	ImportedAt time.Time `json:"imported_at"`
	SHA256     string    `json:"sha256"`
	// Indexing sums up the accepted indexing, e.g.
	// "icosahedral P, a6 = 6.321(4) Å, 14 of 15 peaks"; empty when none.
	Indexing string       `json:"indexing,omitempty"`
	Pattern  plot.Pattern `json:"pattern"`
}

package web

import (
	"context"
	"time"

	"meltbook"
	"meltbook/web/plot"
)

// Notebook is what the pages need from the notebook store: the store's own
// methods (StoreMethods) and what the maps, the overview and the scan view
// need beyond them.
//
// Errors should be *meltbook.Error where the user is at fault (an unknown
// code is NotFound, a bad value Invalid with its field) so that the page can
// say what and where; anything else is shown as an internal error.
type Notebook interface {
	StoreMethods

	// Summary counts what the notebook holds and lists recent changes.
	Summary(ctx context.Context) (Summary, error)
	// SampleMelt returns the code of the melt a sample belongs to.
	SampleMelt(ctx context.Context, sampleCode string) (string, error)
	// MapSamples returns every sample with a composition, for the maps.
	MapSamples(ctx context.Context) ([]MapSample, error)
	// Scans lists the diffraction scans of a melt's samples.
	Scans(ctx context.Context, meltCode string) ([]ScanSummary, error)
	// Scan returns one diffraction scan ready to draw.
	Scan(ctx context.Context, id int64) (ScanView, error)
}

// StoreMethods are the methods the pages use that *store.Store has, with
// its signatures (a test holds them to it).
type StoreMethods interface {
	// FindMelts returns one page of the melts matching f (f.Limit, f.Offset)
	// and the number of all that match.
	FindMelts(ctx context.Context, f meltbook.MeltFilter) ([]meltbook.MeltSummary, int, error)
	// MeltRecord returns everything recorded about the melt with this code.
	MeltRecord(ctx context.Context, code string) (*meltbook.MeltRecord, error)
	// AddNote records a note by who on a melt (code is the melt's) or on
	// one of its derived samples (code is the sample's).
	AddNote(ctx context.Context, who, code, text string) (*meltbook.Note, error)
	// AddOutcome records a person's decision about a phase in a sample.
	AddOutcome(ctx context.Context, who, sampleCode string, o meltbook.Outcome) (*meltbook.Outcome, error)
	// ConfirmProposal and RejectProposal decide an automatic proposal;
	// why is optional.
	ConfirmProposal(ctx context.Context, who string, outcomeID int64, why string) error
	RejectProposal(ctx context.Context, who string, outcomeID int64, why string) error
}

// Summary is the notebook at a glance.
type Summary struct {
	Melts   int `json:"melts"`
	Samples int `json:"samples"`
	Scans   int `json:"scans"`
	// Recent are the latest history entries, newest first.
	Recent []meltbook.HistoryEntry `json:"recent"`
}

// MapSample is one sample as the composition and descriptor maps need it.
type MapSample struct {
	Code string `json:"code"`
	Melt string `json:"melt"`
	// Composition is measured when Measured is set, else the melt's nominal.
	Composition []meltbook.ElementFraction `json:"composition"`
	Measured    bool                       `json:"measured"`
	// Outcomes are the sample's own, of any source and status; the map
	// counts only decided ones (see plot.ClassOf).
	Outcomes []meltbook.Outcome `json:"outcomes"`
	// CoolingRateKPerS is the estimated cooling rate of the melt-spin step
	// the sample came from; nil when not estimated.
	CoolingRateKPerS *float64 `json:"cooling_rate_k_per_s,omitempty"`
	// Annealed is set when a heat treatment followed spinning.
	Annealed bool `json:"annealed"`
}

// ScanSummary names a scan of a sample.
type ScanSummary struct {
	ID        int64   `json:"id"`
	Sample    string  `json:"sample"`
	Name      string  `json:"name"` // source file name
	Radiation string  `json:"radiation"`
	FromDeg   float64 `json:"from_deg"`
	ToDeg     float64 `json:"to_deg"`
	Points    int     `json:"points"`
}

// ScanView is a scan with what analysis made of it, ready to draw.
type ScanView struct {
	ScanSummary
	Melt       string    `json:"melt"`
	ImportedAt time.Time `json:"imported_at"`
	SHA256     string    `json:"sha256"`
	// Indexing sums up the accepted indexing, e.g.
	// "icosahedral P, a6 = 6.321(4) Å, 14 of 15 peaks"; empty when none.
	Indexing string       `json:"indexing,omitempty"`
	Pattern  plot.Pattern `json:"pattern"`
}

package web

import (
	"context"

	"meltbook"
	"meltbook/store"
	"meltbook/web/plot"
)

// Notebook is what the pages need from the notebook: the methods of
// *store.Store with their signatures (a test holds the store to it), so
// that a server serves a store as it is and tests may serve a fake.
//
// Errors should be *meltbook.Error where the user is at fault (an unknown
// code is NotFound, a bad value Invalid with its field) so that the page can
// say what and where; anything else is shown as an internal error.
type Notebook interface {
	// Summary counts what the notebook holds and lists recent changes.
	Summary(ctx context.Context) (store.Summary, error)
	// FindMelts returns one page of the melts matching f (f.Limit, f.Offset)
	// and the number of all that match.
	FindMelts(ctx context.Context, f meltbook.MeltFilter) ([]meltbook.MeltSummary, int, error)
	// MeltRecord returns everything recorded about the melt with this code.
	MeltRecord(ctx context.Context, code string) (*meltbook.MeltRecord, error)
	// SampleMelt returns the code of the melt a sample belongs to.
	SampleMelt(ctx context.Context, sampleCode string) (string, error)
	// MapSamples returns every sample with its composition, outcomes,
	// cooling rate and treatment, for the maps.
	MapSamples(ctx context.Context) ([]store.MapSample, error)
	// MeltScans lists the diffraction scans of a melt's samples.
	MeltScans(ctx context.Context, meltCode string) ([]meltbook.ScanSummary, error)
	// ScanRecord returns one scan with its points and indexings.
	ScanRecord(ctx context.Context, id int64) (*meltbook.ScanRecord, error)

	// AddNote records a note by who on a melt (code is the melt's) or on
	// one of its derived samples (code is the sample's).
	AddNote(ctx context.Context, who, code, text string) (*meltbook.Note, error)
	// AddOutcome records a person's decision about a phase in a sample.
	AddOutcome(ctx context.Context, who, sampleCode string, o meltbook.Outcome) (*meltbook.Outcome, error)
	// ConfirmProposal and RejectProposal decide an automatic proposal;
	// why is optional.
	ConfirmProposal(ctx context.Context, who string, outcomeID int64, why string) error
	RejectProposal(ctx context.Context, who string, outcomeID int64, why string) error

	// NextMeltCode returns the next free melt code for a prefix, and
	// CreateMelt logs a melt with its own sample and steps.
	NextMeltCode(ctx context.Context, prefix string) (string, error)
	CreateMelt(ctx context.Context, who string, m *meltbook.Melt, steps ...meltbook.ProcessStep) error
	// AmendMelt, AmendSample and AmendStep change recorded values, with
	// a reason, returning the history rows written.
	AmendMelt(ctx context.Context, who, code string, u meltbook.MeltUpdate, why string) ([]meltbook.HistoryEntry, error)
	AmendSample(ctx context.Context, who, code string, u meltbook.SampleUpdate, why string) ([]meltbook.HistoryEntry, error)
	AmendStep(ctx context.Context, who string, stepID int64, u meltbook.StepUpdate, why string) ([]meltbook.HistoryEntry, error)
}

// ScanView is a scan with what analysis made of it, ready to draw: what
// /api/scans/{id} answers.
type ScanView struct {
	Scan meltbook.ScanSummary `json:"scan"`
	// Current is the scan's current indexing, nil when it has none.
	Current   *meltbook.Indexing      `json:"indexing,omitempty"`
	Proposals []meltbook.ScanProposal `json:"proposals"`
	// Pattern holds the points, the background and fitted profile of the
	// peak search, and the current indexing's peaks with their labels.
	Pattern plot.Pattern `json:"pattern"`
}

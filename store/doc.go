// Package store keeps the notebook: one SQLite file (modernc.org/sqlite,
// WAL, foreign keys, 5 s busy timeout, synchronous=NORMAL) holding melts,
// their samples, process steps, measured compositions, symmetry
// observations, phase outcomes, notes and an append-only history of every
// change.
//
// # Opening
//
//	s, err := store.Init(ctx, path, opts)  // new notebook; never overwrites a file
//	s, err := store.Open(ctx, path, opts)  // existing notebook, migrated if older
//	defer s.Close()
//
// Options carries the clock (Now) and the valence tables of the schemes
// whose e/a the notebook stores with every melt (Valences, keyed "group"
// and "raynor"; see KeptSchemes). The command line wires the tables of
// analysis/element there. Opening with different tables than last time
// recomputes every stored e/a once.
//
// Open refuses, with a *meltbook.Error: a missing file (NotFound), a file
// that is not a notebook (Invalid), and a notebook from a newer meltbook
// (Conflict), which it leaves untouched. Migrations are the numbered files
// of package migrations, each applied in its own transaction and recorded
// with its time.
//
// # Writing
//
// Every method that writes takes who, the person (or program) making the
// change, runs in one transaction with one reading of the clock, writes a
// history row for everything it creates or changes, and leaves nothing
// behind when it fails. Input is checked with the domain types' Validate
// methods first. Errors are *meltbook.Error values: Invalid (bad input,
// naming the field), NotFound (no such melt, sample, step, ...), Conflict
// (a code in use, a proposal already decided, an import into a notebook
// that is not empty, a newer notebook).
//
//	CreateMelt, CreateMelts          a melt with its own sample (same code) and steps
//	NextMeltCode                     "QX" -> "QX-0042"
//	DeriveSample                     a piece made by a step: "QX-0042" -> "QX-0042.a1"
//	AddStep, AddMeasuredComposition, AddSymmetryObservation, AddNote
//	AddOutcome                       a person's decision
//	ProposeOutcome                   an automatic proposal, then
//	ConfirmProposal, RejectProposal  a person's verdict on it
//	AmendMelt, AmendSample, AmendStep, AmendOutcome,
//	AmendMeasuredComposition, AmendSymmetryObservation, AmendNote
//
// Amendments take a meltbook.*Update (nil fields unchanged) and a reason,
// which is required; they return the history rows written, one per field,
// with the value before and after.
//
// # Reading
//
//	FindMeltByCode, FindSampleByCode
//	MeltRecord   everything about one melt, for show
//	History      a melt's history, oldest first
//	FindMelts    search with a meltbook.MeltFilter; one page and the total
//
// # Export and import
//
// Export writes the whole notebook as one JSON document (see Document for
// the format); Import reads one into an empty notebook, keeping ids, codes,
// times and history, so that export, import, export gives the same bytes.
//
// # Portability
//
// The schema and queries use standard SQL that PostgreSQL also accepts,
// except where noted in the migration files and here: ids are SQLite row
// ids (a NULL id asks SQLite for the next one), instants are fixed-width
// UTC text, the history's append-only triggers use SQLite's syntax, and
// Open and Close use SQLite pragmas (application id, WAL, optimize,
// ANALYZE with value histograms).
package store

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
// with its time. A migration runs on one connection with foreign-key
// enforcement off and is checked with PRAGMA foreign_key_check before it
// commits, as SQLite's procedure for rebuilding a table asks (003 rebuilds
// indexed_phase to widen its CHECKs); one that leaves a reference dangling
// is rolled back with an error naming the table.
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
//	AddScan, AddIndexing             a scan with its indexing, a further indexing
//
// An indexing keeps every field of each phase call (meltbook.IndexedPhase):
// kind (icosahedral, approximant or one of the seven crystal systems),
// centring (P, I, F, A, B, C, R), the library phase's name, space group and
// reference, the cell constants the kind leaves free with their
// uncertainties, the whole-pattern Rwp, and per assignment the line's
// predicted intensity; a model tried keeps the library phase it stood for.
// A call is checked before anything is written (an unknown kind is Invalid
// on "phases[i].kind"). Cell constants the kind fixes (0) are stored as
// NULL; Rwp and predicted intensities are NULL exactly when nil, so a
// computed 0 reads back as 0.
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
// the format, now version 3); Import reads one of version 1, 2 or 3 into an
// empty notebook, keeping ids, codes, times and history, so that export,
// import, export gives the same bytes.
//
// # Portability
//
// The schema and queries use standard SQL that PostgreSQL also accepts,
// except where noted in the migration files and here: ids are SQLite row
// ids (a NULL id asks SQLite for the next one), instants are fixed-width
// UTC text, the history's append-only triggers use SQLite's syntax, a
// CHECK is widened by rebuilding the table (PostgreSQL alters it in place),
// and Open and Close use SQLite pragmas (application id, WAL, optimize,
// ANALYZE with value histograms, foreign_keys and foreign_key_check around
// migrations).
package store

package store

import (
	"bytes"
	"context"
	"database/sql"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"net/url"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"time"

	sqlite "modernc.org/sqlite"
	sqlite3 "modernc.org/sqlite/lib"

	"meltbook"
	"meltbook/migrations"
)

// applicationID marks an SQLite file as a meltbook notebook ("MLTB" in
// the header's application id field).
const applicationID = 0x4D4C5442

// Options configures an opened notebook. The zero value is usable: the
// real clock and no valence tables (e/a left undefined).
type Options struct {
	// Now is the clock; every row written by one call carries one reading
	// of it. Nil means time.Now.
	Now func() time.Time
	// Valences gives, per kept scheme name ("group", "raynor"), the valence
	// of each element (electrons per atom). The notebook stores each melt's
	// nominal e/a under these schemes in indexed columns and recomputes them
	// all when it is opened with different tables than last time. A kept
	// scheme that is missing leaves its e/a undefined.
	Valences map[string]map[string]float64
}

// KeptSchemes are the valence schemes whose e/a the notebook stores with
// every melt; e/a under any other scheme is computed when searching.
var KeptSchemes = []string{"group", "raynor"}

// Store is an open notebook: one SQLite file.
type Store struct {
	db       *sql.DB
	path     string
	now      func() time.Time
	valences map[string]map[string]float64
	// knownVersion is the newest schema version this build knows.
	knownVersion int
	// overview caches MapSamples (overview.go).
	overview overviewCache
}

// Open opens the notebook at path and brings its schema up to date. It
// fails with NotFound when there is no file, Invalid when the file is not a
// notebook, and Conflict, leaving the file untouched, when the notebook was
// written by a newer meltbook than this one.
func Open(ctx context.Context, path string, opt Options) (*Store, error) {
	return open(ctx, path, opt, migrations.FS)
}

// Init creates a new, empty notebook at path and opens it. It refuses, with
// Conflict, to touch a file that already exists.
func Init(ctx context.Context, path string, opt Options) (*Store, error) {
	return initNotebook(ctx, path, opt, migrations.FS)
}

func newStore(path string, opt Options) (*Store, error) {
	s := &Store{path: path, now: opt.Now, valences: map[string]map[string]float64{}}
	if s.now == nil {
		s.now = time.Now
	}
	for name, table := range opt.Valences {
		if !isKept(name) {
			return nil, meltbook.Errorf(invalid, "valences", "the notebook keeps e/a for the schemes %s; %q is not one of them",
				strings.Join(KeptSchemes, ", "), name)
		}
		s.valences[name] = table
	}
	return s, nil
}

func open(ctx context.Context, path string, opt Options, mfs fs.FS) (*Store, error) {
	s, err := newStore(path, opt)
	if err != nil {
		return nil, err
	}
	ms, err := loadMigrations(mfs)
	if err != nil {
		return nil, err
	}
	s.knownVersion = len(ms)
	if err := checkNotebookFile(path); err != nil {
		return nil, err
	}
	if s.db, err = openDB(path); err != nil {
		return nil, err
	}
	if err := s.start(ctx, ms); err != nil {
		s.db.Close()
		return nil, err
	}
	return s, nil
}

// start checks the file's identity and version, then migrates and brings
// the derived columns up to date.
func (s *Store) start(ctx context.Context, ms []migration) error {
	var id int64
	if err := s.db.QueryRowContext(ctx, "PRAGMA application_id").Scan(&id); err != nil {
		return notebookReadError(s.path, err)
	}
	if id != applicationID {
		return meltbook.Errorf(invalid, s.path, "an SQLite database, but not a meltbook notebook")
	}
	var version int
	if err := s.db.QueryRowContext(ctx, "SELECT COALESCE(MAX(version), 0) FROM schema_migration").Scan(&version); err != nil {
		return notebookReadError(s.path, err)
	}
	if version > len(ms) {
		return meltbook.Errorf(conflict, s.path,
			"the notebook was written by a newer meltbook (schema version %d; this one knows up to %d); it was left untouched",
			version, len(ms))
	}
	if err := s.migrate(ctx, ms); err != nil {
		return err
	}
	return s.syncDerived(ctx)
}

func initNotebook(ctx context.Context, path string, opt Options, mfs fs.FS) (_ *Store, err error) {
	s, err := newStore(path, opt)
	if err != nil {
		return nil, err
	}
	ms, err := loadMigrations(mfs)
	if err != nil {
		return nil, err
	}
	s.knownVersion = len(ms)
	f, err := os.OpenFile(path, os.O_RDWR|os.O_CREATE|os.O_EXCL, 0o644)
	if errors.Is(err, fs.ErrExist) {
		if checkNotebookFile(path) == nil {
			return nil, meltbook.Errorf(conflict, path, "a notebook already exists here")
		}
		return nil, meltbook.Errorf(conflict, path, "the file exists and is not a notebook; refusing to overwrite it")
	}
	if err != nil {
		return nil, fmt.Errorf("create notebook: %w", err)
	}
	if err := f.Close(); err != nil {
		return nil, fmt.Errorf("create notebook: %w", err)
	}
	defer func() {
		if err != nil {
			for _, p := range []string{path, path + "-wal", path + "-shm"} {
				os.Remove(p)
			}
		}
	}()
	if s.db, err = openDB(path); err != nil {
		return nil, err
	}
	if err := s.create(ctx, ms); err != nil {
		s.db.Close()
		return nil, err
	}
	return s, nil
}

func (s *Store) create(ctx context.Context, ms []migration) error {
	for _, q := range []string{
		"PRAGMA journal_mode = WAL",
		fmt.Sprintf("PRAGMA application_id = %d", applicationID),
		`CREATE TABLE schema_migration (
			version    INTEGER PRIMARY KEY,
			name       TEXT NOT NULL,
			applied_at TEXT NOT NULL
		)`,
	} {
		if _, err := s.db.ExecContext(ctx, q); err != nil {
			return fmt.Errorf("create notebook: %w", err)
		}
	}
	if err := s.migrate(ctx, ms); err != nil {
		return err
	}
	if err := s.syncDerived(ctx); err != nil {
		return err
	}
	// Write the pages into the main file so that its header names it a
	// notebook even before the first checkpoint.
	if _, err := s.db.ExecContext(ctx, "PRAGMA wal_checkpoint(TRUNCATE)"); err != nil {
		return fmt.Errorf("create notebook: %w", err)
	}
	return nil
}

// Close refreshes the query planner's statistics where needed and closes
// the file.
func (s *Store) Close() error {
	s.overview.close()
	errStats := s.refreshStatistics()
	if err := s.db.Close(); err != nil {
		return err
	}
	return errStats
}

const analyzedSetting = "analyzed-melts"

// refreshStatistics runs SQLite's own light upkeep (PRAGMA optimize), and
// a full ANALYZE of the searched tables whenever the notebook has doubled
// in size since the last one (about 0.5 s per 100,000 melts). The full
// ANALYZE gathers value histograms (stat4), without which the planner
// cannot tell a narrow e/a range from a wide cooling-rate range and may
// search from the wrong index.
func (s *Store) refreshStatistics() error {
	if _, err := s.db.Exec("PRAGMA optimize"); err != nil {
		return fmt.Errorf("close: %w", err)
	}
	var melts int64
	var analyzed string
	if err := s.db.QueryRow(`SELECT COALESCE(MAX(id), 0), COALESCE((SELECT value FROM notebook_setting WHERE name = ?), '0')
		FROM melt`, analyzedSetting).Scan(&melts, &analyzed); err != nil {
		return fmt.Errorf("close: %w", err)
	}
	last, _ := strconv.ParseInt(analyzed, 10, 64)
	if melts < 100 || melts < 2*last {
		return nil
	}
	if _, err := s.db.Exec(`ANALYZE melt; ANALYZE melt_element; ANALYZE outcome; ANALYZE sample`); err != nil {
		return fmt.Errorf("close: %w", err)
	}
	if _, err := s.db.Exec(`INSERT INTO notebook_setting (name, value) VALUES (?, ?)
		ON CONFLICT (name) DO UPDATE SET value = excluded.value`, analyzedSetting, strconv.FormatInt(melts, 10)); err != nil {
		return fmt.Errorf("close: %w", err)
	}
	return nil
}

// Path returns the notebook's file name.
func (s *Store) Path() string { return s.path }

// openDB opens a connection pool on path. Every connection waits up to 5 s
// for a lock, enforces foreign keys, and syncs at WAL checkpoints only
// (synchronous=NORMAL: a commit survives a crash of the program; a power
// loss may lose the last commits but never corrupts the file). Statement
// journals stay in memory and the page cache holds 16 MB. Write
// transactions take the write lock at BEGIN (IMMEDIATE), so two writers
// queue instead of failing halfway; read-only transactions do not.
func openDB(path string) (*sql.DB, error) {
	abs, err := filepath.Abs(path)
	if err != nil {
		return nil, fmt.Errorf("open notebook: %w", err)
	}
	q := url.Values{}
	q.Add("_pragma", "busy_timeout(5000)")
	q.Add("_pragma", "foreign_keys(1)")
	q.Add("_pragma", "synchronous(NORMAL)")
	q.Add("_pragma", "temp_store(MEMORY)")
	q.Add("_pragma", "cache_size(-16000)")
	q.Set("_txlock", "immediate")
	u := url.URL{Scheme: "file", Path: abs, RawQuery: q.Encode()}
	db, err := sql.Open("sqlite", u.String())
	if err != nil {
		return nil, fmt.Errorf("open notebook: %w", err)
	}
	return db, nil
}

// checkNotebookFile checks that path is an SQLite file carrying the
// notebook's application id, reading only its header.
func checkNotebookFile(path string) error {
	f, err := os.Open(path)
	if errors.Is(err, fs.ErrNotExist) {
		return meltbook.Errorf(notFound, path, "no notebook here")
	}
	if err != nil {
		return fmt.Errorf("open notebook: %w", err)
	}
	defer f.Close()
	var header [100]byte
	n, err := io.ReadFull(f, header[:])
	if err != nil && !errors.Is(err, io.ErrUnexpectedEOF) && !errors.Is(err, io.EOF) {
		return fmt.Errorf("open notebook: %w", err)
	}
	if n < len(header) || !bytes.HasPrefix(header[:], []byte("SQLite format 3\x00")) {
		return meltbook.Errorf(invalid, path, "not a meltbook notebook (not an SQLite database)")
	}
	id := uint32(header[68])<<24 | uint32(header[69])<<16 | uint32(header[70])<<8 | uint32(header[71])
	if id != applicationID {
		return meltbook.Errorf(invalid, path, "an SQLite database, but not a meltbook notebook")
	}
	return nil
}

func notebookReadError(path string, err error) error {
	var se *sqlite.Error
	if errors.As(err, &se) && (se.Code()&0xff == sqlite3.SQLITE_NOTADB || se.Code()&0xff == sqlite3.SQLITE_CORRUPT) {
		return meltbook.Errorf(invalid, path, "the notebook file is damaged: %v", err)
	}
	if errors.As(err, &se) && se.Code()&0xff == sqlite3.SQLITE_ERROR {
		return meltbook.Errorf(invalid, path, "not a complete meltbook notebook: %v", err)
	}
	return fmt.Errorf("read notebook %s: %w", path, err)
}

// Shorter names for the error kinds used throughout the package.
const (
	invalid  = meltbook.Invalid
	notFound = meltbook.NotFound
	conflict = meltbook.Conflict
)

func isKept(scheme string) bool {
	for _, k := range KeptSchemes {
		if k == scheme {
			return true
		}
	}
	return false
}

// isConstraint reports whether err is SQLite refusing a row for a UNIQUE,
// PRIMARY KEY, CHECK or FOREIGN KEY constraint.
func isConstraint(err error) bool {
	var se *sqlite.Error
	return errors.As(err, &se) && se.Code()&0xff == sqlite3.SQLITE_CONSTRAINT
}

package store

import (
	"context"
	"database/sql"
	"database/sql/driver"
	"fmt"
	"io/fs"
	"sort"
	"strconv"
	"strings"
)

// migration is one numbered schema file.
type migration struct {
	version int
	name    string
	sql     string
}

// loadMigrations reads NNN_topic.sql files from mfs, in order. Versions
// must count 1, 2, 3, ... without gaps; anything else is a fault of the
// build, reported as an internal error.
func loadMigrations(mfs fs.FS) ([]migration, error) {
	names, err := fs.Glob(mfs, "*.sql")
	if err != nil {
		return nil, fmt.Errorf("list migrations: %w", err)
	}
	var ms []migration
	for _, name := range names {
		digits, _, ok := strings.Cut(name, "_")
		v, err := strconv.Atoi(digits)
		if !ok || err != nil || v < 1 {
			return nil, fmt.Errorf("migration %s: the name must start with its version, e.g. 001_topic.sql", name)
		}
		b, err := fs.ReadFile(mfs, name)
		if err != nil {
			return nil, fmt.Errorf("migration %s: %w", name, err)
		}
		ms = append(ms, migration{version: v, name: name, sql: string(b)})
	}
	sort.Slice(ms, func(i, j int) bool { return ms[i].version < ms[j].version })
	for i, m := range ms {
		if m.version != i+1 {
			return nil, fmt.Errorf("migration %s: expected version %d", m.name, i+1)
		}
	}
	return ms, nil
}

// migrate applies the migrations the notebook has not seen, each in its own
// transaction, recording version, file name and time.
func (s *Store) migrate(ctx context.Context, ms []migration) error {
	for _, m := range ms {
		if err := s.applyMigration(ctx, m); err != nil {
			return err
		}
	}
	return nil
}

// applyMigration runs one migration the way SQLite's procedure for
// rebuilding a table asks (https://www.sqlite.org/lang_altertable.html#otheralter):
// on one connection with foreign-key enforcement off (it cannot be switched
// inside a transaction), in a transaction that checks the whole file with
// PRAGMA foreign_key_check before it commits, and with enforcement back on
// afterwards. A migration may thus drop and recreate a table that others
// refer to; one that leaves a reference dangling is rolled back.
func (s *Store) applyMigration(ctx context.Context, m migration) error {
	var done int
	// A cheap read first, so that an up-to-date notebook is never locked
	// for writing on open.
	if err := s.db.QueryRowContext(ctx, "SELECT COUNT(*) FROM schema_migration WHERE version = ?", m.version).Scan(&done); err != nil {
		return fmt.Errorf("migration %s: %w", m.name, err)
	}
	if done > 0 {
		return nil
	}
	conn, err := s.db.Conn(ctx)
	if err != nil {
		return fmt.Errorf("migration %s: %w", m.name, err)
	}
	defer conn.Close()
	if _, err := conn.ExecContext(ctx, "PRAGMA foreign_keys = OFF"); err != nil {
		return fmt.Errorf("migration %s: %w", m.name, err)
	}
	errRun := s.runMigration(ctx, conn, m)
	if _, err := conn.ExecContext(ctx, "PRAGMA foreign_keys = ON"); err != nil {
		// The connection must not go back to the pool without enforcement.
		conn.Raw(func(any) error { return driver.ErrBadConn })
		if errRun == nil {
			errRun = fmt.Errorf("migration %s: enforce foreign keys again: %w", m.name, err)
		}
	}
	return errRun
}

func (s *Store) runMigration(ctx context.Context, conn *sql.Conn, m migration) error {
	tx, err := conn.BeginTx(ctx, nil)
	if err != nil {
		return fmt.Errorf("migration %s: %w", m.name, err)
	}
	defer tx.Rollback()
	var done int
	// Another process may have applied it while we waited for the lock.
	if err := tx.QueryRowContext(ctx, "SELECT COUNT(*) FROM schema_migration WHERE version = ?", m.version).Scan(&done); err != nil {
		return fmt.Errorf("migration %s: %w", m.name, err)
	}
	if done > 0 {
		return nil
	}
	if _, err := tx.ExecContext(ctx, m.sql); err != nil {
		return fmt.Errorf("migration %s: %w", m.name, err)
	}
	if err := foreignKeyCheck(ctx, tx); err != nil {
		return fmt.Errorf("migration %s: %w", m.name, err)
	}
	if _, err := tx.ExecContext(ctx, "INSERT INTO schema_migration (version, name, applied_at) VALUES (?, ?, ?)",
		m.version, m.name, formatTime(s.now())); err != nil {
		return fmt.Errorf("migration %s: %w", m.name, err)
	}
	if err := tx.Commit(); err != nil {
		return fmt.Errorf("migration %s: %w", m.name, err)
	}
	return nil
}

// foreignKeyCheck reports the first row whose reference names no row, as
// PRAGMA foreign_key_check finds it: table, row id, referred table.
func foreignKeyCheck(ctx context.Context, tx *sql.Tx) error {
	rows, err := tx.QueryContext(ctx, "PRAGMA foreign_key_check")
	if err != nil {
		return fmt.Errorf("foreign key check: %w", err)
	}
	defer rows.Close()
	n := 0
	var first string
	for rows.Next() {
		var table, parent string
		var rowid sql.NullInt64
		var fk int
		if err := rows.Scan(&table, &rowid, &parent, &fk); err != nil {
			return fmt.Errorf("foreign key check: %w", err)
		}
		if n == 0 {
			first = fmt.Sprintf("row %d of %s names no row of %s", rowid.Int64, table, parent)
		}
		n++
	}
	if err := rows.Err(); err != nil {
		return fmt.Errorf("foreign key check: %w", err)
	}
	if n > 0 {
		return fmt.Errorf("%d references left dangling, e.g. %s", n, first)
	}
	return nil
}

// SchemaVersion returns the notebook's schema version and the newest one
// this build knows.
func (s *Store) SchemaVersion(ctx context.Context) (have, known int, err error) {
	if err := s.db.QueryRowContext(ctx, "SELECT COALESCE(MAX(version), 0) FROM schema_migration").Scan(&have); err != nil {
		return 0, 0, fmt.Errorf("schema version: %w", err)
	}
	return have, s.knownVersion, nil
}

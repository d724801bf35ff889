package store

import (
	"context"
	"database/sql"
	"encoding/json"
	"fmt"
	"strconv"
	"strings"
	"time"

	"meltbook"
)

// txn is one transaction with what every helper needs: the context, one
// reading of the clock for every row written, the acting person, and a
// cache of prepared statements (a bulk write runs the same few statements
// hundreds of thousands of times).
type txn struct {
	ctx   context.Context
	tx    *sql.Tx
	s     *Store
	now   time.Time
	who   string
	stmts map[string]*sql.Stmt
	// importing: the rows come with their ids and their history from an
	// exported document, so inserts write no history of their own.
	importing bool
}

// write runs fn in one write transaction on behalf of who and commits it;
// on any error nothing fn wrote survives.
func (s *Store) write(ctx context.Context, who string, fn func(t *txn) error) error {
	if strings.TrimSpace(who) == "" {
		return meltbook.Errorf(invalid, "who", "a change to the notebook needs the name of who makes it")
	}
	tx, err := s.db.BeginTx(ctx, nil)
	if err != nil {
		return fmt.Errorf("begin: %w", err)
	}
	defer tx.Rollback()
	t := &txn{ctx: ctx, tx: tx, s: s, now: s.now().UTC(), who: who, stmts: map[string]*sql.Stmt{}}
	defer t.close()
	if err := fn(t); err != nil {
		return err
	}
	if err := tx.Commit(); err != nil {
		return fmt.Errorf("commit: %w", err)
	}
	return nil
}

// read runs fn in one read-only transaction, so that it sees one state of
// the notebook.
func (s *Store) read(ctx context.Context, fn func(t *txn) error) error {
	tx, err := s.db.BeginTx(ctx, &sql.TxOptions{ReadOnly: true})
	if err != nil {
		return fmt.Errorf("begin: %w", err)
	}
	defer tx.Rollback()
	t := &txn{ctx: ctx, tx: tx, s: s, stmts: map[string]*sql.Stmt{}}
	defer t.close()
	if err := fn(t); err != nil {
		return err
	}
	return tx.Commit()
}

func (t *txn) close() {
	for _, st := range t.stmts {
		st.Close()
	}
}

func (t *txn) stmt(query string) (*sql.Stmt, error) {
	if st, ok := t.stmts[query]; ok {
		return st, nil
	}
	st, err := t.tx.PrepareContext(t.ctx, query)
	if err != nil {
		return nil, err
	}
	t.stmts[query] = st
	return st, nil
}

func (t *txn) exec(query string, args ...any) (sql.Result, error) {
	st, err := t.stmt(query)
	if err != nil {
		return nil, err
	}
	return st.ExecContext(t.ctx, args...)
}

// insert runs an INSERT ... RETURNING id and returns the new row's id.
func (t *txn) insert(query string, args ...any) (int64, error) {
	st, err := t.stmt(query)
	if err != nil {
		return 0, err
	}
	var id int64
	err = st.QueryRowContext(t.ctx, args...).Scan(&id)
	return id, err
}

func (t *txn) queryRow(query string, args ...any) *sql.Row {
	return t.tx.QueryRowContext(t.ctx, query, args...)
}

func (t *txn) query(query string, args ...any) (*sql.Rows, error) {
	return t.tx.QueryContext(t.ctx, query, args...)
}

// change is one field of an amendment, as the history records it.
type change struct {
	field, before, after string
}

// record appends one history row. A meltID of 0 records a change of the
// notebook as a whole (melt_id NULL), such as a setting.
func (t *txn) record(meltID int64, entity string, entityID int64, action string, c change, why string) (meltbook.HistoryEntry, error) {
	h := meltbook.HistoryEntry{At: t.now, Who: t.who, Entity: entity, EntityID: entityID,
		Action: action, Field: c.field, Before: c.before, After: c.after, Why: why}
	var melt any = meltID
	if meltID == 0 {
		melt = nil
	}
	id, err := t.insert(`INSERT INTO history (changed_at, who, melt_id, entity, entity_id, action, field, before_value, after_value, why)
		VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?) RETURNING id`,
		formatTime(t.now), t.who, melt, entity, entityID, action, c.field, c.before, c.after, why)
	if err != nil {
		return h, fmt.Errorf("record history: %w", err)
	}
	h.ID = id
	return h, nil
}

// recordCreate appends the history row of a new entity, with the entity as
// JSON in the after column.
func (t *txn) recordCreate(meltID int64, entity string, entityID int64, v any) error {
	if t.importing {
		return nil
	}
	b, err := json.Marshal(v)
	if err != nil {
		return fmt.Errorf("record history: %w", err)
	}
	_, err = t.record(meltID, entity, entityID, "create", change{after: string(b)}, "")
	return err
}

// recordAmendment writes one history row per change, all with the reason.
func (t *txn) recordAmendment(meltID int64, entity string, entityID int64, changes []change, why string) ([]meltbook.HistoryEntry, error) {
	if len(changes) == 0 {
		return nil, meltbook.Errorf(invalid, entity, "nothing to amend: the new values equal the recorded ones")
	}
	out := make([]meltbook.HistoryEntry, 0, len(changes))
	for _, c := range changes {
		h, err := t.record(meltID, entity, entityID, "amend", c, why)
		if err != nil {
			return nil, err
		}
		out = append(out, h)
	}
	return out, nil
}

// needReason refuses an amendment without a reason.
func needReason(why string) error {
	if strings.TrimSpace(why) == "" {
		return meltbook.Errorf(invalid, "why", "an amendment needs a reason")
	}
	return nil
}

// Instants are stored as fixed-width UTC text, so text order is time order.
const timeLayout = "2006-01-02T15:04:05.000000000Z"

func formatTime(t time.Time) string { return t.UTC().Format(timeLayout) }

func parseTime(s string) (time.Time, error) {
	t, err := time.Parse(timeLayout, s)
	if err != nil {
		return time.Time{}, fmt.Errorf("stored time %q: %w", s, err)
	}
	return t, nil
}

func formatFloat(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

func formatOptionalFloat(v *float64) string {
	if v == nil {
		return ""
	}
	return formatFloat(*v)
}

// formatFractions writes a composition as "Al 0.63, Cu 0.25, Fe 0.12".
func formatFractions(fs []meltbook.ElementFraction) string {
	parts := make([]string, len(fs))
	for i, f := range fs {
		parts[i] = f.Element + " " + formatFloat(f.Fraction)
	}
	return strings.Join(parts, ", ")
}

// idArg is the id column's value: NULL (SQLite then assigns the next row
// id; PostgreSQL would need DEFAULT instead) or a given id when importing.
func idArg(id int64) any {
	if id == 0 {
		return nil
	}
	return id
}

// nullFloat converts an optional number to a query argument.
func nullFloat(v *float64) any {
	if v == nil {
		return nil
	}
	return *v
}

// floatPtr converts a scanned nullable number.
func floatPtr(n sql.NullFloat64) *float64 {
	if !n.Valid {
		return nil
	}
	v := n.Float64
	return &v
}

func differs(a, b *float64) bool {
	if a == nil || b == nil {
		return a != b
	}
	return *a != *b
}

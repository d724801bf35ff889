package store

import (
	"context"
	"database/sql"
	"fmt"

	"meltbook"
)

// MeltRecord returns everything the notebook holds about a melt: the melt,
// its e/a under the kept schemes and cooling rate, its samples in tree
// order with their steps, measurements, symmetry observations and
// outcomes, the notes, and the history.
func (s *Store) MeltRecord(ctx context.Context, code string) (*meltbook.MeltRecord, error) {
	var r *meltbook.MeltRecord
	err := s.read(ctx, func(t *txn) error {
		var err error
		r, err = t.meltRecord(code)
		return err
	})
	return r, err
}

func (t *txn) meltRecord(code string) (*meltbook.MeltRecord, error) {
	m, err := t.meltByCode(code)
	if err != nil {
		return nil, err
	}
	r := &meltbook.MeltRecord{Melt: *m}
	var group, raynor, cooling sql.NullFloat64
	if err := t.queryRow(`SELECT e_over_a_group, e_over_a_raynor, cooling_rate_k_per_s FROM melt WHERE id = ?`, m.ID).
		Scan(&group, &raynor, &cooling); err != nil {
		return nil, fmt.Errorf("melt %s: %w", code, err)
	}
	for scheme, v := range map[string]sql.NullFloat64{"group": group, "raynor": raynor} {
		if v.Valid {
			if r.EOverA == nil {
				r.EOverA = map[string]float64{}
			}
			r.EOverA[scheme] = v.Float64
		}
	}
	r.CoolingRateKPerS = floatPtr(cooling)
	samples, err := t.samplesOf(m.ID)
	if err != nil {
		return nil, err
	}
	for _, sr := range samples {
		if err := t.fillSample(&sr); err != nil {
			return nil, err
		}
		r.Samples = append(r.Samples, sr)
	}
	if r.Notes, err = t.notesOf(m.ID); err != nil {
		return nil, err
	}
	if r.History, err = t.historyOf(m.ID); err != nil {
		return nil, err
	}
	return r, nil
}

// samplesOf returns a melt's samples in tree order: each sample followed
// by its derived pieces, oldest first, depth-first.
func (t *txn) samplesOf(meltID int64) ([]meltbook.SampleRecord, error) {
	rows, err := t.query(`SELECT `+sampleColumns+` FROM sample sa LEFT JOIN sample pa ON pa.id = sa.parent_id
		WHERE sa.melt_id = ? ORDER BY sa.id`, meltID)
	if err != nil {
		return nil, fmt.Errorf("samples: %w", err)
	}
	defer rows.Close()
	children := map[int64][]*meltbook.Sample{}
	var roots []*meltbook.Sample
	for rows.Next() {
		sa, err := scanSample(rows)
		if err != nil {
			return nil, fmt.Errorf("samples: %w", err)
		}
		if sa.ParentID == nil {
			roots = append(roots, sa)
		} else {
			children[*sa.ParentID] = append(children[*sa.ParentID], sa)
		}
	}
	if err := rows.Err(); err != nil {
		return nil, fmt.Errorf("samples: %w", err)
	}
	var out []meltbook.SampleRecord
	var walk func(sa *meltbook.Sample, depth int)
	walk = func(sa *meltbook.Sample, depth int) {
		out = append(out, meltbook.SampleRecord{Sample: *sa, Depth: depth})
		for _, c := range children[sa.ID] {
			walk(c, depth+1)
		}
	}
	for _, root := range roots {
		walk(root, 0)
	}
	return out, nil
}

// fillSample loads a sample's steps, measurements, observations and
// outcomes.
func (t *txn) fillSample(sr *meltbook.SampleRecord) error {
	rows, err := t.query(`SELECT `+stepColumns+` FROM process_step WHERE sample_id = ? ORDER BY seq`, sr.ID)
	if err != nil {
		return fmt.Errorf("sample %s steps: %w", sr.Code, err)
	}
	for rows.Next() {
		st, err := scanStep(rows)
		if err != nil {
			rows.Close()
			return fmt.Errorf("sample %s steps: %w", sr.Code, err)
		}
		sr.Steps = append(sr.Steps, *st)
	}
	rows.Close()
	if err := rows.Err(); err != nil {
		return fmt.Errorf("sample %s steps: %w", sr.Code, err)
	}
	for i := range sr.Steps {
		if err := t.loadParams(&sr.Steps[i]); err != nil {
			return fmt.Errorf("sample %s steps: %w", sr.Code, err)
		}
	}
	rows, err = t.query(`SELECT `+measurementColumns+` FROM measured_composition WHERE sample_id = ? ORDER BY id`, sr.ID)
	if err != nil {
		return fmt.Errorf("sample %s measurements: %w", sr.Code, err)
	}
	if sr.Measurements, err = t.scanMeasurements(rows); err != nil {
		return fmt.Errorf("sample %s measurements: %w", sr.Code, err)
	}
	rows, err = t.query(`SELECT `+observationColumns+` FROM symmetry_observation WHERE sample_id = ? ORDER BY id`, sr.ID)
	if err != nil {
		return fmt.Errorf("sample %s observations: %w", sr.Code, err)
	}
	if sr.Symmetry, err = t.scanObservations(rows); err != nil {
		return fmt.Errorf("sample %s observations: %w", sr.Code, err)
	}
	rows, err = t.query(`SELECT `+outcomeColumns+` FROM outcome o JOIN sample sa ON sa.id = o.sample_id
		WHERE o.sample_id = ? ORDER BY `+outcomeRank+`, o.id`, sr.ID)
	if err != nil {
		return fmt.Errorf("sample %s outcomes: %w", sr.Code, err)
	}
	defer rows.Close()
	for rows.Next() {
		o, err := scanOutcome(rows)
		if err != nil {
			return fmt.Errorf("sample %s outcomes: %w", sr.Code, err)
		}
		sr.Outcomes = append(sr.Outcomes, *o)
	}
	return rows.Err()
}

func (t *txn) notesOf(meltID int64) ([]meltbook.Note, error) {
	rows, err := t.query(`SELECT `+noteColumns+` FROM note n LEFT JOIN sample sa ON sa.id = n.sample_id
		WHERE n.melt_id = ? ORDER BY n.id`, meltID)
	if err != nil {
		return nil, fmt.Errorf("notes: %w", err)
	}
	defer rows.Close()
	var out []meltbook.Note
	for rows.Next() {
		n, err := scanNote(rows)
		if err != nil {
			return nil, fmt.Errorf("notes: %w", err)
		}
		out = append(out, *n)
	}
	return out, rows.Err()
}

// History returns every change recorded about a melt and everything on
// it, oldest first.
func (s *Store) History(ctx context.Context, meltCode string) ([]meltbook.HistoryEntry, error) {
	var out []meltbook.HistoryEntry
	err := s.read(ctx, func(t *txn) error {
		m, err := t.meltByCode(meltCode)
		if err != nil {
			return err
		}
		out, err = t.historyOf(m.ID)
		return err
	})
	return out, err
}

const historyColumns = `h.id, h.changed_at, h.who, COALESCE(m.code, ''), h.entity, h.entity_id, h.action, h.field,
	h.before_value, h.after_value, h.why`

func scanHistory(rows *sql.Rows) ([]meltbook.HistoryEntry, error) {
	defer rows.Close()
	var out []meltbook.HistoryEntry
	for rows.Next() {
		var h meltbook.HistoryEntry
		var at string
		if err := rows.Scan(&h.ID, &at, &h.Who, &h.MeltCode, &h.Entity, &h.EntityID, &h.Action, &h.Field,
			&h.Before, &h.After, &h.Why); err != nil {
			return nil, fmt.Errorf("history: %w", err)
		}
		var err error
		if h.At, err = parseTime(at); err != nil {
			return nil, err
		}
		out = append(out, h)
	}
	return out, rows.Err()
}

func (t *txn) historyOf(meltID int64) ([]meltbook.HistoryEntry, error) {
	rows, err := t.query(`SELECT `+historyColumns+` FROM history h LEFT JOIN melt m ON m.id = h.melt_id
		WHERE h.melt_id = ? ORDER BY h.id`, meltID)
	if err != nil {
		return nil, fmt.Errorf("history: %w", err)
	}
	return scanHistory(rows)
}

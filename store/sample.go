package store

import (
	"context"
	"database/sql"
	"errors"
	"fmt"

	"meltbook"
)

// derivedCodeLetter is the letter a derived sample's code adds for the
// step that made it: QX-0042 annealed gives QX-0042.a1, then QX-0042.a2;
// that piece annealed again gives QX-0042.a1.a1.
var derivedCodeLetter = map[meltbook.StepKind]string{
	meltbook.Anneal:    "a",
	meltbook.MeltSpin:  "s",
	meltbook.ArcMelt:   "m",
	meltbook.OtherStep: "x",
}

func (t *txn) insertSample(sa *meltbook.Sample) error {
	var parent any
	if sa.ParentID != nil {
		parent = *sa.ParentID
	}
	id, err := t.insert(`INSERT INTO sample (id, melt_id, parent_id, code, label, created_at) VALUES (?, ?, ?, ?, ?, ?) RETURNING id`,
		idArg(sa.ID), sa.MeltID, parent, sa.Code, sa.Label, formatTime(sa.CreatedAt))
	if isConstraint(err) {
		return meltbook.Errorf(conflict, "code", "a sample %s already exists", sa.Code)
	}
	if err != nil {
		return fmt.Errorf("create sample %s: %w", sa.Code, err)
	}
	sa.ID = id
	return t.recordCreate(sa.MeltID, "sample", sa.ID, sa)
}

// FindSampleByCode returns a sample, with its parent's code when it was
// derived from another.
func (s *Store) FindSampleByCode(ctx context.Context, code string) (*meltbook.Sample, error) {
	var sa *meltbook.Sample
	err := s.read(ctx, func(t *txn) error {
		var err error
		sa, err = t.sampleByCode(code)
		return err
	})
	return sa, err
}

const sampleColumns = `sa.id, sa.melt_id, sa.parent_id, sa.code, COALESCE(pa.code, ''), sa.label, sa.created_at`

func scanSample(sc interface{ Scan(...any) error }) (*meltbook.Sample, error) {
	var sa meltbook.Sample
	var parent sql.NullInt64
	var created string
	if err := sc.Scan(&sa.ID, &sa.MeltID, &parent, &sa.Code, &sa.ParentCode, &sa.Label, &created); err != nil {
		return nil, err
	}
	if parent.Valid {
		p := parent.Int64
		sa.ParentID = &p
	}
	var err error
	sa.CreatedAt, err = parseTime(created)
	return &sa, err
}

func (t *txn) sampleByCode(code string) (*meltbook.Sample, error) {
	sa, err := scanSample(t.queryRow(`SELECT `+sampleColumns+` FROM sample sa
		LEFT JOIN sample pa ON pa.id = sa.parent_id WHERE sa.code = ?`, code))
	if errors.Is(err, sql.ErrNoRows) {
		return nil, meltbook.Errorf(notFound, "sample", "no sample %s in the notebook", code)
	}
	if err != nil {
		return nil, fmt.Errorf("sample %s: %w", code, err)
	}
	return sa, nil
}

func (t *txn) sampleByID(id int64) (*meltbook.Sample, error) {
	sa, err := scanSample(t.queryRow(`SELECT `+sampleColumns+` FROM sample sa
		LEFT JOIN sample pa ON pa.id = sa.parent_id WHERE sa.id = ?`, id))
	if err != nil {
		return nil, fmt.Errorf("sample %d: %w", id, err)
	}
	return sa, nil
}

// DeriveSample records a new piece made from the sample parentCode by
// step (e.g. an anneal), remembering its parent. The new code extends the
// parent's with the step's letter (a anneal, s melt-spin, m arc-melt,
// x other) and the next free number: "QX-0042" -> "QX-0042.a1". The step is
// the new sample's step 1; without a time it gets now, without an operator
// who. It returns the new sample.
func (s *Store) DeriveSample(ctx context.Context, who, parentCode string, step meltbook.ProcessStep, label string) (*meltbook.Sample, error) {
	step.ID = 0
	if step.Operator == "" {
		step.Operator = who
	}
	if err := step.Validate(); err != nil {
		return nil, err
	}
	var out *meltbook.Sample
	err := s.write(ctx, who, func(t *txn) error {
		parent, err := t.sampleByCode(parentCode)
		if err != nil {
			return err
		}
		code, err := t.nextDerivedCode(parent.Code + "." + derivedCodeLetter[step.Kind])
		if err != nil {
			return err
		}
		sa := &meltbook.Sample{MeltID: parent.MeltID, ParentID: &parent.ID, Code: code,
			ParentCode: parent.Code, Label: label, CreatedAt: t.now}
		if err := t.insertSample(sa); err != nil {
			return err
		}
		if step.At.IsZero() {
			step.At = t.now
		}
		if err := t.insertStep(sa.MeltID, sa, 1, &step); err != nil {
			return err
		}
		out = sa
		return t.refreshCoolingRate(sa.MeltID)
	})
	return out, err
}

// nextDerivedCode returns stem followed by one more than the highest
// number any sample code stem+digits uses.
func (t *txn) nextDerivedCode(stem string) (string, error) {
	rows, err := t.query(`SELECT code FROM sample WHERE code > ? AND code < ?`, stem, stem+":") // ':' follows '9'
	if err != nil {
		return "", fmt.Errorf("derived code: %w", err)
	}
	defer rows.Close()
	highest := 0
	for rows.Next() {
		var code string
		if err := rows.Scan(&code); err != nil {
			return "", err
		}
		if n, ok := codeNumber(code, stem); ok && n > highest {
			highest = n
		}
	}
	if err := rows.Err(); err != nil {
		return "", err
	}
	return fmt.Sprintf("%s%d", stem, highest+1), nil
}

// AmendSample changes a sample's label or time, with a reason.
func (s *Store) AmendSample(ctx context.Context, who, code string, u meltbook.SampleUpdate, why string) ([]meltbook.HistoryEntry, error) {
	if err := needReason(why); err != nil {
		return nil, err
	}
	var out []meltbook.HistoryEntry
	err := s.write(ctx, who, func(t *txn) error {
		sa, err := t.sampleByCode(code)
		if err != nil {
			return err
		}
		var cs []change
		if u.Label != nil && *u.Label != sa.Label {
			cs = append(cs, change{"label", sa.Label, *u.Label})
			sa.Label = *u.Label
		}
		if u.CreatedAt != nil && !u.CreatedAt.Equal(sa.CreatedAt) {
			cs = append(cs, change{"created", formatTime(sa.CreatedAt), formatTime(*u.CreatedAt)})
			sa.CreatedAt = u.CreatedAt.UTC()
		}
		if _, err := t.exec(`UPDATE sample SET label = ?, created_at = ? WHERE id = ?`,
			sa.Label, formatTime(sa.CreatedAt), sa.ID); err != nil {
			return fmt.Errorf("amend sample %s: %w", code, err)
		}
		out, err = t.recordAmendment(sa.MeltID, "sample", sa.ID, cs, why)
		return err
	})
	return out, err
}

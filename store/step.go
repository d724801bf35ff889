package store

import (
	"context"
	"database/sql"
	"errors"
	"fmt"

	"meltbook"
)

// insertStep writes a validated step as step seq of sample sa.
func (t *txn) insertStep(meltID int64, sa *meltbook.Sample, seq int, st *meltbook.ProcessStep) error {
	st.SampleID = sa.ID
	st.Seq = seq
	st.At = st.At.UTC()
	id, err := t.insert(`INSERT INTO process_step (id, sample_id, seq, kind, done_at, operator, notes)
		VALUES (?, ?, ?, ?, ?, ?, ?) RETURNING id`,
		idArg(st.ID), sa.ID, seq, string(st.Kind), formatTime(st.At), st.Operator, st.Notes)
	if err != nil {
		return fmt.Errorf("sample %s step %d: %w", sa.Code, seq, err)
	}
	st.ID = id
	if err := t.insertParams(st); err != nil {
		return fmt.Errorf("sample %s step %d: %w", sa.Code, seq, err)
	}
	return t.recordCreate(meltID, "step", st.ID, st)
}

func (t *txn) insertParams(st *meltbook.ProcessStep) error {
	for i, p := range st.Params {
		spec, _ := meltbook.ParamSpecFor(st.Kind, p.Name)
		var value any
		if spec.Dimension != meltbook.Text {
			value = p.SI
		}
		if _, err := t.exec(`INSERT INTO step_param (step_id, position, name, value_si, unit, text_value)
			VALUES (?, ?, ?, ?, ?, ?)`, st.ID, i, p.Name, value, p.Unit, p.Text); err != nil {
			return err
		}
	}
	return nil
}

// AddStep records a further step done to a sample, numbered after its
// last one. Without a time it gets now, without an operator who.
func (s *Store) AddStep(ctx context.Context, who, sampleCode string, step meltbook.ProcessStep) (*meltbook.ProcessStep, error) {
	step.ID = 0
	if step.Operator == "" {
		step.Operator = who
	}
	if err := step.Validate(); err != nil {
		return nil, err
	}
	err := s.write(ctx, who, func(t *txn) error {
		sa, err := t.sampleByCode(sampleCode)
		if err != nil {
			return err
		}
		var last int
		if err := t.queryRow(`SELECT COALESCE(MAX(seq), 0) FROM process_step WHERE sample_id = ?`, sa.ID).Scan(&last); err != nil {
			return fmt.Errorf("sample %s steps: %w", sampleCode, err)
		}
		if step.At.IsZero() {
			step.At = t.now
		}
		if err := t.insertStep(sa.MeltID, sa, last+1, &step); err != nil {
			return err
		}
		return t.refreshCoolingRate(sa.MeltID)
	})
	if err != nil {
		return nil, err
	}
	return &step, nil
}

const stepColumns = `id, sample_id, seq, kind, done_at, operator, notes`

func scanStep(sc interface{ Scan(...any) error }) (*meltbook.ProcessStep, error) {
	var st meltbook.ProcessStep
	var kind, at string
	if err := sc.Scan(&st.ID, &st.SampleID, &st.Seq, &kind, &at, &st.Operator, &st.Notes); err != nil {
		return nil, err
	}
	st.Kind = meltbook.StepKind(kind)
	var err error
	st.At, err = parseTime(at)
	return &st, err
}

func (t *txn) loadParams(st *meltbook.ProcessStep) error {
	rows, err := t.query(`SELECT name, value_si, unit, text_value FROM step_param WHERE step_id = ? ORDER BY position`, st.ID)
	if err != nil {
		return err
	}
	defer rows.Close()
	st.Params = nil
	for rows.Next() {
		var p meltbook.Param
		var v sql.NullFloat64
		if err := rows.Scan(&p.Name, &v, &p.Unit, &p.Text); err != nil {
			return err
		}
		p.SI = v.Float64
		st.Params = append(st.Params, p)
	}
	return rows.Err()
}

func (t *txn) stepByID(id int64) (*meltbook.ProcessStep, error) {
	st, err := scanStep(t.queryRow(`SELECT `+stepColumns+` FROM process_step WHERE id = ?`, id))
	if errors.Is(err, sql.ErrNoRows) {
		return nil, meltbook.Errorf(notFound, "step", "no process step %d in the notebook", id)
	}
	if err != nil {
		return nil, fmt.Errorf("step %d: %w", id, err)
	}
	return st, t.loadParams(st)
}

// formatParam writes a parameter for the history: "1.2e-05 m (entered
// in µm)" or the text.
func formatParam(kind meltbook.StepKind, p *meltbook.Param) string {
	if p == nil {
		return ""
	}
	spec, _ := meltbook.ParamSpecFor(kind, p.Name)
	if spec.Dimension == meltbook.Text {
		return p.Text
	}
	s := formatFloat(p.SI)
	if u := spec.Dimension.SIUnit(); u != "" {
		s += " " + u
	}
	if p.Unit != "" && p.Unit != spec.Dimension.SIUnit() {
		s += " (entered in " + p.Unit + ")"
	}
	return s
}

// AmendStep changes a step's time, operator, notes or parameters, with a
// reason; one history row per field ("<kind>.<param>" for parameters).
func (s *Store) AmendStep(ctx context.Context, who string, stepID int64, u meltbook.StepUpdate, why string) ([]meltbook.HistoryEntry, error) {
	if err := needReason(why); err != nil {
		return nil, err
	}
	var out []meltbook.HistoryEntry
	err := s.write(ctx, who, func(t *txn) error {
		st, err := t.stepByID(stepID)
		if err != nil {
			return err
		}
		sa, err := t.sampleByID(st.SampleID)
		if err != nil {
			return err
		}
		var cs []change
		if u.At != nil && !u.At.Equal(st.At) {
			cs = append(cs, change{"at", formatTime(st.At), formatTime(*u.At)})
			st.At = u.At.UTC()
		}
		if u.Operator != nil && *u.Operator != st.Operator {
			cs = append(cs, change{"operator", st.Operator, *u.Operator})
			st.Operator = *u.Operator
		}
		if u.Notes != nil && *u.Notes != st.Notes {
			cs = append(cs, change{"notes", st.Notes, *u.Notes})
			st.Notes = *u.Notes
		}
		paramsChanged := false
		for _, name := range u.Unset {
			i := paramIndex(st.Params, name)
			if i < 0 {
				return meltbook.Errorf(invalid, string(st.Kind)+"."+name, "step %d records no such parameter", st.ID)
			}
			cs = append(cs, change{string(st.Kind) + "." + name, formatParam(st.Kind, &st.Params[i]), ""})
			st.Params = append(st.Params[:i:i], st.Params[i+1:]...)
			paramsChanged = true
		}
		for _, p := range u.Set {
			p := p
			var old *meltbook.Param
			if i := paramIndex(st.Params, p.Name); i >= 0 {
				old = &st.Params[i]
			}
			if old != nil && *old == p {
				continue
			}
			cs = append(cs, change{string(st.Kind) + "." + p.Name, formatParam(st.Kind, old), formatParam(st.Kind, &p)})
			if old != nil {
				*old = p
			} else {
				st.Params = append(st.Params, p)
			}
			paramsChanged = true
		}
		if st.Operator == "" {
			return meltbook.Errorf(invalid, "operator", "a step needs an operator")
		}
		if err := st.Validate(); err != nil {
			return err
		}
		if _, err := t.exec(`UPDATE process_step SET done_at = ?, operator = ?, notes = ? WHERE id = ?`,
			formatTime(st.At), st.Operator, st.Notes, st.ID); err != nil {
			return fmt.Errorf("amend step %d: %w", stepID, err)
		}
		if paramsChanged {
			if _, err := t.exec(`DELETE FROM step_param WHERE step_id = ?`, st.ID); err != nil {
				return fmt.Errorf("amend step %d: %w", stepID, err)
			}
			if err := t.insertParams(st); err != nil {
				return fmt.Errorf("amend step %d: %w", stepID, err)
			}
			if err := t.refreshCoolingRate(sa.MeltID); err != nil {
				return err
			}
		}
		out, err = t.recordAmendment(sa.MeltID, "step", st.ID, cs, why)
		return err
	})
	return out, err
}

func paramIndex(ps []meltbook.Param, name string) int {
	for i := range ps {
		if ps[i].Name == name {
			return i
		}
	}
	return -1
}

package store

import (
	"context"
	"database/sql"
	"fmt"

	"meltbook"
)

func (t *txn) insertOutcome(meltID int64, sa *meltbook.Sample, o *meltbook.Outcome) error {
	o.SampleID = sa.ID
	o.At = o.At.UTC()
	id, err := t.insert(`INSERT INTO outcome (id, sample_id, kind, lattice, approximant_order, phase_name, fraction,
			source, recorded_by, evidence, status, decided_at)
		VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?) RETURNING id`,
		idArg(o.ID), sa.ID, string(o.Kind), o.Lattice, o.Order, o.Name, nullFloat(o.Fraction),
		string(o.Source), o.RecordedBy, o.Evidence, string(o.Status), formatTime(o.At))
	if err != nil {
		return fmt.Errorf("outcome on %s: %w", sa.Code, err)
	}
	o.ID = id
	return t.recordCreate(meltID, "outcome", o.ID, o)
}

// AddOutcome records a person's decision about a phase in a sample. It is
// stored as source "person", status "confirmed", and always ranks above
// automatic proposals on the same sample. RecordedBy defaults to who, the
// time to now.
func (s *Store) AddOutcome(ctx context.Context, who, sampleCode string, o meltbook.Outcome) (*meltbook.Outcome, error) {
	o.Source, o.Status = meltbook.ByPerson, meltbook.Confirmed
	return s.addOutcome(ctx, who, sampleCode, o)
}

// ProposeOutcome records an automatic proposal (e.g. from diffraction
// indexing) as source "automatic", status "proposed", for a person to
// confirm or reject. who names the program and version that proposed it.
func (s *Store) ProposeOutcome(ctx context.Context, who, sampleCode string, o meltbook.Outcome) (*meltbook.Outcome, error) {
	o.Source, o.Status = meltbook.ByAutomatic, meltbook.Proposed
	return s.addOutcome(ctx, who, sampleCode, o)
}

func (s *Store) addOutcome(ctx context.Context, who, sampleCode string, o meltbook.Outcome) (*meltbook.Outcome, error) {
	o.ID = 0
	if o.RecordedBy == "" {
		o.RecordedBy = who
	}
	if err := o.Validate(); err != nil {
		return nil, err
	}
	err := s.write(ctx, who, func(t *txn) error {
		sa, err := t.sampleByCode(sampleCode)
		if err != nil {
			return err
		}
		if o.At.IsZero() {
			o.At = t.now
		}
		o.SampleCode = ""
		return t.insertOutcome(sa.MeltID, sa, &o)
	})
	if err != nil {
		return nil, err
	}
	o.SampleCode = sampleCode
	return &o, nil
}

// ConfirmProposal marks an automatic proposal confirmed by who; why is
// optional. Only a proposal still awaiting a decision can be confirmed.
func (s *Store) ConfirmProposal(ctx context.Context, who string, outcomeID int64, why string) error {
	return s.decideProposal(ctx, who, outcomeID, meltbook.Confirmed, why)
}

// RejectProposal marks an automatic proposal rejected by who; why is
// optional. A rejected proposal stays in the notebook but never counts.
func (s *Store) RejectProposal(ctx context.Context, who string, outcomeID int64, why string) error {
	return s.decideProposal(ctx, who, outcomeID, meltbook.Rejected, why)
}

func (s *Store) decideProposal(ctx context.Context, who string, id int64, status meltbook.ProposalStatus, why string) error {
	return s.write(ctx, who, func(t *txn) error {
		o, meltID, err := t.outcomeByID(id)
		if err != nil {
			return err
		}
		if o.Source != meltbook.ByAutomatic {
			return meltbook.Errorf(conflict, "outcome", "outcome %d is a person's, not an automatic proposal", id)
		}
		if o.Status != meltbook.Proposed {
			return meltbook.Errorf(conflict, "outcome", "proposal %d was already %s", id, o.Status)
		}
		if _, err := t.exec(`UPDATE outcome SET status = ? WHERE id = ?`, string(status), id); err != nil {
			return fmt.Errorf("outcome %d: %w", id, err)
		}
		action := "confirm"
		if status == meltbook.Rejected {
			action = "reject"
		}
		_, err = t.record(meltID, "outcome", id, action, change{"status", string(o.Status), string(status)}, why)
		return err
	})
}

const outcomeColumns = `o.id, o.sample_id, sa.code, o.kind, o.lattice, o.approximant_order, o.phase_name, o.fraction,
	o.source, o.recorded_by, o.evidence, o.status, o.decided_at`

// outcomeRank orders outcomes: a person's, confirmed, proposed, rejected.
const outcomeRank = `CASE WHEN o.source = 'person' THEN 0 WHEN o.status = 'confirmed' THEN 1 WHEN o.status = 'proposed' THEN 2 ELSE 3 END`

func scanOutcome(sc interface{ Scan(...any) error }) (*meltbook.Outcome, error) {
	var o meltbook.Outcome
	var kind, source, status, at string
	var fraction sql.NullFloat64
	if err := sc.Scan(&o.ID, &o.SampleID, &o.SampleCode, &kind, &o.Lattice, &o.Order, &o.Name, &fraction,
		&source, &o.RecordedBy, &o.Evidence, &status, &at); err != nil {
		return nil, err
	}
	o.Kind, o.Source, o.Status = meltbook.PhaseKind(kind), meltbook.OutcomeSource(source), meltbook.ProposalStatus(status)
	o.Fraction = floatPtr(fraction)
	var err error
	o.At, err = parseTime(at)
	return &o, err
}

func (t *txn) outcomeByID(id int64) (*meltbook.Outcome, int64, error) {
	rows, err := t.query(`SELECT `+outcomeColumns+`, sa.melt_id FROM outcome o JOIN sample sa ON sa.id = o.sample_id WHERE o.id = ?`, id)
	if err != nil {
		return nil, 0, fmt.Errorf("outcome %d: %w", id, err)
	}
	defer rows.Close()
	if !rows.Next() {
		if err := rows.Err(); err != nil {
			return nil, 0, fmt.Errorf("outcome %d: %w", id, err)
		}
		return nil, 0, meltbook.Errorf(notFound, "outcome", "no outcome %d in the notebook", id)
	}
	var meltID int64
	o, err := scanOutcome(scanPrefix{rows, &meltID})
	if err != nil {
		return nil, 0, fmt.Errorf("outcome %d: %w", id, err)
	}
	return o, meltID, nil
}

// scanPrefix scans a row whose columns are a scanner's followed by extra
// trailing ones.
type scanPrefix struct {
	rows  *sql.Rows
	extra any
}

func (p scanPrefix) Scan(dest ...any) error { return p.rows.Scan(append(dest, p.extra)...) }

// AmendOutcome changes a person's outcome, with a reason. Automatic
// proposals cannot be amended: confirm or reject them, and record your own.
func (s *Store) AmendOutcome(ctx context.Context, who string, id int64, u meltbook.OutcomeUpdate, why string) ([]meltbook.HistoryEntry, error) {
	if err := needReason(why); err != nil {
		return nil, err
	}
	var out []meltbook.HistoryEntry
	err := s.write(ctx, who, func(t *txn) error {
		o, meltID, err := t.outcomeByID(id)
		if err != nil {
			return err
		}
		if o.Source != meltbook.ByPerson {
			return meltbook.Errorf(conflict, "outcome", "outcome %d is an automatic proposal; confirm or reject it, or record your own outcome", id)
		}
		var cs []change
		str := func(field string, dst *string, v *string) {
			if v != nil && *v != *dst {
				cs = append(cs, change{field, *dst, *v})
				*dst = *v
			}
		}
		if u.Kind != nil && *u.Kind != o.Kind {
			cs = append(cs, change{"kind", string(o.Kind), string(*u.Kind)})
			o.Kind = *u.Kind
		}
		str("lattice", &o.Lattice, u.Lattice)
		str("order", &o.Order, u.Order)
		str("name", &o.Name, u.Name)
		str("evidence", &o.Evidence, u.Evidence)
		if u.Fraction != nil && differs(u.Fraction, o.Fraction) {
			cs = append(cs, change{"fraction", formatOptionalFloat(o.Fraction), formatFloat(*u.Fraction)})
			o.Fraction = u.Fraction
		}
		if err := o.Validate(); err != nil {
			return err
		}
		if _, err := t.exec(`UPDATE outcome SET kind = ?, lattice = ?, approximant_order = ?, phase_name = ?, fraction = ?, evidence = ?
			WHERE id = ?`, string(o.Kind), o.Lattice, o.Order, o.Name, nullFloat(o.Fraction), o.Evidence, id); err != nil {
			return fmt.Errorf("amend outcome %d: %w", id, err)
		}
		out, err = t.recordAmendment(meltID, "outcome", id, cs, why)
		return err
	})
	return out, err
}

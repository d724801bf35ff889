package store

import (
	"context"
	"database/sql"
	"fmt"
	"slices"
	"strconv"
	"strings"

	"meltbook"
)

// checkUncertainty refuses an uncertainty for an element that was not
// measured (the store keeps each uncertainty beside its fraction).
func checkUncertainty(mc *meltbook.MeasuredComposition) error {
	seen := map[string]bool{}
	for _, u := range mc.Uncertainty {
		if seen[u.Element] {
			return meltbook.Errorf(invalid, "uncertainty", "%s appears twice", u.Element)
		}
		seen[u.Element] = true
		if !slices.ContainsFunc(mc.Fractions, func(f meltbook.ElementFraction) bool { return f.Element == u.Element }) {
			return meltbook.Errorf(invalid, "uncertainty", "%s has an uncertainty but no measured fraction", u.Element)
		}
	}
	return nil
}

func (t *txn) insertMeasuredFractions(mc *meltbook.MeasuredComposition) error {
	unc := map[string]float64{}
	for _, u := range mc.Uncertainty {
		unc[u.Element] = u.Fraction
	}
	for i, f := range mc.Fractions {
		var u any
		if v, ok := unc[f.Element]; ok {
			u = v
		}
		if _, err := t.exec(`INSERT INTO measured_fraction (measurement_id, position, element, fraction, uncertainty)
			VALUES (?, ?, ?, ?, ?)`, mc.ID, i, f.Element, f.Fraction, u); err != nil {
			return fmt.Errorf("measured composition %d: %w", mc.ID, err)
		}
	}
	return nil
}

func (t *txn) insertMeasurement(meltID int64, mc *meltbook.MeasuredComposition) error {
	mc.At = mc.At.UTC()
	id, err := t.insert(`INSERT INTO measured_composition (id, sample_id, method, measured_at, operator, notes)
		VALUES (?, ?, ?, ?, ?, ?) RETURNING id`, idArg(mc.ID), mc.SampleID, mc.Method, formatTime(mc.At), mc.Operator, mc.Notes)
	if err != nil {
		return fmt.Errorf("measured composition: %w", err)
	}
	mc.ID = id
	if err := t.insertMeasuredFractions(mc); err != nil {
		return err
	}
	return t.recordCreate(meltID, "measurement", mc.ID, mc)
}

// AddMeasuredComposition records a composition measured on a sample (EDS,
// ICP-OES, ...), with per-element standard uncertainties. Without a time
// it gets now, without an operator who.
func (s *Store) AddMeasuredComposition(ctx context.Context, who, sampleCode string, mc meltbook.MeasuredComposition) (*meltbook.MeasuredComposition, error) {
	mc.ID = 0
	if mc.Operator == "" {
		mc.Operator = who
	}
	if err := mc.Validate(); err != nil {
		return nil, err
	}
	if err := checkUncertainty(&mc); err != nil {
		return nil, err
	}
	err := s.write(ctx, who, func(t *txn) error {
		sa, err := t.sampleByCode(sampleCode)
		if err != nil {
			return err
		}
		mc.SampleID = sa.ID
		if mc.At.IsZero() {
			mc.At = t.now
		}
		return t.insertMeasurement(sa.MeltID, &mc)
	})
	if err != nil {
		return nil, err
	}
	return &mc, nil
}

const measurementColumns = `id, sample_id, method, measured_at, operator, notes`

func (t *txn) scanMeasurements(rows *sql.Rows) ([]meltbook.MeasuredComposition, error) {
	defer rows.Close()
	var out []meltbook.MeasuredComposition
	for rows.Next() {
		var mc meltbook.MeasuredComposition
		var at string
		if err := rows.Scan(&mc.ID, &mc.SampleID, &mc.Method, &at, &mc.Operator, &mc.Notes); err != nil {
			return nil, err
		}
		var err error
		if mc.At, err = parseTime(at); err != nil {
			return nil, err
		}
		out = append(out, mc)
	}
	if err := rows.Err(); err != nil {
		return nil, err
	}
	rows.Close()
	for i := range out {
		if err := t.loadMeasuredFractions(&out[i]); err != nil {
			return nil, err
		}
	}
	return out, nil
}

func (t *txn) loadMeasuredFractions(mc *meltbook.MeasuredComposition) error {
	rows, err := t.query(`SELECT element, fraction, uncertainty FROM measured_fraction
		WHERE measurement_id = ? ORDER BY position`, mc.ID)
	if err != nil {
		return err
	}
	defer rows.Close()
	mc.Fractions, mc.Uncertainty = nil, nil
	for rows.Next() {
		var f meltbook.ElementFraction
		var u sql.NullFloat64
		if err := rows.Scan(&f.Element, &f.Fraction, &u); err != nil {
			return err
		}
		mc.Fractions = append(mc.Fractions, f)
		if u.Valid {
			mc.Uncertainty = append(mc.Uncertainty, meltbook.ElementFraction{Element: f.Element, Fraction: u.Float64})
		}
	}
	return rows.Err()
}

func (t *txn) measurementByID(id int64) (*meltbook.MeasuredComposition, error) {
	rows, err := t.query(`SELECT `+measurementColumns+` FROM measured_composition WHERE id = ?`, id)
	if err != nil {
		return nil, fmt.Errorf("measured composition %d: %w", id, err)
	}
	ms, err := t.scanMeasurements(rows)
	if err != nil {
		return nil, fmt.Errorf("measured composition %d: %w", id, err)
	}
	if len(ms) == 0 {
		return nil, meltbook.Errorf(notFound, "measurement", "no measured composition %d in the notebook", id)
	}
	return &ms[0], nil
}

// AmendMeasuredComposition changes a measured composition, with a reason.
func (s *Store) AmendMeasuredComposition(ctx context.Context, who string, id int64, u meltbook.MeasurementUpdate, why string) ([]meltbook.HistoryEntry, error) {
	if err := needReason(why); err != nil {
		return nil, err
	}
	var out []meltbook.HistoryEntry
	err := s.write(ctx, who, func(t *txn) error {
		mc, err := t.measurementByID(id)
		if err != nil {
			return err
		}
		sa, err := t.sampleByID(mc.SampleID)
		if err != nil {
			return err
		}
		var cs []change
		str := func(field string, dst *string, v *string) {
			if v != nil && *v != *dst {
				cs = append(cs, change{field, *dst, *v})
				*dst = *v
			}
		}
		str("method", &mc.Method, u.Method)
		str("operator", &mc.Operator, u.Operator)
		str("notes", &mc.Notes, u.Notes)
		if u.At != nil && !u.At.Equal(mc.At) {
			cs = append(cs, change{"at", formatTime(mc.At), formatTime(*u.At)})
			mc.At = u.At.UTC()
		}
		fractionsChanged := false
		if u.Fractions != nil && formatFractions(u.Fractions) != formatFractions(mc.Fractions) {
			cs = append(cs, change{"fractions", formatFractions(mc.Fractions), formatFractions(u.Fractions)})
			mc.Fractions = u.Fractions
			fractionsChanged = true
		}
		if u.Uncertainty != nil && formatFractions(u.Uncertainty) != formatFractions(mc.Uncertainty) {
			cs = append(cs, change{"uncertainty", formatFractions(mc.Uncertainty), formatFractions(u.Uncertainty)})
			mc.Uncertainty = u.Uncertainty
			fractionsChanged = true
		}
		if strings.TrimSpace(mc.Operator) == "" {
			return meltbook.Errorf(invalid, "operator", "a measurement needs an operator")
		}
		if err := mc.Validate(); err != nil {
			return err
		}
		if err := checkUncertainty(mc); err != nil {
			return err
		}
		if _, err := t.exec(`UPDATE measured_composition SET method = ?, measured_at = ?, operator = ?, notes = ? WHERE id = ?`,
			mc.Method, formatTime(mc.At), mc.Operator, mc.Notes, mc.ID); err != nil {
			return fmt.Errorf("amend measured composition %d: %w", id, err)
		}
		if fractionsChanged {
			if _, err := t.exec(`DELETE FROM measured_fraction WHERE measurement_id = ?`, mc.ID); err != nil {
				return fmt.Errorf("amend measured composition %d: %w", id, err)
			}
			if err := t.insertMeasuredFractions(mc); err != nil {
				return err
			}
		}
		out, err = t.recordAmendment(sa.MeltID, "measurement", mc.ID, cs, why)
		return err
	})
	return out, err
}

func (t *txn) insertObservation(meltID int64, o *meltbook.SymmetryObservation) error {
	o.At = o.At.UTC()
	id, err := t.insert(`INSERT INTO symmetry_observation (id, sample_id, observed_at, operator, notes)
		VALUES (?, ?, ?, ?, ?) RETURNING id`, idArg(o.ID), o.SampleID, formatTime(o.At), o.Operator, o.Notes)
	if err != nil {
		return fmt.Errorf("symmetry observation: %w", err)
	}
	o.ID = id
	if err := t.insertFolds(o); err != nil {
		return err
	}
	return t.recordCreate(meltID, "observation", o.ID, o)
}

func (t *txn) insertFolds(o *meltbook.SymmetryObservation) error {
	for i, f := range o.Folds {
		if _, err := t.exec(`INSERT INTO symmetry_fold (observation_id, position, fold) VALUES (?, ?, ?)`, o.ID, i, f); err != nil {
			return fmt.Errorf("symmetry observation %d: %w", o.ID, err)
		}
	}
	return nil
}

// AddSymmetryObservation records the rotational symmetries seen in
// electron diffraction of a sample. Without a time it gets now, without an
// operator who.
func (s *Store) AddSymmetryObservation(ctx context.Context, who, sampleCode string, o meltbook.SymmetryObservation) (*meltbook.SymmetryObservation, error) {
	o.ID = 0
	if o.Operator == "" {
		o.Operator = who
	}
	if err := o.Validate(); err != nil {
		return nil, err
	}
	err := s.write(ctx, who, func(t *txn) error {
		sa, err := t.sampleByCode(sampleCode)
		if err != nil {
			return err
		}
		o.SampleID = sa.ID
		if o.At.IsZero() {
			o.At = t.now
		}
		return t.insertObservation(sa.MeltID, &o)
	})
	if err != nil {
		return nil, err
	}
	return &o, nil
}

const observationColumns = `id, sample_id, observed_at, operator, notes`

func (t *txn) scanObservations(rows *sql.Rows) ([]meltbook.SymmetryObservation, error) {
	defer rows.Close()
	var out []meltbook.SymmetryObservation
	for rows.Next() {
		var o meltbook.SymmetryObservation
		var at string
		if err := rows.Scan(&o.ID, &o.SampleID, &at, &o.Operator, &o.Notes); err != nil {
			return nil, err
		}
		var err error
		if o.At, err = parseTime(at); err != nil {
			return nil, err
		}
		out = append(out, o)
	}
	if err := rows.Err(); err != nil {
		return nil, err
	}
	rows.Close()
	for i := range out {
		if err := t.loadFolds(&out[i]); err != nil {
			return nil, err
		}
	}
	return out, nil
}

func (t *txn) loadFolds(o *meltbook.SymmetryObservation) error {
	rows, err := t.query(`SELECT fold FROM symmetry_fold WHERE observation_id = ? ORDER BY position`, o.ID)
	if err != nil {
		return err
	}
	defer rows.Close()
	o.Folds = nil
	for rows.Next() {
		var f int
		if err := rows.Scan(&f); err != nil {
			return err
		}
		o.Folds = append(o.Folds, f)
	}
	return rows.Err()
}

func formatFolds(folds []int) string {
	parts := make([]string, len(folds))
	for i, f := range folds {
		parts[i] = strconv.Itoa(f)
	}
	return strings.Join(parts, ",")
}

// AmendSymmetryObservation changes a symmetry observation, with a reason.
func (s *Store) AmendSymmetryObservation(ctx context.Context, who string, id int64, u meltbook.ObservationUpdate, why string) ([]meltbook.HistoryEntry, error) {
	if err := needReason(why); err != nil {
		return nil, err
	}
	var out []meltbook.HistoryEntry
	err := s.write(ctx, who, func(t *txn) error {
		rows, err := t.query(`SELECT `+observationColumns+` FROM symmetry_observation WHERE id = ?`, id)
		if err != nil {
			return fmt.Errorf("symmetry observation %d: %w", id, err)
		}
		found, err := t.scanObservations(rows)
		if err != nil {
			return fmt.Errorf("symmetry observation %d: %w", id, err)
		}
		if len(found) == 0 {
			return meltbook.Errorf(notFound, "observation", "no symmetry observation %d in the notebook", id)
		}
		o := &found[0]
		sa, err := t.sampleByID(o.SampleID)
		if err != nil {
			return err
		}
		var cs []change
		if u.At != nil && !u.At.Equal(o.At) {
			cs = append(cs, change{"at", formatTime(o.At), formatTime(*u.At)})
			o.At = u.At.UTC()
		}
		if u.Operator != nil && *u.Operator != o.Operator {
			cs = append(cs, change{"operator", o.Operator, *u.Operator})
			o.Operator = *u.Operator
		}
		if u.Notes != nil && *u.Notes != o.Notes {
			cs = append(cs, change{"notes", o.Notes, *u.Notes})
			o.Notes = *u.Notes
		}
		foldsChanged := u.Folds != nil && !slices.Equal(u.Folds, o.Folds)
		if foldsChanged {
			cs = append(cs, change{"folds", formatFolds(o.Folds), formatFolds(u.Folds)})
			o.Folds = u.Folds
		}
		if strings.TrimSpace(o.Operator) == "" {
			return meltbook.Errorf(invalid, "operator", "an observation needs an operator")
		}
		if err := o.Validate(); err != nil {
			return err
		}
		if _, err := t.exec(`UPDATE symmetry_observation SET observed_at = ?, operator = ?, notes = ? WHERE id = ?`,
			formatTime(o.At), o.Operator, o.Notes, o.ID); err != nil {
			return fmt.Errorf("amend symmetry observation %d: %w", id, err)
		}
		if foldsChanged {
			if _, err := t.exec(`DELETE FROM symmetry_fold WHERE observation_id = ?`, o.ID); err != nil {
				return fmt.Errorf("amend symmetry observation %d: %w", id, err)
			}
			if err := t.insertFolds(o); err != nil {
				return err
			}
		}
		out, err = t.recordAmendment(sa.MeltID, "observation", o.ID, cs, why)
		return err
	})
	return out, err
}

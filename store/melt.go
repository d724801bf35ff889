package store

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"regexp"
	"strconv"
	"strings"

	"meltbook"
)

// NewMelt is one melt for CreateMelts: the melt, the steps done to its
// button in order (usually arc-melt, then melt-spin), and for runs logged
// after the fact the outcomes already decided on it.
type NewMelt struct {
	Melt  meltbook.Melt
	Steps []meltbook.ProcessStep
	// Outcomes are a person's (Source empty or "person") or automatic
	// proposals (Source "automatic", stored as proposed).
	Outcomes []meltbook.Outcome
}

// EntryError says which entry of a CreateMelts batch failed; the batch
// was not stored. Unwrap gives the *meltbook.Error.
type EntryError struct {
	Index int    // 0-based position in the batch
	Code  string // the entry's melt code
	Err   error
}

func (e *EntryError) Error() string {
	return fmt.Sprintf("melt %d (%s): %v", e.Index+1, e.Code, e.Err)
}

func (e *EntryError) Unwrap() error { return e.Err }

// CreateMelt logs a new melt with its own sample (same code as the melt)
// and the steps done to it, numbered from 1. It fills in m.ID and, when
// zero, m.CreatedAt (now). Steps without a time get m.CreatedAt, without an
// operator m.Operator. A melt or sample with the same code is a Conflict.
func (s *Store) CreateMelt(ctx context.Context, who string, m *meltbook.Melt, steps ...meltbook.ProcessStep) error {
	batch := []NewMelt{{Melt: *m, Steps: steps}}
	err := s.CreateMelts(ctx, who, batch)
	var ee *EntryError
	if errors.As(err, &ee) {
		err = ee.Err
	}
	if err == nil {
		*m = batch[0].Melt
	}
	return err
}

// CreateMelts logs many melts in one transaction: all are stored or none.
// It is the fast path for importing a run list. It fills in each entry's
// Melt.ID and zero CreatedAt as CreateMelt does (after a failure they mean
// nothing); a failing entry is named by an *EntryError.
func (s *Store) CreateMelts(ctx context.Context, who string, batch []NewMelt) error {
	for i := range batch {
		if err := prepareNewMelt(&batch[i], who); err != nil {
			return &EntryError{Index: i, Code: batch[i].Melt.Code, Err: err}
		}
	}
	return s.write(ctx, who, func(t *txn) error {
		for i := range batch {
			if err := t.createMelt(&batch[i]); err != nil {
				return &EntryError{Index: i, Code: batch[i].Melt.Code, Err: err}
			}
		}
		return nil
	})
}

// prepareNewMelt validates an entry and fills the defaults that do not
// depend on the clock.
func prepareNewMelt(nm *NewMelt, who string) error {
	nm.Melt.ID = 0
	if err := nm.Melt.Validate(); err != nil {
		return err
	}
	for i := range nm.Steps {
		nm.Steps[i].ID = 0
		if nm.Steps[i].Operator == "" {
			nm.Steps[i].Operator = nm.Melt.Operator
		}
		if err := nm.Steps[i].Validate(); err != nil {
			return err
		}
	}
	for i := range nm.Outcomes {
		o := &nm.Outcomes[i]
		o.ID = 0
		if o.Source == "" {
			o.Source = meltbook.ByPerson
		}
		if o.RecordedBy == "" {
			o.RecordedBy = who
		}
		o.Status = meltbook.Confirmed
		if o.Source == meltbook.ByAutomatic {
			o.Status = meltbook.Proposed
		}
		if err := o.Validate(); err != nil {
			return err
		}
	}
	return nil
}

func (t *txn) createMelt(nm *NewMelt) error {
	m := &nm.Melt
	if m.CreatedAt.IsZero() {
		m.CreatedAt = t.now
	}
	m.CreatedAt = m.CreatedAt.UTC()
	group, raynor := t.s.eOverAColumns(m.Nominal)
	id, err := t.insert(`INSERT INTO melt (id, code, operator, created_at, composition_entered, target_mass_g,
			mass_after_melt_g, notes, element_set, e_over_a_group, e_over_a_raynor)
		VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?) RETURNING id`,
		idArg(m.ID), m.Code, m.Operator, formatTime(m.CreatedAt), m.CompositionEntered, m.TargetMassGrams,
		nullFloat(m.MassAfterMeltGrams), m.Notes, elementSet(m.Nominal), group, raynor)
	if isConstraint(err) {
		return meltbook.Errorf(conflict, "code", "melt %s already exists", m.Code)
	}
	if err != nil {
		return fmt.Errorf("create melt %s: %w", m.Code, err)
	}
	m.ID = id
	if err := t.insertComposition(m); err != nil {
		return err
	}
	if err := t.recordCreate(m.ID, "melt", m.ID, m); err != nil {
		return err
	}
	sample := &meltbook.Sample{MeltID: m.ID, Code: m.Code, CreatedAt: m.CreatedAt}
	if err := t.insertSample(sample); err != nil {
		return err
	}
	for i := range nm.Steps {
		st := &nm.Steps[i]
		if st.At.IsZero() {
			st.At = m.CreatedAt
		}
		if err := t.insertStep(m.ID, sample, i+1, st); err != nil {
			return err
		}
	}
	for i := range nm.Outcomes {
		o := &nm.Outcomes[i]
		if o.At.IsZero() {
			o.At = m.CreatedAt
		}
		if err := t.insertOutcome(m.ID, sample, o); err != nil {
			return err
		}
	}
	return t.refreshCoolingRate(m.ID)
}

// insertComposition writes the nominal composition and weigh-out rows.
func (t *txn) insertComposition(m *meltbook.Melt) error {
	for i, f := range m.Nominal {
		if _, err := t.exec(`INSERT INTO melt_element (melt_id, position, element, fraction) VALUES (?, ?, ?, ?)`,
			m.ID, i, f.Element, f.Fraction); err != nil {
			return fmt.Errorf("melt %s composition: %w", m.Code, err)
		}
	}
	seen := map[string]bool{}
	for i, w := range m.WeighOut {
		if seen[w.Element] {
			return meltbook.Errorf(invalid, "weigh-out."+w.Element, "the element appears twice")
		}
		seen[w.Element] = true
		if _, err := t.exec(`INSERT INTO weigh_out_line (melt_id, position, element, planned_g, weighed_g, purity_pct, loss_pct)
			VALUES (?, ?, ?, ?, ?, ?, ?)`,
			m.ID, i, w.Element, w.PlannedGrams, nullFloat(w.WeighedGrams), w.PurityPercent, w.LossPercent); err != nil {
			return fmt.Errorf("melt %s weigh-out: %w", m.Code, err)
		}
	}
	return nil
}

// refreshCoolingRate sets the melt's cooling rate from the first melt-spin
// step (oldest sample first, then step order) that records one.
func (t *txn) refreshCoolingRate(meltID int64) error {
	_, err := t.exec(`UPDATE melt SET cooling_rate_k_per_s = (
			SELECT p.value_si FROM step_param p
			JOIN process_step st ON st.id = p.step_id
			JOIN sample sa ON sa.id = st.sample_id
			WHERE sa.melt_id = ? AND st.kind = 'melt-spin' AND p.name = 'cooling-rate'
			ORDER BY sa.id, st.seq
			LIMIT 1)
		WHERE id = ?`, meltID, meltID)
	if err != nil {
		return fmt.Errorf("cooling rate: %w", err)
	}
	return nil
}

var codePrefix = regexp.MustCompile(`^[A-Za-z0-9]{1,12}$`)

// NextMeltCode returns the next free melt code for prefix: the prefix, a
// hyphen and a number one above the highest already used with that
// prefix, zero-padded to four digits ("QX" -> "QX-0001", then "QX-0002";
// after "QX-9999" comes "QX-10000"). The prefix is 1-12 letters or digits.
// Two writers racing for the same code meet a Conflict in CreateMelt.
func (s *Store) NextMeltCode(ctx context.Context, prefix string) (string, error) {
	if !codePrefix.MatchString(prefix) {
		return "", meltbook.Errorf(invalid, "prefix", "%q: a code prefix is 1 to 12 letters or digits", prefix)
	}
	highest := 0
	err := s.read(ctx, func(t *txn) error {
		// Every code "PREFIX-..." sorts between "PREFIX-" and "PREFIX." ('.' follows '-').
		rows, err := t.query(`SELECT code FROM melt WHERE code >= ? AND code < ?`, prefix+"-", prefix+".")
		if err != nil {
			return err
		}
		defer rows.Close()
		for rows.Next() {
			var code string
			if err := rows.Scan(&code); err != nil {
				return err
			}
			if n, ok := codeNumber(code, prefix+"-"); ok && n > highest {
				highest = n
			}
		}
		return rows.Err()
	})
	if err != nil {
		return "", fmt.Errorf("next melt code: %w", err)
	}
	return fmt.Sprintf("%s-%04d", prefix, highest+1), nil
}

// codeNumber parses the all-digit rest of code after stem.
func codeNumber(code, stem string) (int, bool) {
	rest, ok := strings.CutPrefix(code, stem)
	if !ok || rest == "" || strings.Trim(rest, "0123456789") != "" {
		return 0, false
	}
	n, err := strconv.Atoi(rest)
	return n, err == nil
}

// FindMeltByCode returns a melt with its nominal composition and weigh-out.
func (s *Store) FindMeltByCode(ctx context.Context, code string) (*meltbook.Melt, error) {
	var m *meltbook.Melt
	err := s.read(ctx, func(t *txn) error {
		var err error
		m, err = t.meltByCode(code)
		return err
	})
	return m, err
}

const meltColumns = `id, code, operator, created_at, composition_entered, target_mass_g, mass_after_melt_g, notes`

func scanMelt(sc interface{ Scan(...any) error }) (*meltbook.Melt, error) {
	var m meltbook.Melt
	var created string
	var after sql.NullFloat64
	if err := sc.Scan(&m.ID, &m.Code, &m.Operator, &created, &m.CompositionEntered, &m.TargetMassGrams, &after, &m.Notes); err != nil {
		return nil, err
	}
	var err error
	if m.CreatedAt, err = parseTime(created); err != nil {
		return nil, err
	}
	m.MassAfterMeltGrams = floatPtr(after)
	return &m, nil
}

func (t *txn) meltByCode(code string) (*meltbook.Melt, error) {
	m, err := scanMelt(t.queryRow(`SELECT `+meltColumns+` FROM melt WHERE code = ?`, code))
	if errors.Is(err, sql.ErrNoRows) {
		return nil, meltbook.Errorf(notFound, "melt", "no melt %s in the notebook", code)
	}
	if err != nil {
		return nil, fmt.Errorf("melt %s: %w", code, err)
	}
	if err := t.loadComposition(m); err != nil {
		return nil, err
	}
	return m, nil
}

func (t *txn) meltByID(id int64) (*meltbook.Melt, error) {
	m, err := scanMelt(t.queryRow(`SELECT `+meltColumns+` FROM melt WHERE id = ?`, id))
	if err != nil {
		return nil, fmt.Errorf("melt %d: %w", id, err)
	}
	if err := t.loadComposition(m); err != nil {
		return nil, err
	}
	return m, nil
}

func (t *txn) loadComposition(m *meltbook.Melt) error {
	rows, err := t.query(`SELECT element, fraction FROM melt_element WHERE melt_id = ? ORDER BY position`, m.ID)
	if err != nil {
		return fmt.Errorf("melt %s composition: %w", m.Code, err)
	}
	defer rows.Close()
	m.Nominal = nil
	for rows.Next() {
		var f meltbook.ElementFraction
		if err := rows.Scan(&f.Element, &f.Fraction); err != nil {
			return err
		}
		m.Nominal = append(m.Nominal, f)
	}
	if err := rows.Err(); err != nil {
		return err
	}
	rows, err = t.query(`SELECT element, planned_g, weighed_g, purity_pct, loss_pct FROM weigh_out_line
		WHERE melt_id = ? ORDER BY position`, m.ID)
	if err != nil {
		return fmt.Errorf("melt %s weigh-out: %w", m.Code, err)
	}
	defer rows.Close()
	m.WeighOut = nil
	for rows.Next() {
		var w meltbook.WeighOutLine
		var weighed sql.NullFloat64
		if err := rows.Scan(&w.Element, &w.PlannedGrams, &weighed, &w.PurityPercent, &w.LossPercent); err != nil {
			return err
		}
		w.WeighedGrams = floatPtr(weighed)
		m.WeighOut = append(m.WeighOut, w)
	}
	return rows.Err()
}

// AmendMelt changes a melt's recorded values, one history row per field
// changed, each with the reason. It returns those rows.
func (s *Store) AmendMelt(ctx context.Context, who, code string, u meltbook.MeltUpdate, why string) ([]meltbook.HistoryEntry, error) {
	if err := needReason(why); err != nil {
		return nil, err
	}
	var out []meltbook.HistoryEntry
	err := s.write(ctx, who, func(t *txn) error {
		old, err := t.meltByCode(code)
		if err != nil {
			return err
		}
		m := *old
		var cs []change
		str := func(field string, dst *string, v *string) {
			if v != nil && *v != *dst {
				cs = append(cs, change{field, *dst, *v})
				*dst = *v
			}
		}
		str("operator", &m.Operator, u.Operator)
		str("composition", &m.CompositionEntered, u.CompositionEntered)
		str("notes", &m.Notes, u.Notes)
		if u.CreatedAt != nil && !u.CreatedAt.Equal(m.CreatedAt) {
			cs = append(cs, change{"created", formatTime(m.CreatedAt), formatTime(*u.CreatedAt)})
			m.CreatedAt = u.CreatedAt.UTC()
		}
		nominalChanged := u.Nominal != nil && formatFractions(u.Nominal) != formatFractions(m.Nominal)
		if nominalChanged {
			cs = append(cs, change{"nominal", formatFractions(m.Nominal), formatFractions(u.Nominal)})
			m.Nominal = u.Nominal
		}
		if u.TargetMassGrams != nil && *u.TargetMassGrams != m.TargetMassGrams {
			cs = append(cs, change{"mass", formatFloat(m.TargetMassGrams), formatFloat(*u.TargetMassGrams)})
			m.TargetMassGrams = *u.TargetMassGrams
		}
		if u.MassAfterMeltGrams != nil && differs(u.MassAfterMeltGrams, m.MassAfterMeltGrams) {
			cs = append(cs, change{"mass-after", formatOptionalFloat(m.MassAfterMeltGrams), formatFloat(*u.MassAfterMeltGrams)})
			m.MassAfterMeltGrams = u.MassAfterMeltGrams
		}
		weighOutChanged := false
		if u.WeighOut != nil {
			wc := weighOutChanges(m.WeighOut, u.WeighOut)
			weighOutChanged = len(wc) > 0
			cs = append(cs, wc...)
			m.WeighOut = u.WeighOut
		}
		if err := m.Validate(); err != nil {
			return err
		}
		group, raynor := t.s.eOverAColumns(m.Nominal)
		if _, err := t.exec(`UPDATE melt SET operator = ?, created_at = ?, composition_entered = ?, target_mass_g = ?,
				mass_after_melt_g = ?, notes = ?, element_set = ?, e_over_a_group = ?, e_over_a_raynor = ? WHERE id = ?`,
			m.Operator, formatTime(m.CreatedAt), m.CompositionEntered, m.TargetMassGrams,
			nullFloat(m.MassAfterMeltGrams), m.Notes, elementSet(m.Nominal), group, raynor, m.ID); err != nil {
			return fmt.Errorf("amend melt %s: %w", code, err)
		}
		if nominalChanged || weighOutChanged {
			if _, err := t.exec(`DELETE FROM melt_element WHERE melt_id = ?`, m.ID); err != nil {
				return fmt.Errorf("amend melt %s: %w", code, err)
			}
			if _, err := t.exec(`DELETE FROM weigh_out_line WHERE melt_id = ?`, m.ID); err != nil {
				return fmt.Errorf("amend melt %s: %w", code, err)
			}
			if err := t.insertComposition(&m); err != nil {
				return err
			}
		}
		out, err = t.recordAmendment(m.ID, "melt", m.ID, cs, why)
		return err
	})
	return out, err
}

// weighOutChanges compares two weigh-outs element by element.
func weighOutChanges(old, new []meltbook.WeighOutLine) []change {
	format := func(w *meltbook.WeighOutLine) string {
		if w == nil {
			return ""
		}
		weighed := "not weighed"
		if w.WeighedGrams != nil {
			weighed = "weighed " + formatFloat(*w.WeighedGrams) + " g"
		}
		return fmt.Sprintf("planned %s g, %s, purity %s %%, loss %s %%", formatFloat(w.PlannedGrams),
			weighed, formatFloat(w.PurityPercent), formatFloat(w.LossPercent))
	}
	find := func(ws []meltbook.WeighOutLine, el string) *meltbook.WeighOutLine {
		for i := range ws {
			if ws[i].Element == el {
				return &ws[i]
			}
		}
		return nil
	}
	var cs []change
	for i := range new {
		before, after := format(find(old, new[i].Element)), format(&new[i])
		if before != after {
			cs = append(cs, change{"weigh-out." + new[i].Element, before, after})
		}
	}
	for i := range old {
		if find(new, old[i].Element) == nil {
			cs = append(cs, change{"weigh-out." + old[i].Element, format(&old[i]), ""})
		}
	}
	return cs
}

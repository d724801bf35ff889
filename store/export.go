package store

import (
	"bytes"
	"context"
	"database/sql"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"strings"

	"meltbook"
)

// The exported notebook is one JSON document:
//
//	{
//	  "format": "meltbook-notebook",
//	  "version": 3,
//	  "melts": [
//	    {
//	      "id": 1, "code": "QX-0001", "operator": "...", "created_at": "RFC 3339",
//	      "composition_entered": "Al63Cu25Fe12",
//	      "nominal": [{"element": "Al", "fraction": 0.63}, ...],
//	      "target_mass_g": 10, "mass_after_melt_g": 9.98,
//	      "weigh_out": [{"element": "Al", "planned_g": 4.5, "weighed_g": 4.51,
//	                     "purity_pct": 99.99, "loss_pct": 0}, ...],
//	      "notes": "...",
//	      "samples": [
//	        {
//	          "id": 1, "code": "QX-0001", "parent": "", "label": "", "created_at": "...",
//	          "steps": [{"id": 1, "seq": 1, "kind": "melt-spin", "at": "...", "operator": "...",
//	                     "params": [{"name": "wheel-speed", "si": 30, "unit": "m/s"},
//	                                {"name": "chamber-gas", "text": "Ar"}], "notes": ""}],
//	          "measurements": [{"id": 1, "method": "EDS", "fractions": [...],
//	                            "uncertainty": [...], "at": "...", "operator": "..."}],
//	          "symmetry": [{"id": 1, "folds": [2, 3, 5], "at": "...", "operator": "..."}],
//	          "outcomes": [{"id": 1, "kind": "icosahedral", "lattice": "F", "fraction": 0.9,
//	                        "source": "person", "recorded_by": "...", "evidence": "...",
//	                        "status": "confirmed", "at": "..."}],
//	          "scans": [{"id": 1, "file_name": "a.xy", "sha256": "...", "format": "xy",
//	                     "radiation": {"anode": "Cu", "kalpha1_angstrom": 1.5405929, ...},
//	                     "imported_at": "...", "imported_by": "...",
//	                     "two_theta_deg": [20, 20.02, ...], "counts": [301, 296, ...],
//	                     "indexings": [{"id": 1, "version": 1, "at": "...", "by": "...",
//	                                    "requested_by": "...", "radiation": {...},
//	                                    "tolerance_deg": 0.1, "max_chance": 0.01,
//	                                    "peaks": [{"id": 1, "two_theta_deg": 38.47, ...}],
//	                                    "phases": [{"id": 1, "kind": "tetragonal", "lattice": "I",
//	                                                "phase": "θ-Al2Cu", "space_group": "I4/mcm",
//	                                                "reference": "...", "constant_angstrom": 6.067,
//	                                                "constant_su_angstrom": 0.002,
//	                                                "c_angstrom": 4.877, "c_su_angstrom": 0.002, ...,
//	                                                "whole_pattern_rwp": 0.11,
//	                                                "assignments": [{"peak_id": 1, "label": "110",
//	                                                                 "predicted_intensity": 37.5, ...}]}],
//	                                    "unexplained_peaks": [3],
//	                                    "models": [{"kind": "tetragonal", "lattice": "I",
//	                                                "phase": "θ-Al2Cu", ...}],
//	                                    "proposals": [{"outcome_id": 2, "phase_id": 1,
//	                                                   "confidence": "medium"}]}]}]
//	        }
//	      ],
//	      "dated_notes": [{"id": 1, "sample": "QX-0001.a1", "author": "...", "at": "...", "text": "..."}]
//	    }
//	  ],
//	  "history": [{"id": 1, "at": "...", "who": "...", "melt": "QX-0001", "entity": "melt",
//	               "entity_id": 1, "action": "create", "field": "", "before": "", "after": "...",
//	               "why": ""}]
//	}
//
// Samples are listed oldest first, so a parent comes before the pieces
// derived from it; the melt's own sample comes first and has the melt's
// code. "notes" is the melt's own remark field; "dated_notes" are the
// notes written on the melt (no "sample") or on a derived sample. Ids key the rows within the document and are kept on import, so
// that each history entry's entity_id keeps naming its row. Numbers are in
// the units their names give (SI for step parameters, "unit" being the unit
// the value was entered in); times are RFC 3339 in UTC. e/a and cooling
// rate are derived, not stored in the document. Omitted fields are empty.
//
// Version 2 added the diffraction scans, listed under their sample with
// their points and every indexing (see DocScan); a proposal's outcome is
// listed among the sample's outcomes and named by id.
//
// Version 3 keeps every field of a phase call: a phase's kind may be any
// crystal system (tetragonal, hexagonal, orthorhombic, monoclinic,
// triclinic, rhombohedral beside icosahedral, approximant and cubic) and
// its lattice any centring (P, I, F, A, B, C, R); a phase may name a phase
// of known structure ("phase", "space_group", "reference"), give the cell
// constants its kind leaves free with their uncertainties ("b_angstrom",
// "b_su_angstrom", "c_angstrom", "c_su_angstrom", "alpha_deg",
// "alpha_su_deg", "beta_deg", "beta_su_deg", "gamma_deg", "gamma_su_deg";
// absent when the kind fixes them) and the Rwp of a whole-pattern check
// ("whole_pattern_rwp", a fraction; absent when none was run). An
// assignment may give the line's "predicted_intensity" (the phase's
// strongest predicted line = 100; absent when none was computed, so that
// a computed 0 stays 0), and a model tried the library "phase" it stood
// for.
//
// Version 1 (no scans) and version 2 documents still import; one that
// holds what a later version brought (scans in version 1, the fields of
// version 3 in version 2) is refused as not what it says it is. A document
// of a version above DocumentVersion is refused as written by a newer
// meltbook.

// DocumentFormat and DocumentVersion identify an exported notebook.
const (
	DocumentFormat  = "meltbook-notebook"
	DocumentVersion = 3
)

// Document is an exported notebook.
type Document struct {
	Format  string       `json:"format"`
	Version int          `json:"version"`
	Melts   []DocMelt    `json:"melts"`
	History []DocHistory `json:"history"`
}

// DocMelt is a melt with its samples and dated notes.
type DocMelt struct {
	ID int64 `json:"id"`
	meltbook.Melt
	Samples    []DocSample `json:"samples"`
	DatedNotes []DocNote   `json:"dated_notes,omitempty"`
}

// DocSample is a sample with all that was done to it and found in it.
type DocSample struct {
	ID int64 `json:"id"`
	meltbook.Sample
	Steps        []DocStep        `json:"steps,omitempty"`
	Measurements []DocMeasurement `json:"measurements,omitempty"`
	Symmetry     []DocObservation `json:"symmetry,omitempty"`
	Outcomes     []DocOutcome     `json:"outcomes,omitempty"`
	Scans        []DocScan        `json:"scans,omitempty"`
}

// DocStep is a process step with its id.
type DocStep struct {
	ID int64 `json:"id"`
	meltbook.ProcessStep
}

// DocMeasurement is a measured composition with its id.
type DocMeasurement struct {
	ID int64 `json:"id"`
	meltbook.MeasuredComposition
}

// DocObservation is a symmetry observation with its id.
type DocObservation struct {
	ID int64 `json:"id"`
	meltbook.SymmetryObservation
}

// DocOutcome is an outcome with its id; its sample is the one it is
// listed under.
type DocOutcome struct {
	ID int64 `json:"id"`
	meltbook.Outcome
}

// DocNote is a dated note with its id.
type DocNote struct {
	ID int64 `json:"id"`
	meltbook.Note
}

// DocHistory is a history entry with its id.
type DocHistory struct {
	ID int64 `json:"id"`
	meltbook.HistoryEntry
}

// Export writes the whole notebook to w as an indented JSON Document.
func (s *Store) Export(ctx context.Context, w io.Writer) error {
	d, err := s.ExportDocument(ctx)
	if err != nil {
		return err
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	if err := enc.Encode(d); err != nil {
		return fmt.Errorf("export: %w", err)
	}
	return nil
}

// ExportDocument returns the whole notebook as a Document.
func (s *Store) ExportDocument(ctx context.Context) (*Document, error) {
	d := &Document{Format: DocumentFormat, Version: DocumentVersion, Melts: []DocMelt{}, History: []DocHistory{}}
	err := s.read(ctx, func(t *txn) error { return t.export(d) })
	if err != nil {
		return nil, fmt.Errorf("export: %w", err)
	}
	return d, nil
}

// each runs a query and calls fn for every row.
func (t *txn) each(query string, fn func(rows *sql.Rows) error) error {
	rows, err := t.query(query)
	if err != nil {
		return err
	}
	defer rows.Close()
	for rows.Next() {
		if err := fn(rows); err != nil {
			return err
		}
	}
	return rows.Err()
}

// export reads table by table, each in id order, and assembles the
// document; a handful of full scans rather than queries per melt.
func (t *txn) export(d *Document) error {
	meltAt := map[int64]int{}
	err := t.each(`SELECT `+meltColumns+` FROM melt ORDER BY id`, func(rows *sql.Rows) error {
		m, err := scanMelt(rows)
		if err != nil {
			return err
		}
		meltAt[m.ID] = len(d.Melts)
		d.Melts = append(d.Melts, DocMelt{ID: m.ID, Melt: *m, Samples: []DocSample{}})
		return nil
	})
	if err != nil {
		return err
	}
	err = t.each(`SELECT melt_id, element, fraction FROM melt_element ORDER BY melt_id, position`, func(rows *sql.Rows) error {
		var id int64
		var f meltbook.ElementFraction
		if err := rows.Scan(&id, &f.Element, &f.Fraction); err != nil {
			return err
		}
		m := &d.Melts[meltAt[id]].Melt
		m.Nominal = append(m.Nominal, f)
		return nil
	})
	if err != nil {
		return err
	}
	err = t.each(`SELECT melt_id, element, planned_g, weighed_g, purity_pct, loss_pct FROM weigh_out_line
		ORDER BY melt_id, position`, func(rows *sql.Rows) error {
		var id int64
		var w meltbook.WeighOutLine
		var weighed sql.NullFloat64
		if err := rows.Scan(&id, &w.Element, &w.PlannedGrams, &weighed, &w.PurityPercent, &w.LossPercent); err != nil {
			return err
		}
		w.WeighedGrams = floatPtr(weighed)
		m := &d.Melts[meltAt[id]].Melt
		m.WeighOut = append(m.WeighOut, w)
		return nil
	})
	if err != nil {
		return err
	}

	type place struct{ melt, sample int }
	sampleAt := map[int64]place{}
	err = t.each(`SELECT `+sampleColumns+` FROM sample sa LEFT JOIN sample pa ON pa.id = sa.parent_id ORDER BY sa.id`,
		func(rows *sql.Rows) error {
			sa, err := scanSample(rows)
			if err != nil {
				return err
			}
			mi := meltAt[sa.MeltID]
			sampleAt[sa.ID] = place{mi, len(d.Melts[mi].Samples)}
			d.Melts[mi].Samples = append(d.Melts[mi].Samples, DocSample{ID: sa.ID, Sample: *sa})
			return nil
		})
	if err != nil {
		return err
	}
	sample := func(id int64) *DocSample {
		p := sampleAt[id]
		return &d.Melts[p.melt].Samples[p.sample]
	}

	type stepPlace struct {
		sample int64
		index  int
	}
	stepAt := map[int64]stepPlace{}
	err = t.each(`SELECT `+stepColumns+` FROM process_step ORDER BY sample_id, seq`, func(rows *sql.Rows) error {
		st, err := scanStep(rows)
		if err != nil {
			return err
		}
		sa := sample(st.SampleID)
		stepAt[st.ID] = stepPlace{st.SampleID, len(sa.Steps)}
		sa.Steps = append(sa.Steps, DocStep{ID: st.ID, ProcessStep: *st})
		return nil
	})
	if err != nil {
		return err
	}
	err = t.each(`SELECT step_id, name, value_si, unit, text_value FROM step_param ORDER BY step_id, position`, func(rows *sql.Rows) error {
		var id int64
		var p meltbook.Param
		var v sql.NullFloat64
		if err := rows.Scan(&id, &p.Name, &v, &p.Unit, &p.Text); err != nil {
			return err
		}
		p.SI = v.Float64
		sp := stepAt[id]
		st := &sample(sp.sample).Steps[sp.index]
		st.Params = append(st.Params, p)
		return nil
	})
	if err != nil {
		return err
	}

	mcAt := map[int64]stepPlace{}
	err = t.each(`SELECT `+measurementColumns+` FROM measured_composition ORDER BY id`, func(rows *sql.Rows) error {
		var mc meltbook.MeasuredComposition
		var at string
		if err := rows.Scan(&mc.ID, &mc.SampleID, &mc.Method, &at, &mc.Operator, &mc.Notes); err != nil {
			return err
		}
		var err error
		if mc.At, err = parseTime(at); err != nil {
			return err
		}
		sa := sample(mc.SampleID)
		mcAt[mc.ID] = stepPlace{mc.SampleID, len(sa.Measurements)}
		sa.Measurements = append(sa.Measurements, DocMeasurement{ID: mc.ID, MeasuredComposition: mc})
		return nil
	})
	if err != nil {
		return err
	}
	err = t.each(`SELECT measurement_id, element, fraction, uncertainty FROM measured_fraction ORDER BY measurement_id, position`,
		func(rows *sql.Rows) error {
			var id int64
			var f meltbook.ElementFraction
			var u sql.NullFloat64
			if err := rows.Scan(&id, &f.Element, &f.Fraction, &u); err != nil {
				return err
			}
			p := mcAt[id]
			mc := &sample(p.sample).Measurements[p.index]
			mc.Fractions = append(mc.Fractions, f)
			if u.Valid {
				mc.Uncertainty = append(mc.Uncertainty, meltbook.ElementFraction{Element: f.Element, Fraction: u.Float64})
			}
			return nil
		})
	if err != nil {
		return err
	}

	obsAt := map[int64]stepPlace{}
	err = t.each(`SELECT `+observationColumns+` FROM symmetry_observation ORDER BY id`, func(rows *sql.Rows) error {
		var o meltbook.SymmetryObservation
		var at string
		if err := rows.Scan(&o.ID, &o.SampleID, &at, &o.Operator, &o.Notes); err != nil {
			return err
		}
		var err error
		if o.At, err = parseTime(at); err != nil {
			return err
		}
		sa := sample(o.SampleID)
		obsAt[o.ID] = stepPlace{o.SampleID, len(sa.Symmetry)}
		sa.Symmetry = append(sa.Symmetry, DocObservation{ID: o.ID, SymmetryObservation: o})
		return nil
	})
	if err != nil {
		return err
	}
	err = t.each(`SELECT observation_id, fold FROM symmetry_fold ORDER BY observation_id, position`, func(rows *sql.Rows) error {
		var id int64
		var f int
		if err := rows.Scan(&id, &f); err != nil {
			return err
		}
		p := obsAt[id]
		o := &sample(p.sample).Symmetry[p.index]
		o.Folds = append(o.Folds, f)
		return nil
	})
	if err != nil {
		return err
	}

	err = t.each(`SELECT `+outcomeColumns+` FROM outcome o JOIN sample sa ON sa.id = o.sample_id ORDER BY o.id`, func(rows *sql.Rows) error {
		o, err := scanOutcome(rows)
		if err != nil {
			return err
		}
		o.SampleCode = ""
		sa := sample(o.SampleID)
		sa.Outcomes = append(sa.Outcomes, DocOutcome{ID: o.ID, Outcome: *o})
		return nil
	})
	if err != nil {
		return err
	}
	if err := t.exportScans(sample); err != nil {
		return err
	}
	err = t.each(`SELECT `+noteColumns+` FROM note n LEFT JOIN sample sa ON sa.id = n.sample_id ORDER BY n.id`, func(rows *sql.Rows) error {
		n, err := scanNote(rows)
		if err != nil {
			return err
		}
		m := &d.Melts[meltAt[n.MeltID]]
		m.DatedNotes = append(m.DatedNotes, DocNote{ID: n.ID, Note: *n})
		return nil
	})
	if err != nil {
		return err
	}
	rows, err := t.query(`SELECT ` + historyColumns + ` FROM history h LEFT JOIN melt m ON m.id = h.melt_id ORDER BY h.id`)
	if err != nil {
		return err
	}
	hs, err := scanHistory(rows)
	if err != nil {
		return err
	}
	for _, h := range hs {
		d.History = append(d.History, DocHistory{ID: h.ID, HistoryEntry: h})
	}
	return nil
}

// Import reads a JSON Document (as Export writes it) into this notebook,
// which must be empty (Conflict otherwise). Everything is checked before
// anything is written, and the whole import is one transaction. Bad input
// is an Invalid error naming the line and column or the place in the
// document ("melts[3].samples[1].steps[0]: ...").
func (s *Store) Import(ctx context.Context, who string, r io.Reader) error {
	b, err := io.ReadAll(r)
	if err != nil {
		return fmt.Errorf("import: %w", err)
	}
	dec := json.NewDecoder(bytes.NewReader(b))
	dec.DisallowUnknownFields()
	var d Document
	if err := dec.Decode(&d); err != nil {
		return jsonError(b, err)
	}
	if dec.More() {
		return meltbook.Errorf(invalid, "document", "more than one JSON value; a notebook export is one document")
	}
	return s.ImportDocument(ctx, who, &d)
}

// jsonError turns a decoding error into an Invalid error naming the line
// and column.
func jsonError(b []byte, err error) error {
	var offset int64 = -1
	var syntax *json.SyntaxError
	var typ *json.UnmarshalTypeError
	switch {
	case errors.As(err, &syntax):
		offset = syntax.Offset
	case errors.As(err, &typ):
		offset = typ.Offset
	}
	if offset < 0 || offset > int64(len(b)) {
		return meltbook.Errorf(invalid, "document", "not a notebook document: %v", err)
	}
	// The decoder's offset is just past the byte at fault.
	if offset > 0 {
		offset--
	}
	line := 1 + bytes.Count(b[:offset], []byte("\n"))
	col := int(offset) - bytes.LastIndexByte(b[:offset], '\n')
	return meltbook.Errorf(invalid, fmt.Sprintf("document line %d, column %d", line, col), "%v", err)
}

// at prefixes an error's field with a place in the document.
func at(place string, err error) error {
	var e *meltbook.Error
	if errors.As(err, &e) {
		field := place
		if e.Field != "" {
			field += "." + e.Field
		}
		return &meltbook.Error{Kind: e.Kind, Field: field, Message: e.Message}
	}
	return fmt.Errorf("%s: %w", place, err)
}

// ImportDocument writes d into this notebook, which must be empty; see
// Import. Ids, codes, times and history are kept as the document gives
// them; who is remembered as the importer in the notebook's settings.
func (s *Store) ImportDocument(ctx context.Context, who string, d *Document) error {
	if d.Format != DocumentFormat {
		return meltbook.Errorf(invalid, "format", "%q is not a meltbook notebook document (%q)", d.Format, DocumentFormat)
	}
	if d.Version > DocumentVersion {
		return meltbook.Errorf(conflict, "version", "the document was written by a newer meltbook (version %d; this one reads up to %d)",
			d.Version, DocumentVersion)
	}
	if d.Version < 1 {
		return meltbook.Errorf(invalid, "version", "%d is not a document version", d.Version)
	}
	if err := checkDocument(d); err != nil {
		return err
	}
	return s.write(ctx, who, func(t *txn) error {
		var melts, history int
		if err := t.queryRow(`SELECT (SELECT COUNT(*) FROM melt), (SELECT COUNT(*) FROM history)`).Scan(&melts, &history); err != nil {
			return fmt.Errorf("import: %w", err)
		}
		if melts > 0 || history > 0 {
			return meltbook.Errorf(conflict, "notebook", "an import needs an empty notebook; this one holds %d melts", melts)
		}
		t.importing = true
		meltIDs := map[string]int64{}
		for i := range d.Melts {
			if err := t.importMelt(&d.Melts[i]); err != nil {
				return at(fmt.Sprintf("melts[%d]", i), err)
			}
			meltIDs[d.Melts[i].Code] = d.Melts[i].ID
		}
		for i, h := range d.History {
			var melt any
			if h.MeltCode != "" {
				melt = meltIDs[h.MeltCode]
			}
			if _, err := t.exec(`INSERT INTO history (id, changed_at, who, melt_id, entity, entity_id, action, field,
					before_value, after_value, why) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
				h.ID, formatTime(h.At), h.Who, melt, h.Entity, h.EntityID, h.Action, h.Field, h.Before, h.After, h.Why); err != nil {
				return at(fmt.Sprintf("history[%d]", i), err)
			}
		}
		_, err := t.exec(`INSERT INTO notebook_setting (name, value) VALUES ('imported', ?)
			ON CONFLICT (name) DO UPDATE SET value = excluded.value`, formatTime(t.now)+" by "+who)
		return err
	})
}

// idSet checks that ids of one kind are positive and unique.
type idSet map[int64]bool

func (s idSet) add(kind string, id int64) error {
	if id <= 0 {
		return meltbook.Errorf(invalid, "id", "a %s id must be a positive number, got %d", kind, id)
	}
	if s[id] {
		return meltbook.Errorf(invalid, "id", "%s id %d appears twice", kind, id)
	}
	s[id] = true
	return nil
}

// checkDocument validates the whole document before anything is written.
func checkDocument(d *Document) error {
	ids := map[string]idSet{}
	for _, k := range []string{"melt", "sample", "step", "measurement", "observation", "outcome", "note", "history",
		"scan", "indexing", "peak", "phase", "proposal"} {
		ids[k] = idSet{}
	}
	codes := map[string]bool{}
	for i := range d.Melts {
		dm := &d.Melts[i]
		place := fmt.Sprintf("melts[%d]", i)
		if err := checkDocMelt(dm, d.Version, ids, codes); err != nil {
			return at(place, err)
		}
	}
	for i, h := range d.History {
		place := fmt.Sprintf("history[%d]", i)
		if err := ids["history"].add("history", h.ID); err != nil {
			return at(place, err)
		}
		if h.MeltCode != "" && !meltCodeIn(d, h.MeltCode) {
			return at(place, meltbook.Errorf(invalid, "melt", "no melt %s in the document", h.MeltCode))
		}
		if strings.TrimSpace(h.Who) == "" || h.Entity == "" || h.Action == "" {
			return at(place, meltbook.Errorf(invalid, "", "a history entry needs who, entity and action"))
		}
	}
	return nil
}

func meltCodeIn(d *Document, code string) bool {
	for i := range d.Melts {
		if d.Melts[i].Code == code {
			return true
		}
	}
	return false
}

func checkDocMelt(dm *DocMelt, version int, ids map[string]idSet, codes map[string]bool) error {
	if err := ids["melt"].add("melt", dm.ID); err != nil {
		return err
	}
	if err := dm.Melt.Validate(); err != nil {
		return err
	}
	if len(dm.Samples) == 0 || dm.Samples[0].Code != dm.Code || dm.Samples[0].ParentCode != "" {
		return meltbook.Errorf(invalid, "samples", "the first sample must be the melt's own, with the code %s and no parent", dm.Code)
	}
	seen := map[string]bool{}
	for j := range dm.Samples {
		ds := &dm.Samples[j]
		place := fmt.Sprintf("samples[%d]", j)
		if err := ids["sample"].add("sample", ds.ID); err != nil {
			return at(place, err)
		}
		if strings.TrimSpace(ds.Code) == "" || codes[ds.Code] {
			return at(place, meltbook.Errorf(invalid, "code", "sample code %q is empty or used twice", ds.Code))
		}
		codes[ds.Code] = true
		if j > 0 && !seen[ds.ParentCode] {
			return at(place, meltbook.Errorf(invalid, "parent", "%q is not a sample listed before %s in this melt", ds.ParentCode, ds.Code))
		}
		seen[ds.Code] = true
		seqs := map[int]bool{}
		for k := range ds.Steps {
			st := &ds.Steps[k]
			stPlace := fmt.Sprintf("%s.steps[%d]", place, k)
			if err := ids["step"].add("step", st.ID); err != nil {
				return at(stPlace, err)
			}
			if st.Seq < 1 || seqs[st.Seq] {
				return at(stPlace, meltbook.Errorf(invalid, "seq", "step number %d is not positive or appears twice", st.Seq))
			}
			seqs[st.Seq] = true
			if strings.TrimSpace(st.Operator) == "" {
				return at(stPlace, meltbook.Errorf(invalid, "operator", "a step needs an operator"))
			}
			if err := st.Validate(); err != nil {
				return at(stPlace, err)
			}
		}
		for k := range ds.Measurements {
			mc := &ds.Measurements[k]
			mPlace := fmt.Sprintf("%s.measurements[%d]", place, k)
			if err := ids["measurement"].add("measurement", mc.ID); err != nil {
				return at(mPlace, err)
			}
			if err := mc.Validate(); err != nil {
				return at(mPlace, err)
			}
			if err := checkUncertainty(&mc.MeasuredComposition); err != nil {
				return at(mPlace, err)
			}
		}
		for k := range ds.Symmetry {
			o := &ds.Symmetry[k]
			oPlace := fmt.Sprintf("%s.symmetry[%d]", place, k)
			if err := ids["observation"].add("observation", o.ID); err != nil {
				return at(oPlace, err)
			}
			if err := o.Validate(); err != nil {
				return at(oPlace, err)
			}
		}
		for k := range ds.Outcomes {
			o := &ds.Outcomes[k]
			oPlace := fmt.Sprintf("%s.outcomes[%d]", place, k)
			if err := ids["outcome"].add("outcome", o.ID); err != nil {
				return at(oPlace, err)
			}
			if err := o.Validate(); err != nil {
				return at(oPlace, err)
			}
			if o.SampleCode != "" && o.SampleCode != ds.Code {
				return at(oPlace, meltbook.Errorf(invalid, "sample", "listed under %s but names %s", ds.Code, o.SampleCode))
			}
			switch {
			case o.Source == meltbook.ByPerson && o.Status != meltbook.Confirmed:
				return at(oPlace, meltbook.Errorf(invalid, "status", "a person's outcome is confirmed, not %q", o.Status))
			case o.Status != meltbook.Proposed && o.Status != meltbook.Confirmed && o.Status != meltbook.Rejected:
				return at(oPlace, meltbook.Errorf(invalid, "status", "%q is not proposed, confirmed or rejected", o.Status))
			}
		}
		if err := checkDocScans(ds, version, ids); err != nil {
			return at(place, err)
		}
	}
	for k := range dm.DatedNotes {
		n := &dm.DatedNotes[k]
		nPlace := fmt.Sprintf("dated_notes[%d]", k)
		if err := ids["note"].add("note", n.ID); err != nil {
			return at(nPlace, err)
		}
		if n.SampleCode != "" && (!seen[n.SampleCode] || n.SampleCode == dm.Code) {
			return at(nPlace, meltbook.Errorf(invalid, "sample", "%q is not a derived sample of melt %s", n.SampleCode, dm.Code))
		}
		if strings.TrimSpace(n.Author) == "" || strings.TrimSpace(n.Text) == "" {
			return at(nPlace, meltbook.Errorf(invalid, "", "a note needs an author and a text"))
		}
	}
	return nil
}

// importMelt writes one checked melt with its ids.
func (t *txn) importMelt(dm *DocMelt) error {
	m := dm.Melt
	m.ID = dm.ID
	group, raynor := t.s.eOverAColumns(m.Nominal)
	if _, err := t.exec(`INSERT INTO melt (id, code, operator, created_at, composition_entered, target_mass_g,
			mass_after_melt_g, notes, element_set, e_over_a_group, e_over_a_raynor) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
		m.ID, m.Code, m.Operator, formatTime(m.CreatedAt), m.CompositionEntered, m.TargetMassGrams,
		nullFloat(m.MassAfterMeltGrams), m.Notes, elementSet(m.Nominal), group, raynor); err != nil {
		return err
	}
	if err := t.insertComposition(&m); err != nil {
		return err
	}
	sampleIDs := map[string]int64{}
	for j := range dm.Samples {
		ds := &dm.Samples[j]
		sa := ds.Sample
		sa.ID, sa.MeltID = ds.ID, m.ID
		if sa.ParentCode != "" {
			p := sampleIDs[sa.ParentCode]
			sa.ParentID = &p
		}
		if err := t.insertSample(&sa); err != nil {
			return at(fmt.Sprintf("samples[%d]", j), err)
		}
		sampleIDs[sa.Code] = sa.ID
		for k := range ds.Steps {
			st := ds.Steps[k].ProcessStep
			st.ID = ds.Steps[k].ID
			if err := t.insertStep(m.ID, &sa, ds.Steps[k].Seq, &st); err != nil {
				return at(fmt.Sprintf("samples[%d].steps[%d]", j, k), err)
			}
		}
		for k := range ds.Measurements {
			mc := ds.Measurements[k].MeasuredComposition
			mc.ID, mc.SampleID = ds.Measurements[k].ID, sa.ID
			if err := t.insertMeasurement(m.ID, &mc); err != nil {
				return at(fmt.Sprintf("samples[%d].measurements[%d]", j, k), err)
			}
		}
		for k := range ds.Symmetry {
			o := ds.Symmetry[k].SymmetryObservation
			o.ID, o.SampleID = ds.Symmetry[k].ID, sa.ID
			if err := t.insertObservation(m.ID, &o); err != nil {
				return at(fmt.Sprintf("samples[%d].symmetry[%d]", j, k), err)
			}
		}
		for k := range ds.Outcomes {
			o := ds.Outcomes[k].Outcome
			o.ID = ds.Outcomes[k].ID
			if err := t.insertOutcome(m.ID, &sa, &o); err != nil {
				return at(fmt.Sprintf("samples[%d].outcomes[%d]", j, k), err)
			}
		}
		for k := range ds.Scans {
			if err := t.importScan(sa.ID, &ds.Scans[k]); err != nil {
				return at(fmt.Sprintf("samples[%d].scans[%d]", j, k), err)
			}
		}
	}
	for k := range dm.DatedNotes {
		n := dm.DatedNotes[k].Note
		n.ID, n.MeltID, n.SampleID = dm.DatedNotes[k].ID, m.ID, nil
		if n.SampleCode != "" {
			id := sampleIDs[n.SampleCode]
			n.SampleID = &id
		}
		if err := t.insertNote(&n); err != nil {
			return at(fmt.Sprintf("dated_notes[%d]", k), err)
		}
	}
	return t.refreshCoolingRate(m.ID)
}

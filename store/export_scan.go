package store

import (
	"database/sql"
	"fmt"
	"strings"
	"time"

	"meltbook"
)

// DocScan is a diffraction scan with its points and its indexings, oldest
// first; its sample is the one it is listed under. The points are JSON
// numbers in the shortest form that reads back as the same float64, so
// they come back bit for bit.
type DocScan struct {
	ID               int64                  `json:"id"`
	FileName         string                 `json:"file_name"`
	SHA256           string                 `json:"sha256"`
	Format           string                 `json:"format"`
	Radiation        meltbook.ScanRadiation `json:"radiation"`
	InternalStandard string                 `json:"internal_standard,omitempty"`
	ImportedAt       time.Time              `json:"imported_at"`
	ImportedBy       string                 `json:"imported_by"`
	Notes            string                 `json:"notes,omitempty"`
	TwoThetaDeg      []float64              `json:"two_theta_deg"`
	Counts           []float64              `json:"counts"`
	CountErrors      []float64              `json:"count_errors,omitempty"`
	Indexings        []DocIndexing          `json:"indexings"`
}

// DocIndexing is one indexing of a scan. Peaks and phases are listed in
// the indexing's order; assignments, unexplained peaks and proposals name
// peaks and phases by id.
type DocIndexing struct {
	ID               int64                  `json:"id"`
	Version          int                    `json:"version"`
	At               time.Time              `json:"at"`
	By               string                 `json:"by"`
	RequestedBy      string                 `json:"requested_by"`
	Reason           string                 `json:"reason,omitempty"`
	Radiation        meltbook.ScanRadiation `json:"radiation"`
	InternalStandard string                 `json:"internal_standard,omitempty"`
	ZeroShiftDeg     *float64               `json:"standard_zero_shift_deg,omitempty"`
	ZeroShiftSUDeg   *float64               `json:"standard_zero_shift_su_deg,omitempty"`
	ToleranceDeg     float64                `json:"tolerance_deg"`
	MaxChance        float64                `json:"max_chance"`
	Notes            []string               `json:"notes,omitempty"`
	Peaks            []meltbook.Peak        `json:"peaks,omitempty"`
	Phases           []DocPhase             `json:"phases,omitempty"`
	Unexplained      []int64                `json:"unexplained_peaks,omitempty"`
	Models           []meltbook.ModelTried  `json:"models,omitempty"`
	Proposals        []DocProposal          `json:"proposals,omitempty"`
}

// DocPhase is an indexed phase. Its Assignments, naming peaks by id, take
// the place of the embedded phase's own (which the document leaves empty).
type DocPhase struct {
	meltbook.IndexedPhase
	Assignments []DocAssignment `json:"assignments"`
}

// DocAssignment is the reflection that explains one peak of the indexing.
type DocAssignment struct {
	PeakID                int64   `json:"peak_id"`
	CalculatedTwoThetaDeg float64 `json:"calculated_two_theta_deg"`
	ResidualDeg           float64 `json:"residual_deg"`
	DAngstrom             float64 `json:"d_angstrom"`
	Label                 string  `json:"label"`
	Detail                string  `json:"detail,omitempty"`
	// PredictedIntensity is the line's computed intensity, the phase's
	// strongest predicted line = 100; absent when none was computed
	// (version 3).
	PredictedIntensity *float64 `json:"predicted_intensity,omitempty"`
}

// DocProposal links an automatic outcome, listed among the sample's
// outcomes, to the indexing that proposed it and the phase it rests on
// (none for the pattern as a whole).
type DocProposal struct {
	OutcomeID  int64  `json:"outcome_id"`
	PhaseID    *int64 `json:"phase_id,omitempty"`
	Confidence string `json:"confidence"`
}

// exportScans reads the scans with everything below them, table by table,
// and lists each scan under its sample. A notebook still on the first
// schema (opened by tests with their own migrations) has no scans.
func (t *txn) exportScans(sample func(id int64) *DocSample) error {
	var schema int
	if err := t.queryRow(`SELECT COALESCE(MAX(version), 0) FROM schema_migration`).Scan(&schema); err != nil {
		return err
	}
	if schema < 2 {
		return nil
	}
	type scanRow struct {
		sampleID int64
		scan     *DocScan
	}
	var scans []scanRow
	scanByID := map[int64]*DocScan{}
	err := t.each(`SELECT id, sample_id, file_name, sha256, file_format, anode, kalpha1_angstrom, kalpha2_angstrom,
			kalpha2_ratio, kalpha2_state, radiation_text, radiation_assumed, internal_standard, points, two_theta_deg,
			counts, count_errors, imported_at, imported_by, notes
		FROM scan ORDER BY id`, func(rows *sql.Rows) error {
		sc := &DocScan{Indexings: []DocIndexing{}}
		var sampleID int64
		var assumed, points int
		var tt, counts, errs []byte
		var at string
		r := &sc.Radiation
		if err := rows.Scan(&sc.ID, &sampleID, &sc.FileName, &sc.SHA256, &sc.Format, &r.Anode, &r.Kalpha1Angstrom,
			&r.Kalpha2Angstrom, &r.Kalpha2Ratio, &r.Kalpha2, &r.Text, &assumed, &sc.InternalStandard, &points, &tt,
			&counts, &errs, &at, &sc.ImportedBy, &sc.Notes); err != nil {
			return err
		}
		r.Assumed = assumed == 1
		var err error
		if sc.ImportedAt, err = parseTime(at); err != nil {
			return err
		}
		if sc.TwoThetaDeg, err = decodeFloats(tt, points); err != nil {
			return fmt.Errorf("scan %d angles: %w", sc.ID, err)
		}
		if sc.Counts, err = decodeFloats(counts, points); err != nil {
			return fmt.Errorf("scan %d counts: %w", sc.ID, err)
		}
		if errs != nil {
			if sc.CountErrors, err = decodeFloats(errs, points); err != nil {
				return fmt.Errorf("scan %d uncertainties: %w", sc.ID, err)
			}
		}
		scans = append(scans, scanRow{sampleID, sc})
		scanByID[sc.ID] = sc
		return nil
	})
	if err != nil {
		return err
	}

	type indexingRow struct {
		scanID int64
		x      *DocIndexing
	}
	var indexings []indexingRow
	indexingByID := map[int64]*DocIndexing{}
	err = t.each(`SELECT id, scan_id, version, indexed_at, indexed_by, requested_by, reason, anode, kalpha1_angstrom,
			kalpha2_angstrom, kalpha2_ratio, kalpha2_state, radiation_text, radiation_assumed, internal_standard,
			zero_shift_deg, zero_shift_su_deg, tolerance_deg, max_chance, notes
		FROM indexing ORDER BY scan_id, version`, func(rows *sql.Rows) error {
		x := &DocIndexing{}
		var scanID int64
		var at, notes string
		var assumed int
		var zero, zeroSU sql.NullFloat64
		r := &x.Radiation
		if err := rows.Scan(&x.ID, &scanID, &x.Version, &at, &x.By, &x.RequestedBy, &x.Reason, &r.Anode, &r.Kalpha1Angstrom,
			&r.Kalpha2Angstrom, &r.Kalpha2Ratio, &r.Kalpha2, &r.Text, &assumed, &x.InternalStandard,
			&zero, &zeroSU, &x.ToleranceDeg, &x.MaxChance, &notes); err != nil {
			return err
		}
		r.Assumed = assumed == 1
		x.ZeroShiftDeg, x.ZeroShiftSUDeg = floatPtr(zero), floatPtr(zeroSU)
		if notes != "" {
			x.Notes = strings.Split(notes, "\n")
		}
		var err error
		if x.At, err = parseTime(at); err != nil {
			return err
		}
		indexings = append(indexings, indexingRow{scanID, x})
		indexingByID[x.ID] = x
		return nil
	})
	if err != nil {
		return err
	}

	err = t.each(`SELECT indexing_id, id, two_theta_deg, two_theta_su_deg, d_angstrom, d_su_angstrom, height, height_su, area,
			area_su, fwhm_deg, fwhm_su_deg, eta, eta_su, significance, standard_line, corrected_two_theta_deg,
			corrected_d_angstrom, found
		FROM peak ORDER BY indexing_id, position`, func(rows *sql.Rows) error {
		var xID int64
		var p meltbook.Peak
		var ttSU, dSU, hSU, aSU, wSU, eSU, ctt, cd sql.NullFloat64
		var found string
		if err := rows.Scan(&xID, &p.ID, &p.TwoThetaDeg, &ttSU, &p.DAngstrom, &dSU, &p.Height, &hSU, &p.Area, &aSU,
			&p.FWHMDeg, &wSU, &p.Eta, &eSU, &p.Significance, &p.Standard, &ctt, &cd, &found); err != nil {
			return err
		}
		p.TwoThetaSUDeg, p.DSUAngstrom, p.HeightSU, p.AreaSU = floatPtr(ttSU), floatPtr(dSU), floatPtr(hSU), floatPtr(aSU)
		p.FWHMSUDeg, p.EtaSU, p.CorrectedTwoThetaDeg, p.CorrectedDAngstrom = floatPtr(wSU), floatPtr(eSU), floatPtr(ctt), floatPtr(cd)
		p.Found = meltbook.PeakOrigin(found)
		x := indexingByID[xID]
		x.Peaks = append(x.Peaks, p)
		return nil
	})
	if err != nil {
		return err
	}

	type phaseRow struct {
		indexingID int64
		ph         *DocPhase
	}
	var phases []phaseRow
	phaseByID := map[int64]*DocPhase{}
	err = t.each(`SELECT `+phaseColumns+`, indexing_id FROM indexed_phase ORDER BY indexing_id, position`, func(rows *sql.Rows) error {
		var xID int64
		ph := &DocPhase{Assignments: []DocAssignment{}}
		p := &ph.IndexedPhase
		if err := scanPhase(scanExtra{rows, []any{&xID}}, p); err != nil {
			return err
		}
		phases = append(phases, phaseRow{xID, ph})
		phaseByID[p.ID] = ph
		return nil
	})
	if err != nil {
		return err
	}
	err = t.each(`SELECT a.phase_id, a.peak_id, a.calculated_two_theta_deg, a.residual_deg, a.d_angstrom, a.label, a.detail,
			a.predicted_intensity
		FROM peak_assignment a JOIN peak p ON p.id = a.peak_id ORDER BY a.phase_id, p.position`, func(rows *sql.Rows) error {
		var phaseID int64
		var a DocAssignment
		var predicted sql.NullFloat64
		if err := rows.Scan(&phaseID, &a.PeakID, &a.CalculatedTwoThetaDeg, &a.ResidualDeg, &a.DAngstrom, &a.Label, &a.Detail,
			&predicted); err != nil {
			return err
		}
		a.PredictedIntensity = floatPtr(predicted)
		ph := phaseByID[phaseID]
		ph.Assignments = append(ph.Assignments, a)
		return nil
	})
	if err != nil {
		return err
	}
	err = t.each(`SELECT u.indexing_id, u.peak_id FROM unexplained_peak u JOIN peak p ON p.id = u.peak_id
		ORDER BY u.indexing_id, p.position`, func(rows *sql.Rows) error {
		var xID, peakID int64
		if err := rows.Scan(&xID, &peakID); err != nil {
			return err
		}
		x := indexingByID[xID]
		x.Unexplained = append(x.Unexplained, peakID)
		return nil
	})
	if err != nil {
		return err
	}
	err = t.each(`SELECT `+modelColumns+`, indexing_id FROM indexing_model ORDER BY indexing_id, position`, func(rows *sql.Rows) error {
		var xID int64
		var m meltbook.ModelTried
		if err := scanModel(scanExtra{rows, []any{&xID}}, &m); err != nil {
			return err
		}
		x := indexingByID[xID]
		x.Models = append(x.Models, m)
		return nil
	})
	if err != nil {
		return err
	}
	err = t.each(`SELECT indexing_id, outcome_id, phase_id, confidence FROM indexing_proposal ORDER BY indexing_id, outcome_id`,
		func(rows *sql.Rows) error {
			var xID int64
			var p DocProposal
			var phase sql.NullInt64
			if err := rows.Scan(&xID, &p.OutcomeID, &phase, &p.Confidence); err != nil {
				return err
			}
			if phase.Valid {
				p.PhaseID = &phase.Int64
			}
			x := indexingByID[xID]
			x.Proposals = append(x.Proposals, p)
			return nil
		})
	if err != nil {
		return err
	}

	// Assemble from the leaves up, now that every row is in place.
	for _, r := range phases {
		x := indexingByID[r.indexingID]
		x.Phases = append(x.Phases, *r.ph)
	}
	for _, r := range indexings {
		sc := scanByID[r.scanID]
		sc.Indexings = append(sc.Indexings, *r.x)
	}
	for _, r := range scans {
		sa := sample(r.sampleID)
		sa.Scans = append(sa.Scans, *r.scan)
	}
	return nil
}

// checkDocScans validates the scans listed under a sample: the scan
// itself, its indexings numbered 1, 2, ... in order, peaks and phases named
// only within their own indexing, and proposals resting on automatic
// outcomes of the same sample, each outcome at most once.
func checkDocScans(ds *DocSample, version int, ids map[string]idSet) error {
	if len(ds.Scans) > 0 && version < 2 {
		return meltbook.Errorf(invalid, "scans", "a version %d document holds no scans; scans came with version 2", version)
	}
	outcomes := map[int64]*DocOutcome{}
	for k := range ds.Outcomes {
		outcomes[ds.Outcomes[k].ID] = &ds.Outcomes[k]
	}
	files := map[string]bool{}
	for i := range ds.Scans {
		sc := &ds.Scans[i]
		place := fmt.Sprintf("scans[%d]", i)
		if err := ids["scan"].add("scan", sc.ID); err != nil {
			return at(place, err)
		}
		check := meltbook.Scan{SampleCode: ds.Code, FileName: sc.FileName, SHA256: sc.SHA256, Format: sc.Format,
			Radiation: sc.Radiation, TwoThetaDeg: sc.TwoThetaDeg, Counts: sc.Counts, CountErrors: sc.CountErrors}
		if err := check.Validate(); err != nil {
			return at(place, err)
		}
		if files[sc.SHA256] {
			return at(place, meltbook.Errorf(invalid, "sha256", "sample %s lists the file %s… twice", ds.Code, sc.SHA256[:12]))
		}
		files[sc.SHA256] = true
		if strings.TrimSpace(sc.Format) == "" || strings.TrimSpace(sc.ImportedBy) == "" || sc.ImportedAt.IsZero() {
			return at(place, meltbook.Errorf(invalid, "", "a scan needs its file format, who imported it and when"))
		}
		for j := range sc.Indexings {
			xPlace := fmt.Sprintf("%s.indexings[%d]", place, j)
			if err := checkDocIndexing(&sc.Indexings[j], j+1, version, outcomes, ids); err != nil {
				return at(xPlace, err)
			}
		}
	}
	return nil
}

func checkDocIndexing(x *DocIndexing, version, docVersion int, outcomes map[int64]*DocOutcome, ids map[string]idSet) error {
	if err := ids["indexing"].add("indexing", x.ID); err != nil {
		return err
	}
	if x.Version != version {
		return meltbook.Errorf(invalid, "version", "indexing number %d is listed as version %d; versions count 1, 2, ... in order", version, x.Version)
	}
	if err := x.Radiation.Validate(); err != nil {
		return err
	}
	if strings.TrimSpace(x.By) == "" || strings.TrimSpace(x.RequestedBy) == "" || x.At.IsZero() {
		return meltbook.Errorf(invalid, "", "an indexing needs the program that ran it, who asked and when")
	}
	if version > 1 && strings.TrimSpace(x.Reason) == "" {
		return meltbook.Errorf(invalid, "reason", "indexing version %d needs the reason it was run again", version)
	}
	for k, n := range x.Notes {
		if n == "" || strings.Contains(n, "\n") {
			return meltbook.Errorf(invalid, fmt.Sprintf("notes[%d]", k), "an indexing note is one non-empty line")
		}
	}
	peaks := map[int64]bool{}
	for k := range x.Peaks {
		p := &x.Peaks[k]
		if err := ids["peak"].add("peak", p.ID); err != nil {
			return at(fmt.Sprintf("peaks[%d]", k), err)
		}
		if p.Found != meltbook.PeakAutomatic && p.Found != meltbook.PeakByHand {
			return at(fmt.Sprintf("peaks[%d]", k), meltbook.Errorf(invalid, "found", "%q is not %q or %q", p.Found, meltbook.PeakAutomatic, meltbook.PeakByHand))
		}
		peaks[p.ID] = true
	}
	phases := map[int64]bool{}
	for k := range x.Phases {
		ph := &x.Phases[k]
		pPlace := fmt.Sprintf("phases[%d]", k)
		if err := ids["phase"].add("phase", ph.ID); err != nil {
			return at(pPlace, err)
		}
		if len(ph.IndexedPhase.Assignments) > 0 {
			return at(pPlace, meltbook.Errorf(invalid, "assignments", "the phase's assignments are listed once"))
		}
		if err := checkPhase(&ph.IndexedPhase); err != nil {
			return at(pPlace, err)
		}
		if docVersion < 3 {
			if err := checkBeforeVersion3(ph); err != nil {
				return at(pPlace, err)
			}
		}
		assigned := map[int64]bool{}
		for a := range ph.Assignments {
			aPlace := fmt.Sprintf("%s.assignments[%d]", pPlace, a)
			id := ph.Assignments[a].PeakID
			if !peaks[id] || assigned[id] {
				return at(aPlace, meltbook.Errorf(invalid, "peak_id", "%d is not a peak of this indexing or is assigned twice", id))
			}
			assigned[id] = true
			da := &ph.Assignments[a]
			if err := checkAssignment(da.CalculatedTwoThetaDeg, da.ResidualDeg, da.DAngstrom, da.PredictedIntensity); err != nil {
				return at(aPlace, err)
			}
		}
		phases[ph.ID] = true
	}
	if docVersion < 3 {
		for k, m := range x.Models {
			if m.Phase != "" {
				return at(fmt.Sprintf("models[%d]", k), meltbook.Errorf(invalid, "phase",
					"a version %d document names no library phases; they came with version 3", docVersion))
			}
		}
	}
	unexplained := map[int64]bool{}
	for k, id := range x.Unexplained {
		if !peaks[id] || unexplained[id] {
			return meltbook.Errorf(invalid, fmt.Sprintf("unexplained_peaks[%d]", k), "%d is not a peak of this indexing or is listed twice", id)
		}
		unexplained[id] = true
	}
	for k := range x.Proposals {
		p := &x.Proposals[k]
		pPlace := fmt.Sprintf("proposals[%d]", k)
		o := outcomes[p.OutcomeID]
		switch {
		case o == nil || o.Source != meltbook.ByAutomatic:
			return at(pPlace, meltbook.Errorf(invalid, "outcome_id", "%d is not an automatic outcome of this sample", p.OutcomeID))
		case ids["proposal"][p.OutcomeID]:
			return at(pPlace, meltbook.Errorf(invalid, "outcome_id", "outcome %d is proposed twice", p.OutcomeID))
		case p.PhaseID != nil && !phases[*p.PhaseID]:
			return at(pPlace, meltbook.Errorf(invalid, "phase_id", "%d is not a phase of this indexing", *p.PhaseID))
		case !confidenceLevels[p.Confidence]:
			return at(pPlace, meltbook.Errorf(invalid, "confidence", "%q is not high, medium or low", p.Confidence))
		}
		ids["proposal"][p.OutcomeID] = true
	}
	return nil
}

// checkBeforeVersion3 refuses, in a document older than version 3, what
// version 3 brought: phases other than icosahedral, approximant and cubic
// ones, centrings other than P, I and F, library phase names, space groups
// and references, the further cell constants, Rwp and predicted
// intensities.
func checkBeforeVersion3(ph *DocPhase) error {
	came := func(field, what string) error {
		return meltbook.Errorf(invalid, field, "a version 2 document holds no %s; they came with version 3", what)
	}
	p := &ph.IndexedPhase
	switch {
	case p.Kind != meltbook.ModelIcosahedral && p.Kind != meltbook.ModelApproximant && p.Kind != meltbook.ModelCubic:
		return came("kind", p.Kind+" phases")
	case p.Lattice != "P" && p.Lattice != "I" && p.Lattice != "F":
		return came("lattice", p.Lattice+"-centred phases")
	case p.Phase != "" || p.SpaceGroup != "" || p.Reference != "":
		return came("phase", "library phases (name, space group, reference)")
	case p.WholePatternRwp != nil:
		return came("whole_pattern_rwp", "whole-pattern Rwp")
	}
	for _, c := range []struct {
		field string
		v     float64
	}{
		{"b_angstrom", p.ConstantB}, {"b_su_angstrom", p.ConstantSUB}, {"c_angstrom", p.ConstantC}, {"c_su_angstrom", p.ConstantSUC},
		{"alpha_deg", p.AlphaDeg}, {"alpha_su_deg", p.AlphaSUDeg}, {"beta_deg", p.BetaDeg}, {"beta_su_deg", p.BetaSUDeg},
		{"gamma_deg", p.GammaDeg}, {"gamma_su_deg", p.GammaSUDeg},
	} {
		if c.v != 0 {
			return came(c.field, "cell constants beyond a")
		}
	}
	for a := range ph.Assignments {
		if ph.Assignments[a].PredictedIntensity != nil {
			return at(fmt.Sprintf("assignments[%d]", a), came("predicted_intensity", "predicted intensities"))
		}
	}
	return nil
}

// importScan writes one checked scan of sample sampleID with its ids.
func (t *txn) importScan(sampleID int64, sc *DocScan) error {
	n := len(sc.TwoThetaDeg)
	r := sc.Radiation
	var errs any
	if sc.CountErrors != nil {
		errs = encodeFloats(sc.CountErrors)
	}
	if _, err := t.exec(`INSERT INTO scan (id, sample_id, file_name, sha256, file_format, anode, kalpha1_angstrom, kalpha2_angstrom,
			kalpha2_ratio, kalpha2_state, radiation_text, radiation_assumed, internal_standard, points, two_theta_from_deg,
			two_theta_to_deg, two_theta_deg, counts, count_errors, imported_at, imported_by, notes)
		VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
		sc.ID, sampleID, sc.FileName, sc.SHA256, sc.Format, r.Anode, r.Kalpha1Angstrom, r.Kalpha2Angstrom,
		r.Kalpha2Ratio, r.Kalpha2, r.Text, boolInt(r.Assumed), sc.InternalStandard, n, sc.TwoThetaDeg[0],
		sc.TwoThetaDeg[n-1], encodeFloats(sc.TwoThetaDeg), encodeFloats(sc.Counts), errs,
		formatTime(sc.ImportedAt), sc.ImportedBy, sc.Notes); err != nil {
		return err
	}
	for j := range sc.Indexings {
		if err := t.importIndexing(sc.ID, &sc.Indexings[j]); err != nil {
			return at(fmt.Sprintf("indexings[%d]", j), err)
		}
	}
	return nil
}

func (t *txn) importIndexing(scanID int64, x *DocIndexing) error {
	r := x.Radiation
	if _, err := t.exec(`INSERT INTO indexing (id, scan_id, version, indexed_at, indexed_by, requested_by, reason, anode,
			kalpha1_angstrom, kalpha2_angstrom, kalpha2_ratio, kalpha2_state, radiation_text, radiation_assumed,
			internal_standard, zero_shift_deg, zero_shift_su_deg, tolerance_deg, max_chance, notes)
		VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
		x.ID, scanID, x.Version, formatTime(x.At), x.By, x.RequestedBy, x.Reason, r.Anode,
		r.Kalpha1Angstrom, r.Kalpha2Angstrom, r.Kalpha2Ratio, r.Kalpha2, r.Text, boolInt(r.Assumed),
		x.InternalStandard, nullFloat(x.ZeroShiftDeg), nullFloat(x.ZeroShiftSUDeg), x.ToleranceDeg, x.MaxChance,
		strings.Join(x.Notes, "\n")); err != nil {
		return err
	}
	for i := range x.Peaks {
		p := &x.Peaks[i]
		if _, err := t.exec(`INSERT INTO peak (id, indexing_id, position, two_theta_deg, two_theta_su_deg, d_angstrom, d_su_angstrom,
				height, height_su, area, area_su, fwhm_deg, fwhm_su_deg, eta, eta_su, significance, standard_line,
				corrected_two_theta_deg, corrected_d_angstrom, found)
			VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
			p.ID, x.ID, i, p.TwoThetaDeg, finiteOrNull(p.TwoThetaSUDeg), p.DAngstrom, finiteOrNull(p.DSUAngstrom),
			p.Height, finiteOrNull(p.HeightSU), p.Area, finiteOrNull(p.AreaSU), p.FWHMDeg, finiteOrNull(p.FWHMSUDeg),
			p.Eta, finiteOrNull(p.EtaSU), p.Significance, p.Standard,
			finiteOrNull(p.CorrectedTwoThetaDeg), finiteOrNull(p.CorrectedDAngstrom), string(p.Found)); err != nil {
			return at(fmt.Sprintf("peaks[%d]", i), err)
		}
	}
	for i := range x.Phases {
		ph := &x.Phases[i]
		if _, err := t.insertPhase(ph.ID, x.ID, i, &ph.IndexedPhase); err != nil {
			return at(fmt.Sprintf("phases[%d]", i), err)
		}
		for j, a := range ph.Assignments {
			if err := t.insertAssignment(ph.ID, a.PeakID, a.CalculatedTwoThetaDeg, a.ResidualDeg, a.DAngstrom, a.Label, a.Detail,
				a.PredictedIntensity); err != nil {
				return at(fmt.Sprintf("phases[%d].assignments[%d]", i, j), err)
			}
		}
	}
	for i, m := range x.Models {
		if err := t.insertModel(x.ID, i, m); err != nil {
			return at(fmt.Sprintf("models[%d]", i), err)
		}
	}
	for i, id := range x.Unexplained {
		if _, err := t.exec(`INSERT INTO unexplained_peak (indexing_id, peak_id) VALUES (?, ?)`, x.ID, id); err != nil {
			return at(fmt.Sprintf("unexplained_peaks[%d]", i), err)
		}
	}
	for i, p := range x.Proposals {
		var phase any
		if p.PhaseID != nil {
			phase = *p.PhaseID
		}
		if _, err := t.exec(`INSERT INTO indexing_proposal (outcome_id, indexing_id, phase_id, confidence) VALUES (?, ?, ?, ?)`,
			p.OutcomeID, x.ID, phase, p.Confidence); err != nil {
			return at(fmt.Sprintf("proposals[%d]", i), err)
		}
	}
	return nil
}

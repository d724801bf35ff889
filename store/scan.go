package store

import (
	"context"
	"database/sql"
	"encoding/binary"
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"

	"meltbook"
)

// Confidence levels a proposal may carry (see analysis/verdict).
var confidenceLevels = map[string]bool{"high": true, "medium": true, "low": true}

// Proposal is an automatic outcome proposed from an indexing, for AddScan
// and AddIndexing.
type Proposal struct {
	// Outcome is stored as ProposeOutcome stores it: source automatic,
	// status proposed; RecordedBy defaults to the indexing's By.
	Outcome meltbook.Outcome
	// Phase is the position in Indexing.Phases of the phase the proposal
	// rests on, or -1 for one resting on the pattern as a whole (an
	// amorphous halo).
	Phase int
	// Confidence is "high", "medium" or "low".
	Confidence string
}

// NewScan is a scan with its first indexing and the proposals made from it.
type NewScan struct {
	// Scan names its sample by SampleCode; ImportedAt defaults to now and
	// ImportedBy to who.
	Scan meltbook.Scan
	// Indexing is version 1; At defaults to now and RequestedBy to who.
	Indexing  meltbook.Indexing
	Proposals []Proposal
}

// NewIndexing is a further indexing of a stored scan.
type NewIndexing struct {
	// Indexing gets the next version; its Reason is required.
	Indexing  meltbook.Indexing
	Proposals []Proposal
	// Radiation, when set, corrects the radiation recorded with the scan
	// (an amendment with Indexing.Reason as its reason).
	Radiation *meltbook.ScanRadiation
}

// supersededReason is why a pending proposal of an earlier indexing is
// rejected when a scan is indexed again.
const supersededReason = "superseded by re-indexing"

// AddScan stores a scan of a sample with its first indexing (peaks,
// phases, assignments, models tried) and the automatic proposals made from
// it, all in one transaction, with history rows for the scan, the indexing
// and each proposal. Every field of each phase call is kept (see the
// package documentation); a call the notebook cannot hold (an unknown kind
// or centring, a non-finite number, a cell constant that is not positive)
// is Invalid, naming the field ("phases[0].kind"), before anything is
// written. The same file (by SHA-256) on the same sample is a Conflict
// naming the scan that holds it. It returns the stored record.
func (s *Store) AddScan(ctx context.Context, who string, n NewScan) (*meltbook.ScanRecord, error) {
	sc := n.Scan
	sc.ID = 0
	if sc.ImportedBy == "" {
		sc.ImportedBy = who
	}
	if err := sc.Validate(); err != nil {
		return nil, err
	}
	if err := checkIndexing(&n.Indexing, n.Proposals, false); err != nil {
		return nil, err
	}
	var rec *meltbook.ScanRecord
	err := s.write(ctx, who, func(t *txn) error {
		sa, err := t.sampleByCode(sc.SampleCode)
		if err != nil {
			return err
		}
		if prev, err := t.scanBySHA(sa.ID, sc.SHA256); err != nil {
			return err
		} else if prev != nil {
			return meltbook.Errorf(conflict, sc.FileName, "this file (SHA-256 %s…) is already scan %d of sample %s, imported from %s on %s",
				sc.SHA256[:12], prev.ID, prev.SampleCode, prev.FileName, prev.ImportedAt.Format("2006-01-02"))
		}
		if sc.ImportedAt.IsZero() {
			sc.ImportedAt = t.now
		}
		sc.SampleID = sa.ID
		if err := t.insertScan(sa.MeltID, &sc); err != nil {
			return err
		}
		x := n.Indexing
		x.Version = 1
		if err := t.insertIndexing(sa.MeltID, sa, &sc, &x, n.Proposals); err != nil {
			return err
		}
		rec, err = t.scanRecord(sc.ID)
		return err
	})
	if err != nil {
		return nil, err
	}
	return rec, nil
}

// AddIndexing stores a further indexing of scan scanID as its next version,
// which becomes the current one; earlier versions stay. Proposals of
// earlier versions still awaiting a decision are rejected as superseded
// (with history); confirmed or rejected ones keep their status. With
// n.Radiation set the scan's recorded radiation is amended first.
func (s *Store) AddIndexing(ctx context.Context, who string, scanID int64, n NewIndexing) (*meltbook.ScanRecord, error) {
	if strings.TrimSpace(n.Indexing.Reason) == "" {
		return nil, meltbook.Errorf(invalid, "reason", "say why the scan is indexed again")
	}
	if err := checkIndexing(&n.Indexing, n.Proposals, true); err != nil {
		return nil, err
	}
	if n.Radiation != nil {
		if err := n.Radiation.Validate(); err != nil {
			return nil, err
		}
	}
	var rec *meltbook.ScanRecord
	err := s.write(ctx, who, func(t *txn) error {
		sc, err := t.scanByID(scanID, false)
		if err != nil {
			return err
		}
		sa, err := t.sampleByID(sc.SampleID)
		if err != nil {
			return err
		}
		if n.Radiation != nil && *n.Radiation != sc.Radiation {
			if err := t.amendScanRadiation(sa.MeltID, sc, *n.Radiation, n.Indexing.Reason); err != nil {
				return err
			}
		}
		var last int
		if err := t.queryRow(`SELECT COALESCE(MAX(version), 0) FROM indexing WHERE scan_id = ?`, scanID).Scan(&last); err != nil {
			return fmt.Errorf("scan %d: %w", scanID, err)
		}
		if err := t.supersede(sa.MeltID, scanID, last+1); err != nil {
			return err
		}
		x := n.Indexing
		x.Version = last + 1
		if err := t.insertIndexing(sa.MeltID, sa, sc, &x, n.Proposals); err != nil {
			return err
		}
		rec, err = t.scanRecord(scanID)
		return err
	})
	if err != nil {
		return nil, err
	}
	return rec, nil
}

// checkIndexing checks an indexing, its phase calls (checkPhase) and its
// proposals before anything is written.
func checkIndexing(x *meltbook.Indexing, ps []Proposal, again bool) error {
	if err := x.Radiation.Validate(); err != nil {
		return err
	}
	if strings.TrimSpace(x.By) == "" {
		return meltbook.Errorf(invalid, "indexing", "an indexing needs the program that ran it")
	}
	if !again && x.Reason != "" {
		return meltbook.Errorf(invalid, "reason", "a scan's first indexing needs no reason")
	}
	for i := range x.Phases {
		ph := &x.Phases[i]
		if err := checkPhase(ph); err != nil {
			return at(fmt.Sprintf("phases[%d]", i), err)
		}
		for _, a := range ph.Assignments {
			if a.Peak < 0 || a.Peak >= len(x.Peaks) {
				return meltbook.Errorf(invalid, "indexing", "phase %d assigns peak %d of %d", i+1, a.Peak+1, len(x.Peaks))
			}
		}
	}
	for _, u := range x.Unexplained {
		if u < 0 || u >= len(x.Peaks) {
			return meltbook.Errorf(invalid, "indexing", "unexplained peak %d of %d", u+1, len(x.Peaks))
		}
	}
	for i, p := range ps {
		if p.Phase < -1 || p.Phase >= len(x.Phases) {
			return meltbook.Errorf(invalid, "proposal", "proposal %d rests on phase %d of %d", i+1, p.Phase+1, len(x.Phases))
		}
		if !confidenceLevels[p.Confidence] {
			return meltbook.Errorf(invalid, "confidence", "%q is not high, medium or low", p.Confidence)
		}
		o := p.Outcome
		o.Source, o.Status = meltbook.ByAutomatic, meltbook.Proposed
		if o.RecordedBy == "" {
			o.RecordedBy = x.By
		}
		if err := o.Validate(); err != nil {
			return err
		}
	}
	return nil
}

// scanSummaryJSON is what the history keeps of a new scan: everything but
// the points.
type scanSummaryJSON struct {
	File             string                 `json:"file_name"`
	SHA256           string                 `json:"sha256"`
	Format           string                 `json:"format"`
	Radiation        meltbook.ScanRadiation `json:"radiation"`
	InternalStandard string                 `json:"internal_standard,omitempty"`
	Points           int                    `json:"points"`
	FromDeg          float64                `json:"from_deg"`
	ToDeg            float64                `json:"to_deg"`
	Notes            string                 `json:"notes,omitempty"`
}

func (t *txn) insertScan(meltID int64, sc *meltbook.Scan) error {
	n := len(sc.TwoThetaDeg)
	r := sc.Radiation
	var errs any
	if sc.CountErrors != nil {
		errs = encodeFloats(sc.CountErrors)
	}
	id, err := t.insert(`INSERT INTO scan (sample_id, file_name, sha256, file_format, anode, kalpha1_angstrom, kalpha2_angstrom,
			kalpha2_ratio, kalpha2_state, radiation_text, radiation_assumed, internal_standard, points, two_theta_from_deg,
			two_theta_to_deg, two_theta_deg, counts, count_errors, imported_at, imported_by, notes)
		VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?) RETURNING id`,
		sc.SampleID, sc.FileName, sc.SHA256, sc.Format, r.Anode, r.Kalpha1Angstrom, r.Kalpha2Angstrom,
		r.Kalpha2Ratio, r.Kalpha2, r.Text, boolInt(r.Assumed), sc.InternalStandard, n, sc.TwoThetaDeg[0],
		sc.TwoThetaDeg[n-1], encodeFloats(sc.TwoThetaDeg), encodeFloats(sc.Counts), errs,
		formatTime(sc.ImportedAt), sc.ImportedBy, sc.Notes)
	if isConstraint(err) {
		return meltbook.Errorf(conflict, sc.FileName, "this file is already a scan of the sample")
	}
	if err != nil {
		return fmt.Errorf("store scan %s: %w", sc.FileName, err)
	}
	sc.ID = id
	return t.recordCreate(meltID, "scan", id, scanSummaryJSON{
		File: sc.FileName, SHA256: sc.SHA256, Format: sc.Format, Radiation: sc.Radiation,
		InternalStandard: sc.InternalStandard, Points: n, FromDeg: sc.TwoThetaDeg[0], ToDeg: sc.TwoThetaDeg[n-1], Notes: sc.Notes,
	})
}

// indexingSummaryJSON is what the history keeps of a new indexing.
type indexingSummaryJSON struct {
	Scan        int64    `json:"scan"`
	Version     int      `json:"version"`
	By          string   `json:"by"`
	Radiation   string   `json:"radiation"`
	Standard    string   `json:"internal_standard,omitempty"`
	Peaks       int      `json:"peaks"`
	Phases      []string `json:"phases"`
	Unexplained int      `json:"unexplained"`
}

func (t *txn) insertIndexing(meltID int64, sa *meltbook.Sample, sc *meltbook.Scan, x *meltbook.Indexing, ps []Proposal) error {
	x.ScanID = sc.ID
	if x.At.IsZero() {
		x.At = t.now
	}
	if x.RequestedBy == "" {
		x.RequestedBy = t.who
	}
	r := x.Radiation
	id, err := t.insert(`INSERT INTO indexing (scan_id, version, indexed_at, indexed_by, requested_by, reason, anode,
			kalpha1_angstrom, kalpha2_angstrom, kalpha2_ratio, kalpha2_state, radiation_text, radiation_assumed,
			internal_standard, zero_shift_deg, zero_shift_su_deg, tolerance_deg, max_chance, notes)
		VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?) RETURNING id`,
		sc.ID, x.Version, formatTime(x.At), x.By, x.RequestedBy, x.Reason, r.Anode,
		r.Kalpha1Angstrom, r.Kalpha2Angstrom, r.Kalpha2Ratio, r.Kalpha2, r.Text, boolInt(r.Assumed),
		x.InternalStandard, nullFloat(x.ZeroShiftDeg), nullFloat(x.ZeroShiftSUDeg), x.ToleranceDeg, x.MaxChance,
		strings.Join(x.Notes, "\n"))
	if err != nil {
		return fmt.Errorf("store indexing of scan %d: %w", sc.ID, err)
	}
	x.ID = id
	for i := range x.Peaks {
		p := &x.Peaks[i]
		if p.Found == "" {
			p.Found = meltbook.PeakAutomatic
		}
		p.ID, err = t.insert(`INSERT INTO peak (indexing_id, position, two_theta_deg, two_theta_su_deg, d_angstrom, d_su_angstrom,
				height, height_su, area, area_su, fwhm_deg, fwhm_su_deg, eta, eta_su, significance, standard_line,
				corrected_two_theta_deg, corrected_d_angstrom, found)
			VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?) RETURNING id`,
			id, i, p.TwoThetaDeg, finiteOrNull(p.TwoThetaSUDeg), p.DAngstrom, finiteOrNull(p.DSUAngstrom),
			p.Height, finiteOrNull(p.HeightSU), p.Area, finiteOrNull(p.AreaSU), p.FWHMDeg, finiteOrNull(p.FWHMSUDeg),
			p.Eta, finiteOrNull(p.EtaSU), p.Significance, p.Standard,
			finiteOrNull(p.CorrectedTwoThetaDeg), finiteOrNull(p.CorrectedDAngstrom), string(p.Found))
		if err != nil {
			return fmt.Errorf("store peak %d of scan %d: %w", i+1, sc.ID, err)
		}
	}
	titles := make([]string, len(x.Phases))
	for i := range x.Phases {
		ph := &x.Phases[i]
		titles[i] = ph.Title()
		ph.ID, err = t.insertPhase(nil, id, i, ph)
		if isConstraint(err) {
			return meltbook.Errorf(invalid, "indexing", "phase %d (%s) has a kind, lattice, cell or chance the notebook does not hold", i+1, titles[i])
		}
		if err != nil {
			return fmt.Errorf("store phase %d of scan %d: %w", i+1, sc.ID, err)
		}
		for j := range ph.Assignments {
			a := &ph.Assignments[j]
			a.PeakID = x.Peaks[a.Peak].ID
			if err := t.insertAssignment(ph.ID, a.PeakID, a.CalculatedTwoThetaDeg, a.ResidualDeg, a.DAngstrom, a.Label, a.Detail,
				a.PredictedIntensity); err != nil {
				if isConstraint(err) {
					return meltbook.Errorf(invalid, "indexing", "phase %d assigns peak %d twice", i+1, a.Peak+1)
				}
				return fmt.Errorf("store assignment of scan %d: %w", sc.ID, err)
			}
		}
	}
	for i, m := range x.Models {
		if err := t.insertModel(id, i, m); err != nil {
			return fmt.Errorf("store model of scan %d: %w", sc.ID, err)
		}
	}
	for _, u := range x.Unexplained {
		if _, err := t.exec(`INSERT INTO unexplained_peak (indexing_id, peak_id) VALUES (?, ?)`, id, x.Peaks[u].ID); err != nil {
			if isConstraint(err) {
				return meltbook.Errorf(invalid, "indexing", "peak %d is listed twice as unexplained", u+1)
			}
			return fmt.Errorf("store unexplained peak of scan %d: %w", sc.ID, err)
		}
	}
	if err := t.recordCreate(meltID, "indexing", id, indexingSummaryJSON{
		Scan: sc.ID, Version: x.Version, By: x.By, Radiation: x.Radiation.Text, Standard: x.InternalStandard,
		Peaks: len(x.Peaks), Phases: titles, Unexplained: len(x.Unexplained),
	}); err != nil {
		return err
	}
	for _, p := range ps {
		o := p.Outcome
		o.ID = 0
		o.Source, o.Status = meltbook.ByAutomatic, meltbook.Proposed
		if o.RecordedBy == "" {
			o.RecordedBy = x.By
		}
		if o.At.IsZero() {
			o.At = t.now
		}
		o.SampleCode = ""
		if err := t.insertOutcome(meltID, sa, &o); err != nil {
			return err
		}
		var phase any
		if p.Phase >= 0 {
			phase = x.Phases[p.Phase].ID
		}
		if _, err := t.exec(`INSERT INTO indexing_proposal (outcome_id, indexing_id, phase_id, confidence) VALUES (?, ?, ?, ?)`,
			o.ID, id, phase, p.Confidence); err != nil {
			return fmt.Errorf("store proposal of scan %d: %w", sc.ID, err)
		}
	}
	return nil
}

// supersede rejects the pending proposals of a scan's earlier indexings.
func (t *txn) supersede(meltID, scanID int64, version int) error {
	rows, err := t.query(`SELECT o.id FROM indexing_proposal p JOIN indexing x ON x.id = p.indexing_id
		JOIN outcome o ON o.id = p.outcome_id WHERE x.scan_id = ? AND o.status = 'proposed' ORDER BY o.id`, scanID)
	if err != nil {
		return fmt.Errorf("scan %d: %w", scanID, err)
	}
	var ids []int64
	for rows.Next() {
		var id int64
		if err := rows.Scan(&id); err != nil {
			rows.Close()
			return fmt.Errorf("scan %d: %w", scanID, err)
		}
		ids = append(ids, id)
	}
	rows.Close()
	if err := rows.Err(); err != nil {
		return fmt.Errorf("scan %d: %w", scanID, err)
	}
	why := fmt.Sprintf("%s (scan %d, indexing %d)", supersededReason, scanID, version)
	for _, id := range ids {
		if _, err := t.exec(`UPDATE outcome SET status = 'rejected' WHERE id = ?`, id); err != nil {
			return fmt.Errorf("outcome %d: %w", id, err)
		}
		if _, err := t.record(meltID, "outcome", id, "reject", change{"status", string(meltbook.Proposed), string(meltbook.Rejected)}, why); err != nil {
			return err
		}
	}
	return nil
}

// amendScanRadiation corrects the radiation recorded with a scan.
func (t *txn) amendScanRadiation(meltID int64, sc *meltbook.Scan, r meltbook.ScanRadiation, why string) error {
	if _, err := t.exec(`UPDATE scan SET anode = ?, kalpha1_angstrom = ?, kalpha2_angstrom = ?, kalpha2_ratio = ?,
			kalpha2_state = ?, radiation_text = ?, radiation_assumed = ? WHERE id = ?`,
		r.Anode, r.Kalpha1Angstrom, r.Kalpha2Angstrom, r.Kalpha2Ratio, r.Kalpha2, r.Text, boolInt(r.Assumed), sc.ID); err != nil {
		return fmt.Errorf("amend scan %d: %w", sc.ID, err)
	}
	before, after := radiationText(sc.Radiation), radiationText(r)
	sc.Radiation = r
	_, err := t.record(meltID, "scan", sc.ID, "amend", change{"radiation", before, after}, why)
	return err
}

func radiationText(r meltbook.ScanRadiation) string {
	if r.Assumed {
		return r.Text + " (assumed)"
	}
	return r.Text
}

// ScanRecord returns everything the notebook holds about scan id: the scan
// with its points, every indexing oldest first with its peaks, phases,
// assignments and models, the proposals made from them and the scan's
// history.
func (s *Store) ScanRecord(ctx context.Context, id int64) (*meltbook.ScanRecord, error) {
	var rec *meltbook.ScanRecord
	err := s.read(ctx, func(t *txn) error {
		var err error
		rec, err = t.scanRecord(id)
		return err
	})
	return rec, err
}

// SampleScans lists the scans of one sample, oldest first, without their
// points.
func (s *Store) SampleScans(ctx context.Context, sampleCode string) ([]meltbook.ScanSummary, error) {
	var out []meltbook.ScanSummary
	err := s.read(ctx, func(t *txn) error {
		sa, err := t.sampleByCode(sampleCode)
		if err != nil {
			return err
		}
		out, err = t.scanSummaries(`sc.sample_id = ?`, sa.ID)
		return err
	})
	return out, err
}

// MeltScans lists the scans of every sample of a melt, oldest first,
// without their points.
func (s *Store) MeltScans(ctx context.Context, meltCode string) ([]meltbook.ScanSummary, error) {
	var out []meltbook.ScanSummary
	err := s.read(ctx, func(t *txn) error {
		m, err := t.meltByCode(meltCode)
		if err != nil {
			return err
		}
		out, err = t.scanSummaries(`sa.melt_id = ?`, m.ID)
		return err
	})
	return out, err
}

// FindScanByFile returns the scan of a sample imported from a file with
// this SHA-256 digest, or a NotFound error.
func (s *Store) FindScanByFile(ctx context.Context, sampleCode, sha256 string) (*meltbook.ScanSummary, error) {
	var out *meltbook.ScanSummary
	err := s.read(ctx, func(t *txn) error {
		sa, err := t.sampleByCode(sampleCode)
		if err != nil {
			return err
		}
		if out, err = t.scanBySHA(sa.ID, sha256); err != nil {
			return err
		}
		if out == nil {
			return meltbook.Errorf(notFound, "scan", "sample %s has no scan from a file with SHA-256 %s", sampleCode, sha256)
		}
		return nil
	})
	return out, err
}

// CountScans returns the number of scans in the notebook.
func (s *Store) CountScans(ctx context.Context) (int, error) {
	var n int
	err := s.read(ctx, func(t *txn) error {
		if err := t.queryRow(`SELECT COUNT(*) FROM scan`).Scan(&n); err != nil {
			return fmt.Errorf("count scans: %w", err)
		}
		return nil
	})
	return n, err
}

func (t *txn) scanBySHA(sampleID int64, sha string) (*meltbook.ScanSummary, error) {
	out, err := t.scanSummaries(`sc.sample_id = ? AND sc.sha256 = ?`, sampleID, sha)
	if err != nil || len(out) == 0 {
		return nil, err
	}
	return &out[0], nil
}

const scanSummaryColumns = `sc.id, sa.code, m.code, sc.file_name, sc.sha256, sc.file_format, sc.anode, sc.kalpha1_angstrom,
	sc.kalpha2_angstrom, sc.kalpha2_ratio, sc.kalpha2_state, sc.radiation_text, sc.radiation_assumed, sc.internal_standard,
	sc.points, sc.two_theta_from_deg, sc.two_theta_to_deg, sc.imported_at, sc.imported_by`

// scanSummaries lists scans matching a condition on sc (scan), sa (sample)
// or m (melt), oldest first, each with its current indexing in brief.
func (t *txn) scanSummaries(where string, args ...any) ([]meltbook.ScanSummary, error) {
	rows, err := t.query(`SELECT `+scanSummaryColumns+` FROM scan sc JOIN sample sa ON sa.id = sc.sample_id
		JOIN melt m ON m.id = sa.melt_id WHERE `+where+` ORDER BY sc.imported_at, sc.id`, args...)
	if err != nil {
		return nil, fmt.Errorf("scans: %w", err)
	}
	var out []meltbook.ScanSummary
	for rows.Next() {
		var s meltbook.ScanSummary
		var assumed int
		var at string
		r := &s.Radiation
		if err := rows.Scan(&s.ID, &s.SampleCode, &s.MeltCode, &s.FileName, &s.SHA256, &s.Format, &r.Anode, &r.Kalpha1Angstrom,
			&r.Kalpha2Angstrom, &r.Kalpha2Ratio, &r.Kalpha2, &r.Text, &assumed, &s.InternalStandard,
			&s.Points, &s.FromDeg, &s.ToDeg, &at, &s.ImportedBy); err != nil {
			rows.Close()
			return nil, fmt.Errorf("scans: %w", err)
		}
		r.Assumed = assumed == 1
		if s.ImportedAt, err = parseTime(at); err != nil {
			rows.Close()
			return nil, err
		}
		out = append(out, s)
	}
	rows.Close()
	if err := rows.Err(); err != nil {
		return nil, fmt.Errorf("scans: %w", err)
	}
	for i := range out {
		if err := t.fillIndexingBrief(&out[i]); err != nil {
			return nil, err
		}
	}
	return out, nil
}

// fillIndexingBrief sums up a scan's current indexing.
func (t *txn) fillIndexingBrief(s *meltbook.ScanSummary) error {
	var id int64
	err := t.queryRow(`SELECT id, version FROM indexing WHERE scan_id = ? ORDER BY version DESC LIMIT 1`, s.ID).Scan(&id, &s.IndexingVersion)
	if errors.Is(err, sql.ErrNoRows) {
		s.Indexing = "not indexed"
		return nil
	}
	if err != nil {
		return fmt.Errorf("scan %d: %w", s.ID, err)
	}
	x := meltbook.Indexing{ID: id}
	if err := t.fillPeaks(&x); err != nil {
		return err
	}
	if err := t.fillPhases(&x); err != nil {
		return err
	}
	s.Indexing = IndexingBrief(&x)
	return nil
}

// IndexingBrief sums up an indexing in one line: each phase's title with
// the peaks it explains, or that no phase beat chance.
func IndexingBrief(x *meltbook.Indexing) string {
	n := x.SpecimenPeaks()
	if len(x.Phases) == 0 {
		if n == 0 {
			return "no peaks found"
		}
		return fmt.Sprintf("no phase beats chance (%d peaks)", n)
	}
	parts := make([]string, len(x.Phases))
	for i := range x.Phases {
		ph := &x.Phases[i]
		parts[i] = fmt.Sprintf("%s, %d of %d peaks", ph.Title(), len(ph.Assignments), n)
	}
	return strings.Join(parts, "; ")
}

func (t *txn) scanByID(id int64, points bool) (*meltbook.Scan, error) {
	out, err := t.scanSummaries(`sc.id = ?`, id)
	if err != nil {
		return nil, err
	}
	if len(out) == 0 {
		return nil, meltbook.Errorf(notFound, "scan", "no scan %d in the notebook", id)
	}
	s := out[0]
	sc := &meltbook.Scan{ID: s.ID, SampleCode: s.SampleCode, MeltCode: s.MeltCode, FileName: s.FileName, SHA256: s.SHA256,
		Format: s.Format, Radiation: s.Radiation, InternalStandard: s.InternalStandard, ImportedAt: s.ImportedAt, ImportedBy: s.ImportedBy}
	var tt, counts, errs []byte
	if err := t.queryRow(`SELECT sample_id, notes, two_theta_deg, counts, count_errors FROM scan WHERE id = ?`, id).
		Scan(&sc.SampleID, &sc.Notes, &tt, &counts, &errs); err != nil {
		return nil, fmt.Errorf("scan %d: %w", id, err)
	}
	if !points {
		return sc, nil
	}
	if sc.TwoThetaDeg, err = decodeFloats(tt, s.Points); err != nil {
		return nil, fmt.Errorf("scan %d angles: %w", id, err)
	}
	if sc.Counts, err = decodeFloats(counts, s.Points); err != nil {
		return nil, fmt.Errorf("scan %d counts: %w", id, err)
	}
	if errs != nil {
		if sc.CountErrors, err = decodeFloats(errs, s.Points); err != nil {
			return nil, fmt.Errorf("scan %d uncertainties: %w", id, err)
		}
	}
	return sc, nil
}

func (t *txn) scanRecord(id int64) (*meltbook.ScanRecord, error) {
	sc, err := t.scanByID(id, true)
	if err != nil {
		return nil, err
	}
	rec := &meltbook.ScanRecord{Scan: *sc, Indexings: []meltbook.Indexing{}, Proposals: []meltbook.ScanProposal{}}
	rows, err := t.query(`SELECT id, version, indexed_at, indexed_by, requested_by, reason, anode, kalpha1_angstrom,
			kalpha2_angstrom, kalpha2_ratio, kalpha2_state, radiation_text, radiation_assumed, internal_standard,
			zero_shift_deg, zero_shift_su_deg, tolerance_deg, max_chance, notes
		FROM indexing WHERE scan_id = ? ORDER BY version`, id)
	if err != nil {
		return nil, fmt.Errorf("scan %d: %w", id, err)
	}
	for rows.Next() {
		x := meltbook.Indexing{ScanID: id}
		var at, notes string
		var assumed int
		var zero, zeroSU sql.NullFloat64
		r := &x.Radiation
		if err := rows.Scan(&x.ID, &x.Version, &at, &x.By, &x.RequestedBy, &x.Reason, &r.Anode, &r.Kalpha1Angstrom,
			&r.Kalpha2Angstrom, &r.Kalpha2Ratio, &r.Kalpha2, &r.Text, &assumed, &x.InternalStandard,
			&zero, &zeroSU, &x.ToleranceDeg, &x.MaxChance, &notes); err != nil {
			rows.Close()
			return nil, fmt.Errorf("scan %d: %w", id, err)
		}
		r.Assumed = assumed == 1
		x.ZeroShiftDeg, x.ZeroShiftSUDeg = floatPtr(zero), floatPtr(zeroSU)
		if notes != "" {
			x.Notes = strings.Split(notes, "\n")
		}
		if x.At, err = parseTime(at); err != nil {
			rows.Close()
			return nil, err
		}
		rec.Indexings = append(rec.Indexings, x)
	}
	rows.Close()
	if err := rows.Err(); err != nil {
		return nil, fmt.Errorf("scan %d: %w", id, err)
	}
	for i := range rec.Indexings {
		x := &rec.Indexings[i]
		if err := t.fillPeaks(x); err != nil {
			return nil, err
		}
		if err := t.fillPhases(x); err != nil {
			return nil, err
		}
		if err := t.fillModels(x); err != nil {
			return nil, err
		}
	}
	if rec.Proposals, err = t.scanProposals(id); err != nil {
		return nil, err
	}
	if rec.History, err = t.scanHistory(id); err != nil {
		return nil, err
	}
	return rec, nil
}

func (t *txn) fillPeaks(x *meltbook.Indexing) error {
	rows, err := t.query(`SELECT id, two_theta_deg, two_theta_su_deg, d_angstrom, d_su_angstrom, height, height_su, area, area_su,
			fwhm_deg, fwhm_su_deg, eta, eta_su, significance, standard_line, corrected_two_theta_deg, corrected_d_angstrom, found
		FROM peak WHERE indexing_id = ? ORDER BY position`, x.ID)
	if err != nil {
		return fmt.Errorf("peaks: %w", err)
	}
	defer rows.Close()
	x.Peaks = []meltbook.Peak{}
	for rows.Next() {
		var p meltbook.Peak
		var ttSU, dSU, hSU, aSU, wSU, eSU, ctt, cd sql.NullFloat64
		var found string
		if err := rows.Scan(&p.ID, &p.TwoThetaDeg, &ttSU, &p.DAngstrom, &dSU, &p.Height, &hSU, &p.Area, &aSU,
			&p.FWHMDeg, &wSU, &p.Eta, &eSU, &p.Significance, &p.Standard, &ctt, &cd, &found); err != nil {
			return fmt.Errorf("peaks: %w", err)
		}
		p.TwoThetaSUDeg, p.DSUAngstrom, p.HeightSU, p.AreaSU = floatPtr(ttSU), floatPtr(dSU), floatPtr(hSU), floatPtr(aSU)
		p.FWHMSUDeg, p.EtaSU, p.CorrectedTwoThetaDeg, p.CorrectedDAngstrom = floatPtr(wSU), floatPtr(eSU), floatPtr(ctt), floatPtr(cd)
		p.Found = meltbook.PeakOrigin(found)
		x.Peaks = append(x.Peaks, p)
	}
	if err := rows.Err(); err != nil {
		return fmt.Errorf("peaks: %w", err)
	}
	rows.Close()
	position := make(map[int64]int, len(x.Peaks))
	for i, p := range x.Peaks {
		position[p.ID] = i
	}
	urows, err := t.query(`SELECT peak_id FROM unexplained_peak WHERE indexing_id = ?`, x.ID)
	if err != nil {
		return fmt.Errorf("unexplained peaks: %w", err)
	}
	defer urows.Close()
	x.Unexplained = []int{}
	for urows.Next() {
		var id int64
		if err := urows.Scan(&id); err != nil {
			return fmt.Errorf("unexplained peaks: %w", err)
		}
		x.Unexplained = append(x.Unexplained, position[id])
	}
	if err := urows.Err(); err != nil {
		return fmt.Errorf("unexplained peaks: %w", err)
	}
	sort.Ints(x.Unexplained)
	return nil
}

func (t *txn) fillPhases(x *meltbook.Indexing) error {
	rows, err := t.query(`SELECT `+phaseColumns+` FROM indexed_phase WHERE indexing_id = ? ORDER BY position`, x.ID)
	if err != nil {
		return fmt.Errorf("phases: %w", err)
	}
	x.Phases = []meltbook.IndexedPhase{}
	for rows.Next() {
		var ph meltbook.IndexedPhase
		if err := scanPhase(rows, &ph); err != nil {
			rows.Close()
			return fmt.Errorf("phases: %w", err)
		}
		x.Phases = append(x.Phases, ph)
	}
	rows.Close()
	if err := rows.Err(); err != nil {
		return fmt.Errorf("phases: %w", err)
	}
	position := make(map[int64]int, len(x.Peaks))
	for i, p := range x.Peaks {
		position[p.ID] = i
	}
	for i := range x.Phases {
		ph := &x.Phases[i]
		arows, err := t.query(`SELECT a.peak_id, p.two_theta_deg, a.calculated_two_theta_deg, a.residual_deg, a.d_angstrom, a.label, a.detail,
				a.predicted_intensity
			FROM peak_assignment a JOIN peak p ON p.id = a.peak_id WHERE a.phase_id = ? ORDER BY p.position`, ph.ID)
		if err != nil {
			return fmt.Errorf("assignments: %w", err)
		}
		ph.Assignments = []meltbook.PeakAssignment{}
		for arows.Next() {
			var a meltbook.PeakAssignment
			var predicted sql.NullFloat64
			if err := arows.Scan(&a.PeakID, &a.TwoThetaDeg, &a.CalculatedTwoThetaDeg, &a.ResidualDeg, &a.DAngstrom, &a.Label, &a.Detail,
				&predicted); err != nil {
				arows.Close()
				return fmt.Errorf("assignments: %w", err)
			}
			a.PredictedIntensity = floatPtr(predicted)
			a.Peak = position[a.PeakID]
			ph.Assignments = append(ph.Assignments, a)
		}
		arows.Close()
		if err := arows.Err(); err != nil {
			return fmt.Errorf("assignments: %w", err)
		}
	}
	return nil
}

func (t *txn) fillModels(x *meltbook.Indexing) error {
	rows, err := t.query(`SELECT `+modelColumns+` FROM indexing_model WHERE indexing_id = ? ORDER BY position`, x.ID)
	if err != nil {
		return fmt.Errorf("models: %w", err)
	}
	defer rows.Close()
	x.Models = []meltbook.ModelTried{}
	for rows.Next() {
		var m meltbook.ModelTried
		if err := scanModel(rows, &m); err != nil {
			return fmt.Errorf("models: %w", err)
		}
		x.Models = append(x.Models, m)
	}
	return rows.Err()
}

func (t *txn) scanProposals(scanID int64) ([]meltbook.ScanProposal, error) {
	rows, err := t.query(`SELECT `+outcomeColumns+`, x.version, p.confidence FROM indexing_proposal p
		JOIN indexing x ON x.id = p.indexing_id JOIN outcome o ON o.id = p.outcome_id JOIN sample sa ON sa.id = o.sample_id
		WHERE x.scan_id = ? ORDER BY x.version, o.id`, scanID)
	if err != nil {
		return nil, fmt.Errorf("proposals: %w", err)
	}
	defer rows.Close()
	out := []meltbook.ScanProposal{}
	for rows.Next() {
		var p meltbook.ScanProposal
		o, err := scanOutcome(scanExtra{rows, []any{&p.IndexingVersion, &p.Confidence}})
		if err != nil {
			return nil, fmt.Errorf("proposals: %w", err)
		}
		p.Outcome, p.OutcomeID = *o, o.ID
		out = append(out, p)
	}
	if err := rows.Err(); err != nil {
		return nil, fmt.Errorf("proposals: %w", err)
	}
	return out, nil
}

// scanHistory lists the history of a scan, its indexings and the outcomes
// proposed from them, oldest first.
func (t *txn) scanHistory(scanID int64) ([]meltbook.HistoryEntry, error) {
	rows, err := t.query(`SELECT `+historyColumns+` FROM history h LEFT JOIN melt m ON m.id = h.melt_id
		WHERE (h.entity = 'scan' AND h.entity_id = ?)
		   OR (h.entity = 'indexing' AND h.entity_id IN (SELECT id FROM indexing WHERE scan_id = ?))
		   OR (h.entity = 'outcome' AND h.entity_id IN (SELECT p.outcome_id FROM indexing_proposal p
		       JOIN indexing x ON x.id = p.indexing_id WHERE x.scan_id = ?))
		ORDER BY h.id`, scanID, scanID, scanID)
	if err != nil {
		return nil, fmt.Errorf("history: %w", err)
	}
	return scanHistory(rows)
}

// encodeFloats writes values as little-endian IEEE 754 doubles.
func encodeFloats(v []float64) []byte {
	b := make([]byte, 8*len(v))
	for i, x := range v {
		binary.LittleEndian.PutUint64(b[8*i:], math.Float64bits(x))
	}
	return b
}

// decodeFloats reads n little-endian doubles.
func decodeFloats(b []byte, n int) ([]float64, error) {
	if len(b) != 8*n {
		return nil, fmt.Errorf("%d bytes for %d points", len(b), n)
	}
	v := make([]float64, n)
	for i := range v {
		v[i] = math.Float64frombits(binary.LittleEndian.Uint64(b[8*i:]))
	}
	return v, nil
}

func boolInt(b bool) int {
	if b {
		return 1
	}
	return 0
}

// finiteOrNull stores a missing or non-finite number as NULL.
func finiteOrNull(v *float64) any {
	if v == nil || math.IsNaN(*v) || math.IsInf(*v, 0) {
		return nil
	}
	return *v
}

func zeroNull(v float64) any {
	if v == 0 {
		return nil
	}
	return v
}

// scanExtra scans a row whose columns are a scanner's followed by extra
// trailing ones.
type scanExtra struct {
	rows  *sql.Rows
	extra []any
}

func (p scanExtra) Scan(dest ...any) error { return p.rows.Scan(append(dest, p.extra...)...) }

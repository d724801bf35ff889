package store

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"sort"
	"sync"

	"meltbook"
)

// RecentChanges is how many history entries Summary lists.
const RecentChanges = 12

// Summary is the notebook at a glance.
type Summary struct {
	Melts   int `json:"melts"`
	Samples int `json:"samples"`
	Scans   int `json:"scans"`
	// Recent are the latest history entries, newest first.
	Recent []meltbook.HistoryEntry `json:"recent"`
}

// Summary counts the melts, samples and diffraction scans and lists the
// RecentChanges latest history entries, newest first.
func (s *Store) Summary(ctx context.Context) (Summary, error) {
	var sum Summary
	err := s.read(ctx, func(t *txn) error {
		if err := t.queryRow(`SELECT (SELECT COUNT(*) FROM melt), (SELECT COUNT(*) FROM sample), (SELECT COUNT(*) FROM scan)`).
			Scan(&sum.Melts, &sum.Samples, &sum.Scans); err != nil {
			return err
		}
		rows, err := t.query(`SELECT `+historyColumns+` FROM history h LEFT JOIN melt m ON m.id = h.melt_id
			ORDER BY h.id DESC LIMIT ?`, RecentChanges)
		if err != nil {
			return err
		}
		sum.Recent, err = scanHistory(rows)
		return err
	})
	if err != nil {
		return Summary{}, fmt.Errorf("summary: %w", err)
	}
	if sum.Recent == nil {
		sum.Recent = []meltbook.HistoryEntry{}
	}
	return sum, nil
}

// SampleMelt returns the code of the melt a sample belongs to; a melt's
// own sample has the melt's code.
func (s *Store) SampleMelt(ctx context.Context, sampleCode string) (string, error) {
	var melt string
	err := s.read(ctx, func(t *txn) error {
		return t.queryRow(`SELECT m.code FROM sample sa JOIN melt m ON m.id = sa.melt_id WHERE sa.code = ?`, sampleCode).Scan(&melt)
	})
	if errors.Is(err, sql.ErrNoRows) {
		return "", meltbook.Errorf(notFound, "sample", "no sample %s in the notebook", sampleCode)
	}
	if err != nil {
		return "", fmt.Errorf("sample %s: %w", sampleCode, err)
	}
	return melt, nil
}

// MapSample is one sample as the composition and descriptor maps need it.
type MapSample struct {
	Code string `json:"code"`
	Melt string `json:"melt"`
	// Composition is measured when Measured is set, else the melt's nominal.
	Composition []meltbook.ElementFraction `json:"composition"`
	Measured    bool                       `json:"measured"`
	// Outcomes are the sample's own, of any source and status, a person's
	// first, then confirmed, proposed and rejected proposals.
	Outcomes []meltbook.Outcome `json:"outcomes"`
	// CoolingRateKPerS is the estimated cooling rate of the melt-spin step
	// the sample came from; nil when not estimated.
	CoolingRateKPerS *float64 `json:"cooling_rate_k_per_s,omitempty"`
	// Annealed is set when a heat treatment followed spinning.
	Annealed bool `json:"annealed"`
}

// MapSamples returns every sample of the notebook in the order recorded,
// each with what the maps need. A sample's history is its ancestors'
// steps, oldest first, followed by its own, so a piece cut from a ribbon
// and annealed came from its parent's melt-spin step:
//
//   - Composition: the sample's latest measured composition (by time, then
//     as recorded), else its nearest ancestor's, else the melt's nominal one.
//   - CoolingRateKPerS: the estimate of the last melt-spin step in its
//     history; nil when that step has none, or there is no such step.
//   - Annealed: an anneal step comes after the last melt-spin step (or there
//     is an anneal and no spinning at all).
//
// Reading them costs a pass over eight tables; while the notebook file is
// unchanged (by this program or any other: SQLite's data version says so)
// repeated calls return the rows read before. Callers must not change the
// returned slice or anything it refers to.
func (s *Store) MapSamples(ctx context.Context) ([]MapSample, error) {
	c := &s.overview
	c.mu.Lock()
	defer c.mu.Unlock()
	version, versionErr := c.dataVersion(ctx, s.db)
	if versionErr == nil && c.valid && version == c.version {
		return c.samples, nil
	}
	var out []MapSample
	err := s.read(ctx, func(t *txn) error {
		var err error
		out, err = t.mapSamples()
		return err
	})
	if err != nil {
		return nil, fmt.Errorf("map samples: %w", err)
	}
	c.samples, c.version, c.valid = out, version, versionErr == nil
	return out, nil
}

// overviewCache keeps the last MapSamples result with the data version of
// the file when it was read. The version comes from a connection of its
// own that never writes: SQLite changes the data_version it reports
// whenever another connection, of this process or another, commits.
type overviewCache struct {
	mu      sync.Mutex
	watch   *sql.Conn
	version int64
	valid   bool
	samples []MapSample
}

func (c *overviewCache) dataVersion(ctx context.Context, db *sql.DB) (int64, error) {
	if c.watch == nil {
		conn, err := db.Conn(ctx)
		if err != nil {
			return 0, err
		}
		c.watch = conn
	}
	var v int64
	err := c.watch.QueryRowContext(ctx, "PRAGMA data_version").Scan(&v)
	return v, err
}

// close releases the watching connection.
func (c *overviewCache) close() error {
	c.mu.Lock()
	defer c.mu.Unlock()
	c.valid, c.samples = false, nil
	if c.watch == nil {
		return nil
	}
	err := c.watch.Close()
	c.watch = nil
	return err
}

// sampleHistory is what mapSamples gathers about one sample before the
// ancestors are taken into account.
type sampleHistory struct {
	parent int64 // 0 for a melt's own sample
	meltID int64
	index  int // position in the result
	// measuredAt and measured are the sample's own latest measured
	// composition and its time.
	measuredAt string
	measuredID int64
	measured   []meltbook.ElementFraction
	// steps are the sample's own steps in order.
	steps []mapStep
	// resolving guards against a parent cycle; once resolved, rate and
	// annealed account for the whole history.
	resolving, resolved bool
	rate                *float64
	annealed            bool
}

type mapStep struct {
	id   int64
	seq  int
	kind meltbook.StepKind
}

// positioned is an element fraction with its place in the composition as
// entered.
type positioned struct {
	position int
	meltbook.ElementFraction
}

// mapSamples reads each table once, in the order it is stored, and puts
// the rows in order in Go: sorting in SQL would cost temporary B-trees.
func (t *txn) mapSamples() ([]MapSample, error) {
	var out []MapSample
	byID := map[int64]*sampleHistory{}
	var order []int64
	err := t.each(`SELECT sa.id, sa.parent_id, sa.melt_id, sa.code, m.code FROM sample sa JOIN melt m ON m.id = sa.melt_id ORDER BY sa.id`, func(rows *sql.Rows) error {
		var id, meltID int64
		var parent sql.NullInt64
		var ms MapSample
		if err := rows.Scan(&id, &parent, &meltID, &ms.Code, &ms.Melt); err != nil {
			return err
		}
		byID[id] = &sampleHistory{parent: parent.Int64, meltID: meltID, index: len(out)}
		order = append(order, id)
		out = append(out, ms)
		return nil
	})
	if err != nil {
		return nil, fmt.Errorf("samples: %w", err)
	}

	nominal, err := t.positionedFractions(`SELECT melt_id, position, element, fraction FROM melt_element`)
	if err != nil {
		return nil, fmt.Errorf("nominal compositions: %w", err)
	}

	// Each sample keeps its latest measurement: the latest time, and of
	// two at one time the one recorded last.
	err = t.each(`SELECT id, sample_id, measured_at FROM measured_composition`, func(rows *sql.Rows) error {
		var id, sampleID int64
		var at string
		if err := rows.Scan(&id, &sampleID, &at); err != nil {
			return err
		}
		if h := byID[sampleID]; h != nil && (at > h.measuredAt || at == h.measuredAt && id > h.measuredID) {
			h.measuredAt, h.measuredID = at, id
		}
		return nil
	})
	if err != nil {
		return nil, fmt.Errorf("measured compositions: %w", err)
	}
	measured, err := t.positionedFractions(`SELECT measurement_id, position, element, fraction FROM measured_fraction`)
	if err != nil {
		return nil, fmt.Errorf("measured compositions: %w", err)
	}
	for _, h := range byID {
		if h.measuredID != 0 {
			h.measured = measured[h.measuredID]
		}
	}

	rates := map[int64]float64{}
	err = t.each(`SELECT step_id, value_si FROM step_param WHERE name = 'cooling-rate' AND value_si IS NOT NULL`, func(rows *sql.Rows) error {
		var id int64
		var rate float64
		if err := rows.Scan(&id, &rate); err != nil {
			return err
		}
		rates[id] = rate
		return nil
	})
	if err != nil {
		return nil, fmt.Errorf("cooling rates: %w", err)
	}
	// Only spinning and annealing matter here.
	err = t.each(`SELECT id, sample_id, seq, kind FROM process_step WHERE kind IN ('melt-spin', 'anneal')`, func(rows *sql.Rows) error {
		var st mapStep
		var sampleID int64
		var kind string
		if err := rows.Scan(&st.id, &sampleID, &st.seq, &kind); err != nil {
			return err
		}
		st.kind = meltbook.StepKind(kind)
		if h := byID[sampleID]; h != nil {
			h.steps = append(h.steps, st)
		}
		return nil
	})
	if err != nil {
		return nil, fmt.Errorf("steps: %w", err)
	}

	// The sample code is filled in below, from the samples read above.
	err = t.each(`SELECT id, sample_id, '', kind, lattice, approximant_order, phase_name, fraction,
		source, recorded_by, evidence, status, decided_at FROM outcome ORDER BY id`, func(rows *sql.Rows) error {
		o, err := scanOutcome(rows)
		if err != nil {
			return err
		}
		if h := byID[o.SampleID]; h != nil {
			ms := &out[h.index]
			o.SampleCode = ms.Code
			ms.Outcomes = append(ms.Outcomes, *o)
		}
		return nil
	})
	if err != nil {
		return nil, fmt.Errorf("outcomes: %w", err)
	}

	for _, id := range order {
		h := byID[id]
		if err := resolveHistory(byID, h, rates); err != nil {
			return nil, err
		}
		ms := &out[h.index]
		ms.CoolingRateKPerS, ms.Annealed = h.rate, h.annealed
		// As MeltRecord lists them: a person's first, then confirmed,
		// proposed and rejected proposals, each oldest first.
		sort.SliceStable(ms.Outcomes, func(i, j int) bool { return outcomeRankOf(ms.Outcomes[i]) < outcomeRankOf(ms.Outcomes[j]) })
		for a := h; a != nil; a = byID[a.parent] {
			if len(a.measured) > 0 {
				ms.Composition, ms.Measured = a.measured, true
				break
			}
		}
		if !ms.Measured {
			ms.Composition = nominal[h.meltID]
		}
	}
	return out, nil
}

// outcomeRankOf is outcomeRank in Go.
func outcomeRankOf(o meltbook.Outcome) int {
	switch {
	case o.Source == meltbook.ByPerson:
		return 0
	case o.Status == meltbook.Confirmed:
		return 1
	case o.Status == meltbook.Proposed:
		return 2
	}
	return 3
}

// positionedFractions reads rows of (owner id, position, element,
// fraction) into each owner's composition in the order entered.
func (t *txn) positionedFractions(query string) (map[int64][]meltbook.ElementFraction, error) {
	byOwner := map[int64][]positioned{}
	err := t.each(query, func(rows *sql.Rows) error {
		var id int64
		var p positioned
		if err := rows.Scan(&id, &p.position, &p.Element, &p.Fraction); err != nil {
			return err
		}
		byOwner[id] = append(byOwner[id], p)
		return nil
	})
	if err != nil {
		return nil, err
	}
	out := make(map[int64][]meltbook.ElementFraction, len(byOwner))
	for id, ps := range byOwner {
		sort.Slice(ps, func(i, j int) bool { return ps[i].position < ps[j].position })
		efs := make([]meltbook.ElementFraction, len(ps))
		for i, p := range ps {
			efs[i] = p.ElementFraction
		}
		out[id] = efs
	}
	return out, nil
}

// resolveHistory works out the estimated rate of a sample's last spinning
// and whether it was annealed afterwards, from its parent's history and
// its own steps.
func resolveHistory(byID map[int64]*sampleHistory, h *sampleHistory, rates map[int64]float64) error {
	if h.resolved {
		return nil
	}
	if h.resolving {
		return errors.New("samples: a sample is its own ancestor")
	}
	h.resolving = true
	if h.parent != 0 {
		p := byID[h.parent]
		if p == nil {
			return fmt.Errorf("samples: parent %d is missing", h.parent)
		}
		if err := resolveHistory(byID, p, rates); err != nil {
			return err
		}
		h.rate, h.annealed = p.rate, p.annealed
	}
	sort.Slice(h.steps, func(i, j int) bool { return h.steps[i].seq < h.steps[j].seq })
	for _, st := range h.steps {
		switch st.kind {
		case meltbook.MeltSpin:
			h.rate, h.annealed = nil, false
			if r, ok := rates[st.id]; ok {
				h.rate = &r
			}
		case meltbook.Anneal:
			h.annealed = true
		}
	}
	h.resolved = true
	return nil
}

package seed

import (
	"encoding/json"
	"fmt"
	"sort"
	"time"

	"meltbook"
	"meltbook/store"
)

// Document returns the notebook as a store document for
// store.ImportDocument on an empty notebook. Rows are numbered from 1 in
// code order, the invented times are kept, and every row has one "create"
// history entry dated when the lab made it and signed by whoever made it,
// as the store writes one for each row it creates.
func (nb *Notebook) Document() (*store.Document, error) {
	d := &store.Document{Format: store.DocumentFormat, Version: store.DocumentVersion}
	var ids struct{ melt, sample, step, measurement, observation, outcome, note int64 }
	var history []store.DocHistory
	create := func(melt, entity string, id int64, at time.Time, who string, v any) error {
		b, err := json.Marshal(v)
		if err != nil {
			return fmt.Errorf("demo notebook: %s %d: %w", entity, id, err)
		}
		history = append(history, store.DocHistory{HistoryEntry: meltbook.HistoryEntry{
			At: at, Who: who, MeltCode: melt, Entity: entity, EntityID: id, Action: "create", After: string(b)}})
		return nil
	}
	for _, r := range nb.Runs {
		code := r.Melt.Code
		ids.melt++
		dm := store.DocMelt{ID: ids.melt, Melt: r.Melt}
		if err := create(code, "melt", ids.melt, r.Melt.CreatedAt, r.Melt.Operator, r.Melt); err != nil {
			return nil, err
		}
		type piece struct {
			sample       meltbook.Sample
			who          string
			steps        []meltbook.ProcessStep
			measured     []meltbook.MeasuredComposition
			observations []meltbook.SymmetryObservation
			outcomes     []meltbook.Outcome
		}
		pieces := []piece{{sample: meltbook.Sample{Code: code, CreatedAt: r.Melt.CreatedAt}, who: r.Melt.Operator,
			steps: r.Steps, measured: r.Measured, observations: r.Observations, outcomes: r.Outcomes}}
		for _, p := range r.Derived {
			pieces = append(pieces, piece{sample: p.Sample, who: p.Step.Operator, steps: []meltbook.ProcessStep{p.Step},
				measured: p.Measured, observations: p.Observations, outcomes: p.Outcomes})
		}
		for _, p := range pieces {
			ids.sample++
			ds := store.DocSample{ID: ids.sample, Sample: p.sample}
			created := p.sample.CreatedAt
			if len(p.steps) > 0 && p.sample.ParentCode != "" {
				created = p.steps[0].At // logged when the piece was cut and treated
			}
			if err := create(code, "sample", ids.sample, created, p.who, p.sample); err != nil {
				return nil, err
			}
			for _, st := range p.steps {
				ids.step++
				ds.Steps = append(ds.Steps, store.DocStep{ID: ids.step, ProcessStep: st})
				if err := create(code, "step", ids.step, st.At, st.Operator, st); err != nil {
					return nil, err
				}
			}
			for _, m := range p.measured {
				ids.measurement++
				ds.Measurements = append(ds.Measurements, store.DocMeasurement{ID: ids.measurement, MeasuredComposition: m})
				if err := create(code, "measurement", ids.measurement, m.At, m.Operator, m); err != nil {
					return nil, err
				}
			}
			for _, o := range p.observations {
				ids.observation++
				ds.Symmetry = append(ds.Symmetry, store.DocObservation{ID: ids.observation, SymmetryObservation: o})
				if err := create(code, "observation", ids.observation, o.At, o.Operator, o); err != nil {
					return nil, err
				}
			}
			for _, o := range p.outcomes {
				ids.outcome++
				o.SampleCode = p.sample.Code
				ds.Outcomes = append(ds.Outcomes, store.DocOutcome{ID: ids.outcome, Outcome: o})
				if err := create(code, "outcome", ids.outcome, o.At, o.RecordedBy, o); err != nil {
					return nil, err
				}
			}
			dm.Samples = append(dm.Samples, ds)
		}
		notes := append([]meltbook.Note(nil), r.Notes...)
		for _, p := range r.Derived {
			notes = append(notes, p.Notes...)
		}
		for _, n := range notes {
			ids.note++
			dm.DatedNotes = append(dm.DatedNotes, store.DocNote{ID: ids.note, Note: n})
			if err := create(code, "note", ids.note, n.At, n.Author, n); err != nil {
				return nil, err
			}
		}
		d.Melts = append(d.Melts, dm)
	}
	sort.SliceStable(history, func(i, j int) bool { return history[i].At.Before(history[j].At) })
	for i := range history {
		history[i].ID = int64(i + 1)
	}
	d.History = history
	return d, nil
}

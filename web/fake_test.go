package web_test

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"sort"
	"strings"
	"sync"
	"time"

	"meltbook"
	"meltbook/analysis/element"
	"meltbook/store"
	"meltbook/web/plot"
)

// Metallic radii for 12-fold coordination in Å (from memory, for the test
// δ only).
var testRadii = map[string]float64{"Al": 1.432, "Cu": 1.278, "Fe": 1.274, "Si": 1.32, "B": 0.98, "Mn": 1.35, "Pd": 1.376}

// testSizeMismatch is δ = 100·sqrt(Σ c_i (1 − r_i/r̄)²), r̄ = Σ c_i r_i
// (common practice), standing in for the descriptor package in tests.
func testSizeMismatch(comp []meltbook.ElementFraction) (float64, error) {
	var mean float64
	for _, ef := range comp {
		r, ok := testRadii[ef.Element]
		if !ok {
			return 0, fmt.Errorf("no radius for %s", ef.Element)
		}
		mean += ef.Fraction * r
	}
	var sum float64
	for _, ef := range comp {
		d := 1 - testRadii[ef.Element]/mean
		sum += ef.Fraction * d * d
	}
	return 100 * math.Sqrt(sum), nil
}

// fakeSample is one sample of the fake notebook. A melt's own sample has
// the melt's code; derived ones carry a parent.
type fakeSample struct {
	code, melt  string
	composition []meltbook.ElementFraction
	outcomes    []meltbook.Outcome
	rate        *float64
	annealed    bool
	created     time.Time
}

// fakeNotebook implements web.Notebook in memory, enough for the pages:
// FindMelts honours outcomes, e/a, cooling rate, elements, operator, sort
// and paging.
type fakeNotebook struct {
	mu      sync.Mutex
	samples []fakeSample
	notes   map[string][]meltbook.Note
	// created and amendments are the melts logged and the amendments
	// made, as received.
	created    []fakeCreated
	amendments []fakeAmendment
	// fault, when set, is returned by every read, to test the error table.
	fault error
}

func newFake(samples ...fakeSample) *fakeNotebook {
	f := &fakeNotebook{samples: samples, notes: map[string][]meltbook.Note{}}
	f.numberOutcomes()
	return f
}

// numberOutcomes gives every outcome an ID, as the store does.
func (f *fakeNotebook) numberOutcomes() {
	id := int64(0)
	for i := range f.samples {
		f.samples[i].outcomes = slices.Clone(f.samples[i].outcomes)
		for j := range f.samples[i].outcomes {
			id++
			f.samples[i].outcomes[j].ID = id
		}
	}
}

func fractions(pairs ...any) []meltbook.ElementFraction {
	var out []meltbook.ElementFraction
	for i := 0; i < len(pairs); i += 2 {
		out = append(out, meltbook.ElementFraction{Element: pairs[i].(string), Fraction: pairs[i+1].(float64)})
	}
	return out
}

var epoch = time.Date(2031, 3, 2, 9, 0, 0, 0, time.UTC)

func decided(kinds ...meltbook.PhaseKind) []meltbook.Outcome {
	var out []meltbook.Outcome
	for _, k := range kinds {
		o := meltbook.Outcome{Kind: k, Source: meltbook.ByPerson, Status: meltbook.Confirmed, RecordedBy: "T. Ingram", At: epoch}
		switch k {
		case meltbook.Crystalline:
			o.Name = "λ-Al13Fe4"
		case meltbook.Approximant:
			o.Order = "1/1"
		case meltbook.Icosahedral:
			o.Lattice = "F"
		}
		out = append(out, o)
	}
	return out
}

func ptr(v float64) *float64 { return &v }

func raynor() element.Scheme {
	s, _ := element.LookupScheme(element.RaynorScheme)
	return s
}

// inventedNotebook makes n samples of an invented group's Al-Cu-Fe campaign
// (with some Si, B and Pd-Mn side lines): every melt is spun and half of
// them also annealed. Outcomes follow a rough invented rule of e/a and
// cooling rate. Deterministic.
func inventedNotebook(n int) *fakeNotebook {
	r := rand.New(rand.NewPCG(2031, 42))
	valence := raynor().Valence
	f := newFake()
	for i := 0; i < n; i++ {
		melt := fmt.Sprintf("ZR-%04d", i/2+1)
		code := melt
		annealed := i%2 == 1
		if annealed {
			code += ".a1"
		}
		al := 0.58 + 0.12*r.Float64()
		fe := 0.08 + 0.08*r.Float64()
		comp := fractions("Al", al, "Cu", 1-al-fe, "Fe", fe)
		switch i % 11 {
		case 3:
			si := 0.01 + 0.04*r.Float64()
			comp = fractions("Al", al-si, "Cu", 1-al-fe, "Fe", fe, "Si", si)
		case 7:
			comp = fractions("Al", al-0.08, "Cu", 1-al-fe, "Fe", fe, "B", 0.08)
		case 9:
			pd := 0.18 + 0.06*r.Float64()
			mn := 0.07 + 0.04*r.Float64()
			comp = fractions("Al", 1-pd-mn, "Pd", pd, "Mn", mn)
		}
		if annealed {
			comp = f.samples[len(f.samples)-1].composition
		}
		ea, _ := plot.ElectronsPerAtom(comp, valence)
		rate := math.Pow(10, 4.5+2.5*r.Float64())
		var outcomes []meltbook.Outcome
		switch x := r.Float64(); {
		case x < 0.04:
		case x < 0.08:
			outcomes = []meltbook.Outcome{{Kind: meltbook.Icosahedral, Lattice: "F", Source: meltbook.ByAutomatic, Status: meltbook.Proposed,
				RecordedBy: "meltbook indexing", Evidence: "12 of 13 peaks index as icosahedral F", At: epoch}}
		case math.Abs(ea-1.86) < 0.06 && rate > 2e5:
			outcomes = decided(meltbook.Icosahedral, meltbook.Crystalline)
		case math.Abs(ea-1.86) < 0.1:
			outcomes = decided(meltbook.Approximant)
		case ea < 1.6 && rate > 3e6:
			outcomes = decided(meltbook.Amorphous)
		case x < 0.12:
			outcomes = decided(meltbook.Decagonal)
		default:
			outcomes = decided(meltbook.Crystalline)
		}
		s := fakeSample{code: code, melt: melt, composition: comp, outcomes: outcomes, annealed: annealed, created: epoch.Add(time.Duration(i) * 3 * time.Hour)}
		if i%13 != 5 {
			s.rate = ptr(rate)
		}
		f.samples = append(f.samples, s)
	}
	f.numberOutcomes()
	return f
}

// melts returns the melt codes in order of their first sample.
func (f *fakeNotebook) melts() []string {
	var out []string
	for _, s := range f.samples {
		if !slices.Contains(out, s.melt) {
			out = append(out, s.melt)
		}
	}
	return out
}

func (f *fakeNotebook) own(melt string) (fakeSample, bool) {
	for _, s := range f.samples {
		if s.code == melt {
			return s, true
		}
	}
	return fakeSample{}, false
}

func (f *fakeNotebook) Summary(ctx context.Context) (store.Summary, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.fault != nil {
		return store.Summary{}, f.fault
	}
	sum := store.Summary{Melts: len(f.melts()), Samples: len(f.samples), Scans: len(f.melts())}
	for i := len(f.samples) - 1; i >= 0 && len(sum.Recent) < 6; i-- {
		s := f.samples[i]
		sum.Recent = append(sum.Recent, meltbook.HistoryEntry{At: s.created, Who: "T. Ingram", MeltCode: s.melt, Entity: "sample", Action: "create"})
	}
	return sum, nil
}

func (f *fakeNotebook) FindMelts(ctx context.Context, q meltbook.MeltFilter) ([]meltbook.MeltSummary, int, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.fault != nil {
		return nil, 0, f.fault
	}
	if err := q.Validate(); err != nil {
		return nil, 0, err
	}
	scheme, ok := element.LookupScheme(q.Scheme)
	if !ok {
		return nil, 0, meltbook.Errorf(meltbook.Invalid, "scheme", "no valence scheme %q", q.Scheme)
	}
	var rows []meltbook.MeltSummary
	for _, melt := range f.melts() {
		own, _ := f.own(melt)
		row := meltbook.MeltSummary{Code: melt, CreatedAt: own.created, Operator: "T. Ingram", Nominal: own.composition, Scheme: q.Scheme, CoolingRateKPerS: own.rate}
		if ea, err := plot.ElectronsPerAtom(own.composition, scheme.Valence); err == nil {
			row.EOverA = &ea
		}
		kinds := map[meltbook.PhaseKind]bool{}
		for _, s := range f.samples {
			if s.melt != melt {
				continue
			}
			for _, o := range s.outcomes {
				standing := o.Source == meltbook.ByPerson || o.Status == meltbook.Confirmed
				pending := o.Source == meltbook.ByAutomatic && o.Status == meltbook.Proposed
				if !standing && !(pending && q.IncludeProposals) {
					continue
				}
				o.SampleCode = s.code
				row.Outcomes = append(row.Outcomes, o)
				kinds[o.Kind] = true
			}
		}
		keep := len(q.Outcomes) == 0
		for _, k := range q.Outcomes {
			keep = keep || kinds[k]
		}
		if q.EOverA != nil {
			keep = keep && row.EOverA != nil && q.EOverA.Contains(*row.EOverA)
		}
		if q.CoolingRateKPerS != nil {
			keep = keep && row.CoolingRateKPerS != nil && q.CoolingRateKPerS.Contains(*row.CoolingRateKPerS)
		}
		for _, el := range q.Elements {
			keep = keep && slices.ContainsFunc(row.Nominal, func(ef meltbook.ElementFraction) bool { return ef.Element == el })
		}
		if q.OnlyElements {
			keep = keep && len(row.Nominal) == len(q.Elements)
		}
		if q.Operator != "" {
			keep = keep && q.Operator == row.Operator
		}
		if keep {
			rows = append(rows, row)
		}
	}
	less := func(a, b meltbook.MeltSummary) int {
		value := func(r meltbook.MeltSummary) *float64 {
			switch q.Sort {
			case meltbook.SortEOverA:
				return r.EOverA
			case meltbook.SortCoolingRate:
				return r.CoolingRateKPerS
			}
			return nil
		}
		switch q.Sort {
		case meltbook.SortCode:
			return strings.Compare(a.Code, b.Code)
		case meltbook.SortEOverA, meltbook.SortCoolingRate:
			va, vb := value(a), value(b)
			switch {
			case va == nil || vb == nil:
				return 0
			case *va < *vb:
				return -1
			case *va > *vb:
				return 1
			}
			return 0
		}
		return a.CreatedAt.Compare(b.CreatedAt)
	}
	sort.SliceStable(rows, func(i, j int) bool {
		if q.Descending {
			return less(rows[i], rows[j]) > 0
		}
		return less(rows[i], rows[j]) < 0
	})
	total := len(rows)
	if q.Limit > 0 {
		end := min(q.Offset+q.Limit, total)
		if q.Offset >= end {
			return nil, total, nil
		}
		rows = rows[q.Offset:end]
	}
	return rows, total, nil
}

func (f *fakeNotebook) MapSamples(ctx context.Context) ([]store.MapSample, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.fault != nil {
		return nil, f.fault
	}
	out := make([]store.MapSample, len(f.samples))
	for i, s := range f.samples {
		out[i] = store.MapSample{Code: s.code, Melt: s.melt, Composition: s.composition, Outcomes: s.outcomes, CoolingRateKPerS: s.rate, Annealed: s.annealed}
	}
	return out, nil
}

func (f *fakeNotebook) SampleMelt(ctx context.Context, code string) (string, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	for _, s := range f.samples {
		if s.code == code {
			return s.melt, nil
		}
	}
	return "", meltbook.Errorf(meltbook.NotFound, "sample", "no sample %s in the notebook", code)
}

func (f *fakeNotebook) MeltRecord(ctx context.Context, code string) (*meltbook.MeltRecord, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.fault != nil {
		return nil, f.fault
	}
	own, ok := f.own(code)
	if !ok || own.melt != code {
		return nil, meltbook.Errorf(meltbook.NotFound, "melt", "no melt %s in the notebook", code)
	}
	rec := &meltbook.MeltRecord{
		Melt:             meltbook.Melt{Code: code, Operator: "T. Ingram", CreatedAt: own.created, CompositionEntered: plot.FormatComposition(own.composition), Nominal: own.composition, TargetMassGrams: 12},
		CoolingRateKPerS: own.rate,
	}
	if ea, err := plot.ElectronsPerAtom(own.composition, raynor().Valence); err == nil {
		rec.EOverA = map[string]float64{element.RaynorScheme: ea}
	}
	for _, s := range f.samples {
		if s.melt != code {
			continue
		}
		sr := meltbook.SampleRecord{Sample: meltbook.Sample{Code: s.code, CreatedAt: s.created}, Outcomes: s.outcomes}
		if s.annealed {
			sr.ParentCode, sr.Depth = code, 1
			sr.Steps = []meltbook.ProcessStep{{Seq: 1, Kind: meltbook.Anneal, At: s.created, Operator: "T. Ingram", Params: []meltbook.Param{
				{Name: "temperature", SI: 1073.15, Unit: "°C"}, {Name: "time", SI: 4 * 3600, Unit: "h"}, {Name: "atmosphere", Text: "sealed silica under Ar"},
			}}}
		} else {
			spin := meltbook.ProcessStep{Seq: 1, Kind: meltbook.MeltSpin, At: s.created, Operator: "T. Ingram", Params: []meltbook.Param{
				{Name: "wheel-speed", SI: 32, Unit: "m/s"}, {Name: "chamber-gas", Text: "Ar"}, {Name: "melt-temperature", SI: 1523.15, Unit: "°C"},
			}}
			if s.rate != nil {
				spin.Params = append(spin.Params, meltbook.Param{Name: "cooling-rate", SI: *s.rate, Unit: "K/s"})
			}
			sr.Steps = []meltbook.ProcessStep{spin}
		}
		rec.Samples = append(rec.Samples, sr)
	}
	rec.Notes = f.notes[code]
	return rec, nil
}

func (f *fakeNotebook) meltNumber(code string) int64 {
	for i, m := range f.melts() {
		if m == code {
			return int64(i + 1)
		}
	}
	return 0
}

func (f *fakeNotebook) MeltScans(ctx context.Context, melt string) ([]meltbook.ScanSummary, error) {
	f.mu.Lock()
	id := f.meltNumber(melt)
	f.mu.Unlock()
	rec, err := f.ScanRecord(ctx, id)
	if err != nil {
		return nil, err
	}
	sc := rec.Scan
	return []meltbook.ScanSummary{{ID: sc.ID, SampleCode: sc.SampleCode, MeltCode: sc.MeltCode, FileName: sc.FileName, SHA256: sc.SHA256,
		Format: sc.Format, Radiation: sc.Radiation, Points: sc.Points(), FromDeg: 20, ToDeg: 80, ImportedAt: sc.ImportedAt,
		ImportedBy: sc.ImportedBy, IndexingVersion: 1, Indexing: "icosahedral F (invented), 6 of 7 peaks"}}, nil
}

// ScanRecord gives every melt one invented scan, numbered as the melts:
// seven peaks on a sloping background, six of them labelled by an invented
// icosahedral phase and one (64.6°) unexplained.
func (f *fakeNotebook) ScanRecord(ctx context.Context, id int64) (*meltbook.ScanRecord, error) {
	f.mu.Lock()
	melts := f.melts()
	f.mu.Unlock()
	if id < 1 || id > int64(len(melts)) {
		return nil, meltbook.Errorf(meltbook.NotFound, "scan", "no scan %d", id)
	}
	melt := melts[id-1]
	peaks := []struct {
		t, h, w float64
		label   string
	}{{24.1, 180, 0.12, "(6,9)"}, {26.0, 120, 0.12, "(7,11)"}, {42.9, 1000, 0.1, "(18,29)"}, {45.0, 620, 0.1, "(20,32)"}, {62.4, 260, 0.14, "(38,61)"}, {64.6, 90, 0.14, ""}, {73.6, 150, 0.16, "(52,84)"}}
	sc := meltbook.Scan{ID: id, SampleCode: melt, MeltCode: melt, FileName: melt + "-xrd.xy", SHA256: strings.Repeat("5e", 32), Format: "XY",
		Radiation:  meltbook.ScanRadiation{Anode: "Cu", Kalpha1Angstrom: 1.5405929, Kalpha2Angstrom: 1.5444274, Kalpha2Ratio: 0.5, Kalpha2: meltbook.Kalpha2Doublet, Text: "Cu"},
		ImportedAt: epoch, ImportedBy: "T. Ingram"}
	for i := 0; i <= 3000; i++ {
		t := 20 + 0.02*float64(i)
		y := 140 - 0.9*(t-20) + 30*math.Exp(-(t-20)/6)
		for _, pk := range peaks {
			y += pk.h * math.Exp(-math.Pow((t-pk.t)/pk.w, 2))
		}
		sc.TwoThetaDeg = append(sc.TwoThetaDeg, t)
		sc.Counts = append(sc.Counts, y+6*math.Sin(float64(i)*12.9898))
	}
	x := meltbook.Indexing{ID: id, ScanID: id, Version: 1, At: epoch, By: "invented indexer", RequestedBy: "T. Ingram", Radiation: sc.Radiation}
	phase := meltbook.IndexedPhase{Kind: meltbook.ModelIcosahedral, Lattice: "F", ConstantA: 4.4621, ConstantSUA: 0.0008, Chance: 2e-6}
	for i, pk := range peaks {
		x.Peaks = append(x.Peaks, meltbook.Peak{TwoThetaDeg: pk.t, Height: pk.h, FWHMDeg: 2 * math.Sqrt(math.Ln2) * pk.w, Found: meltbook.PeakAutomatic})
		if pk.label == "" {
			x.Unexplained = append(x.Unexplained, i)
			continue
		}
		phase.Assignments = append(phase.Assignments, meltbook.PeakAssignment{Peak: i, TwoThetaDeg: pk.t, Label: pk.label})
	}
	x.Phases = []meltbook.IndexedPhase{phase}
	return &meltbook.ScanRecord{Scan: sc, Indexings: []meltbook.Indexing{x}}, nil
}

func (f *fakeNotebook) AddNote(ctx context.Context, who, code, text string) (*meltbook.Note, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	switch {
	case strings.Contains(text, "CLASH"):
		return nil, meltbook.Errorf(meltbook.Conflict, "text", "an identical note was recorded a moment ago")
	case strings.Contains(text, "BREAK"):
		return nil, errors.New("disk /var/secret/notebook.db is full")
	}
	melt := ""
	for _, s := range f.samples {
		if s.code == code {
			melt = s.melt
		}
	}
	if melt == "" {
		return nil, meltbook.Errorf(meltbook.NotFound, "sample", "no melt or sample %s", code)
	}
	n := meltbook.Note{Author: who, Text: text, At: epoch}
	if code != melt {
		n.SampleCode = code
	}
	f.notes[melt] = append(f.notes[melt], n)
	return &n, nil
}

func (f *fakeNotebook) AddOutcome(ctx context.Context, who, sampleCode string, o meltbook.Outcome) (*meltbook.Outcome, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	o.Source, o.Status, o.At = meltbook.ByPerson, meltbook.Confirmed, epoch
	if err := o.Validate(); err != nil {
		return nil, err
	}
	next := int64(1)
	for _, s := range f.samples {
		for _, x := range s.outcomes {
			next = max(next, x.ID+1)
		}
	}
	for i := range f.samples {
		if f.samples[i].code == sampleCode {
			o.ID = next
			f.samples[i].outcomes = append(f.samples[i].outcomes, o)
			return &o, nil
		}
	}
	return nil, meltbook.Errorf(meltbook.NotFound, "sample", "no sample %s", sampleCode)
}

func (f *fakeNotebook) decide(id int64, status meltbook.ProposalStatus) error {
	f.mu.Lock()
	defer f.mu.Unlock()
	for i := range f.samples {
		for j := range f.samples[i].outcomes {
			o := &f.samples[i].outcomes[j]
			if o.ID != id {
				continue
			}
			if o.Source != meltbook.ByAutomatic || o.Status != meltbook.Proposed {
				return meltbook.Errorf(meltbook.Conflict, "outcome", "outcome %d is not a proposal awaiting a decision", id)
			}
			o.Status = status
			return nil
		}
	}
	return meltbook.Errorf(meltbook.NotFound, "outcome", "no outcome %d", id)
}

func (f *fakeNotebook) ConfirmProposal(ctx context.Context, who string, id int64, why string) error {
	return f.decide(id, meltbook.Confirmed)
}

func (f *fakeNotebook) RejectProposal(ctx context.Context, who string, id int64, why string) error {
	return f.decide(id, meltbook.Rejected)
}

func (f *fakeNotebook) NextMeltCode(ctx context.Context, prefix string) (string, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	n := 0
	for _, m := range f.melts() {
		if strings.HasPrefix(m, prefix+"-") {
			n++
		}
	}
	return fmt.Sprintf("%s-%04d", prefix, n+1), nil
}

// CreateMelt adds the melt's own sample, with the cooling rate of its
// melt-spin step.
func (f *fakeNotebook) CreateMelt(ctx context.Context, who string, m *meltbook.Melt, steps ...meltbook.ProcessStep) error {
	if err := m.Validate(); err != nil {
		return err
	}
	f.mu.Lock()
	defer f.mu.Unlock()
	if _, ok := f.own(m.Code); ok {
		return meltbook.Errorf(meltbook.Conflict, "code", "melt %s already exists", m.Code)
	}
	s := fakeSample{code: m.Code, melt: m.Code, composition: m.Nominal, created: m.CreatedAt}
	for _, st := range steps {
		if p, ok := st.Param("cooling-rate"); ok && st.Kind == meltbook.MeltSpin {
			s.rate = ptr(p.SI)
		}
	}
	f.samples = append(f.samples, s)
	f.created = append(f.created, fakeCreated{who: who, melt: *m, steps: steps})
	return nil
}

// fakeCreated is a melt as CreateMelt received it.
type fakeCreated struct {
	who   string
	melt  meltbook.Melt
	steps []meltbook.ProcessStep
}

// fakeAmendment is an amendment as the fake received it.
type fakeAmendment struct {
	who, target, why string
	update           any
}

func (f *fakeNotebook) amend(who, target, why string, u any) ([]meltbook.HistoryEntry, error) {
	if strings.TrimSpace(why) == "" {
		return nil, meltbook.Errorf(meltbook.Invalid, "why", "an amendment needs a reason")
	}
	f.mu.Lock()
	defer f.mu.Unlock()
	f.amendments = append(f.amendments, fakeAmendment{who: who, target: target, why: why, update: u})
	return []meltbook.HistoryEntry{{Who: who, Action: "amend", Why: why}}, nil
}

func (f *fakeNotebook) AmendMelt(ctx context.Context, who, code string, u meltbook.MeltUpdate, why string) ([]meltbook.HistoryEntry, error) {
	return f.amend(who, code, why, u)
}

func (f *fakeNotebook) AmendSample(ctx context.Context, who, code string, u meltbook.SampleUpdate, why string) ([]meltbook.HistoryEntry, error) {
	return f.amend(who, code, why, u)
}

func (f *fakeNotebook) AmendStep(ctx context.Context, who string, stepID int64, u meltbook.StepUpdate, why string) ([]meltbook.HistoryEntry, error) {
	return f.amend(who, fmt.Sprintf("step %d", stepID), why, u)
}

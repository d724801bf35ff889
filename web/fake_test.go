package web_test

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"sort"
	"strconv"
	"strings"
	"sync"
	"time"

	"meltbook"
	"meltbook/analysis/element"
	"meltbook/web"
	"meltbook/web/plot"
)

// testScheme holds valences for the invented notebook: Al 3, Cu 1, Si 4
// and B 3 are group valences (common practice); Fe −2.66 and Mn −3.66 are
// Raynor's values as commonly quoted, Pd 0 likewise (from memory).
var testScheme = element.Scheme{
	Name:    "Raynor (test copy)",
	Source:  "from memory, for tests only",
	Valence: map[string]float64{"Al": 3, "Cu": 1, "Fe": -2.66, "Si": 4, "B": 3, "Mn": -3.66, "Pd": 0},
}

// Metallic radii for 12-fold coordination in Å (from memory, tests only).
var testRadii = map[string]float64{"Al": 1.432, "Cu": 1.278, "Fe": 1.274, "Si": 1.32, "B": 0.98, "Mn": 1.35, "Pd": 1.376}

// testSizeMismatch is δ = 100·sqrt(Σ c_i (1 − r_i/r̄)²), r̄ = Σ c_i r_i
// (common practice), for the descriptor map in tests.
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

// fakeSample is one sample of the fake notebook.
type fakeSample struct {
	code, melt  string
	composition []meltbook.ElementFraction
	outcomes    []meltbook.Outcome
	rate        *float64
	annealed    bool
	created     time.Time
}

// fakeNotebook implements web.Notebook in memory. It understands the
// filters outcome (a map class or phase kind), ea (lo:hi), code (prefix)
// and treatment (as-spun or annealed).
type fakeNotebook struct {
	mu      sync.Mutex
	samples []fakeSample
	notes   map[string][]meltbook.Note
	// fault, when set, is returned by every read, to test the error table.
	fault error
}

func newFake(samples ...fakeSample) *fakeNotebook {
	return &fakeNotebook{samples: samples, notes: map[string][]meltbook.Note{}}
}

func fractions(pairs ...any) []meltbook.ElementFraction {
	var out []meltbook.ElementFraction
	for i := 0; i < len(pairs); i += 2 {
		out = append(out, meltbook.ElementFraction{Element: pairs[i].(string), Fraction: pairs[i+1].(float64)})
	}
	return out
}

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

var epoch = time.Date(2031, 3, 2, 9, 0, 0, 0, time.UTC)

// inventedNotebook makes n samples of an invented group's Al-Cu-Fe campaign
// (with some Si, B and Pd-Mn side lines), outcomes following a rough
// invented rule of e/a and cooling rate. Deterministic.
func inventedNotebook(n int) *fakeNotebook {
	r := rand.New(rand.NewPCG(2031, 42))
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
			comp = fractions("Al", al-0.02, "Cu", 1-al-fe, "Fe", fe, "B", 0.02)
		case 9:
			pd := 0.18 + 0.06*r.Float64()
			mn := 0.07 + 0.04*r.Float64()
			comp = fractions("Al", 1-pd-mn, "Pd", pd, "Mn", mn)
		}
		ea, _ := plot.ElectronsPerAtom(comp, testScheme.Valence)
		rate := math.Pow(10, 4.5+2.5*r.Float64())
		var outcomes []meltbook.Outcome
		switch x := r.Float64(); {
		case x < 0.08:
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
	return f
}

func (f *fakeNotebook) Summary(ctx context.Context) (web.Summary, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.fault != nil {
		return web.Summary{}, f.fault
	}
	melts := map[string]bool{}
	for _, s := range f.samples {
		melts[s.melt] = true
	}
	sum := web.Summary{Melts: len(melts), Samples: len(f.samples), Scans: len(melts)}
	for i := len(f.samples) - 1; i >= 0 && len(sum.Recent) < 6; i-- {
		s := f.samples[i]
		sum.Recent = append(sum.Recent, meltbook.HistoryEntry{At: s.created, Who: "T. Ingram", MeltCode: s.melt, Entity: "sample", Action: "create"})
	}
	return sum, nil
}

func (f *fakeNotebook) FilterFields() []web.FilterField {
	return []web.FilterField{
		{Name: "code", Label: "Code", Help: "start of a melt or sample code", Example: "ZR-00"},
		{Name: "outcome", Label: "Outcome", Help: "a phase kind", Example: "icosahedral"},
		{Name: "ea", Label: "e/a", Help: "range lo:hi", Example: "1.7:1.8"},
		{Name: "treatment", Label: "Treatment", Help: "as-spun or annealed", Example: "as-spun"},
	}
}

func (f *fakeNotebook) row(s fakeSample) web.RunRow {
	row := web.RunRow{Sample: s.code, Melt: s.melt, CreatedAt: s.created, Operator: "T. Ingram", Composition: s.composition, Outcomes: s.outcomes, CoolingRateKPerS: s.rate, Treatment: "as-spun"}
	if s.annealed {
		row.Treatment = "annealed"
	}
	if ea, err := plot.ElectronsPerAtom(s.composition, testScheme.Valence); err == nil {
		row.ElectronsPerAtom = &ea
	}
	return row
}

func (f *fakeNotebook) FindRuns(ctx context.Context, q web.RunQuery) (web.RunPage, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.fault != nil {
		return web.RunPage{}, f.fault
	}
	var rows []web.RunRow
	for _, s := range f.samples {
		row := f.row(s)
		keep := true
		for _, t := range q.Filters {
			switch t.Name {
			case "code":
				keep = keep && strings.HasPrefix(s.code, t.Value)
			case "treatment":
				if t.Value != "as-spun" && t.Value != "annealed" {
					return web.RunPage{}, meltbook.Errorf(meltbook.Invalid, "treatment", "%q is not as-spun or annealed", t.Value)
				}
				keep = keep && row.Treatment == t.Value
			case "outcome":
				keep = keep && plot.ClassOf(s.outcomes).Slug() == t.Value
			case "ea":
				lo, hi, ok := strings.Cut(t.Value, ":")
				a, errA := strconv.ParseFloat(lo, 64)
				b, errB := strconv.ParseFloat(hi, 64)
				if !ok || errA != nil || errB != nil {
					return web.RunPage{}, meltbook.Errorf(meltbook.Invalid, "ea", "%q is not a range lo:hi", t.Value)
				}
				keep = keep && row.ElectronsPerAtom != nil && *row.ElectronsPerAtom >= a && *row.ElectronsPerAtom <= b
			default:
				return web.RunPage{}, meltbook.Errorf(meltbook.Invalid, t.Name, "unknown filter")
			}
		}
		if keep {
			rows = append(rows, row)
		}
	}
	key := func(r web.RunRow) string {
		switch q.Sort {
		case web.SortSample:
			return r.Sample
		case web.SortMelt:
			return r.Melt
		case web.SortEA:
			return fmt.Sprintf("%012.6f", *r.ElectronsPerAtom+100)
		case web.SortRate:
			if r.CoolingRateKPerS == nil {
				return ""
			}
			return fmt.Sprintf("%020.3f", *r.CoolingRateKPerS)
		case web.SortOutcome:
			return strconv.Itoa(int(plot.ClassOf(r.Outcomes)))
		}
		return r.CreatedAt.Format(time.RFC3339)
	}
	sort.SliceStable(rows, func(i, j int) bool {
		if q.Descending {
			return key(rows[i]) > key(rows[j])
		}
		return key(rows[i]) < key(rows[j])
	})
	page := web.RunPage{Total: len(rows)}
	end := min(q.Offset+q.Limit, len(rows))
	if q.Offset < end {
		page.Runs = rows[q.Offset:end]
	}
	return page, nil
}

func (f *fakeNotebook) MapSamples(ctx context.Context) ([]web.MapSample, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.fault != nil {
		return nil, f.fault
	}
	out := make([]web.MapSample, len(f.samples))
	for i, s := range f.samples {
		out[i] = web.MapSample{Code: s.code, Melt: s.melt, Composition: s.composition, Outcomes: s.outcomes, CoolingRateKPerS: s.rate, Annealed: s.annealed}
	}
	return out, nil
}

func (f *fakeNotebook) Run(ctx context.Context, code string) (web.RunDetail, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.fault != nil {
		return web.RunDetail{}, f.fault
	}
	melt := ""
	for _, s := range f.samples {
		if s.code == code || s.melt == code {
			melt = s.melt
		}
	}
	if melt == "" {
		return web.RunDetail{}, meltbook.Errorf(meltbook.NotFound, "code", "no melt or sample %s", code)
	}
	var d web.RunDetail
	for _, s := range f.samples {
		if s.melt != melt {
			continue
		}
		if s.code == melt {
			d.Melt = meltbook.Melt{Code: melt, Operator: "T. Ingram", CreatedAt: s.created, CompositionEntered: plot.FormatComposition(s.composition), Nominal: s.composition, TargetMassGrams: 12}
		}
		sd := web.SampleDetail{Sample: meltbook.Sample{Code: s.code, CreatedAt: s.created}, Outcomes: s.outcomes}
		spin := meltbook.ProcessStep{Seq: 1, Kind: meltbook.MeltSpin, At: s.created, Operator: "T. Ingram", Params: []meltbook.Param{
			{Name: "wheel-speed", SI: 32, Unit: "m/s"}, {Name: "chamber-gas", Text: "Ar"}, {Name: "melt-temperature", SI: 1523.15, Unit: "°C"},
		}}
		if s.rate != nil {
			spin.Params = append(spin.Params, meltbook.Param{Name: "cooling-rate", SI: *s.rate, Unit: "K/s"})
		}
		if s.annealed {
			sd.Sample.ParentCode = melt
			sd.Steps = []meltbook.ProcessStep{{Seq: 1, Kind: meltbook.Anneal, At: s.created, Operator: "T. Ingram", Params: []meltbook.Param{
				{Name: "temperature", SI: 1073.15, Unit: "°C"}, {Name: "time", SI: 4 * 3600, Unit: "h"}, {Name: "atmosphere", Text: "sealed silica under Ar"},
			}}}
		} else {
			sd.Steps = []meltbook.ProcessStep{spin}
			sd.Scans = []web.ScanSummary{{ID: 1, Name: s.code + "-xrd.xy", Radiation: "Cu Kα", FromDeg: 20, ToDeg: 80, Points: 3001}}
		}
		d.Samples = append(d.Samples, sd)
	}
	d.Notes = f.notes[melt]
	return d, nil
}

func (f *fakeNotebook) Scan(ctx context.Context, id int64) (web.ScanView, error) {
	if id != 1 {
		return web.ScanView{}, meltbook.Errorf(meltbook.NotFound, "id", "no scan %d", id)
	}
	var p plot.Pattern
	// Invented peaks on a sloping background; labels are invented too.
	peaks := []struct {
		t, h, w float64
		label   string
	}{{24.1, 180, 0.12, "(6,9)"}, {26.0, 120, 0.12, "(7,11)"}, {42.9, 1000, 0.1, "(18,29)"}, {45.0, 620, 0.1, "(20,32)"}, {62.4, 260, 0.14, "(38,61)"}, {64.6, 90, 0.14, ""}, {73.6, 150, 0.16, "(52,84)"}}
	for i := 0; i <= 3000; i++ {
		t := 20 + 0.02*float64(i)
		bg := 140 - 0.9*(t-20) + 30*math.Exp(-(t-20)/6)
		y := bg
		for _, pk := range peaks {
			y += pk.h * math.Exp(-math.Pow((t-pk.t)/pk.w, 2))
		}
		noise := 6 * math.Sin(float64(i)*12.9898)
		p.TwoThetaDeg = append(p.TwoThetaDeg, t)
		p.Counts = append(p.Counts, y+noise)
		p.Background = append(p.Background, bg)
		p.Fit = append(p.Fit, y)
	}
	for _, pk := range peaks {
		p.Peaks = append(p.Peaks, plot.PeakMark{TwoThetaDeg: pk.t, Label: pk.label, Explained: pk.label != ""})
	}
	return web.ScanView{
		ScanSummary: web.ScanSummary{ID: 1, Name: "ZR-0001-xrd.xy", Radiation: "Cu Kα", FromDeg: 20, ToDeg: 80, Points: 3001},
		Sample:      "ZR-0001", Melt: "ZR-0001", ImportedAt: epoch, SHA256: strings.Repeat("ab", 32),
		Indexing: "icosahedral F (invented), 6 of 7 peaks", Pattern: p,
	}, nil
}

func (f *fakeNotebook) AddNote(ctx context.Context, meltCode string, n meltbook.Note) (meltbook.Note, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	switch {
	case strings.Contains(n.Text, "CLASH"):
		return n, meltbook.Errorf(meltbook.Conflict, "text", "an identical note was recorded a moment ago")
	case strings.Contains(n.Text, "BREAK"):
		return n, errors.New("disk /var/secret/notebook.db is full")
	}
	n.At = epoch
	f.notes[meltCode] = append(f.notes[meltCode], n)
	return n, nil
}

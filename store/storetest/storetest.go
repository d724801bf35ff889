// Package storetest invents notebooks of any size for tests and benchmarks:
// melts in eight alloy systems by six operators over six years, each
// arc-melted and spun, most with a phase outcome, some with an annealed
// piece and a measured composition. Every name and number is invented, and
// the same options give the same notebook.
package storetest

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"time"

	"meltbook"
	"meltbook/store"
)

// Options says what Generate invents.
type Options struct {
	// Melts is the number of melts, coded GEN-000001, GEN-000002, ...
	Melts int
	// AnnealedShare is the share of melts (0..1) that also have a piece of
	// ribbon annealed: a derived sample GEN-nnnnnn.a1 with an anneal step
	// and an outcome of its own.
	AnnealedShare float64
	// MeasuredShare is the share of samples (0..1) with a composition
	// measured by EDS, a little off the nominal one.
	MeasuredShare float64
	// Systems are the alloy systems to draw from, major element first;
	// nil means DefaultSystems.
	Systems [][]string
	// Store configures the new notebook (clock and valence tables).
	Store store.Options
}

// DefaultSystems are the invented alloy systems, first element the major
// one; an entry listed twice is drawn twice as often.
var DefaultSystems = [][]string{
	{"Al", "Cu", "Fe"}, {"Al", "Cu", "Fe"}, {"Al", "Cu", "Fe", "Si"},
	{"Al", "Pd", "Mn"}, {"Al", "Ni", "Co"}, {"Al", "Mn", "Si"}, {"Al", "Cu", "Cr"}, {"Zn", "Mg", "Al"},
}

// Operators are the invented operators.
var Operators = []string{"Ines Marlow", "Jon Pell", "Kai Ostrow", "Lena Fitch", "Omar Vey", "Rui Tanaka"}

// Generator names the program in outcomes it proposes and in the notebook's
// import record.
const Generator = "storetest generator"

// Document invents the notebook opt describes as a store document, rows
// numbered from 1, without history.
//
// Each melt's major element has 50-75 at.%, the rest is shared at random
// and rounded to 0.1 at.%; the cooling rate of its spin is 10^4-10^7 K/s
// (uniform in the logarithm); 60 % of melts have one outcome of a random
// phase kind, three in ten of them an automatic proposal still awaiting a
// decision. Annealed pieces get a person's outcome.
func Document(opt Options) *store.Document {
	rng := rand.New(rand.NewPCG(1, 2))
	// Pieces and measurements draw from their own stream, so that the
	// melts are the same whatever the shares.
	extra := rand.New(rand.NewPCG(3, 4))
	d := &store.Document{Format: store.DocumentFormat, Version: store.DocumentVersion, Melts: make([]store.DocMelt, 0, opt.Melts)}
	var ids struct{ sample, step, measurement, outcome int64 }
	t0 := time.Date(2020, 1, 1, 0, 0, 0, 0, time.UTC)
	kinds := meltbook.PhaseKinds
	systems := opt.Systems
	if systems == nil {
		systems = DefaultSystems
	}
	for i := range opt.Melts {
		sys := systems[rng.IntN(len(systems))]
		rest := 1 - (0.5 + 0.25*rng.Float64())
		parts := []meltbook.ElementFraction{{Element: sys[0], Fraction: math.Round((1-rest)*1000) / 1000}}
		left := math.Round(rest*1000) / 1000
		for j, el := range sys[1:] {
			f := left
			if j < len(sys)-2 {
				f = math.Round(left*(0.3+0.5*rng.Float64())*1000) / 1000
			}
			left = math.Round((left-f)*1000) / 1000
			parts = append(parts, meltbook.ElementFraction{Element: el, Fraction: f})
		}
		code := fmt.Sprintf("GEN-%06d", i+1)
		operator := Operators[rng.IntN(len(Operators))]
		m := meltbook.Melt{
			Code: code, Operator: operator, CompositionEntered: "generated", Nominal: parts,
			TargetMassGrams: 5 + 15*rng.Float64(),
			CreatedAt:       t0.Add(time.Duration(rng.Int64N(int64(6 * 365 * 24 * time.Hour)))),
		}
		rate := math.Pow(10, 4+3*rng.Float64())
		ids.sample++
		own := store.DocSample{ID: ids.sample, Sample: meltbook.Sample{Code: code, CreatedAt: m.CreatedAt}}
		for _, st := range []meltbook.ProcessStep{arcMelt(), meltSpin(rate)} {
			ids.step++
			st.Seq, st.At, st.Operator = len(own.Steps)+1, m.CreatedAt, operator
			own.Steps = append(own.Steps, store.DocStep{ID: ids.step, ProcessStep: st})
		}
		if rng.Float64() < 0.6 {
			o := meltbook.Outcome{Kind: kinds[rng.IntN(len(kinds))], Order: "1/1", Name: "generated",
				Source: meltbook.ByPerson, Status: meltbook.Confirmed, RecordedBy: operator, At: m.CreatedAt}
			if rng.Float64() < 0.3 {
				o.Source, o.Status, o.RecordedBy = meltbook.ByAutomatic, meltbook.Proposed, Generator
			}
			ids.outcome++
			own.Outcomes = append(own.Outcomes, store.DocOutcome{ID: ids.outcome, Outcome: o})
		}
		dm := store.DocMelt{ID: int64(i + 1), Melt: m, Samples: []store.DocSample{own}}
		if extra.Float64() < opt.AnnealedShare {
			at := m.CreatedAt.Add(time.Duration(1+extra.IntN(30)) * 24 * time.Hour)
			ids.sample++
			piece := store.DocSample{ID: ids.sample, Sample: meltbook.Sample{Code: code + ".a1", ParentCode: code, CreatedAt: at}}
			ids.step++
			piece.Steps = []store.DocStep{{ID: ids.step, ProcessStep: anneal(at, operator, 873.15+250*extra.Float64(), float64(1+extra.IntN(24))*3600)}}
			ids.outcome++
			piece.Outcomes = []store.DocOutcome{{ID: ids.outcome, Outcome: meltbook.Outcome{Kind: kinds[extra.IntN(len(kinds))], Order: "1/1",
				Name: "generated", Source: meltbook.ByPerson, Status: meltbook.Confirmed, RecordedBy: operator, At: at}}}
			dm.Samples = append(dm.Samples, piece)
		}
		for j := range dm.Samples {
			if extra.Float64() < opt.MeasuredShare {
				ids.measurement++
				dm.Samples[j].Measurements = []store.DocMeasurement{{ID: ids.measurement, MeasuredComposition: meltbook.MeasuredComposition{
					Method: "EDS", Fractions: offNominal(parts, extra), At: dm.Samples[j].CreatedAt.Add(48 * time.Hour), Operator: operator,
				}}}
			}
		}
		d.Melts = append(d.Melts, dm)
	}
	return d
}

// Generate creates a new notebook at path holding the invented notebook
// opt describes, written in one transaction, and closes it.
func Generate(ctx context.Context, path string, opt Options) error {
	s, err := store.Init(ctx, path, opt.Store)
	if err != nil {
		return err
	}
	if err := s.ImportDocument(ctx, Generator, Document(opt)); err != nil {
		s.Close()
		return err
	}
	return s.Close()
}

// offNominal is a measured composition: each minor fraction off the
// nominal one by up to ±1 at.% and rounded to 0.1 at.%, the major element
// making up the balance.
func offNominal(nominal []meltbook.ElementFraction, rng *rand.Rand) []meltbook.ElementFraction {
	out := make([]meltbook.ElementFraction, len(nominal))
	balance := 1.0
	for i := len(nominal) - 1; i >= 0; i-- {
		f := nominal[i].Fraction
		if i > 0 {
			f = math.Round(math.Max(0.001, f+0.02*(rng.Float64()-0.5))*1000) / 1000
			balance -= f
		} else {
			f = math.Round(balance*1000) / 1000
		}
		out[i] = meltbook.ElementFraction{Element: nominal[i].Element, Fraction: f}
	}
	return out
}

func arcMelt() meltbook.ProcessStep {
	return meltbook.ProcessStep{Kind: meltbook.ArcMelt, Params: []meltbook.Param{
		{Name: "remelts", SI: 4},
		{Name: "atmosphere", Text: "Ar after Ti getter"},
	}}
}

func meltSpin(coolingRate float64) meltbook.ProcessStep {
	return meltbook.ProcessStep{Kind: meltbook.MeltSpin, Params: []meltbook.Param{
		{Name: "wheel-material", Text: "Cu"},
		{Name: "wheel-speed", SI: 30, Unit: "m/s"},
		{Name: "thickness", SI: 25e-6, Unit: "µm"},
		{Name: "cooling-rate", SI: coolingRate, Unit: "K/s"},
	}}
}

func anneal(at time.Time, operator string, kelvin, seconds float64) meltbook.ProcessStep {
	return meltbook.ProcessStep{Seq: 1, Kind: meltbook.Anneal, At: at, Operator: operator, Params: []meltbook.Param{
		{Name: "temperature", SI: kelvin, Unit: "°C"},
		{Name: "time", SI: seconds, Unit: "h"},
		{Name: "cooling", Text: "water quench"},
	}}
}

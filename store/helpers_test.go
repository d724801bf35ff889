package store_test

import (
	"bytes"
	"context"
	"errors"
	"path/filepath"
	"sync"
	"testing"
	"time"

	"meltbook"
	"meltbook/store"
)

// testValences are the tables the test notebooks keep e/a for.
//
// "raynor": Al 3, Cu 1, Zn 2, Mg 2, Si 4 (their group valences) and the
// transition-metal valences after Raynor (1949) as commonly quoted
// (Cr −4.66, Mn −3.66, Fe −2.66, Co −1.71, Ni −0.61); Pd is left out on
// purpose so that Al-Pd-Mn has no e/a under it.
// "group": a fixture table without transition metals, so that e/a is
// undefined under it for Al-Cu-Fe.
var testValences = map[string]map[string]float64{
	"raynor": {"Al": 3, "Cu": 1, "Zn": 2, "Mg": 2, "Si": 4, "Cr": -4.66, "Mn": -3.66, "Fe": -2.66, "Co": -1.71, "Ni": -0.61},
	"group":  {"Al": 3, "Cu": 1, "Zn": 2, "Mg": 2, "Si": 4},
}

// clock is a test clock that moves on one second per reading.
type clock struct {
	mu sync.Mutex
	t  time.Time
}

func newClock() *clock {
	return &clock{t: time.Date(2026, 5, 4, 8, 0, 0, 0, time.UTC)}
}

func (c *clock) Now() time.Time {
	c.mu.Lock()
	defer c.mu.Unlock()
	c.t = c.t.Add(time.Second)
	return c.t
}

// MustOpen creates a new notebook in a temporary directory with the test
// clock and valence tables; it is closed when the test ends.
func MustOpen(tb testing.TB) *store.Store {
	tb.Helper()
	s, err := store.Init(context.Background(), filepath.Join(tb.TempDir(), "notebook.db"),
		store.Options{Now: newClock().Now, Valences: testValences})
	if err != nil {
		tb.Fatal(err)
	}
	tb.Cleanup(func() {
		if err := s.Close(); err != nil {
			tb.Error(err)
		}
	})
	return s
}

// fractions builds a composition from element, fraction pairs.
func fractions(pairs ...any) []meltbook.ElementFraction {
	var out []meltbook.ElementFraction
	for i := 0; i < len(pairs); i += 2 {
		out = append(out, meltbook.ElementFraction{Element: pairs[i].(string), Fraction: pairs[i+1].(float64)})
	}
	return out
}

func ptr[T any](v T) *T { return &v }

// newMelt is an invented Al65Cu20Fe15 button.
func newMelt(code string) *meltbook.Melt {
	return &meltbook.Melt{
		Code: code, Operator: "Ines Marlow", CompositionEntered: "Al65Cu20Fe15",
		Nominal:         fractions("Al", 0.65, "Cu", 0.20, "Fe", 0.15),
		TargetMassGrams: 8,
		WeighOut: []meltbook.WeighOutLine{
			{Element: "Al", PlannedGrams: 3.91, WeighedGrams: ptr(3.912), PurityPercent: 99.99, LossPercent: 0.5},
			{Element: "Cu", PlannedGrams: 2.84, PurityPercent: 99.99},
			{Element: "Fe", PlannedGrams: 1.87, PurityPercent: 99.95},
		},
		Notes: "first button of the week",
	}
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

func anneal() meltbook.ProcessStep {
	return meltbook.ProcessStep{Kind: meltbook.Anneal, Params: []meltbook.Param{
		{Name: "temperature", SI: 1073.15, Unit: "°C"},
		{Name: "time", SI: 4 * 3600, Unit: "h"},
		{Name: "cooling", Text: "water quench"},
	}}
}

// export returns the notebook as JSON.
func export(tb testing.TB, s *store.Store) []byte {
	tb.Helper()
	var b bytes.Buffer
	if err := s.Export(context.Background(), &b); err != nil {
		tb.Fatal(err)
	}
	return b.Bytes()
}

// wantKind fails unless err carries a *meltbook.Error of kind on field
// (field "" skips that check).
func wantKind(tb testing.TB, err error, kind meltbook.ErrorKind, field string) {
	tb.Helper()
	if err == nil {
		tb.Fatalf("no error; want %s", kind)
	}
	var e *meltbook.Error
	if !errors.As(err, &e) || e.Kind != kind {
		tb.Fatalf("error %v (%T); want kind %s", err, err, kind)
	}
	if field != "" && e.Field != field {
		tb.Fatalf("error %v names field %q; want %q", err, e.Field, field)
	}
}

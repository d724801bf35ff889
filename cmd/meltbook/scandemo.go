package main

import (
	"context"
	"fmt"
	"sync"
	"time"

	"meltbook/seed"
	"meltbook/store"
	"meltbook/store/intake"
)

// scanClock is the demo notebook's clock: the real one, or a set time
// while invented records dated in the past are written.
type scanClock struct {
	mu   sync.Mutex
	at   time.Time
	real func() time.Time
}

// Now returns the set time, else the real clock's.
func (c *scanClock) Now() time.Time {
	c.mu.Lock()
	defer c.mu.Unlock()
	if !c.at.IsZero() {
		return c.at
	}
	return c.real()
}

func (c *scanClock) set(t time.Time) {
	c.mu.Lock()
	c.at = t
	c.mu.Unlock()
}

// addDemoScans runs the demo's invented scans through the same intake as
// scan add, each dated and signed as the lab imported it.
func (a *app) addDemoScans(ctx context.Context, st *store.Store, nb *seed.Notebook, seedValue uint64, clock *scanClock) error {
	list, err := nb.Scans(seedValue)
	if err != nil {
		return err
	}
	a.loadCalibration()
	defer a.saveCalibration()
	defer clock.set(time.Time{})
	for _, s := range list {
		clock.set(s.MeasuredAt)
		if _, err := intake.Add(ctx, st, s.Operator, intake.File{Sample: s.Sample, Name: s.FileName, Data: s.Data},
			intake.Options{Radiation: "Cu"}); err != nil {
			return fmt.Errorf("demo scan %s: %w", s.FileName, err)
		}
	}
	return nil
}

package storetest_test

import (
	"context"
	"path/filepath"
	"reflect"
	"testing"

	"meltbook/store"
	"meltbook/store/storetest"
)

func TestGenerate(t *testing.T) {
	ctx := context.Background()
	opt := storetest.Options{Melts: 300, AnnealedShare: 0.5, MeasuredShare: 0.3}
	d := storetest.Document(opt)
	if !reflect.DeepEqual(d, storetest.Document(opt)) {
		t.Fatal("the same options gave two different documents")
	}
	// The melts do not depend on the shares.
	plain := storetest.Document(storetest.Options{Melts: 300})
	for i := range plain.Melts {
		if !reflect.DeepEqual(plain.Melts[i].Melt, d.Melts[i].Melt) {
			t.Fatalf("melt %d differs with pieces and measurements added", i)
		}
	}
	samples, pieces, measured := 0, 0, 0
	for _, m := range d.Melts {
		for _, s := range m.Samples {
			samples++
			if s.ParentCode != "" {
				pieces++
			}
			measured += len(s.Measurements)
		}
	}
	// Shares of 0.5 and 0.3 over 300 melts: well inside a wide band.
	if pieces < 100 || pieces > 200 || measured < 60 || measured > 180 {
		t.Errorf("%d annealed pieces and %d measurements in %d samples", pieces, measured, samples)
	}

	path := filepath.Join(t.TempDir(), "notebook.db")
	if err := storetest.Generate(ctx, path, opt); err != nil {
		t.Fatal(err)
	}
	s, err := store.Open(ctx, path, store.Options{})
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	sum, err := s.Summary(ctx)
	if err != nil || sum.Melts != 300 || sum.Samples != samples {
		t.Errorf("notebook holds %+v, %v; want 300 melts and %d samples", sum, err, samples)
	}
}

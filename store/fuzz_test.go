package store_test

import (
	"bytes"
	"context"
	"fmt"
	"path/filepath"
	"strings"
	"testing"

	"meltbook"
	"meltbook/store"
)

// FuzzImport feeds documents to Import: it must never panic, and a document
// it refuses must be refused as the user's input (Invalid or Conflict),
// leaving the notebook empty.
func FuzzImport(f *testing.F) {
	src := MustOpen(f)
	fillNotebook(f, src)
	good := export(f, src)
	f.Add(good)
	f.Add([]byte(`{"format":"meltbook-notebook","version":1,"melts":[],"history":[]}`))
	f.Add([]byte(`{"format":"meltbook-notebook","version":1,"melts":[{"id":1,"code":"QX-1","operator":"a","created_at":"2026-01-01T00:00:00Z","composition_entered":"Al","nominal":[{"element":"Al","fraction":1}],"target_mass_g":1,"samples":[{"id":1,"code":"QX-1","created_at":"2026-01-01T00:00:00Z"}]}],"history":[]}`))
	f.Add(bytes.Replace(good, []byte(`"parent": "QX-0001"`), []byte(`"parent": "QX-0002"`), 1))
	f.Add([]byte(`{"format":"meltbook-notebook","version":1,"melts":[{"id":1}]}`))
	f.Add([]byte(`[]`))
	ctx := context.Background()
	withScan := MustOpen(f)
	if err := withScan.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001")); err != nil {
		f.Fatal(err)
	}
	if _, err := withScan.AddScan(ctx, "Ines Marlow", store.NewScan{Scan: newScan("QX-0001", "x.xy"), Indexing: newIndexing(),
		Proposals: []store.Proposal{crystallineProposal()}}); err != nil {
		f.Fatal(err)
	}
	f.Add(export(f, withScan))
	// Version 2 by hand, and version 3 with every field of a phase call.
	f.Add([]byte(version2Document))
	f.Add([]byte(strings.Replace(version2Document, `"kind": "cubic"`, `"kind": "tetragonal"`, 1)))
	for _, x := range []meltbook.Indexing{thetaAl2CuIndexing(), hexagonalIndexing(), icosahedralIndexing()} {
		calls := MustOpen(f)
		if err := calls.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001")); err != nil {
			f.Fatal(err)
		}
		if _, err := calls.AddScan(ctx, "Ines Marlow", store.NewScan{Scan: newScan("QX-0001", "x.xy"), Indexing: x}); err != nil {
			f.Fatal(err)
		}
		f.Add(export(f, calls))
	}
	dir := f.TempDir()
	notebooks := 0
	fresh := func(tb testing.TB) *store.Store {
		notebooks++
		s, err := store.Init(ctx, filepath.Join(dir, fmt.Sprintf("n%d.db", notebooks)), store.Options{Valences: testValences})
		if err != nil {
			tb.Fatal(err)
		}
		return s
	}
	dst := fresh(f)
	f.Cleanup(func() { dst.Close() })
	f.Fuzz(func(t *testing.T, doc []byte) {
		err := dst.Import(ctx, "fuzz", bytes.NewReader(doc))
		if err == nil {
			// Imported: go on with an empty notebook.
			dst.Close()
			dst = fresh(t)
			return
		}
		if k := meltbook.KindOf(err); k != meltbook.Invalid && k != meltbook.Conflict {
			t.Fatalf("import error of kind %s: %v", k, err)
		}
		if _, total, _ := dst.FindMelts(ctx, meltbook.MeltFilter{}); total != 0 {
			t.Fatalf("a refused import left %d melts", total)
		}
	})
}

package store_test

import (
	"bytes"
	"context"
	"database/sql"
	"fmt"
	"os"
	"path/filepath"
	"testing"
	"testing/fstest"
	"time"

	"meltbook"
	"meltbook/migrations"
	"meltbook/store"
)

func TestInitCreatesMigratedNotebook(t *testing.T) {
	ctx := context.Background()
	s := MustOpen(t)
	have, known, err := s.SchemaVersion(ctx)
	if err != nil {
		t.Fatal(err)
	}
	if have != known || known < 1 {
		t.Fatalf("schema version %d, known %d; want equal and at least 1", have, known)
	}
	_, err = store.Init(ctx, s.Path(), store.Options{})
	wantKind(t, err, meltbook.Conflict, s.Path())
}

func TestInitRefusesToOverwrite(t *testing.T) {
	ctx := context.Background()
	p := filepath.Join(t.TempDir(), "runs.txt")
	content := []byte("QX-0001 Al65Cu20Fe15\n")
	if err := os.WriteFile(p, content, 0o644); err != nil {
		t.Fatal(err)
	}
	_, err := store.Init(ctx, p, store.Options{})
	wantKind(t, err, meltbook.Conflict, p)
	got, _ := os.ReadFile(p)
	if !bytes.Equal(got, content) {
		t.Fatal("Init changed an existing file")
	}
}

func TestOpenRefusesWhatIsNotANotebook(t *testing.T) {
	ctx := context.Background()
	dir := t.TempDir()

	_, err := store.Open(ctx, filepath.Join(dir, "missing.db"), store.Options{})
	wantKind(t, err, meltbook.NotFound, "")
	if _, statErr := os.Stat(filepath.Join(dir, "missing.db")); !os.IsNotExist(statErr) {
		t.Fatal("Open created a file")
	}

	text := filepath.Join(dir, "runs.csv")
	os.WriteFile(text, []byte("code,composition\nQX-0001,Al65Cu20Fe15\n"), 0o644)
	_, err = store.Open(ctx, text, store.Options{})
	wantKind(t, err, meltbook.Invalid, text)

	// Another program's SQLite database: refused, and not switched to WAL.
	other := filepath.Join(dir, "other.db")
	db, err := sql.Open("sqlite", other)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := db.Exec("CREATE TABLE t (x INTEGER)"); err != nil {
		t.Fatal(err)
	}
	db.Close()
	before, _ := os.ReadFile(other)
	_, err = store.Open(ctx, other, store.Options{})
	wantKind(t, err, meltbook.Invalid, other)
	after, _ := os.ReadFile(other)
	if !bytes.Equal(before, after) {
		t.Fatal("Open changed another program's database")
	}
}

func TestOpenUnknownValenceScheme(t *testing.T) {
	p := MustOpen(t).Path()
	_, err := store.Open(context.Background(), p, store.Options{Valences: map[string]map[string]float64{"mine": {"Al": 3}}})
	wantKind(t, err, meltbook.Invalid, "valences")
}

// migrationSets returns the real first migration alone, and with a second,
// test-only one.
func migrationSets(t *testing.T) (v1, v2 fstest.MapFS) {
	first, err := migrations.FS.ReadFile("001_notebook.sql")
	if err != nil {
		t.Fatal(err)
	}
	v1 = fstest.MapFS{"001_notebook.sql": {Data: first}}
	v2 = fstest.MapFS{
		"001_notebook.sql": {Data: first},
		"002_furnace.sql":  {Data: []byte("CREATE TABLE furnace (id INTEGER PRIMARY KEY, name TEXT NOT NULL);")},
	}
	return v1, v2
}

func TestOlderNotebookMigrates(t *testing.T) {
	ctx := context.Background()
	v1, v2 := migrationSets(t)
	p := filepath.Join(t.TempDir(), "notebook.db")
	c := newClock()
	s, err := store.InitWith(ctx, p, store.Options{Now: c.Now}, v1)
	if err != nil {
		t.Fatal(err)
	}
	if err := s.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001")); err != nil {
		t.Fatal(err)
	}
	s.Close()

	s, err = store.OpenWith(ctx, p, store.Options{Now: c.Now}, v2)
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	if have, known, _ := s.SchemaVersion(ctx); have != 2 || known != 2 {
		t.Fatalf("after migrating: version %d of %d; want 2 of 2", have, known)
	}
	if _, err := s.FindMeltByCode(ctx, "QX-0001"); err != nil {
		t.Fatalf("the melt did not survive the migration: %v", err)
	}
	db, err := sql.Open("sqlite", p)
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	var name, applied string
	if err := db.QueryRow("SELECT name, applied_at FROM schema_migration WHERE version = 2").Scan(&name, &applied); err != nil {
		t.Fatal(err)
	}
	if name != "002_furnace.sql" {
		t.Errorf("recorded migration name %q", name)
	}
	if at, err := time.Parse(time.RFC3339Nano, applied); err != nil || at.Before(time.Date(2026, 5, 4, 8, 0, 0, 0, time.UTC)) {
		t.Errorf("recorded time %q is not from the notebook's clock", applied)
	}
	if _, err := db.Exec("INSERT INTO furnace (name) VALUES ('tube furnace 2')"); err != nil {
		t.Fatalf("migration 2 was not applied: %v", err)
	}
}

// notebookFiles reads the notebook and its WAL files, if any.
func notebookFiles(t *testing.T, p string) [][]byte {
	var out [][]byte
	for _, f := range []string{p, p + "-wal", p + "-shm"} {
		b, _ := os.ReadFile(f)
		out = append(out, b)
	}
	return out
}

func TestNewerNotebookRefusedUntouched(t *testing.T) {
	ctx := context.Background()
	v1, v2 := migrationSets(t)
	p := filepath.Join(t.TempDir(), "notebook.db")
	s, err := store.InitWith(ctx, p, store.Options{}, v2)
	if err != nil {
		t.Fatal(err)
	}
	if err := s.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001")); err != nil {
		t.Fatal(err)
	}
	s.Close()
	before := notebookFiles(t, p)

	_, err = store.OpenWith(ctx, p, store.Options{Valences: testValences}, v1)
	wantKind(t, err, meltbook.Conflict, p)
	after := notebookFiles(t, p)
	for i := range before {
		if !bytes.Equal(before[i], after[i]) {
			t.Fatalf("file %d of the notebook changed on a refused open", i)
		}
	}

	// The same with the real migrations and a version from the future.
	db, err := sql.Open("sqlite", p)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := db.Exec("INSERT INTO schema_migration (version, name, applied_at) VALUES (999, '999_future.sql', '2031-01-01T00:00:00.000000000Z')"); err != nil {
		t.Fatal(err)
	}
	db.Close()
	before = notebookFiles(t, p)
	_, err = store.Open(ctx, p, store.Options{})
	wantKind(t, err, meltbook.Conflict, p)
	after = notebookFiles(t, p)
	for i := range before {
		if !bytes.Equal(before[i], after[i]) {
			t.Fatalf("file %d of the notebook changed on a refused open", i)
		}
	}
}

func TestValenceTablesChangeRecomputesEOverA(t *testing.T) {
	ctx := context.Background()
	p := filepath.Join(t.TempDir(), "notebook.db")
	s, err := store.Init(ctx, p, store.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if err := s.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001")); err != nil {
		t.Fatal(err)
	}
	r, _ := s.MeltRecord(ctx, "QX-0001")
	if len(r.EOverA) != 0 {
		t.Fatalf("e/a %v without valence tables", r.EOverA)
	}
	s.Close()

	s, err = store.Open(ctx, p, store.Options{Valences: testValences})
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	r, _ = s.MeltRecord(ctx, "QX-0001")
	// Al65Cu20Fe15 under Raynor's valences: 0.65·3 + 0.20·1 + 0.15·(−2.66)
	// = 1.751 (hand arithmetic); the i-AlCuFe phase is commonly quoted near
	// e/a 1.75 (Tsai, Inoue, Masumoto 1990).
	if got, ok := r.EOverA["raynor"]; !ok || abs(got-1.751) > 1e-12 {
		t.Fatalf("raynor e/a %v; want 1.751", r.EOverA)
	}
	if _, ok := r.EOverA["group"]; ok {
		t.Fatalf("group e/a %v defined without a valence for Fe", r.EOverA["group"])
	}
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}

func TestCloseGathersPlannerStatistics(t *testing.T) {
	ctx := context.Background()
	p := filepath.Join(t.TempDir(), "notebook.db")
	s, err := store.Init(ctx, p, store.Options{Valences: testValences})
	if err != nil {
		t.Fatal(err)
	}
	batch := make([]store.NewMelt, 120)
	for i := range batch {
		batch[i] = store.NewMelt{Melt: *newMelt(fmt.Sprintf("QX-%04d", i+1)), Steps: []meltbook.ProcessStep{meltSpin(1e6)}}
	}
	if err := s.CreateMelts(ctx, "Ines Marlow", batch); err != nil {
		t.Fatal(err)
	}
	if err := s.Close(); err != nil {
		t.Fatal(err)
	}
	db, err := sql.Open("sqlite", p)
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	var samples int
	if err := db.QueryRow("SELECT COUNT(*) FROM sqlite_stat4 WHERE tbl = 'melt'").Scan(&samples); err != nil {
		t.Fatal(err)
	}
	if samples == 0 {
		t.Fatal("no value histograms for the melt table after closing a grown notebook")
	}
}

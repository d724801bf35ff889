package store_test

import (
	"bytes"
	"context"
	"database/sql"
	"encoding/binary"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
	"testing/fstest"

	"meltbook"
	"meltbook/migrations"
	"meltbook/store"
)

// migrationsUpTo returns the real migration files numbered up to last.
func migrationsUpTo(t testing.TB, last int) fstest.MapFS {
	t.Helper()
	out := fstest.MapFS{}
	names, err := migrations.FS.ReadDir(".")
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range names {
		var v int
		if _, err := fmt.Sscanf(e.Name(), "%03d_", &v); err != nil || v > last {
			continue
		}
		b, err := migrations.FS.ReadFile(e.Name())
		if err != nil {
			t.Fatal(err)
		}
		out[e.Name()] = &fstest.MapFile{Data: b}
	}
	if len(out) != last {
		t.Fatalf("%d migration files up to %d", len(out), last)
	}
	return out
}

// littleEndianDoubles writes values as the scan table's BLOBs hold them
// (little-endian IEEE 754 doubles, as 002_diffraction.sql says).
func littleEndianDoubles(v ...float64) []byte {
	b := make([]byte, 8*len(v))
	for i, x := range v {
		binary.LittleEndian.PutUint64(b[8*i:], math.Float64bits(x))
	}
	return b
}

// version2Rows are the diffraction rows a notebook at schema version 2
// holds in the test below, written as version 2 wrote them: a scan, its
// indexing with four peaks, an icosahedral F phase and a 1/1 approximant
// (both kinds version 2 knew), their assignments, two models tried, one
// unexplained peak and a proposal resting on the first phase.
const version2Rows = `
INSERT INTO scan (id, sample_id, file_name, sha256, file_format, anode, kalpha1_angstrom, kalpha2_angstrom, kalpha2_ratio,
    kalpha2_state, radiation_text, radiation_assumed, internal_standard, points, two_theta_from_deg, two_theta_to_deg,
    two_theta_deg, counts, count_errors, imported_at, imported_by, notes)
  VALUES (11, (SELECT id FROM sample WHERE code = 'QX-0001'), 'old.xy', ?, 'xy', 'Cu', 1.5405929, 1.5444274, 0.5,
    'doublet', 'Cu', 0, '', 3, 20, 40, ?, ?, NULL, '2026-05-04T09:00:00.000000000Z', 'Ines Marlow', 'kept from 2026');
INSERT INTO indexing (id, scan_id, version, indexed_at, indexed_by, requested_by, reason, anode, kalpha1_angstrom,
    kalpha2_angstrom, kalpha2_ratio, kalpha2_state, radiation_text, radiation_assumed, internal_standard,
    zero_shift_deg, zero_shift_su_deg, tolerance_deg, max_chance, notes)
  VALUES (21, 11, 1, '2026-05-04T09:00:01.000000000Z', 'meltbook 0.2', 'Ines Marlow', '', 'Cu', 1.5405929,
    1.5444274, 0.5, 'doublet', 'Cu', 0, '', NULL, NULL, 0.1, 0.01, 'first note');
INSERT INTO peak (id, indexing_id, position, two_theta_deg, two_theta_su_deg, d_angstrom, d_su_angstrom, height, height_su,
    area, area_su, fwhm_deg, fwhm_su_deg, eta, eta_su, significance, standard_line, corrected_two_theta_deg,
    corrected_d_angstrom, found)
  VALUES (31, 21, 0, 26.7, 0.002, 3.336, NULL, 300, NULL, 40, NULL, 0.12, NULL, 0.3, NULL, 25, '', NULL, NULL, 'automatic'),
         (32, 21, 1, 42.9, 0.002, 2.106, NULL, 900, NULL, 120, NULL, 0.12, NULL, 0.3, NULL, 60, '', NULL, NULL, 'automatic'),
         (33, 21, 2, 44.9, NULL, 2.017, NULL, 500, NULL, 70, NULL, 0.13, NULL, 0.3, NULL, 40, '', NULL, NULL, 'by hand'),
         (34, 21, 3, 48.1, NULL, 1.890, NULL, 50, NULL, 6, NULL, 0.14, NULL, 0.2, NULL, 5, '', NULL, NULL, 'automatic');
INSERT INTO indexed_phase (id, indexing_id, position, kind, lattice, approximant_order, approximant_of, ideal_a_angstrom,
    constant_angstrom, constant_su_angstrom, a6_angstrom, zero_shift_deg, zero_shift_su_deg, figure_of_merit, chance,
    chance_basis, explained_intensity, rms_residual_deg, phason_strain)
  VALUES (41, 21, 0, 'icosahedral', 'F', '', '', NULL, 4.462, 0.002, 6.3102, 0.01, 0.003, 18.5, 0.0004, 'uniform lists', 0.7, 0.004, 1),
         (42, 21, 1, 'approximant', 'P', '1/1', 'i-Al-Cu-Fe', 12.28, 12.31, 0.01, NULL, 0.0, 0.004, 7.5, 0.008, 'uniform lists', 0.25, 0.006, 0);
INSERT INTO peak_assignment (phase_id, peak_id, calculated_two_theta_deg, residual_deg, d_angstrom, label, detail)
  VALUES (41, 31, 26.698, 0.002, 3.336, '(7,11)', 'N = 7, M = 11'),
         (41, 32, 42.901, -0.001, 2.106, '(18,29)', 'N = 18, M = 29'),
         (42, 33, 44.897, 0.003, 2.017, '530', 'h² + k² + l² = 34');
INSERT INTO indexing_model (indexing_id, position, kind, lattice, approximant_order, scale_angstrom, indexed_peaks,
    figure_of_merit, chance)
  VALUES (21, 0, 'icosahedral', 'F', '', 4.462, 2, 18.5, 0.0004),
         (21, 1, 'approximant', 'P', '1/1', 12.31, 1, 7.5, 0.008);
INSERT INTO unexplained_peak (indexing_id, peak_id) VALUES (21, 34);
INSERT INTO indexing_proposal (outcome_id, indexing_id, phase_id, confidence)
  VALUES ((SELECT MAX(id) FROM outcome), 21, 41, 'medium');
`

// version2Notebook creates a notebook with the real migrations 001 and 002
// only, holding a melt written by the store and the rows above, and
// returns its path.
func version2Notebook(t *testing.T) string {
	t.Helper()
	ctx := context.Background()
	p := filepath.Join(t.TempDir(), "notebook.db")
	s, err := store.InitWith(ctx, p, store.Options{Now: newClock().Now, Valences: testValences}, migrationsUpTo(t, 2))
	if err != nil {
		t.Fatal(err)
	}
	if err := s.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001"), arcMelt(), meltSpin(1e6)); err != nil {
		t.Fatal(err)
	}
	if _, err := s.ProposeOutcome(ctx, "meltbook 0.2", "QX-0001", meltbook.Outcome{Kind: meltbook.Icosahedral, Lattice: "F"}); err != nil {
		t.Fatal(err)
	}
	if err := s.Close(); err != nil {
		t.Fatal(err)
	}
	db := rawDB(t, p)
	if _, err := db.Exec(version2Rows, digest("old.xy"), littleEndianDoubles(20, 30, 40), littleEndianDoubles(100, 180, 95)); err != nil {
		t.Fatal(err)
	}
	if err := db.Close(); err != nil {
		t.Fatal(err)
	}
	return p
}

// tableRows reads every row of the tables as text, in the columns given
// (as columnsOf lists them), so that the same columns can be read again
// after a migration added others.
func tableRows(t *testing.T, db *sql.DB, columns map[string][]string) map[string][]string {
	t.Helper()
	out := map[string][]string{}
	for table, cols := range columns {
		if table == "schema_migration" {
			continue
		}
		rows, err := db.Query(`SELECT quote(` + strings.Join(cols, `) || '|' || quote(`) + `) FROM ` + table + ` ORDER BY rowid`)
		if err != nil {
			t.Fatalf("%s: %v", table, err)
		}
		for rows.Next() {
			var line string
			if err := rows.Scan(&line); err != nil {
				t.Fatal(err)
			}
			out[table] = append(out[table], line)
		}
		rows.Close()
	}
	return out
}

func columnsOf(t *testing.T, db *sql.DB) map[string][]string {
	t.Helper()
	rows, err := db.Query(`SELECT m.name, c.name FROM sqlite_master m, pragma_table_info(m.name) c
		WHERE m.type = 'table' AND m.name NOT LIKE 'sqlite_%' ORDER BY m.name, c.cid`)
	if err != nil {
		t.Fatal(err)
	}
	defer rows.Close()
	out := map[string][]string{}
	for rows.Next() {
		var table, column string
		if err := rows.Scan(&table, &column); err != nil {
			t.Fatal(err)
		}
		out[table] = append(out[table], column)
	}
	return out
}

// schemaOf lists the notebook's tables, indexes and triggers with their SQL.
func schemaOf(t *testing.T, db *sql.DB) []string {
	t.Helper()
	rows, err := db.Query(`SELECT type || ' ' || name || ': ' || COALESCE(sql, '') FROM sqlite_master
		WHERE name NOT LIKE 'sqlite_%' ORDER BY type, name`)
	if err != nil {
		t.Fatal(err)
	}
	defer rows.Close()
	var out []string
	for rows.Next() {
		var s string
		rows.Scan(&s)
		out = append(out, s)
	}
	return out
}

func TestVersion2NotebookMigratesWithItsIndexings(t *testing.T) {
	ctx := context.Background()
	p := version2Notebook(t)
	db := rawDB(t, p)
	oldColumns := columnsOf(t, db)
	before := tableRows(t, db, oldColumns)
	db.Close()

	s, err := store.Open(ctx, p, store.Options{Now: newClock().Now, Valences: testValences})
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	if have, known, _ := s.SchemaVersion(ctx); have != 3 || known != 3 {
		t.Fatalf("after migrating: version %d of %d; want 3 of 3", have, known)
	}

	db = rawDB(t, p)
	// Every row of every table, in the columns it had, is as it was.
	after := tableRows(t, db, oldColumns)
	if !reflect.DeepEqual(before, after) {
		for table := range before {
			if !reflect.DeepEqual(before[table], after[table]) {
				t.Errorf("%s changed:\n%q\n%q", table, before[table], after[table])
			}
		}
		t.Fatal("the migration changed data")
	}
	if len(before["indexed_phase"]) != 2 || len(before["peak_assignment"]) != 3 || len(before["indexing_proposal"]) != 1 {
		t.Fatalf("the fixture holds %d phases, %d assignments, %d proposals", len(before["indexed_phase"]),
			len(before["peak_assignment"]), len(before["indexing_proposal"]))
	}
	// References still hold, and still name indexed_phase.
	if rows := schemaRows(t, db, `SELECT "table", rowid, parent FROM pragma_foreign_key_check`); len(rows) != 0 {
		t.Fatalf("foreign key check after migrating: %q", rows)
	}
	for _, table := range []string{"peak_assignment", "indexing_proposal"} {
		got := schemaRows(t, db, `SELECT "table" || '(' || "to" || ') <- ' || "from" FROM pragma_foreign_key_list(?) WHERE "from" = 'phase_id'`, table)
		if !reflect.DeepEqual(got, []string{"indexed_phase(id) <- phase_id"}) {
			t.Errorf("%s.phase_id refers to %q; want indexed_phase(id)", table, got)
		}
	}
	// The migrated schema is the one a new notebook gets.
	fresh := rawDB(t, MustOpen(t).Path())
	if a, b := schemaOf(t, db), schemaOf(t, fresh); !reflect.DeepEqual(a, b) {
		t.Errorf("migrated schema differs from a new notebook's:\n%s\n----\n%s", strings.Join(a, "\n"), strings.Join(b, "\n"))
	}

	// The store reads the old calls with the new fields empty.
	rec, err := s.ScanRecord(ctx, 11)
	if err != nil {
		t.Fatal(err)
	}
	x := rec.Current()
	if len(x.Phases) != 2 || x.Phases[0].ID != 41 || x.Phases[1].ID != 42 {
		t.Fatalf("phases after migrating: %+v", x.Phases)
	}
	ico := x.Phases[0]
	if ico.Kind != meltbook.ModelIcosahedral || ico.Lattice != "F" || ico.ConstantA != 4.462 || ico.SixDimensionalConstantA != 6.3102 ||
		!ico.PhasonStrain || ico.Phase != "" || ico.SpaceGroup != "" || ico.ConstantC != 0 || ico.WholePatternRwp != nil {
		t.Errorf("icosahedral phase after migrating: %+v", ico)
	}
	if len(ico.Assignments) != 2 || ico.Assignments[1].PeakID != 32 || ico.Assignments[1].Label != "(18,29)" || ico.Assignments[1].PredictedIntensity != nil {
		t.Errorf("icosahedral assignments after migrating: %+v", ico.Assignments)
	}
	if ap := x.Phases[1]; ap.Kind != meltbook.ModelApproximant || ap.Order != "1/1" || ap.IdealAA != 12.28 || len(ap.Assignments) != 1 {
		t.Errorf("approximant after migrating: %+v", ap)
	}
	if len(x.Models) != 2 || x.Models[1].Order != "1/1" || x.Models[1].Phase != "" || !reflect.DeepEqual(x.Unexplained, []int{3}) {
		t.Errorf("models and unexplained peaks after migrating: %+v, %v", x.Models, x.Unexplained)
	}
	if len(rec.Proposals) != 1 || rec.Proposals[0].Confidence != "medium" {
		t.Errorf("proposals after migrating: %+v", rec.Proposals)
	}

	// And it goes on: a tetragonal call is stored beside the old ones,
	// superseding the old proposal.
	next := thetaAl2CuIndexing()
	next.Reason = "library phases now searched"
	rec, err = s.AddIndexing(ctx, "Ines Marlow", 11, store.NewIndexing{Indexing: next})
	if err != nil {
		t.Fatal(err)
	}
	if got := rec.Current(); got.Version != 2 || got.Phases[0].Kind != meltbook.ModelTetragonal || got.Phases[0].SpaceGroup != "I4/mcm" {
		t.Fatalf("second indexing after migrating: %s", store.IndexingBrief(got))
	}
	if rec.Proposals[0].Outcome.Status != meltbook.Rejected {
		t.Errorf("old proposal %s after re-indexing; want rejected as superseded", rec.Proposals[0].Outcome.Status)
	}
}

func schemaRows(t *testing.T, db *sql.DB, query string, args ...any) []string {
	t.Helper()
	rows, err := db.Query(query, args...)
	if err != nil {
		t.Fatal(err)
	}
	defer rows.Close()
	var out []string
	for rows.Next() {
		var cols []any
		n, _ := rows.Columns()
		vals := make([]sql.NullString, len(n))
		for i := range vals {
			cols = append(cols, &vals[i])
		}
		if err := rows.Scan(cols...); err != nil {
			t.Fatal(err)
		}
		var parts []string
		for _, v := range vals {
			parts = append(parts, v.String)
		}
		out = append(out, strings.Join(parts, " "))
	}
	return out
}

func TestMigrationLeavingDanglingReferencesIsRolledBack(t *testing.T) {
	ctx := context.Background()
	p := version2Notebook(t)
	db := rawDB(t, p)
	columns := columnsOf(t, db)
	before := tableRows(t, db, columns)
	db.Close()

	// A faulty third migration: it rebuilds indexed_phase without the rows
	// that peak_assignment and indexing_proposal name.
	bad := migrationsUpTo(t, 2)
	bad["003_faulty.sql"] = &fstest.MapFile{Data: []byte(`
		CREATE TABLE indexed_phase_rebuilt (id INTEGER PRIMARY KEY, indexing_id INTEGER NOT NULL REFERENCES indexing (id));
		DROP TABLE indexed_phase;
		ALTER TABLE indexed_phase_rebuilt RENAME TO indexed_phase;`)}
	_, err := store.OpenWith(ctx, p, store.Options{Valences: testValences}, bad)
	if err == nil || !strings.Contains(err.Error(), "003_faulty.sql") || !strings.Contains(err.Error(), "indexed_phase") {
		t.Fatalf("faulty migration: %v; want it refused naming the file and the table referred to", err)
	}
	db = rawDB(t, p)
	if !reflect.DeepEqual(columns, columnsOf(t, db)) || !reflect.DeepEqual(before, tableRows(t, db, columns)) {
		t.Fatal("a refused migration changed the notebook")
	}
	db.Close()

	// The real one then applies.
	s, err := store.Open(ctx, p, store.Options{Valences: testValences})
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	if have, _, _ := s.SchemaVersion(ctx); have != 3 {
		t.Fatalf("version %d after the real migration; want 3", have)
	}
}

// BenchmarkMigrate003 times migration 003 on a notebook at version 2
// holding the fixture above plus 10,000 further indexings of its scan,
// each with one peak, one phase and one assignment.
func BenchmarkMigrate003(b *testing.B) {
	ctx := context.Background()
	dir := b.TempDir()
	src := filepath.Join(dir, "v2.db")
	s, err := store.InitWith(ctx, src, store.Options{Now: newClock().Now}, migrationsUpTo(b, 2))
	if err != nil {
		b.Fatal(err)
	}
	if err := s.CreateMelt(ctx, "Ines Marlow", newMelt("QX-0001")); err != nil {
		b.Fatal(err)
	}
	if _, err := s.ProposeOutcome(ctx, "meltbook 0.2", "QX-0001", meltbook.Outcome{Kind: meltbook.Icosahedral, Lattice: "F"}); err != nil {
		b.Fatal(err)
	}
	s.Close()
	db, err := sql.Open("sqlite", "file:"+filepath.ToSlash(src)+"?_pragma=foreign_keys(1)")
	if err != nil {
		b.Fatal(err)
	}
	if _, err := db.Exec(version2Rows, digest("old.xy"), littleEndianDoubles(20, 30, 40), littleEndianDoubles(100, 180, 95)); err != nil {
		b.Fatal(err)
	}
	const n = 10000
	for k, q := range []string{
		`WITH RECURSIVE k(i) AS (SELECT 2 UNION ALL SELECT i + 1 FROM k WHERE i < 1 + ?)
		INSERT INTO indexing (id, scan_id, version, indexed_at, indexed_by, requested_by, reason, anode, kalpha1_angstrom,
			kalpha2_angstrom, kalpha2_ratio, kalpha2_state, radiation_text, tolerance_deg, max_chance)
		SELECT 1000 + i, 11, i, '2026-05-04T09:00:01.000000000Z', 'meltbook 0.2', 'Ines Marlow', 'again', 'Cu', 1.5405929,
			1.5444274, 0.5, 'doublet', 'Cu', 0.1, 0.01 FROM k`,
		`INSERT INTO peak (id, indexing_id, position, two_theta_deg, d_angstrom, height, area, fwhm_deg, eta, significance, found)
		SELECT id, id, 0, 42.9, 2.106, 900, 120, 0.12, 0.3, 60, 'automatic' FROM indexing WHERE id > 1000`,
		`INSERT INTO indexed_phase (id, indexing_id, position, kind, lattice, constant_angstrom, constant_su_angstrom,
			zero_shift_deg, zero_shift_su_deg, figure_of_merit, chance, chance_basis, explained_intensity, rms_residual_deg)
		SELECT id, id, 0, 'cubic', 'F', 4.0495, 0.0003, 0, 0.002, 9.5, 0.001, 'uniform lists', 1, 0.003 FROM indexing WHERE id > 1000`,
		`INSERT INTO peak_assignment (phase_id, peak_id, calculated_two_theta_deg, residual_deg, d_angstrom, label)
		SELECT id, id, 42.9, 0, 2.106, '200' FROM indexing WHERE id > 1000`,
	} {
		var args []any
		if k == 0 {
			args = []any{n}
		}
		if _, err := db.Exec(q, args...); err != nil {
			b.Fatal(err)
		}
	}
	var phases int
	db.QueryRow(`SELECT COUNT(*) FROM indexed_phase`).Scan(&phases)
	db.Close()
	if phases != n+2 {
		b.Fatalf("%d phases in the benchmark notebook; want %d", phases, n+2)
	}
	data, err := os.ReadFile(src)
	if err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		b.StopTimer()
		p := filepath.Join(dir, fmt.Sprintf("copy%d.db", i))
		if err := os.WriteFile(p, data, 0o644); err != nil {
			b.Fatal(err)
		}
		b.StartTimer()
		s, err := store.Open(ctx, p, store.Options{})
		if err != nil {
			b.Fatal(err)
		}
		b.StopTimer()
		s.Close()
		os.Remove(p)
		b.StartTimer()
	}
}

// A notebook at version 3 with a tetragonal call, opened by a build that
// knows only 001 and 002, is refused and left as it was.
func TestVersion3NotebookRefusedByVersion2Build(t *testing.T) {
	ctx := context.Background()
	src, _ := threeCallNotebook(t)
	p := filepath.Join(t.TempDir(), "notebook.db")
	s, err := store.Init(ctx, p, store.Options{Valences: testValences})
	if err != nil {
		t.Fatal(err)
	}
	if err := s.Import(ctx, "Kai Ostrow", bytes.NewReader(export(t, src))); err != nil {
		t.Fatal(err)
	}
	if err := s.Close(); err != nil {
		t.Fatal(err)
	}
	before := notebookFiles(t, p)
	_, err = store.OpenWith(ctx, p, store.Options{Valences: testValences}, migrationsUpTo(t, 2))
	wantKind(t, err, meltbook.Conflict, p)
	if !strings.Contains(err.Error(), "schema version 3; this one knows up to 2") {
		t.Errorf("message %q does not give both versions", err)
	}
	for i, b := range notebookFiles(t, p) {
		if !reflect.DeepEqual(before[i], b) {
			t.Fatalf("file %d of the notebook changed on a refused open", i)
		}
	}
}

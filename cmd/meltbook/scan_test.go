package main

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"meltbook"
)

// TestMain keeps the indexing calibration the scan commands save out of
// the user's cache folder: every test of this binary shares one temporary
// one.
func TestMain(m *testing.M) {
	dir, err := os.MkdirTemp("", "meltbook-test-cache-")
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
	os.Setenv("XDG_CACHE_HOME", dir)
	code := m.Run()
	os.RemoveAll(dir)
	os.Exit(code)
}

// alScan writes an fcc Al scan (the first five lines, a = 4.0495 Å; see
// fccAluminiumSpacings) named name into dir and returns its path.
func alScan(t *testing.T, dir, name string, seed uint64) string {
	t.Helper()
	_, ds := fccAluminiumSpacings()
	src := syntheticScan(t, name, ds, []float64{3000, 1400, 700, 750, 220}, 20, 90, 0.02, seed)
	data, err := os.ReadFile(src)
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dir, name)
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// scanNotebook is a notebook with melts QX-0001 (Al99Cu1) and QX-0002
// (Al98Cu2).
func scanNotebook(t *testing.T) *testNotebook {
	t.Helper()
	nb := newNotebook(t)
	nb.ok("log", "--code", "QX-0001", "--composition", "Al99Cu1", "--mass", "5g")
	nb.ok("log", "--code", "QX-0002", "--composition", "Al98Cu2", "--mass", "5g")
	nb.later(24 * 3600e9)
	return nb
}

func TestScanAddOne(t *testing.T) {
	nb := scanNotebook(t)
	path := alScan(t, t.TempDir(), "QX-0001_al.xy", 1)
	out, errOut, code := nb.run("", "scan", "add", "QX-0001", path)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	golden(t, "scan_add_one.txt", out)

	// The same file again is reported, not stored.
	out, _, code = nb.run("", "scan", "add", "QX-0001", path)
	if code != 0 || !strings.Contains(out, "already scan 1 of QX-0001") {
		t.Errorf("exit %d: %s", code, out)
	}
	if list := nb.ok("scan", "list", "QX-0001"); strings.Count(list, "QX-0001_al.xy") != 1 {
		t.Errorf("list after adding the same file twice:\n%s", list)
	}
}

func TestScanAddMany(t *testing.T) {
	nb := scanNotebook(t)
	dir := t.TempDir()
	alScan(t, dir, "QX-0001_run1.xy", 1)
	alScan(t, dir, "QX-0002_run1.xy", 2)
	alScan(t, dir, "QX-0404_run1.xy", 3) // no such sample
	if err := os.WriteFile(filepath.Join(dir, "QX-0001_bad.xy"), []byte("2theta counts\n20.00 10\n20.02 ten\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "notes.md"), []byte("not a scan"), 0o644); err != nil {
		t.Fatal(err)
	}
	out, errOut, code := nb.run("", "scan", "add", "--by-name", dir)
	if code != exitInvalid {
		t.Errorf("exit %d; want %d (a file refused)", code, exitInvalid)
	}
	// One line per file, in name order; notes.md is not a scan file.
	want := []string{
		"refused  QX-0001_bad.xy:3:7: ",
		"added    " + filepath.Join(dir, "QX-0001_run1.xy") + ": scan 1 of QX-0001; Al, cubic Fm-3m",
		"added    " + filepath.Join(dir, "QX-0002_run1.xy") + ": scan 2 of QX-0002; Al, cubic Fm-3m",
		"refused  " + filepath.Join(dir, "QX-0404_run1.xy") + ": sample: no sample QX-0404 in the notebook",
		"",
		"4 files: 2 added, 0 already held, 2 refused",
	}
	lines := strings.Split(strings.TrimSuffix(out, "\n"), "\n")
	if len(lines) != len(want) {
		t.Fatalf("output:\n%s", out)
	}
	for i, w := range want {
		if !strings.HasPrefix(lines[i], w) {
			t.Errorf("line %d: %q; want it to start %q", i+1, lines[i], w)
		}
	}
	if !strings.Contains(errOut, "2 of 4 files were not added; the others were") {
		t.Errorf("stderr %q", errOut)
	}
	if errOut != "meltbook: 2 of 4 files were not added; the others were\n" {
		t.Errorf("stderr holds more than the summary (a progress bar on a non-terminal?): %q", errOut)
	}

	// Again: the two stored ones are held, nothing is added twice.
	out, _, _ = nb.run("", "scan", "add", "--by-name", dir)
	if !strings.Contains(out, "4 files: 0 added, 2 already held, 2 refused") {
		t.Errorf("second run:\n%s", out)
	}
}

func TestScanAddWithMapping(t *testing.T) {
	nb := scanNotebook(t)
	dir := t.TempDir()
	alScan(t, dir, "first.xy", 1)
	alScan(t, dir, "second.xy", 2)
	mapPath := filepath.Join(dir, "map.csv")
	if err := os.WriteFile(mapPath, []byte("file,sample\nfirst.xy,QX-0001\nsecond.xy,QX-0002\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	out, errOut, code := nb.run("", "scan", "add", "--map", mapPath, dir)
	if code != 0 || !strings.Contains(out, "2 files: 2 added") {
		t.Fatalf("exit %d: %s%s", code, out, errOut)
	}
	if list := nb.ok("scan", "list", "QX-0002"); !strings.Contains(list, "second.xy") || strings.Contains(list, "first.xy") {
		t.Errorf("QX-0002's scans:\n%s", list)
	}
	// A mapping that does not read names its line.
	if err := os.WriteFile(mapPath, []byte("file,sample\nfirst.xy,\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	_, errOut, code = nb.run("", "scan", "add", "--map", mapPath, dir)
	if code != exitInvalid || !strings.Contains(errOut, "map.csv line 2, column 10: no sample code for first.xy") {
		t.Errorf("exit %d: %s", code, errOut)
	}
}

func TestScanShowReindexAndFind(t *testing.T) {
	nb := scanNotebook(t)
	path := alScan(t, t.TempDir(), "QX-0001_al.xy", 1)
	nb.ok("scan", "add", "QX-0001", path)

	// The proposal counts in find only with --proposals, until confirmed.
	if out := nb.ok("find", "--outcome", "crystalline"); strings.Contains(out, "QX-0001") {
		t.Errorf("a pending proposal counted without --proposals:\n%s", out)
	}
	if out := nb.ok("find", "--outcome", "crystalline", "--proposals", "yes"); !strings.Contains(out, "QX-0001") || !strings.Contains(out, "proposed") {
		t.Errorf("the proposal is missing with --proposals yes:\n%s", out)
	}

	nb.later(3600e9)
	_, errOut, code := nb.run("", "scan", "reindex", "1")
	if code != exitInvalid || !strings.Contains(errOut, "--reason") {
		t.Errorf("reindex without a reason: exit %d, %s", code, errOut)
	}
	nb.ok("scan", "reindex", "scan:1", "--anode", "Cu", "--reason", "radiation from the instrument log")
	nb.ok("confirm", "outcome:2", "--reason", "the lines are aluminium's")
	if out := nb.ok("find", "--outcome", "crystalline"); !strings.Contains(out, "QX-0001") {
		t.Errorf("a confirmed proposal does not count:\n%s", out)
	}
	golden(t, "scan_show.txt", nb.ok("scan", "show", "1"))

	var rec meltbook.ScanRecord
	if err := json.Unmarshal([]byte(nb.ok("scan", "show", "1", "--json")), &rec); err != nil {
		t.Fatal(err)
	}
	if len(rec.Indexings) != 2 || rec.Scan.Points() != 3501 || len(rec.Proposals) != 2 ||
		rec.Proposals[0].Outcome.Status != meltbook.Rejected || rec.Proposals[1].Outcome.Status != meltbook.Confirmed {
		t.Errorf("JSON record: %d indexings, %d points, proposals %+v", len(rec.Indexings), rec.Scan.Points(), rec.Proposals)
	}
	var list []meltbook.ScanSummary
	if err := json.Unmarshal([]byte(nb.ok("scan", "list", "QX-0001", "--json")), &list); err != nil || len(list) != 1 || list[0].IndexingVersion != 2 {
		t.Errorf("list JSON: %+v, %v", list, err)
	}
}

func TestScanFailuresChangeNothing(t *testing.T) {
	nb := scanNotebook(t)
	before := nb.export()
	path := alScan(t, t.TempDir(), "a.xy", 1)
	cases := []struct {
		args []string
		code int
		want string
	}{
		{[]string{"scan", "add", "QX-0404", path}, exitNotFound, "no sample QX-0404"},
		{[]string{"scan", "add", "QX-0001", filepath.Join(t.TempDir(), "missing.xy")}, exitNotFound, "missing.xy"},
		{[]string{"scan", "add", "QX-0001", path, "--anode", "Xx"}, exitInvalid, "radiation"},
		{[]string{"scan", "add", "QX-0001", path, "--anode", "Cu", "--wavelength", "1.54"}, exitInvalid, "not both"},
		{[]string{"scan", "add", "QX-0001"}, exitInvalid, "SAMPLE FILE"},
		{[]string{"scan", "show", "7"}, exitNotFound, "no scan 7"},
		{[]string{"scan", "show", "seven"}, exitInvalid, "not a scan number"},
		{[]string{"scan", "list", "QX-0404"}, exitNotFound, "QX-0404"},
		{[]string{"scan", "reindex", "7", "--reason", "why"}, exitNotFound, "no scan 7"},
	}
	for _, c := range cases {
		_, errOut, code := nb.run("", c.args...)
		if code != c.code || !strings.Contains(errOut, c.want) {
			t.Errorf("meltbook %s: exit %d, %q; want exit %d naming %q", strings.Join(c.args, " "), code, errOut, c.code, c.want)
		}
	}
	if nb.export() != before {
		t.Error("a failed scan command changed the notebook")
	}
}

// BenchmarkScanAdd runs `meltbook scan add SAMPLE FILE` end to end as a
// person does: open the notebook, load the kept indexing calibration, read
// and analyse a 3501-point fcc Al scan, store it with its proposal, save
// the calibration, close. The calibration was kept by an earlier run, as
// it is after the first import; each iteration adds another file.
func BenchmarkScanAdd(b *testing.B) {
	dir := b.TempDir()
	nbPath := filepath.Join(dir, "notebook.db")
	run := func(args ...string) {
		var out, errOut bytes.Buffer
		if code := Run(context.Background(), append([]string{"--notebook", nbPath, "--as", "bench"}, args...), strings.NewReader(""), &out, &errOut); code != 0 {
			b.Fatalf("meltbook %s: exit %d: %s", strings.Join(args, " "), code, errOut.String())
		}
	}
	run("init")
	run("log", "--code", "QX-0001", "--composition", "Al99Cu1", "--mass", "5g")
	_, ds := fccAluminiumSpacings()
	files := make([]string, b.N+1)
	for i := range files {
		files[i] = syntheticScan(b, fmt.Sprintf("s%d.xy", i), ds, []float64{3000, 1400, 700, 750, 220}, 20, 90, 0.02, uint64(i+1))
	}
	run("scan", "add", "QX-0001", files[0])
	b.ResetTimer()
	for i := 1; i <= b.N; i++ {
		run("scan", "add", "QX-0001", files[i])
	}
}

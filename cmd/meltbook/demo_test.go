package main

import (
	"bytes"
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"meltbook"
	"meltbook/store"
)

// demoClock is the fixed clock of the demo tests.
var demoClock = time.Date(2026, 11, 2, 9, 0, 0, 0, time.UTC)

// runDemoCLI runs meltbook in-process with a fixed clock.
func runDemoCLI(t testing.TB, args ...string) (string, string, int) {
	t.Helper()
	var out, errOut bytes.Buffer
	a := &app{stdin: strings.NewReader(""), stdout: &out, stderr: &errOut, now: func() time.Time { return demoClock }}
	root := newRootCommand(a)
	root.SetArgs(args)
	root.SetOut(&out)
	root.SetErr(&errOut)
	err := root.ExecuteContext(context.Background())
	if err == nil {
		return out.String(), errOut.String(), exitOK
	}
	errOut.WriteString("meltbook: " + err.Error() + "\n")
	code := map[meltbook.ErrorKind]int{meltbook.Invalid: exitInvalid, meltbook.NotFound: exitNotFound, meltbook.Conflict: exitConflict}[meltbook.KindOf(err)]
	if code == 0 {
		code = exitInternal
	}
	return out.String(), errOut.String(), code
}

func demoExport(t *testing.T, path string) []byte {
	t.Helper()
	st, err := store.Open(context.Background(), path, (&app{now: time.Now}).storeOptions())
	if err != nil {
		t.Fatal(err)
	}
	defer st.Close()
	var b bytes.Buffer
	if err := st.Export(context.Background(), &b); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

func TestDemoSummaryAndSuggestions(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "demo.db")
	out, errOut, code := runDemoCLI(t, "--notebook", path, "demo", "--no-serve")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	golden(t, "demo-seed-1.txt", strings.ReplaceAll(out, dir, "DIR"))

	st, err := store.Open(context.Background(), path, (&app{now: time.Now}).storeOptions())
	if err != nil {
		t.Fatal(err)
	}
	defer st.Close()
	_, total, err := st.FindMelts(context.Background(), meltbook.MeltFilter{})
	if err != nil {
		t.Fatal(err)
	}
	if total < 120 {
		t.Errorf("demo notebook holds %d melts, want at least 120", total)
	}
	if !strings.Contains(out, "WHAT TO TRY NEXT") {
		t.Error("no suggestions printed")
	}
	for _, system := range []string{"Al-Cu-Fe", "Al-Pd-Mn", "Zn-Mg-Y"} {
		i := strings.Index(out, "\n"+system+": ")
		if i < 0 {
			t.Errorf("no suggestions for %s", system)
			continue
		}
		block := out[i:]
		for _, n := range []string{"  best bet 1. ", "  best bet 2. ", "  to explore: "} {
			if !strings.Contains(block, n) {
				t.Errorf("%s: suggestion %q missing", system, strings.TrimSpace(n))
			}
		}
		if j := strings.Index(block, "  best bet 1. "); j < 0 || !strings.Contains(block[:j], "e/a kept within") {
			t.Errorf("%s: suggestions not held to the family's e/a window", system)
		}
	}
	if !strings.Contains(out, "These notes are reminders, not a safety procedure") {
		t.Error("no cautions ending with the deferral to local rules")
	}
}

func TestDemoIsDeterministic(t *testing.T) {
	dir := t.TempDir()
	a, b, c := filepath.Join(dir, "a.db"), filepath.Join(dir, "b.db"), filepath.Join(dir, "c.db")
	outA, errOut, code := runDemoCLI(t, "--notebook", a, "demo", "--no-serve", "--seed", "7")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	outB, errOut, code := runDemoCLI(t, "--notebook", b, "demo", "--no-serve", "--seed", "7")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	if _, errOut, code := runDemoCLI(t, "--notebook", c, "demo", "--no-serve", "--seed", "8"); code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	if !bytes.Equal(demoExport(t, a), demoExport(t, b)) {
		t.Error("the same seed gave different notebooks")
	}
	if strings.ReplaceAll(outA, a, "X") != strings.ReplaceAll(outB, b, "X") {
		t.Error("the same seed gave different summaries")
	}
	if bytes.Equal(demoExport(t, a), demoExport(t, c)) {
		t.Error("seeds 7 and 8 gave the same notebook")
	}
}

func TestDemoKeepsANamedFile(t *testing.T) {
	path := filepath.Join(t.TempDir(), "mine.db")
	if err := os.WriteFile(path, []byte("precious"), 0o644); err != nil {
		t.Fatal(err)
	}
	_, errOut, code := runDemoCLI(t, "--notebook", path, "demo", "--no-serve")
	if code != exitConflict || !strings.Contains(errOut, "--replace") {
		t.Errorf("exit %d, stderr %q; want a refusal naming --replace", code, errOut)
	}
	if got, _ := os.ReadFile(path); string(got) != "precious" {
		t.Error("the demo overwrote a file it was not asked to replace")
	}
	if _, errOut, code := runDemoCLI(t, "--notebook", path, "demo", "--no-serve", "--replace"); code != 0 {
		t.Fatalf("--replace: exit %d: %s", code, errOut)
	}
	if len(demoExport(t, path)) == 0 {
		t.Error("--replace left no notebook")
	}
}

// TestDemoRunsAgainAndAgain runs the README's one command twice (without
// serving, which TestDemoServes tries): the default demo file is rebuilt
// each time, and $MELTBOOK_NOTEBOOK is not touched.
func TestDemoRunsAgainAndAgain(t *testing.T) {
	cache := t.TempDir()
	t.Setenv("XDG_CACHE_HOME", cache)
	t.Setenv("HOME", cache)
	own := filepath.Join(t.TempDir(), "own.db")
	t.Setenv(notebookEnv, own)
	var first []byte
	for i := 0; i < 2; i++ {
		out, errOut, code := runDemoCLI(t, "demo", "--no-serve")
		if code != 0 {
			t.Fatalf("run %d: exit %d: %s", i+1, code, errOut)
		}
		path := filepath.Join(cache, "meltbook", demoFileName)
		if !strings.Contains(out, path) {
			t.Errorf("run %d does not name %s", i+1, path)
		}
		exp := demoExport(t, path)
		if i == 0 {
			first = exp
		} else if !bytes.Equal(first, exp) {
			t.Error("the rebuilt demo differs from the first")
		}
	}
	if _, err := os.Stat(own); !os.IsNotExist(err) {
		t.Errorf("the demo touched $%s: %v", notebookEnv, err)
	}
	entries, err := os.ReadDir(filepath.Join(cache, "meltbook"))
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range entries {
		if strings.Contains(e.Name(), ".building-") {
			t.Errorf("left behind %s", e.Name())
		}
	}
}

// BenchmarkDemo builds the demonstration notebook: generating it, writing
// it to a new SQLite file and reading it back into systems.
func BenchmarkDemo(b *testing.B) {
	dir := b.TempDir()
	a := &app{stdout: &bytes.Buffer{}, stderr: &bytes.Buffer{}, now: func() time.Time { return demoClock }, notebookFlag: filepath.Join(dir, "demo.db")}
	for b.Loop() {
		d, err := a.buildDemo(context.Background(), demoFlags{seed: demoDefaultSeed, replace: true})
		if err != nil {
			b.Fatal(err)
		}
		d.store.Close()
	}
}

// BenchmarkDemoNext ranks the next compositions of every demo system.
func BenchmarkDemoNext(b *testing.B) {
	dir := b.TempDir()
	a := &app{now: func() time.Time { return demoClock }, notebookFlag: filepath.Join(dir, "demo.db")}
	d, err := a.buildDemo(context.Background(), demoFlags{seed: demoDefaultSeed, replace: true})
	if err != nil {
		b.Fatal(err)
	}
	defer d.store.Close()
	for b.Loop() {
		if err := writeDemoNext(&bytes.Buffer{}, d); err != nil {
			b.Fatal(err)
		}
	}
}

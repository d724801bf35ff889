package main

import (
	"bytes"
	"context"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/spf13/cobra"
)

// Test hooks: a command built while testClock is set reads that clock, and
// testInteractive makes it treat standard input as a terminal. They are set
// through a hidden command builder that exists only in the test binary.
var (
	testClock       func() time.Time
	testInteractive bool
)

func init() {
	// Times print in the local zone; tests print them in UTC.
	time.Local = time.UTC
	addCommand(func(a *app) *cobra.Command {
		if testClock != nil {
			a.now = testClock
		}
		if testInteractive {
			a.interactive = true
		}
		return &cobra.Command{Use: "test-hooks", Hidden: true, RunE: func(*cobra.Command, []string) error { return nil }}
	})
}

// testNotebook is a fresh notebook in a temporary folder with a clock the
// test sets.
type testNotebook struct {
	tb   testing.TB
	path string
	now  time.Time
}

// newNotebook creates an empty notebook whose clock reads
// 2024-05-02 09:30 UTC until the test moves it.
func newNotebook(tb testing.TB) *testNotebook {
	tb.Helper()
	nb := &testNotebook{tb: tb, path: filepath.Join(tb.TempDir(), "notebook.db"), now: time.Date(2024, 5, 2, 9, 30, 0, 0, time.UTC)}
	testClock = func() time.Time { return nb.now }
	tb.Cleanup(func() { testClock, testInteractive = nil, false })
	nb.ok("init")
	return nb
}

// run runs meltbook on the notebook as operator "adaeze" unless args say
// otherwise.
func (nb *testNotebook) run(stdin string, args ...string) (stdout, stderr string, code int) {
	nb.tb.Helper()
	var out, errOut bytes.Buffer
	all := append([]string{"--notebook", nb.path, "--as", "adaeze"}, args...)
	code = Run(context.Background(), all, strings.NewReader(stdin), &out, &errOut)
	return out.String(), errOut.String(), code
}

// ok runs a command that must succeed and returns its output.
func (nb *testNotebook) ok(args ...string) string {
	nb.tb.Helper()
	out, errOut, code := nb.run("", args...)
	if code != 0 {
		nb.tb.Fatalf("meltbook %s: exit %d: %s", strings.Join(args, " "), code, errOut)
	}
	return out
}

// export returns the whole notebook as exported.
func (nb *testNotebook) export() string {
	nb.tb.Helper()
	return nb.ok("export")
}

// later moves the clock on.
func (nb *testNotebook) later(d time.Duration) { nb.now = nb.now.Add(d) }

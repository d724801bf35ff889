package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"time"

	"github.com/spf13/cobra"
	"golang.org/x/term"

	"meltbook"
)

// Exit codes, one per error kind.
const (
	exitOK       = 0
	exitInternal = 1
	exitInvalid  = 2
	exitNotFound = 3
	exitConflict = 4
)

// notebookEnv names the environment variable that chooses the notebook when
// --notebook is not given.
const notebookEnv = "MELTBOOK_NOTEBOOK"

// app is what every command receives: the streams, the global options and
// the clock. Commands write only to app.stdout and app.stderr.
type app struct {
	stdin          io.Reader
	stdout, stderr io.Writer
	notebookFlag   string
	who            string
	now            func() time.Time
	// interactive reports whether stdin is a terminal a person types at.
	interactive bool
}

// commandBuilders are the subcommands; each file adds its own in init.
var commandBuilders []func(*app) *cobra.Command

func addCommand(b func(*app) *cobra.Command) { commandBuilders = append(commandBuilders, b) }

// Run runs meltbook with args (without the program name) and returns the
// process exit code. It never panics on user input.
func Run(ctx context.Context, args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	a := &app{stdin: stdin, stdout: stdout, stderr: stderr, now: time.Now}
	if f, ok := stdin.(*os.File); ok {
		a.interactive = term.IsTerminal(int(f.Fd()))
	}
	root := newRootCommand(a)
	root.SetArgs(args)
	root.SetIn(stdin)
	root.SetOut(stdout)
	root.SetErr(stderr)
	err := root.ExecuteContext(ctx)
	if err == nil {
		return exitOK
	}
	fmt.Fprintln(stderr, "meltbook:", err)
	var flagErr *usageError
	if errors.As(err, &flagErr) {
		return exitInvalid
	}
	switch meltbook.KindOf(err) {
	case meltbook.Invalid:
		return exitInvalid
	case meltbook.NotFound:
		return exitNotFound
	case meltbook.Conflict:
		return exitConflict
	}
	return exitInternal
}

// usageError marks errors cobra reports about the command line itself.
type usageError struct{ err error }

func (e *usageError) Error() string { return e.err.Error() }
func (e *usageError) Unwrap() error { return e.err }

func newRootCommand(a *app) *cobra.Command {
	root := &cobra.Command{
		Use:   "meltbook",
		Short: "Notebook and analysis bench for quasicrystal and approximant alloys",
		Long: `meltbook records every melt-spinning run (composition, weigh-out, process,
measured composition, heat treatments, diffraction scans, phase outcomes,
notes) in a SQLite notebook, and does the analysis: composition arithmetic,
Hume-Rothery descriptors, peak finding and indexing of icosahedral, cubic
and approximant patterns.`,
		SilenceUsage:  true,
		SilenceErrors: true,
	}
	root.PersistentFlags().StringVar(&a.notebookFlag, "notebook", "",
		"notebook file (default: $"+notebookEnv+", else the per-user data folder)")
	root.PersistentFlags().StringVar(&a.who, "as", "",
		"name recorded as operator and in history (default: $USER)")
	root.SetFlagErrorFunc(func(_ *cobra.Command, err error) error { return &usageError{err} })
	for _, b := range commandBuilders {
		root.AddCommand(b(a))
	}
	return root
}

// notebookPath resolves which notebook a command uses: the --notebook flag,
// then $MELTBOOK_NOTEBOOK, then meltbook/notebook.db under the user's data
// folder ($XDG_DATA_HOME, else ~/.local/share).
func (a *app) notebookPath() (string, error) {
	if a.notebookFlag != "" {
		return a.notebookFlag, nil
	}
	if p := os.Getenv(notebookEnv); p != "" {
		return p, nil
	}
	dir := os.Getenv("XDG_DATA_HOME")
	if dir == "" {
		home, err := os.UserHomeDir()
		if err != nil {
			return "", meltbook.Errorf(meltbook.Invalid, "--notebook", "no home folder to hold the default notebook; give --notebook or $%s", notebookEnv)
		}
		dir = filepath.Join(home, ".local", "share")
	}
	return filepath.Join(dir, "meltbook", "notebook.db"), nil
}

// operator returns the name to record for a person's action.
func (a *app) operator() string {
	if a.who != "" {
		return a.who
	}
	for _, v := range []string{"MELTBOOK_USER", "USER", "USERNAME"} {
		if s := os.Getenv(v); s != "" {
			return s
		}
	}
	return "unknown"
}

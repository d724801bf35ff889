package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"github.com/spf13/cobra"

	"meltbook"
	"meltbook/store"
)

func init() {
	addCommand(newExportCommand)
	addCommand(newRestoreCommand)
}

func newExportCommand(a *app) *cobra.Command {
	return &cobra.Command{
		Use:   "export [FILE]",
		Short: "Write the whole notebook as one JSON document",
		Long: `Writes every melt, sample, step, measurement, observation, outcome, note
and the whole history as one JSON document, to FILE (which must not exist
yet) or to standard output. 'meltbook restore' reads it back into an empty
notebook with nothing lost.`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) > 1 {
				return &usageError{fmt.Errorf("export takes at most one FILE, got %d arguments", len(args))}
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			st, err := a.openNotebook(cmd.Context())
			if err != nil {
				return err
			}
			defer st.Close()
			if len(args) == 0 {
				return st.Export(cmd.Context(), a.stdout)
			}
			return writeNewFile(args[0], func(w io.Writer) error { return st.Export(cmd.Context(), w) })
		},
	}
}

// writeNewFile writes a file that must not exist yet, through a temporary
// file in the same folder, so that a failed write leaves nothing behind.
func writeNewFile(path string, write func(io.Writer) error) error {
	if _, err := os.Stat(path); err == nil {
		return meltbook.Errorf(meltbook.Conflict, path, "already exists; choose another name")
	}
	tmp, err := os.CreateTemp(filepath.Dir(path), ".meltbook-export-*")
	if err != nil {
		return meltbook.Errorf(meltbook.Invalid, path, "cannot write here: %v", err)
	}
	defer os.Remove(tmp.Name())
	if err := write(tmp); err != nil {
		tmp.Close()
		return err
	}
	if err := tmp.Close(); err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	if err := os.Link(tmp.Name(), path); err != nil {
		if _, statErr := os.Stat(path); statErr == nil {
			return meltbook.Errorf(meltbook.Conflict, path, "already exists; choose another name")
		}
		return fmt.Errorf("write %s: %w", path, err)
	}
	return nil
}

func newRestoreCommand(a *app) *cobra.Command {
	return &cobra.Command{
		Use:   "restore FILE",
		Short: "Read an exported notebook into an empty notebook",
		Long: `Reads a document written by 'meltbook export' (FILE, or - for standard
input) into the notebook chosen by --notebook, $MELTBOOK_NOTEBOOK or the
default. The notebook must be empty; when there is no notebook file yet, one
is created. Everything is checked before anything is written: a bad document
leaves the notebook as it was (and a notebook created for it is removed).`,
		Args: exactArgs(1, "FILE"),
		RunE: func(cmd *cobra.Command, args []string) error {
			var in io.Reader = a.stdin
			if args[0] != "-" {
				fh, err := os.Open(args[0])
				if err != nil {
					return meltbook.Errorf(meltbook.Invalid, args[0], "cannot open: %v", err)
				}
				defer fh.Close()
				in = fh
			}
			path, err := a.notebookPath()
			if err != nil {
				return err
			}
			created := false
			st, err := store.Open(cmd.Context(), path, a.storeOptions())
			if meltbook.KindOf(err) == meltbook.NotFound {
				if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
					return meltbook.Errorf(meltbook.Invalid, "--notebook", "cannot create the folder for %s: %v", path, err)
				}
				st, err = store.Init(cmd.Context(), path, a.storeOptions())
				created = err == nil
			}
			if err != nil {
				return err
			}
			err = st.Import(cmd.Context(), a.operator(), in)
			closeErr := st.Close()
			if err != nil {
				if created {
					removeNotebook(path)
				}
				var e *meltbook.Error
				if errors.As(err, &e) && e.Kind == meltbook.Invalid && args[0] != "-" {
					return &meltbook.Error{Kind: e.Kind, Field: args[0] + ": " + e.Field, Message: e.Message}
				}
				return err
			}
			if closeErr != nil {
				return closeErr
			}
			fmt.Fprintf(a.stdout, "restored %s into %s\n", args[0], path)
			return nil
		},
	}
}

// removeNotebook deletes a notebook file created moments ago, with the
// files SQLite keeps beside it.
func removeNotebook(path string) {
	for _, p := range []string{path, path + "-wal", path + "-shm"} {
		os.Remove(p)
	}
}

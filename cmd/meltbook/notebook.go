package main

import (
	"context"
	"fmt"
	"os"
	"path/filepath"

	"github.com/spf13/cobra"

	"meltbook"
	"meltbook/analysis/element"
	"meltbook/store"
)

func init() { addCommand(newInitCommand) }

// storeOptions gives the store the app's clock and the built-in valence
// schemes whose e/a it keeps indexed.
func (a *app) storeOptions() store.Options {
	valences := map[string]map[string]float64{}
	for _, name := range element.SchemeNames() {
		if s, ok := element.LookupScheme(name); ok {
			valences[name] = s.Valence
		}
	}
	return store.Options{Now: a.now, Valences: valences}
}

// openNotebook opens the notebook the global options name. The caller
// closes it.
func (a *app) openNotebook(ctx context.Context) (*store.Store, error) {
	path, err := a.notebookPath()
	if err != nil {
		return nil, err
	}
	st, err := store.Open(ctx, path, a.storeOptions())
	if err != nil {
		if meltbook.KindOf(err) == meltbook.NotFound {
			return nil, meltbook.Errorf(meltbook.NotFound, "notebook", "no notebook at %s; create one with `meltbook init` or choose one with --notebook or $%s", path, notebookEnv)
		}
		return nil, err
	}
	return st, nil
}

func newInitCommand(a *app) *cobra.Command {
	return &cobra.Command{
		Use:   "init",
		Short: "Create a new, empty notebook",
		Long: `Creates a new notebook at --notebook, $MELTBOOK_NOTEBOOK, or the per-user
default (meltbook/notebook.db under $XDG_DATA_HOME or ~/.local/share).
An existing file is never overwritten.`,
		Args: exactArgs(0, "no arguments"),
		RunE: func(cmd *cobra.Command, _ []string) error {
			path, err := a.notebookPath()
			if err != nil {
				return err
			}
			if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
				return meltbook.Errorf(meltbook.Invalid, "--notebook", "cannot create the folder for %s: %v", path, err)
			}
			st, err := store.Init(cmd.Context(), path, a.storeOptions())
			if err != nil {
				return err
			}
			if err := st.Close(); err != nil {
				return err
			}
			fmt.Fprintf(a.stdout, "created notebook %s\n", path)
			return nil
		},
	}
}

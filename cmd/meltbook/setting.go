package main

import (
	"fmt"
	"path/filepath"
	"sort"

	"github.com/spf13/cobra"

	"meltbook/store"
)

func init() { addCommand(newSettingCommand) }

func newSettingCommand(a *app) *cobra.Command {
	var clear bool
	cmd := &cobra.Command{
		Use:   "setting [NAME [VALUE]]",
		Short: "Show or change the notebook's settings",
		Long: `With no argument, lists the notebook's settings and their values. With NAME,
prints that setting's value; with NAME and VALUE, sets it (--clear removes it).
Every change is kept in the notebook's history with who made it.

Settings:
  phase-library   folder of CIF files whose phases indexing tries beside the
                  built-in phase library (see 'meltbook phases')`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) > 2 || (clear && len(args) != 1) {
				return exactArgs(1, "NAME with --clear, else at most NAME and VALUE")(cmd, args[:min(len(args), 3)])
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			ctx := cmd.Context()
			st, err := a.openNotebook(ctx)
			if err != nil {
				return err
			}
			defer st.Close()
			switch {
			case len(args) == 0:
				names := store.SettingNames()
				keys := make([]string, 0, len(names))
				for k := range names {
					keys = append(keys, k)
				}
				sort.Strings(keys)
				for _, k := range keys {
					v, err := st.Setting(ctx, k)
					if err != nil {
						return err
					}
					if v == "" {
						v = "(not set)"
					}
					fmt.Fprintf(a.stdout, "%s = %s\n  %s\n", k, v, names[k])
				}
				return nil
			case len(args) == 1 && !clear:
				v, err := st.Setting(ctx, args[0])
				if err != nil {
					return err
				}
				fmt.Fprintln(a.stdout, v)
				return nil
			}
			value := ""
			if !clear {
				value = args[1]
			}
			if args[0] == store.SettingPhaseLibrary && value != "" {
				// A folder is kept as an absolute path, so that the setting
				// means the same from wherever meltbook runs.
				abs, err := filepath.Abs(value)
				if err != nil {
					return invalidFlag("VALUE", err.Error())
				}
				if _, err := a.phaseLibraryFrom(abs); err != nil {
					return err
				}
				value = abs
			}
			if err := st.SetSetting(ctx, a.operator(), args[0], value); err != nil {
				return err
			}
			if clear {
				fmt.Fprintf(a.stdout, "%s cleared\n", args[0])
			} else {
				fmt.Fprintf(a.stdout, "%s = %s\n", args[0], value)
			}
			return nil
		},
	}
	cmd.Flags().BoolVar(&clear, "clear", false, "remove the setting")
	return cmd
}

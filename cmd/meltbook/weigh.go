package main

import (
	"github.com/spf13/cobra"

	"meltbook"
	"meltbook/analysis/quantity"
	"meltbook/analysis/weighout"
)

func init() { addCommand(newWeighCommand) }

func newWeighCommand(a *app) *cobra.Command {
	var (
		mass          string
		purity, loss  []string
		asJSON, asCSV bool
		noDefaultLoss bool
		weight        bool
	)
	cmd := &cobra.Command{
		Use:   "weigh COMPOSITION --mass 10g",
		Short: "Weigh-out sheet for a button, with purity and evaporation allowances",
		Long: `Prints the mass of each element to weigh for a button of the given mass,
allowing for the purity of each piece (--purity El=99.99) and for evaporation
of volatile elements (--loss El=2%). Mg, Zn, Mn, Li and Ca get rule-of-thumb
loss allowances unless --no-default-loss is given. The sheet ends with the
bench cautions for the elements involved.`,
		Args: exactArgs(1, "COMPOSITION"),
		RunE: func(cmd *cobra.Command, args []string) error {
			if asJSON && asCSV {
				return meltbook.Errorf(meltbook.Invalid, "--json", "choose --json or --csv, not both")
			}
			parsed, err := parseComposition("composition", args[0], weight)
			if err != nil {
				return err
			}
			if mass == "" {
				return meltbook.Errorf(meltbook.Invalid, "--mass", "give the button mass, e.g. --mass 10g")
			}
			m, err := parseQuantity("--mass", mass, quantity.Mass)
			if err != nil {
				return err
			}
			opt := weighout.Options{TotalMassGrams: m.SI * 1000, NoDefaultLoss: noDefaultLoss}
			if opt.Purity, err = parseElementPercents("--purity", purity); err != nil {
				return err
			}
			if opt.Loss, err = parseElementPercents("--loss", loss); err != nil {
				return err
			}
			sheet, err := weighout.Plan(parsed.Atomic, opt)
			if err != nil {
				return invalid(err)
			}
			switch {
			case asJSON:
				return sheet.WriteJSON(a.stdout)
			case asCSV:
				return sheet.WriteCSV(a.stdout)
			}
			a.warn(parsed.Warnings)
			return sheet.WriteText(a.stdout)
		},
	}
	f := cmd.Flags()
	f.StringVar(&mass, "mass", "", "button mass with unit: 10g, 500mg")
	f.StringArrayVar(&purity, "purity", nil, "purity of an element's pieces, El=PERCENT (repeat per element; default 100)")
	f.StringArrayVar(&loss, "loss", nil, "evaporation allowance, El=PERCENT (repeat per element)")
	f.BoolVar(&noDefaultLoss, "no-default-loss", false, "no rule-of-thumb loss allowances for Mg, Zn, Mn, Li, Ca")
	f.BoolVar(&asJSON, "json", false, "print JSON")
	f.BoolVar(&asCSV, "csv", false, "print CSV")
	f.BoolVar(&weight, "wt", false, "read amounts as weight percent when the composition has no unit suffix")
	return cmd
}

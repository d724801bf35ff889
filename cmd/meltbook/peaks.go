package main

import (
	"fmt"
	"math"
	"text/tabwriter"

	"github.com/spf13/cobra"
)

func init() { addCommand(newPeaksCommand) }

func addRadiationFlags(cmd *cobra.Command, r *radiationFlags) {
	f := cmd.Flags()
	f.StringVar(&r.anode, "anode", "", "anode and Kα2 state: Cu, Co, Fe, Cr, Mo, optionally :doublet, :stripped or :mono (default: what the file states, else Cu)")
	f.StringVar(&r.wavelength, "wavelength", "", "wavelength in Å (monochromated), or Kα1/Kα2 as 1.5406/1.5444")
	f.StringVar(&r.standard, "standard", "", "internal standard mixed in, for the zero shift: Si (SRM 640f) or LaB6 (SRM 660c)")
}

func newPeaksCommand(a *app) *cobra.Command {
	var (
		r      radiationFlags
		asJSON bool
	)
	cmd := &cobra.Command{
		Use:   "peaks FILE",
		Short: "Find and fit the peaks of a powder scan (XY, XYE or powder CIF)",
		Long: `Reads a scan, estimates the background (SNIP), smooths (Savitzky-Golay),
strips Kα2 for the search (Rachinger), keeps peaks significant against counting
statistics and fits each with a pseudo-Voigt profile, printing 2θ, d, height,
area and FWHM with standard uncertainties. Works on a file alone, without a
notebook.`,
		Args: exactArgs(1, "FILE"),
		RunE: func(cmd *cobra.Command, args []string) error {
			s, res, err := a.findPeaks(args[0], r)
			if err != nil {
				return err
			}
			if asJSON {
				return writeJSON(a.stdout, res.Report())
			}
			w := a.stdout
			fmt.Fprintf(w, "%s: %d points, 2θ %.3f-%.3f°, step %.4f°, %s\n", args[0], s.Len(), s.TwoThetaDeg[0], s.TwoThetaDeg[s.Len()-1], res.StepDeg, res.Radiation)
			fmt.Fprintf(w, "%d peaks\n\n", len(res.Peaks))
			tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
			fmt.Fprintln(tw, "2θ (°)\t±\td (Å)\theight\tarea\tFWHM (°)\tη\tstandard\t")
			for _, p := range res.Peaks {
				fmt.Fprintf(tw, "%.4f\t%s\t%.5f\t%.0f\t%.1f\t%.4f\t%.2f\t%s\t\n",
					p.TwoThetaDeg, su(p.TwoThetaSUDeg, 4), p.DAngstrom, p.Height, p.Area, p.FWHMDeg, p.Eta, p.Standard)
			}
			if err := tw.Flush(); err != nil {
				return err
			}
			if z := res.ZeroShift; z != nil {
				fmt.Fprintf(w, "\nzero shift from the internal standard: %+.4f ± %.4f° 2θ\n", z.ZeroDeg, z.ZeroSUDeg)
			}
			for _, n := range res.Notes {
				fmt.Fprintln(w, "note:", n)
			}
			return nil
		},
	}
	addRadiationFlags(cmd, &r)
	cmd.Flags().BoolVar(&asJSON, "json", false, "print JSON")
	return cmd
}

// su formats a standard uncertainty, "-" when there is none.
func su(x float64, decimals int) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return "-"
	}
	return fmt.Sprintf("%.*f", decimals, x)
}

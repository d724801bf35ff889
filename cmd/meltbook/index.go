package main

import (
	"fmt"
	"io"
	"os"
	"path/filepath"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"meltbook"
	"meltbook/analysis/indexing"
	"meltbook/analysis/phaselib"
	"meltbook/analysis/scanfile"
)

func init() { addCommand(newIndexCommand) }

func newIndexCommand(a *app) *cobra.Command {
	var (
		r         radiationFlags
		peakList  bool
		asJSON    bool
		tolerance float64
		dirs      []string
		comp      string
	)
	cmd := &cobra.Command{
		Use:   "index FILE",
		Short: "Index a scan or peak list: icosahedral, approximant, cubic and library phases",
		Long: `Finds the peaks of a scan (or reads a peak list of 2θ and relative intensity
with --peaks) and tries icosahedral P, F and I models, cubic P, I and F lattices
and cubic approximants of order 1/1 and 2/1, and matches the phases of the
phase library (see 'meltbook phases'; with --composition only those whose
elements the alloy holds) by line positions and intensities, each with its
cell free within ±2 % for solid solution. Each phase is reported with its
lattice constant and uncertainty, zero shift, figure of merit and the chance
that random peaks of the same count and range fit as well; phases no better
than chance are not reported. Mixtures are taken one phase at a time, the one
explaining the most intensity first; peaks no phase takes are listed.`,
		Args: exactArgs(1, "FILE"),
		RunE: func(cmd *cobra.Command, args []string) error {
			var (
				list   []indexing.Peak
				lambda float64
			)
			if peakList {
				lines, err := readPeakList(args[0])
				if err != nil {
					return err
				}
				rad, note, err := r.resolve(scanfile.Scan{})
				if err != nil {
					return err
				}
				if note != "" {
					fmt.Fprintln(a.stderr, "note: the peak list states no radiation: Cu Kα1 assumed (give --anode or --wavelength)")
				}
				lambda = rad.Kalpha1Angstrom
				for _, p := range lines {
					list = append(list, indexing.Peak{TwoThetaDeg: p.TwoThetaDeg, Intensity: p.Intensity})
				}
			} else {
				_, res, err := a.findPeaks(args[0], r)
				if err != nil {
					return err
				}
				lambda = res.Radiation.Kalpha1Angstrom
				peaks := res.Peaks
				if res.Corrected != nil {
					peaks = res.Corrected
				}
				for _, p := range peaks {
					if p.Standard != "" {
						continue // the internal standard's own lines
					}
					list = append(list, indexing.Peak{TwoThetaDeg: p.TwoThetaDeg, Intensity: p.Area})
				}
			}
			lib, err := a.phaseLibrary(cmd.Context(), dirs)
			if err != nil {
				return err
			}
			els, err := compositionElements(comp)
			if err != nil {
				return err
			}
			known, err := phaselib.KnownPhases(lib.ForElements(els), lambda)
			if err != nil {
				return invalid(err)
			}
			// The chance calibrations are kept between runs, as scan add
			// keeps them, so that only the first run of a kind of list
			// pays for them.
			a.loadCalibration()
			defer a.saveCalibration()
			result, err := indexing.Index(list, lambda, indexing.Options{ToleranceDeg: tolerance, Library: known})
			if err != nil {
				return err
			}
			if asJSON {
				return writeJSON(a.stdout, result)
			}
			return printIndexing(a.stdout, result)
		},
	}
	addRadiationFlags(cmd, &r)
	f := cmd.Flags()
	f.BoolVar(&peakList, "peaks", false, "FILE is a peak list (2θ and relative intensity), not a scan")
	f.BoolVar(&asJSON, "json", false, "print JSON")
	f.StringSliceVar(&dirs, "library", nil, "folder of CIF files whose phases are tried beside the built-in library (repeatable)")
	f.StringVar(&comp, "composition", "", "try only the library phases whose elements this composition holds, e.g. Al62Cu25.5Fe12.5 (default: every phase)")
	f.Float64Var(&tolerance, "tolerance", 0, "largest |2θobs − 2θcalc| in degrees for a peak to count as indexed (default 0.10)")
	return cmd
}

func readPeakList(path string) ([]scanfile.PeakLine, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, meltbook.Errorf(meltbook.NotFound, path, "cannot open: %v", err)
	}
	defer f.Close()
	lines, err := scanfile.ReadPeakList(filepath.Base(path), f)
	if err != nil {
		return nil, invalid(err)
	}
	return lines, nil
}

func printIndexing(w io.Writer, r indexing.Result) error {
	if len(r.Phases) == 0 {
		fmt.Fprintln(w, "No phase indexes these peaks better than chance.")
	}
	for i, ph := range r.Phases {
		fmt.Fprintf(w, "Phase %d: %s\n", i+1, phaseTitle(ph))
		fmt.Fprintf(w, "  zero shift %+.4f ± %.4f°, rms residual %.4f°, %.0f%% of the intensity\n",
			ph.ZeroShiftDeg, ph.ZeroShiftUncertaintyDeg, ph.RMSResidualDeg, 100*ph.ExplainedIntensity)
		fmt.Fprintf(w, "  figure of merit %.1f, chance of a fit this good from random peaks %.2g (%s)\n",
			ph.FigureOfMerit, ph.Chance, ph.ChanceBasis)
		if t := ph.PhasonTrend; t != nil && t.Flagged {
			fmt.Fprintf(w, "  residuals grow with |G⊥| (slope %.3g ± %.2g): a sign of phason strain\n", t.Slope, t.SlopeUncertainty)
		}
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintln(tw, "  2θ obs\t2θ calc\tΔ\td (Å)\tindex\t")
		for _, p := range ph.Peaks {
			fmt.Fprintf(tw, "  %.3f\t%.3f\t%+.3f\t%.4f\t%s\t\n", p.TwoThetaDeg, p.CalculatedTwoThetaDeg, p.ResidualDeg, p.DSpacingA, peakLabel(p))
		}
		if err := tw.Flush(); err != nil {
			return err
		}
		fmt.Fprintln(w)
	}
	if len(r.Unexplained) > 0 {
		fmt.Fprintf(w, "Unexplained peaks (%d):", len(r.Unexplained))
		for _, p := range r.Unexplained {
			fmt.Fprintf(w, " %.3f°", p.TwoThetaDeg)
		}
		fmt.Fprintln(w)
	}
	return nil
}

func phaseTitle(ph indexing.Phase) string {
	switch ph.Kind {
	case indexing.Icosahedral:
		return fmt.Sprintf("icosahedral %s, quasilattice constant a_R = %.4f ± %.4f Å (a6 = %.4f Å)",
			ph.Lattice, ph.QuasilatticeConstantA, ph.QuasilatticeConstantUncertaintyA, ph.SixDimensionalConstantA)
	case indexing.Approximant:
		return fmt.Sprintf("cubic %s approximant of order %s, a = %.4f ± %.4f Å (ideal %.3f Å for %s)",
			ph.Lattice, ph.Order, ph.AA, ph.AUncertaintyA, ph.IdealAA, ph.ApproximantOf)
	}
	if ph.Kind != indexing.Cubic || ph.Phase != "" {
		return ph.Title()
	}
	return fmt.Sprintf("cubic %s, a = %.4f ± %.4f Å", ph.Lattice, ph.AA, ph.AUncertaintyA)
}

func peakLabel(p indexing.IndexedPeak) string {
	switch {
	case p.Icosahedral != nil:
		l := p.Icosahedral
		return fmt.Sprintf("(%d,%d) %v", l.N, l.M, l.Index)
	case p.HKL != nil:
		return fmt.Sprintf("%d%d%d", p.HKL[0], p.HKL[1], p.HKL[2])
	}
	return ""
}

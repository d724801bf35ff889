package main

import (
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"meltbook"
	"meltbook/analysis/indexing"
	"meltbook/analysis/phaselib"
	"meltbook/analysis/radiation"
	"meltbook/analysis/scanfile"
	"meltbook/analysis/wholepattern"
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
explaining the most intensity first; peaks no phase takes are listed.

On a scan (not a peak list), the cells of the library phases found are then
refined against the whole profile, Le Bail style (line intensities free; cells,
zero shift, Caglioti widths, pseudo-Voigt shape and background refined), and
Rwp is reported beside the expected Rexp.`,
		Args: exactArgs(1, "FILE"),
		RunE: func(cmd *cobra.Command, args []string) error {
			var (
				list   []indexing.Peak
				lambda float64
				scan   *scanfile.Scan
				rad    radiation.Radiation
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
				sc, res, err := a.findPeaks(args[0], r)
				if err != nil {
					return err
				}
				scan, rad = &sc, res.Radiation
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
			var whole *wholePatternCheck
			if scan != nil {
				whole = checkWholePattern(*scan, rad, lib, result)
			}
			if asJSON {
				return writeJSON(a.stdout, struct {
					indexing.Result
					WholePattern *wholePatternCheck `json:"whole_pattern,omitempty"`
				}{result, whole})
			}
			if err := printIndexing(a.stdout, result); err != nil {
				return err
			}
			printWholePattern(a.stdout, whole)
			return nil
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

// wholePatternCheck is the Le Bail refinement of the library phases an
// indexing found, against the whole scan.
type wholePatternCheck struct {
	Rwp          float64            `json:"rwp"`
	Rexp         float64            `json:"rexp"`
	ZeroShiftDeg float64            `json:"zero_shift_deg"`
	Cells        []wholePatternCell `json:"cells"`
	Warnings     []string           `json:"warnings,omitempty"`
	Error        string             `json:"error,omitempty"`
}

type wholePatternCell struct {
	Phase string     `json:"phase"`
	Cell  [6]float64 `json:"cell"` // a, b, c (Å), α, β, γ (degrees)
	SU    [6]float64 `json:"su"`
	Free  []string   `json:"free"`
}

// checkWholePattern refines the library phases of the result against the
// scan; nil when the result holds none. A refinement that fails is
// reported in the check, not as the command's error: the indexing stands.
func checkWholePattern(sc scanfile.Scan, rad radiation.Radiation, lib *phaselib.Library, res indexing.Result) *wholePatternCheck {
	if len(sc.TwoThetaDeg) == 0 {
		return nil
	}
	last := sc.TwoThetaDeg[len(sc.TwoThetaDeg)-1]
	dMin := rad.Kalpha1Angstrom / (2 * math.Sin(math.Min(last+2, 179)*math.Pi/360))
	var phases []wholepattern.Phase
	for _, ph := range res.Phases {
		if ph.Phase == "" {
			continue
		}
		p, err := lib.Find(ph.Phase)
		if err != nil {
			continue
		}
		wp, err := p.WholePattern(ph.CellScale, dMin)
		if err != nil {
			return &wholePatternCheck{Error: err.Error()}
		}
		phases = append(phases, wp)
	}
	if len(phases) == 0 {
		return nil
	}
	r, err := wholepattern.Refine(sc.TwoThetaDeg, sc.Counts, rad, phases, wholepattern.Options{})
	if err != nil {
		return &wholePatternCheck{Error: err.Error()}
	}
	out := &wholePatternCheck{Rwp: r.Rwp, Rexp: r.Rexp, ZeroShiftDeg: r.ZeroShiftDeg, Warnings: r.Warnings}
	for _, c := range r.Cells {
		out.Cells = append(out.Cells, wholePatternCell{Phase: c.Name,
			Cell: [6]float64{c.Cell.A, c.Cell.B, c.Cell.C, c.Cell.Alpha, c.Cell.Beta, c.Cell.Gamma},
			SU:   [6]float64{c.SU.A, c.SU.B, c.SU.C, c.SU.Alpha, c.SU.Beta, c.SU.Gamma}, Free: c.Free})
	}
	return out
}

func printWholePattern(w io.Writer, c *wholePatternCheck) {
	if c == nil {
		return
	}
	if c.Error != "" {
		fmt.Fprintf(w, "Whole-pattern check not run: %s\n", c.Error)
		return
	}
	fmt.Fprintf(w, "Whole-pattern check (Le Bail): Rwp %.2f %%, expected %.2f %%, zero shift %+.4f°\n", 100*c.Rwp, 100*c.Rexp, c.ZeroShiftDeg)
	names := []string{"a", "b", "c", "alpha", "beta", "gamma"}
	for _, cell := range c.Cells {
		var parts []string
		for _, f := range cell.Free {
			for i, n := range names {
				if n == f {
					unit := " Å"
					if i >= 3 {
						unit = "°"
					}
					parts = append(parts, f+" = "+meltbook.WithUncertainty(cell.Cell[i], cell.SU[i])+unit)
				}
			}
		}
		fmt.Fprintf(w, "  %s: %s\n", cell.Phase, strings.Join(parts, ", "))
	}
	for _, m := range c.Warnings {
		fmt.Fprintf(w, "  note: %s\n", m)
	}
}

package main

import (
	"context"
	"fmt"
	"io"
	"math"
	"os"
	"sort"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"meltbook"
	"meltbook/analysis/composition"
	"meltbook/analysis/crystal"
	"meltbook/analysis/phaselib"
	"meltbook/analysis/powder"
	"meltbook/analysis/scanfile"
	"meltbook/store"
	"meltbook/store/intake"
)

func init() { addCommand(newPhasesCommand) }

// phaseLibrary loads the built-in library, the folder the notebook's
// phase-library setting names (when the notebook exists) and dirs.
func (a *app) phaseLibrary(ctx context.Context, dirs []string) (*phaselib.Library, error) {
	notebookDir := ""
	if path, err := a.notebookPath(); err == nil {
		if _, err := os.Stat(path); err == nil {
			st, err := store.Open(ctx, path, a.storeOptions())
			if err != nil {
				return nil, err
			}
			notebookDir, err = st.Setting(ctx, store.SettingPhaseLibrary)
			st.Close()
			if err != nil {
				return nil, err
			}
		}
	}
	return intake.LoadLibrary(notebookDir, dirs...)
}

// phaseLibraryFrom checks that a folder holds a library the program reads
// (every CIF file in it valid), before a setting names it.
func (a *app) phaseLibraryFrom(dir string) (*phaselib.Library, error) {
	lib, err := phaselib.Load(dir)
	if err != nil {
		return nil, invalid(err)
	}
	return lib, nil
}

// compositionElements reads --composition into its element symbols.
func compositionElements(text string) ([]string, error) {
	if strings.TrimSpace(text) == "" {
		return nil, nil
	}
	p, err := composition.Parse(text)
	if err != nil {
		return nil, invalidFlag("--composition", err.Error())
	}
	var els []string
	for _, part := range p.Atomic {
		els = append(els, part.Element)
	}
	return els, nil
}

func newPhasesCommand(a *app) *cobra.Command {
	var (
		dirs   []string
		comp   string
		asJSON bool
	)
	cmd := &cobra.Command{
		Use:   "phases",
		Short: "List the crystalline phases of known structure that indexing tries",
		Long: `Lists the phase library: the built-in phases (one CIF file each, with its
published source), the CIF files in the folder the notebook's phase-library
setting names (see 'meltbook setting'), and those in --library folders. A
user's file that names a built-in phase replaces it.

With --composition, only the phases whose elements the composition holds are
listed: those are the ones indexing a scan of that alloy tries.`,
		Args: exactArgs(0, "no arguments"),
		RunE: func(cmd *cobra.Command, _ []string) error {
			lib, err := a.phaseLibrary(cmd.Context(), dirs)
			if err != nil {
				return err
			}
			els, err := compositionElements(comp)
			if err != nil {
				return err
			}
			phases := lib.ForElements(els)
			if asJSON {
				return writeJSON(a.stdout, phaseSummaries(phases))
			}
			return printPhases(a.stdout, phases, els == nil)
		},
	}
	f := cmd.Flags()
	f.StringSliceVar(&dirs, "library", nil, "folder of CIF files added to the library (repeatable)")
	f.StringVar(&comp, "composition", "", "list only the phases whose elements this composition holds, e.g. Al62Cu25.5Fe12.5")
	f.BoolVar(&asJSON, "json", false, "print JSON")
	cmd.AddCommand(newPhasesShowCommand(a))
	return cmd
}

// phaseSummary is one phase as `phases --json` prints it.
type phaseSummary struct {
	Name       string     `json:"name"`
	Key        string     `json:"key"`
	Formula    string     `json:"formula"`
	System     string     `json:"system"`
	SpaceGroup string     `json:"space_group"`
	Number     int        `json:"space_group_number"`
	Cell       [6]float64 `json:"cell"` // a, b, c (Å), α, β, γ (degrees)
	Reference  string     `json:"reference"`
	Provenance string     `json:"provenance"`
	Origin     string     `json:"origin"`
}

func phaseSummaries(phases []phaselib.Phase) []phaseSummary {
	out := make([]phaseSummary, 0, len(phases))
	for _, p := range phases {
		c := p.Structure.Cell
		out = append(out, phaseSummary{
			Name: p.Name, Key: p.Key, Formula: p.Structure.Formula, System: string(phaselib.Kind(p.Structure)),
			SpaceGroup: phaselib.SpaceGroupSymbol(p.Structure), Number: p.Structure.Group.Number,
			Cell:      [6]float64{c.A, c.B, c.C, c.Alpha, c.Beta, c.Gamma},
			Reference: p.Structure.Reference, Provenance: p.Provenance, Origin: p.Origin,
		})
	}
	return out
}

// cellText writes the cell constants a crystal system does not fix.
func cellText(s crystal.Structure) string {
	c := s.Cell
	parts := []string{fmt.Sprintf("a = %.4f", c.A)}
	switch s.Group.System {
	case crystal.Cubic:
	case crystal.Tetragonal, crystal.Hexagonal, crystal.Trigonal:
		if s.Group.System == crystal.Trigonal && s.Group.Setting == "R" {
			parts = append(parts, fmt.Sprintf("α = %.3f°", c.Alpha))
			break
		}
		parts = append(parts, fmt.Sprintf("c = %.4f", c.C))
	case crystal.Orthorhombic:
		parts = append(parts, fmt.Sprintf("b = %.4f", c.B), fmt.Sprintf("c = %.4f", c.C))
	case crystal.Monoclinic:
		parts = append(parts, fmt.Sprintf("b = %.4f", c.B), fmt.Sprintf("c = %.4f", c.C), fmt.Sprintf("β = %.3f°", c.Beta))
	default:
		parts = append(parts, fmt.Sprintf("b = %.4f", c.B), fmt.Sprintf("c = %.4f", c.C),
			fmt.Sprintf("α = %.3f°", c.Alpha), fmt.Sprintf("β = %.3f°", c.Beta), fmt.Sprintf("γ = %.3f°", c.Gamma))
	}
	return strings.Join(parts, ", ") + " Å"
}

func printPhases(w io.Writer, phases []phaselib.Phase, all bool) error {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "phase\tformula\tsystem\tspace group\tcell\tsource\t")
	for _, p := range phases {
		src := p.Structure.Reference
		if p.Origin != phaselib.BuiltIn {
			src += " [" + p.Origin + "]"
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s (%d)\t%s\t%s\t\n", p.Name, p.Structure.Formula, phaselib.Kind(p.Structure),
			phaselib.SpaceGroupSymbol(p.Structure), p.Structure.Group.Number, cellText(p.Structure), src)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	if len(phases) == 0 {
		fmt.Fprintln(w, "No phase of the library has only these elements.")
	}
	if all {
		fmt.Fprintln(w, "\nNot in the built-in library (add a CIF of your own with --library or the phase-library setting):")
		for _, n := range phaselib.NotBuiltIn {
			fmt.Fprintf(w, "  %s: %s\n", n.Name, n.Why)
		}
	}
	return nil
}

func newPhasesShowCommand(a *app) *cobra.Command {
	var (
		dirs   []string
		r      radiationFlags
		count  int
		asJSON bool
	)
	cmd := &cobra.Command{
		Use:   "show NAME",
		Short: "Print a library phase's structure and its strongest computed powder lines",
		Long: `Prints a phase's cell, space group, atom sites and published source, and its
strongest powder lines computed from the structure (structure factors with the
International Tables form factors, multiplicity, Lorentz–polarisation without
a monochromator, isotropic displacement) at the Kα1 wavelength of --anode
(Cu by default) or --wavelength. Intensities are relative, the strongest
line = 100. NAME may be written with Greek letters (θ-Al2Cu) or spelled out
(theta-Al2Cu).`,
		Args: exactArgs(1, "NAME"),
		RunE: func(cmd *cobra.Command, args []string) error {
			lib, err := a.phaseLibrary(cmd.Context(), dirs)
			if err != nil {
				return err
			}
			p, err := lib.Find(args[0])
			if err != nil {
				return meltbook.Errorf(meltbook.NotFound, "phase", "%v", err)
			}
			rad, _, err := r.resolve(scanfile.Scan{})
			if err != nil {
				return err
			}
			lines, err := p.Lines(powder.Options{WavelengthA: rad.Kalpha1Angstrom, TwoThetaMaxDeg: phaselib.LinesTwoThetaMaxDeg})
			if err != nil {
				return invalid(err)
			}
			shown := strongestLines(lines, count)
			if asJSON {
				return writeJSON(a.stdout, struct {
					Phase       phaseSummary `json:"phase"`
					WavelengthA float64      `json:"wavelength_angstrom"`
					Lines       []shownLine  `json:"lines"`
				}{phaseSummaries([]phaselib.Phase{p})[0], rad.Kalpha1Angstrom, shown})
			}
			return printPhase(a.stdout, p, rad.Kalpha1Angstrom, shown)
		},
	}
	addRadiationFlags(cmd, &r)
	f := cmd.Flags()
	f.StringSliceVar(&dirs, "library", nil, "folder of CIF files added to the library (repeatable)")
	f.IntVar(&count, "lines", 15, "how many of the strongest lines to print")
	f.BoolVar(&asJSON, "json", false, "print JSON")
	return cmd
}

// shownLine is one printed powder line.
type shownLine struct {
	HKL          [3]int  `json:"hkl"`
	Multiplicity int     `json:"multiplicity"`
	DA           float64 `json:"d_angstrom"`
	TwoThetaDeg  float64 `json:"two_theta_deg"`
	Relative     float64 `json:"relative_intensity"`
}

// strongestLines keeps the n strongest lines, in order of 2θ, scaled so
// that the strongest of all is 100.
func strongestLines(lines []powder.Line, n int) []shownLine {
	top := 0.0
	for _, l := range lines {
		top = math.Max(top, l.Intensity)
	}
	idx := make([]int, len(lines))
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(i, j int) bool { return lines[idx[i]].Intensity > lines[idx[j]].Intensity })
	if n > 0 && len(idx) > n {
		idx = idx[:n]
	}
	sort.Ints(idx)
	out := make([]shownLine, 0, len(idx))
	for _, i := range idx {
		l := lines[i]
		rel := 0.0
		if top > 0 {
			rel = 100 * l.Intensity / top
		}
		out = append(out, shownLine{l.HKL, l.Multiplicity, l.DSpacingA, l.TwoThetaDeg, rel})
	}
	return out
}

func printPhase(w io.Writer, p phaselib.Phase, lambda float64, lines []shownLine) error {
	s := p.Structure
	fmt.Fprintf(w, "%s (%s), %s %s (No. %d), %s\n", p.Name, s.Formula, phaselib.Kind(s), phaselib.SpaceGroupSymbol(s), s.Group.Number, cellText(s))
	fmt.Fprintf(w, "Source: %s\n", s.Reference)
	if p.Provenance != "" {
		fmt.Fprintf(w, "Provenance: %s\n", p.Provenance)
	}
	if p.Origin != phaselib.BuiltIn {
		fmt.Fprintf(w, "File: %s\n", p.Origin)
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "  site\telement\tx\ty\tz\toccupancy\tU (Å²)\t")
	for _, site := range s.Sites {
		fmt.Fprintf(tw, "  %s\t%s\t%.4f\t%.4f\t%.4f\t%.3f\t%.4f\t\n", site.Label, site.Element, site.Fract[0], site.Fract[1], site.Fract[2], site.Occupancy, site.UisoA2)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	fmt.Fprintf(w, "\nStrongest lines at λ = %.5f Å (Kα1), no monochromator:\n", lambda)
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "  hkl\tm\td (Å)\t2θ (°)\tI rel\t")
	for _, l := range lines {
		fmt.Fprintf(tw, "  %d %d %d\t%d\t%.4f\t%.3f\t%.1f\t\n", l.HKL[0], l.HKL[1], l.HKL[2], l.Multiplicity, l.DA, l.TwoThetaDeg, l.Relative)
	}
	return tw.Flush()
}

package main

import (
	"fmt"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"meltbook/analysis/composition"
	"meltbook/analysis/descriptor"
	"meltbook/analysis/element"
)

func init() { addCommand(newDescribeCommand) }

// describeJSON is the stable machine-readable form of `describe`.
type describeJSON struct {
	Composition     string             `json:"composition"`
	AtomicFractions map[string]float64 `json:"atomic_fractions"`
	WeightFractions map[string]float64 `json:"weight_fractions"`
	EOverA          *float64           `json:"e_over_a"`
	Scheme          string             `json:"scheme"`
	VEC             float64            `json:"vec"`
	DeltaPct        *float64           `json:"delta_pct"`
	DeltaChi        *float64           `json:"delta_chi"`
	Undefined       []string           `json:"undefined"`
	MeanAtomicMass  float64            `json:"mean_atomic_mass_g_mol"`
	AtomicVolumeA3  float64            `json:"atomic_volume_A3"`
	VolumeMethod    string             `json:"atomic_volume_method"`
	KFInvA          *float64           `json:"kf_inv_A"`
	TwoKFInvA       *float64           `json:"two_kf_inv_A"`
	FermiNote       string             `json:"fermi_note,omitempty"`
	Flags           []string           `json:"flags"`
	FlagDetails     []flagJSON         `json:"flag_details"`
	Warnings        []string           `json:"warnings"`
}

type flagJSON struct {
	Code   string `json:"code"`
	Text   string `json:"text"`
	Source string `json:"source"`
}

func newDescribeCommand(a *app) *cobra.Command {
	var (
		schemeName string
		density    float64
		asJSON     bool
		weight     bool
	)
	cmd := &cobra.Command{
		Use:   "describe COMPOSITION",
		Short: "Composition, e/a, VEC, size mismatch, Δχ and 2kF of an alloy",
		Long: `Parses a composition (Al63Cu25Fe12, Al0.63Cu0.25Fe0.12, Al-25Cu-12Fe,
"Al-30Cu-10Fe wt%", (Al0.7Pd0.2Mn0.1)99B1) and prints its atomic and weight
fractions and its Hume-Rothery and size descriptors, with flags comparing e/a
with published icosahedral windows.`,
		Args: exactArgs(1, "COMPOSITION"),
		RunE: func(cmd *cobra.Command, args []string) error {
			parsed, err := parseComposition("composition", args[0], weight)
			if err != nil {
				return err
			}
			scheme, err := loadScheme(schemeName)
			if err != nil {
				return err
			}
			d, err := descriptor.Describe(parsed.Atomic, scheme, descriptor.Options{DensityGPerCm3: density})
			if err != nil {
				return invalid(err)
			}
			wf, err := parsed.Atomic.ToWeight()
			if err != nil {
				return invalid(err)
			}
			if asJSON {
				return writeJSON(a.stdout, describeResult(parsed, wf, d))
			}
			a.warn(parsed.Warnings)
			return printDescribe(a, parsed, wf, d)
		},
	}
	f := cmd.Flags()
	f.StringVar(&schemeName, "scheme", element.RaynorScheme, "valence scheme for e/a: "+strings.Join(element.SchemeNames(), ", ")+", or a scheme file")
	f.Float64Var(&density, "density", 0, "measured alloy density in g/cm³ (default: estimated from the elements)")
	f.BoolVar(&asJSON, "json", false, "print JSON")
	f.BoolVar(&weight, "wt", false, "read amounts as weight percent when the composition has no at% or wt% suffix")
	return cmd
}

func describeResult(p composition.Parsed, wf composition.Composition, d descriptor.Descriptors) describeJSON {
	out := describeJSON{
		Composition:     p.Atomic.Format(2),
		AtomicFractions: p.Atomic.Map(),
		WeightFractions: wf.Map(),
		Scheme:          d.Scheme,
		VEC:             d.VEC,
		Undefined:       append([]string{}, d.Undefined...),
		MeanAtomicMass:  d.MeanAtomicMassGPerMol,
		AtomicVolumeA3:  d.AtomicVolumeA3,
		VolumeMethod:    d.VolumeMethod,
		FermiNote:       d.FermiNote,
		Flags:           []string{},
		FlagDetails:     []flagJSON{},
		Warnings:        p.Warnings,
	}
	if out.Warnings == nil {
		out.Warnings = []string{}
	}
	if d.ElectronsPerAtomDefined {
		out.EOverA = &d.ElectronsPerAtom
	}
	if d.SizeMismatchDefined {
		out.DeltaPct = &d.SizeMismatchPercent
	}
	if d.ElectronegativityDefined {
		out.DeltaChi = &d.ElectronegativitySpread
	}
	if d.FermiDefined {
		kf, two := d.FermiWaveNumberPerA, d.TwoKFPerA
		out.KFInvA, out.TwoKFInvA = &kf, &two
	}
	for _, f := range d.Flags {
		out.Flags = append(out.Flags, f.Code+": "+f.Text)
		out.FlagDetails = append(out.FlagDetails, flagJSON{Code: f.Code, Text: f.Text, Source: f.Source})
	}
	return out
}

func printDescribe(a *app, p composition.Parsed, wf composition.Composition, d descriptor.Descriptors) error {
	w := a.stdout
	fmt.Fprintf(w, "%s  (%s)\n\n", p.Atomic.Format(2), p.Atomic.FormatBalance(2))
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "element\tat.%\twt.%\t")
	for _, part := range p.Atomic {
		fmt.Fprintf(tw, "%s\t%.2f\t%.2f\t\n", part.Element, 100*part.Fraction, 100*wf.Fraction(part.Element))
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	fmt.Fprintln(w)
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintf(tw, "e/a\t%s\t(%s valences)\n", definedf(d.ElectronsPerAtomDefined, "%.3f", d.ElectronsPerAtom), d.Scheme)
	fmt.Fprintf(tw, "VEC\t%.3f\t\n", d.VEC)
	if d.SizeMismatchDefined {
		fmt.Fprintf(tw, "δ\t%.2f %%\tsize mismatch, CN12 radii, mean r %.4f Å\n", d.SizeMismatchPercent, d.MeanRadiusAngstrom)
	} else {
		fmt.Fprintln(tw, "δ\tundefined\t")
	}
	if d.ElectronegativityDefined {
		fmt.Fprintf(tw, "Δχ\t%.4f\tPauling, mean χ %.3f\n", d.ElectronegativitySpread, d.MeanElectronegativity)
	} else {
		fmt.Fprintln(tw, "Δχ\tundefined\t")
	}
	fmt.Fprintf(tw, "mean atomic mass\t%.3f g/mol\t\n", d.MeanAtomicMassGPerMol)
	if d.AtomicVolumeA3 > 0 {
		fmt.Fprintf(tw, "atomic volume\t%.3f Å³\t%s\n", d.AtomicVolumeA3, d.VolumeMethod)
	} else {
		fmt.Fprintf(tw, "atomic volume\tunknown\t%s\n", d.VolumeMethod)
	}
	if d.FermiDefined {
		fmt.Fprintf(tw, "kF\t%.4f Å⁻¹\tfree electrons, n = %.4f e/Å³\n", d.FermiWaveNumberPerA, d.ElectronDensityPerA3)
		fmt.Fprintf(tw, "2kF\t%.4f Å⁻¹\tcompare with |G| = 2π/d of strong reflections\n", d.TwoKFPerA)
	} else {
		fmt.Fprintf(tw, "kF\tundefined\t%s\n", d.FermiNote)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	if len(d.Undefined) > 0 {
		fmt.Fprintln(w)
		for _, u := range d.Undefined {
			fmt.Fprintf(w, "undefined %s\n", u)
		}
	}
	if len(d.Flags) > 0 {
		fmt.Fprintln(w)
		for _, f := range d.Flags {
			fmt.Fprintf(w, "• %s\n", f.Text)
			if f.Source != "" {
				fmt.Fprintf(w, "  source: %s\n", f.Source)
			}
		}
	}
	return nil
}

// exactArgs is cobra.ExactArgs with a message that names the missing argument.
func exactArgs(n int, names string) cobra.PositionalArgs {
	return func(cmd *cobra.Command, args []string) error {
		if len(args) != n {
			return &usageError{fmt.Errorf("%s takes %s (%d argument(s)), got %d; see meltbook %s --help", cmd.Name(), names, n, len(args), cmd.Name())}
		}
		return nil
	}
}

// definedf formats v, or says "undefined" when it is not.
func definedf(defined bool, format string, v float64) string {
	if !defined {
		return "undefined"
	}
	return fmt.Sprintf(format, v)
}

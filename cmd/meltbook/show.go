package main

import (
	"fmt"
	"io"
	"math"
	"sort"
	"strings"
	"text/tabwriter"
	"time"

	"github.com/spf13/cobra"

	"meltbook"
	"meltbook/analysis/composition"
	"meltbook/analysis/descriptor"
	"meltbook/analysis/element"
)

func init() { addCommand(newShowCommand) }

func newShowCommand(a *app) *cobra.Command {
	var (
		schemeName string
		asJSON     bool
	)
	cmd := &cobra.Command{
		Use:   "show CODE",
		Short: "Everything recorded about a melt",
		Long: `Prints a melt with everything recorded about it: composition as entered and
normalised, measured compositions beside the nominal one with the
difference, the weigh-out and mass loss, the descriptors, every sample with
its process steps in the units they were typed in, electron-diffraction
observations, outcomes (a person's decisions apart from, and above,
automatic proposals), notes and the history. CODE may name the melt or
any sample derived from it. The handles in brackets ([step:QX-0042:2],
[outcome:12], ...) are the targets 'meltbook amend' takes.`,
		Args: exactArgs(1, "CODE"),
		RunE: func(cmd *cobra.Command, args []string) error {
			scheme, err := loadScheme(schemeName)
			if err != nil {
				return err
			}
			st, err := a.openNotebook(cmd.Context())
			if err != nil {
				return err
			}
			defer st.Close()
			rec, _, err := meltOfSample(cmd.Context(), st, args[0])
			if err != nil {
				return err
			}
			if asJSON {
				return writeJSON(a.stdout, rec)
			}
			return printMelt(a.stdout, rec, scheme)
		},
	}
	f := cmd.Flags()
	f.StringVar(&schemeName, "scheme", element.RaynorScheme, "valence scheme for e/a: "+strings.Join(element.SchemeNames(), ", ")+", or a scheme file")
	f.BoolVar(&asJSON, "json", false, "print the record as JSON")
	return cmd
}

// when writes a time in the local zone to the minute.
func shownAt(t time.Time) string { return t.Local().Format("2006-01-02 15:04") }

func compositionOf(fs []meltbook.ElementFraction) composition.Composition {
	c := make(composition.Composition, len(fs))
	for i, f := range fs {
		c[i] = composition.Part{Element: f.Element, Fraction: f.Fraction}
	}
	return c
}

func printMelt(w io.Writer, rec *meltbook.MeltRecord, scheme element.Scheme) error {
	m := &rec.Melt
	nominal := compositionOf(m.Nominal)
	fmt.Fprintf(w, "%s  %s\n\n", m.Code, nominal.Format(2))
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintf(tw, "made\t%s by %s\n", shownAt(m.CreatedAt), m.Operator)
	fmt.Fprintf(tw, "entered as\t%s\n", m.CompositionEntered)
	fmt.Fprintf(tw, "normalised\t%s (at.%%)\n", nominal.Format(2))
	fmt.Fprintf(tw, "button\t%s planned\n", gramsText(m.TargetMassGrams))
	if m.MassAfterMeltGrams != nil {
		line := gramsText(*m.MassAfterMeltGrams) + " after melting"
		if loss, ok := m.MassLossGrams(); ok {
			before := *m.MassAfterMeltGrams + loss
			line += fmt.Sprintf(", loss %s (%.2f %% of %s)", gramsText(loss), 100*loss/before, gramsText(before))
		}
		fmt.Fprintf(tw, "\t%s\n", line)
	}
	if m.Notes != "" {
		fmt.Fprintf(tw, "notes\t%s\n", m.Notes)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	printDescriptors(w, rec, nominal, scheme)
	printWeighOut(w, m)
	printCompositions(w, rec, nominal)
	fmt.Fprintln(w, "\nSamples")
	for i := range rec.Samples {
		printSample(w, &rec.Samples[i])
	}
	if len(rec.Notes) > 0 {
		fmt.Fprintln(w, "\nNotes")
		for _, n := range rec.Notes {
			on := ""
			if n.SampleCode != "" && n.SampleCode != m.Code {
				on = " on " + n.SampleCode
			}
			fmt.Fprintf(w, "  %s %s%s: %s  [note:%d]\n", shownAt(n.At), n.Author, on, n.Text, n.ID)
		}
	}
	fmt.Fprintln(w, "\nHistory")
	printHistory(w, rec.History)
	return nil
}

func printDescriptors(w io.Writer, rec *meltbook.MeltRecord, nominal composition.Composition, scheme element.Scheme) {
	fmt.Fprintln(w, "\nDescriptors of the nominal composition")
	d, err := descriptor.Describe(nominal, scheme, descriptor.Options{})
	if err != nil {
		fmt.Fprintf(w, "  not computed: %v\n", err)
		return
	}
	fmt.Fprintf(w, "  e/a %s (%s valences)   VEC %.3f   δ %s   Δχ %s\n",
		definedf(d.ElectronsPerAtomDefined, "%.3f", d.ElectronsPerAtom), d.Scheme, d.VEC,
		definedf(d.SizeMismatchDefined, "%.2f %%", d.SizeMismatchPercent),
		definedf(d.ElectronegativityDefined, "%.4f", d.ElectronegativitySpread))
	for _, u := range d.Undefined {
		fmt.Fprintf(w, "  undefined %s\n", u)
	}
	var others []string
	for _, name := range element.SchemeNames() {
		if name == d.Scheme {
			continue
		}
		if ea, ok := rec.EOverA[name]; ok {
			others = append(others, fmt.Sprintf("%.3f (%s)", ea, name))
		} else {
			others = append(others, fmt.Sprintf("undefined (%s: an element has no valence)", name))
		}
	}
	if len(others) > 0 {
		fmt.Fprintf(w, "  e/a under the other schemes: %s\n", strings.Join(others, ", "))
	}
	for _, f := range d.Flags {
		fmt.Fprintf(w, "  • %s\n", f.Text)
	}
}

func printWeighOut(w io.Writer, m *meltbook.Melt) {
	if len(m.WeighOut) == 0 {
		return
	}
	fmt.Fprintln(w, "\nWeigh-out")
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "  element\tplanned g\tweighed g\tdifference g\tpurity\tloss allowance\t")
	var planned, weighed float64
	allWeighed := true
	for _, l := range m.WeighOut {
		planned += l.PlannedGrams
		got, diff := "-", "-"
		if l.WeighedGrams != nil {
			weighed += *l.WeighedGrams
			got = fmt.Sprintf("%.4f", *l.WeighedGrams)
			diff = fmt.Sprintf("%+.4f", roundTo(*l.WeighedGrams-l.PlannedGrams, 4))
		} else {
			allWeighed = false
		}
		fmt.Fprintf(tw, "  %s\t%.4f\t%s\t%s\t%s%%\t%s%%\t\n", l.Element, l.PlannedGrams, got, diff, trimFloat(l.PurityPercent), trimFloat(l.LossPercent))
	}
	total := "-"
	if allWeighed {
		total = fmt.Sprintf("%.4f", weighed)
	}
	fmt.Fprintf(tw, "  total\t%.4f\t%s\t\t\t\t\n", planned, total)
	tw.Flush()
}

// roundTo rounds x to the given decimals, turning a result of zero into +0
// so that it never prints as -0.00.
func roundTo(x float64, decimals int) float64 {
	p := math.Pow(10, float64(decimals))
	r := math.Round(x*p) / p
	if r == 0 {
		return 0
	}
	return r
}

func trimFloat(x float64) string { return strings.TrimSuffix(fmt.Sprintf("%g", x), ".0") }

// printCompositions shows every measured composition beside the nominal
// one, with the difference measured − nominal in at.%.
func printCompositions(w io.Writer, rec *meltbook.MeltRecord, nominal composition.Composition) {
	type measured struct {
		sample string
		m      meltbook.MeasuredComposition
	}
	var ms []measured
	for _, s := range rec.Samples {
		for _, m := range s.Measurements {
			ms = append(ms, measured{s.Code, m})
		}
	}
	if len(ms) == 0 {
		return
	}
	elements := nominal.Elements()
	for _, x := range ms {
		for _, f := range x.m.Fractions {
			if nominal.Fraction(f.Element) == 0 && !hasString(elements, f.Element) {
				elements = append(elements, f.Element)
			}
		}
	}
	fmt.Fprintln(w, "\nComposition, nominal and measured (at.%)")
	// Fixed columns: the lines naming each measurement sit between the
	// rows and must not break the alignment.
	row := func(label string, value func(el string) string) {
		var b strings.Builder
		fmt.Fprintf(&b, "  %-11s", label)
		for _, el := range elements {
			fmt.Fprintf(&b, "%8s", value(el))
		}
		fmt.Fprintln(w, b.String())
	}
	row("", func(el string) string { return el })
	row("nominal", func(el string) string { return fmt.Sprintf("%.2f", 100*nominal.Fraction(el)) })
	for _, x := range ms {
		fr := map[string]float64{}
		for _, f := range x.m.Fractions {
			fr[f.Element] = f.Fraction
		}
		unc := map[string]float64{}
		for _, u := range x.m.Uncertainty {
			unc[u.Element] = u.Fraction
		}
		fmt.Fprintf(w, "  %s %s, %s by %s  [measurement:%d]\n", x.sample, x.m.Method, shownAt(x.m.At), x.m.Operator, x.m.ID)
		row("measured", func(el string) string { return fmt.Sprintf("%.2f", 100*fr[el]) })
		if len(unc) > 0 {
			row("± (1σ)", func(el string) string {
				if u, ok := unc[el]; ok {
					return fmt.Sprintf("%.2f", 100*u)
				}
				return "-"
			})
		}
		row("difference", func(el string) string {
			return fmt.Sprintf("%+.2f", roundTo(100*(fr[el]-nominal.Fraction(el)), 2))
		})
		if x.m.Notes != "" {
			fmt.Fprintf(w, "  notes: %s\n", x.m.Notes)
		}
	}
}

func printSample(w io.Writer, s *meltbook.SampleRecord) {
	indent := strings.Repeat("    ", s.Depth)
	what := "the button itself"
	if s.ParentCode != "" {
		what = "from " + s.ParentCode
	}
	label := ""
	if s.Label != "" {
		label = " \"" + s.Label + "\""
	}
	fmt.Fprintf(w, "%s  %s%s  %s, %s\n", indent, s.Code, label, what, shownAt(s.CreatedAt))
	for _, st := range s.Steps {
		fmt.Fprintf(w, "%s    %d. %s  %s by %s  [step:%s:%d]\n", indent, st.Seq, st.Kind, shownAt(st.At), st.Operator, s.Code, st.Seq)
		for _, p := range orderedParams(st) {
			fmt.Fprintf(w, "%s         %-18s %s\n", indent, p.Name, formatParam(st.Kind, p))
		}
		if st.Notes != "" {
			fmt.Fprintf(w, "%s         %-18s %s\n", indent, "notes", st.Notes)
		}
	}
	for _, o := range s.Symmetry {
		notes := ""
		if o.Notes != "" {
			notes = "; " + o.Notes
		}
		fmt.Fprintf(w, "%s    electron diffraction: %s axes, %s by %s%s  [symmetry:%d]\n", indent, foldsText(o.Folds), shownAt(o.At), o.Operator, notes, o.ID)
	}
	var person, automatic []meltbook.Outcome
	for _, o := range s.Outcomes {
		if o.Source == meltbook.ByPerson {
			person = append(person, o)
		} else {
			automatic = append(automatic, o)
		}
	}
	if len(person) > 0 {
		fmt.Fprintf(w, "%s    outcome, decided by a person:\n", indent)
		for _, o := range person {
			fmt.Fprintf(w, "%s      %s  by %s, %s%s  [outcome:%d]\n", indent, outcomeText(o), o.RecordedBy, shownAt(o.At), evidenceText(o), o.ID)
		}
	}
	if len(automatic) > 0 {
		note := ""
		if len(person) > 0 {
			note = "; the person's decision above stands"
		}
		fmt.Fprintf(w, "%s    automatic proposals%s:\n", indent, note)
		for _, o := range automatic {
			fmt.Fprintf(w, "%s      %s  %s, from %s, %s%s  [outcome:%d]\n", indent, outcomeText(o), o.Status, o.RecordedBy, shownAt(o.At), evidenceText(o), o.ID)
		}
	}
}

func evidenceText(o meltbook.Outcome) string {
	if o.Evidence == "" {
		return ""
	}
	return "; " + o.Evidence
}

// orderedParams lists a step's parameters in the display order of
// StepParams.
func orderedParams(st meltbook.ProcessStep) []meltbook.Param {
	rank := map[string]int{}
	for i, s := range meltbook.StepParams[st.Kind] {
		rank[s.Name] = i
	}
	ps := append([]meltbook.Param(nil), st.Params...)
	sort.SliceStable(ps, func(i, j int) bool { return rank[ps[i].Name] < rank[ps[j].Name] })
	return ps
}

func printHistory(w io.Writer, hs []meltbook.HistoryEntry) {
	for _, h := range hs {
		what := h.Entity
		if h.EntityID != 0 {
			what = fmt.Sprintf("%s %d", h.Entity, h.EntityID)
		}
		switch h.Action {
		case "amend":
			fmt.Fprintf(w, "  %s %s amended %s %s: %s → %s; why: %s\n", shownAt(h.At), h.Who, what, h.Field, orNone(h.Before), orNone(h.After), h.Why)
		default:
			line := fmt.Sprintf("  %s %s %s %s", shownAt(h.At), h.Who, h.Action, what)
			if h.Field != "" {
				line += " " + h.Field
			}
			if h.Why != "" {
				line += "; why: " + h.Why
			}
			fmt.Fprintln(w, line)
		}
	}
}

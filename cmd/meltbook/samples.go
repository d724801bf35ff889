package main

import (
	"fmt"
	"sort"
	"strconv"
	"strings"
	"time"

	"github.com/spf13/cobra"

	"meltbook"
	"meltbook/analysis/quantity"
	"meltbook/store/runform"
)

func init() {
	addCommand(newAnnealCommand)
	addCommand(newMeasureCommand)
	addCommand(newSymmetryCommand)
	addCommand(newOutcomeCommand)
	addCommand(newNoteCommand)
	addCommand(func(a *app) *cobra.Command { return newDecideCommand(a, true) })
	addCommand(func(a *app) *cobra.Command { return newDecideCommand(a, false) })
}

// atFlag reads an optional --at time in the local zone.
func atFlag(s string) (time.Time, error) {
	if s == "" {
		return time.Time{}, nil
	}
	return runform.ParseWhen(runform.Value{Key: "at", Value: s, Where: "--at"}, time.Local)
}

func newAnnealCommand(a *app) *cobra.Command {
	var temperature, duration, atmosphere, coolingMode, label, notes, at string
	cmd := &cobra.Command{
		Use:   "anneal SAMPLE --temperature 700C --time 4h",
		Short: "Record an anneal, which makes a new sample derived from SAMPLE",
		Long: `Records a heat treatment of a piece of SAMPLE (a melt code or a derived
sample's code). The annealed piece becomes a new sample that remembers its
parent; its code extends the parent's (QX-0042 -> QX-0042.a1) and is printed.`,
		Args: exactArgs(1, "SAMPLE"),
		RunE: func(cmd *cobra.Command, args []string) error {
			step := meltbook.ProcessStep{Kind: meltbook.Anneal}
			for _, fv := range []struct{ name, value string }{
				{"temperature", temperature}, {"time", duration}, {"atmosphere", atmosphere}, {"cooling", coolingMode},
			} {
				if fv.value == "" {
					if fv.name == "temperature" || fv.name == "time" {
						spec, _ := meltbook.ParamSpecFor(meltbook.Anneal, fv.name)
						return invalidFlag("--"+fv.name, "give the "+spec.Help+", e.g. --temperature 700C --time 4h")
					}
					continue
				}
				spec, _ := meltbook.ParamSpecFor(meltbook.Anneal, fv.name)
				p, err := runform.ParseParam(spec, runform.Value{Key: fv.name, Value: fv.value, Where: "--" + fv.name})
				if err != nil {
					return err
				}
				step.Params = append(step.Params, p)
			}
			var err error
			if step.At, err = atFlag(at); err != nil {
				return err
			}
			step.Notes = notes
			st, err := a.openNotebook(cmd.Context())
			if err != nil {
				return err
			}
			defer st.Close()
			sa, err := st.DeriveSample(cmd.Context(), a.operator(), args[0], step, label)
			if err != nil {
				return err
			}
			parts := make([]string, len(step.Params))
			for i, p := range step.Params {
				parts[i] = p.Name + " " + formatParam(meltbook.Anneal, p)
			}
			fmt.Fprintf(a.stdout, "%s annealed from %s: %s\n", sa.Code, args[0], strings.Join(parts, "; "))
			return nil
		},
	}
	f := cmd.Flags()
	f.StringVar(&temperature, "temperature", "", "anneal temperature, e.g. 700C or 973K")
	f.StringVar(&duration, "time", "", "time at temperature, e.g. 4h or 30min")
	f.StringVar(&atmosphere, "atmosphere", "", "atmosphere or vacuum, e.g. \"sealed silica, Ar\"")
	f.StringVar(&coolingMode, "cooling", "", "how it was cooled, e.g. \"water quench\" or \"furnace cool\"")
	f.StringVar(&label, "label", "", "a short label for the new piece")
	f.StringVar(&notes, "notes", "", "remarks on the anneal")
	f.StringVar(&at, "at", "", "when it was done, local time YYYY-MM-DDTHH:MM (default: now)")
	return cmd
}

// parseUncertainty reads --uncertainty values: one at.% value for every
// element, or EL=VALUE for single elements.
func parseUncertainty(values []string, elements []string) ([]meltbook.ElementFraction, error) {
	per := map[string]float64{}
	for _, v := range values {
		el, amount, hasElement := strings.Cut(v, "=")
		if !hasElement {
			amount, el = v, ""
		}
		amount = strings.TrimSuffix(strings.TrimSpace(amount), "%")
		x, err := strconv.ParseFloat(amount, 64)
		if err != nil || !(x >= 0 && x <= 100) {
			return nil, invalidFlag("--uncertainty", fmt.Sprintf("%q is not an uncertainty in at.%% (0-100), e.g. 0.5 or Cu=0.3", v))
		}
		if !hasElement {
			for _, e := range elements {
				per[e] = x / 100
			}
			continue
		}
		el = strings.TrimSpace(el)
		found := false
		for _, e := range elements {
			found = found || e == el
		}
		if !found {
			return nil, invalidFlag("--uncertainty", el+" is not in the measured composition")
		}
		per[el] = x / 100
	}
	var out []meltbook.ElementFraction
	for _, e := range elements {
		if u, ok := per[e]; ok {
			out = append(out, meltbook.ElementFraction{Element: e, Fraction: u})
		}
	}
	return out, nil
}

func newMeasureCommand(a *app) *cobra.Command {
	var method, comp, notes, at string
	var uncertainty []string
	cmd := &cobra.Command{
		Use:   "measure SAMPLE --method EDS --composition Al62.1Cu25.8Fe12.1",
		Short: "Record a composition measured on a sample",
		Long: `Records a measured composition of SAMPLE with its method (` + strings.Join(meltbook.MeasurementMethods, ", ") + `)
and standard uncertainty. 'meltbook show' prints it beside the nominal
composition with the difference.`,
		Args: exactArgs(1, "SAMPLE"),
		RunE: func(cmd *cobra.Command, args []string) error {
			mc := meltbook.MeasuredComposition{Notes: notes}
			for _, m := range meltbook.MeasurementMethods {
				if strings.EqualFold(m, strings.TrimSpace(method)) {
					mc.Method = m
				}
			}
			if mc.Method == "" {
				return invalidFlag("--method", fmt.Sprintf("%q is not one of %s", method, strings.Join(meltbook.MeasurementMethods, ", ")))
			}
			if comp == "" {
				return invalidFlag("--composition", "give the measured composition, e.g. --composition Al62.1Cu25.8Fe12.1")
			}
			parsed, err := runform.ParseComposition(runform.Value{Key: "composition", Value: comp, Where: "--composition"})
			if err != nil {
				return err
			}
			a.warn(parsed.Warnings)
			for _, p := range parsed.Atomic {
				mc.Fractions = append(mc.Fractions, meltbook.ElementFraction{Element: p.Element, Fraction: p.Fraction})
			}
			if mc.Uncertainty, err = parseUncertainty(uncertainty, parsed.Atomic.Elements()); err != nil {
				return err
			}
			if mc.At, err = atFlag(at); err != nil {
				return err
			}
			st, err := a.openNotebook(cmd.Context())
			if err != nil {
				return err
			}
			defer st.Close()
			got, err := st.AddMeasuredComposition(cmd.Context(), a.operator(), args[0], mc)
			if err != nil {
				return err
			}
			fmt.Fprintf(a.stdout, "measurement:%d on %s: %s %s\n", got.ID, args[0], got.Method, parsed.Atomic.Format(2))
			return nil
		},
	}
	f := cmd.Flags()
	f.StringVar(&method, "method", "", "measurement method: "+strings.Join(meltbook.MeasurementMethods, ", "))
	f.StringVar(&comp, "composition", "", "the measured composition (any composition notation; wt% suffix for weight)")
	f.StringArrayVar(&uncertainty, "uncertainty", nil, "standard uncertainty in at.%: one value for all elements, or EL=VALUE (repeat)")
	f.StringVar(&notes, "notes", "", "remarks, e.g. area scanned")
	f.StringVar(&at, "at", "", "when it was measured, local time (default: now)")
	return cmd
}

func newSymmetryCommand(a *app) *cobra.Command {
	var folds, notes, at string
	cmd := &cobra.Command{
		Use:   "symmetry SAMPLE --folds 2,3,5",
		Short: "Record the rotational symmetries seen in electron diffraction",
		Long: `Records which rotation axes electron diffraction patterns of SAMPLE showed,
e.g. --folds 2,3,5 for the three axes of an icosahedral phase, or 10 for a
decagonal one.`,
		Args: exactArgs(1, "SAMPLE"),
		RunE: func(cmd *cobra.Command, args []string) error {
			o := meltbook.SymmetryObservation{Notes: notes}
			var err error
			if o.Folds, err = parseFolds("--folds", folds); err != nil {
				return err
			}
			if err := o.Validate(); err != nil {
				return flagError(err)
			}
			if o.At, err = atFlag(at); err != nil {
				return err
			}
			st, err := a.openNotebook(cmd.Context())
			if err != nil {
				return err
			}
			defer st.Close()
			got, err := st.AddSymmetryObservation(cmd.Context(), a.operator(), args[0], o)
			if err != nil {
				return err
			}
			fmt.Fprintf(a.stdout, "symmetry:%d on %s: %s\n", got.ID, args[0], foldsText(got.Folds))
			return nil
		},
	}
	f := cmd.Flags()
	f.StringVar(&folds, "folds", "", "rotational symmetries seen, comma-separated: 2,3,5 (also 4, 6, 8, 10, 12)")
	f.StringVar(&notes, "notes", "", "remarks, e.g. zone axes or microscope")
	f.StringVar(&at, "at", "", "when it was observed, local time (default: now)")
	return cmd
}

// parseFolds reads a comma-separated list of rotation orders, sorted and
// without repeats.
func parseFolds(where, s string) ([]int, error) {
	seen := map[int]bool{}
	var out []int
	for _, part := range strings.FieldsFunc(s, func(r rune) bool { return r == ',' || r == ' ' }) {
		n, err := strconv.Atoi(strings.TrimSuffix(strings.TrimSpace(part), "-fold"))
		if err != nil {
			return nil, invalidFlag(where, fmt.Sprintf("%q is not a rotation order such as 2, 3, 5 or 10", part))
		}
		if !seen[n] {
			seen[n] = true
			out = append(out, n)
		}
	}
	if len(out) == 0 {
		return nil, invalidFlag(where, "name the symmetries seen, e.g. 2,3,5")
	}
	sort.Ints(out)
	return out, nil
}

func foldsText(folds []int) string {
	parts := make([]string, len(folds))
	for i, f := range folds {
		parts[i] = strconv.Itoa(f)
	}
	return strings.Join(parts, "-, ") + "-fold"
}

// parseFraction reads a phase fraction as 0.9 or 90%.
func parseFraction(where, s string) (*float64, error) {
	if s == "" {
		return nil, nil
	}
	q, err := quantity.Parse(s, quantity.Fraction)
	if err != nil {
		return nil, invalidFlag(where, err.Error())
	}
	return &q.SI, nil
}

func newOutcomeCommand(a *app) *cobra.Command {
	var kind, lattice, order, name, fraction, evidenceText string
	kinds := make([]string, len(meltbook.PhaseKinds))
	for i, k := range meltbook.PhaseKinds {
		kinds[i] = string(k)
	}
	cmd := &cobra.Command{
		Use:   "outcome SAMPLE --kind icosahedral [--lattice F] [--fraction 90%] --evidence TEXT",
		Short: "Record a person's decision on a phase found in a sample",
		Long: `Records one phase found in SAMPLE as a person's decision: its kind
(` + strings.Join(kinds, ", ") + `), for an icosahedral or cubic phase the
lattice (P, F or I), for an approximant its order (1/1, 2/1, ...), for a
crystalline phase its name, the rough volume fraction and the evidence.
A person's decision always ranks above automatic proposals on the sample.`,
		Args: exactArgs(1, "SAMPLE"),
		RunE: func(cmd *cobra.Command, args []string) error {
			o := meltbook.Outcome{
				Kind: meltbook.PhaseKind(strings.ToLower(strings.TrimSpace(kind))), Lattice: strings.ToUpper(strings.TrimSpace(lattice)),
				Order: strings.TrimSpace(order), Name: strings.TrimSpace(name), Evidence: evidenceText,
				Source: meltbook.ByPerson, RecordedBy: a.operator(),
			}
			var err error
			if o.Fraction, err = parseFraction("--fraction", fraction); err != nil {
				return err
			}
			if err := o.Validate(); err != nil {
				return flagError(err)
			}
			st, err := a.openNotebook(cmd.Context())
			if err != nil {
				return err
			}
			defer st.Close()
			got, err := st.AddOutcome(cmd.Context(), a.operator(), args[0], o)
			if err != nil {
				return err
			}
			fmt.Fprintf(a.stdout, "outcome:%d on %s: %s\n", got.ID, args[0], outcomeText(*got))
			return nil
		},
	}
	f := cmd.Flags()
	f.StringVar(&kind, "kind", "", "phase kind: "+strings.Join(kinds, ", "))
	f.StringVar(&lattice, "lattice", "", "P, F or I (icosahedral or cubic)")
	f.StringVar(&order, "order", "", "approximant order, e.g. 1/1")
	f.StringVar(&name, "name", "", "name of a crystalline phase, e.g. λ-Al13Fe4")
	f.StringVar(&fraction, "fraction", "", "rough volume fraction, 0.9 or 90%")
	f.StringVar(&evidenceText, "evidence", "", "what the decision rests on, e.g. \"XRD: all peaks index as F\"")
	return cmd
}

// flagError names the flag of a domain error about a field.
func flagError(err error) error {
	if e, ok := err.(*meltbook.Error); ok && e.Field != "" && !strings.HasPrefix(e.Field, "--") {
		field := e.Field
		if field == "by" {
			field = "as"
		}
		return &meltbook.Error{Kind: e.Kind, Field: "--" + field, Message: e.Message}
	}
	return err
}

// outcomeText writes an outcome briefly, e.g. "icosahedral F, 90%".
func outcomeText(o meltbook.Outcome) string {
	s := string(o.Kind)
	for _, part := range []string{o.Lattice, o.Order, o.Name} {
		if part != "" {
			s += " " + part
		}
	}
	if o.Fraction != nil {
		s += ", " + strconv.FormatFloat(100**o.Fraction, 'f', -1, 64) + "%"
	}
	return s
}

func newNoteCommand(a *app) *cobra.Command {
	return &cobra.Command{
		Use:   "note CODE TEXT",
		Short: "Write a dated note on a melt or a sample",
		Long:  `Writes TEXT as a note, with the time and your name, on the melt or derived sample CODE.`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) < 2 {
				return &usageError{fmt.Errorf("note takes CODE and the TEXT of the note; see meltbook note --help")}
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			text := strings.TrimSpace(strings.Join(args[1:], " "))
			if text == "" {
				return invalidFlag("TEXT", "the note is empty")
			}
			st, err := a.openNotebook(cmd.Context())
			if err != nil {
				return err
			}
			defer st.Close()
			n, err := st.AddNote(cmd.Context(), a.operator(), args[0], text)
			if err != nil {
				return err
			}
			fmt.Fprintf(a.stdout, "note:%d on %s\n", n.ID, args[0])
			return nil
		},
	}
}

// newDecideCommand builds confirm (accept an automatic proposal) or
// reject.
func newDecideCommand(a *app, confirm bool) *cobra.Command {
	var reason string
	verb, short := "reject", "Reject an automatic outcome proposal; it stays in the notebook but never counts"
	if confirm {
		verb, short = "confirm", "Confirm an automatic outcome proposal, making it a standing outcome"
	}
	cmd := &cobra.Command{
		Use:   verb + " outcome:ID",
		Short: short,
		Long: short + `.
Proposals come from the automatic analysis (e.g. indexing of a diffraction
scan); 'meltbook show' lists them with their handles. A person's own outcome,
recorded with 'meltbook outcome', always ranks above any proposal.`,
		Args: exactArgs(1, "outcome:ID"),
		RunE: func(cmd *cobra.Command, args []string) error {
			ref, ok := strings.CutPrefix(args[0], "outcome:")
			id, err := strconv.ParseInt(ref, 10, 64)
			if !ok || err != nil || id <= 0 {
				return invalidFlag("outcome:ID", fmt.Sprintf("%q is not an outcome handle such as outcome:12", args[0]))
			}
			if !confirm && strings.TrimSpace(reason) == "" {
				return invalidFlag("--reason", "say why the proposal is rejected")
			}
			st, err := a.openNotebook(cmd.Context())
			if err != nil {
				return err
			}
			defer st.Close()
			if confirm {
				err = st.ConfirmProposal(cmd.Context(), a.operator(), id, reason)
			} else {
				err = st.RejectProposal(cmd.Context(), a.operator(), id, reason)
			}
			if err != nil {
				return err
			}
			fmt.Fprintf(a.stdout, "%sed %s\n", strings.TrimSuffix(verb, "e"), args[0])
			return nil
		},
	}
	help := "why (optional)"
	if !confirm {
		help = "why the proposal is wrong (required)"
	}
	cmd.Flags().StringVar(&reason, "reason", "", help)
	return cmd
}

package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"
	"time"

	"github.com/spf13/cobra"

	"meltbook"
	"meltbook/analysis/hazard"
	"meltbook/store"
	"meltbook/store/runform"
)

func init() { addCommand(newLogCommand) }

func newLogCommand(a *app) *cobra.Command {
	var (
		file  string
		check bool
	)
	cmd := &cobra.Command{
		Use:   "log --composition Al63Cu25Fe12 --mass 10g [--code QX-0042] [process flags]",
		Short: "Record a melt with its weigh-out, arc melting and melt spinning",
		Long: `Records one melt in the notebook in one go: the nominal composition and
target mass, the weigh-out (planned as 'meltbook weigh' plans it, with the
masses actually weighed), the mass after melting, the arc-melting step
(--arc-... flags) and the melt-spinning step (wheel, nozzle, gas and ribbon
flags). Values carry their units (10g, 30um, 1250C, 25kPa, 30m/s, or 3000rpm
with --wheel-diameter); they are stored in SI and shown back in the units
typed. With a ribbon thickness the cooling rate is estimated and stored with
its regime.

Without --code the next free code with --prefix is used. With --file the runs
come from a run file (format in the README, Notebook section), all logged or none. On a
terminal, missing required values are asked for. Nothing is written when any
value is wrong. The bench cautions for the elements and the process follow.`,
		Args: exactArgs(0, "no arguments"),
		RunE: func(cmd *cobra.Command, _ []string) error {
			var inputs []runform.Input
			flagged := flagRun(cmd)
			switch {
			case file != "" && len(flagged.Values) > 0:
				return meltbook.Errorf(meltbook.Invalid, "--file", "give the runs in the file or as flags, not both (found --%s)", flagged.Values[0].Key)
			case file != "":
				runs, err := a.readRunFiles(file)
				if err != nil {
					return err
				}
				inputs = runs
			default:
				if (!flagged.Has("composition") || !flagged.Has("mass")) && a.interactive {
					if err := a.promptRun(&flagged); err != nil {
						return err
					}
				}
				inputs = []runform.Input{flagged}
			}
			built := make([]*runform.Run, len(inputs))
			for i, in := range inputs {
				b, err := runform.Build(in, a.operator(), time.Local)
				if err != nil {
					return err
				}
				a.warn(b.Parsed.Warnings)
				built[i] = b
			}
			return a.logRuns(cmd.Context(), built, check)
		},
	}
	f := cmd.Flags()
	f.StringVar(&file, "file", "", "read the runs from this run file (- for standard input)")
	f.BoolVar(&check, "check", false, "check the runs and show what would be logged, without writing")
	for _, rf := range runform.Fields() {
		help := rf.HelpText()
		switch {
		case rf.Key == "no-default-loss":
			f.Bool(rf.Key, false, "plan no rule-of-thumb evaporation allowances for Mg, Zn, Mn, Li, Ca")
		case rf.Repeat:
			f.StringArray(rf.Key, nil, help+" (repeat, or separate with commas)")
		default:
			f.String(rf.Key, "", help)
		}
	}
	return cmd
}

// flagRun collects the run fields given as flags.
func flagRun(cmd *cobra.Command) runform.Input {
	in := runform.Input{Missing: func(key string) string { return "--" + key }}
	f := cmd.Flags()
	for _, rf := range runform.Fields() {
		if !f.Changed(rf.Key) {
			continue
		}
		where := "--" + rf.Key
		switch {
		case rf.Key == "no-default-loss":
			on, _ := f.GetBool(rf.Key)
			in.Add(rf.Key, strconv.FormatBool(on), where)
		case rf.Repeat:
			vs, _ := f.GetStringArray(rf.Key)
			for _, v := range vs {
				in.Add(rf.Key, v, where)
			}
		default:
			v, _ := f.GetString(rf.Key)
			in.Add(rf.Key, v, where)
		}
	}
	return in
}

// readRunFiles reads a run file, or standard input for "-".
func (a *app) readRunFiles(name string) ([]runform.Input, error) {
	if name == "-" {
		return readRunFile("standard input", a.stdin)
	}
	fh, err := os.Open(name)
	if err != nil {
		return nil, meltbook.Errorf(meltbook.Invalid, "--file", "cannot open the run file: %v", err)
	}
	defer fh.Close()
	return readRunFile(name, fh)
}

// logRuns gives the runs their codes and writes them in one transaction,
// or with check only shows what would be written.
func (a *app) logRuns(ctx context.Context, runs []*runform.Run, check bool) error {
	st, err := a.openNotebook(ctx)
	if err != nil {
		return err
	}
	defer st.Close()
	if err := assignCodes(ctx, st, runs); err != nil {
		return err
	}
	who := a.operator()
	switch {
	case check:
		for _, r := range runs {
			if r.Prefix != "" {
				continue
			}
			if _, err := st.FindMeltByCode(ctx, r.New.Melt.Code); err == nil {
				return r.Retarget(meltbook.Errorf(meltbook.Conflict, "code", "melt %s already exists", r.New.Melt.Code))
			} else if meltbook.KindOf(err) != meltbook.NotFound {
				return err
			}
		}
	case len(runs) == 1:
		r := runs[0]
		if err := st.CreateMelt(ctx, who, &r.New.Melt, r.New.Steps...); err != nil {
			return r.Retarget(err)
		}
	default:
		batch := make([]store.NewMelt, len(runs))
		for i, r := range runs {
			batch[i] = r.New
		}
		if err := st.CreateMelts(ctx, who, batch); err != nil {
			var ee *store.EntryError
			if errors.As(err, &ee) && ee.Index >= 0 && ee.Index < len(runs) {
				return runs[ee.Index].Retarget(ee.Err)
			}
			return err
		}
	}
	verb := "logged"
	if check {
		verb = "would log"
		fmt.Fprintln(a.stdout, "checked; nothing written")
	}
	var elements []string
	for _, r := range runs {
		printLogged(a.stdout, verb, r)
		elements = append(elements, r.Parsed.Atomic.Elements()...)
	}
	fmt.Fprintln(a.stdout)
	printCautions(a.stdout, runCautions(elements))
	return nil
}

// assignCodes gives each run without a code the next free one for its
// prefix, after the highest one in the notebook or given in the batch, and
// refuses a batch that names one code twice.
func assignCodes(ctx context.Context, st *store.Store, runs []*runform.Run) error {
	taken := map[string]*runform.Run{}
	for _, r := range runs {
		code := r.New.Melt.Code
		if code == "" {
			continue
		}
		if other, dup := taken[code]; dup {
			return meltbook.Errorf(meltbook.Conflict, r.Where["code"], "code %s is also given at %s", code, other.Where["code"])
		}
		taken[code] = r
	}
	next := map[string]int{}
	for _, r := range runs {
		if r.Prefix == "" {
			continue
		}
		n, ok := next[r.Prefix]
		if !ok {
			first, err := st.NextMeltCode(ctx, r.Prefix)
			if err != nil {
				return r.RetargetPrefix(err)
			}
			if n, err = strconv.Atoi(strings.TrimPrefix(first, r.Prefix+"-")); err != nil {
				return fmt.Errorf("next code for prefix %s: unexpected %q", r.Prefix, first)
			}
			// Follow the highest code the batch itself gives with this prefix.
			for code := range taken {
				if k, err := strconv.Atoi(strings.TrimPrefix(code, r.Prefix+"-")); err == nil && strings.HasPrefix(code, r.Prefix+"-") && k >= n {
					n = k + 1
				}
			}
		}
		code := meltCode(r.Prefix, n)
		for taken[code] != nil {
			n++
			code = meltCode(r.Prefix, n)
		}
		r.New.Melt.Code = code
		taken[code] = r
		next[r.Prefix] = n + 1
	}
	return nil
}

// meltCode writes a generated code as store.NextMeltCode does.
func meltCode(prefix string, n int) string { return fmt.Sprintf("%s-%04d", prefix, n) }

func printLogged(w io.Writer, verb string, r *runform.Run) {
	m := &r.New.Melt
	kinds := make([]string, len(r.New.Steps))
	for i, s := range r.New.Steps {
		kinds[i] = string(s.Kind)
	}
	steps := "no process steps"
	if len(kinds) > 0 {
		steps = "steps: " + strings.Join(kinds, ", ")
	}
	fmt.Fprintf(w, "%s %s: %s, button %s; %s\n", verb, m.Code, r.Parsed.Atomic.Format(2), gramsText(m.TargetMassGrams), steps)
	if r.Estimate != nil {
		fmt.Fprintf(w, "  estimated cooling rate %.3g K/s, %s (Biot number %.3g)\n", r.Estimate.RateKPerS, r.Estimate.Regime, r.Estimate.Biot)
	}
}

// grams shows a mass in grams to 0.1 mg.
func gramsText(g float64) string { return strconv.FormatFloat(g, 'f', 4, 64) + " g" }

// runCautions are the bench cautions for the elements and for arc melting
// and melt spinning, with the deferral to local rules once, last.
func runCautions(elements []string) []hazard.Caution {
	var out []hazard.Caution
	for _, c := range append(hazard.Cautions(elements), hazard.ProcessCautions()...) {
		if c.Kind != hazard.LocalRules {
			out = append(out, c)
		}
	}
	for _, c := range hazard.ProcessCautions() {
		if c.Kind == hazard.LocalRules {
			out = append(out, c)
		}
	}
	return out
}

func printCautions(w io.Writer, cs []hazard.Caution) {
	fmt.Fprintln(w, "Cautions:")
	for _, c := range cs {
		if len(c.Elements) > 0 {
			fmt.Fprintf(w, "  - %s: %s\n", strings.Join(c.Elements, ", "), c.Text)
			continue
		}
		fmt.Fprintf(w, "  - %s\n", c.Text)
	}
}

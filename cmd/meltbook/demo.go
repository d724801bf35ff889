package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"meltbook"
	"meltbook/analysis/campaign"
	"meltbook/analysis/element"
	"meltbook/analysis/hazard"
	"meltbook/analysis/suggest"
	"meltbook/seed"
	"meltbook/store"
)

func init() { addCommand(newDemoCommand) }

// demoDefaultSeed is the seed of the demonstration notebook the README
// shows.
const demoDefaultSeed = 1

// demoFileName is the demo notebook's name in the user's cache folder.
const demoFileName = "meltbook-demo.db"

// demoBestBets is how many best bets the demo proposes per system, before
// one composition to explore.
const demoBestBets = 2

type demoFlags struct {
	seed    uint64
	replace bool
	noServe bool
	serve   serveFlags
}

func newDemoCommand(a *app) *cobra.Command {
	var fl demoFlags
	cmd := &cobra.Command{
		Use:   "demo",
		Short: "Build the invented demonstration notebook and show what to try next",
		Long: `Builds the demonstration notebook: an invented lab's ten months of
melt-spinning runs in five alloy systems, the same for the same --seed.
It prints a summary of the runs and outcomes per system, then what to
melt next in each system, ranked from the notebook's own results, and then
serves the notebook's web pages (as 'meltbook serve' does) until Ctrl-C,
unless --no-serve is given.

Without --notebook the demo lives in the user's cache folder
(meltbook/` + demoFileName + ` under $XDG_CACHE_HOME or ~/.cache) and is
rebuilt on every run; $MELTBOOK_NOTEBOOK is not used, so your own notebook
is never touched. With --notebook an existing file is kept unless
--replace is given.`,
		Args: exactArgs(0, "no arguments"),
		RunE: func(cmd *cobra.Command, _ []string) error {
			d, err := a.buildDemo(cmd.Context(), fl)
			if err != nil {
				return err
			}
			defer d.store.Close()
			if err := writeDemoSummary(cmd.Context(), a.stdout, d); err != nil {
				return err
			}
			if err := writeDemoNext(a.stdout, d); err != nil || fl.noServe {
				return err
			}
			fmt.Fprintln(a.stdout)
			return a.serve(cmd.Context(), d.store, fl.serve)
		},
	}
	cmd.Flags().Uint64Var(&fl.seed, "seed", demoDefaultSeed, "seed of the invented notebook; the same seed gives the same notebook")
	cmd.Flags().BoolVar(&fl.replace, "replace", false, "replace an existing file named by --notebook")
	cmd.Flags().BoolVar(&fl.noServe, "no-serve", false, "build and summarise the notebook, then stop instead of serving its web pages")
	fl.serve.register(cmd)
	return cmd
}

// demoNotebook is a built demonstration notebook, open, with what the
// summary, the suggestions and a web page need.
type demoNotebook struct {
	path    string
	seed    uint64
	lab     seed.Lab
	store   *store.Store
	systems []campaign.System
}

// demoPath returns where the demo is built, and whether an existing file
// there may be replaced without asking.
func (a *app) demoPath(fl demoFlags) (string, bool, error) {
	if a.notebookFlag != "" {
		return a.notebookFlag, fl.replace, nil
	}
	dir, err := os.UserCacheDir()
	if err != nil {
		dir = os.TempDir()
	}
	return filepath.Join(dir, "meltbook", demoFileName), true, nil
}

// buildDemo generates the notebook for the seed, writes it to a new file
// beside the target and moves it into place, so that a failed build
// leaves any earlier file as it was. It returns the notebook open.
func (a *app) buildDemo(ctx context.Context, fl demoFlags) (*demoNotebook, error) {
	path, replace, err := a.demoPath(fl)
	if err != nil {
		return nil, err
	}
	if info, err := os.Stat(path); err == nil {
		switch {
		case info.IsDir():
			return nil, meltbook.Errorf(meltbook.Invalid, "--notebook", "%s is a folder", path)
		case info.Size() > 0 && !replace:
			return nil, meltbook.Errorf(meltbook.Conflict, "--notebook", "%s already exists; the demo replaces it only with --replace (or leave out --notebook to use the demo's own file)", path)
		}
	}
	dir := filepath.Dir(path)
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, meltbook.Errorf(meltbook.Invalid, "--notebook", "cannot create the folder for %s: %v", path, err)
	}
	nb, err := seed.Generate(fl.seed)
	if err != nil {
		return nil, err
	}
	doc, err := nb.Document()
	if err != nil {
		return nil, err
	}
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".building-*")
	if err != nil {
		return nil, meltbook.Errorf(meltbook.Invalid, "--notebook", "cannot write in %s: %v", dir, err)
	}
	tmpPath := tmp.Name()
	tmp.Close()
	os.Remove(tmpPath) // store.Init creates the file itself
	defer demoRemove(tmpPath)
	clock := &scanClock{real: a.now}
	opts := a.storeOptions()
	opts.Now = clock.Now
	st, err := store.Init(ctx, tmpPath, opts)
	if err != nil {
		return nil, err
	}
	if err := st.ImportDocument(ctx, "meltbook demo", doc); err != nil {
		st.Close()
		return nil, fmt.Errorf("build the demo notebook: %w", err)
	}
	if err := a.addDemoScans(ctx, st, nb, fl.seed, clock); err != nil {
		st.Close()
		return nil, fmt.Errorf("build the demo notebook: %w", err)
	}
	if err := st.Close(); err != nil {
		return nil, err
	}
	demoRemove(path)
	if err := os.Rename(tmpPath, path); err != nil {
		return nil, fmt.Errorf("move the demo notebook into place: %w", err)
	}
	st, err = store.Open(ctx, path, a.storeOptions())
	if err != nil {
		return nil, err
	}
	d := &demoNotebook{path: path, seed: fl.seed, lab: nb.Lab, store: st}
	if d.systems, err = demoSystems(ctx, st); err != nil {
		st.Close()
		return nil, err
	}
	return d, nil
}

// demoRemove removes a notebook file with its SQLite journal files.
func demoRemove(path string) {
	for _, p := range []string{path, path + "-wal", path + "-shm", path + "-journal"} {
		_ = os.Remove(p) // a file that stays makes the rename that follows fail
	}
}

// demoSystems reads the whole notebook in one pass and groups its melts by
// system.
func demoSystems(ctx context.Context, st *store.Store) ([]campaign.System, error) {
	doc, err := st.ExportDocument(ctx)
	if err != nil {
		return nil, err
	}
	records := make([]meltbook.MeltRecord, len(doc.Melts))
	for i, m := range doc.Melts {
		rec := &records[i]
		rec.Melt = m.Melt
		for _, s := range m.Samples {
			sr := meltbook.SampleRecord{Sample: s.Sample}
			for _, st := range s.Steps {
				sr.Steps = append(sr.Steps, st.ProcessStep)
				if p, ok := st.Param("cooling-rate"); ok && st.Kind == meltbook.MeltSpin && rec.CoolingRateKPerS == nil && s.ParentCode == "" {
					rate := p.SI
					rec.CoolingRateKPerS = &rate
				}
			}
			for _, o := range s.Outcomes {
				sr.Outcomes = append(sr.Outcomes, o.Outcome)
			}
			rec.Samples = append(rec.Samples, sr)
		}
	}
	return campaign.Group(records), nil
}

// writeDemoSummary prints the lab, where the notebook is, and the melts and
// their outcomes per system.
func writeDemoSummary(ctx context.Context, w io.Writer, d *demoNotebook) error {
	lab := d.lab
	fmt.Fprintf(w, "Demonstration notebook (seed %d): %s\n", d.seed, d.path)
	fmt.Fprintf(w, "%s, %s\n", lab.Name, lab.Institute)
	var ops []string
	for _, o := range lab.Operators {
		ops = append(ops, fmt.Sprintf("%s (%s)", o.Name, o.Role))
	}
	fmt.Fprintf(w, "operators: %s\n", strings.Join(ops, ", "))
	melts, samples := 0, 0
	for _, s := range d.systems {
		melts += len(s.Melts)
		samples += s.Samples
	}
	fmt.Fprintf(w, "%d melts, %d samples, made %s to %s. Every name and number is invented.\n\n",
		melts, samples, lab.From.Format("2006-01-02"), lab.To.Format("2006-01-02"))

	fmt.Fprintln(w, "Melts per system, by the most telling result among each melt's samples:")
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprint(tw, "system\tmelts\t")
	for _, f := range campaign.Findings {
		fmt.Fprintf(tw, "%s\t", f)
	}
	fmt.Fprintln(tw)
	for _, s := range d.systems {
		fmt.Fprintf(tw, "%s\t%d\t", s.Name, len(s.Melts))
		for _, f := range campaign.Findings {
			fmt.Fprintf(tw, "%d\t", s.ByFinding[f])
		}
		fmt.Fprintln(tw)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	_, err := fmt.Fprintln(w)
	return err
}

// writeDemoNext prints, per system, the compositions to melt next with
// the reasons, and how to look further.
func writeDemoNext(w io.Writer, d *demoNotebook) error {
	scheme, ok := element.LookupScheme("raynor")
	if !ok {
		return errors.New("the raynor valence scheme is missing")
	}
	fmt.Fprintln(w, "WHAT TO TRY NEXT")
	fmt.Fprintln(w, "Per system, from its own examined samples (tentative results count half): the best bets,")
	fmt.Fprintln(w, "ranked by estimated chance of an icosahedral phase, then one to explore, ranked by that")
	fmt.Fprintln(w, "chance plus its uncertainty, where the notebook knows least.")
	best := suggest.DefaultOptions()
	best.Exploration = 0
	best.Count = demoBestBets
	explore := suggest.DefaultOptions()
	explore.Count = demoBestBets + 1
	for _, s := range d.systems {
		fmt.Fprintf(w, "\n%s: %d melts, %d samples examined", s.Name, len(s.Melts), s.Examined)
		bets, win, err := s.Next(scheme, best)
		switch {
		case errors.Is(err, campaign.ErrTooFew):
			fmt.Fprintf(w, "; too few to suggest from\n")
			continue
		case err != nil:
			return err
		}
		if win != nil {
			_, pub, _ := s.Window(scheme)
			fmt.Fprintf(w, "; e/a kept within %.2f-%.2f (%s, %s valences)\n", win.Low, win.High, pub.Family, win.Scheme)
		} else {
			_, _, why := s.Window(scheme)
			fmt.Fprintf(w, "; no e/a limit: %s\n", why)
		}
		listed := map[string]bool{}
		for i, sg := range bets.Suggestions {
			f := demoFormula(sg.Composition)
			listed[f] = true
			fmt.Fprintf(w, "  best bet %d. %s  %s\n", i+1, f, sg.Reason)
		}
		wide, _, err := s.Next(scheme, explore)
		if err != nil {
			return err
		}
		for _, sg := range wide.Suggestions {
			if f := demoFormula(sg.Composition); !listed[f] {
				fmt.Fprintf(w, "  to explore: %s  %s\n", f, sg.Reason)
				break
			}
		}
	}
	writeDemoCautions(w, d.systems)
	fmt.Fprintf(w, "\nLook further with --notebook %s, e.g. meltbook --notebook %s list\n", d.path, d.path)
	return nil
}

// writeDemoCautions prints the cautions of melting and spinning and of the
// systems' elements, ending with the deferral to local rules.
func writeDemoCautions(w io.Writer, systems []campaign.System) {
	var elements []string
	seen := map[string]bool{}
	for _, s := range systems {
		for _, el := range s.Elements {
			if !seen[el] {
				seen[el] = true
				elements = append(elements, el)
			}
		}
	}
	fmt.Fprintln(w, "\nBefore melting any of these:")
	for _, c := range hazard.ProcessCautions() {
		if c.Kind != hazard.LocalRules {
			fmt.Fprintf(w, "  - %s\n", c.Text)
		}
	}
	for _, c := range hazard.Cautions(elements) {
		fmt.Fprintf(w, "  - %s\n", c.Text)
	}
}

// demoFormula writes a composition in at.% to 0.1, elements at zero left out.
func demoFormula(c []meltbook.ElementFraction) string {
	var b strings.Builder
	for _, f := range c {
		if x := math.Round(1000*f.Fraction) / 10; x > 0 {
			fmt.Fprintf(&b, "%s%g", f.Element, x)
		}
	}
	return b.String()
}

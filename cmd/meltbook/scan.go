package main

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"github.com/schollz/progressbar/v3"
	"github.com/spf13/cobra"
	"golang.org/x/term"

	"meltbook"
	"meltbook/analysis/scanfile"
	"meltbook/store"
	"meltbook/store/intake"
)

func init() { addCommand(newScanCommand) }

// scanExtensions are the file name endings a folder's scan files have.
var scanExtensions = map[string]bool{".xy": true, ".xye": true, ".cif": true, ".dat": true, ".txt": true, ".csv": true}

func newScanCommand(a *app) *cobra.Command {
	cmd := &cobra.Command{
		Use:   "scan",
		Short: "Diffraction scans in the notebook: add, list, show, re-index",
		Long: `Adds powder diffraction scans to samples of the notebook. Each scan is
stored with its points, source file name and SHA-256, radiation and internal
standard; its peaks are found and indexed, and every phase that beats chance
becomes an automatic outcome proposal, weighed against the sample's electron
diffraction, its e/a window and the outcomes of nearby compositions. Confirm
or reject proposals with meltbook confirm / reject.`,
	}
	cmd.AddCommand(newScanAddCommand(a), newScanListCommand(a), newScanShowCommand(a), newScanReindexCommand(a))
	return cmd
}

type scanAddFlags struct {
	radiation radiationFlags
	mapFile   string
	byName    bool
	tolerance float64
	notes     string
	library   []string
}

func newScanAddCommand(a *app) *cobra.Command {
	var fl scanAddFlags
	cmd := &cobra.Command{
		Use:   "add SAMPLE FILE... | add --map FILE PATH... | add --by-name PATH...",
		Short: "Add scan files to samples, with peaks, indexing and proposals",
		Long: `Adds scans (XY, XYE or powder CIF) to samples. Three ways to say which
sample a file belongs to:

  meltbook scan add QR-0042.a1 run1.xy run2.xy    every file to one sample
  meltbook scan add --map map.csv scans/           a mapping file: columns
                                                   file and sample
  meltbook scan add --by-name scans/               the sample code is the file's
                                                   base name without extension,
                                                   up to the first _ or space:
                                                   QR-0042.a1_xrd.xy -> QR-0042.a1

A folder stands for its files ending in .xy, .xye, .cif, .dat, .txt or .csv
(not its subfolders). Each file is its own transaction: a file that is
refused (its file, line and column are named) or whose sample is unknown
leaves the others stored. A file already held by its sample (same SHA-256)
is reported and not stored again. The radiation is --anode or --wavelength,
else what the file states, else Cu Kα1/Kα2, recorded as assumed; correct it
later with scan reindex --anode/--wavelength.

Indexing tries the phases of the phase library whose elements the sample's
nominal composition holds: the built-in phases, the folder the notebook's
phase-library setting names and --library folders (see 'meltbook phases').`,
		Args: func(cmd *cobra.Command, args []string) error {
			if fl.mapFile == "" && !fl.byName && len(args) < 2 {
				return &usageError{fmt.Errorf("scan add takes SAMPLE FILE..., or --map FILE or --by-name with files or folders; see meltbook scan add --help")}
			}
			if (fl.mapFile != "" || fl.byName) && len(args) < 1 {
				return &usageError{fmt.Errorf("scan add --map/--by-name takes files or folders")}
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			return a.scanAdd(cmd.Context(), fl, args)
		},
	}
	addRadiationFlags(cmd, &fl.radiation)
	f := cmd.Flags()
	f.StringVar(&fl.mapFile, "map", "", "mapping file: CSV with a file and a sample column")
	f.BoolVar(&fl.byName, "by-name", false, "take each file's sample code from its name (see above)")
	f.Float64Var(&fl.tolerance, "tolerance", 0, "indexing tolerance, |2θobs − 2θcalc| in degrees (default 0.10)")
	f.StringVar(&fl.notes, "notes", "", "notes kept with every scan added")
	f.StringSliceVar(&fl.library, "library", nil, "folder of CIF files whose phases indexing tries beside the built-in library and the notebook's phase-library folder (repeatable)")
	return cmd
}

// radiationText turns the radiation flags into intake's radiation option.
func (r radiationFlags) radiationText() (string, error) {
	switch {
	case r.anode != "" && r.wavelength != "":
		return "", invalidFlag("--anode", "give --anode or --wavelength, not both")
	case r.anode != "":
		return r.anode, nil
	case r.wavelength != "":
		if _, err := strconv.ParseFloat(r.wavelength, 64); err == nil {
			return r.wavelength + ":mono", nil
		}
		return r.wavelength, nil
	}
	return "", nil
}

// scanJob is one file to add, with its sample or why it has none.
type scanJob struct {
	path, sample string
	err          error
}

// scanJobs lists the files to add with their samples.
func scanJobs(fl scanAddFlags, args []string) ([]scanJob, error) {
	var mapping *intake.Mapping
	var mapAbs string
	if fl.mapFile != "" {
		if fl.byName {
			return nil, invalidFlag("--map", "give --map or --by-name, not both")
		}
		f, err := os.Open(fl.mapFile)
		if err != nil {
			return nil, meltbook.Errorf(meltbook.NotFound, fl.mapFile, "cannot open the mapping: %v", err)
		}
		mapping, err = intake.ReadMapping(filepath.Base(fl.mapFile), f)
		f.Close()
		if err != nil {
			return nil, err
		}
		mapAbs, _ = filepath.Abs(fl.mapFile)
	}
	sample := ""
	paths := args
	if mapping == nil && !fl.byName {
		sample, paths = args[0], args[1:]
	}
	var jobs []scanJob
	for _, p := range paths {
		info, err := os.Stat(p)
		if err != nil {
			jobs = append(jobs, scanJob{path: p, err: meltbook.Errorf(meltbook.NotFound, p, "no such file or folder")})
			continue
		}
		files := []string{p}
		if info.IsDir() {
			entries, err := os.ReadDir(p)
			if err != nil {
				return nil, meltbook.Errorf(meltbook.Invalid, p, "cannot read the folder: %v", err)
			}
			files = files[:0]
			for _, e := range entries {
				name := e.Name()
				full := filepath.Join(p, name)
				abs, _ := filepath.Abs(full)
				if e.IsDir() || strings.HasPrefix(name, ".") || !scanExtensions[strings.ToLower(filepath.Ext(name))] || abs == mapAbs {
					continue
				}
				files = append(files, full)
			}
			sort.Strings(files)
		}
		for _, f := range files {
			j := scanJob{path: f, sample: sample}
			switch {
			case mapping != nil:
				s, ok := mapping.Sample(f)
				if !ok {
					j.err = meltbook.Errorf(meltbook.Invalid, f, "not in the mapping %s", fl.mapFile)
				}
				j.sample = s
			case fl.byName:
				s, ok := intake.SampleFromFileName(f)
				if !ok {
					j.err = meltbook.Errorf(meltbook.Invalid, f, "the file name carries no sample code")
				}
				j.sample = s
			}
			jobs = append(jobs, j)
		}
	}
	if len(jobs) == 0 {
		return nil, meltbook.Errorf(meltbook.Invalid, strings.Join(args, " "), "no scan files found (a folder's files must end in .xy, .xye, .cif, .dat, .txt or .csv)")
	}
	return jobs, nil
}

func (a *app) scanAdd(ctx context.Context, fl scanAddFlags, args []string) error {
	rad, err := fl.radiation.radiationText()
	if err != nil {
		return err
	}
	opt := intake.Options{Radiation: rad, Standard: fl.radiation.standard, ToleranceDeg: fl.tolerance, Notes: fl.notes, LibraryDirs: fl.library}
	if fl.tolerance < 0 {
		return invalidFlag("--tolerance", "the tolerance must be positive")
	}
	jobs, err := scanJobs(fl, args)
	if err != nil {
		return err
	}
	st, err := a.openNotebook(ctx)
	if err != nil {
		return err
	}
	defer st.Close()
	a.loadCalibration()
	defer a.saveCalibration()

	bar := a.progressBar(len(jobs))
	var added, same int
	var failed []error
	for _, j := range jobs {
		var res *intake.Result
		if j.err == nil {
			res, j.err = a.addScanFile(ctx, st, j, opt)
		}
		if bar != nil {
			bar.Clear()
		}
		switch {
		case j.err != nil:
			failed = append(failed, j.err)
			if msg := j.err.Error(); strings.HasPrefix(msg, filepath.Base(j.path)) || strings.HasPrefix(msg, j.path) {
				fmt.Fprintf(a.stdout, "refused  %s\n", msg)
			} else {
				fmt.Fprintf(a.stdout, "refused  %s: %s\n", j.path, msg)
			}
		case res.Duplicate != nil:
			same++
			d := res.Duplicate
			fmt.Fprintf(a.stdout, "held     %s: already scan %d of %s (imported %s from %s); not added again\n",
				j.path, d.ID, d.SampleCode, shownAt(d.ImportedAt), d.FileName)
		case len(jobs) == 1:
			added++
			if err := writeScanAdded(a.stdout, res); err != nil {
				return err
			}
		default:
			added++
			writeScanLine(a.stdout, j.path, res)
		}
		if bar != nil {
			bar.Add(1)
		}
	}
	if bar != nil {
		bar.Finish()
		fmt.Fprintln(a.stderr)
	}
	if len(jobs) > 1 {
		fmt.Fprintf(a.stdout, "\n%d files: %d added, %d already held, %d refused\n", len(jobs), added, same, len(failed))
	}
	if len(failed) > 0 {
		if len(jobs) == 1 {
			return failed[0]
		}
		return &meltbook.Error{Kind: meltbook.KindOf(failed[0]), Message: fmt.Sprintf("%d of %d files were not added; the others were", len(failed), len(jobs))}
	}
	return nil
}

// addScanFile reads one file and adds it.
func (a *app) addScanFile(ctx context.Context, st *store.Store, j scanJob, opt intake.Options) (*intake.Result, error) {
	info, err := os.Stat(j.path)
	if err != nil {
		return nil, meltbook.Errorf(meltbook.NotFound, j.path, "no such file")
	}
	if info.Size() > scanfile.MaxBytes {
		return nil, meltbook.Errorf(meltbook.Invalid, j.path, "larger than %d MiB; is this a scan?", scanfile.MaxBytes>>20)
	}
	data, err := os.ReadFile(j.path)
	if err != nil {
		return nil, meltbook.Errorf(meltbook.Invalid, j.path, "cannot read: %v", err)
	}
	return intake.Add(ctx, st, a.operator(), intake.File{Sample: j.sample, Name: j.path, Data: data}, opt)
}

// progressBar returns a bar on stderr when it is a terminal and there is
// more than one file, else nil.
func (a *app) progressBar(n int) *progressbar.ProgressBar {
	f, ok := a.stderr.(*os.File)
	if n < 2 || !ok || !term.IsTerminal(int(f.Fd())) {
		return nil
	}
	return progressbar.NewOptions(n,
		progressbar.OptionSetWriter(f),
		progressbar.OptionSetDescription("scans"),
		progressbar.OptionShowCount(),
		progressbar.OptionClearOnFinish())
}

// loadCalibration loads the kept indexing calibration, saying on stderr
// when the file cannot be used.
func (a *app) loadCalibration() {
	path, err := intake.DefaultCalibrationPath()
	if err != nil {
		return
	}
	if _, err := intake.LoadCalibration(path); err != nil {
		fmt.Fprintf(a.stderr, "note: %v; it will be rebuilt\n", err)
	}
}

// saveCalibration keeps the indexing calibration for the next run.
func (a *app) saveCalibration() {
	path, err := intake.DefaultCalibrationPath()
	if err != nil {
		return
	}
	if err := intake.SaveCalibration(path); err != nil {
		fmt.Fprintf(a.stderr, "note: %v\n", err)
	}
}

func newScanListCommand(a *app) *cobra.Command {
	var asJSON bool
	cmd := &cobra.Command{
		Use:   "list CODE",
		Short: "List the scans of a sample, or of every sample of a melt",
		Long: `Lists the scans of a sample with their current indexing in brief. A melt's
code lists the scans of all its samples (the melt's own and the pieces
derived from it).`,
		Args: exactArgs(1, "CODE"),
		RunE: func(cmd *cobra.Command, args []string) error {
			ctx := cmd.Context()
			st, err := a.openNotebook(ctx)
			if err != nil {
				return err
			}
			defer st.Close()
			scans, err := st.MeltScans(ctx, args[0])
			if meltbook.KindOf(err) == meltbook.NotFound {
				scans, err = st.SampleScans(ctx, args[0])
			}
			if err != nil {
				return err
			}
			if asJSON {
				if scans == nil {
					scans = []meltbook.ScanSummary{}
				}
				return writeJSON(a.stdout, scans)
			}
			return writeScanList(a.stdout, args[0], scans)
		},
	}
	cmd.Flags().BoolVar(&asJSON, "json", false, "print JSON")
	return cmd
}

// scanID reads "12" or "scan:12".
func scanID(s string) (int64, error) {
	id, err := strconv.ParseInt(strings.TrimPrefix(s, "scan:"), 10, 64)
	if err != nil || id < 1 {
		return 0, invalidFlag("ID", fmt.Sprintf("%q is not a scan number such as 12 or scan:12", s))
	}
	return id, nil
}

func newScanShowCommand(a *app) *cobra.Command {
	var asJSON bool
	cmd := &cobra.Command{
		Use:   "show ID",
		Short: "Show a scan: its peaks, indexings, proposals and history",
		Long: `Shows everything the notebook holds about a scan: the file, radiation and
range, the current indexing with each peak and the reflection that explains
it, the phases with lattice constant, zero shift, figure of merit and
chance, the automatic proposals with their weighing, earlier indexings and
the history. --json prints the whole record, points included.`,
		Args: exactArgs(1, "ID"),
		RunE: func(cmd *cobra.Command, args []string) error {
			id, err := scanID(args[0])
			if err != nil {
				return err
			}
			ctx := cmd.Context()
			st, err := a.openNotebook(ctx)
			if err != nil {
				return err
			}
			defer st.Close()
			rec, err := st.ScanRecord(ctx, id)
			if err != nil {
				return err
			}
			if asJSON {
				return writeJSON(a.stdout, rec)
			}
			return writeScanRecord(a.stdout, rec)
		},
	}
	cmd.Flags().BoolVar(&asJSON, "json", false, "print JSON (the whole record, points included)")
	return cmd
}

func newScanReindexCommand(a *app) *cobra.Command {
	var (
		r         radiationFlags
		reason    string
		tolerance float64
		library   []string
	)
	cmd := &cobra.Command{
		Use:   "reindex ID --reason TEXT",
		Short: "Find the peaks and index a stored scan again, keeping the earlier result",
		Long: `Runs the peak search and indexing again on a stored scan and keeps the
result as the scan's next indexing; earlier ones stay in the notebook.
--anode or --wavelength corrects the radiation recorded with the scan (an
amendment, with the reason, in the history); --standard sets the internal
standard (none removes it). Proposals of earlier indexings still awaiting a
decision are rejected as superseded; confirmed or rejected ones stand.`,
		Args: exactArgs(1, "ID"),
		RunE: func(cmd *cobra.Command, args []string) error {
			id, err := scanID(args[0])
			if err != nil {
				return err
			}
			if strings.TrimSpace(reason) == "" {
				return invalidFlag("--reason", "say why the scan is indexed again")
			}
			rad, err := r.radiationText()
			if err != nil {
				return err
			}
			ctx := cmd.Context()
			st, err := a.openNotebook(ctx)
			if err != nil {
				return err
			}
			defer st.Close()
			a.loadCalibration()
			defer a.saveCalibration()
			res, err := intake.Reindex(ctx, st, a.operator(), id, reason,
				intake.Options{Radiation: rad, Standard: r.standard, ToleranceDeg: tolerance, LibraryDirs: library})
			if err != nil {
				return err
			}
			return writeScanAdded(a.stdout, res)
		},
	}
	addRadiationFlags(cmd, &r)
	cmd.Flags().StringVar(&reason, "reason", "", "why the scan is indexed again (required)")
	cmd.Flags().Float64Var(&tolerance, "tolerance", 0, "indexing tolerance, |2θobs − 2θcalc| in degrees (default 0.10)")
	cmd.Flags().StringSliceVar(&library, "library", nil, "folder of CIF files added to the phase library (repeatable)")
	return cmd
}

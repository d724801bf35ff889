package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"regexp"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"

	"github.com/spf13/cobra"

	"meltbook"
	"meltbook/store"
	"meltbook/store/runsheet"
)

func init() { addCommand(newImportSheetCommand) }

// sheetFlags are the options of import-sheet.
type sheetFlags struct {
	maps, fills  []string
	dates        string
	delimiter    string
	prefix       string
	dryRun       bool
	allOrNothing bool
	fields       bool
}

func newImportSheetCommand(a *app) *cobra.Command {
	var fl sheetFlags
	cmd := &cobra.Command{
		Use:   "import-sheet FILE",
		Short: "Import a spreadsheet of runs saved as CSV",
		Long: `Reads a group's spreadsheet of runs, saved as CSV, and logs one melt per row
with its arc-melting, melt-spinning and anneal steps and the phases found.

Columns are recognised by their headings (see --fields), units come from
the heading ("Thickness (um)") or the cell ("35 um"); --map assigns a
column by hand and --fill gives a value for empty cells or a missing
column. The report shows how each column was read, then each row: taken,
with what was guessed, or refused, with the reasons (file, line, column).

Rows that are fine are imported together in one transaction; refused rows
are reported and the exit status is non-zero. With --all-or-nothing a
single refused row stops the import. --dry-run checks everything, against
the notebook too, and writes nothing.`,
		RunE: func(cmd *cobra.Command, args []string) error {
			if fl.fields {
				return writeSheetFields(a.stdout)
			}
			return a.importSheet(cmd.Context(), args[0], fl)
		},
	}
	f := cmd.Flags()
	f.StringArrayVar(&fl.maps, "map", nil, `read a column as a field: HEADING=FIELD, HEADING=FIELD (UNIT), or HEADING=- to leave it out; HEADING may be a column number`)
	f.StringArrayVar(&fl.fills, "fill", nil, "value for empty cells or a missing column: FIELD=VALUE, e.g. wheel-material=Cu")
	f.StringVar(&fl.dates, "dates", "", "read dates like 03/04/2026 as day-first or month-first (default: as the sheet's other dates show)")
	f.StringVar(&fl.delimiter, "delimiter", "", "cell separator: comma, semicolon or tab (default: detected)")
	f.StringVar(&fl.prefix, "prefix", "", "number rows without a code as PREFIX-0001, ... after the notebook's last")
	f.BoolVar(&fl.dryRun, "dry-run", false, "check the sheet against the notebook and write nothing")
	f.BoolVar(&fl.allOrNothing, "all-or-nothing", false, "import nothing when any row is refused")
	f.BoolVar(&fl.fields, "fields", false, "list the fields and the headings recognised for them, and exit")
	cmd.Args = func(cmd *cobra.Command, args []string) error {
		if fl.fields {
			return nil
		}
		return exactArgs(1, "the sheet file")(cmd, args)
	}
	return cmd
}

// sheetOptions turns the flags into reader options.
func (a *app) sheetOptions(name string, fl sheetFlags) (runsheet.Options, error) {
	opt := runsheet.Options{Name: name, Location: time.Local, Operator: a.operator(), Map: map[string]string{}, Fill: map[string]string{}}
	for _, m := range fl.maps {
		heading, field, ok := strings.Cut(m, "=")
		if !ok || strings.TrimSpace(heading) == "" || strings.TrimSpace(field) == "" {
			return opt, invalidFlag("--map", fmt.Sprintf("%q is not HEADING=FIELD, e.g. \"Dicke (um)=thickness\"", m))
		}
		if _, dup := opt.Map[heading]; dup {
			return opt, invalidFlag("--map", fmt.Sprintf("%q mapped twice", heading))
		}
		opt.Map[heading] = field
	}
	for _, v := range fl.fills {
		field, value, ok := strings.Cut(v, "=")
		if !ok || strings.TrimSpace(field) == "" || strings.TrimSpace(value) == "" {
			return opt, invalidFlag("--fill", fmt.Sprintf("%q is not FIELD=VALUE, e.g. wheel-material=Cu", v))
		}
		opt.Fill[strings.TrimSpace(field)] = value
	}
	switch strings.ToLower(fl.dates) {
	case "":
	case "day-first", "dmy", "day":
		opt.Dates = runsheet.DayFirst
	case "month-first", "mdy", "month":
		opt.Dates = runsheet.MonthFirst
	default:
		return opt, invalidFlag("--dates", fmt.Sprintf("%q is neither day-first nor month-first", fl.dates))
	}
	switch strings.ToLower(fl.delimiter) {
	case "":
	case "comma", ",":
		opt.Delimiter = ','
	case "semicolon", ";":
		opt.Delimiter = ';'
	case "tab", "\\t", "\t":
		opt.Delimiter = '\t'
	default:
		return opt, invalidFlag("--delimiter", fmt.Sprintf("%q is not comma, semicolon or tab", fl.delimiter))
	}
	return opt, nil
}

func (a *app) importSheet(ctx context.Context, name string, fl sheetFlags) error {
	opt, err := a.sheetOptions(name, fl)
	if err != nil {
		return err
	}
	f, err := os.Open(name)
	if err != nil {
		return meltbook.Errorf(meltbook.NotFound, name, "cannot open the sheet: %v", err)
	}
	sh, err := runsheet.Read(f, opt)
	f.Close()
	if err != nil {
		return err
	}
	st, err := a.openNotebook(ctx)
	if err != nil {
		return err
	}
	defer st.Close()
	if err := sheetCheckNotebook(ctx, st, sh); err != nil {
		return err
	}
	if err := sheetAssignCodes(ctx, st, sh, fl.prefix); err != nil {
		return err
	}
	if err := writeSheetReport(a.stdout, sh); err != nil {
		return err
	}

	taken, refused := sh.Taken(), len(sh.Rows)-sh.Taken()
	verdict := fmt.Sprintf("%d %s taken, %d refused", taken, sheetPlural(taken, "row", "rows"), refused)
	if sh.Blank > 0 {
		verdict += fmt.Sprintf(", %d blank %s skipped", sh.Blank, sheetPlural(sh.Blank, "row", "rows"))
	}
	switch {
	case fl.dryRun:
		fmt.Fprintf(a.stdout, "dry run: %s; %d %s would be imported into %s; nothing was written\n", verdict, taken, sheetPlural(taken, "melt", "melts"), st.Path())
	case refused > 0 && fl.allOrNothing:
		fmt.Fprintf(a.stdout, "%s; nothing imported (--all-or-nothing)\n", verdict)
	case taken == 0:
		fmt.Fprintf(a.stdout, "%s; nothing to import\n", verdict)
	default:
		batch := make([]store.NewMelt, 0, taken)
		lines := make([]int, 0, taken)
		for _, r := range sh.Rows {
			if r.OK() {
				batch = append(batch, store.NewMelt{Melt: r.Melt, Steps: r.Steps, Outcomes: r.Outcomes})
				lines = append(lines, r.Line)
			}
		}
		if err := st.CreateMelts(ctx, a.operator(), batch); err != nil {
			var ee *store.EntryError
			if errors.As(err, &ee) {
				return &meltbook.Error{Kind: meltbook.KindOf(err), Field: fmt.Sprintf("%s line %d", name, lines[ee.Index]),
					Message: fmt.Sprintf("melt %s: %s; nothing was imported", ee.Code, sheetMessage(ee.Err))}
			}
			return fmt.Errorf("import %s: %w; nothing was imported", name, err)
		}
		fmt.Fprintf(a.stdout, "%s; imported %d %s into %s\n", verdict, taken, sheetPlural(taken, "melt", "melts"), st.Path())
	}
	if refused > 0 {
		what := "the others were imported"
		switch {
		case fl.dryRun:
			what = "dry run"
		case fl.allOrNothing || taken == 0:
			what = "nothing was imported"
		}
		return meltbook.Errorf(meltbook.Invalid, name, "%d of %d %s refused (%s)", refused, len(sh.Rows), sheetPlural(len(sh.Rows), "row", "rows"), what)
	}
	return nil
}

func sheetMessage(err error) string {
	var e *meltbook.Error
	if errors.As(err, &e) {
		return e.Message
	}
	return err.Error()
}

func sheetPlural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}

// sheetCheckNotebook refuses rows whose code the notebook already holds,
// as a melt or as any sample.
func sheetCheckNotebook(ctx context.Context, st *store.Store, sh *runsheet.Sheet) error {
	heading := ""
	for _, c := range sh.Columns {
		if c.Field == "code" {
			heading = c.Heading
		}
	}
	for i := range sh.Rows {
		r := &sh.Rows[i]
		if r.Melt.Code == "" {
			continue
		}
		s, err := st.FindSampleByCode(ctx, r.Melt.Code)
		switch {
		case err == nil && s.ParentCode == "":
			r.Refuse(heading, "melt %s is already in the notebook; correct it there with amend instead", r.Melt.Code)
		case err == nil:
			r.Refuse(heading, "%s is already a sample in the notebook (a piece of %s)", r.Melt.Code, s.ParentCode)
		case meltbook.KindOf(err) != meltbook.NotFound:
			return err
		}
	}
	return nil
}

// sheetCodeNumber matches a generated code, PREFIX-NUMBER.
var sheetCodeNumber = regexp.MustCompile(`^(.+)-(\d+)$`)

// sheetAssignCodes numbers rows without a code after the highest code with
// the prefix in the notebook and in the sheet, or refuses them when no
// prefix is given.
func sheetAssignCodes(ctx context.Context, st *store.Store, sh *runsheet.Sheet, prefix string) error {
	var open []*runsheet.Row
	for i := range sh.Rows {
		if sh.Rows[i].Melt.Code == "" {
			open = append(open, &sh.Rows[i])
		}
	}
	if len(open) == 0 {
		return nil
	}
	if prefix == "" {
		for _, r := range open {
			r.Refuse("", "no melt code; give one in the sheet, or number such rows with --prefix")
		}
		return nil
	}
	first, err := st.NextMeltCode(ctx, prefix)
	if err != nil {
		var e *meltbook.Error
		if errors.As(err, &e) && e.Kind == meltbook.Invalid {
			return invalidFlag("--prefix", e.Message)
		}
		return err
	}
	m := sheetCodeNumber.FindStringSubmatch(first)
	if m == nil {
		return fmt.Errorf("next code %q has no number", first)
	}
	next, _ := strconv.Atoi(m[2])
	for _, r := range sh.Rows {
		if c := sheetCodeNumber.FindStringSubmatch(r.Melt.Code); c != nil && c[1] == prefix {
			if n, err := strconv.Atoi(c[2]); err == nil && n >= next {
				next = n + 1
			}
		}
	}
	for _, r := range open {
		if !r.OK() {
			continue
		}
		r.Melt.Code = fmt.Sprintf("%s-%04d", prefix, next)
		r.Guesses = append(r.Guesses, "no code in the sheet; numbered "+r.Melt.Code)
		next++
	}
	return nil
}

// writeSheetReport prints how the sheet was read and each row's fate.
func writeSheetReport(w io.Writer, sh *runsheet.Sheet) error {
	delim := map[rune]string{',': "commas", ';': "semicolons", '\t': "tabs"}[sh.Delimiter]
	decimal := "decimal point"
	if sh.DecimalComma {
		decimal = "decimal comma or point"
	}
	fmt.Fprintf(w, "sheet %s: %s, cells separated by %s, %s, headings on line %d\n", sh.Name, sh.Encoding, delim, decimal, sh.HeadingLine)
	fmt.Fprintln(w, "columns:")
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	for _, c := range sh.Columns {
		heading := strconv.Quote(c.Heading)
		if c.Heading == "" {
			heading = "(no heading)"
		}
		switch {
		case c.Field == "":
			fmt.Fprintf(tw, "  %d\t%s\tnot read: %s\n", c.Number, heading, c.How)
		default:
			how := ""
			if c.How == "map" {
				how = " (--map)"
			}
			unit := ""
			if c.Unit != "" {
				unit = ", numbers in " + c.Unit
			}
			fmt.Fprintf(tw, "  %d\t%s\t-> %s%s%s\n", c.Number, heading, c.Field, unit, how)
		}
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	if sh.DatesWhy != "" {
		fmt.Fprintf(w, "dates: %s\n", sh.DatesWhy)
	}
	for _, n := range sh.Notes {
		fmt.Fprintf(w, "note: %s\n", n)
	}
	fmt.Fprintln(w, "rows:")
	for i := range sh.Rows {
		r := &sh.Rows[i]
		code := r.Melt.Code
		if code == "" {
			code = "(no code)"
		}
		if r.OK() {
			fmt.Fprintf(w, "  line %d  %s  taken: %s\n", r.Line, code, r.Summary())
			for _, g := range r.Guesses {
				fmt.Fprintf(w, "      guessed: %s\n", g)
			}
			continue
		}
		fmt.Fprintf(w, "  line %d  %s  refused:\n", r.Line, code)
		for _, p := range r.Problems {
			fmt.Fprintf(w, "      %s\n", p.Error())
		}
	}
	return nil
}

// writeSheetFields lists the fields a column can fill.
func writeSheetFields(w io.Writer) error {
	for _, f := range runsheet.Fields {
		what := ""
		if f.Unit != 0 {
			what = ", a " + f.Unit.String() + " with its unit"
		}
		if f.Required {
			what += ", required"
		}
		if _, err := fmt.Fprintf(w, "%s%s\n    %s\n    headings: %s\n", f.Key, what, f.Help, strings.Join(f.Headings, ", ")); err != nil {
			return err
		}
	}
	return nil
}

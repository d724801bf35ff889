package runsheet

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"sort"
	"strconv"
	"strings"
	"time"

	"meltbook"
)

// MaxBytes is the largest sheet Read accepts.
const MaxBytes = 32 << 20

// Options tune Read. The zero value reads a sheet named "sheet" with the
// delimiter detected, day/month order taken from the sheet, dates in UTC
// and no default operator.
type Options struct {
	// Name is the file name used in messages, e.g. "runs.csv".
	Name string
	// Delimiter separates cells: ',', ';' or '\t'; 0 detects it.
	Delimiter rune
	// Map assigns columns by hand: the key is a heading as written (compared
	// ignoring case, spaces and punctuation) or a 1-based column number; the
	// value is a field key, optionally with a unit as in a heading
	// ("thickness (um)"), or "-" to leave the column out.
	Map map[string]string
	// Fill gives a field's value for rows whose cell is empty or whose
	// sheet has no such column, e.g. "wheel-material" -> "Cu".
	Fill map[string]string
	// Dates says how to read dates such as 03/04/2026.
	Dates DateOrder
	// Location is the time zone of dates written without one; nil is UTC.
	Location *time.Location
	// Operator is recorded for rows that name no operator.
	Operator string
}

// Column is how one column of the sheet was read.
type Column struct {
	// Number is the 1-based column number.
	Number int
	// Heading is the heading as written.
	Heading string
	// Field is the key of the field the column fills; "" when unused.
	Field string
	// Unit is the unit the heading (or --map) gives its numbers, as written.
	Unit string
	// How says how the field was chosen ("heading", "map") or, for an
	// unused column, why it is not used.
	How string
}

// Problem is one reason a row was refused.
type Problem struct {
	Sheet string
	Line  int
	// Column is the heading as written, "--fill KEY" for a filled value,
	// or "" for the row as a whole.
	Column  string
	Message string
}

// Error returns e.g. `runs.csv line 14, column "Wheel speed": unknown unit "ft/s"`.
func (p Problem) Error() string {
	switch {
	case p.Column == "":
		return fmt.Sprintf("%s line %d: %s", p.Sheet, p.Line, p.Message)
	case strings.HasPrefix(p.Column, "--"):
		return fmt.Sprintf("%s line %d, %s: %s", p.Sheet, p.Line, p.Column, p.Message)
	}
	return fmt.Sprintf("%s line %d, column %q: %s", p.Sheet, p.Line, p.Column, p.Message)
}

// Row is one run of the sheet: the melt with its steps and outcomes as the
// store takes them, or the problems that refuse it.
type Row struct {
	// Line is the line of the sheet where the row starts.
	Line int
	// Melt is the melt; Melt.Code is empty when the sheet gave none.
	Melt meltbook.Melt
	// Steps are the steps done to the melt's own sample, in order: arc
	// melting, melt spinning, annealing, each when the sheet records it.
	Steps []meltbook.ProcessStep
	// Outcomes are the phases the sheet says were found, a person's.
	Outcomes []meltbook.Outcome
	// Guesses say what was read with some guessing, and what was left out.
	Guesses []string
	// Problems are why the row is refused; none when it can be taken.
	Problems []Problem

	sheet string
}

// OK reports whether the row can be taken.
func (r *Row) OK() bool { return len(r.Problems) == 0 }

// Refuse adds a problem about column (a heading, or "" for the row).
func (r *Row) Refuse(column, format string, args ...any) {
	r.Problems = append(r.Problems, Problem{Sheet: r.sheet, Line: r.Line, Column: column, Message: fmt.Sprintf(format, args...)})
}

func (r *Row) guess(format string, args ...any) {
	r.Guesses = append(r.Guesses, fmt.Sprintf(format, args...))
}

// Sheet is a run sheet as read: how its columns map to fields and each
// row's melt or problems.
type Sheet struct {
	Name      string
	Encoding  string
	Delimiter rune
	// DecimalComma is true when numbers may use a decimal comma (sheets
	// separated by semicolons or tabs).
	DecimalComma bool
	// HeadingLine is the line of the column headings.
	HeadingLine int
	Columns     []Column
	// Dates is the day/month order used for dates such as 03/04/2026, and
	// DatesWhy how it was chosen.
	Dates    DateOrder
	DatesWhy string
	// Notes are remarks on the sheet as a whole: lines above the headings,
	// fields filled for every row, missing columns.
	Notes []string
	Rows  []Row
	// Blank counts the empty rows skipped.
	Blank int
}

// Taken counts the rows that can be taken.
func (s *Sheet) Taken() int {
	n := 0
	for i := range s.Rows {
		if s.Rows[i].OK() {
			n++
		}
	}
	return n
}

// record is one CSV record with the line of each cell.
type record struct {
	cells []string
	lines []int
}

func (r record) blank() bool {
	for _, c := range r.cells {
		if strings.TrimSpace(c) != "" {
			return false
		}
	}
	return true
}

// Read reads a run sheet saved as CSV (comma, semicolon or tab separated;
// UTF-8 with or without byte-order mark, UTF-16 with one, or Windows-1252)
// and maps its columns to fields. Problems with a row are kept on the row;
// the error is for the sheet as a whole: unreadable text or CSV, no heading
// row naming the composition, two columns for one field, a unit in a
// heading that does not fit its field, or a bad Map or Fill. Errors are
// *meltbook.Error of kind Invalid.
func Read(r io.Reader, opt Options) (*Sheet, error) {
	if opt.Name == "" {
		opt.Name = "sheet"
	}
	if opt.Location == nil {
		opt.Location = time.UTC
	}
	raw, err := io.ReadAll(io.LimitReader(r, MaxBytes+1))
	if err != nil {
		return nil, meltbook.Errorf(meltbook.Invalid, opt.Name, "cannot read: %v", err)
	}
	if len(raw) > MaxBytes {
		return nil, meltbook.Errorf(meltbook.Invalid, opt.Name, "larger than %d MiB; split the sheet", MaxBytes>>20)
	}
	text, enc, ok := decode(raw)
	if !ok {
		return nil, meltbook.Errorf(meltbook.Invalid, opt.Name, "not readable as %s text; save the sheet as CSV UTF-8", enc)
	}
	if strings.ContainsRune(text, 0) {
		return nil, meltbook.Errorf(meltbook.Invalid, opt.Name, "holds NUL characters (UTF-16 without a byte-order mark, or not a text file); save the sheet as CSV UTF-8")
	}
	sh := &Sheet{Name: opt.Name, Encoding: enc, Delimiter: opt.Delimiter}
	switch sh.Delimiter {
	case 0:
		sh.Delimiter = detectDelimiter(text)
	case ',', ';', '\t':
	default:
		return nil, meltbook.Errorf(meltbook.Invalid, "delimiter", "%q is not a cell separator; use a comma, a semicolon or a tab", sh.Delimiter)
	}
	sh.DecimalComma = sh.Delimiter != ','

	records, err := readRecords(text, sh.Delimiter, opt.Name)
	if err != nil {
		return nil, err
	}
	b := &builder{sheet: sh, opt: opt}
	head, err := b.findHeadings(records)
	if err != nil {
		return nil, err
	}
	if err := b.mapColumns(records[head]); err != nil {
		return nil, err
	}
	if err := b.checkFill(); err != nil {
		return nil, err
	}
	b.chooseDateOrder(records[head+1:])
	for _, rec := range records[head+1:] {
		if rec.blank() {
			sh.Blank++
			continue
		}
		sh.Rows = append(sh.Rows, b.row(rec))
	}
	refuseDuplicateCodes(sh.Rows, b.heading("code"))
	return sh, nil
}

// readRecords splits the text into CSV records, keeping each cell's line.
func readRecords(text string, delim rune, name string) ([]record, error) {
	cr := csv.NewReader(strings.NewReader(text))
	cr.Comma = delim
	cr.FieldsPerRecord = -1
	cr.LazyQuotes = true
	var out []record
	for {
		cells, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				return nil, meltbook.Errorf(meltbook.Invalid, fmt.Sprintf("%s line %d", name, pe.Line), "%v", pe.Err)
			}
			return nil, meltbook.Errorf(meltbook.Invalid, name, "%v", err)
		}
		rec := record{cells: cells, lines: make([]int, len(cells))}
		for i := range cells {
			rec.lines[i], _ = cr.FieldPos(i)
		}
		out = append(out, rec)
	}
	return out, nil
}

// builder reads the rows of one sheet.
type builder struct {
	sheet *Sheet
	opt   Options
	// byField maps a field key to its column index.
	byField map[string]int
}

// mapSpec reads a Map value: a field key with an optional unit, or "-".
func mapSpec(spec string) (field, unit string, err error) {
	spec = strings.TrimSpace(spec)
	if spec == "-" || strings.EqualFold(spec, "skip") {
		return "", "", nil
	}
	words, unit := splitHeading(spec)
	f, ok := FieldByKey(strings.ReplaceAll(words, " ", "-"))
	if !ok {
		return "", "", fmt.Errorf("%q is not a field; the fields are %s", spec, FieldKeys())
	}
	if unit != "" && (f.Unit == 0 || !unitFits(unit, f.Unit)) {
		return "", "", fmt.Errorf("%q: %s is no unit of %s", spec, unit, f.Key)
	}
	return f.Key, unit, nil
}

// mapKeyMatches reports whether a Map key names the column.
func mapKeyMatches(key, heading string, number int) bool {
	if strings.TrimSpace(key) == strconv.Itoa(number) {
		return true
	}
	k := normaliseWords(key)
	if k == "" {
		return false
	}
	if k == normaliseWords(heading) {
		return true
	}
	words, _ := splitHeading(heading)
	return k == words
}

// findHeadings returns the index of the heading record: the first of the
// first 30 non-blank records with a column that names the composition.
func (b *builder) findHeadings(records []record) (int, error) {
	seen := 0
	for i, rec := range records {
		if rec.blank() {
			continue
		}
		if seen++; seen > 30 {
			break
		}
		for j, c := range rec.cells {
			if b.columnField(c, j+1) == "composition" {
				for k := 0; k < i; k++ {
					if !records[k].blank() {
						b.sheet.Notes = append(b.sheet.Notes, fmt.Sprintf("line %d is above the headings and is not read", records[k].lines[0]))
					}
				}
				b.sheet.HeadingLine = rec.lines[0]
				return i, nil
			}
		}
	}
	return 0, meltbook.Errorf(meltbook.Invalid, b.sheet.Name, "no heading row names the composition (e.g. a column headed \"composition\" or \"nominal\"); name the column with --map HEADING=composition")
}

// columnField returns the field a heading would map to, "" for none.
func (b *builder) columnField(heading string, number int) string {
	for _, key := range sortedKeys(b.opt.Map) {
		if mapKeyMatches(key, heading, number) {
			f, _, err := mapSpec(b.opt.Map[key])
			if err != nil {
				return ""
			}
			return f
		}
	}
	words, unit := splitHeading(heading)
	if i, ok, _ := fieldForHeading(words, unit); ok {
		return Fields[i].Key
	}
	return ""
}

func sortedKeys(m map[string]string) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return keys
}

// mapColumns decides each column's field.
func (b *builder) mapColumns(head record) error {
	sh := b.sheet
	used := map[string]bool{}
	for _, key := range sortedKeys(b.opt.Map) {
		if _, _, err := mapSpec(b.opt.Map[key]); err != nil {
			return meltbook.Errorf(meltbook.Invalid, "--map "+key, "%v", err)
		}
	}
	b.byField = map[string]int{}
	for j, h := range head.cells {
		col := Column{Number: j + 1, Heading: strings.TrimSpace(h)}
		mapped := false
		for _, key := range sortedKeys(b.opt.Map) {
			if mapKeyMatches(key, col.Heading, col.Number) {
				used[key] = true
				mapped = true
				col.Field, col.Unit, _ = mapSpec(b.opt.Map[key])
				if col.Field == "" {
					col.How = "left out by --map"
				} else {
					col.How = "map"
					if col.Unit == "" {
						_, col.Unit = splitHeading(col.Heading)
					}
				}
				break
			}
		}
		if !mapped {
			words, unit := splitHeading(col.Heading)
			switch i, ok, others := fieldForHeading(words, unit); {
			case col.Heading == "":
				col.How = "no heading"
			case len(others) > 0:
				col.How = fmt.Sprintf("could be %s; put the unit in the heading or choose with --map", strings.Join(others, " or "))
			case !ok:
				col.How = "no field has this heading"
			default:
				col.Field, col.Unit, col.How = Fields[i].Key, unit, "heading"
			}
		}
		if col.Field != "" {
			f, _ := FieldByKey(col.Field)
			if col.Unit != "" && (f.Unit == 0 || !unitFits(col.Unit, f.Unit)) {
				what := "takes no unit"
				if f.Unit != 0 {
					what = "is a " + f.Unit.String()
				}
				return meltbook.Errorf(meltbook.Invalid, fmt.Sprintf("%s line %d, column %q", sh.Name, head.lines[j], col.Heading),
					"unknown unit %q: %s %s; fix the heading or give --map %q", col.Unit, f.Key, what, col.Heading+"="+f.Key+" (UNIT)")
			}
			if prev, dup := b.byField[col.Field]; dup {
				return meltbook.Errorf(meltbook.Invalid, fmt.Sprintf("%s line %d", sh.Name, head.lines[j]),
					"columns %d %q and %d %q both give the %s; leave one out with --map %q", prev+1, sh.Columns[prev].Heading, j+1, col.Heading, col.Field, col.Heading+"=-")
			}
			b.byField[col.Field] = j
		}
		sh.Columns = append(sh.Columns, col)
	}
	for _, key := range sortedKeys(b.opt.Map) {
		if !used[key] {
			var hs []string
			for _, c := range sh.Columns {
				hs = append(hs, strconv.Quote(c.Heading))
			}
			return meltbook.Errorf(meltbook.Invalid, "--map "+key, "no column is headed %q; the headings are %s", key, strings.Join(hs, ", "))
		}
	}
	_, hasAnneal := b.byField["anneal"]
	_, hasT := b.byField["anneal-temperature"]
	_, hasTime := b.byField["anneal-time"]
	if hasT != hasTime {
		return meltbook.Errorf(meltbook.Invalid, sh.Name, "the anneal temperature and time come together: give both columns, or one anneal column such as \"800 °C 4 h\"")
	}
	if hasAnneal && hasT {
		b.sheet.Notes = append(b.sheet.Notes, "the anneal column and the anneal temperature and time columns are both read; a row may fill only one of them")
	}
	return nil
}

// checkFill checks the Fill values' keys and notes the fields no column
// gives.
func (b *builder) checkFill() error {
	for _, key := range sortedKeys(b.opt.Fill) {
		f, ok := FieldByKey(key)
		if !ok {
			return meltbook.Errorf(meltbook.Invalid, "--fill "+key, "%q is not a field; the fields are %s", key, FieldKeys())
		}
		if f.kind == codeCell {
			return meltbook.Errorf(meltbook.Invalid, "--fill "+key, "codes must differ from row to row; number rows without a code with a prefix instead")
		}
		if _, ok := b.byField[f.Key]; ok {
			b.sheet.Notes = append(b.sheet.Notes, fmt.Sprintf("%s: empty cells take %q (--fill)", f.Key, b.opt.Fill[key]))
		} else {
			b.sheet.Notes = append(b.sheet.Notes, fmt.Sprintf("%s: no column; every row takes %q (--fill)", f.Key, b.opt.Fill[key]))
		}
	}
	for _, f := range Fields {
		if _, ok := b.byField[f.Key]; ok {
			continue
		}
		if _, ok := b.opt.Fill[f.Key]; ok {
			continue
		}
		switch {
		case f.Required:
			return meltbook.Errorf(meltbook.Invalid, b.sheet.Name, "no column gives the %s (%s); add one, map one with --map HEADING=%s, or give one value for every row with --fill %s=VALUE", f.Key, f.Help, f.Key, f.Key)
		case f.Key == "code":
			b.sheet.Notes = append(b.sheet.Notes, "code: no column; rows need codes made from a prefix")
		case f.Key == "operator":
			if b.opt.Operator != "" {
				b.sheet.Notes = append(b.sheet.Notes, fmt.Sprintf("operator: no column; melts are recorded as made by %s", b.opt.Operator))
			}
		case f.Key == "date":
			b.sheet.Notes = append(b.sheet.Notes, "date: no column; melts are dated when they are imported")
		}
	}
	return nil
}

// chooseDateOrder settles the day/month order of dates like 03/04/2026.
func (b *builder) chooseDateOrder(rows []record) {
	sh := b.sheet
	sh.Dates = b.opt.Dates
	if sh.Dates != DateOrderFromSheet {
		sh.DatesWhy = "as asked"
		return
	}
	col, ok := b.byField["date"]
	if !ok {
		return
	}
	var dayFirst, monthFirst []int
	open := false
	for _, rec := range rows {
		if col >= len(rec.cells) {
			continue
		}
		p, err := splitDate(rec.cells[col])
		if err != nil {
			continue
		}
		switch p.evidence() {
		case DayFirst:
			dayFirst = append(dayFirst, rec.lines[col])
		case MonthFirst:
			monthFirst = append(monthFirst, rec.lines[col])
		}
		open = open || p.ambiguous()
	}
	lines := func(ls []int) string {
		var s []string
		for i, l := range ls {
			if i == 3 {
				s = append(s, "...")
				break
			}
			s = append(s, strconv.Itoa(l))
		}
		return strings.Join(s, ", ")
	}
	switch {
	case len(dayFirst) > 0 && len(monthFirst) > 0:
		sh.DatesWhy = fmt.Sprintf("the sheet has day/month dates (line %s) and month/day dates (line %s); dates that could be either are refused (give --dates)", lines(dayFirst), lines(monthFirst))
	case len(dayFirst) > 0:
		sh.Dates, sh.DatesWhy = DayFirst, fmt.Sprintf("day/month, as the dates on line %s show", lines(dayFirst))
	case len(monthFirst) > 0:
		sh.Dates, sh.DatesWhy = MonthFirst, fmt.Sprintf("month/day, as the dates on line %s show", lines(monthFirst))
	case open:
		sh.DatesWhy = "no date in the sheet shows whether 03/04 is day/month or month/day; such dates are refused (give --dates)"
	}
}

// refuseDuplicateCodes refuses every row whose code another row of the
// sheet also has (codes compared ignoring case).
func refuseDuplicateCodes(rows []Row, heading string) {
	lines := map[string][]int{}
	for _, r := range rows {
		if r.Melt.Code != "" {
			k := strings.ToLower(r.Melt.Code)
			lines[k] = append(lines[k], r.Line)
		}
	}
	for i := range rows {
		r := &rows[i]
		ls := lines[strings.ToLower(r.Melt.Code)]
		if r.Melt.Code == "" || len(ls) < 2 {
			continue
		}
		var others []string
		for _, l := range ls {
			if l != r.Line {
				others = append(others, strconv.Itoa(l))
			}
		}
		r.Refuse(heading, "code %s is also on line %s of the sheet; which row is right is not clear, so none is taken", r.Melt.Code, strings.Join(others, ", "))
	}
}

package element

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strconv"
	"strings"
)

// MaxSchemeValence bounds the magnitude of a valence in a scheme file; no
// element gives or takes more than ten electrons per atom.
const MaxSchemeValence = 10

// maxSchemeLine is the longest line a scheme file may have, in bytes.
const maxSchemeLine = 4096

// SchemeFileError reports a problem in a scheme file: which file, which
// line (from 1), and which whitespace-separated field (from 1; 0 when the
// problem concerns the whole line or file).
type SchemeFileError struct {
	File  string
	Line  int
	Field int
	Msg   string
}

func (e *SchemeFileError) Error() string {
	var b strings.Builder
	b.WriteString("scheme file ")
	b.WriteString(e.File)
	if e.Line > 0 {
		fmt.Fprintf(&b, ": line %d", e.Line)
		if e.Field > 0 {
			fmt.Fprintf(&b, ", field %d", e.Field)
		}
	}
	b.WriteString(": ")
	b.WriteString(e.Msg)
	return b.String()
}

// ReadScheme reads a valence scheme from a small text file. fileName is
// used in error messages and, when the file has no name line, as the
// scheme's name (without directory and extension).
//
// The format is line-oriented UTF-8 text. '#' starts a comment that runs to
// the end of the line; blank lines are ignored. Each remaining line is
// whitespace-separated fields and is one of:
//
//	base <scheme>          start from a built-in scheme ("group" or "raynor");
//	                       at most once, before any element line
//	name <word>            the scheme's name (one word, not a built-in name)
//	source <text...>       where the values come from
//	<Symbol> <valence> [note...]
//	                       set one element, e.g. "Pd -0.61 Raynor's Ni value";
//	                       the note, if any, is kept as that element's source
//
// Keywords are lower case; element symbols are case-sensitive ("Co"). An
// element line overrides the base scheme's value; an element may be set
// once per file. Valences are decimal numbers between −10 and 10. A file
// must have a base line or at least one element line. Example:
//
//	# Al-Pd-Re work: Re like Mn, Pd as Ni
//	name   alpdre
//	base   raynor
//	Pd     -0.61   Raynor's Ni value, homologue rule
//
// Errors are *SchemeFileError values naming file, line and field.
func ReadScheme(r io.Reader, fileName string) (Scheme, error) {
	p := schemeParser{file: fileName, setOn: map[string]int{}}
	sc := bufio.NewScanner(r)
	sc.Buffer(make([]byte, 0, 512), maxSchemeLine)
	for sc.Scan() {
		p.line++
		text := sc.Text()
		if p.line == 1 {
			text = strings.TrimPrefix(text, "\uFEFF")
		}
		if err := p.parseLine(text); err != nil {
			return Scheme{}, err
		}
	}
	if err := sc.Err(); err != nil {
		if errors.Is(err, bufio.ErrTooLong) {
			return Scheme{}, p.errorf(p.line+1, 0, "line longer than %d bytes", maxSchemeLine)
		}
		return Scheme{}, p.errorf(0, 0, "read: %v", err)
	}
	return p.finish()
}

type schemeParser struct {
	file   string
	line   int
	base   *Scheme
	name   string
	source string
	nameOn int
	srcOn  int
	baseOn int
	values map[string]float64
	notes  map[string]string
	setOn  map[string]int // symbol -> line it was set on
}

func (p *schemeParser) errorf(line, field int, format string, args ...any) error {
	return &SchemeFileError{File: p.file, Line: line, Field: field, Msg: fmt.Sprintf(format, args...)}
}

func (p *schemeParser) parseLine(text string) error {
	if i := strings.IndexByte(text, '#'); i >= 0 {
		text = text[:i]
	}
	fields := strings.Fields(text)
	if len(fields) == 0 {
		return nil
	}
	switch fields[0] {
	case "base":
		return p.parseBase(fields)
	case "name":
		return p.parseName(fields)
	case "source":
		if p.srcOn > 0 {
			return p.errorf(p.line, 1, "source already given on line %d", p.srcOn)
		}
		if len(fields) < 2 {
			return p.errorf(p.line, 0, "source needs a text after it")
		}
		p.srcOn = p.line
		p.source = strings.Join(fields[1:], " ")
		return nil
	}
	return p.parseElement(fields)
}

func (p *schemeParser) parseBase(fields []string) error {
	if p.baseOn > 0 {
		return p.errorf(p.line, 1, "base already given on line %d", p.baseOn)
	}
	if len(p.setOn) > 0 {
		return p.errorf(p.line, 1, "base must come before the element lines")
	}
	if len(fields) != 2 {
		return p.errorf(p.line, 0, "base takes one scheme name (%s), got %d fields", strings.Join(SchemeNames(), " or "), len(fields)-1)
	}
	s, ok := LookupScheme(fields[1])
	if !ok {
		return p.errorf(p.line, 2, "unknown base scheme %q (built-in schemes: %s)", fields[1], strings.Join(SchemeNames(), ", "))
	}
	p.baseOn = p.line
	p.base = &s
	return nil
}

func (p *schemeParser) parseName(fields []string) error {
	if p.nameOn > 0 {
		return p.errorf(p.line, 1, "name already given on line %d", p.nameOn)
	}
	if len(fields) != 2 {
		return p.errorf(p.line, 0, "name takes one word, got %d fields", len(fields)-1)
	}
	if _, builtIn := LookupScheme(fields[1]); builtIn {
		return p.errorf(p.line, 2, "name %q belongs to a built-in scheme; choose another", fields[1])
	}
	p.nameOn = p.line
	p.name = fields[1]
	return nil
}

func (p *schemeParser) parseElement(fields []string) error {
	sym := fields[0]
	if _, ok := BySymbol(sym); !ok {
		if sym == strings.ToLower(sym) {
			return p.errorf(p.line, 1, "unknown keyword %q (want base, name, source or an element symbol)", sym)
		}
		return p.errorf(p.line, 1, "unknown element %q (symbols are case-sensitive, e.g. Co)", sym)
	}
	if prev, dup := p.setOn[sym]; dup {
		return p.errorf(p.line, 1, "%s already set on line %d", sym, prev)
	}
	if len(fields) < 2 {
		return p.errorf(p.line, 0, "%s needs a valence after it", sym)
	}
	v, err := strconv.ParseFloat(fields[1], 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return p.errorf(p.line, 2, "valence %q is not a number", fields[1])
	}
	if math.Abs(v) > MaxSchemeValence {
		return p.errorf(p.line, 2, "valence %g outside −%d…%d", v, MaxSchemeValence, MaxSchemeValence)
	}
	if p.values == nil {
		p.values = map[string]float64{}
		p.notes = map[string]string{}
	}
	p.setOn[sym] = p.line
	p.values[sym] = v
	if len(fields) > 2 {
		p.notes[sym] = strings.Join(fields[2:], " ")
	}
	return nil
}

func (p *schemeParser) finish() (Scheme, error) {
	if p.base == nil && len(p.values) == 0 {
		return Scheme{}, p.errorf(0, 0, "no base line and no element lines")
	}
	var s Scheme
	if p.base != nil {
		s = *p.base
	} else {
		s = Scheme{Valence: map[string]float64{}}
	}
	if s.Notes == nil {
		s.Notes = map[string]string{}
	}
	for sym, v := range p.values {
		s.Valence[sym] = v
		if note, ok := p.notes[sym]; ok {
			s.Notes[sym] = note
		} else {
			s.Notes[sym] = "set in " + p.file
		}
	}
	s.Name = p.name
	if s.Name == "" {
		s.Name = schemeNameFromFile(p.file)
	}
	switch {
	case p.source != "":
		s.Source = p.source
	case p.base != nil:
		s.Source = fmt.Sprintf("scheme file %s on base %q (%s)", p.file, p.base.Name, p.base.Source)
	default:
		s.Source = "scheme file " + p.file
	}
	return s, nil
}

// schemeNameFromFile turns "dir/alpdre.txt" into "alpdre". A name that
// would be taken for a built-in scheme gets a "file:" prefix.
func schemeNameFromFile(file string) string {
	name := strings.TrimSuffix(filepath.Base(file), filepath.Ext(file))
	if name == "" || name == "." || name == string(filepath.Separator) {
		name = "unnamed"
	}
	if _, builtIn := LookupScheme(name); builtIn {
		name = "file:" + name
	}
	return name
}

// WriteScheme writes s in the scheme-file format that ReadScheme reads:
// a self-contained file (no base line) with every element's valence, in
// order of atomic number, and its note. A built-in scheme's name is left
// as a comment, since a file may not reuse it.
func WriteScheme(w io.Writer, s Scheme) error {
	bw := bufio.NewWriter(w)
	if _, builtIn := LookupScheme(s.Name); builtIn || s.Name == "" || strings.ContainsAny(s.Name, " \t#") {
		fmt.Fprintf(bw, "# copy of scheme %q; give it a name of your own with a name line\n", s.Name)
	} else {
		fmt.Fprintf(bw, "name %s\n", s.Name)
	}
	if src := oneLine(s.Source); src != "" {
		fmt.Fprintf(bw, "source %s\n", src)
	}
	for _, sym := range s.Symbols() {
		line := sym + " " + strconv.FormatFloat(s.Valence[sym], 'g', -1, 64)
		if note := oneLine(s.Notes[sym]); note != "" {
			line += " " + note
		}
		fmt.Fprintln(bw, line)
	}
	return bw.Flush()
}

// oneLine makes text safe for the tail of a scheme-file line: no line
// breaks, no '#' (which would start a comment), single spaces.
func oneLine(text string) string {
	return strings.Join(strings.Fields(strings.ReplaceAll(text, "#", " ")), " ")
}

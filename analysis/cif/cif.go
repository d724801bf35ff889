package cif

import (
	"fmt"
	"strings"
)

// Error is a syntax error at a place in a CIF file.
type Error struct {
	File string
	Line int // 1-based, 0 when the fault concerns the whole file
	Col  int // 1-based byte column, 0 when none applies
	Msg  string
}

func (e *Error) Error() string {
	switch {
	case e.Line == 0:
		return fmt.Sprintf("%s: %s", e.File, e.Msg)
	case e.Col == 0:
		return fmt.Sprintf("%s:%d: %s", e.File, e.Line, e.Msg)
	}
	return fmt.Sprintf("%s:%d:%d: %s", e.File, e.Line, e.Col, e.Msg)
}

// Value is one value with its place in the file. Quoted is true for a
// value in quotes or a text field, which is never unknown or a number
// marker.
type Value struct {
	Text   string
	Quoted bool
	Line   int
	Col    int
}

// Unknown reports whether the value is CIF's "?" (unknown) or "."
// (inapplicable), unquoted.
func (v Value) Unknown() bool { return !v.Quoted && (v.Text == "?" || v.Text == ".") }

// Loop is one loop_ of a data block: its tags (lower case) and its values,
// row by row.
type Loop struct {
	Line, Col int
	Tags      []string
	Rows      [][]Value
}

// Column returns the index of the first of the tags (alternative names,
// case-insensitive) that the loop has, with the tag found; -1 and "" when
// it has none.
func (lp *Loop) Column(tags ...string) (int, string) {
	for _, want := range tags {
		want = strings.ToLower(want)
		for i, t := range lp.Tags {
			if t == want {
				return i, t
			}
		}
	}
	return -1, ""
}

// Block is one data block: its name, its single items by lower-case tag
// and its loops.
type Block struct {
	Name      string
	Line, Col int
	Items     map[string]Value
	Loops     []*Loop
}

// Item returns the value of the first of the tags (alternative names such
// as the new and the old dictionary name, case-insensitive) that the block
// gives, as a single item or as a loop of one row, with the tag found.
func (b *Block) Item(tags ...string) (Value, string, bool) {
	for _, t := range tags {
		t = strings.ToLower(t)
		if v, ok := b.Items[t]; ok {
			return v, t, true
		}
		for _, lp := range b.Loops {
			if c, _ := lp.Column(t); c >= 0 && len(lp.Rows) == 1 {
				return lp.Rows[0][c], t, true
			}
		}
	}
	return Value{}, "", false
}

// Loop returns the first loop that has one of the tags, with the column
// and the tag found; nil when none has.
func (b *Block) Loop(tags ...string) (*Loop, int, string) {
	for _, t := range tags {
		for _, lp := range b.Loops {
			if c, tag := lp.Column(t); c >= 0 {
				return lp, c, tag
			}
		}
	}
	return nil, -1, ""
}

// tokenKind classifies a CIF token.
type tokenKind int

const (
	tokEOF    tokenKind = iota
	tokTag              // _name
	tokValue            // unquoted, quoted or text-field value
	tokData             // data_name
	tokLoop             // loop_
	tokSave             // save_name, or save_ ending a frame
	tokGlobal           // global_
	tokStop             // stop_
)

// token is one CIF token with its position.
type token struct {
	kind tokenKind
	val  Value // tag name (lower case), value (quotes removed) or block name
}

// lexer splits CIF text into tokens following the CIF 1.1 syntax.
type lexer struct {
	file string
	data []byte
	i    int
	line int
	col  int // 1-based column of data[i]
}

func (l *lexer) errAt(v Value, format string, args ...any) error {
	return &Error{File: l.file, Line: v.Line, Col: v.Col, Msg: fmt.Sprintf(format, args...)}
}

// advance moves past one byte, counting lines; CRLF and CR end a line
// like LF.
func (l *lexer) advance() {
	c := l.data[l.i]
	l.i++
	switch {
	case c == '\n' || c == '\r' && (l.i == len(l.data) || l.data[l.i] != '\n'):
		l.line++
		l.col = 1
	default:
		l.col++
	}
}

func isSpace(c byte) bool { return c == ' ' || c == '\t' || c == '\n' || c == '\r' }

// next returns the next token.
func (l *lexer) next() (token, error) {
	for l.i < len(l.data) {
		c := l.data[l.i]
		switch {
		case isSpace(c):
			l.advance()
			continue
		case c == '#':
			for l.i < len(l.data) && l.data[l.i] != '\n' && l.data[l.i] != '\r' {
				l.advance()
			}
			continue
		}
		break
	}
	at := Value{Line: l.line, Col: l.col}
	if l.i == len(l.data) {
		return token{kind: tokEOF, val: at}, nil
	}
	switch c := l.data[l.i]; {
	case c == ';' && l.col == 1:
		return l.textField(at)
	case c == '\'' || c == '"':
		return l.quotedValue(at, c)
	}
	from := l.i
	for l.i < len(l.data) && !isSpace(l.data[l.i]) {
		l.advance()
	}
	word := string(l.data[from:l.i])
	lower := strings.ToLower(word)
	kind := tokValue
	at.Text = word
	switch {
	case word[0] == '_':
		kind, at.Text = tokTag, lower
	case strings.HasPrefix(lower, "data_"):
		if len(word) == len("data_") {
			return token{}, l.errAt(at, "data_ needs a block name")
		}
		kind, at.Text = tokData, word[5:]
	case lower == "loop_":
		kind = tokLoop
	case strings.HasPrefix(lower, "save_"):
		kind, at.Text = tokSave, word[5:]
	case lower == "global_":
		kind = tokGlobal
	case lower == "stop_":
		kind = tokStop
	}
	return token{kind: kind, val: at}, nil
}

// quotedValue reads a value in quotes q. The value ends at a q that is
// followed by white space or the end of the file; it may not span lines.
func (l *lexer) quotedValue(at Value, q byte) (token, error) {
	l.advance()
	from := l.i
	for l.i < len(l.data) {
		c := l.data[l.i]
		if c == '\n' || c == '\r' {
			break
		}
		if c == q && (l.i+1 == len(l.data) || isSpace(l.data[l.i+1])) {
			at.Text, at.Quoted = string(l.data[from:l.i]), true
			l.advance()
			return token{kind: tokValue, val: at}, nil
		}
		l.advance()
	}
	return token{}, l.errAt(at, "quoted value not closed on its line (%c)", q)
}

// textField reads a semicolon-delimited text field: from a ';' at the start
// of a line to the next line that starts with ';'.
func (l *lexer) textField(at Value) (token, error) {
	l.advance()
	var b strings.Builder
	for l.i < len(l.data) {
		c := l.data[l.i]
		l.advance()
		if (c == '\n' || c == '\r') && l.i < len(l.data) && l.data[l.i] == ';' && l.col == 1 {
			l.advance()
			at.Text, at.Quoted = b.String(), true
			return token{kind: tokValue, val: at}, nil
		}
		if c == '\r' && l.i < len(l.data) && l.data[l.i] == '\n' {
			continue
		}
		b.WriteByte(c)
	}
	return token{}, l.errAt(at, "text field opened with ';' is never closed by a line starting with ';'")
}

// Parse reads every data block of a CIF file; file names it in errors.
// Save frames are read for syntax and then left out. A tag given twice in
// a block, a loop whose values are not a whole number of rows, global_ and
// stop_ are refused.
//
// Reference: IUCr, CIF 1.1 syntax specification.
func Parse(file string, data []byte) ([]*Block, error) {
	lx := &lexer{file: file, data: data, line: 1, col: 1}
	var (
		blocks []*Block
		cur    *Block
		inSave bool
		seen   map[string]Value
	)
	tok, err := lx.next()
	for err == nil && tok.kind != tokEOF {
		switch tok.kind {
		case tokData:
			if inSave {
				return nil, lx.errAt(tok.val, "data_%s inside a save frame", tok.val.Text)
			}
			cur = &Block{Name: tok.val.Text, Line: tok.val.Line, Col: tok.val.Col, Items: map[string]Value{}}
			seen = map[string]Value{}
			blocks = append(blocks, cur)
			tok, err = lx.next()
		case tokSave:
			if cur == nil {
				return nil, lx.errAt(tok.val, "save frame outside a data block")
			}
			if tok.val.Text == "" != inSave {
				if inSave {
					return nil, lx.errAt(tok.val, "save_%s inside another save frame", tok.val.Text)
				}
				return nil, lx.errAt(tok.val, "save_ closes no save frame")
			}
			inSave = !inSave
			tok, err = lx.next()
		case tokGlobal:
			return nil, lx.errAt(tok.val, "global_ blocks are not allowed in CIF")
		case tokStop:
			return nil, lx.errAt(tok.val, "stop_ is not allowed in CIF")
		case tokValue:
			return nil, lx.errAt(tok.val, "value %q has no tag before it", clip(tok.val.Text))
		case tokTag, tokLoop:
			if cur == nil {
				return nil, lx.errAt(tok.val, "data item before the first data_ block header")
			}
			var target *Block
			if !inSave {
				target = cur
			}
			if tok.kind == tokTag {
				tok, err = parseItem(lx, tok, target, seen)
			} else {
				tok, err = parseLoop(lx, tok, target, seen)
			}
		}
	}
	if err != nil {
		return nil, err
	}
	if inSave {
		return nil, lx.errAt(tok.val, "save frame not closed by save_")
	}
	if len(blocks) == 0 {
		return nil, &Error{File: file, Msg: "no data_ block header: not a CIF file"}
	}
	return blocks, nil
}

// parseItem reads the value of tag and returns the token after it. target
// is nil inside save frames.
func parseItem(lx *lexer, tag token, target *Block, seen map[string]Value) (token, error) {
	val, err := lx.next()
	if err != nil {
		return token{}, err
	}
	if val.kind != tokValue {
		return token{}, lx.errAt(tag.val, "tag _%s has no value", tag.val.Text[1:])
	}
	if target != nil {
		if p, dup := seen[tag.val.Text]; dup {
			return token{}, lx.errAt(tag.val, "tag %s given twice in data_%s (first on line %d)", tag.val.Text, target.Name, p.Line)
		}
		seen[tag.val.Text] = tag.val
		target.Items[tag.val.Text] = val.val
	}
	return lx.next()
}

// parseLoop reads a loop_ and returns the token after it.
func parseLoop(lx *lexer, loopTok token, target *Block, seen map[string]Value) (token, error) {
	lp := &Loop{Line: loopTok.val.Line, Col: loopTok.val.Col}
	tok, err := lx.next()
	for err == nil && tok.kind == tokTag {
		if target != nil {
			if p, dup := seen[tok.val.Text]; dup {
				return token{}, lx.errAt(tok.val, "tag %s given twice in data_%s (first on line %d)", tok.val.Text, target.Name, p.Line)
			}
			seen[tok.val.Text] = tok.val
		}
		lp.Tags = append(lp.Tags, tok.val.Text)
		tok, err = lx.next()
	}
	if err != nil {
		return token{}, err
	}
	if len(lp.Tags) == 0 {
		return token{}, lx.errAt(loopTok.val, "loop_ without tags")
	}
	var row []Value
	n := 0
	for tok.kind == tokValue {
		row = append(row, tok.val)
		n++
		if len(row) == len(lp.Tags) {
			lp.Rows = append(lp.Rows, row)
			row = nil
		}
		if tok, err = lx.next(); err != nil {
			return token{}, err
		}
	}
	if n == 0 {
		return token{}, lx.errAt(loopTok.val, "loop_ has tags but no values")
	}
	if len(row) != 0 {
		return token{}, lx.errAt(loopTok.val, "loop_ has %d values for %d tags: not a whole number of rows (last row short by %d; check line %d)",
			n, len(lp.Tags), len(lp.Tags)-len(row), row[0].Line)
	}
	if target != nil {
		target.Loops = append(target.Loops, lp)
	}
	return tok, nil
}

// clip shortens long text for messages.
func clip(s string) string {
	if len(s) > 40 {
		return s[:37] + "..."
	}
	return s
}

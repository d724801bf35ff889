package scanfile

import (
	"fmt"
	"strings"
)

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
	kind   tokenKind
	text   string // tag name, value (quotes removed) or block name
	quoted bool   // value came from quotes or a text field
	pos    pos
}

// cifLexer splits CIF text into tokens following the CIF 1.1 syntax.
type cifLexer struct {
	file string
	data []byte
	i    int
	line int
	col  int // 1-based column of data[i]
}

func newLexer(file string, data []byte) *cifLexer {
	return &cifLexer{file: file, data: data, line: 1, col: 1}
}

func (l *cifLexer) errAt(p pos, format string, args ...any) error {
	return &Error{File: l.file, Line: p.line, Column: p.col, Err: ErrSyntax, Msg: fmt.Sprintf(format, args...)}
}

// advance moves past one byte, counting lines; CRLF and CR end a line
// like LF.
func (l *cifLexer) advance() {
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
func (l *cifLexer) next() (token, error) {
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
	start := pos{l.line, l.col}
	if l.i == len(l.data) {
		return token{kind: tokEOF, pos: start}, nil
	}
	switch c := l.data[l.i]; {
	case c == ';' && l.col == 1:
		return l.textField(start)
	case c == '\'' || c == '"':
		return l.quotedValue(start, c)
	}
	from := l.i
	for l.i < len(l.data) && !isSpace(l.data[l.i]) {
		l.advance()
	}
	word := string(l.data[from:l.i])
	lower := strings.ToLower(word)
	switch {
	case word[0] == '_':
		return token{kind: tokTag, text: lower, pos: start}, nil
	case strings.HasPrefix(lower, "data_"):
		if len(word) == len("data_") {
			return token{}, l.errAt(start, "data_ needs a block name")
		}
		return token{kind: tokData, text: word[5:], pos: start}, nil
	case lower == "loop_":
		return token{kind: tokLoop, pos: start}, nil
	case strings.HasPrefix(lower, "save_"):
		return token{kind: tokSave, text: word[5:], pos: start}, nil
	case lower == "global_":
		return token{kind: tokGlobal, pos: start}, nil
	case lower == "stop_":
		return token{kind: tokStop, pos: start}, nil
	}
	return token{kind: tokValue, text: word, pos: start}, nil
}

// quotedValue reads a value in quotes q. The value ends at a q that is
// followed by white space or the end of the file; it may not span lines.
func (l *cifLexer) quotedValue(start pos, q byte) (token, error) {
	l.advance()
	from := l.i
	for l.i < len(l.data) {
		c := l.data[l.i]
		if c == '\n' || c == '\r' {
			break
		}
		if c == q && (l.i+1 == len(l.data) || isSpace(l.data[l.i+1])) {
			text := string(l.data[from:l.i])
			l.advance()
			return token{kind: tokValue, text: text, quoted: true, pos: start}, nil
		}
		l.advance()
	}
	return token{}, l.errAt(start, "quoted value not closed on its line (%c)", q)
}

// textField reads a semicolon-delimited text field: from a ';' at the start
// of a line to the next line that starts with ';'.
func (l *cifLexer) textField(start pos) (token, error) {
	l.advance()
	var b strings.Builder
	for l.i < len(l.data) {
		c := l.data[l.i]
		l.advance()
		if (c == '\n' || c == '\r') && l.i < len(l.data) && l.data[l.i] == ';' && l.col == 1 {
			l.advance()
			return token{kind: tokValue, text: b.String(), quoted: true, pos: start}, nil
		}
		if c == '\r' && l.i < len(l.data) && l.data[l.i] == '\n' {
			continue
		}
		b.WriteByte(c)
	}
	return token{}, l.errAt(start, "text field opened with ';' is never closed by a line starting with ';'")
}

// cifLoop is one loop_ of a data block: its tags and its values, row by row.
type cifLoop struct {
	at   pos
	tags []string
	rows [][]token
}

// column returns the index of tag in the loop, or -1.
func (lp *cifLoop) column(tag string) int {
	for i, t := range lp.tags {
		if t == tag {
			return i
		}
	}
	return -1
}

// cifBlock is one data block.
type cifBlock struct {
	name  string
	items map[string]token
	loops []*cifLoop
}

// parseCIF reads every data block of a CIF file. Save frames are read for
// syntax and then left out.
func parseCIF(file string, data []byte) ([]*cifBlock, error) {
	lx := newLexer(file, data)
	var (
		blocks []*cifBlock
		cur    *cifBlock
		inSave bool
		seen   map[string]pos
	)
	tok, err := lx.next()
	for err == nil && tok.kind != tokEOF {
		switch tok.kind {
		case tokData:
			if inSave {
				return nil, lx.errAt(tok.pos, "data_%s inside a save frame", tok.text)
			}
			cur = &cifBlock{name: tok.text, items: map[string]token{}}
			seen = map[string]pos{}
			blocks = append(blocks, cur)
			tok, err = lx.next()
		case tokSave:
			if cur == nil {
				return nil, lx.errAt(tok.pos, "save frame outside a data block")
			}
			if tok.text == "" != inSave {
				if inSave {
					return nil, lx.errAt(tok.pos, "save_%s inside another save frame", tok.text)
				}
				return nil, lx.errAt(tok.pos, "save_ closes no save frame")
			}
			inSave = !inSave
			tok, err = lx.next()
		case tokGlobal:
			return nil, lx.errAt(tok.pos, "global_ blocks are not allowed in CIF")
		case tokStop:
			return nil, lx.errAt(tok.pos, "stop_ is not allowed in CIF")
		case tokValue:
			return nil, lx.errAt(tok.pos, "value %q has no tag before it", clip(tok.text))
		case tokTag, tokLoop:
			if cur == nil {
				return nil, lx.errAt(tok.pos, "data item before the first data_ block header")
			}
			var target *cifBlock
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
		return nil, lx.errAt(tok.pos, "save frame not closed by save_")
	}
	if len(blocks) == 0 {
		return nil, &Error{File: file, Err: ErrSyntax, Msg: "no data_ block header: not a CIF file"}
	}
	return blocks, nil
}

// parseItem reads the value of tag and returns the token after it. target
// is nil inside save frames.
func parseItem(lx *cifLexer, tag token, target *cifBlock, seen map[string]pos) (token, error) {
	val, err := lx.next()
	if err != nil {
		return token{}, err
	}
	if val.kind != tokValue {
		return token{}, lx.errAt(tag.pos, "tag _%s has no value", tag.text[1:])
	}
	if target != nil {
		if p, dup := seen[tag.text]; dup {
			return token{}, lx.errAt(tag.pos, "tag %s given twice in data_%s (first on line %d)", tag.text, target.name, p.line)
		}
		seen[tag.text] = tag.pos
		target.items[tag.text] = val
	}
	return lx.next()
}

// parseLoop reads a loop_ and returns the token after it.
func parseLoop(lx *cifLexer, loopTok token, target *cifBlock, seen map[string]pos) (token, error) {
	lp := &cifLoop{at: loopTok.pos}
	tok, err := lx.next()
	for err == nil && tok.kind == tokTag {
		if target != nil {
			if p, dup := seen[tok.text]; dup {
				return token{}, lx.errAt(tok.pos, "tag %s given twice in data_%s (first on line %d)", tok.text, target.name, p.line)
			}
			seen[tok.text] = tok.pos
		}
		lp.tags = append(lp.tags, tok.text)
		tok, err = lx.next()
	}
	if err != nil {
		return token{}, err
	}
	if len(lp.tags) == 0 {
		return token{}, lx.errAt(loopTok.pos, "loop_ without tags")
	}
	var row []token
	n := 0
	for tok.kind == tokValue {
		row = append(row, tok)
		n++
		if len(row) == len(lp.tags) {
			lp.rows = append(lp.rows, row)
			row = nil
		}
		if tok, err = lx.next(); err != nil {
			return token{}, err
		}
	}
	if n == 0 {
		return token{}, lx.errAt(loopTok.pos, "loop_ has tags but no values")
	}
	if len(row) != 0 {
		return token{}, lx.errAt(loopTok.pos, "loop_ has %d values for %d tags: not a whole number of rows (last row short by %d; check line %d)",
			n, len(lp.tags), len(lp.tags)-len(row), row[0].pos.line)
	}
	if target != nil {
		target.loops = append(target.loops, lp)
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

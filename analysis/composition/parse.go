package composition

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"

	"meltbook/analysis/element"
)

// Basis says what the written amounts measure.
type Basis uint8

const (
	// Atomic amounts count atoms (at%, mole fractions).
	Atomic Basis = iota
	// Weight amounts measure mass (wt%, mass fractions).
	Weight
)

// String returns "atomic" or "weight".
func (b Basis) String() string {
	switch b {
	case Atomic:
		return "atomic"
	case Weight:
		return "weight"
	}
	return "Basis(" + strconv.Itoa(int(b)) + ")"
}

// Notation says how the top level of a composition was written.
type Notation uint8

const (
	// Formula lists elements each followed by its amount: Al63Cu25Fe12.
	Formula Notation = iota
	// Balance names the balance element first and the others after "-"
	// with their amounts before them: Al-25Cu-12Fe.
	Balance
)

// String returns "formula" or "balance".
func (n Notation) String() string {
	switch n {
	case Formula:
		return "formula"
	case Balance:
		return "balance"
	}
	return "Notation(" + strconv.Itoa(int(n)) + ")"
}

// Scale says how the written amounts of the top level were read.
type Scale uint8

const (
	// Percent amounts total about 100 (written total of 50 or more).
	Percent Scale = iota
	// Fractions total about 1 (written total of 1.5 or less).
	Fractions
	// Proportions are formula units or other parts, such as Al2Cu or
	// Al13Fe4 (written total between 1.5 and 50).
	Proportions
)

// String returns "percent", "fractions" or "proportions".
func (s Scale) String() string {
	switch s {
	case Percent:
		return "percent"
	case Fractions:
		return "fractions"
	case Proportions:
		return "proportions"
	}
	return "Scale(" + strconv.Itoa(int(s)) + ")"
}

// Options tune ParseWith.
type Options struct {
	// Basis is assumed when the text carries no unit suffix; a written
	// "at%" or "wt%" always wins.
	Basis Basis
}

// Parsed is a parsed composition together with how it was written.
type Parsed struct {
	// Atomic holds the normalised atomic fractions in the order the
	// elements were first written.
	Atomic Composition
	// Written holds the normalised fractions on the written basis: weight
	// fractions when Basis is Weight, otherwise the same slice as Atomic.
	Written Composition
	// Entered is the input exactly as given.
	Entered string
	// Basis is the basis of the written amounts.
	Basis Basis
	// Notation is how the top level was written.
	Notation Notation
	// Scale is how the top-level amounts were read.
	Scale Scale
	// Total is the sum of the top-level amounts as written, in the unit
	// written: 100 for Al63Cu25Fe12 and for any balance notation, 1 for
	// Al0.63Cu0.25Fe0.12, 3 for Al2Cu. A group counts with its own amount.
	Total float64
	// Warnings describe what was accepted but looks doubtful: totals off
	// their scale, repeated elements, zero amounts, letters that read as
	// two one-letter symbols.
	Warnings []string
}

// ParseError reports text that is not a composition. Pos is the 0-based
// byte offset in Input where the trouble was found (len(Input) when the
// text ended too soon).
type ParseError struct {
	Input string
	Pos   int
	// Expected says what would have been accepted at Pos.
	Expected string
	// Problem says what is wrong when that is more than a missing token;
	// it is empty when Expected alone explains the error.
	Problem string
}

// Error returns e.g.
//
//	composition "Al-25Cu-" at position 8: expected an amount and element after "-"
func (e *ParseError) Error() string {
	msg := e.Problem
	if msg == "" {
		msg = "expected " + e.Expected
	}
	return "composition " + strconv.Quote(e.Input) + " at position " + strconv.Itoa(e.Pos) + ": " + msg
}

// Parse reads a composition written as an at% or fraction formula, in
// balance notation, with groups, and with an optional at% or wt% suffix;
// see the package documentation for the notations and their exact
// meaning. Unsuffixed amounts are atomic. Errors are *ParseError.
func Parse(s string) (Parsed, error) {
	return ParseWith(s, Options{})
}

// ParseWith is Parse with options; opt.Basis applies to text with no
// unit suffix.
func ParseWith(s string, opt Options) (Parsed, error) {
	p := parser{s: s, lastSymbolEnd: -1}
	out, perr := p.parse(opt)
	if perr != nil {
		return Parsed{Entered: s}, perr
	}
	return out, nil
}

// maxDepth bounds group nesting.
const maxDepth = 16

// entry is one written element, its amount scaled through the groups
// that enclose it.
type entry struct {
	symbol string
	weight float64 // standard atomic weight, g/mol
	amount float64
	pos    int // byte offset of the symbol
	list   int // id of the list the symbol was written in directly
}

type parser struct {
	s string
	i int
	// The entries live in small until it is full, then in more; all
	// returns them. Keeping them in the parser value lets the common case
	// run without allocating.
	small    [16]entry
	n        int
	more     []entry
	lists    int
	warnings []string
	// lastSymbolEnd and lastSymbolShort track the previous symbol so that
	// "CU" (C then U) can be flagged.
	lastSymbolEnd   int
	lastSymbolShort bool
}

// listInfo describes one parsed list of terms (the top level or the
// inside of a group).
type listInfo struct {
	total    float64
	notation Notation
	scale    Scale
}

func (p *parser) all() []entry {
	if p.more != nil {
		return p.more
	}
	return p.small[:p.n]
}

func (p *parser) add(e entry) {
	if p.more == nil && p.n < len(p.small) {
		p.small[p.n] = e
		p.n++
		return
	}
	if p.more == nil {
		p.more = append(make([]entry, 0, 4*len(p.small)), p.small[:p.n]...)
	}
	p.more = append(p.more, e)
}

func (p *parser) fail(pos int, expected, problem string) *ParseError {
	return &ParseError{Input: p.s, Pos: pos, Expected: expected, Problem: problem}
}

func (p *parser) warn(format string, args ...any) {
	p.warnings = append(p.warnings, fmt.Sprintf(format, args...))
}

func (p *parser) parse(opt Options) (Parsed, *ParseError) {
	p.space()
	if p.i == len(p.s) {
		return Parsed{}, p.fail(p.i, `an element symbol or "("`, "empty composition; write e.g. Al63Cu25Fe12 or Al-25Cu-12Fe")
	}
	if unitAt(p.s[p.i:]) > 0 {
		return Parsed{}, p.fail(p.i, `an element symbol or "("`, "a unit with no composition before it")
	}
	start := p.i
	top, err := p.list(0, -1)
	if err != nil {
		return Parsed{}, err
	}
	p.space()
	basis := opt.Basis
	if p.i < len(p.s) {
		switch c := p.s[p.i]; {
		case c == ')':
			return Parsed{}, p.fail(p.i, "an element symbol, a unit or the end", `")" has no matching "("`)
		case c == '%':
			return Parsed{}, p.fail(p.i, "at% or wt%", `a bare "%" does not say whether it is at% or wt%`)
		}
		// The list stops only at the end, ")", "%" or a unit, so what is
		// left here is a unit.
		if p.s[p.i] == 'w' || p.s[p.i] == 'm' {
			basis = Weight
		} else {
			basis = Atomic
		}
		p.i += unitAt(p.s[p.i:])
		p.space()
		if p.i < len(p.s) {
			return Parsed{}, p.unexpected("the end after the unit")
		}
	}
	written, err := p.merge(start)
	if err != nil {
		return Parsed{}, err
	}
	out := Parsed{
		Atomic:   written,
		Written:  written,
		Entered:  p.s,
		Basis:    basis,
		Notation: top.notation,
		Scale:    top.scale,
		Total:    top.total,
		Warnings: p.warnings,
	}
	if basis == Weight {
		out.Atomic = weightToAtomic(written, p.all())
	}
	return out, nil
}

// merge adds repeated elements at their first position with a positive
// amount, drops zero amounts and normalises; start is where the
// expression begins, blamed when nothing is left.
func (p *parser) merge(start int) (Composition, *ParseError) {
	entries := p.all()
	n := 0
	for k, e := range entries {
		if e.amount > 0 && !seenBefore(entries, k) {
			n++
		}
	}
	if n == 0 {
		return nil, p.fail(start, "at least one positive amount", "the amounts total 0; at least one must be positive")
	}
	out := make(Composition, 0, n)
	var sum float64
	for k, e := range entries {
		if e.amount == 0 {
			continue
		}
		sum += e.amount
		if !seenBefore(entries, k) {
			out = append(out, Part{Element: e.symbol, Fraction: e.amount})
			continue
		}
		for j := range out {
			if out[j].Element == e.symbol {
				out[j].Fraction += e.amount
				break
			}
		}
	}
	for j := range out {
		out[j].Fraction /= sum
	}
	return out, nil
}

// seenBefore reports whether an entry before k with a positive amount has
// the symbol of entry k.
func seenBefore(entries []entry, k int) bool {
	for _, e := range entries[:k] {
		if e.amount > 0 && e.symbol == entries[k].symbol {
			return true
		}
	}
	return false
}

// weightToAtomic converts normalised weight fractions to atomic ones with
// the weights carried by the entries: x_i = (w_i/M_i) / Σ_j (w_j/M_j).
func weightToAtomic(w Composition, entries []entry) Composition {
	out := make(Composition, len(w))
	var sum float64
	for j, q := range w {
		var m float64
		for _, e := range entries {
			if e.symbol == q.Element {
				m = e.weight
				break
			}
		}
		out[j] = Part{Element: q.Element, Fraction: q.Fraction / m}
		sum += out[j].Fraction
	}
	for j := range out {
		out[j].Fraction /= sum
	}
	return out
}

// list parses terms until ")" or the end of the expression. Each term's
// entries sum to 1 when the term is read and are then scaled by its
// amount, so after list returns the entries it added sum to its total.
// groupPos is the position of the enclosing "(" or -1 at the top level.
func (p *parser) list(depth, groupPos int) (listInfo, *ParseError) {
	id := p.lists
	p.lists++
	first := len(p.all())
	p.space()
	if p.atListEnd() {
		return listInfo{}, p.expectTerm("an element symbol or \"(\"")
	}
	termPos := p.i
	lo, err := p.term(depth, id, first)
	if err != nil {
		return listInfo{}, err
	}
	p.space()
	if dashAt(p.s[p.i:]) > 0 {
		return p.balance(depth, id, first, lo, termPos, groupPos)
	}
	var info listInfo
	whole := true
	for {
		amount, written, err := p.amount()
		if err != nil {
			return listInfo{}, err
		}
		if !written {
			amount = 1
		} else if amount != math.Trunc(amount) {
			whole = false
		}
		p.scale(lo, amount)
		if written && amount == 0 {
			p.warn("%s at position %d has amount 0 and is left out", p.describeTerm(termPos, lo), termPos)
		}
		info.total += amount
		p.space()
		if p.atListEnd() {
			break
		}
		if dashAt(p.s[p.i:]) > 0 {
			return listInfo{}, p.fail(p.i, `an element symbol, "(" or the end`,
				`unexpected "-": amounts cannot be negative, and balance notation such as Al-25Cu-12Fe starts with an element that has no amount`)
		}
		termPos = p.i
		lo, err = p.term(depth, id, first)
		if err != nil {
			return listInfo{}, err
		}
		p.space()
	}
	if math.IsInf(info.total, 0) {
		return listInfo{}, p.fail(termPos, "smaller amounts", "the amounts are too large to add up")
	}
	info.notation = Formula
	info.scale = p.classify(info.total, whole, groupPos)
	return info, nil
}

// balance parses the rest of a balance list, "-25Cu-12Fe", after its
// first term (entries from lo on) and gives that term 100 minus the rest.
func (p *parser) balance(depth, id, first, lo, basePos, groupPos int) (listInfo, *ParseError) {
	baseEnd := len(p.all())
	var rest float64
	for {
		n := dashAt(p.s[p.i:])
		if n == 0 {
			break
		}
		dashPos := p.i
		p.i += n
		p.space()
		const expected = `an amount and element after "-"`
		if p.i == len(p.s) {
			return listInfo{}, p.fail(p.i, expected, "")
		}
		if dashAt(p.s[p.i:]) > 0 {
			return listInfo{}, p.fail(p.i, expected, `amounts cannot be negative (two dashes at position `+strconv.Itoa(dashPos)+`)`)
		}
		amountPos := p.i
		amount, written, err := p.amount()
		if err != nil {
			return listInfo{}, err
		}
		if !written {
			if c := p.s[p.i]; isUpper(c) || c == '(' {
				return listInfo{}, p.fail(p.i, expected, fmt.Sprintf(
					"%s has no amount; in balance notation each element after the first has its amount before it, as in Al-25Cu",
					p.peekTerm()))
			}
			return listInfo{}, p.unexpected(expected)
		}
		text := p.s[amountPos:p.i]
		p.space()
		if p.atListEnd() || dashAt(p.s[p.i:]) > 0 {
			return listInfo{}, p.fail(p.i, `an element symbol or "(" after the amount `+text, "")
		}
		if isAmountStart(p.s[p.i]) {
			return listInfo{}, p.fail(p.i, `an element symbol or "(" after the amount `+text, fmt.Sprintf(
				"two amounts in a row (%s and %s); each amount needs its element after it", text, p.s[p.i:amountEnd(p.s, p.i)]))
		}
		termPos := p.i
		tlo, err := p.term(depth, id, first)
		if err != nil {
			return listInfo{}, err
		}
		p.scale(tlo, amount)
		if amount == 0 {
			p.warn("%s at position %d has amount 0 and is left out", p.describeTerm(termPos, tlo), termPos)
		}
		rest += amount
		p.space()
		if p.i < len(p.s) && isAmountStart(p.s[p.i]) {
			return listInfo{}, p.fail(p.i, `"-", ")" or the end`,
				`in balance notation the amount goes before the element ("-25Cu", not "-Cu25")`)
		}
		if !p.atListEnd() && dashAt(p.s[p.i:]) == 0 {
			if pair, fix, ok := p.splitHint(); ok {
				return listInfo{}, p.fail(p.i-1, `"-", ")" or the end`, fmt.Sprintf(
					"%s reads as %s then %s; symbols are case-sensitive (did you mean %s?)", pair, pair[:1], pair[1:], fix))
			}
			if c := p.s[p.i]; isUpper(c) || c == '(' {
				return listInfo{}, p.fail(p.i, `"-" before `+p.peekTerm(),
					`missing "-" before `+p.peekTerm()+`; balance notation separates the elements with "-"`)
			}
			return listInfo{}, p.unexpected(`"-", ")" or the end`)
		}
	}
	if math.IsInf(rest, 0) {
		return listInfo{}, p.fail(basePos, "smaller amounts", "the amounts are too large to add up")
	}
	base := 100 - rest
	name := p.describeTerm(basePos, lo)
	if base <= 1e-9 {
		return listInfo{}, p.fail(basePos, "amounts after the balance element totalling less than 100", fmt.Sprintf(
			"balance %s comes to %s: the amounts after it total %s, so nothing is left for it",
			name, strconv.FormatFloat(base, 'g', 6, 64), strconv.FormatFloat(rest, 'g', -1, 64)))
	}
	baseEntries := p.all()[lo:baseEnd]
	for k := range baseEntries {
		baseEntries[k].amount *= base
	}
	return listInfo{total: 100, notation: Balance, scale: Percent}, nil
}

// classify decides the scale of a formula list from its written total
// and warns when the total is off that scale. whole reports whether every
// written amount is a whole number.
func (p *parser) classify(total float64, whole bool, groupPos int) Scale {
	switch {
	case total <= 1.5:
		if math.Abs(total-1) > 0.005 {
			p.warn("the fractions%s total %.6g rather than 1; normalised", inGroup(groupPos), total)
		}
		return Fractions
	case total >= 50:
		if math.Abs(total-100) > 0.5 {
			p.warn("the percentages%s total %.6g rather than 100; normalised", inGroup(groupPos), total)
		}
		return Percent
	default:
		if !whole {
			p.warn("the amounts%s total %.6g, neither about 1 (fractions) nor about 100 (percent); read as proportions and normalised", inGroup(groupPos), total)
		}
		return Proportions
	}
}

// inGroup returns " in the group at position N", or "" at the top level.
func inGroup(groupPos int) string {
	if groupPos < 0 {
		return ""
	}
	return " in the group at position " + strconv.Itoa(groupPos)
}

// term parses an element symbol or a group and returns the index of its
// first entry; the term's entries sum to 1.
func (p *parser) term(depth, id, first int) (int, *ParseError) {
	lo := len(p.all())
	start := p.i
	c := p.s[p.i]
	switch {
	case c == '(':
		if depth+1 > maxDepth {
			return 0, p.fail(p.i, "an element symbol", "groups are nested more than "+strconv.Itoa(maxDepth)+" deep")
		}
		p.i++
		p.space()
		if p.i < len(p.s) && p.s[p.i] == ')' {
			return 0, p.fail(p.i, `an element symbol or "("`, "empty group")
		}
		inner, err := p.list(depth+1, start)
		if err != nil {
			return 0, err
		}
		p.space()
		if p.i == len(p.s) || p.s[p.i] != ')' {
			closing := `")" to close the group opened at position ` + strconv.Itoa(start)
			if p.i == len(p.s) {
				return 0, p.fail(p.i, closing, "the group opened at position "+strconv.Itoa(start)+" is not closed")
			}
			return 0, p.fail(p.i, closing, "a unit inside the group opened at position "+strconv.Itoa(start)+
				"; the unit goes once, at the end of the whole composition")
		}
		p.i++
		if !(inner.total > 0) {
			return 0, p.fail(start, "a group with a positive amount", "the group at position "+strconv.Itoa(start)+" has no positive amount")
		}
		group := p.all()[lo:]
		for k := range group {
			group[k].amount /= inner.total
		}
		p.lastSymbolEnd = -1
		return lo, nil
	case isUpper(c):
		n := 1
		if p.i+1 < len(p.s) && isLower(p.s[p.i+1]) {
			n = 2
		}
		sym := p.s[p.i : p.i+n]
		e, ok := element.BySymbol(sym)
		if !ok {
			return 0, p.unknownSymbol()
		}
		if pair, fix, ok := p.splitHint(); ok {
			p.warn("%s at position %d reads as %s then %s; symbols are case-sensitive (did you mean %s?)",
				pair, p.i-1, pair[:1], pair[1:], fix)
		}
		for _, earlier := range p.all()[first:] {
			if earlier.list == id && earlier.symbol == e.Symbol {
				p.warn("%s is written twice (positions %d and %d); the amounts are added", e.Symbol, earlier.pos, p.i)
				break
			}
		}
		p.add(entry{symbol: e.Symbol, weight: e.AtomicWeight, amount: 1, pos: p.i, list: id})
		p.i += n
		p.lastSymbolEnd = p.i
		p.lastSymbolShort = n == 1
		return lo, nil
	case isLower(c):
		return 0, p.lowercase()
	case isAmountStart(c):
		end := amountEnd(p.s, p.i)
		return 0, p.fail(p.i, `an element symbol or "("`, fmt.Sprintf(
			"the amount %s has no element before it; in a formula the amount follows its element (Al63)", p.s[p.i:end]))
	}
	return 0, p.unexpected(`an element symbol or "("`)
}

// splitHint reports whether the one-letter symbol at p.i directly
// follows another one-letter symbol and the two letters are an element in
// the wrong case ("CU" read as C then U); it returns the pair and the fix.
func (p *parser) splitHint() (pair, fix string, ok bool) {
	if p.i == 0 || !p.lastSymbolShort || p.lastSymbolEnd != p.i || !isUpper(p.s[p.i]) ||
		(p.i+1 < len(p.s) && isLower(p.s[p.i+1])) {
		return "", "", false
	}
	pair = p.s[p.i-1 : p.i+1]
	fix, ok = caseFix(pair)
	return pair, fix, ok
}

// unknownSymbol reports the symbol at p.i, which is not an element,
// suggesting a case fix when one exists.
func (p *parser) unknownSymbol() *ParseError {
	const expected = "an element symbol"
	// "FE": F was read as fluorine and E is unknown; blame "FE".
	if p.lastSymbolShort && p.lastSymbolEnd == p.i && p.i > 0 {
		if fix, ok := caseFix(p.s[p.i-1 : p.i+1]); ok {
			return p.fail(p.i-1, expected, fmt.Sprintf("%s is not an element symbol; symbols are case-sensitive (did you mean %s?)", p.s[p.i-1:p.i+1], fix))
		}
	}
	letters := letterRun(p.s, p.i)
	if len(letters) == 2 {
		if fix, ok := caseFix(letters); ok {
			return p.fail(p.i, expected, fmt.Sprintf("%s is not an element symbol; symbols are case-sensitive (did you mean %s?)", letters, fix))
		}
	}
	sym := p.s[p.i : p.i+1]
	if p.i+1 < len(p.s) && isLower(p.s[p.i+1]) {
		sym = p.s[p.i : p.i+2]
	}
	return p.fail(p.i, expected, sym+" is not an element symbol")
}

// lowercase reports a lowercase letter where a symbol should start: a
// symbol typed in the wrong case, a unit glued to a symbol, or a word.
func (p *parser) lowercase() *ParseError {
	run := p.s[p.i:]
	n := 0
	for n < len(run) && (isLower(run[n]) || run[n] == '.') {
		n++
	}
	if n < len(run) && run[n] == '%' {
		// "Cat%": the unit's "a" was taken into the symbol "Ca".
		if p.i >= 2 && p.lastSymbolEnd == p.i && !p.lastSymbolShort && unitAt(p.s[p.i-1:]) > 0 {
			return p.fail(p.i, `a space before the unit`, fmt.Sprintf(
				"%q is read as the symbol %s followed by %q; put a space before the unit (%s %s)",
				p.s[p.i-2:p.i+n+1], p.s[p.i-2:p.i], run[:n+1], p.s[p.i-2:p.i-1], p.s[p.i-1:p.i+n+1]))
		}
		return p.fail(p.i, "at% or wt%", fmt.Sprintf("unknown unit %q; write at%% or wt%%", run[:n+1]))
	}
	letters := letterRun(p.s, p.i)
	if fix, ok := caseFix(letters); ok {
		return p.fail(p.i, "an element symbol", fmt.Sprintf("%s is not an element symbol; symbols are case-sensitive (did you mean %s?)", letters, fix))
	}
	if len(letters) == 2 {
		if fix, ok := caseFix(letters[:1]); ok {
			return p.fail(p.i, "an element symbol", fmt.Sprintf("%s is not an element symbol; symbols are case-sensitive (did you mean %s?)", letters[:1], fix))
		}
	}
	return p.unexpected("an element symbol")
}

// amount reads an optional unsigned decimal number: digits with an
// optional fraction, or a fraction alone (".5").
func (p *parser) amount() (float64, bool, *ParseError) {
	if p.i == len(p.s) || !isAmountStart(p.s[p.i]) {
		return 0, false, nil
	}
	start := p.i
	j := start
	for j < len(p.s) && isDigit(p.s[j]) {
		j++
	}
	if j < len(p.s) && p.s[j] == '.' {
		j++
		d := j
		for j < len(p.s) && isDigit(p.s[j]) {
			j++
		}
		if j == d {
			return 0, false, p.fail(j, "a digit after the decimal point", fmt.Sprintf("%q has no digits after the decimal point", p.s[start:j]))
		}
	}
	if j < len(p.s) && p.s[j] == '.' {
		return 0, false, p.fail(j, "an element symbol after the amount", fmt.Sprintf("second decimal point in %q", p.s[start:amountEnd(p.s, j)]))
	}
	if j+1 < len(p.s) && p.s[j] == ',' && isDigit(p.s[j+1]) {
		k := j + 1
		for k < len(p.s) && isDigit(p.s[k]) {
			k++
		}
		return 0, false, p.fail(j, "a decimal point", fmt.Sprintf("decimal comma in %q; write a decimal point (%s.%s)", p.s[start:k], p.s[start:j], p.s[j+1:k]))
	}
	v, err := strconv.ParseFloat(p.s[start:j], 64)
	if err != nil || math.IsInf(v, 0) {
		return 0, false, p.fail(start, "a smaller amount", fmt.Sprintf("the amount %s is too large", p.s[start:j]))
	}
	p.i = j
	return v, true, nil
}

// scale multiplies the amounts of entries lo.. by f.
func (p *parser) scale(lo int, f float64) {
	entries := p.all()[lo:]
	for k := range entries {
		entries[k].amount *= f
	}
}

// describeTerm names the term at pos for messages: its symbol, or
// "the group".
func (p *parser) describeTerm(pos, lo int) string {
	if p.s[pos] == '(' {
		return "the group"
	}
	return p.all()[lo].symbol
}

// peekTerm names the symbol or group starting at p.i.
func (p *parser) peekTerm() string {
	if p.s[p.i] == '(' {
		return `the group at position ` + strconv.Itoa(p.i)
	}
	n := 1
	if p.i+1 < len(p.s) && isLower(p.s[p.i+1]) {
		n = 2
	}
	return p.s[p.i : p.i+n]
}

func (p *parser) unexpected(expected string) *ParseError {
	if p.i == len(p.s) {
		return p.fail(p.i, expected, "")
	}
	r, _ := utf8.DecodeRuneInString(p.s[p.i:])
	var what string
	if r == utf8.RuneError {
		what = fmt.Sprintf("byte %#02x", p.s[p.i])
	} else {
		what = fmt.Sprintf("character %q", r)
	}
	return p.fail(p.i, expected, fmt.Sprintf("unexpected %s; expected %s", what, expected))
}

func (p *parser) expectTerm(expected string) *ParseError {
	if p.i < len(p.s) && p.s[p.i] == ')' {
		return p.fail(p.i, expected, "")
	}
	return p.unexpected(expected)
}

// atListEnd reports whether the text at p.i ends a list: the end, ")",
// a unit or a lone "%".
func (p *parser) atListEnd() bool {
	if p.i == len(p.s) {
		return true
	}
	c := p.s[p.i]
	return c == ')' || c == '%' || unitAt(p.s[p.i:]) > 0
}

func (p *parser) space() {
	for p.i < len(p.s) {
		switch p.s[p.i] {
		case ' ', '\t', '\n', '\r':
			p.i++
		default:
			return
		}
	}
}

// unitAt returns the length of the unit suffix at the start of s ("at%",
// "at.%", "wt%", "wt.%", "mass%", with optional spaces before "%"), or 0.
func unitAt(s string) int {
	var n int
	switch {
	case strings.HasPrefix(s, "at"), strings.HasPrefix(s, "wt"):
		n = 2
	case strings.HasPrefix(s, "mass"):
		n = 4
	default:
		return 0
	}
	if n < len(s) && s[n] == '.' && n == 2 {
		n++
	}
	for n < len(s) && (s[n] == ' ' || s[n] == '\t') {
		n++
	}
	if n < len(s) && s[n] == '%' {
		return n + 1
	}
	return 0
}

// dashAt returns the byte length of a dash at the start of s: "-",
// hyphen U+2010, en dash U+2013 or minus sign U+2212; 0 when none.
func dashAt(s string) int {
	if s == "" {
		return 0
	}
	if s[0] == '-' {
		return 1
	}
	for _, d := range [...]string{"\u2010", "\u2013", "\u2212"} {
		if strings.HasPrefix(s, d) {
			return len(d)
		}
	}
	return 0
}

// caseFix returns the element whose symbol differs from letters only in
// case ("AL" -> "Al", "cu" -> "Cu"), when there is one and it differs.
func caseFix(letters string) (string, bool) {
	var b [2]byte
	if len(letters) == 0 || len(letters) > 2 {
		return "", false
	}
	b[0] = toUpper(letters[0])
	if len(letters) == 2 {
		b[1] = toLower(letters[1])
	}
	fix := string(b[:len(letters)])
	if fix == letters {
		return "", false
	}
	if _, ok := element.BySymbol(fix); !ok {
		return "", false
	}
	return fix, true
}

// letterRun returns up to two ASCII letters starting at i.
func letterRun(s string, i int) string {
	j := i
	for j < len(s) && j-i < 2 && (isUpper(s[j]) || isLower(s[j])) {
		j++
	}
	return s[i:j]
}

func amountEnd(s string, i int) int {
	for i < len(s) && (isDigit(s[i]) || s[i] == '.') {
		i++
	}
	return i
}

func isUpper(c byte) bool       { return 'A' <= c && c <= 'Z' }
func isLower(c byte) bool       { return 'a' <= c && c <= 'z' }
func isDigit(c byte) bool       { return '0' <= c && c <= '9' }
func isAmountStart(c byte) bool { return isDigit(c) || c == '.' }

func toUpper(c byte) byte {
	if isLower(c) {
		return c - 'a' + 'A'
	}
	return c
}

func toLower(c byte) byte {
	if isUpper(c) {
		return c - 'A' + 'a'
	}
	return c
}

package composition_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"meltbook/analysis/composition"
)

// want is an expected composition in entry order.
type want []composition.Part

func checkFractions(t *testing.T, input string, got composition.Composition, w want, tol float64) {
	t.Helper()
	if len(got) != len(w) {
		t.Fatalf("%q: got %d elements %v, want %d %v", input, len(got), got, len(w), w)
	}
	for i := range w {
		if got[i].Element != w[i].Element || math.Abs(got[i].Fraction-w[i].Fraction) > tol {
			t.Errorf("%q part %d: got %s %.12g, want %s %.12g (±%g)", input, i, got[i].Element, got[i].Fraction, w[i].Element, w[i].Fraction, tol)
		}
	}
}

func TestParseNotations(t *testing.T) {
	const tol = 1e-12
	// Every expected fraction here is worked by hand from the notation
	// rules in the package documentation; the arithmetic is in the comment.
	tests := []struct {
		in       string
		want     want
		notation composition.Notation
		scale    composition.Scale
		total    float64
	}{
		// worked by hand: 63/100, 25/100, 12/100
		{"Al63Cu25Fe12", want{{"Al", 0.63}, {"Cu", 0.25}, {"Fe", 0.12}}, composition.Formula, composition.Percent, 100},
		// worked by hand: the at% suffix changes nothing
		{"Al63Cu25Fe12 at%", want{{"Al", 0.63}, {"Cu", 0.25}, {"Fe", 0.12}}, composition.Formula, composition.Percent, 100},
		{"Al63Cu25Fe12at.%", want{{"Al", 0.63}, {"Cu", 0.25}, {"Fe", 0.12}}, composition.Formula, composition.Percent, 100},
		// worked by hand: spaces between every token
		{"  Al 63 Cu 25\tFe 12  at % ", want{{"Al", 0.63}, {"Cu", 0.25}, {"Fe", 0.12}}, composition.Formula, composition.Percent, 100},
		// worked by hand: fractions total 1
		{"Al0.63Cu0.25Fe0.12", want{{"Al", 0.63}, {"Cu", 0.25}, {"Fe", 0.12}}, composition.Formula, composition.Fractions, 1},
		// worked by hand: .5 + .5 = 1
		{"Al.5Cu.5", want{{"Al", 0.5}, {"Cu", 0.5}}, composition.Formula, composition.Fractions, 1},
		// worked by hand: bare symbols count 1 each: 1/2, 1/2
		{"AlCu", want{{"Al", 0.5}, {"Cu", 0.5}}, composition.Formula, composition.Proportions, 2},
		// worked by hand: Al2Cu is 2 + 1 = 3 parts: 2/3, 1/3
		{"Al2Cu", want{{"Al", 2.0 / 3}, {"Cu", 1.0 / 3}}, composition.Formula, composition.Proportions, 3},
		// worked by hand: Al13Fe4 is 17 parts: 13/17, 4/17
		{"Al13Fe4", want{{"Al", 13.0 / 17}, {"Fe", 4.0 / 17}}, composition.Formula, composition.Proportions, 17},
		// worked by hand: a single element is all of it
		{"Fe", want{{"Fe", 1}}, composition.Formula, composition.Fractions, 1},
		// worked by hand: Al = 100 − 25 − 12 = 63
		{"Al-25Cu-12Fe", want{{"Al", 0.63}, {"Cu", 0.25}, {"Fe", 0.12}}, composition.Balance, composition.Percent, 100},
		// worked by hand: Al = 100 − 24.5 − 12.3 = 63.2
		{"Al-24.5Cu-12.3Fe", want{{"Al", 0.632}, {"Cu", 0.245}, {"Fe", 0.123}}, composition.Balance, composition.Percent, 100},
		// worked by hand: spaces around the dashes
		{"Al - 25 Cu - 12 Fe", want{{"Al", 0.63}, {"Cu", 0.25}, {"Fe", 0.12}}, composition.Balance, composition.Percent, 100},
		// worked by hand: en dash (U+2013) and minus sign (U+2212) as dashes
		{"Al\u201325Cu\u221212Fe", want{{"Al", 0.63}, {"Cu", 0.25}, {"Fe", 0.12}}, composition.Balance, composition.Percent, 100},
		// worked by hand: Al = 100 − 0.5 = 99.5
		{"Al-0.5Cu", want{{"Al", 0.995}, {"Cu", 0.005}}, composition.Balance, composition.Percent, 100},
		// worked by hand: inner 0.7+0.2+0.1 = 1, times 99: 69.3, 19.8, 9.9; B 1
		{"(Al0.7Pd0.2Mn0.1)99B1", want{{"Al", 0.693}, {"Pd", 0.198}, {"Mn", 0.099}, {"B", 0.01}}, composition.Formula, composition.Percent, 100},
		// worked by hand: inner 70+20+10 = 100 normalises to the same as above
		{"(Al70Pd20Mn10)99B1", want{{"Al", 0.693}, {"Pd", 0.198}, {"Mn", 0.099}, {"B", 0.01}}, composition.Formula, composition.Percent, 100},
		// worked by hand: (Al0.5Cu0.5)80 = Al40 Cu40; with Fe20 that is 100,
		// times 90/100: Al36 Cu36 Fe18; Ni10
		{"((Al0.5Cu0.5)80Fe20)90Ni10", want{{"Al", 0.36}, {"Cu", 0.36}, {"Fe", 0.18}, {"Ni", 0.10}}, composition.Formula, composition.Percent, 100},
		// worked by hand, depth 3: (Al1Cu1) = Al 1/2 Cu 1/2; with Fe1, halved:
		// Al 1/4 Cu 1/4 Fe 1/2; with Ni1, halved: Al 1/8 Cu 1/8 Fe 1/4 Ni 1/2;
		// with Co1, halved: Al 1/16 Cu 1/16 Fe 1/8 Ni 1/4 Co 1/2
		{"(((Al1Cu1)1Fe1)1Ni1)1Co1", want{{"Al", 1.0 / 16}, {"Cu", 1.0 / 16}, {"Fe", 1.0 / 8}, {"Ni", 1.0 / 4}, {"Co", 1.0 / 2}}, composition.Formula, composition.Proportions, 2},
		// worked by hand: group with no amount counts 1: Al1 + (Cu2/3 Fe1/3)×3 = Al1 Cu2 Fe1, over 4
		{"Al(Cu2Fe)3", want{{"Al", 0.25}, {"Cu", 0.5}, {"Fe", 0.25}}, composition.Formula, composition.Proportions, 4},
		// worked by hand: group as a balance base: (Al80 Pd20)×90/100 = Al72 Pd18; Mn10
		{"(Al-20Pd)-10Mn", want{{"Al", 0.72}, {"Pd", 0.18}, {"Mn", 0.10}}, composition.Balance, composition.Percent, 100},
		// worked by hand: group after a dash: Cu 5, Fe 5, Al 100 − 10 = 90
		{"Al-10(Cu1Fe1)", want{{"Al", 0.90}, {"Cu", 0.05}, {"Fe", 0.05}}, composition.Balance, composition.Percent, 100},
		// worked by hand: across groups the same element adds: Al 0.5×60 + 40 = 70, Cu 30
		{"(Al1Cu1)60Al40", want{{"Al", 0.70}, {"Cu", 0.30}}, composition.Formula, composition.Percent, 100},
		// worked by hand: repeated element adds at its first position: Al 60+3 = 63
		{"Al60Cu25Al3Fe12", want{{"Al", 0.63}, {"Cu", 0.25}, {"Fe", 0.12}}, composition.Formula, composition.Percent, 100},
		// worked by hand: zero amount dropped: 63/100, 37/100
		{"Al63Cu37Fe0", want{{"Al", 0.63}, {"Cu", 0.37}}, composition.Formula, composition.Percent, 100},
		// worked by hand: total 101 normalised: 63/101, 25/101, 13/101
		{"Al63Cu25Fe13", want{{"Al", 63.0 / 101}, {"Cu", 25.0 / 101}, {"Fe", 13.0 / 101}}, composition.Formula, composition.Percent, 101},
		// worked by hand: C and U are two elements (case-sensitive): 63/101, 1/101, 37/101
		{"Al63CU37", want{{"Al", 63.0 / 101}, {"C", 1.0 / 101}, {"U", 37.0 / 101}}, composition.Formula, composition.Percent, 101},
		// worked by hand: Co is cobalt, CO is C then O
		{"Co1CO", want{{"Co", 1.0 / 3}, {"C", 1.0 / 3}, {"O", 1.0 / 3}}, composition.Formula, composition.Proportions, 3},
	}
	for _, tt := range tests {
		p, err := composition.Parse(tt.in)
		if err != nil {
			t.Errorf("Parse(%q): %v", tt.in, err)
			continue
		}
		checkFractions(t, tt.in, p.Atomic, tt.want, tol)
		if p.Basis != composition.Atomic {
			t.Errorf("%q: basis %v, want atomic", tt.in, p.Basis)
		}
		if p.Notation != tt.notation || p.Scale != tt.scale {
			t.Errorf("%q: notation %v scale %v, want %v %v", tt.in, p.Notation, p.Scale, tt.notation, tt.scale)
		}
		if math.Abs(p.Total-tt.total) > 1e-9 {
			t.Errorf("%q: total %g, want %g", tt.in, p.Total, tt.total)
		}
		if p.Entered != tt.in {
			t.Errorf("%q: Entered = %q", tt.in, p.Entered)
		}
		checkFractions(t, tt.in+" (Written)", p.Written, tt.want, tol)
	}
}

func TestParseWeight(t *testing.T) {
	// worked by hand with the IUPAC/CIAAW 2021 standard atomic weights
	// Al 26.9815384, Cu 63.546, Fe 55.845: x_i = (w_i/M_i) / Σ w_j/M_j.
	// Al-30Cu-10Fe wt%: 60/26.9815384 = 2.2237427, 30/63.546 = 0.4720990,
	// 10/55.845 = 0.1790671; sum 2.8749087.
	alCuFeBalance := want{{"Al", 0.77350028}, {"Cu", 0.16421354}, {"Fe", 0.06228617}}
	// Al52Cu35Fe13 wt%: 52/26.9815384 = 1.9272437, 35/63.546 = 0.5507821,
	// 13/55.845 = 0.2327872; sum 2.7108130.
	alCuFeFormula := want{{"Al", 0.71094676}, {"Cu", 0.20317968}, {"Fe", 0.08587357}}
	const tol = 1e-4 // the element table may round weights differently
	tests := []struct {
		in   string
		opt  composition.Options
		want want
	}{
		{"Al-30Cu-10Fe wt%", composition.Options{}, alCuFeBalance},
		{"Al-30Cu-10Fe wt.%", composition.Options{}, alCuFeBalance},
		{"Al-30Cu-10Fe mass%", composition.Options{}, alCuFeBalance},
		{"Al-30Cu-10Fe", composition.Options{Basis: composition.Weight}, alCuFeBalance},
		{"Al52Cu35Fe13wt%", composition.Options{}, alCuFeFormula},
		{"Al0.52Cu0.35Fe0.13 wt%", composition.Options{}, alCuFeFormula},
	}
	for _, tt := range tests {
		p, err := composition.ParseWith(tt.in, tt.opt)
		if err != nil {
			t.Errorf("ParseWith(%q): %v", tt.in, err)
			continue
		}
		if p.Basis != composition.Weight {
			t.Errorf("%q: basis %v, want weight", tt.in, p.Basis)
		}
		checkFractions(t, tt.in, p.Atomic, tt.want, tol)
	}
	// The written weight fractions are kept as written (worked by hand: 60/100, 30/100, 10/100).
	p, err := composition.Parse("Al-30Cu-10Fe wt%")
	if err != nil {
		t.Fatal(err)
	}
	checkFractions(t, "Written", p.Written, want{{"Al", 0.6}, {"Cu", 0.3}, {"Fe", 0.1}}, 1e-12)

	// A written unit wins over the option (worked by hand: 63/100 ...).
	p, err = composition.ParseWith("Al63Cu25Fe12 at%", composition.Options{Basis: composition.Weight})
	if err != nil {
		t.Fatal(err)
	}
	if p.Basis != composition.Atomic {
		t.Errorf("at%% suffix with weight option: basis %v, want atomic", p.Basis)
	}
	checkFractions(t, "at% over option", p.Atomic, want{{"Al", 0.63}, {"Cu", 0.25}, {"Fe", 0.12}}, 1e-12)
}

func TestParseWarnings(t *testing.T) {
	tests := []struct {
		in   string
		want []string // substrings, one per warning, in order
	}{
		{"Al63Cu25Fe12", nil},
		{"Al-25Cu-12Fe", nil},
		{"Al2Cu", nil},
		{"Al63Cu25Fe12.4", nil},      // total 100.4, within 0.5
		{"Al0.63Cu0.25Fe0.124", nil}, // total 1.004, within 0.005
		{"Al63Cu25Fe13", []string{"total 101 rather than 100"}}, // off by 1
		{"Al0.63Cu0.25Fe0.13", []string{"total 1.01 rather than 1"}},
		{"Al0.63Cu25", []string{"total 25.63, neither about 1"}},
		{"(Al0.7Pd0.2Mn0.2)99B1", []string{"in the group at position 0 total 1.1 rather than 1"}},
		{"Al60Cu25Al3Fe12", []string{"Al is written twice (positions 0 and 8)"}},
		{"(Al1Cu1)60Al40", nil},
		{"Al63Cu37Fe0", []string{"Fe at position 8 has amount 0"}},
		{"Al-25Cu-0Fe", []string{"Fe at position 9 has amount 0"}},
		{"Al63CU37", []string{"CU at position 4 reads as C then U", "total 101"}},
		{"Al63Cu36CO1", []string{"CO at position 8 reads as C then O", "total 101"}},
	}
	for _, tt := range tests {
		p, err := composition.Parse(tt.in)
		if err != nil {
			t.Errorf("Parse(%q): %v", tt.in, err)
			continue
		}
		if len(p.Warnings) != len(tt.want) {
			t.Errorf("%q: warnings %q, want %d containing %q", tt.in, p.Warnings, len(tt.want), tt.want)
			continue
		}
		for i, w := range tt.want {
			if !strings.Contains(p.Warnings[i], w) {
				t.Errorf("%q: warning %d = %q, want it to contain %q", tt.in, i, p.Warnings[i], w)
			}
		}
	}
}

func TestParseErrors(t *testing.T) {
	tests := []struct {
		in   string
		pos  int
		want string // substring of the message
	}{
		// empty input
		{"", 0, "empty composition"},
		{"   ", 3, "empty composition"},
		{"wt%", 0, "a unit with no composition"},
		// dangling dash
		{"Al-25Cu-", 8, `expected an amount and element after "-"`},
		{"Al-", 3, `expected an amount and element after "-"`},
		{"Al-25", 5, `expected an element symbol or "(" after the amount 25`},
		{"Al-25-12Fe", 5, `after the amount 25`},
		// balance notation without an amount
		{"Al-Cu", 3, "Cu has no amount"},
		{"Al-25Cu3", 7, "the amount goes before the element"},
		{"Al-25Cu Fe", 8, `missing "-" before Fe`},
		{"Al-25 12Cu", 6, "two amounts in a row"},
		{"Al-25CU", 5, "CU reads as C then U; symbols are case-sensitive (did you mean Cu?)"},
		// negative amounts
		{"Al--5Cu", 3, "amounts cannot be negative"},
		{"Al63Cu-5Fe", 6, "amounts cannot be negative"},
		{"Al63-25Cu", 4, "amounts cannot be negative"},
		// balance at or below zero
		{"Al-60Cu-50Fe", 0, "balance Al comes to -10"},
		{"Al-50Cu-50Fe", 0, "balance Al comes to 0"},
		{"(Al1Cu1)-100Fe", 0, "balance the group comes to 0"},
		// unknown symbols, with and without a case fix
		{"Xx50Cu50", 0, "Xx is not an element symbol"},
		{"Al63Cu25Xx12", 8, "Xx is not an element symbol"},
		{"AL63Cu37", 0, "AL is not an element symbol; symbols are case-sensitive (did you mean Al?)"},
		{"al63Cu37", 0, "al is not an element symbol; symbols are case-sensitive (did you mean Al?)"},
		{"Al63cu37", 4, "did you mean Cu?"},
		{"Al50FE50", 4, "FE is not an element symbol; symbols are case-sensitive (did you mean Fe?)"},
		{"Al50MN50", 4, "did you mean Mn?"},
		{"Al50Q50", 4, "Q is not an element symbol"},
		// unbalanced parentheses
		{"(Al0.7Pd0.3", 11, "the group opened at position 0 is not closed"},
		{"((Al1Cu1)50Fe50", 15, "the group opened at position 0 is not closed"},
		{"Al63Cu37)", 8, `")" has no matching "("`},
		{"()", 1, "empty group"},
		{"(Al0Cu0)5Fe", 0, "the group at position 0 has no positive amount"},
		{"(Al50Cu50 wt%)", 10, "a unit inside the group"},
		{strings.Repeat("(", 17) + "Al" + strings.Repeat(")", 17), 16, "nested more than 16 deep"},
		// a number with no element
		{"63Al37Cu", 0, "the amount 63 has no element before it"},
		{"Al63 25Cu", 5, "the amount 25 has no element before it"},
		{"(63Al)", 1, "the amount 63 has no element before it"},
		// number syntax
		{"Al63,5Cu36.5", 4, "decimal comma"},
		{"Al5.Cu", 4, "no digits after the decimal point"},
		{"Al63.5.1Cu", 6, `second decimal point in "63.5.1"`},
		{"Al" + strings.Repeat("9", 400) + "Cu", 2, "too large"},
		// all amounts zero
		{"Al0Cu0", 0, "the amounts total 0"},
		{"  Al0", 2, "the amounts total 0"},
		// stray characters and units
		{"Al63*Cu37", 4, `unexpected character '*'`},
		{"Al63+Cu37", 4, `unexpected character '+'`},
		{"Al63, Cu37", 4, `unexpected character ','`},
		{"Al63Cu37 ü", 9, `unexpected character 'ü'`},
		{"Al63Cu37\xff", 8, "unexpected byte 0xff"},
		{"Al63Cu25Fe12%", 12, `a bare "%"`},
		{"Al63Cu37 vol%", 9, `unknown unit "vol%"`},
		{"Cat%", 2, "put a space before the unit (C at%)"},
		{"Al63Cu37 wt% x", 13, "expected the end after the unit"},
		{"Al63Cu37 wt% at%", 13, "expected the end after the unit"},
	}
	for _, tt := range tests {
		_, err := composition.Parse(tt.in)
		if err == nil {
			t.Errorf("Parse(%q): no error, want one at %d containing %q", tt.in, tt.pos, tt.want)
			continue
		}
		var pe *composition.ParseError
		if !errors.As(err, &pe) {
			t.Errorf("Parse(%q): error %T is not a *ParseError", tt.in, err)
			continue
		}
		if pe.Pos != tt.pos {
			t.Errorf("Parse(%q): position %d, want %d (%v)", tt.in, pe.Pos, tt.pos, err)
		}
		if pe.Input != tt.in {
			t.Errorf("Parse(%q): Input = %q", tt.in, pe.Input)
		}
		if pe.Expected == "" {
			t.Errorf("Parse(%q): Expected is empty (%v)", tt.in, err)
		}
		if !strings.Contains(err.Error(), tt.want) {
			t.Errorf("Parse(%q): %q does not contain %q", tt.in, err.Error(), tt.want)
		}
	}
}

func TestParseErrorMessage(t *testing.T) {
	_, err := composition.Parse("Al-25Cu-")
	// The exact wording is the package's own contract for this case.
	const want = `composition "Al-25Cu-" at position 8: expected an amount and element after "-"`
	if err == nil || err.Error() != want {
		t.Errorf("got %v, want %s", err, want)
	}
}

func TestParseManyElements(t *testing.T) {
	// More elements than the parser keeps inline; worked by hand: 20
	// bare symbols count 1 each, so each is 1/20, and the repeated Al adds
	// 1 more: Al 2/21, the others 1/21.
	symbols := []string{"Al", "Cu", "Fe", "Ni", "Co", "Cr", "Mn", "Ti", "Zr", "V",
		"Nb", "Mo", "Ta", "W", "Hf", "Si", "B", "C", "Y", "Sc"}
	in := strings.Join(symbols, "")
	p, err := composition.Parse(in)
	if err != nil {
		t.Fatal(err)
	}
	var w want
	for _, s := range symbols {
		w = append(w, composition.Part{Element: s, Fraction: 1.0 / 20})
	}
	checkFractions(t, in, p.Atomic, w, 1e-15)

	p, err = composition.Parse(in + "Al")
	if err != nil {
		t.Fatal(err)
	}
	w[0].Fraction = 2.0 / 21
	for i := 1; i < len(w); i++ {
		w[i].Fraction = 1.0 / 21
	}
	checkFractions(t, in+"Al", p.Atomic, w, 1e-15)
}

package composition_test

import (
	"errors"
	"math"
	"testing"

	"meltbook/analysis/composition"
)

func FuzzParse(f *testing.F) {
	for _, s := range []string{
		"Al63Cu25Fe12", "Al0.63Cu0.25Fe0.12", "Al-25Cu-12Fe", "Al-24.5Cu-12.3Fe",
		"Al-30Cu-10Fe wt%", "Al52Cu35Fe13wt%", "(Al0.7Pd0.2Mn0.1)99B1",
		"((Al0.5Cu0.5)80Fe20)90Ni10", "(Al-20Pd)-10Mn", "Al-10(Cu1Fe1)", "Al2Cu",
		"Al\u201325Cu\u221212Fe", " Al 63 Cu 25 Fe 12 at % ", "Al63CU37",
		"", "Al-25Cu-", "Al--5Cu", "Al-60Cu-50Fe", "(Al0.7Pd0.3", "Al)", "63Al",
		"Al63,5Cu", "Al5.Cu", "Xx50Cu50", "FE50Al50", "Cat%", "Al63Cu37 vol%", "()",
		"(Al0Cu0)5Fe", "Al0Cu0", "Al63Cu25Fe12%", "Al63Cu37\xff",
	} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		p, err := composition.Parse(s)
		if err != nil {
			var pe *composition.ParseError
			if !errors.As(err, &pe) {
				t.Fatalf("Parse(%q): error %T is not a *ParseError: %v", s, err, err)
			}
			if pe.Pos < 0 || pe.Pos > len(s) {
				t.Fatalf("Parse(%q): position %d outside 0..%d", s, pe.Pos, len(s))
			}
			if pe.Expected == "" {
				t.Fatalf("Parse(%q): no Expected in %v", s, err)
			}
			return
		}
		for _, c := range []composition.Composition{p.Atomic, p.Written} {
			var sum float64
			for _, q := range c {
				if !(q.Fraction >= 0) {
					t.Fatalf("Parse(%q): %s fraction %g", s, q.Element, q.Fraction)
				}
				sum += q.Fraction
			}
			if math.Abs(sum-1) > 1e-9 {
				t.Fatalf("Parse(%q): fractions sum to %.15g", s, sum)
			}
			if err := c.Validate(); err != nil {
				t.Fatalf("Parse(%q): %v", s, err)
			}
		}
		// What Format writes must read back to the same composition.
		back, err := composition.Parse(p.Atomic.Format(-1))
		if err != nil {
			t.Fatalf("Parse(%q) formatted as %q: %v", s, p.Atomic.Format(-1), err)
		}
		if !composition.EqualWithin(back.Atomic, p.Atomic, 1e-9) {
			t.Fatalf("Parse(%q) = %v reads back as %v", s, p.Atomic, back.Atomic)
		}
	})
}

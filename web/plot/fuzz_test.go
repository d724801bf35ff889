package plot_test

import (
	"strings"
	"testing"

	"meltbook/web/plot"
)

func FuzzParseCorner(f *testing.F) {
	for _, s := range []string{"Al", "Fe+Si", "(Fe + Si)", "", "()", "fe", "Fe+Fe", "Al2", "((Al))", "Fe+", "+"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		c, err := plot.ParseCorner(s)
		if err != nil {
			return
		}
		if len(c.Elements) == 0 {
			t.Fatalf("ParseCorner(%q) accepted a corner with no element", s)
		}
		// What it accepted reads back to the same corner.
		again, err := plot.ParseCorner(c.Label())
		if err != nil || strings.Join(again.Elements, "+") != strings.Join(c.Elements, "+") {
			t.Fatalf("label %q of %q reads back as %v, %v", c.Label(), s, again.Elements, err)
		}
	})
}

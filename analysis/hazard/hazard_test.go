package hazard_test

import (
	"fmt"
	"slices"
	"strings"
	"testing"

	"meltbook/analysis/hazard"
)

func kinds(cs []hazard.Caution) []hazard.Kind {
	out := make([]hazard.Kind, len(cs))
	for i, c := range cs {
		out[i] = c.Kind
	}
	return out
}

func TestCautions(t *testing.T) {
	tests := []struct {
		name     string
		elements []string
		// want maps each hazard kind to the elements that must be listed
		// under it. Classes: toxic Cd, Be, Pb, Tl, As, Hg; readily burning
		// Mg, Li, Ca, the rare earths and uranium fines; radioactive U (no
		// stable isotope) — the elements' safety data sheets (common practice).
		want map[hazard.Kind][]string
	}{
		{"Al-Cu-Fe has no element hazard", []string{"Al", "Cu", "Fe"}, map[hazard.Kind][]string{}},
		{"Cd-Yb", []string{"Cd", "Yb"}, map[hazard.Kind][]string{
			hazard.Toxic: {"Cd"}, hazard.ReadilyBurning: {"Yb"}}},
		{"Zn-Mg-Y", []string{"Zn", "Mg", "Y"}, map[hazard.Kind][]string{
			hazard.ReadilyBurning: {"Mg", "Y"}}},
		{"beryllium and lead, repeated", []string{"Be", "Pb", "Be"}, map[hazard.Kind][]string{
			hazard.Toxic: {"Be", "Pb"}}},
		{"uranium", []string{"U"}, map[hazard.Kind][]string{
			hazard.Radioactive: {"U"}, hazard.ReadilyBurning: {"U"}}},
		{"unknown symbol", []string{"Al", "Xq"}, map[hazard.Kind][]string{
			hazard.UnknownElement: {"Xq"}}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := hazard.Cautions(tt.elements)
			if len(got) == 0 || got[len(got)-1].Kind != hazard.LocalRules {
				t.Fatalf("cautions %v do not end with the local-rules line", kinds(got))
			}
			for k, want := range tt.want {
				c, ok := groupCaution(got, k)
				if !ok {
					t.Errorf("no %s caution in %v", k, kinds(got))
					continue
				}
				if !slices.Equal(c.Elements, want) {
					t.Errorf("%s elements %v, want %v", k, c.Elements, want)
				}
			}
			for _, k := range []hazard.Kind{hazard.Toxic, hazard.ReadilyBurning, hazard.Radioactive, hazard.UnknownElement} {
				if _, listed := tt.want[k]; listed {
					continue
				}
				if c, ok := groupCaution(got, k); ok {
					t.Errorf("unexpected %s caution for %v", k, c.Elements)
				}
			}
		})
	}
}

// groupCaution finds the per-class caution (the one naming its elements
// before the colon), skipping element-specific notes.
func groupCaution(cs []hazard.Caution, k hazard.Kind) (hazard.Caution, bool) {
	for _, c := range cs {
		if c.Kind == k && strings.HasPrefix(c.Text, strings.Join(c.Elements, ", ")+": ") {
			return c, true
		}
	}
	return hazard.Caution{}, false
}

func TestCautionsNotes(t *testing.T) {
	// Cadmium boils at 767 °C (CRC Handbook, from memory), below the melt
	// temperature of Cd-Yb alloys, so its note must say so.
	got := hazard.Cautions([]string{"Cd", "Yb"})
	var note string
	for _, c := range got {
		if slices.Equal(c.Elements, []string{"Cd"}) && strings.HasPrefix(c.Text, "Cadmium") {
			note = c.Text
		}
	}
	if !strings.Contains(note, "767 °C") || !strings.Contains(note, "sealed") {
		t.Errorf("cadmium note %q lacks the boiling point or the sealed-vessel advice", note)
	}
}

func TestProcessCautions(t *testing.T) {
	got := hazard.ProcessCautions()
	// The hazards of melt spinning: molten metal above 1000 °C, pressurised
	// gas, a fast wheel, inert-gas asphyxiation, hot parts (common practice).
	want := []hazard.Kind{hazard.MoltenMetal, hazard.PressurisedGas, hazard.SpinningWheel,
		hazard.Asphyxiation, hazard.HotParts, hazard.LocalRules}
	if !slices.Equal(kinds(got), want) {
		t.Fatalf("kinds %v, want %v", kinds(got), want)
	}
	for _, c := range got {
		if len(c.Text) < 40 {
			t.Errorf("%s caution too short: %q", c.Kind, c.Text)
		}
	}
	last := got[len(got)-1].Text
	for _, w := range []string{"rules", "safety officer", "trained"} {
		if !strings.Contains(last, w) {
			t.Errorf("closing line %q does not mention %q", last, w)
		}
	}
	if !strings.Contains(got[0].Text, "1000 °C") {
		t.Errorf("molten-metal caution %q does not give the temperature", got[0].Text)
	}
}

func ExampleCautions() {
	for _, c := range hazard.Cautions([]string{"Zn", "Mg", "Y"}) {
		fmt.Println(c.Kind, c.Elements)
	}
	// Output:
	// readily-burning [Mg Y]
	// toxic [Zn]
	// readily-burning [Mg]
	// local-rules []
}

func TestZincFumeNote(t *testing.T) {
	// Zinc boils at 907 °C (CRC Handbook, from memory) and its oxide fume
	// causes metal fume fever (common practice in foundry safety): a Zn-Mg-Y
	// weigh-out must say so, although Zn is in no hazard class of its own.
	var note string
	for _, c := range hazard.Cautions([]string{"Zn", "Mg", "Y"}) {
		if slices.Equal(c.Elements, []string{"Zn"}) {
			note = c.Text
		}
	}
	if !strings.Contains(note, "907 °C") || !strings.Contains(note, "metal fume fever") {
		t.Errorf("zinc note %q lacks the boiling point or the fume warning", note)
	}
}

package weighout_test

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"flag"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"meltbook/analysis/composition"
	"meltbook/analysis/hazard"
	"meltbook/analysis/weighout"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata")

func parse(t testing.TB, s string) composition.Composition {
	t.Helper()
	p, err := composition.Parse(s)
	if err != nil {
		t.Fatal(err)
	}
	return p.Atomic
}

func TestPlanAlCuFe(t *testing.T) {
	// Al63Cu25Fe12, 10 g, pure pieces, no volatile element. Standard atomic
	// weights (CIAAW 2021): Al 26.9815384, Cu 63.546, Fe 55.845.
	//   x·M: Al 0.63 × 26.9815384 = 16.99837
	//        Cu 0.25 × 63.546     = 15.88650
	//        Fe 0.12 × 55.845     =  6.70140      Σ = 39.58627 g/mol
	//   w:   Al 0.429401, Cu 0.401313, Fe 0.169286
	//   mass to weigh (10 g × w): Al 4.29401 g, Cu 4.01313 g, Fe 1.69286 g
	s, err := weighout.Plan(parse(t, "Al63Cu25Fe12"), weighout.Options{TotalMassGrams: 10})
	if err != nil {
		t.Fatal(err)
	}
	want := []struct {
		el     string
		w, g   float64
		assume bool
	}{
		{"Al", 0.429401, 4.29401, true},
		{"Cu", 0.401313, 4.01313, true},
		{"Fe", 0.169286, 1.69286, true},
	}
	for i, w := range want {
		l := s.Lines[i]
		if l.Element != w.el || math.Abs(l.WeightFraction-w.w) > 2e-6 || math.Abs(l.MassGrams-w.g) > 2e-5 {
			t.Errorf("line %d: %s w %.6f mass %.5f g, want %s %.6f %.5f", i, l.Element, l.WeightFraction, l.MassGrams, w.el, w.w, w.g)
		}
		if l.Purity != 1 || !l.PurityAssumed || l.LossBasis != weighout.LossNone || l.MassGrams != l.ElementGrams {
			t.Errorf("line %d: purity %g assumed %v loss %s", i, l.Purity, l.PurityAssumed, l.LossBasis)
		}
	}
	if math.Abs(s.TotalGrams-10) > 1e-12 || math.Abs(s.ExpectedGrams-10) > 1e-12 || s.ImpurityGrams != 0 {
		t.Errorf("total %g expected %g impurity %g", s.TotalGrams, s.ExpectedGrams, s.ImpurityGrams)
	}
	if !composition.EqualWithin(s.ExpectedComposition, s.Composition, 1e-12) || !composition.EqualWithin(s.IfNoLoss, s.Composition, 1e-12) {
		t.Errorf("expected %v, if no loss %v", s.ExpectedComposition, s.IfNoLoss)
	}
	if !strings.Contains(strings.Join(s.Notes, " "), "No purity given for Al, Cu, Fe: taken as 100 %") {
		t.Errorf("notes %q do not state the assumed purity", s.Notes)
	}
	if last := s.Cautions[len(s.Cautions)-1]; last.Kind != hazard.LocalRules {
		t.Errorf("cautions end with %s", last.Kind)
	}
}

func TestPlanVolatileAndImpure(t *testing.T) {
	// Zn60Mg30Y10, 5 g; Y pieces 99.9 %; rule-of-thumb losses Zn 2 %,
	// Mg 3 % (common practice). Atomic weights (CIAAW 2021): Zn 65.38,
	// Mg 24.305, Y 88.905838.
	//   x·M: 39.228 + 7.2915 + 8.8905838 = 55.4100838 g/mol
	//   w:   Zn 0.707958, Mg 0.131592, Y 0.160451
	//   in the button (5 g × w): Zn 3.539789, Mg 0.657958, Y 0.802253 g
	//   charge e = m/(1 − L): Zn 3.539789/0.98 = 3.612029,
	//                         Mg 0.657958/0.97 = 0.678307, Y 0.802253
	//   weigh p = e/P:        Y 0.802253/0.999 = 0.803056; Σ p = 5.093393 g
	//   impurity 0.803056 − 0.802253 = 0.000803 g, so 5.000803 g after the
	//   allowed losses.
	//   if nothing evaporates, moles ∝ e/M: Zn 0.0552467, Mg 0.0279081,
	//   Y 0.0090236 → Zn 59.935, Mg 30.276, Y 9.789 at.%
	s, err := weighout.Plan(parse(t, "Zn60Mg30Y10"), weighout.Options{TotalMassGrams: 5, Purity: map[string]float64{"Y": 0.999}})
	if err != nil {
		t.Fatal(err)
	}
	want := []struct {
		el                 string
		elementG, weighG   float64
		loss               float64
		basis              string
		purity             float64
		noLossAtomicFrac   float64
		expectedAtomicFrac float64
	}{
		{"Zn", 3.612029, 3.612029, 0.02, weighout.LossRuleOfThumb, 1, 0.59935, 0.60},
		{"Mg", 0.678307, 0.678307, 0.03, weighout.LossRuleOfThumb, 1, 0.30276, 0.30},
		{"Y", 0.802253, 0.803056, 0, weighout.LossNone, 0.999, 0.09789, 0.10},
	}
	for i, w := range want {
		l := s.Lines[i]
		if math.Abs(l.ElementGrams-w.elementG) > 2e-6 || math.Abs(l.MassGrams-w.weighG) > 2e-6 {
			t.Errorf("%s: element %.6f g weigh %.6f g, want %.6f %.6f", l.Element, l.ElementGrams, l.MassGrams, w.elementG, w.weighG)
		}
		if l.Loss != w.loss || l.LossBasis != w.basis || l.Purity != w.purity {
			t.Errorf("%s: loss %g (%s) purity %g", l.Element, l.Loss, l.LossBasis, l.Purity)
		}
		if math.Abs(s.IfNoLoss[i].Fraction-w.noLossAtomicFrac) > 1e-5 || math.Abs(s.ExpectedComposition[i].Fraction-w.expectedAtomicFrac) > 1e-12 {
			t.Errorf("%s: if no loss %.5f expected %.5f", l.Element, s.IfNoLoss[i].Fraction, s.ExpectedComposition[i].Fraction)
		}
	}
	if math.Abs(s.TotalGrams-5.093393) > 2e-6 || math.Abs(s.ExpectedGrams-5.000803) > 2e-6 || math.Abs(s.ImpurityGrams-0.000803) > 2e-6 {
		t.Errorf("total %.6f expected %.6f impurity %.6f", s.TotalGrams, s.ExpectedGrams, s.ImpurityGrams)
	}
	notes := strings.Join(s.Notes, " ")
	for _, w := range []string{"rule of thumb for Zn 2%, Mg 3%", "No purity given for Zn, Mg", "0.8 mg of impurities"} {
		if !strings.Contains(notes, w) {
			t.Errorf("notes lack %q: %s", w, notes)
		}
	}
	// Mg and Y burn readily as fines (safety data sheets, common practice).
	var burning bool
	for _, c := range s.Cautions {
		if c.Kind == hazard.ReadilyBurning && strings.Join(c.Elements, ",") == "Mg,Y" {
			burning = true
		}
	}
	if !burning {
		t.Errorf("no readily-burning caution for Mg, Y: %+v", s.Cautions)
	}
}

func TestPlanOverrides(t *testing.T) {
	c := parse(t, "Zn60Mg30Y10")
	// A given loss overrides the rule of thumb; NoDefaultLoss drops it.
	s, err := weighout.Plan(c, weighout.Options{TotalMassGrams: 5, Loss: map[string]float64{"Mg": 0.05}, NoDefaultLoss: true})
	if err != nil {
		t.Fatal(err)
	}
	if s.Lines[0].LossBasis != weighout.LossNone || s.Lines[1].Loss != 0.05 || s.Lines[1].LossBasis != weighout.LossGiven {
		t.Errorf("lines %+v", s.Lines)
	}
	if got := weighout.DefaultLosses(); got["Mg"] != 0.03 || got["Zn"] != 0.02 || got["Mn"] != 0.01 || got["Li"] != 0.03 || got["Ca"] != 0.02 {
		t.Errorf("default losses %v", got)
	}
}

func TestPlanErrors(t *testing.T) {
	c := parse(t, "Al63Cu25Fe12")
	tests := []struct {
		name string
		opt  weighout.Options
		want string
	}{
		{"zero mass", weighout.Options{}, "button mass must be a positive number of grams, got 0 g"},
		{"negative mass", weighout.Options{TotalMassGrams: -5}, "got -5 g"},
		{"purity above 100 %", weighout.Options{TotalMassGrams: 10, Purity: map[string]float64{"Al": 1.2}}, "purity of Al is 120%"},
		{"purity zero", weighout.Options{TotalMassGrams: 10, Purity: map[string]float64{"Cu": 0}}, "purity of Cu is 0%"},
		{"loss 100 %", weighout.Options{TotalMassGrams: 10, Loss: map[string]float64{"Fe": 1}}, "loss allowance for Fe is 100%"},
		{"negative loss", weighout.Options{TotalMassGrams: 10, Loss: map[string]float64{"Fe": -0.1}}, "loss allowance for Fe is -10%"},
		{"purity for absent element", weighout.Options{TotalMassGrams: 10, Purity: map[string]float64{"Ni": 0.99}}, "purity given for Ni, which is not in the composition (Al, Cu, Fe)"},
		{"losses for absent elements", weighout.Options{TotalMassGrams: 10, Loss: map[string]float64{"Zn": 0.02, "Mg": 0.03}}, "loss allowance given for Mg, Zn, which are not in the composition"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := weighout.Plan(c, tt.opt)
			if err == nil || !strings.Contains(err.Error(), tt.want) {
				t.Errorf("err = %v, want %q", err, tt.want)
			}
		})
	}
	if _, err := weighout.Plan(nil, weighout.Options{TotalMassGrams: 1}); err == nil {
		t.Error("empty composition accepted")
	}
	if _, err := weighout.Plan(composition.Composition{{Element: "Qq", Fraction: 1}}, weighout.Options{TotalMassGrams: 1}); err == nil {
		t.Error("unknown element accepted")
	}
}

func zincSheet(t testing.TB) weighout.Sheet {
	s, err := weighout.Plan(parse(t, "Zn60Mg30Y10"), weighout.Options{TotalMassGrams: 5, Purity: map[string]float64{"Y": 0.999}})
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func TestWriteTextGolden(t *testing.T) {
	var b bytes.Buffer
	if err := zincSheet(t).WriteText(&b); err != nil {
		t.Fatal(err)
	}
	golden := filepath.Join("testdata", "zn60mg30y10.txt")
	if *update {
		if err := os.WriteFile(golden, b.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(golden)
	if err != nil {
		t.Fatal(err)
	}
	if b.String() != string(want) {
		t.Errorf("text sheet differs from %s (run with -update after checking):\n%s", golden, b.String())
	}
	// Masses are shown to 0.1 mg: the hand-worked 3.612029 g prints as 3.6120.
	if !strings.Contains(b.String(), "3.6120") || !strings.Contains(b.String(), "0.8031") {
		t.Errorf("rounded masses missing:\n%s", b.String())
	}
}

func TestWriteCSV(t *testing.T) {
	var b bytes.Buffer
	if err := zincSheet(t).WriteCSV(&b); err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(&b).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 5 || rows[0][0] != "element" || rows[4][0] != "total" {
		t.Fatalf("rows %v", rows)
	}
	// Full precision survives: Y weigh mass 0.802253235/0.999 (hand-worked above).
	y, _ := strconv.ParseFloat(rows[3][8], 64)
	if math.Abs(y-0.8030562916) > 1e-9 {
		t.Errorf("Y weigh_g %v", rows[3][8])
	}
}

func TestWriteJSON(t *testing.T) {
	var b bytes.Buffer
	if err := zincSheet(t).WriteJSON(&b); err != nil {
		t.Fatal(err)
	}
	var got struct {
		Elements []struct {
			Element string  `json:"element"`
			MassG   float64 `json:"mass_g"`
		} `json:"elements"`
		TotalG   float64 `json:"total_g"`
		Cautions []struct {
			Kind string `json:"kind"`
		} `json:"cautions"`
	}
	if err := json.Unmarshal(b.Bytes(), &got); err != nil {
		t.Fatal(err)
	}
	if len(got.Elements) != 3 || got.Elements[2].Element != "Y" || math.Abs(got.Elements[2].MassG-0.803056) > 2e-6 {
		t.Errorf("elements %+v", got.Elements)
	}
	if math.Abs(got.TotalG-5.093393) > 2e-6 || len(got.Cautions) == 0 || got.Cautions[len(got.Cautions)-1].Kind != "local-rules" {
		t.Errorf("total %g cautions %+v", got.TotalG, got.Cautions)
	}
}

func BenchmarkWeighOut(b *testing.B) {
	c := parse(b, "Zn60Mg30Y10")
	opt := weighout.Options{TotalMassGrams: 5, Purity: map[string]float64{"Y": 0.999}}
	for b.Loop() {
		if _, err := weighout.Plan(c, opt); err != nil {
			b.Fatal(err)
		}
	}
}

func ExamplePlan() {
	p, err := composition.Parse("Al63Cu25Fe12")
	if err != nil {
		panic(err)
	}
	sheet, err := weighout.Plan(p.Atomic, weighout.Options{TotalMassGrams: 10})
	if err != nil {
		panic(err)
	}
	for _, l := range sheet.Lines {
		fmt.Printf("%s %.4f g\n", l.Element, l.MassGrams)
	}
	// Output:
	// Al 4.2940 g
	// Cu 4.0131 g
	// Fe 1.6929 g
}

package element_test

import (
	"bytes"
	"errors"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"meltbook/analysis/element"
)

func mustScheme(t testing.TB, name string) element.Scheme {
	t.Helper()
	s, ok := element.LookupScheme(name)
	if !ok {
		t.Fatalf("built-in scheme %q missing", name)
	}
	return s
}

func TestSchemeNames(t *testing.T) {
	if got, want := element.SchemeNames(), []string{"group", "raynor"}; !reflect.DeepEqual(got, want) {
		t.Fatalf("SchemeNames = %v, want %v", got, want)
	}
	for _, name := range element.SchemeNames() {
		s := mustScheme(t, name)
		if s.Name != name || s.Source == "" {
			t.Errorf("%s: name %q, source %q", name, s.Name, s.Source)
		}
		for sym := range s.Valence {
			if _, ok := element.BySymbol(sym); !ok {
				t.Errorf("%s: valence for unknown symbol %q", name, sym)
			}
		}
	}
	if _, ok := element.LookupScheme("Raynor"); ok {
		t.Error("LookupScheme is case-sensitive; \"Raynor\" must not match")
	}
}

// TestGroupSchemeValences checks the group valences (Hume-Rothery's
// electron-concentration rules, common practice) and the divalent Eu and Yb
// (4f⁷ and 4f¹⁴ in the metal; common practice).
func TestGroupSchemeValences(t *testing.T) {
	want := map[float64][]string{
		1: {"Li", "Na", "K", "Rb", "Cs", "Cu", "Ag", "Au"},
		2: {"Be", "Mg", "Ca", "Sr", "Ba", "Zn", "Cd", "Hg", "Eu", "Yb"},
		3: {"B", "Al", "Ga", "In", "Tl", "Sc", "Y", "La", "Ce", "Pr", "Nd", "Pm", "Sm", "Gd",
			"Tb", "Dy", "Ho", "Er", "Tm", "Lu"},
		4: {"C", "Si", "Ge", "Sn", "Pb"},
		5: {"P", "As", "Sb", "Bi"},
	}
	for _, name := range element.SchemeNames() {
		s := mustScheme(t, name)
		for v, symbols := range want {
			for _, sym := range symbols {
				if got, ok := s.ValenceOf(sym); !ok || got != v {
					t.Errorf("%s: %s = %v (%v), want %v", name, sym, got, ok, v)
				}
			}
		}
	}
	g := mustScheme(t, "group")
	for _, sym := range []string{"Eu", "Yb"} {
		if !strings.Contains(g.Notes[sym], "divalent") {
			t.Errorf("group: note for %s %q does not say divalent", sym, g.Notes[sym])
		}
	}
}

// TestGroupSchemeLeavesTransitionMetalsUndefined checks the decision that
// the group scheme has no valence for the transition metals of groups 4-10,
// and that the error names the element and points to raynor.
func TestGroupSchemeLeavesTransitionMetalsUndefined(t *testing.T) {
	g := mustScheme(t, "group")
	for _, e := range element.All() {
		if e.Group < 4 || e.Group > 10 {
			continue
		}
		if _, ok := g.ValenceOf(e.Symbol); ok {
			t.Errorf("group defines transition metal %s", e.Symbol)
		}
		_, err := g.Require(e.Symbol)
		var missing *element.MissingValenceError
		if !errors.As(err, &missing) {
			t.Fatalf("%s: error %v is not a *MissingValenceError", e.Symbol, err)
		}
		msg := err.Error()
		if missing.Symbol != e.Symbol || !strings.Contains(msg, e.Symbol) || !strings.Contains(msg, `"raynor"`) {
			t.Errorf("%s: unhelpful error %q", e.Symbol, msg)
		}
	}
}

// TestRaynorValences checks the raynor scheme's transition-metal values.
func TestRaynorValences(t *testing.T) {
	tests := []struct {
		symbol string
		want   float64
	}{
		{"Cr", -4.66}, // G. V. Raynor, Prog. Met. Phys. 1, 1 (1949), as commonly quoted
		{"Mn", -3.66}, // Raynor (1949), as commonly quoted
		{"Fe", -2.66}, // Raynor (1949), as commonly quoted
		{"Co", -1.71}, // Raynor (1949), as commonly quoted
		{"Ni", -0.61}, // Raynor (1949), as commonly quoted
		{"Mo", -4.66}, // homologue of Cr; common practice
		{"W", -4.66},  // homologue of Cr; common practice
		{"Tc", -3.66}, // homologue of Mn; common practice
		{"Re", -3.66}, // homologue of Mn (Al-Pd-Re); common practice
		{"Ru", -2.66}, // homologue of Fe (Al-Cu-Ru); common practice
		{"Os", -2.66}, // homologue of Fe (Al-Cu-Os); common practice
		{"Rh", -1.71}, // homologue of Co; common practice
		{"Ir", -1.71}, // homologue of Co; common practice
		{"Pd", 0},     // 0 in Al-Pd-Mn e/a work; common practice
		{"Pt", 0},     // as Pd; common practice
		{"Cu", 1},     // group valence; common practice
		{"Al", 3},     // group valence; common practice
	}
	r := mustScheme(t, "raynor")
	for _, tt := range tests {
		got, err := r.Require(tt.symbol)
		if err != nil || got != tt.want {
			t.Errorf("raynor %s = %v, %v; want %v", tt.symbol, got, err, tt.want)
		}
		if r.Notes[tt.symbol] == "" && tt.symbol != "Cu" && tt.symbol != "Al" {
			t.Errorf("raynor %s: no note naming the source", tt.symbol)
		}
	}
	for _, sym := range []string{"Ti", "V", "Zr", "Nb", "Hf", "Ta"} {
		_, err := r.Require(sym)
		if err == nil || !strings.Contains(err.Error(), sym) || !strings.Contains(err.Error(), "scheme file") {
			t.Errorf("raynor %s: error %v, want one naming %s and suggesting a scheme file", sym, err, sym)
		}
	}
}

// TestElectronsPerAtomWorkedExamples computes e/a = Σ x_i·v_i for alloys of
// the families users work with, checked against hand calculations.
func TestElectronsPerAtomWorkedExamples(t *testing.T) {
	tests := []struct {
		scheme string
		parts  map[string]float64 // atomic fractions
		want   float64
	}{
		// Al65Cu20Fe15: 0.65·3 + 0.20·1 + 0.15·(−2.66) = 1.751 (by hand); the
		// stable Al-Cu-Fe i-phase sits near e/a 1.75 (Tsai, Inoue, Masumoto; from memory).
		{"raynor", map[string]float64{"Al": 0.65, "Cu": 0.20, "Fe": 0.15}, 1.751},
		// Al65Cu20Ru15: Ru as Fe, same e/a 1.751 (by hand).
		{"raynor", map[string]float64{"Al": 0.65, "Cu": 0.20, "Ru": 0.15}, 1.751},
		// Al70Pd20Mn10: 0.70·3 + 0.20·0 + 0.10·(−3.66) = 1.734 (by hand).
		{"raynor", map[string]float64{"Al": 0.70, "Pd": 0.20, "Mn": 0.10}, 1.734},
		// Al73Mn21Si6 (α-AlMnSi region): 2.19 − 0.7686 + 0.24 = 1.6614 (by hand).
		{"raynor", map[string]float64{"Al": 0.73, "Mn": 0.21, "Si": 0.06}, 1.6614},
		// Cd84Yb16 (Cd5.7Yb): all divalent, e/a = 2 (by hand).
		{"group", map[string]float64{"Cd": 0.84, "Yb": 0.16}, 2.0},
		// Zn60Mg30Ho10: 1.2 + 0.6 + 0.3 = 2.1 (by hand).
		{"group", map[string]float64{"Zn": 0.60, "Mg": 0.30, "Ho": 0.10}, 2.1},
	}
	for _, tt := range tests {
		s := mustScheme(t, tt.scheme)
		var ea float64
		for sym, x := range tt.parts {
			v, err := s.Require(sym)
			if err != nil {
				t.Fatal(err)
			}
			ea += x * v
		}
		if math.Abs(ea-tt.want) > 1e-9 {
			t.Errorf("%s %v: e/a %.6f, want %.6f", tt.scheme, tt.parts, ea, tt.want)
		}
	}
}

func TestLookupSchemeReturnsCopies(t *testing.T) {
	a := mustScheme(t, "raynor")
	a.Valence["Fe"] = 99
	a.Notes["Fe"] = "changed"
	b := mustScheme(t, "raynor")
	if b.Valence["Fe"] != -2.66 || b.Notes["Fe"] == "changed" {
		t.Fatal("changing a looked-up scheme changed the built-in")
	}
	c := b.Clone()
	c.Valence["Mn"] = 0
	if b.Valence["Mn"] != -3.66 {
		t.Fatal("Clone shares its map")
	}
}

func TestSymbolsOrderedByZ(t *testing.T) {
	s := element.Scheme{Valence: map[string]float64{"Fe": 1, "Al": 1, "Cu": 1, "H": 1}}
	if got, want := s.Symbols(), []string{"H", "Al", "Fe", "Cu"}; !reflect.DeepEqual(got, want) {
		t.Fatalf("Symbols = %v, want %v", got, want)
	}
}

const alPdReFile = `# Al-Pd-Re work: Pd counted as Ni
name   alpdre
base   raynor

Pd  -0.61   Raynor's Ni value, homologue rule   # note runs to the comment
Ti  4       group valence
`

func TestReadScheme(t *testing.T) {
	s, err := element.ReadScheme(strings.NewReader(alPdReFile), "alpdre.txt")
	if err != nil {
		t.Fatal(err)
	}
	if s.Name != "alpdre" {
		t.Errorf("name %q", s.Name)
	}
	checks := map[string]float64{"Pd": -0.61, "Ti": 4, "Re": -3.66, "Mn": -3.66, "Al": 3}
	for sym, want := range checks {
		if got, ok := s.ValenceOf(sym); !ok || got != want {
			t.Errorf("%s = %v (%v), want %v", sym, got, ok, want)
		}
	}
	if got, want := s.Notes["Pd"], "Raynor's Ni value, homologue rule"; got != want {
		t.Errorf("Pd note %q, want %q", got, want)
	}
	if !strings.Contains(s.Source, "alpdre.txt") || !strings.Contains(s.Source, "raynor") {
		t.Errorf("source %q does not name the file and base", s.Source)
	}
	if _, ok := s.ValenceOf("Zr"); ok {
		t.Error("Zr set though the file does not set it")
	}
}

func TestReadSchemeWithoutBase(t *testing.T) {
	in := "\uFEFFsource  own counts, 2024\r\nAl 3\r\nCu 1\r\nFe -2.66\r\n"
	s, err := element.ReadScheme(strings.NewReader(in), "dir/own.scheme")
	if err != nil {
		t.Fatal(err)
	}
	if s.Name != "own" || s.Source != "own counts, 2024" || len(s.Valence) != 3 {
		t.Errorf("got %+v", s)
	}
	if _, ok := s.ValenceOf("Mg"); ok {
		t.Error("a file without base must define only its own elements")
	}
	named, err := element.ReadScheme(strings.NewReader("Al 3\n"), "raynor.txt")
	if err != nil {
		t.Fatal(err)
	}
	if named.Name == "raynor" {
		t.Error("a file named like a built-in scheme must not take its name")
	}
}

func TestReadSchemeErrors(t *testing.T) {
	tests := []struct {
		name, in, want string
	}{
		{"empty", "", "scheme file f.txt: no base line and no element lines"},
		{"only comments", "# nothing\n\n", "no base line and no element lines"},
		{"unknown element", "base raynor\nXx 2\n", "line 2, field 1: unknown element \"Xx\""},
		{"wrong case", "CO 2\n", "line 1, field 1: unknown element \"CO\""},
		{"unknown keyword", "bsae raynor\n", "line 1, field 1: unknown keyword \"bsae\""},
		{"not a number", "Al three\n", "line 1, field 2: valence \"three\" is not a number"},
		{"NaN", "Al NaN\n", "line 1, field 2: valence \"NaN\" is not a number"},
		{"Inf", "Al +Inf\n", "line 1, field 2: valence \"+Inf\" is not a number"},
		{"too large", "Al 11\n", "line 1, field 2: valence 11 outside"},
		{"missing value", "\nAl\n", "line 2: Al needs a valence"},
		{"duplicate", "Al 3\nCu 1\nAl 2\n", "line 3, field 1: Al already set on line 1"},
		{"base after elements", "Al 3\nbase group\n", "line 2, field 1: base must come before the element lines"},
		{"base twice", "base group\nbase raynor\n", "line 2, field 1: base already given on line 1"},
		{"unknown base", "base rayner\n", "line 1, field 2: unknown base scheme \"rayner\""},
		{"base without name", "base\n", "line 1: base takes one scheme name"},
		{"base file path", "base ./x.txt\n", "line 1, field 2: unknown base scheme"},
		{"name taken", "name group\nAl 3\n", "line 1, field 2: name \"group\" belongs to a built-in scheme"},
		{"name two words", "name my scheme\nAl 3\n", "line 1: name takes one word"},
		{"name twice", "name a\nname b\n", "line 2, field 1: name already given on line 1"},
		{"source empty", "source\n", "line 1: source needs a text"},
		{"source twice", "source a\nsource b\n", "line 2, field 1: source already given on line 1"},
		{"long line", "# " + strings.Repeat("x", 5000) + "\nAl 3\n", "line 1: line longer than"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := element.ReadScheme(strings.NewReader(tt.in), "f.txt")
			if err == nil {
				t.Fatalf("no error, want %q", tt.want)
			}
			var fe *element.SchemeFileError
			if !errors.As(err, &fe) {
				t.Fatalf("error %v is not a *SchemeFileError", err)
			}
			if !strings.Contains(err.Error(), tt.want) || !strings.HasPrefix(err.Error(), "scheme file f.txt") {
				t.Fatalf("error %q, want it to contain %q", err, tt.want)
			}
		})
	}
}

func TestLoadScheme(t *testing.T) {
	s, err := element.LoadScheme("raynor")
	if err != nil || s.Name != "raynor" {
		t.Fatalf("LoadScheme(raynor) = %v, %v", s.Name, err)
	}
	dir := t.TempDir()
	path := filepath.Join(dir, "alpdre.txt")
	if err := os.WriteFile(path, []byte(alPdReFile), 0o644); err != nil {
		t.Fatal(err)
	}
	s, err = element.LoadScheme(path)
	if err != nil || s.Name != "alpdre" || s.Valence["Pd"] != -0.61 {
		t.Fatalf("LoadScheme(file) = %+v, %v", s, err)
	}
	bad := filepath.Join(dir, "bad.txt")
	if err := os.WriteFile(bad, []byte("base raynor\nFe x\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := element.LoadScheme(bad); err == nil || !strings.Contains(err.Error(), bad+": line 2, field 2") {
		t.Errorf("bad file: error %v", err)
	}
	if _, err := element.LoadScheme("raynr"); err == nil || !strings.Contains(err.Error(), "built-in schemes are group, raynor") {
		t.Errorf("unknown name: error %v", err)
	}
	if _, err := element.LoadScheme(filepath.Join(dir, "missing.txt")); err == nil || !strings.Contains(err.Error(), "missing.txt") {
		t.Errorf("missing file: error %v", err)
	}
}

func TestWriteSchemeRoundTrip(t *testing.T) {
	for _, name := range element.SchemeNames() {
		s := mustScheme(t, name)
		var buf bytes.Buffer
		if err := element.WriteScheme(&buf, s); err != nil {
			t.Fatal(err)
		}
		back, err := element.ReadScheme(&buf, "copy-of-"+name+".txt")
		if err != nil {
			t.Fatalf("%s: reading the written scheme: %v\n%s", name, err, buf.String())
		}
		if !reflect.DeepEqual(back.Valence, s.Valence) {
			t.Errorf("%s: valences differ after a round trip", name)
		}
		for sym, note := range s.Notes {
			if back.Notes[sym] != note {
				t.Errorf("%s: note for %s %q, want %q", name, sym, back.Notes[sym], note)
			}
		}
		if back.Source != s.Source {
			t.Errorf("%s: source %q, want %q", name, back.Source, s.Source)
		}
	}
}

func FuzzReadScheme(f *testing.F) {
	f.Add(alPdReFile)
	f.Add("base group\nYb 3 trivalent instead\n")
	f.Add("Al 3\nCu 1\nFe -2.66\n")
	f.Add("name x\nsource y z\nAl 1e0\n")
	f.Add("\uFEFFAl 3 # c\r\n")
	f.Add("Al 3\nAl 2\n")
	f.Add("base raynor\nMn -0x1p1\n")
	f.Fuzz(func(t *testing.T, in string) {
		s, err := element.ReadScheme(strings.NewReader(in), "fuzz.txt")
		if err != nil {
			var fe *element.SchemeFileError
			if !errors.As(err, &fe) {
				t.Fatalf("error %v is not a *SchemeFileError", err)
			}
			return
		}
		if s.Name == "" || len(s.Valence) == 0 {
			t.Fatalf("accepted scheme without name or valences: %+v", s)
		}
		for sym, v := range s.Valence {
			if _, ok := element.BySymbol(sym); !ok {
				t.Fatalf("accepted unknown element %q", sym)
			}
			if math.IsNaN(v) || math.Abs(v) > element.MaxSchemeValence {
				t.Fatalf("accepted valence %v for %s", v, sym)
			}
		}
		var buf bytes.Buffer
		if err := element.WriteScheme(&buf, s); err != nil {
			t.Fatal(err)
		}
		back, err := element.ReadScheme(&buf, "fuzz-copy.txt")
		if err != nil {
			t.Fatalf("written scheme does not read back: %v\n%s", err, buf.String())
		}
		if !reflect.DeepEqual(back.Valence, s.Valence) {
			t.Fatalf("round trip changed valences:\n%v\n%v", s.Valence, back.Valence)
		}
	})
}

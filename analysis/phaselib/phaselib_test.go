package phaselib_test

import (
	"encoding/json"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"meltbook/analysis/crystal"
	"meltbook/analysis/indexing"
	"meltbook/analysis/internal/pyref"
	"meltbook/analysis/phaselib"
	"meltbook/analysis/powder"
)

// cuKalpha1 is the Cu Kα1 wavelength in Å (common practice: 1.5406 Å,
// the value diffractometer software uses by default).
const cuKalpha1 = 1.5406

func builtin(t *testing.T) *phaselib.Library {
	t.Helper()
	lib, err := phaselib.Builtin()
	if err != nil {
		t.Fatal(err)
	}
	return lib
}

// TestBuiltinPhases checks what the embedded library holds: the names,
// crystal systems, lattice letters and space groups of the phases. The
// expected values are the structure types as the trade knows them
// (common practice; the space groups from memory of the structure
// reports cited in each file).
func TestBuiltinPhases(t *testing.T) {
	want := map[string]struct {
		name, sg string
		kind     indexing.Kind
		centring string
	}{
		"Al":             {"Al", "Fm-3m", indexing.Cubic, "F"},            // fcc, common practice
		"Si":             {"Si", "Fd-3m", indexing.Cubic, "F"},            // diamond, common practice
		"Mg":             {"Mg", "P63/mmc", indexing.Hexagonal, "P"},      // hcp, common practice
		"Zn":             {"Zn", "P63/mmc", indexing.Hexagonal, "P"},      // hcp, common practice
		"theta-Al2Cu":    {"θ-Al2Cu", "I4/mcm", indexing.Tetragonal, "I"}, // C16 type, common practice
		"beta-Al(Cu,Fe)": {"β-Al(Cu,Fe)", "Pm-3m", indexing.Cubic, "P"},   // B2 (CsCl) type, common practice
		"Al6Mn":          {"Al6Mn", "Cmcm", indexing.Orthorhombic, "C"},   // from memory
		"MgZn2":          {"MgZn2", "P63/mmc", indexing.Hexagonal, "P"},   // C14 Laves, common practice
		"Al3Pd2":         {"Al3Pd2", "P-3m1", indexing.Hexagonal, "P"},    // Ni2Al3 type, from memory
	}
	lib := builtin(t)
	if lib.Len() != len(want) {
		names := []string{}
		for _, p := range lib.Phases() {
			names = append(names, p.Key)
		}
		t.Errorf("built-in library holds %d phases %v, want %d", lib.Len(), names, len(want))
	}
	for key, w := range want {
		p, err := lib.Find(key)
		if err != nil {
			t.Errorf("%s: %v", key, err)
			continue
		}
		k, err := p.Known(cuKalpha1)
		if err != nil {
			t.Fatalf("%s: %v", key, err)
		}
		if p.Name != w.name || k.SpaceGroup != w.sg || k.System != w.kind || k.Centring != w.centring {
			t.Errorf("%s = %q %s %s %s, want %q %s %s %s", key, p.Name, k.SpaceGroup, k.System, k.Centring, w.name, w.sg, w.kind, w.centring)
		}
		if p.Origin != phaselib.BuiltIn {
			t.Errorf("%s: origin %q", key, p.Origin)
		}
		// Every file names its publication (authors, journal and year) and
		// says what of it was checked.
		ref := p.Structure.Reference
		if !strings.Contains(ref, "(19") && !strings.Contains(ref, "(20") || !strings.Contains(ref, ",") {
			t.Errorf("%s: reference %q lacks authors or a year", key, ref)
		}
		if len(p.Provenance) < 20 {
			t.Errorf("%s: provenance %q", key, p.Provenance)
		}
	}
}

// TestBuiltinStoichiometry checks each phase's cell content against the
// formula its file states: the ratios of the elements over the whole cell
// (sites expanded by the space group, weighted by occupancy) must equal
// _chemical_formula_sum's within 0.5 %. The formulas are the phases'
// names as the trade writes them (common practice).
func TestBuiltinStoichiometry(t *testing.T) {
	for _, p := range builtin(t).Phases() {
		count := map[string]float64{}
		for _, a := range p.Structure.Atoms() {
			site := p.Structure.Sites[a.Site]
			count[site.Element] += site.Occupancy
		}
		formula := map[string]float64{}
		for _, f := range strings.Fields(p.Structure.Formula) {
			el := strings.TrimRight(f, "0123456789.")
			n := 1.0
			if rest := f[len(el):]; rest != "" {
				if err := json.Unmarshal([]byte(rest), &n); err != nil {
					t.Fatalf("%s: formula %q: %v", p.Key, p.Structure.Formula, err)
				}
			}
			formula[el] = n
		}
		if len(formula) != len(count) {
			t.Errorf("%s: formula %q has elements %v, the cell %v", p.Key, p.Structure.Formula, formula, count)
			continue
		}
		ref := p.Elements[0]
		for el, n := range formula {
			got := count[el] / count[ref]
			want := n / formula[ref]
			if math.Abs(got-want) > 0.005*want {
				t.Errorf("%s: %s/%s = %.4f in the cell, %.4f in the formula %q", p.Key, el, ref, got, want, p.Structure.Formula)
			}
		}
	}
}

// TestBuiltinDistances catches a mistyped coordinate: in these metallic
// phases no two atoms lie closer than 2.3 Å. (Common practice: the
// shortest metal–metal contacts in aluminides are about 2.4–2.5 Å, Cu–Cu
// in θ-Al2Cu about 2.44 Å, Si–Si in silicon 2.35 Å.)
func TestBuiltinDistances(t *testing.T) {
	for _, p := range builtin(t).Phases() {
		s := p.Structure
		atoms := s.Atoms()
		g := s.Cell.Metric()
		shortest := math.Inf(1)
		for i, a := range atoms {
			for j := i; j < len(atoms); j++ {
				b := atoms[j]
				for dx := -1; dx <= 1; dx++ {
					for dy := -1; dy <= 1; dy++ {
						for dz := -1; dz <= 1; dz++ {
							if i == j && dx == 0 && dy == 0 && dz == 0 {
								continue
							}
							d := [3]float64{b.Fract[0] + float64(dx) - a.Fract[0], b.Fract[1] + float64(dy) - a.Fract[1], b.Fract[2] + float64(dz) - a.Fract[2]}
							var d2 float64
							for r := 0; r < 3; r++ {
								for c := 0; c < 3; c++ {
									d2 += d[r] * g[r][c] * d[c]
								}
							}
							// Sites sharing one position (mixed occupancy) are one atom.
							if d2 > 0.01 {
								shortest = math.Min(shortest, math.Sqrt(d2))
							}
						}
					}
				}
			}
		}
		if shortest < 2.3 {
			t.Errorf("%s: two atoms %.3f Å apart; a coordinate is wrong", p.Key, shortest)
		}
	}
}

// TestBuiltinAgainstGemmi reads every built-in file with python3-gemmi
// and compares the space-group number, the cell and the whole-cell atom
// positions with this package's reading. Positions must agree to 1e-4 in
// fractional units (the files give coordinates to four or five places).
func TestBuiltinAgainstGemmi(t *testing.T) {
	dir, err := filepath.Abs("phases")
	if err != nil {
		t.Fatal(err)
	}
	files, err := filepath.Glob(filepath.Join(dir, "*.cif"))
	if err != nil || len(files) == 0 {
		t.Fatalf("no phase files: %v", err)
	}
	in, _ := json.Marshal(files)
	out := pyref.Run(t, []string{"gemmi"}, `
import gemmi, json, sys
out = []
for path in json.load(sys.stdin):
    st = gemmi.read_small_structure(path)
    sg = gemmi.find_spacegroup_by_name(st.spacegroup_hm)
    c = st.cell
    out.append({"path": path, "number": sg.number,
                "cell": [c.a, c.b, c.c, c.alpha, c.beta, c.gamma],
                "sites": [[s.type_symbol, s.fract.x % 1.0, s.fract.y % 1.0, s.fract.z % 1.0]
                          for s in st.get_all_unit_cell_sites()]})
print(json.dumps(out))
`, in)
	var ref []struct {
		Path   string
		Number int
		Cell   [6]float64
		Sites  [][4]any
	}
	if err := json.Unmarshal(out, &ref); err != nil {
		t.Fatal(err)
	}
	for _, r := range ref {
		data, err := os.ReadFile(r.Path)
		if err != nil {
			t.Fatal(err)
		}
		ps, err := phaselib.Parse(filepath.Base(r.Path), data)
		if err != nil {
			t.Fatal(err)
		}
		s := ps[0].Structure
		name := filepath.Base(r.Path)
		if s.Group.Number != r.Number {
			t.Errorf("%s: space group %d, gemmi %d", name, s.Group.Number, r.Number)
		}
		got := [6]float64{s.Cell.A, s.Cell.B, s.Cell.C, s.Cell.Alpha, s.Cell.Beta, s.Cell.Gamma}
		for i := range got {
			if math.Abs(got[i]-r.Cell[i]) > 1e-9 {
				t.Errorf("%s: cell %v, gemmi %v", name, got, r.Cell)
				break
			}
		}
		atoms := s.Atoms()
		if len(atoms) != len(r.Sites) {
			t.Errorf("%s: %d atoms in the cell, gemmi %d", name, len(atoms), len(r.Sites))
			continue
		}
		for _, rs := range r.Sites {
			el := rs[0].(string)
			x := [3]float64{rs[1].(float64), rs[2].(float64), rs[3].(float64)}
			found := false
			for _, a := range atoms {
				if s.Sites[a.Site].Element != el {
					continue
				}
				ok := true
				for k := 0; k < 3; k++ {
					d := a.Fract[k] - x[k]
					d -= math.Round(d)
					ok = ok && math.Abs(d) < 1e-4
				}
				found = found || ok
			}
			if !found {
				t.Errorf("%s: gemmi's %s at %v is not among this reading's atoms", name, el, x)
			}
		}
	}
}

// TestKnownLinesArePowderLines checks the conversion for the indexer: the
// lines are the powder calculator's, unchanged, at the wavelength given.
// (The calculator itself is checked against pymatgen and gemmi for every
// file of the library in the powder package's tests.)
func TestKnownLinesArePowderLines(t *testing.T) {
	p, err := builtin(t).Find("θ-Al2Cu")
	if err != nil {
		t.Fatal(err)
	}
	const coKalpha1 = 1.78897 // Å, common practice (Co Kα1)
	k, err := p.Known(coKalpha1)
	if err != nil {
		t.Fatal(err)
	}
	lines, err := powder.Pattern(p.Structure, powder.Options{WavelengthA: coKalpha1, TwoThetaMaxDeg: phaselib.LinesTwoThetaMaxDeg})
	if err != nil {
		t.Fatal(err)
	}
	if len(k.Lines) != len(lines) || len(lines) < 10 {
		t.Fatalf("%d known lines, %d powder lines", len(k.Lines), len(lines))
	}
	for i, l := range lines {
		if k.Lines[i].DSpacingA != l.DSpacingA || k.Lines[i].Intensity != l.Intensity || k.Lines[i].HKL != l.HKL {
			t.Fatalf("line %d: %+v, powder %+v", i, k.Lines[i], l)
		}
	}
	// θ-Al2Cu's (110) at d = a/√2 = 4.290 Å (a = 6.067 Å, from memory of
	// the cited report) is its first line.
	if math.Abs(k.Lines[0].DSpacingA-6.067/math.Sqrt2) > 1e-3 || k.Lines[0].HKL != [3]int{1, 1, 0} {
		t.Errorf("first line %+v, want 110 at 4.290 Å", k.Lines[0])
	}
}

func TestFindSpellings(t *testing.T) {
	lib := builtin(t)
	for _, name := range []string{"θ-Al2Cu", `\q-Al2Cu`, "theta-al2cu", " THETA-Al2Cu "} {
		p, err := lib.Find(name)
		if err != nil || p.Key != "theta-Al2Cu" {
			t.Errorf("Find(%q) = %q, %v", name, p.Key, err)
		}
	}
	_, err := lib.Find("omega-Al7Cu2Fe")
	if !errors.Is(err, phaselib.ErrNoPhase) || !strings.Contains(err.Error(), "theta-Al2Cu") {
		t.Errorf("Find of a missing phase: %v; want ErrNoPhase listing what the library holds", err)
	}
}

func TestNames(t *testing.T) {
	for _, c := range []struct{ in, display, ascii string }{
		{`\q-Al2Cu`, "θ-Al2Cu", "theta-Al2Cu"},
		{`\b-Al(Cu,Fe)`, "β-Al(Cu,Fe)", "beta-Al(Cu,Fe)"},
		{`\x'-Al-Pd-Mn`, "ξ'-Al-Pd-Mn", "xi'-Al-Pd-Mn"},
		{"ξ′-Al-Pd-Mn", "ξ′-Al-Pd-Mn", "xi'-Al-Pd-Mn"},
		{"MgZn2", "MgZn2", "MgZn2"},
	} {
		if got := phaselib.DisplayName(c.in); got != c.display {
			t.Errorf("DisplayName(%q) = %q, want %q", c.in, got, c.display)
		}
		if got := phaselib.ASCIIName(c.in); got != c.ascii {
			t.Errorf("ASCIIName(%q) = %q, want %q", c.in, got, c.ascii)
		}
	}
}

func TestForElements(t *testing.T) {
	lib := builtin(t)
	keys := func(ps []phaselib.Phase) string {
		var k []string
		for _, p := range ps {
			k = append(k, p.Key)
		}
		return strings.Join(k, " ")
	}
	for _, c := range []struct {
		els  []string
		want string
	}{
		{[]string{"Al", "Cu", "Fe"}, "Al beta-Al(Cu,Fe) theta-Al2Cu"},
		{[]string{"Zn", "Mg", "Y"}, "Mg MgZn2 Zn"},
		{[]string{"Al", "Pd", "Mn"}, "Al Al3Pd2 Al6Mn"},
		{[]string{"Fe"}, ""},
	} {
		if got := keys(lib.ForElements(c.els)); got != c.want {
			t.Errorf("ForElements(%v) = %q, want %q", c.els, got, c.want)
		}
	}
	if n := len(lib.ForElements(nil)); n != lib.Len() {
		t.Errorf("no elements: %d phases, want all %d", n, lib.Len())
	}
}

// userCIF is the user's file the tests of the library folders share,
// renamed so that it adds a phase instead of replacing none.
func userCIF(t *testing.T) string {
	return strings.Replace(string(mustRead(t, "testdata/user-Cu.cif")), "'Cu'\n_chemical_formula_sum", "'\\w-Test'\n_chemical_formula_sum", 1)
}

func TestLoadUserFolder(t *testing.T) {
	userCIF := userCIF(t)
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "test.cif"), []byte(userCIF), 0o644); err != nil {
		t.Fatal(err)
	}
	// A user's Al replaces the built-in one.
	al := strings.NewReplacer(`'\w-Test'`, "'Al'", "'Cu'", "'Al'", "Cu1 Cu", "Al1 Al", "3.6149", "4.0500").Replace(userCIF)
	if err := os.WriteFile(filepath.Join(dir, "myAl.CIF"), []byte(al), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "notes.txt"), []byte("not a CIF"), 0o644); err != nil {
		t.Fatal(err)
	}
	lib, err := phaselib.Load(dir)
	if err != nil {
		t.Fatal(err)
	}
	if lib.Len() != builtin(t).Len()+1 {
		t.Errorf("%d phases, want the built-in ones and one more", lib.Len())
	}
	p, err := lib.Find("omega-Test")
	if err != nil || p.Name != "ω-Test" || p.Origin != filepath.Join(dir, "test.cif") {
		t.Errorf("user phase = %+v, %v", p.Name, err)
	}
	a, _ := lib.Find("Al")
	if a.Structure.Cell.A != 4.05 || a.Origin == phaselib.BuiltIn {
		t.Errorf("Al a = %g from %s, want the user's 4.05", a.Structure.Cell.A, a.Origin)
	}
	// The built-in library is untouched.
	if b, _ := builtin(t).Find("Al"); b.Structure.Cell.A == 4.05 {
		t.Error("loading a folder changed the built-in library")
	}
}

func TestLoadErrors(t *testing.T) {
	userCIF := userCIF(t)
	dir := t.TempDir()
	if _, err := phaselib.Load(filepath.Join(dir, "absent")); err == nil || !strings.Contains(err.Error(), "absent") {
		t.Errorf("missing folder: %v", err)
	}
	bad := strings.Replace(userCIF, "_cell_length_b 3.6149", "_cell_length_b 3,6149", 1)
	if err := os.WriteFile(filepath.Join(dir, "bad.cif"), []byte(bad), 0o644); err != nil {
		t.Fatal(err)
	}
	_, err := phaselib.Load(dir)
	var fe *crystal.FileError
	if !errors.As(err, &fe) || !strings.Contains(err.Error(), "bad.cif:10") || !strings.Contains(err.Error(), "_cell_length_b") {
		t.Errorf("bad file: %v; want file:line and the data name", err)
	}
	dup := t.TempDir()
	for _, n := range []string{"a.cif", "b.cif"} {
		if err := os.WriteFile(filepath.Join(dup, n), []byte(userCIF), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	if _, err := phaselib.Load(dup); err == nil || !strings.Contains(err.Error(), "a.cif") || !strings.Contains(err.Error(), "b.cif") {
		t.Errorf("two files of one phase: %v; want both named", err)
	}
}

func mustRead(t *testing.T, path string) []byte {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

package crystal_test

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"strconv"
	"strings"
	"testing"

	"meltbook/analysis/cif"
	"meltbook/analysis/crystal"
	"meltbook/analysis/internal/pyref"
)

var structureFiles = []string{"al.cif", "nacl.cif", "mg.cif", "al2cu.cif", "bi.cif", "monoclinic.cif"}

func readFile(t testing.TB, name string) []crystal.Structure {
	t.Helper()
	data, err := os.ReadFile("testdata/" + name)
	if err != nil {
		t.Fatal(err)
	}
	s, err := crystal.ReadCIF(name, data)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// gemmiSites reads each path of stdin with python3-gemmi 0.5.7
// (read_small_structure, get_all_unit_cell_sites) and prints the number of
// atoms in the cell, then label and fractional coordinates of each. That
// version takes the symmetry from the H-M name only, so where the file
// gives operations or a Hall symbol the script finds the group from them
// with gemmi's own functions.
const gemmiSites = `
import sys
import gemmi
for path in sys.stdin.read().split():
    st = gemmi.read_small_structure(path)
    block = gemmi.cif.read(path).sole_block()
    ops = list(block.find_values('_space_group_symop_operation_xyz')) or list(block.find_values('_symmetry_equiv_pos_as_xyz'))
    hall = block.find_value('_space_group_name_Hall') or block.find_value('_symmetry_space_group_name_Hall')
    if ops:
        st.spacegroup_hm = gemmi.find_spacegroup_by_ops(gemmi.GroupOps([gemmi.Op(gemmi.cif.as_string(o)) for o in ops])).xhm()
    elif hall:
        st.spacegroup_hm = gemmi.find_spacegroup_by_ops(gemmi.symops_from_hall(gemmi.cif.as_string(hall))).xhm()
    st.setup_cell_images()
    sites = st.get_all_unit_cell_sites()
    print(len(sites))
    for s in sites:
        print(s.label, repr(s.fract.x), repr(s.fract.y), repr(s.fract.z))
`

// TestReadCIFAgainstGemmi compares the atoms of the whole cell, count and
// positions (tolerance 10⁻⁴ fractional, modulo whole cells), with
// python3-gemmi 0.5.7's expansion of the same files.
func TestReadCIFAgainstGemmi(t *testing.T) {
	var paths []string
	for _, f := range structureFiles {
		paths = append(paths, "testdata/"+f)
	}
	out := pyref.Run(t, []string{"gemmi"}, gemmiSites, []byte(strings.Join(paths, "\n")))
	sc := bufio.NewScanner(bytes.NewReader(out))
	for _, f := range structureFiles {
		if !sc.Scan() {
			t.Fatalf("reference output ends before %s", f)
		}
		n, err := strconv.Atoi(sc.Text())
		if err != nil {
			t.Fatalf("%s: reference count %q", f, sc.Text())
		}
		s := readFile(t, f)[0]
		atoms := s.Atoms()
		if len(atoms) != n {
			t.Errorf("%s: %d atoms in the cell, gemmi %d", f, len(atoms), n)
		}
		used := make([]bool, len(atoms))
		for k := 0; k < n; k++ {
			if !sc.Scan() {
				t.Fatalf("%s: reference output short", f)
			}
			var label string
			var x [3]float64
			if _, err := fmt.Sscan(sc.Text(), &label, &x[0], &x[1], &x[2]); err != nil {
				t.Fatalf("%s: reference line %q: %v", f, sc.Text(), err)
			}
			found := false
			for i, a := range atoms {
				if used[i] || s.Sites[a.Site].Label != label {
					continue
				}
				ok := true
				for j := range x {
					d := a.Fract[j] - x[j]
					if math.Abs(d-math.Round(d)) > 1e-4 {
						ok = false
					}
				}
				if ok {
					used[i], found = true, true
					break
				}
			}
			if !found {
				t.Errorf("%s: gemmi's atom %s at %v is not among the expanded atoms", f, label, x)
			}
		}
	}
}

func TestReadCIFFields(t *testing.T) {
	theta := readFile(t, "al2cu.cif")[0]
	// Name prefers _chemical_name_common; the reference is the fixture's
	// own citation.
	if theta.Name != "theta-Al2Cu" || theta.Formula != "Al2 Cu" ||
		theta.Reference != "Example, A., Sample, B., Journal of Test Fixtures 12, 345 (1999), doi:10.0000/fixture.1" {
		t.Errorf("al2cu: name %q formula %q reference %q", theta.Name, theta.Formula, theta.Reference)
	}
	// I4/mcm is No. 140 (International Tables Vol. A); "Al0+" is Al.
	if theta.Group.Number != 140 || theta.Sites[0].Element != "Al" || theta.Sites[1].Element != "Cu" {
		t.Errorf("al2cu: group %d, elements %s %s", theta.Group.Number, theta.Sites[0].Element, theta.Sites[1].Element)
	}
	cases := []struct {
		file  string
		site  int
		u     float64
		label string
	}{
		// orthogonal axes: U_eq is the mean of U11, U22, U33 (Fischer &
		// Tillmanns, Acta Cryst. C44, 775 (1988)): (0.010+0.010+0.013)/3
		{"al2cu.cif", 0, 0.011, "Al1"},
		{"al2cu.cif", 1, (0.008 + 0.008 + 0.009) / 3, "Cu1"},
		// U = B/(8π²), common practice: 0.79/78.9568352
		{"mg.cif", 0, 0.79 / 78.95683520871486, "Mg1"},
		{"al.cif", 0, 0.0075, "Al1"},
		// "." and "?" give the documented default 0.01 Å²
		{"monoclinic.cif", 3, 0.01, "O1"},
		{"monoclinic.cif", 4, 0.01, "O2"},
		// no displacement at all: the default
		{"bi.cif", 0, 0.01, "Bi1"},
	}
	for _, c := range cases {
		s := readFile(t, c.file)[0]
		if got := s.Sites[c.site]; got.Label != c.label || math.Abs(got.UisoA2-c.u) > 1e-9 {
			t.Errorf("%s site %s: U = %g Å², want %g", c.file, got.Label, got.UisoA2, c.u)
		}
	}
	// Names and settings: halite from _chemical_name_mineral, the
	// invented oxide from its block name, Bi in hexagonal axes (R-3m:H).
	if s := readFile(t, "nacl.cif")[0]; s.Name != "halite" || s.Group.Number != 225 || s.Sites[0].Element != "Na" || s.Sites[1].Element != "Cl" {
		t.Errorf("nacl: %q %d %s %s", s.Name, s.Group.Number, s.Sites[0].Element, s.Sites[1].Element)
	}
	if s := readFile(t, "monoclinic.cif")[0]; s.Name != "invented_monoclinic" || s.Group.Number != 14 || s.Sites[2].Element != "Mn" || s.Sites[2].Occupancy != 0.3 {
		t.Errorf("monoclinic: %q %d %+v", s.Name, s.Group.Number, s.Sites[2])
	}
	if s := readFile(t, "bi.cif")[0]; s.Group.Number != 166 || s.Group.Setting != "H" || s.Name != "bismuth" {
		t.Errorf("bi: %q %d:%s", s.Name, s.Group.Number, s.Group.Setting)
	}
}

func TestReadCIFDefaultsAndAxes(t *testing.T) {
	// Angles absent are 90°; an R symbol on a cell a = b = c, α = β = γ
	// takes rhombohedral axes (R-3m:R has 12 operations, International
	// Tables Vol. A No. 166).
	const text = `data_rh
_cell_length_a 4.7459
_cell_length_b 4.7459
_cell_length_c 4.7459
_cell_angle_alpha 57.23
_cell_angle_beta 57.23
_cell_angle_gamma 57.23
_symmetry_space_group_name_H-M 'R -3 m'
loop_
_atom_site_label
_atom_site_fract_x
_atom_site_fract_y
_atom_site_fract_z
Bi1 0.2339 0.2339 0.2339
data_cube
_cell_length_a 3
_cell_length_b 3
_cell_length_c 3
_space_group_IT_number 221
loop_
_atom_site_label
_atom_site_fract_x
_atom_site_fract_y
_atom_site_fract_z
Cs1 0 0 0
Cl1 .5 .5 .5
data_shifted
_cell_length_a 5
_cell_length_b 6
_cell_length_c 7
_cell_angle_alpha 80
_cell_angle_beta 85
_cell_angle_gamma 95
_space_group_IT_number 2
loop_
_space_group_symop_operation_xyz
x,y,z
-x+1/6,-y,-z
loop_
_atom_site_label
_atom_site_fract_x
_atom_site_fract_y
_atom_site_fract_z
Si1 0.3 0.2 0.1
`
	s, err := crystal.ReadCIF("t.cif", []byte(text))
	if err != nil {
		t.Fatal(err)
	}
	if len(s) != 3 || s[0].Group.Setting != "R" || len(s[0].Group.Ops) != 12 || len(s[0].Atoms()) != 2 {
		t.Fatalf("rhombohedral block: %+v", s[0].Group)
	}
	if c := s[1].Cell; c.Alpha != 90 || c.Beta != 90 || c.Gamma != 90 || s[1].Group.Number != 221 {
		t.Errorf("cube: cell %+v, group %d", c, s[1].Group.Number)
	}
	// P-1 with its centre of symmetry at (1/12, 0, 0) is no listed
	// setting: the operations stay, the stated number 2 is kept.
	if g := s[2].Group; g.Number != 2 || g.System != crystal.Triclinic || g.HM != "" || len(g.Ops) != 2 {
		t.Errorf("shifted: group %+v", g)
	}
}

func TestUEquivalentMonoclinic(t *testing.T) {
	// Monoclinic closed form (Fischer & Tillmanns, Acta Cryst. C44, 775
	// (1988)): U_eq = ⅓[U22 + (U11 + U33 + 2 U13 cos β)/sin²β].
	cell := crystal.Cell{A: 5.1, B: 7.3, C: 8.2, Alpha: 90, Beta: 104.52, Gamma: 90}
	u11, u22, u33, u13 := 0.010, 0.012, 0.015, 0.002
	b := 104.52 * math.Pi / 180
	want := (u22 + (u11+u33+2*u13*math.Cos(b))/(math.Sin(b)*math.Sin(b))) / 3
	got := crystal.UEquivalent(cell, [3][3]float64{{u11, 0, u13}, {0, u22, 0}, {u13, 0, u33}})
	if math.Abs(got-want) > 1e-12 {
		t.Errorf("U_eq = %.12g, want %.12g", got, want)
	}
}

// gemmiD prints gemmi.UnitCell(a, b, c, α, β, γ).calculate_d((h, k, l))
// for each line "a b c α β γ h k l" of stdin.
const gemmiD = `
import sys
import gemmi
for line in sys.stdin:
    f = line.split()
    c = gemmi.UnitCell(*map(float, f[:6]))
    print(repr(c.calculate_d([int(x) for x in f[6:]])))
`

// TestDSpacingAgainstGemmi: 50 random reflections in each of ten random
// triclinic cells, d within 10⁻⁹ relative of python3-gemmi 0.5.7.
func TestDSpacingAgainstGemmi(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	type item struct {
		cell    crystal.Cell
		h, k, l int
	}
	var items []item
	var in bytes.Buffer
	for len(items) < 500 {
		c := crystal.Cell{A: 2 + 18*rng.Float64(), B: 2 + 18*rng.Float64(), C: 2 + 18*rng.Float64(),
			Alpha: 60 + 60*rng.Float64(), Beta: 60 + 60*rng.Float64(), Gamma: 60 + 60*rng.Float64()}
		if c.Validate() != nil {
			continue
		}
		for k := 0; k < 50; k++ {
			it := item{c, rng.IntN(21) - 10, rng.IntN(21) - 10, rng.IntN(21) - 10}
			if it.h == 0 && it.k == 0 && it.l == 0 {
				it.l = 1
			}
			items = append(items, it)
			fmt.Fprintf(&in, "%.17g %.17g %.17g %.17g %.17g %.17g %d %d %d\n", c.A, c.B, c.C, c.Alpha, c.Beta, c.Gamma, it.h, it.k, it.l)
		}
	}
	out := strings.Fields(string(pyref.Run(t, []string{"gemmi"}, gemmiD, in.Bytes())))
	if len(out) != len(items) {
		t.Fatalf("%d reference values for %d reflections", len(out), len(items))
	}
	for i, it := range items {
		want, err := strconv.ParseFloat(out[i], 64)
		if err != nil {
			t.Fatal(err)
		}
		if got := it.cell.DSpacing(it.h, it.k, it.l); math.Abs(got-want) > 1e-9*want {
			t.Errorf("%+v (%d %d %d): d = %.15g Å, gemmi %.15g", it.cell, it.h, it.k, it.l, got, want)
		}
	}
}

// good is a small valid CIF that the broken ones below change.
const good = `data_good
_cell_length_a 4.05
_cell_length_b 4.05
_cell_length_c 4.05
loop_
_space_group_symop_operation_xyz
x,y,z
-x,-y,-z
loop_
_atom_site_label
_atom_site_type_symbol
_atom_site_fract_x
_atom_site_fract_y
_atom_site_fract_z
_atom_site_occupancy
Al1 Al 0.1 0.2 0.3 1
Cu1 Cu 0.5 0.5 0.5 0.5
`

func TestReadCIFRefuses(t *testing.T) {
	cases := []struct {
		name, old, new, want string
	}{
		{"missing cell edge", "_cell_length_b 4.05\n", "", "b.cif:1: _cell_length_b: the cell edge is missing"},
		{"cell edge not a number", "_cell_length_b 4.05", "_cell_length_b four", "b.cif:3: _cell_length_b: \"four\" is not a number"},
		{"negative occupancy", "0.5 0.5 0.5 0.5", "0.5 0.5 0.5 -0.5", "b.cif:17: _atom_site_occupancy: site Cu1: occupancy -0.5 is not positive"},
		{"unknown element", "Cu1 Cu", "Cu1 Qq", "b.cif:17: _atom_site_type_symbol: \"Qq\" names no known element"},
		{"unparseable operation", "-x,-y,-z", "-x,-y,-q", "b.cif:8: _space_group_symop_operation_xyz: \"-x,-y,-q\""},
		{"not a group", "-x,-y,-z\n", "-x,-y,-z\ny,x,z\n", "b.cif:5: _space_group_symop_operation_xyz: do not form a group"},
		{"coordinate not a number", "0.1 0.2 0.3", "0.1 zero 0.3", "b.cif:16: _atom_site_fract_y: site Al1: coordinate \"zero\" is not a number"},
		{"duplicated label", "Cu1 Cu", "Al1 Cu", "b.cif:17: _atom_site_label: label \"Al1\" is used twice (first on line 16)"},
		{"no symmetry", "loop_\n_space_group_symop_operation_xyz\nx,y,z\n-x,-y,-z\n", "", "b.cif:1: _space_group_symop_operation_xyz: no symmetry given"},
		{"zero occupancy", "0.5 0.5 0.5 0.5", "0.5 0.5 0.5 0", "b.cif:17: _atom_site_occupancy: site Cu1: occupancy 0 is not positive"},
	}
	if _, err := crystal.ReadCIF("b.cif", []byte(good)); err != nil {
		t.Fatalf("the valid base file: %v", err)
	}
	for _, c := range cases {
		text := strings.Replace(good, c.old, c.new, 1)
		if text == good {
			t.Fatalf("%s: the change does not apply", c.name)
		}
		_, err := crystal.ReadCIF("b.cif", []byte(text))
		var fe *crystal.FileError
		if !errors.As(err, &fe) || !strings.HasPrefix(err.Error(), c.want) {
			t.Errorf("%s: error %v, want %q…", c.name, err, c.want)
		}
	}
	// a syntax fault is a *cif.Error with the column
	_, err := crystal.ReadCIF("b.cif", []byte("data_x\n_cell_length_a 'open\n"))
	var ce *cif.Error
	if !errors.As(err, &ce) || !strings.HasPrefix(err.Error(), "b.cif:2:16: ") {
		t.Errorf("syntax error %v", err)
	}
}

func BenchmarkReadCIF(b *testing.B) {
	data, err := os.ReadFile("testdata/al2cu.cif")
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		if _, err := crystal.ReadCIF("al2cu.cif", data); err != nil {
			b.Fatal(err)
		}
	}
}

func FuzzReadCIF(f *testing.F) {
	for _, name := range structureFiles {
		data, err := os.ReadFile("testdata/" + name)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(data)
	}
	f.Add([]byte(good))
	f.Add([]byte(strings.Replace(good, "-x,-y,-z\n", "-x,-y,-z\ny,x,z\n", 1)))
	f.Add([]byte(strings.Replace(good, "_cell_length_b 4.05\n", "", 1)))
	f.Add([]byte("data_x\n_cell_length_a 'open\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		structures, err := crystal.ReadCIF("fuzz.cif", data)
		if err != nil {
			var fe *crystal.FileError
			var ce *cif.Error
			if !errors.As(err, &fe) && !errors.As(err, &ce) {
				t.Fatalf("error %v is neither a FileError nor a cif.Error", err)
			}
			return
		}
		for _, s := range structures {
			if err := s.Validate(); err != nil {
				t.Fatalf("accepted structure does not validate: %v", err)
			}
		}
	})
}

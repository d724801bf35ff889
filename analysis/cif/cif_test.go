package cif_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"meltbook/analysis/cif"
)

// sample follows the CIF 1.1 syntax specification: a block with items, a
// quoted value, a text field, a loop and a save frame (left out).
const sample = `#\#CIF_1.1
data_alpha
_cell_length_a   4.0495(3)
_chemical_name_common 'alpha aluminium'
_publ_section_title
;
Two lines
of text
;
loop_
_atom_site_label
_atom_site_fract_x
Al1 0
Al2 .5
save_frame
_ignored 1
save_
data_beta
_symmetry_space_group_name_H-M "P 63/m m c"
`

func TestParse(t *testing.T) {
	blocks, err := cif.Parse("s.cif", []byte(sample))
	if err != nil {
		t.Fatal(err)
	}
	if len(blocks) != 2 || blocks[0].Name != "alpha" || blocks[1].Name != "beta" {
		t.Fatalf("blocks %v", blocks)
	}
	b := blocks[0]
	v, tag, ok := b.Item("_cell_length_a")
	if !ok || v.Text != "4.0495(3)" || v.Line != 3 || v.Col != 18 || tag != "_cell_length_a" {
		t.Errorf("cell a = %+v %q %v", v, tag, ok)
	}
	if v, _, _ := b.Item("_chemical_name_common"); v.Text != "alpha aluminium" || !v.Quoted {
		t.Errorf("name = %+v", v)
	}
	if v, _, _ := b.Item("_publ_section_title"); v.Text != "\nTwo lines\nof text" {
		t.Errorf("text field = %q", v.Text)
	}
	lp, col, _ := b.Loop("_atom_site_fract_x")
	if lp == nil || col != 1 || len(lp.Rows) != 2 || lp.Rows[1][1].Text != ".5" || lp.Line != 10 {
		t.Errorf("loop = %+v", lp)
	}
	if _, _, ok := b.Item("_ignored"); ok {
		t.Errorf("save frame item read")
	}
	// old and new names: the first given wins
	if v, tag, ok := blocks[1].Item("_space_group_name_H-M_alt", "_symmetry_space_group_name_H-M"); !ok || v.Text != "P 63/m m c" || tag != "_symmetry_space_group_name_h-m" {
		t.Errorf("H-M = %+v %q", v, tag)
	}
}

func TestParseRefuses(t *testing.T) {
	cases := []struct{ text, want string }{
		{"_a 1\n", "f.cif:1:1: data item before the first data_ block header"},
		{"data_x\n_a 1\n_a 2\n", "f.cif:3:1: tag _a given twice in data_x (first on line 2)"},
		{"data_x\nloop_\n_a\n_b\n1 2 3\n", "f.cif:2:1: loop_ has 3 values for 2 tags"},
		{"data_x\n_a 'open\n", "f.cif:2:4: quoted value not closed on its line (')"},
		{"data_x\n_a\n;\nnever closed\n", "f.cif:3:1: text field opened with ';' is never closed"},
		{"# nothing\n", "f.cif: no data_ block header"},
		{"data_x\nglobal_\n", "f.cif:2:1: global_ blocks are not allowed"},
		{"data_x\n_a\n", "f.cif:2:1: tag _a has no value"},
	}
	for _, c := range cases {
		_, err := cif.Parse("f.cif", []byte(c.text))
		var e *cif.Error
		if !errors.As(err, &e) || !strings.HasPrefix(err.Error(), c.want) {
			t.Errorf("Parse(%q) = %v, want %q…", c.text, err, c.want)
		}
	}
}

func TestNumber(t *testing.T) {
	// Standard uncertainty in units of the last digit: CIF 1.1 syntax
	// specification (common practice).
	cases := []struct {
		text   string
		quoted bool
		v, su  float64
		hasSU  bool
		err    error
	}{
		{"1.234(5)", false, 1.234, 0.005, true, nil},
		{"28.4400(5)", false, 28.44, 0.0005, true, nil},
		{"1.5e3(2)", false, 1500, 200, true, nil},
		{"12(3)", false, 12, 3, true, nil},
		{"-0.25", false, -0.25, 0, false, nil},
		{".5", false, 0.5, 0, false, nil},
		{"?", false, 0, 0, false, cif.ErrUnknown},
		{".", false, 0, 0, false, cif.ErrUnknown},
		{"?", true, 0, 0, false, cif.ErrNotNumber},
		{"1.2(x)", false, 0, 0, false, cif.ErrNotNumber},
		{"Inf", false, 0, 0, false, cif.ErrNotFinite},
		{"0x10", false, 0, 0, false, cif.ErrNotNumber},
		{"1e999", false, 0, 0, false, cif.ErrNotFinite},
	}
	for _, c := range cases {
		v, su, has, err := cif.Value{Text: c.text, Quoted: c.quoted}.Number()
		if !errors.Is(err, c.err) || has != c.hasSU || math.Abs(v-c.v) > 1e-12*math.Max(1, math.Abs(c.v)) || math.Abs(su-c.su) > 1e-12*math.Max(1, c.su) {
			t.Errorf("Number(%q) = %g, %g, %v, %v; want %g, %g, %v, %v", c.text, v, su, has, err, c.v, c.su, c.hasSU, c.err)
		}
	}
}

func FuzzParse(f *testing.F) {
	for _, s := range []string{sample, "data_x\nloop_\n_a\n_b\n1 2\n3 4\n", "data_x\n_a 'q'\n", "data_x\r\n_a\r\n;\r\nt\r\n;\r\n", "", "data_\n", "loop_"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		blocks, err := cif.Parse("fuzz.cif", []byte(s))
		if err != nil {
			var e *cif.Error
			if !errors.As(err, &e) {
				t.Fatalf("error %v is not a *cif.Error", err)
			}
			return
		}
		for _, b := range blocks {
			for _, lp := range b.Loops {
				for _, r := range lp.Rows {
					if len(r) != len(lp.Tags) {
						t.Fatalf("row of %d values for %d tags", len(r), len(lp.Tags))
					}
				}
			}
		}
	})
}

package crystal

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"meltbook"
	"meltbook/analysis/cif"
	"meltbook/analysis/element"
)

// FileError is a fault in a structure file: the file, the 1-based line
// (0 when it concerns the whole file), the data name at fault and what is
// wrong. It reads "file:line: _data_name: reason".
type FileError struct {
	File string
	Line int
	Name string // CIF data name (tag) or data block at fault
	Msg  string
}

func (e *FileError) Error() string {
	if e.Line == 0 {
		return fmt.Sprintf("%s: %s: %s", e.File, e.Name, e.Msg)
	}
	return fmt.Sprintf("%s:%d: %s: %s", e.File, e.Line, e.Name, e.Msg)
}

// DefaultUisoA2 is the isotropic displacement U in Å² given to a site for
// which the file states none.
const DefaultUisoA2 = 0.01

// Tags read, the current dictionary name first, then the older one.
var (
	tagCell = [6][]string{
		{"_cell_length_a"}, {"_cell_length_b"}, {"_cell_length_c"},
		{"_cell_angle_alpha"}, {"_cell_angle_beta"}, {"_cell_angle_gamma"},
	}
	tagSymop  = []string{"_space_group_symop_operation_xyz", "_symmetry_equiv_pos_as_xyz"}
	tagHall   = []string{"_space_group_name_hall", "_symmetry_space_group_name_hall"}
	tagHM     = []string{"_space_group_name_h-m_alt", "_symmetry_space_group_name_h-m"}
	tagNumber = []string{"_space_group_it_number", "_symmetry_int_tables_number"}
)

// ReadCIF reads every data block of a CIF file that has atom sites
// (_atom_site_fract_x) into a Structure; file names the file in errors.
//
// The cell comes from _cell_length_a/b/c (Å, required) and
// _cell_angle_alpha/beta/gamma (degrees, 90 when absent). The space group
// comes from the first of: the operations _space_group_symop_operation_xyz
// or _symmetry_equiv_pos_as_xyz (authoritative; they must form a group
// modulo lattice translations; when they match no listed setting the
// stated number is kept, see IdentifySpaceGroup), the Hall symbol _space_group_name_Hall or
// _symmetry_space_group_name_Hall, the Hermann–Mauguin symbol
// _space_group_name_H-M_alt or _symmetry_space_group_name_H-M (see
// FindSpaceGroup for the default settings; an R symbol on a cell with
// a = b = c and α = β = γ takes rhombohedral axes), the number
// _space_group_IT_number or _symmetry_Int_Tables_number.
//
// Each site has a unique _atom_site_label; its element comes from
// _atom_site_type_symbol with charge and digits stripped ("Fe2+" → Fe),
// else from the label ("Al1" → Al), and must be a known element. The
// fractional coordinates are required numbers (uncertainty dropped), the
// occupancy defaults to 1. U in Å² comes from _atom_site_U_iso_or_equiv,
// else _atom_site_B_iso_or_equiv, else the anisotropic U (or B) of the
// _atom_site_aniso_ loop reduced to U_eq, else DefaultUisoA2 (0.01 Å²):
//
//	U = B/(8π²)
//	U_eq = ⅓ Σᵢⱼ Uⁱʲ aᵢ* aⱼ* (aᵢ·aⱼ)
//
// Name is _chemical_name_common, else _chemical_name_mineral, else the
// block name; Formula is _chemical_formula_sum; Reference joins
// _publ_author_name, the journal (_journal_name_full or
// _citation_journal_full), _journal_volume, _journal_page_first, the year
// (_journal_year or _citation_year) and _citation_DOI.
//
// Syntax errors are *cif.Error (file:line:col); content errors are
// *FileError (file:line: _data_name: reason).
//
// Reference: IUCr, CIF core dictionary (coreCIF) 2.4; R. X. Fischer and
// E. Tillmanns, Acta Cryst. C44, 775 (1988), doi:10.1107/S0108270187012745
// (U_eq).
func ReadCIF(file string, data []byte) ([]Structure, error) {
	blocks, err := cif.Parse(file, data)
	if err != nil {
		return nil, err
	}
	var out []Structure
	for _, b := range blocks {
		if lp, _, _ := b.Loop("_atom_site_fract_x"); lp == nil {
			if _, _, ok := b.Item("_atom_site_fract_x"); !ok {
				continue
			}
		}
		s, err := readBlock(file, b)
		if err != nil {
			return nil, err
		}
		out = append(out, s)
	}
	if len(out) == 0 {
		return nil, &FileError{File: file, Name: "_atom_site_fract_x", Msg: "no data block has atom sites"}
	}
	return out, nil
}

type blockReader struct {
	file string
	b    *cif.Block
}

func (r blockReader) fail(line int, name, format string, args ...any) error {
	if line == 0 {
		line = r.b.Line
	}
	return &FileError{File: r.file, Line: line, Name: name, Msg: fmt.Sprintf(format, args...)}
}

// number reads a numeric value; unknown values are reported as such.
func (r blockReader) number(v cif.Value, tag string) (float64, error) {
	x, _, _, err := v.Number()
	switch {
	case errors.Is(err, cif.ErrUnknown):
		return 0, r.fail(v.Line, tag, "value %q is unknown where a number is needed", v.Text)
	case err != nil:
		return 0, r.fail(v.Line, tag, "%q is not a number", v.Text)
	}
	return x, nil
}

// text returns the first given, known value of the tags.
func (r blockReader) text(tags ...string) (cif.Value, string, bool) {
	for _, t := range tags {
		if v, tag, ok := r.b.Item(t); ok && !v.Unknown() && strings.TrimSpace(v.Text) != "" {
			return v, tag, true
		}
	}
	return cif.Value{}, "", false
}

func readBlock(file string, b *cif.Block) (Structure, error) {
	r := blockReader{file, b}
	var s Structure
	cell, err := r.cell()
	if err != nil {
		return s, err
	}
	s.Cell = cell
	if s.Group, err = r.group(cell); err != nil {
		return s, err
	}
	if s.Sites, err = r.sites(cell); err != nil {
		return s, err
	}
	s.Name = b.Name
	if v, _, ok := r.text("_chemical_name_common", "_chemical_name_mineral"); ok {
		s.Name = strings.TrimSpace(v.Text)
	}
	if v, _, ok := r.text("_chemical_formula_sum"); ok {
		s.Formula = strings.TrimSpace(v.Text)
	}
	s.Reference = r.reference()
	if err := s.Validate(); err != nil {
		var me *meltbook.Error
		if errors.As(err, &me) {
			return s, r.fail(0, "data_"+b.Name, "%s: %s", me.Field, me.Message)
		}
		return s, r.fail(0, "data_"+b.Name, "%v", err)
	}
	return s, nil
}

func (r blockReader) cell() (Cell, error) {
	var p [6]float64
	for i, tags := range tagCell {
		v, tag, ok := r.b.Item(tags...)
		if !ok || (i >= 3 && v.Unknown()) {
			if i < 3 {
				return Cell{}, r.fail(0, tags[0], "the cell edge is missing")
			}
			p[i] = 90
			continue
		}
		x, err := r.number(v, tag)
		if err != nil {
			return Cell{}, err
		}
		p[i] = x
	}
	c := Cell{A: p[0], B: p[1], C: p[2], Alpha: p[3], Beta: p[4], Gamma: p[5]}
	if err := c.Validate(); err != nil {
		var me *meltbook.Error
		if errors.As(err, &me) {
			return c, r.fail(0, "_cell", "%s: %s", me.Field, me.Message)
		}
		return c, err
	}
	return c, nil
}

func (r blockReader) group(cell Cell) (SpaceGroup, error) {
	var ops []Operation
	var opsTag string
	var opsLine int
	if lp, col, tag := r.b.Loop(tagSymop...); lp != nil {
		opsTag, opsLine = tag, lp.Line
		for _, row := range lp.Rows {
			op, err := r.operation(row[col], tag)
			if err != nil {
				return SpaceGroup{}, err
			}
			ops = append(ops, op)
		}
	} else if v, tag, ok := r.b.Item(tagSymop...); ok {
		opsTag, opsLine = tag, v.Line
		op, err := r.operation(v, tag)
		if err != nil {
			return SpaceGroup{}, err
		}
		ops = append(ops, op)
	}
	if len(ops) > maxOperations {
		return SpaceGroup{}, r.fail(opsLine, opsTag, "%d operations are more than any space group has (%d)", len(ops), maxOperations)
	}
	if ops != nil {
		g := IdentifySpaceGroup(ops)
		if err := g.CheckGroup(); err != nil {
			var me *meltbook.Error
			if errors.As(err, &me) {
				return g, r.fail(opsLine, opsTag, "%s", me.Message)
			}
			return g, r.fail(opsLine, opsTag, "%v", err)
		}
		if g.Number == 0 {
			// operations of no listed setting: keep the number the file states
			if v, _, ok := r.text(tagNumber...); ok {
				if n, err := strconv.Atoi(strings.TrimSpace(v.Text)); err == nil && SystemOfNumber(n) != "" {
					g.Number, g.System = n, SystemOfNumber(n)
				}
			}
		}
		return g, nil
	}
	if v, tag, ok := r.text(tagHall...); ok {
		all, err := HallOperations(v.Text)
		if err != nil {
			return SpaceGroup{}, r.fail(v.Line, tag, "%q is not a Hall symbol this reader knows", v.Text)
		}
		return IdentifySpaceGroup(all), nil
	}
	if v, tag, ok := r.text(tagHM...); ok {
		name := strings.TrimSpace(v.Text)
		if strings.HasPrefix(name, "R") && !strings.Contains(name, ":") && rhombohedralAxes(cell) {
			name += ":R"
		}
		g, err := FindSpaceGroup(name)
		if err != nil {
			return SpaceGroup{}, r.fail(v.Line, tag, "%q is no Hermann–Mauguin symbol this reader knows", v.Text)
		}
		return g, nil
	}
	if v, tag, ok := r.text(tagNumber...); ok {
		g, err := FindSpaceGroup(strings.TrimSpace(v.Text))
		if err != nil || strings.ContainsAny(v.Text, "-:") {
			return SpaceGroup{}, r.fail(v.Line, tag, "%q is not a space-group number 1 … 230", v.Text)
		}
		return g, nil
	}
	return SpaceGroup{}, r.fail(0, tagSymop[0], "no symmetry given: need operations, a Hall or Hermann–Mauguin symbol or a space-group number")
}

func (r blockReader) operation(v cif.Value, tag string) (Operation, error) {
	op, err := ParseOperation(v.Text)
	if err != nil {
		var me *meltbook.Error
		if errors.As(err, &me) {
			return op, r.fail(v.Line, tag, "%s", me.Message)
		}
		return op, r.fail(v.Line, tag, "%v", err)
	}
	return op, nil
}

// rhombohedralAxes reports a = b = c and α = β = γ ≠ 90°.
func rhombohedralAxes(c Cell) bool {
	near := func(x, y float64) bool { return math.Abs(x-y) <= 1e-4*math.Max(math.Abs(x), 1) }
	return near(c.A, c.B) && near(c.B, c.C) && near(c.Alpha, c.Beta) && near(c.Beta, c.Gamma) && !near(c.Alpha, 90)
}

// elementOf takes the element symbol from a type symbol or a label: its
// one or two leading letters, the first upper case and the second lower
// case, so charges and digits drop ("Fe2+" → Fe, "Al1" → Al). For a label
// whose two letters are no element the first letter alone is tried
// ("OA1" → O).
func elementOf(s string, fromLabel bool) (string, bool) {
	s = strings.TrimSpace(s)
	n := 0
	for n < len(s) && n < 2 && isLetter(s[n]) {
		n++
	}
	if n == 0 {
		return "", false
	}
	sym := strings.ToUpper(s[:1]) + strings.ToLower(s[1:n])
	if _, ok := element.BySymbol(sym); ok {
		return sym, true
	}
	if n == 2 && fromLabel {
		if _, ok := element.BySymbol(sym[:1]); ok {
			return sym[:1], true
		}
	}
	return sym, false
}

func isLetter(c byte) bool { return c >= 'A' && c <= 'Z' || c >= 'a' && c <= 'z' }

func (r blockReader) sites(cell Cell) ([]Site, error) {
	lp, _, _ := r.b.Loop("_atom_site_fract_x")
	var rows [][]cif.Value
	var tags []string
	if lp != nil {
		rows, tags = lp.Rows, lp.Tags
	} else {
		// a single site written as items
		for tag, v := range r.b.Items {
			if strings.HasPrefix(tag, "_atom_site_") && !strings.HasPrefix(tag, "_atom_site_aniso_") {
				tags = append(tags, tag)
				if len(rows) == 0 {
					rows = append(rows, nil)
				}
				rows[0] = append(rows[0], v)
			}
		}
	}
	col := func(tag string) int {
		for i, t := range tags {
			if t == tag {
				return i
			}
		}
		return -1
	}
	cLabel, cType := col("_atom_site_label"), col("_atom_site_type_symbol")
	cXYZ := [3]int{col("_atom_site_fract_x"), col("_atom_site_fract_y"), col("_atom_site_fract_z")}
	cOcc, cU, cB := col("_atom_site_occupancy"), col("_atom_site_u_iso_or_equiv"), col("_atom_site_b_iso_or_equiv")
	for i, c := range cXYZ {
		if c < 0 {
			return nil, r.fail(0, "_atom_site_fract_"+string(rune('x'+i)), "the coordinate is missing from the atom sites")
		}
	}
	if cLabel < 0 && cType < 0 {
		return nil, r.fail(0, "_atom_site_label", "the atom sites have neither labels nor type symbols")
	}
	aniso, err := r.anisoUeq(cell)
	if err != nil {
		return nil, err
	}
	firstLine := map[string]int{}
	sites := make([]Site, 0, len(rows))
	for k, row := range rows {
		var s Site
		at := row[cXYZ[0]].Line
		if cLabel >= 0 {
			s.Label = row[cLabel].Text
		} else {
			s.Label = fmt.Sprintf("%s%d", row[cType].Text, k+1)
		}
		if l, dup := firstLine[s.Label]; dup {
			return nil, r.fail(row[max(cLabel, 0)].Line, "_atom_site_label", "label %q is used twice (first on line %d)", s.Label, l)
		}
		firstLine[s.Label] = at
		var sym string
		var ok bool
		if cType >= 0 && !row[cType].Unknown() {
			sym, ok = elementOf(row[cType].Text, false)
			if !ok {
				return nil, r.fail(row[cType].Line, "_atom_site_type_symbol", "%q names no known element", row[cType].Text)
			}
		} else if sym, ok = elementOf(s.Label, true); !ok {
			return nil, r.fail(row[cLabel].Line, "_atom_site_label", "label %q names no known element and there is no type symbol", s.Label)
		}
		s.Element = sym
		for i, c := range cXYZ {
			x, _, _, err := row[c].Number()
			if err != nil {
				return nil, r.fail(row[c].Line, tags[c], "site %s: coordinate %q is not a number", s.Label, row[c].Text)
			}
			s.Fract[i] = x
		}
		s.Occupancy = 1
		if cOcc >= 0 && !row[cOcc].Unknown() {
			x, err := r.number(row[cOcc], "_atom_site_occupancy")
			if err != nil {
				return nil, err
			}
			if !(x > 0) {
				return nil, r.fail(row[cOcc].Line, "_atom_site_occupancy", "site %s: occupancy %g is not positive", s.Label, x)
			}
			s.Occupancy = x
		}
		s.UisoA2 = DefaultUisoA2
		switch {
		case cU >= 0 && !row[cU].Unknown():
			x, err := r.number(row[cU], "_atom_site_U_iso_or_equiv")
			if err != nil {
				return nil, err
			}
			s.UisoA2 = x
		case cB >= 0 && !row[cB].Unknown():
			x, err := r.number(row[cB], "_atom_site_B_iso_or_equiv")
			if err != nil {
				return nil, err
			}
			s.UisoA2 = x / (8 * math.Pi * math.Pi)
		default:
			if u, ok := aniso[s.Label]; ok {
				s.UisoA2 = u
			}
		}
		if !(s.UisoA2 >= 0) || math.IsInf(s.UisoA2, 0) {
			return nil, r.fail(at, "_atom_site_U_iso_or_equiv", "site %s: U = %g Å² is not a finite number ≥ 0", s.Label, s.UisoA2)
		}
		sites = append(sites, s)
	}
	return sites, nil
}

// UEquivalent returns U_eq in Å² of anisotropic displacements U (Uⁱʲ in
// Å², the CIF _atom_site_aniso_U_ij convention) in a cell:
//
//	U_eq = ⅓ Σᵢⱼ Uⁱʲ aᵢ* aⱼ* (aᵢ·aⱼ)
//
// with aᵢ* the reciprocal edges (√G*ᵢᵢ) and aᵢ·aⱼ = Gᵢⱼ the metric.
//
// Reference: R. X. Fischer and E. Tillmanns, Acta Cryst. C44, 775 (1988),
// doi:10.1107/S0108270187012745.
func UEquivalent(cell Cell, u [3][3]float64) float64 {
	g, gs := cell.Metric(), cell.ReciprocalMetric()
	sum := 0.0
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			sum += u[i][j] * math.Sqrt(gs[i][i]*gs[j][j]) * g[i][j]
		}
	}
	return sum / 3
}

// anisoUeq reads the _atom_site_aniso_ loop into U_eq by label.
func (r blockReader) anisoUeq(cell Cell) (map[string]float64, error) {
	lp, cLabel, _ := r.b.Loop("_atom_site_aniso_label")
	if lp == nil {
		return nil, nil
	}
	names := [6]string{"11", "22", "33", "12", "13", "23"}
	idx := [6][2]int{{0, 0}, {1, 1}, {2, 2}, {0, 1}, {0, 2}, {1, 2}}
	scale := 1.0
	cols := [6]int{}
	prefix := "_atom_site_aniso_u_"
	if c, _ := lp.Column(prefix + "11"); c < 0 {
		prefix, scale = "_atom_site_aniso_b_", 1/(8*math.Pi*math.Pi)
	}
	for k, n := range names {
		c, _ := lp.Column(prefix + n)
		if c < 0 {
			return nil, nil
		}
		cols[k] = c
	}
	out := map[string]float64{}
	for _, row := range lp.Rows {
		var u [3][3]float64
		for k, c := range cols {
			x, err := r.number(row[c], lp.Tags[c])
			if err != nil {
				return nil, err
			}
			i, j := idx[k][0], idx[k][1]
			u[i][j], u[j][i] = x*scale, x*scale
		}
		out[row[cLabel].Text] = UEquivalent(cell, u)
	}
	return out, nil
}

// reference joins what the block says of where it was published.
func (r blockReader) reference() string {
	var parts []string
	if lp, c, _ := r.b.Loop("_publ_author_name"); lp != nil {
		var names []string
		for _, row := range lp.Rows {
			if !row[c].Unknown() {
				names = append(names, strings.TrimSpace(row[c].Text))
			}
		}
		if len(names) > 0 {
			parts = append(parts, strings.Join(names, ", "))
		}
	} else if v, _, ok := r.text("_publ_author_name"); ok {
		parts = append(parts, strings.TrimSpace(v.Text))
	}
	var cite []string
	for _, tags := range [][]string{{"_journal_name_full", "_citation_journal_full"}, {"_journal_volume", "_citation_journal_volume"}} {
		if v, _, ok := r.text(tags...); ok {
			cite = append(cite, strings.TrimSpace(v.Text))
		}
	}
	journal := strings.Join(cite, " ")
	if v, _, ok := r.text("_journal_page_first", "_citation_page_first"); ok {
		if journal != "" {
			journal += ", "
		}
		journal += strings.TrimSpace(v.Text)
	}
	if v, _, ok := r.text("_journal_year", "_citation_year"); ok {
		if journal != "" {
			journal += " "
		}
		journal += "(" + strings.TrimSpace(v.Text) + ")"
	}
	if journal != "" {
		parts = append(parts, journal)
	}
	if v, _, ok := r.text("_citation_doi", "_journal_paper_doi"); ok {
		parts = append(parts, "doi:"+strings.TrimSpace(v.Text))
	}
	return strings.Join(parts, ", ")
}

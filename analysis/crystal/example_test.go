package crystal_test

import (
	"fmt"

	"meltbook/analysis/crystal"
)

func ExampleFindSpaceGroup() {
	g, err := crystal.FindSpaceGroup("Fd-3m")
	if err != nil {
		panic(err)
	}
	fmt.Println(g.Number, g.HM+":"+g.Setting, g.Hall, g.System, string(g.Centring), len(g.Ops))
	// Output: 227 F d -3 m:2 -F 4vw 2vw 3 cubic F 192
}

func ExampleReadCIF() {
	const text = `data_fcc_al
_cell_length_a 4.0495
_cell_length_b 4.0495
_cell_length_c 4.0495
_space_group_name_H-M_alt 'F m -3 m'
loop_
_atom_site_label
_atom_site_fract_x
_atom_site_fract_y
_atom_site_fract_z
Al1 0 0 0
`
	structures, err := crystal.ReadCIF("al.cif", []byte(text))
	if err != nil {
		panic(err)
	}
	s := structures[0]
	fmt.Println(s.Name, s.Group.Number, len(s.Atoms()), "atoms in the cell")
	// Output: fcc_al 225 4 atoms in the cell
}

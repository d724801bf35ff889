package crystal_test

import (
	"math"
	"testing"

	"meltbook/analysis/crystal"
)

// closeOps builds a whole group from generators given in xyz form, with
// its own integer arithmetic (not the package's composition), translations
// kept in twelfths or twenty-fourths reduced modulo 1.
func closeOps(t testing.TB, gens ...string) []crystal.Operation {
	t.Helper()
	type key struct {
		r [3][3]int
		t [3]int // in 1/24
	}
	toKey := func(op crystal.Operation) key {
		k := key{r: op.R}
		for i := range op.T {
			k.t[i] = ((int(math.Round(op.T[i]*24)) % 24) + 24) % 24
		}
		return k
	}
	mul := func(a, b key) key { // a after b
		var c key
		for i := 0; i < 3; i++ {
			c.t[i] = a.t[i]
			for j := 0; j < 3; j++ {
				c.t[i] += a.r[i][j] * b.t[j]
				for k := 0; k < 3; k++ {
					c.r[i][j] += a.r[i][k] * b.r[k][j]
				}
			}
			c.t[i] = ((c.t[i] % 24) + 24) % 24
		}
		return c
	}
	seen := map[key]bool{toKey(crystal.Identity): true}
	list := []key{toKey(crystal.Identity)}
	var gk []key
	for _, g := range gens {
		gk = append(gk, toKey(mustOp(t, g)))
	}
	for i := 0; i < len(list); i++ {
		for _, g := range gk {
			c := mul(g, list[i])
			if !seen[c] {
				seen[c] = true
				list = append(list, c)
			}
		}
	}
	ops := make([]crystal.Operation, len(list))
	for i, k := range list {
		ops[i].R = k.r
		for j := range k.t {
			ops[i].T[j] = float64(k.t[j]) / 24
		}
	}
	return ops
}

// Generators read off the general positions of International Tables Vol. A.
var (
	fm3mGenerators    = []string{"x,y+1/2,z+1/2", "x+1/2,y,z+1/2", "-x,-y,z", "-x,y,-z", "z,x,y", "y,x,-z", "-x,-y,-z"}
	p63mmcGenerators  = []string{"-y,x-y,z", "-x,-y,z+1/2", "y,x,-z", "-x,-y,-z"}
	i4mcmGenerators   = []string{"x+1/2,y+1/2,z+1/2", "-x,-y,z", "-y,x,z", "-x,y,-z+1/2", "-x,-y,-z"}
	p21cGenerators    = []string{"-x,y+1/2,-z+1/2", "-x,-y,-z"}
	cubicOrderFm3m    = 192 // 48 point operations × 4 centring vectors (International Tables Vol. A, No. 225)
	hexagonalOrder194 = 24  // International Tables Vol. A, No. 194
	order140          = 32  // 16 × 2 for I centring (International Tables Vol. A, No. 140)
)

func TestAtoms(t *testing.T) {
	fm3m := crystal.SpaceGroup{Number: 225, Ops: closeOps(t, fm3mGenerators...)}
	p63mmc := crystal.SpaceGroup{Number: 194, Ops: closeOps(t, p63mmcGenerators...)}
	i4mcm := crystal.SpaceGroup{Number: 140, Ops: closeOps(t, i4mcmGenerators...)}
	if len(fm3m.Ops) != cubicOrderFm3m || len(p63mmc.Ops) != hexagonalOrder194 || len(i4mcm.Ops) != order140 {
		t.Fatalf("generated groups have %d, %d, %d operations", len(fm3m.Ops), len(p63mmc.Ops), len(i4mcm.Ops))
	}
	site := func(label, el string, x, y, z float64) crystal.Site {
		return crystal.Site{Label: label, Element: el, Fract: [3]float64{x, y, z}, Occupancy: 1, UisoA2: 0.01}
	}
	for _, c := range []struct {
		name string
		s    crystal.Structure
		want []int // atoms per site: Wyckoff multiplicities, International Tables Vol. A
	}{
		{"fcc Al, Fm-3m 4a", crystal.Structure{Cell: crystal.Cell{A: 4.0495, B: 4.0495, C: 4.0495, Alpha: 90, Beta: 90, Gamma: 90}, Group: fm3m,
			Sites: []crystal.Site{site("Al1", "Al", 0, 0, 0)}}, []int{4}},
		{"NaCl, Fm-3m 4a + 4b", crystal.Structure{Cell: crystal.Cell{A: 5.64, B: 5.64, C: 5.64, Alpha: 90, Beta: 90, Gamma: 90}, Group: fm3m,
			Sites: []crystal.Site{site("Na1", "Na", 0, 0, 0), site("Cl1", "Cl", 0.5, 0.5, 0.5)}}, []int{4, 4}},
		{"Cu3Au-like Fm-3m 8c", crystal.Structure{Cell: crystal.Cell{A: 5.46, B: 5.46, C: 5.46, Alpha: 90, Beta: 90, Gamma: 90}, Group: fm3m,
			Sites: []crystal.Site{site("F1", "F", 0.25, 0.25, 0.25)}}, []int{8}},
		{"hcp Mg, P63/mmc 2c", crystal.Structure{Cell: crystal.Cell{A: 3.209, B: 3.209, C: 5.211, Alpha: 90, Beta: 90, Gamma: 120}, Group: p63mmc,
			Sites: []crystal.Site{site("Mg1", "Mg", 1.0/3, 2.0/3, 0.25)}}, []int{2}},
		{"hcp Mg with four-decimal coordinates", crystal.Structure{Cell: crystal.Cell{A: 3.209, B: 3.209, C: 5.211, Alpha: 90, Beta: 90, Gamma: 120}, Group: p63mmc,
			Sites: []crystal.Site{site("Mg1", "Mg", 0.3333, 0.6667, 0.25)}}, []int{2}},
		{"P63/mmc general position 24l", crystal.Structure{Cell: crystal.Cell{A: 3.2, B: 3.2, C: 5.2, Alpha: 90, Beta: 90, Gamma: 120}, Group: p63mmc,
			Sites: []crystal.Site{site("X1", "Mg", 0.1, 0.3, 0.07)}}, []int{24}},
		{"θ-Al2Cu, I4/mcm 8h + 4a", crystal.Structure{Cell: crystal.Cell{A: 6.067, B: 6.067, C: 4.877, Alpha: 90, Beta: 90, Gamma: 90}, Group: i4mcm,
			Sites: []crystal.Site{site("Al1", "Al", 0.1581, 0.6581, 0), site("Cu1", "Cu", 0, 0, 0.25)}}, []int{8, 4}},
		{"mixed site: two sites on one position both kept", crystal.Structure{Cell: crystal.Cell{A: 4.0495, B: 4.0495, C: 4.0495, Alpha: 90, Beta: 90, Gamma: 90}, Group: fm3m,
			Sites: []crystal.Site{
				{Label: "M1", Element: "Al", Fract: [3]float64{0, 0, 0}, Occupancy: 0.6},
				{Label: "M2", Element: "Cu", Fract: [3]float64{0, 0, 0}, Occupancy: 0.4}}}, []int{4, 4}},
		{"P21/c general position 4e", crystal.Structure{Cell: crystal.Cell{A: 5, B: 6, C: 7, Alpha: 90, Beta: 100, Gamma: 90}, Group: crystal.SpaceGroup{Ops: closeOps(t, p21cGenerators...)},
			Sites: []crystal.Site{site("O1", "O", 0.1, 0.2, 0.3), site("O2", "O", 0, 0, 0)}}, []int{4, 2}},
		{"no operations: the identity", crystal.Structure{Cell: crystal.Cell{A: 5, B: 6, C: 7, Alpha: 90, Beta: 90, Gamma: 90},
			Sites: []crystal.Site{site("O1", "O", 1.1, -0.2, 0.3)}}, []int{1}},
	} {
		if err := c.s.Validate(); err != nil {
			t.Errorf("%s: Validate: %v", c.name, err)
		}
		atoms := c.s.Atoms()
		per := make([]int, len(c.s.Sites))
		for _, a := range atoms {
			per[a.Site]++
			for _, x := range a.Fract {
				if x < 0 || x >= 1 {
					t.Errorf("%s: atom at %v is not wrapped into [0, 1)", c.name, a.Fract)
				}
			}
		}
		for i := range per {
			if per[i] != c.want[i] {
				t.Errorf("%s: site %d gives %d atoms, want %d", c.name, i, per[i], c.want[i])
			}
		}
	}
}

func TestAtomsPositions(t *testing.T) {
	// hcp 2c: (1/3, 2/3, 1/4) and (2/3, 1/3, 3/4) (International Tables Vol. A, No. 194).
	s := crystal.Structure{Cell: crystal.Cell{A: 3.209, B: 3.209, C: 5.211, Alpha: 90, Beta: 90, Gamma: 120},
		Group: crystal.SpaceGroup{Ops: closeOps(t, p63mmcGenerators...)},
		Sites: []crystal.Site{{Label: "Mg1", Element: "Mg", Fract: [3]float64{1.0 / 3, 2.0 / 3, 0.25}, Occupancy: 1}}}
	want := [][3]float64{{1.0 / 3, 2.0 / 3, 0.25}, {2.0 / 3, 1.0 / 3, 0.75}}
	atoms := s.Atoms()
	if len(atoms) != 2 {
		t.Fatalf("%d atoms, want 2", len(atoms))
	}
	for _, w := range want {
		found := false
		for _, a := range atoms {
			if math.Abs(a.Fract[0]-w[0]) < 1e-9 && math.Abs(a.Fract[1]-w[1]) < 1e-9 && math.Abs(a.Fract[2]-w[2]) < 1e-9 {
				found = true
			}
		}
		if !found {
			t.Errorf("no atom at %v in %v", w, atoms)
		}
	}
}

func TestValidateRefuses(t *testing.T) {
	good := func() crystal.Structure {
		return crystal.Structure{Cell: crystal.Cell{A: 4, B: 4, C: 4, Alpha: 90, Beta: 90, Gamma: 90},
			Group: crystal.SpaceGroup{Ops: []crystal.Operation{crystal.Identity}},
			Sites: []crystal.Site{{Label: "Al1", Element: "Al", Occupancy: 1, UisoA2: 0.01}}}
	}
	if err := good().Validate(); err != nil {
		t.Fatalf("good structure: %v", err)
	}
	for name, spoil := range map[string]func(*crystal.Structure){
		"no cell edge":       func(s *crystal.Structure) { s.Cell.A = 0 },
		"negative occupancy": func(s *crystal.Structure) { s.Sites[0].Occupancy = -0.1 },
		"occupancy above 1":  func(s *crystal.Structure) { s.Sites[0].Occupancy = 1.2 },
		"negative U":         func(s *crystal.Structure) { s.Sites[0].UisoA2 = -0.01 },
		"no element":         func(s *crystal.Structure) { s.Sites[0].Element = "" },
		"no label":           func(s *crystal.Structure) { s.Sites[0].Label = "" },
		"NaN coordinate":     func(s *crystal.Structure) { s.Sites[0].Fract[1] = math.NaN() },
		"repeated label":     func(s *crystal.Structure) { s.Sites = append(s.Sites, s.Sites[0]) },
		"no identity":        func(s *crystal.Structure) { s.Group.Ops = []crystal.Operation{mustOp(t, "-x,-y,-z")} },
		"determinant 2": func(s *crystal.Structure) {
			s.Group.Ops = append(s.Group.Ops, crystal.Operation{R: [3][3]int{{2, 0, 0}, {0, 1, 0}, {0, 0, 1}}})
		},
	} {
		s := good()
		spoil(&s)
		if err := s.Validate(); err == nil {
			t.Errorf("%s: Validate accepted it", name)
		}
	}
}

func TestCheckGroup(t *testing.T) {
	if err := (crystal.SpaceGroup{Ops: closeOps(t, fm3mGenerators...)}).CheckGroup(); err != nil {
		t.Errorf("Fm-3m: %v", err)
	}
	// x,y,z and -y,x,z alone lack -x,-y,z and y,-x,z (the 4-fold axis has order 4, common practice).
	g := crystal.SpaceGroup{Ops: []crystal.Operation{crystal.Identity, mustOp(t, "-y,x,z")}}
	if err := g.CheckGroup(); err == nil {
		t.Error("x,y,z; -y,x,z accepted as a group")
	}
	// A screw axis written with its translation taken modulo the lattice is still the group P2₁ (common practice).
	g = crystal.SpaceGroup{Ops: []crystal.Operation{crystal.Identity, mustOp(t, "-x,y-1/2,-z")}}
	if err := g.CheckGroup(); err != nil {
		t.Errorf("P21 with y-1/2: %v", err)
	}
}

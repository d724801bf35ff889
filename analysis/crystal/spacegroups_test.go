package crystal_test

import (
	"errors"
	"testing"

	"meltbook"
	"meltbook/analysis/crystal"
)

func TestFindSpaceGroup(t *testing.T) {
	// Numbers, settings, centring and operation counts (general-position
	// multiplicity of the conventional cell): International Tables for
	// Crystallography Vol. A, the space-group tables.
	cases := []struct {
		name     string
		number   int
		setting  string
		hm       string
		system   crystal.System
		centring byte
		ops      int
	}{
		{"P63/mmc", 194, "", "P 63/m m c", crystal.Hexagonal, 'P', 24},
		{"P 63/m m c", 194, "", "P 63/m m c", crystal.Hexagonal, 'P', 24},
		{"P6_3/mmc", 194, "", "P 63/m m c", crystal.Hexagonal, 'P', 24},
		{"-P 6c 2c", 194, "", "P 63/m m c", crystal.Hexagonal, 'P', 24}, // Hall symbol of 194: ITA Vol. B, Table A1.4.2.7
		{"194", 194, "", "P 63/m m c", crystal.Hexagonal, 'P', 24},
		{"I4/mcm", 140, "", "I 4/m c m", crystal.Tetragonal, 'I', 32},
		{"Fm-3m", 225, "", "F m -3 m", crystal.Cubic, 'F', 192},
		{"F d -3 m:2", 227, "2", "F d -3 m", crystal.Cubic, 'F', 192},
		{"Fd-3m", 227, "2", "F d -3 m", crystal.Cubic, 'F', 192}, // default origin choice 2 (documented choice)
		{"Fd-3m:1", 227, "1", "F d -3 m", crystal.Cubic, 'F', 192},
		{"227", 227, "2", "F d -3 m", crystal.Cubic, 'F', 192},
		{"R-3m", 166, "H", "R -3 m", crystal.Trigonal, 'R', 36},
		{"R -3 m:R", 166, "R", "R -3 m", crystal.Trigonal, 'P', 12},
		{"P21/c", 14, "", "P 1 21/c 1", crystal.Monoclinic, 'P', 4},
		{"C2/m", 12, "", "C 1 2/m 1", crystal.Monoclinic, 'C', 8},
		{"Pnma", 62, "", "P n m a", crystal.Orthorhombic, 'P', 8},
		{"P-1", 2, "", "P -1", crystal.Triclinic, 'P', 2},
		{"Im-3", 204, "", "I m -3", crystal.Cubic, 'I', 48},
		{"P321", 150, "", "P 3 2 1", crystal.Trigonal, 'P', 6},
		{"P 63/M M C", 194, "", "P 63/m m c", crystal.Hexagonal, 'P', 24},
		{"pnma", 62, "", "P n m a", crystal.Orthorhombic, 'P', 8},
		{"P 2 2 3 (1 1 1)", 0, "", "", crystal.Cubic, 'P', 12}, // a Hall symbol of no listed setting: P23 (12 operations) with its origin moved
	}
	for _, c := range cases {
		g, err := crystal.FindSpaceGroup(c.name)
		if err != nil {
			t.Errorf("FindSpaceGroup(%q): %v", c.name, err)
			continue
		}
		if g.Number != c.number || g.Setting != c.setting || g.HM != c.hm || g.System != c.system || g.Centring != c.centring || len(g.Ops) != c.ops {
			t.Errorf("FindSpaceGroup(%q) = %d %q:%q %s %c with %d ops, want %d %q:%q %s %c with %d",
				c.name, g.Number, g.HM, g.Setting, g.System, g.Centring, len(g.Ops), c.number, c.hm, c.setting, c.system, c.centring, c.ops)
		}
		if err := g.CheckGroup(); err != nil {
			t.Errorf("FindSpaceGroup(%q): %v", c.name, err)
		}
	}
}

// TestFindSpaceGroupOrigin checks the two origins of Fd-3m: with origin
// choice 2 the centre of symmetry is at the origin, so -x,-y,-z is an
// operation; with origin choice 1 it is at 1/8,1/8,1/8 and the inversion
// reads -x+1/4,-y+1/4,-z+1/4 (International Tables Vol. A, No. 227).
func TestFindSpaceGroupOrigin(t *testing.T) {
	has := func(g crystal.SpaceGroup, s string) bool {
		op, err := crystal.ParseOperation(s)
		if err != nil {
			t.Fatal(err)
		}
		for _, o := range g.Ops {
			if o.EqualModLattice(op, 1e-9) {
				return true
			}
		}
		return false
	}
	two, _ := crystal.FindSpaceGroup("Fd-3m")
	one, _ := crystal.FindSpaceGroup("Fd-3m:1")
	if !has(two, "-x,-y,-z") || has(one, "-x,-y,-z") || !has(one, "-x+1/4,-y+1/4,-z+1/4") {
		t.Errorf("origin choices of Fd-3m mixed up")
	}
}

func TestFindSpaceGroupRefuses(t *testing.T) {
	for _, name := range []string{"", "0", "231", "Q 2 2 2", "P 5", "Fm-3x", "-P 2 (0 0"} {
		_, err := crystal.FindSpaceGroup(name)
		var me *meltbook.Error
		if !errors.As(err, &me) || me.Kind != meltbook.Invalid {
			t.Errorf("FindSpaceGroup(%q) error = %v, want a meltbook Invalid error", name, err)
		}
	}
}

func TestIdentifyUnlisted(t *testing.T) {
	// Sets of operations that are groups but no setting of the table: the
	// system follows from the rotations, the centring from the pure
	// translations (International Tables Vol. A, 2.1: common practice).
	cases := []struct {
		name     string
		ops      []string
		system   crystal.System
		centring byte
	}{
		// a 2-fold along a+b alone is no listed monoclinic setting
		{"2-fold along a+b", []string{"x,y,z", "y,x,-z"}, crystal.Monoclinic, 'P'},
		// P 2 3 with its origin moved by 1/12 along each axis
		{"shifted P23", nil, crystal.Cubic, 'P'},
		// I 4 with its origin moved by 1/12 along c
		{"shifted I4", nil, crystal.Tetragonal, 'I'},
	}
	halls := map[string]string{"shifted P23": "P 2 2 3 (1 1 1)", "shifted I4": "I 4 (1 0 0)"}
	for _, c := range cases {
		var ops []crystal.Operation
		if h, ok := halls[c.name]; ok {
			var err error
			if ops, err = crystal.HallOperations(h); err != nil {
				t.Fatal(err)
			}
		}
		for _, s := range c.ops {
			ops = append(ops, mustOp(t, s))
		}
		g := crystal.IdentifySpaceGroup(ops)
		if g.Number != 0 || g.System != c.system || g.Centring != c.centring || len(g.Ops) != len(ops) {
			t.Errorf("%s: got number %d, %s, %c, %d ops; want 0, %s, %c, %d", c.name, g.Number, g.System, g.Centring, len(g.Ops), c.system, c.centring, len(ops))
		}
	}
}

func BenchmarkHallOperations(b *testing.B) {
	for b.Loop() {
		if _, err := crystal.HallOperations("-F 4vw 2vw 3"); err != nil {
			b.Fatal(err)
		}
	}
}

func FuzzHallOperations(f *testing.F) {
	for _, s := range []string{"-P 6c 2c", "-F 4vw 2vw 3", "P 31 2 (0 0 4)", "-I 4bd 2", "P 3* -2n", "R 3 2\"", "P 2 2 3 (x,y,z+1/4)", "-", "P 7"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		ops, err := crystal.HallOperations(s)
		if err != nil {
			return
		}
		if len(ops) > 192 {
			t.Fatalf("%q gives %d operations, more than any space group", s, len(ops))
		}
	})
}

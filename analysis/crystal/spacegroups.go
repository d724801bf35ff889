package crystal

// The setting table is generated from Debian's python3-gemmi, which the
// generator needs:
//
//go:generate /usr/bin/python3 internal/gentable/gentable.py spacegroups_table.go

import (
	"sort"
	"strconv"
	"strings"
	"sync"

	"meltbook"
)

// settingEntry is one space-group setting of the generated table.
type settingEntry struct {
	Number  int
	HM      string // full Hermann–Mauguin symbol without the extension
	Setting string // "1", "2" (origin choice), "H", "R" (axes) or ""
	Hall    string
}

// SystemOfNumber returns the crystal system of space group number n
// (1 … 230), "" outside that range.
//
//	1–2 triclinic, 3–15 monoclinic, 16–74 orthorhombic, 75–142 tetragonal,
//	143–167 trigonal, 168–194 hexagonal, 195–230 cubic
//
// Reference: International Tables for Crystallography Vol. A, Table 2.1.2.1.
func SystemOfNumber(n int) System {
	switch {
	case n < 1 || n > 230:
		return ""
	case n <= 2:
		return Triclinic
	case n <= 15:
		return Monoclinic
	case n <= 74:
		return Orthorhombic
	case n <= 142:
		return Tetragonal
	case n <= 167:
		return Trigonal
	case n <= 194:
		return Hexagonal
	}
	return Cubic
}

var (
	lookupOnce sync.Once
	byName     map[string]int // compacted H-M (with and without extension), short H-M, Hall
	byFolded   map[string]int // lower-case compacted H-M, -1 where two settings share it
	byNumber   map[int]int    // default setting of each number
	byOps      map[string]int // operation-set key
	groups     []SpaceGroup
)

// compactName removes spaces and underscores: "P 63/m m c" → "P63/mmc".
func compactName(s string) string {
	return strings.Map(func(r rune) rune {
		if r == ' ' || r == '_' || r == '\t' {
			return -1
		}
		return r
	}, s)
}

// hallKey collapses runs of spaces, for spaces are significant in Hall
// symbols.
func hallKey(s string) string { return "hall:" + strings.Join(strings.Fields(s), " ") }

// shortHM drops the "1" axes of a monoclinic full symbol:
// "P 1 21/c 1" → "P 21/c"; other symbols are returned unchanged.
func shortHM(hm string) string {
	f := strings.Fields(hm)
	if len(f) != 4 {
		return hm
	}
	var keep []string
	for _, p := range f[1:] {
		if p != "1" {
			keep = append(keep, p)
		}
	}
	if len(keep) != 1 {
		return hm
	}
	return f[0] + " " + keep[0]
}

// preferred reports whether setting a is the default over b for the same
// name or number: origin choice 2 over 1, hexagonal axes over rhombohedral,
// else the earlier entry of the table (the standard setting).
func preferred(a, b settingEntry) bool {
	rank := func(s string) int {
		switch s {
		case "2", "H":
			return 0
		case "1", "R":
			return 1
		}
		return 0
	}
	return rank(a.Setting) < rank(b.Setting)
}

func opsKey(ops []Operation) string {
	s := make([]string, len(ops))
	for i, o := range ops {
		s[i] = o.Normalised().String()
	}
	sort.Strings(s)
	return strings.Join(s, ";")
}

func buildLookup() {
	byName = map[string]int{}
	byFolded = map[string]int{}
	byNumber = map[int]int{}
	byOps = map[string]int{}
	groups = make([]SpaceGroup, len(settingTable))
	add := func(key string, i int) {
		if j, ok := byName[key]; !ok || preferred(settingTable[i], settingTable[j]) && settingTable[i].Number == settingTable[j].Number {
			byName[key] = i
		}
	}
	for i, e := range settingTable {
		ops, err := HallOperations(e.Hall)
		if err != nil {
			panic("crystal: generated table: " + err.Error())
		}
		centring := e.HM[0]
		if e.Setting == "R" {
			centring = 'P'
		}
		groups[i] = SpaceGroup{Number: e.Number, HM: e.HM, Setting: e.Setting, Hall: e.Hall,
			System: SystemOfNumber(e.Number), Centring: centring, Ops: ops}
		if e.Setting != "" {
			add(compactName(e.HM+":"+e.Setting), i)
		}
		add(compactName(e.HM), i)
		add(compactName(shortHM(e.HM)), i)
		if _, ok := byName[hallKey(e.Hall)]; !ok {
			byName[hallKey(e.Hall)] = i
		}
		if j, ok := byNumber[e.Number]; !ok || preferred(e, settingTable[j]) && settingTable[j].HM == e.HM {
			byNumber[e.Number] = i
		}
		if _, ok := byOps[opsKey(ops)]; !ok {
			byOps[opsKey(ops)] = i
		}
	}
	for key, i := range byName {
		if strings.HasPrefix(key, "hall:") {
			continue
		}
		folded := strings.ToLower(key)
		if j, ok := byFolded[folded]; ok && j != i {
			byFolded[folded] = -1
		} else if !ok {
			byFolded[folded] = i
		}
	}
}

func copyGroup(i int) SpaceGroup {
	g := groups[i]
	g.Ops = append([]Operation(nil), g.Ops...)
	return g
}

// FindSpaceGroup returns the space group a name gives, with every
// operation of the conventional cell. The name may be
//
//   - a full or short Hermann–Mauguin symbol, with or without spaces and
//     with an optional setting after a colon: "P63/mmc", "P 63/m m c",
//     "I4/mcm", "Fm-3m", "P21/c", "Fd-3m:1", "R-3m:R"; letters in the
//     wrong case ("P 63/M M C") are accepted when no other symbol then
//     reads the same;
//   - a Hall symbol: "-P 6c 2c", "-F 4vw 2vw 3";
//   - an International Tables number: "194".
//
// Where a symbol or number has two settings the default is origin choice 2
// (the origin at a centre of symmetry) and hexagonal axes for the
// rhombohedral groups; a number gives the standard setting. A short
// monoclinic symbol gives the unique-axis-b cell choice. The settings are
// those of the table generated from python3-gemmi 0.5.7 (559 settings).
//
// Reference: International Tables for Crystallography Vol. A, ch. 4.3 (the
// symbols); S. R. Hall, Acta Cryst. A37, 517 (1981) (Hall symbols).
func FindSpaceGroup(name string) (SpaceGroup, error) {
	lookupOnce.Do(buildLookup)
	s := strings.TrimSpace(name)
	if s == "" {
		return SpaceGroup{}, meltbook.Errorf(meltbook.Invalid, "space group", "no symbol or number given")
	}
	if n, err := strconv.Atoi(s); err == nil {
		if i, ok := byNumber[n]; ok {
			return copyGroup(i), nil
		}
		return SpaceGroup{}, meltbook.Errorf(meltbook.Invalid, "space group", "number %d is not in 1 … 230", n)
	}
	if i, ok := byName[hallKey(s)]; ok {
		return copyGroup(i), nil
	}
	if i, ok := byName[compactName(s)]; ok {
		return copyGroup(i), nil
	}
	if i, ok := byFolded[strings.ToLower(compactName(s))]; ok && i >= 0 {
		return copyGroup(i), nil
	}
	if ops, err := HallOperations(s); err == nil {
		return IdentifySpaceGroup(ops), nil
	}
	return SpaceGroup{}, meltbook.Errorf(meltbook.Invalid, "space group", "%q is no Hermann–Mauguin symbol, Hall symbol or number known", name)
}

// IdentifySpaceGroup returns the setting whose operations are the given
// ones as a set, modulo lattice translations (compared in the canonical
// xyz form with translations in [0, 1)). When no setting of the table
// matches, it returns a SpaceGroup with Number 0, HM and Hall empty, the
// given operations, and System and Centring inferred from them: the
// centring from the pure translations among the operations (P when there
// are none or they fit no lattice letter), the system from the proper
// rotations (det·R) they contain — eight 3-fold rotations make it cubic, a
// 6-fold hexagonal, a 3-fold trigonal, a 4-fold tetragonal, three 2-folds
// orthorhombic, one 2-fold monoclinic, else triclinic.
//
// Reference: International Tables for Crystallography Vol. A, 2.1.
func IdentifySpaceGroup(ops []Operation) SpaceGroup {
	lookupOnce.Do(buildLookup)
	if i, ok := byOps[opsKey(ops)]; ok {
		return copyGroup(i)
	}
	return SpaceGroup{System: inferSystem(ops), Centring: inferCentring(ops), Ops: append([]Operation(nil), ops...)}
}

// rotationOrder is the order of a proper rotation from its trace.
func rotationOrder(r [3][3]int) int {
	switch r[0][0] + r[1][1] + r[2][2] {
	case 3:
		return 1
	case -1:
		return 2
	case 0:
		return 3
	case 1:
		return 4
	case 2:
		return 6
	}
	return 0
}

func inferSystem(ops []Operation) System {
	count := map[int]int{}
	seen := map[[3][3]int]bool{}
	for _, o := range ops {
		r := o.R
		if o.Determinant() < 0 {
			for i := range r {
				for j := range r[i] {
					r[i][j] = -r[i][j]
				}
			}
		}
		if seen[r] {
			continue
		}
		seen[r] = true
		count[rotationOrder(r)]++
	}
	switch {
	case count[3] >= 8:
		return Cubic
	case count[6] > 0:
		return Hexagonal
	case count[3] > 0:
		return Trigonal
	case count[4] > 0:
		return Tetragonal
	case count[2] >= 3:
		return Orthorhombic
	case count[2] > 0:
		return Monoclinic
	}
	return Triclinic
}

func inferCentring(ops []Operation) byte {
	var got []string
	for _, o := range ops {
		if o.R == Identity.R {
			if n := o.Normalised(); n.T != [3]float64{} {
				got = append(got, n.String())
			}
		}
	}
	sort.Strings(got)
	for _, letter := range []byte("ABCIRF") {
		var want []string
		for _, c := range hallCentring[letter] {
			o := exactOp{R: Identity.R, T: c}
			want = append(want, o.operation().String())
		}
		sort.Strings(want)
		if strings.Join(want, ";") == strings.Join(got, ";") {
			return letter
		}
	}
	return 'P'
}

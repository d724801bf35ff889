package crystal_test

import (
	"bufio"
	"bytes"
	"sort"
	"strconv"
	"strings"
	"testing"

	"meltbook/analysis/crystal"
	"meltbook/analysis/internal/pyref"
)

// gemmiOps prints, for every setting of gemmi's space-group table, the IT
// number, the extended Hermann–Mauguin symbol, the Hall symbol and the
// operations gemmi generates (op.triplet(), space separated), tab separated.
const gemmiOps = `
import gemmi
for sg in gemmi.spacegroup_table():
    print("\t".join([str(sg.number), sg.xhm(), sg.hall, " ".join(op.triplet() for op in sg.operations())]))
`

func opSet(t *testing.T, ops []crystal.Operation) []string {
	t.Helper()
	out := make([]string, len(ops))
	for i, o := range ops {
		out[i] = o.Normalised().String()
	}
	sort.Strings(out)
	return out
}

// TestHallOperationsAgainstGemmi checks every Hall symbol of the table: the
// operations generated here equal, as a set with translations in [0, 1),
// the ones Debian's python3-gemmi 0.5.7 generates (sg.operations()).
func TestHallOperationsAgainstGemmi(t *testing.T) {
	out := pyref.Run(t, []string{"gemmi"}, gemmiOps, nil)
	sc := bufio.NewScanner(bytes.NewReader(out))
	sc.Buffer(nil, 1<<20)
	n := 0
	for sc.Scan() {
		cols := strings.Split(sc.Text(), "\t")
		if len(cols) != 4 {
			t.Fatalf("reference line %q has not four columns", sc.Text())
		}
		number, xhm, hall, list := cols[0], cols[1], cols[2], cols[3]
		var want []crystal.Operation
		for _, f := range strings.Fields(list) {
			op, err := crystal.ParseOperation(f)
			if err != nil {
				t.Fatalf("%s: gemmi operation %q: %v", hall, f, err)
			}
			want = append(want, op)
		}
		got, err := crystal.HallOperations(hall)
		if err != nil {
			t.Errorf("HallOperations(%q): %v", hall, err)
			continue
		}
		g, w := opSet(t, got), opSet(t, want)
		if strings.Join(g, " ") != strings.Join(w, " ") {
			t.Errorf("HallOperations(%q): %d operations\n got %v\nwant %v (gemmi)", hall, len(g), g, w)
		}
		// The same set of operations identifies a setting of the same
		// number (gemmi's sg.number); two names of one setting share it.
		if id := crystal.IdentifySpaceGroup(want); strconv.Itoa(id.Number) != number || strings.Join(opSet(t, id.Ops), " ") != strings.Join(w, " ") {
			t.Errorf("IdentifySpaceGroup(ops of %q) = %d %q, want number %s (gemmi)", hall, id.Number, id.Hall, number)
		}
		// The extended symbol finds this very setting (gemmi's sg.xhm()).
		if g, err := crystal.FindSpaceGroup(xhm); err != nil || strings.Join(opSet(t, g.Ops), " ") != strings.Join(w, " ") {
			t.Errorf("FindSpaceGroup(%q) = %q, %v; want the setting of Hall symbol %q (gemmi)", xhm, g.Hall, err, hall)
		}
		n++
	}
	if n != 559 {
		t.Errorf("checked %d settings, want the 559 of gemmi 0.5.7's table", n) // gemmi 0.5.7: len(gemmi.spacegroup_table())
	}
}

package main

import (
	"context"
	"encoding/csv"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"meltbook"
	"meltbook/store"
)

// The cooling inputs every spun run below gives, so that each rate can be
// worked by hand: h·ΔT/(ρ·c_p·t) = 1e5 · (1523.15 − 293.15) / (4000 · 800 · t)
// = 38.4375 K·m/s / t, Newtonian with k = 50 W/(m·K).
const findCooling = "melt-temperature: 1250C\ndensity: 4g/cm3\nspecific-heat: 800J/kgK\nconductivity: 50W/mK\n"

// findRuns are five invented melts. e/a under Raynor's valences as
// commonly quoted (Al 3, Cu 1, Fe −2.66, Mn −3.66, Pd 0; Zn 2, Mg 2, Y 3
// being group valences), hand-worked:
//
//	QX-0001 Al63Cu25Fe12     1.89 + 0.25 − 0.3192  = 1.8208   t 30 µm: 1.28125e6 K/s
//	QX-0002 Al65Cu20Fe15     1.95 + 0.20 − 0.399   = 1.751    t 60 µm: 6.40625e5 K/s
//	QX-0003 Al62Cu25.5Fe12.5 1.86 + 0.255 − 0.3325 = 1.7825   t 20 µm: 1.921875e6 K/s
//	QX-0004 Al70Pd20Mn10     2.10 + 0 − 0.366      = 1.734    not spun
//	QX-0005 Zn60Mg30Y10      1.20 + 0.60 + 0.30    = 2.1      not spun
var findRuns = "code: QX-0001\ncomposition: Al63Cu25Fe12\nmass: 10g\nmade: 2024-03-01T10:00\nthickness: 30um\n" + findCooling +
	"\ncode: QX-0002\ncomposition: Al65Cu20Fe15\nmass: 10g\nmade: 2024-03-15T10:00\noperator: bo\nthickness: 60um\n" + findCooling +
	"\ncode: QX-0003\ncomposition: Al62Cu25.5Fe12.5\nmass: 10g\nmade: 2024-04-02T10:00\nthickness: 20um\nnotes: ribbon Cracked near the edge\n" + findCooling +
	"\ncode: QX-0004\ncomposition: Al70Pd20Mn10\nmass: 10g\nmade: 2024-04-20T23:30\noperator: bo\n" +
	"\ncode: QX-0005\ncomposition: Zn60Mg30Y10\nmass: 5g\nmade: 2024-05-01T10:00\n"

func findNotebook(t *testing.T) *testNotebook {
	t.Helper()
	nb := newNotebook(t)
	path := filepath.Join(t.TempDir(), "runs.txt")
	if err := os.WriteFile(path, []byte(findRuns), 0o644); err != nil {
		t.Fatal(err)
	}
	nb.ok("log", "--file", path)
	nb.ok("outcome", "QX-0001", "--kind", "icosahedral", "--evidence", "XRD")
	nb.ok("outcome", "QX-0002", "--kind", "crystalline", "--name", "λ-Al13Fe4")
	nb.ok("outcome", "QX-0003", "--kind", "icosahedral", "--lattice", "F", "--fraction", "0.9")
	st, err := store.Open(context.Background(), nb.path, store.Options{Now: func() time.Time { return nb.now }})
	if err != nil {
		t.Fatal(err)
	}
	defer st.Close()
	if _, err := st.ProposeOutcome(context.Background(), "meltbook-indexer 0.1", "QX-0004", meltbook.Outcome{Kind: meltbook.Icosahedral, Lattice: "P"}); err != nil {
		t.Fatal(err)
	}
	return nb
}

func foundCodes(t *testing.T, nb *testNotebook, args ...string) string {
	t.Helper()
	out := nb.ok(append([]string{"find", "--json"}, args...)...)
	var rows []struct {
		Code string `json:"code"`
	}
	if err := json.Unmarshal([]byte(out), &rows); err != nil {
		t.Fatalf("not JSON: %v\n%s", err, out)
	}
	codes := make([]string, len(rows))
	for i, r := range rows {
		codes[i] = strings.TrimPrefix(r.Code, "QX-000")
	}
	return strings.Join(codes, " ")
}

func TestFindFilters(t *testing.T) {
	nb := findNotebook(t)
	tests := []struct {
		args []string
		want string // last digits of the codes, in order made
	}{
		{nil, "1 2 3 4 5"},
		{[]string{"--outcome", "icosahedral"}, "1 3"},
		{[]string{"--outcome", "icosahedral", "--proposals", "yes"}, "1 3 4"},
		{[]string{"--outcome", "icosahedral,crystalline"}, "1 2 3"},
		{[]string{"--outcome", "icosahedral", "--outcome", "amorphous"}, "1 3"},
		{[]string{"--ea", "1.7:1.8"}, "2 3 4"},
		{[]string{"--outcome", "icosahedral", "--ea", "1.7:1.8"}, "3"},
		{[]string{"--ea", "1.8:"}, "1 5"},
		{[]string{"--system", "Al-Cu-Fe"}, "1 2 3"},
		{[]string{"--with", "Pd"}, "4"},
		{[]string{"--with", "Al"}, "1 2 3 4"},
		{[]string{"--content", "Cu=24:26"}, "1 3"},
		{[]string{"--content", "Cu=24:26", "--content", "Fe=12.2:"}, "3"},
		{[]string{"--rate", "1e6:"}, "1 3"},
		{[]string{"--rate", ":1e6"}, "2"},
		{[]string{"--made", "2024-03-01:2024-03-31"}, "1 2"},
		{[]string{"--made", ":2024-04-20"}, "1 2 3 4"}, // the end day is included
		{[]string{"--made", "2024-04-20T23:00..2024-04-20T23:30"}, "4"},
		{[]string{"--by", "bo"}, "2 4"},
		{[]string{"--text", "cracked"}, "3"},
		// Group valences (common practice): Zn 2, Mg 2, Y 3 give 2.1; Fe, Pd
		// and Mn have none, so the other melts have no e/a under group.
		{[]string{"--scheme", "group", "--ea", "1:3"}, "5"},
		{[]string{"--sort", "ea"}, "4 2 3 1 5"},
		{[]string{"--sort", "rate", "--desc"}, "3 1 2 4 5"}, // melts without a rate come last either way
		{[]string{"--sort", "code", "--limit", "2"}, "1 2"},
	}
	for _, tc := range tests {
		t.Run(strings.Join(tc.args, " "), func(t *testing.T) {
			if got := foundCodes(t, nb, tc.args...); got != tc.want {
				t.Errorf("found %q, want %q", got, tc.want)
			}
		})
	}
}

func TestFindJSON(t *testing.T) {
	nb := findNotebook(t)
	out := nb.ok("find", "--json", "--outcome", "icosahedral", "--ea", "1.7:1.8")
	var rows []map[string]any
	if err := json.Unmarshal([]byte(out), &rows); err != nil {
		t.Fatal(err)
	}
	if len(rows) != 1 {
		t.Fatalf("%d rows, want QX-0003 alone:\n%s", len(rows), out)
	}
	r := rows[0]
	if r["code"] != "QX-0003" {
		t.Errorf("code %v", r["code"])
	}
	if af := r["atomic_fractions"].(map[string]any); af["Cu"] != 0.255 || af["Fe"] != 0.125 {
		t.Errorf("atomic_fractions %v, want Cu 0.255 and Fe 0.125 (Al62Cu25.5Fe12.5)", af)
	}
	closeTo(t, "e_over_a", r["e_over_a"].(float64), 1.7825, 1e-9)                     // hand-worked above
	closeTo(t, "cooling_rate_K_s", r["cooling_rate_K_s"].(float64), 1.921875e6, 1e-9) // 38.4375 / 20e-6
	oc := r["outcomes"].([]any)
	if len(oc) != 1 || oc[0].(map[string]any)["kind"] != "icosahedral" || oc[0].(map[string]any)["fraction"] != 0.9 {
		t.Errorf("outcomes %v", oc)
	}
	if out := nb.ok("find", "--json", "--with", "Ti"); strings.TrimSpace(out) != "[]" {
		t.Errorf("nothing found should print [], got %s", out)
	}
}

func TestFindTableAndCSV(t *testing.T) {
	nb := findNotebook(t)
	golden(t, "find-table.txt", nb.ok("find", "--with", "Al", "--proposals", "yes"))
	golden(t, "list.txt", nb.ok("list"))
	out := nb.ok("find", "--csv", "--system", "Al-Cu-Fe")
	recs, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(recs) != 4 || recs[0][0] != "code" || recs[3][0] != "QX-0003" {
		t.Errorf("CSV:\n%s", out)
	}
}

func TestFindErrors(t *testing.T) {
	nb := findNotebook(t)
	tests := []struct {
		args []string
		want string
	}{
		{[]string{"--ea", "1.7"}, "--ea"},
		{[]string{"--outcome", "quasi"}, "--outcome"},
		{[]string{"--with", "XX"}, "--with"},
		{[]string{"--content", "Cu=30:20"}, "--content"},
		{[]string{"--made", "March"}, "--made"},
		{[]string{"--scheme", "no-such-scheme"}, "--scheme"},
		{[]string{"--sort", "colour"}, "--sort"},
		{[]string{"--json", "--csv"}, "--json"},
	}
	for _, tc := range tests {
		_, errOut, code := nb.run("", append([]string{"find"}, tc.args...)...)
		if code != exitInvalid || !strings.Contains(errOut, tc.want) {
			t.Errorf("find %v: exit %d, %q; want exit %d naming %s", tc.args, code, errOut, exitInvalid, tc.want)
		}
	}
}

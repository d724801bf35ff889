package main

import (
	"bytes"
	"context"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"meltbook"
	"meltbook/store"
)

// sheetNotebook makes an empty notebook holding one melt, QX-0001, and
// returns its path.
func sheetNotebook(t *testing.T) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), "nb.db")
	if _, errOut, code := runCLI(t, "", "--notebook", path, "init"); code != 0 {
		t.Fatalf("init: %s", errOut)
	}
	st := sheetOpen(t, path)
	m := &meltbook.Melt{Code: "QX-0001", Operator: "Ines Varga", CompositionEntered: "Al63Cu25Fe12", TargetMassGrams: 10,
		Nominal:   []meltbook.ElementFraction{{Element: "Al", Fraction: 0.63}, {Element: "Cu", Fraction: 0.25}, {Element: "Fe", Fraction: 0.12}},
		CreatedAt: time.Date(2026, 1, 5, 10, 0, 0, 0, time.UTC)}
	if err := st.CreateMelt(context.Background(), "Ines Varga", m); err != nil {
		t.Fatal(err)
	}
	if err := st.Close(); err != nil {
		t.Fatal(err)
	}
	return path
}

// sheetOpen opens a notebook as the command line does, with the same
// valence tables, so that opening it changes nothing.
func sheetOpen(t *testing.T, path string) *store.Store {
	t.Helper()
	st, err := store.Open(context.Background(), path, (&app{now: time.Now}).storeOptions())
	if err != nil {
		t.Fatal(err)
	}
	return st
}

func sheetExport(t *testing.T, path string) string {
	t.Helper()
	st := sheetOpen(t, path)
	defer st.Close()
	var b bytes.Buffer
	if err := st.Export(context.Background(), &b); err != nil {
		t.Fatal(err)
	}
	return b.String()
}

// sheetReport hides the temporary notebook path in a report.
func sheetReport(out, notebook string) string {
	return strings.ReplaceAll(out, notebook, "NOTEBOOK")
}

func TestSheetMessyDryRunWritesNothing(t *testing.T) {
	nb := sheetNotebook(t)
	exportBefore := sheetExport(t, nb)
	before, err := os.ReadFile(nb)
	if err != nil {
		t.Fatal(err)
	}

	out, errOut, code := runCLI(t, "", "--notebook", nb, "--as", "Lena Holt", "import-sheet", "--dry-run", "testdata/sheet-messy.csv")
	if code != exitInvalid {
		t.Errorf("exit code %d, want %d (rows refused)", code, exitInvalid)
	}
	if want := "9 of 18 rows refused (dry run)"; !strings.Contains(errOut, want) {
		t.Errorf("stderr %q lacks %q", errOut, want)
	}
	golden(t, "sheet-messy-dry-run.txt", sheetReport(out, nb))

	after, err := os.ReadFile(nb)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(before, after) {
		t.Error("the dry run changed the notebook file")
	}
	if got := sheetExport(t, nb); got != exportBefore {
		t.Error("the dry run changed the notebook's contents")
	}
}

func TestSheetMessyImport(t *testing.T) {
	nb := sheetNotebook(t)
	st := sheetOpen(t, nb)
	qx, err := st.MeltRecord(context.Background(), "QX-0001")
	if err != nil {
		t.Fatal(err)
	}
	historyBefore := len(qx.History)
	st.Close()
	out, errOut, code := runCLI(t, "", "--notebook", nb, "--as", "Lena Holt", "import-sheet", "testdata/sheet-messy.csv")
	if code != exitInvalid {
		t.Errorf("exit code %d, want %d (rows refused)", code, exitInvalid)
	}
	if want := "9 of 18 rows refused (the others were imported)"; !strings.Contains(errOut, want) {
		t.Errorf("stderr %q lacks %q", errOut, want)
	}
	golden(t, "sheet-messy-import.txt", sheetReport(out, nb))

	ctx := context.Background()
	st = sheetOpen(t, nb)
	defer st.Close()
	_, total, err := st.FindMelts(ctx, meltbook.MeltFilter{})
	if err != nil {
		t.Fatal(err)
	}
	if total != 10 { // QX-0001 and the nine rows the report takes
		t.Errorf("%d melts in the notebook, want 10", total)
	}
	for _, code := range []string{"RB-103", "RB-105", "RB-109", "RB-110", "RB-112", "RB-114"} {
		if _, err := st.FindMeltByCode(ctx, code); meltbook.KindOf(err) != meltbook.NotFound {
			t.Errorf("refused %s: got %v, want not found", code, err)
		}
	}
	if qx, err := st.MeltRecord(ctx, "QX-0001"); err != nil || qx.Melt.CompositionEntered != "Al63Cu25Fe12" || len(qx.History) != historyBefore {
		t.Errorf("QX-0001 was touched: %v %+v", err, qx)
	}

	// Values read back, each worked by hand from the sheet's cells.
	r101, err := st.MeltRecord(ctx, "RB-101")
	if err != nil {
		t.Fatal(err)
	}
	spin := sheetStep(t, r101, meltbook.MeltSpin)
	sheetParam(t, spin, "thickness", 35.5e-6, 1e-12)       // "35,5" under "Thickness (um)": 35.5 × 10⁻⁶ m (SI prefix µ, SI Brochure)
	sheetParam(t, spin, "wheel-speed", 30, 1e-9)           // "30" under "(m/s)"
	sheetParam(t, spin, "orifice", 0.8e-3, 1e-12)          // "0,8 mm" = 0.8 × 10⁻³ m
	sheetParam(t, spin, "melt-temperature", 1523.15, 1e-9) // 1250 °C + 273.15 K (SI Brochure)
	if !r101.Melt.CreatedAt.Equal(time.Date(2026, 3, 2, 0, 0, 0, 0, time.Local)) {
		t.Errorf("RB-101 made %v, want 2026-03-02", r101.Melt.CreatedAt)
	}
	if r101.Melt.TargetMassGrams != 10 {
		t.Errorf("RB-101 mass %g g, want 10", r101.Melt.TargetMassGrams)
	}

	r102, err := st.MeltRecord(ctx, "RB-102")
	if err != nil {
		t.Fatal(err)
	}
	anneal := sheetStep(t, r102, meltbook.Anneal)
	sheetParam(t, anneal, "temperature", 1073.15, 1e-9) // 800 °C + 273.15 K
	sheetParam(t, anneal, "time", 4*3600, 1e-9)         // 4 h
	outs := r102.Samples[0].Outcomes
	if len(outs) != 2 || outs[0].Kind != meltbook.Icosahedral || outs[0].Lattice != "F" || outs[0].Fraction == nil || *outs[0].Fraction != 0.9 ||
		outs[1].Kind != meltbook.Crystalline || outs[1].Name != "β" || *outs[1].Fraction != 0.1 {
		t.Errorf("RB-102 outcomes %+v, want icosahedral F 0.9 and crystalline β 0.1", outs)
	}
	if g := r102.Melt.Nominal; len(g) != 3 || math.Abs(g[0].Fraction-0.625) > 1e-12 {
		t.Errorf("RB-102 nominal %+v, want Al 0.625 from \"Al62,5Cu25Fe12,5\"", g)
	}

	r104, err := st.MeltRecord(ctx, "RB-104")
	if err != nil {
		t.Fatal(err)
	}
	// 03/04/2026 in a sheet whose 14/03/2026 shows day/month order: 3 April.
	if !r104.Melt.CreatedAt.Equal(time.Date(2026, 4, 3, 0, 0, 0, 0, time.Local)) {
		t.Errorf("RB-104 made %v, want 2026-04-03", r104.Melt.CreatedAt)
	}
	r108, err := st.MeltRecord(ctx, "RB-108")
	if err != nil {
		t.Fatal(err)
	}
	if r108.Melt.Operator != "Lena Holt" {
		t.Errorf("RB-108 operator %q, want the importer", r108.Melt.Operator)
	}
	r115, err := st.MeltRecord(ctx, "RB-115")
	if err != nil {
		t.Fatal(err)
	}
	if o := r115.Samples[0].Outcomes; len(o) != 1 || !strings.HasPrefix(o[0].Evidence, "tentative") || o[0].Fraction != nil {
		t.Errorf("RB-115 outcomes %+v, want one tentative icosahedral", o)
	}

	// The same sheet again takes nothing more: every code is now known.
	again := sheetExport(t, nb)
	out, _, code = runCLI(t, "", "--notebook", nb, "import-sheet", "testdata/sheet-messy.csv")
	if code != exitInvalid || !strings.Contains(out, "0 rows taken, 18 refused") {
		t.Errorf("second import: exit %d, report ends %q", code, lastLine(out))
	}
	if sheetExport(t, nb) != again {
		t.Error("a second import of the same sheet changed the notebook")
	}
}

func lastLine(s string) string {
	lines := strings.Split(strings.TrimSpace(s), "\n")
	return lines[len(lines)-1]
}

func sheetStep(t *testing.T, r *meltbook.MeltRecord, kind meltbook.StepKind) meltbook.ProcessStep {
	t.Helper()
	for _, st := range r.Samples[0].Steps {
		if st.Kind == kind {
			return st
		}
	}
	t.Fatalf("%s has no %s step", r.Melt.Code, kind)
	return meltbook.ProcessStep{}
}

func sheetParam(t *testing.T, st meltbook.ProcessStep, name string, want, tol float64) {
	t.Helper()
	p, ok := st.Param(name)
	if !ok {
		t.Errorf("%s step lacks %s", st.Kind, name)
		return
	}
	if math.Abs(p.SI-want) > tol {
		t.Errorf("%s.%s = %g, want %g ± %g", st.Kind, name, p.SI, want, tol)
	}
}

func TestSheetAllOrNothing(t *testing.T) {
	nb := sheetNotebook(t)
	before := sheetExport(t, nb)
	out, _, code := runCLI(t, "", "--notebook", nb, "import-sheet", "--all-or-nothing", "testdata/sheet-messy.csv")
	if code != exitInvalid || !strings.Contains(out, "nothing imported (--all-or-nothing)") {
		t.Errorf("exit %d, report ends %q", code, lastLine(out))
	}
	if sheetExport(t, nb) != before {
		t.Error("--all-or-nothing wrote rows although some were refused")
	}
}

// TestSheetMapFillPrefix reads a plain comma sheet whose headings no field
// knows, mapped by hand, with codes numbered from a prefix after the
// notebook's last.
func TestSheetMapFillPrefix(t *testing.T) {
	nb := sheetNotebook(t)
	sheet := filepath.Join(t.TempDir(), "runs.csv")
	text := "Legierung,Einwaage,Dicke,Datum,Bemerkung\n" +
		"Al63Cu25Fe12,10 g,35,2026-05-04,\n" +
		"Al62Cu25.5Fe12.5,10 g,32,2026-05-05,remelted twice\n"
	if err := os.WriteFile(sheet, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	out, errOut, code := runCLI(t, "", "--notebook", nb, "--as", "Lena Holt", "import-sheet", sheet,
		"--map", "Legierung=composition", "--map", "einwaage=mass", "--map", "Dicke=thickness (um)", "--map", "4=date",
		"--map", "Bemerkung=notes", "--fill", "operator=Ines Varga", "--fill", "wheel-speed=30 m/s", "--prefix", "QX")
	if code != 0 {
		t.Fatalf("exit %d: %s\n%s", code, errOut, out)
	}
	golden(t, "sheet-map.txt", strings.ReplaceAll(sheetReport(out, nb), sheet, "runs.csv"))
	st := sheetOpen(t, nb)
	defer st.Close()
	r, err := st.MeltRecord(context.Background(), "QX-0003") // QX-0001 was in the notebook: the rows are QX-0002 and QX-0003
	if err != nil {
		t.Fatal(err)
	}
	if r.Melt.Notes != "remelted twice" || r.Melt.Operator != "Ines Varga" {
		t.Errorf("QX-0003: %+v", r.Melt)
	}
	spin := sheetStep(t, r, meltbook.MeltSpin)
	sheetParam(t, spin, "thickness", 32e-6, 1e-12) // 32 µm
	sheetParam(t, spin, "wheel-speed", 30, 1e-9)   // --fill wheel-speed=30 m/s
}

func TestSheetRefusesWholeSheet(t *testing.T) {
	nb := sheetNotebook(t)
	dir := t.TempDir()
	for _, c := range []struct {
		name, text string
		args       []string
		want       string
	}{
		{"no-composition", "code,mass\nA-1,10 g\n", nil, "no heading row names the composition"},
		{"two-thickness", "composition,mass (g),thickness (um),t (um)\nAl63Cu25Fe12,10,30,31\n", nil, "both give the thickness"},
		{"bad-heading-unit", "composition,mass (g),wheel speed (ft/s)\nAl63Cu25Fe12,10,30\n", nil, `unknown unit "ft/s"`},
		{"no-mass", "composition,code\nAl63Cu25Fe12,A-1\n", nil, "no column gives the mass"},
		{"map-missing", "composition,mass (g)\nAl63Cu25Fe12,10\n", []string{"--map", "Dicke=thickness"}, `no column is headed "Dicke"`},
		{"map-field", "composition,mass (g)\nAl63Cu25Fe12,10\n", []string{"--map", "mass (g)=weight"}, `"weight" is not a field`},
		{"fill-field", "composition,mass (g)\nAl63Cu25Fe12,10\n", []string{"--fill", "colour=red"}, `"colour" is not a field`},
	} {
		t.Run(c.name, func(t *testing.T) {
			path := filepath.Join(dir, c.name+".csv")
			if err := os.WriteFile(path, []byte(c.text), 0o644); err != nil {
				t.Fatal(err)
			}
			before := sheetExport(t, nb)
			args := append([]string{"--notebook", nb, "import-sheet", path}, c.args...)
			_, errOut, code := runCLI(t, "", args...)
			if code != exitInvalid || !strings.Contains(errOut, c.want) {
				t.Errorf("exit %d, stderr %q; want %d and %q", code, errOut, exitInvalid, c.want)
			}
			if sheetExport(t, nb) != before {
				t.Error("a refused sheet changed the notebook")
			}
		})
	}
}

func TestSheetFields(t *testing.T) {
	out, errOut, code := runCLI(t, "", "import-sheet", "--fields")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	golden(t, "sheet-fields.txt", out)
}

package runsheet_test

import (
	"bytes"
	"fmt"
	"math"
	"strings"
	"testing"
	"time"
	"unicode/utf16"

	"meltbook"
	"meltbook/store/runsheet"
)

// read reads a sheet from text, failing the test on a sheet-level error.
func read(t *testing.T, text string, opt runsheet.Options) *runsheet.Sheet {
	t.Helper()
	if opt.Name == "" {
		opt.Name = "runs.csv"
	}
	sh, err := runsheet.Read(strings.NewReader(text), opt)
	if err != nil {
		t.Fatalf("Read: %v", err)
	}
	return sh
}

// oneRow reads a sheet of a heading line and one row.
func oneRow(t *testing.T, heading, row string, opt runsheet.Options) runsheet.Row {
	t.Helper()
	sh := read(t, heading+"\n"+row+"\n", opt)
	if len(sh.Rows) != 1 {
		t.Fatalf("%d rows, want 1", len(sh.Rows))
	}
	return sh.Rows[0]
}

func problems(r runsheet.Row) string {
	var s []string
	for _, p := range r.Problems {
		s = append(s, p.Error())
	}
	return strings.Join(s, "\n")
}

func param(t *testing.T, r runsheet.Row, kind meltbook.StepKind, name string) (meltbook.Param, bool) {
	t.Helper()
	for _, st := range r.Steps {
		if st.Kind == kind {
			return st.Param(name)
		}
	}
	return meltbook.Param{}, false
}

func TestHeadings(t *testing.T) {
	for _, c := range []struct {
		heading, field, unit string
	}{
		{"Code", "code", ""},
		{"  NOMINAL  ", "composition", ""},
		{"Mass (g)", "mass", "g"},
		{"mass_g", "mass", "g"},
		{"Wheel_Speed [m/s]", "wheel-speed", "m/s"},
		{"wheel speed (rpm)", "wheel-speed", "rpm"},
		{"Thickness (µm)", "thickness", "µm"},
		{"thickness_um", "thickness", "um"},
		{"t (um)", "thickness", "um"},
		{"T (°C)", "melt-temperature", "°C"},
		{"Melt temp. (C)", "melt-temperature", "C"},
		{"ejection-pressure (kPa)", "ejection-pressure", "kPa"},
		{"Heat treatment", "anneal", ""},
		{"XRD result", "outcome", ""},
		{"Remarks", "notes", ""},
		{"t", "", ""},        // thickness or melt temperature: not guessed
		{"colour", "", ""},   // no field
		{"pressure", "", ""}, // ejection or chamber: not listed
		{"Mass (kg)", "mass", "kg"},
	} {
		t.Run(c.heading, func(t *testing.T) {
			text, opt := "composition,"+c.heading+"\nAl63Cu25Fe12,1\n", runsheet.Options{Fill: map[string]string{"mass": "10 g"}}
			switch c.field {
			case "mass":
				opt = runsheet.Options{}
			case "composition":
				text = "mass (g)," + c.heading + "\n10,Al63Cu25Fe12\n"
			}
			col := read(t, text, opt).Columns[1]
			if col.Field != c.field || col.Unit != c.unit {
				t.Errorf("%q -> field %q unit %q, want %q %q (%s)", c.heading, col.Field, col.Unit, c.field, c.unit, col.How)
			}
		})
	}
}

func TestQuantities(t *testing.T) {
	const heading = "composition;mass (g);thickness (um);wheel speed;wheel diameter;orifice"
	for _, c := range []struct {
		row       string
		name      string
		kind      meltbook.StepKind
		wantSI    float64
		tolerance float64
		problem   string
	}{
		// 35,5 µm = 35.5 × 10⁻⁶ m (SI prefix µ, SI Brochure 9th ed.)
		{row: "Al63Cu25Fe12;10;35,5;30 m/s;;0.8 mm", name: "thickness", kind: meltbook.MeltSpin, wantSI: 35.5e-6, tolerance: 1e-15},
		// a cell's unit wins over the heading's: 0.04 mm = 40 µm
		{row: "Al63Cu25Fe12;10;0,04 mm;30 m/s;;0.8 mm", name: "thickness", kind: meltbook.MeltSpin, wantSI: 40e-6, tolerance: 1e-15},
		// v = π·D·n: 3000 rpm on a 200 mm wheel = π·0.2·50 = 31.4159 m/s (common practice)
		{row: "Al63Cu25Fe12;10;30;3000 rpm;200 mm;0.8 mm", name: "wheel-speed", kind: meltbook.MeltSpin, wantSI: math.Pi * 0.2 * 50, tolerance: 1e-9},
		{row: "Al63Cu25Fe12;10;30;30 ft/s;;0.8 mm", problem: `unknown unit "ft/s"`},
		{row: "Al63Cu25Fe12;10;30;3000 rpm;;0.8 mm", problem: "needs the wheel diameter"},
		{row: "Al63Cu25Fe12;10;30;30 m/s;;0,8", problem: `"0,8" has no unit, and neither has the heading; write e.g. "0.8 mm"`},
		{row: "Al63Cu25Fe12;10;1.234,5;30 m/s;;0.8 mm", problem: "thousands separator"},
		{row: "Al63Cu25Fe12;0;30;30 m/s;;0.8 mm", problem: "must be more than zero"},
		{row: "Al63Cu25Fe12;10;30 kg;30 m/s;;0.8 mm", problem: "is a mass, not a length"},
	} {
		t.Run(c.row, func(t *testing.T) {
			r := oneRow(t, heading, c.row, runsheet.Options{Operator: "Ines Varga"})
			if c.problem != "" {
				if !strings.Contains(problems(r), c.problem) {
					t.Errorf("problems %q, want one containing %q", problems(r), c.problem)
				}
				return
			}
			if !r.OK() {
				t.Fatalf("refused: %s", problems(r))
			}
			p, ok := param(t, r, c.kind, c.name)
			if !ok || math.Abs(p.SI-c.wantSI) > c.tolerance {
				t.Errorf("%s = %g (found %v), want %g ± %g", c.name, p.SI, ok, c.wantSI, c.tolerance)
			}
		})
	}
}

func TestCommaSheetRefusesDecimalComma(t *testing.T) {
	r := oneRow(t, "composition,mass (g),thickness (um)", `Al63Cu25Fe12,10,"35,5"`, runsheet.Options{Operator: "x"})
	if !strings.Contains(problems(r), "comma-separated sheet") {
		t.Errorf("problems %q, want the comma refused", problems(r))
	}
}

func TestDates(t *testing.T) {
	utc := time.UTC
	day := func(y int, m time.Month, d int) time.Time { return time.Date(y, m, d, 0, 0, 0, 0, utc) }
	for _, c := range []struct {
		name    string
		cells   []string // the date column, one row each; the last is checked
		order   runsheet.DateOrder
		want    time.Time
		problem string
	}{
		{name: "iso", cells: []string{"2026-03-14"}, want: day(2026, 3, 14)},
		{name: "iso time", cells: []string{"2026-03-14 09:30"}, want: time.Date(2026, 3, 14, 9, 30, 0, 0, utc)},
		{name: "iso T", cells: []string{"2026-03-14T09:30"}, want: time.Date(2026, 3, 14, 9, 30, 0, 0, utc)},
		{name: "rfc3339", cells: []string{"2026-03-14T09:30:00+01:00"}, want: time.Date(2026, 3, 14, 8, 30, 0, 0, utc)},
		{name: "dotted", cells: []string{"14.03.2026"}, want: day(2026, 3, 14)},
		{name: "dotted is day first", cells: []string{"03.04.2026"}, want: day(2026, 4, 3)},
		{name: "dotted two-digit year", cells: []string{"14.03.26"}, want: day(2026, 3, 14)},
		{name: "slash day above 12", cells: []string{"14/03/2026"}, want: day(2026, 3, 14)},
		{name: "slash month first proven", cells: []string{"03/14/2026"}, want: day(2026, 3, 14)},
		{name: "open, sheet shows day first", cells: []string{"14/03/2026", "03/04/2026"}, want: day(2026, 4, 3)},
		{name: "open, sheet shows month first", cells: []string{"03/14/2026", "03/04/2026"}, want: day(2026, 3, 4)},
		{name: "open, asked month first", cells: []string{"03/04/2026"}, order: runsheet.MonthFirst, want: day(2026, 3, 4)},
		{name: "open, asked day first", cells: []string{"03/04/2026"}, order: runsheet.DayFirst, want: day(2026, 4, 3)},
		{name: "open, no evidence", cells: []string{"03/04/2026"}, problem: "could be day/month or month/day"},
		{name: "open, contradicting", cells: []string{"14/03/2026", "03/14/2026", "03/04/2026"}, problem: "could be day/month or month/day"},
		{name: "same day and month", cells: []string{"04/04/2026"}, want: day(2026, 4, 4)},
		{name: "month name", cells: []string{"14 Mar 2026"}, want: day(2026, 3, 14)},
		{name: "month name first", cells: []string{`"March 14, 2026"`}, want: day(2026, 3, 14)},
		{name: "spreadsheet short", cells: []string{"14-Mar-26"}, want: day(2026, 3, 14)},
		{name: "no such day", cells: []string{"31.04.2026"}, problem: "no such day"},
		{name: "29 February 2026", cells: []string{"2026-02-29"}, problem: "no such day"}, // 2026 is not a leap year
		{name: "29 February 2028", cells: []string{"2028-02-29"}, want: day(2028, 2, 29)},
		{name: "day count", cells: []string{"46095"}, problem: "spreadsheet day number"},
		{name: "words", cells: []string{"last Tuesday"}, problem: "not a date"},
		{name: "bad time", cells: []string{"2026-03-14 25:00"}, problem: "not a time of day"},
	} {
		t.Run(c.name, func(t *testing.T) {
			text := "code,composition,mass (g),date\n"
			for i, d := range c.cells {
				text += "A-" + string(rune('1'+i)) + ",Al63Cu25Fe12,10," + d + "\n"
			}
			sh := read(t, text, runsheet.Options{Dates: c.order, Operator: "x"})
			r := sh.Rows[len(sh.Rows)-1]
			if c.problem != "" {
				if !strings.Contains(problems(r), c.problem) {
					t.Errorf("problems %q, want %q (dates: %s)", problems(r), c.problem, sh.DatesWhy)
				}
				return
			}
			if !r.OK() {
				t.Fatalf("refused: %s (dates: %s)", problems(r), sh.DatesWhy)
			}
			if !r.Melt.CreatedAt.Equal(c.want) {
				t.Errorf("%q -> %v, want %v", c.cells[len(c.cells)-1], r.Melt.CreatedAt, c.want)
			}
		})
	}
}

func TestOutcomes(t *testing.T) {
	type phase struct {
		kind     meltbook.PhaseKind
		detail   string // lattice, order or name
		fraction float64
	}
	for _, c := range []struct {
		cell      string
		want      []phase
		tentative bool
		guessed   string
		problem   string
	}{
		{cell: "i-phase", want: []phase{{meltbook.Icosahedral, "", -1}}},
		{cell: "IQC", want: []phase{{meltbook.Icosahedral, "", -1}}},
		{cell: "icosahedral (F)", want: []phase{{meltbook.Icosahedral, "F", -1}}},
		{cell: "F-type i-phase", want: []phase{{meltbook.Icosahedral, "F", -1}}},
		{cell: "P-type i", want: []phase{{meltbook.Icosahedral, "P", -1}}},
		{cell: "QC", want: []phase{{meltbook.Icosahedral, "", -1}}, guessed: "could be decagonal"},
		{cell: "quasicrystal", want: []phase{{meltbook.Icosahedral, "", -1}}, guessed: "could be decagonal"},
		{cell: "d-phase", want: []phase{{meltbook.Decagonal, "", -1}}},
		{cell: "decagonal", want: []phase{{meltbook.Decagonal, "", -1}}},
		{cell: "approximant 1/1", want: []phase{{meltbook.Approximant, "1/1", -1}}},
		{cell: "2/1", want: []phase{{meltbook.Approximant, "2/1", -1}}, guessed: "2/1 cubic approximant"},
		{cell: "α-AlMnSi", want: []phase{{meltbook.Approximant, "1/1", -1}}, guessed: "1/1 cubic approximant"},
		{cell: "amorphous", want: []phase{{meltbook.Amorphous, "", -1}}},
		{cell: "glassy", want: []phase{{meltbook.Amorphous, "", -1}}},
		{cell: "λ + β", want: []phase{{meltbook.Crystalline, "λ", -1}, {meltbook.Crystalline, "β", -1}}},
		{cell: "λ-Al13Fe4", want: []phase{{meltbook.Crystalline, "λ-Al13Fe4", -1}}},
		{cell: "beta", want: []phase{{meltbook.Crystalline, "beta", -1}}},
		{cell: "Al13Fe4 & MgZn2", want: []phase{{meltbook.Crystalline, "Al13Fe4", -1}, {meltbook.Crystalline, "MgZn2", -1}}},
		{cell: "B2", want: []phase{{meltbook.Crystalline, "B2", -1}}},
		{cell: "H phase", want: []phase{{meltbook.Crystalline, "H phase", -1}}},
		{cell: "fcc Al", want: []phase{{meltbook.Crystalline, "fcc Al", -1}}},
		{cell: "i-phase 70% + λ 30%", want: []phase{{meltbook.Icosahedral, "", 0.7}, {meltbook.Crystalline, "λ", 0.3}}},
		{cell: "60% i and 40% β", want: []phase{{meltbook.Icosahedral, "", 0.6}, {meltbook.Crystalline, "β", 0.4}}},
		{cell: "i with traces of ω", problem: "no phase meltbook knows"},
		{cell: "i?", want: []phase{{meltbook.Icosahedral, "", -1}}, tentative: true, guessed: "tentative"},
		{cell: "maybe QC", want: []phase{{meltbook.Icosahedral, "", -1}}, tentative: true, guessed: "tentative"},
		{cell: "none", want: nil},
		{cell: "no ribbon", want: nil},
		{cell: "approximant", problem: "needs its order"},
		{cell: "crystalline", problem: "name the crystalline phase"},
		{cell: "sludge", problem: "no phase meltbook knows"},
		{cell: "i + -", problem: "no phase meltbook knows"},
		{cell: "i + ()", problem: "names no phase"},
		{cell: "i 70% + λ 50%", problem: "add up to 120%"},
	} {
		t.Run(c.cell, func(t *testing.T) {
			r := oneRow(t, "code;composition;mass (g);outcome", "A-1;Al63Cu25Fe12;10;"+c.cell, runsheet.Options{Operator: "x"})
			if c.problem != "" {
				if !strings.Contains(problems(r), c.problem) {
					t.Errorf("problems %q, want %q", problems(r), c.problem)
				}
				return
			}
			if !r.OK() {
				t.Fatalf("refused: %s", problems(r))
			}
			if len(r.Outcomes) != len(c.want) {
				t.Fatalf("%d outcomes %+v, want %d", len(r.Outcomes), r.Outcomes, len(c.want))
			}
			for i, w := range c.want {
				o := r.Outcomes[i]
				detail := o.Lattice + o.Order + o.Name
				if o.Kind == meltbook.Approximant {
					detail = o.Order
				}
				if o.Kind != w.kind || detail != w.detail {
					t.Errorf("outcome %d: %s %q, want %s %q", i, o.Kind, detail, w.kind, w.detail)
				}
				switch {
				case w.fraction < 0 && o.Fraction != nil:
					t.Errorf("outcome %d: fraction %g, want none", i, *o.Fraction)
				case w.fraction >= 0 && (o.Fraction == nil || math.Abs(*o.Fraction-w.fraction) > 1e-12):
					t.Errorf("outcome %d: fraction %v, want %g", i, o.Fraction, w.fraction)
				}
				if got := strings.HasPrefix(o.Evidence, runsheet.Tentative); got != c.tentative {
					t.Errorf("outcome %d: evidence %q, tentative %v", i, o.Evidence, c.tentative)
				}
				if !strings.Contains(o.Evidence, "runs.csv line 2") {
					t.Errorf("outcome %d: evidence %q does not say where", i, o.Evidence)
				}
			}
			if g := strings.Join(r.Guesses, "; "); !strings.Contains(g, c.guessed) || (c.guessed == "" && g != "") {
				t.Errorf("guesses %q, want %q", g, c.guessed)
			}
		})
	}
}

func TestAnneals(t *testing.T) {
	for _, c := range []struct {
		cell                string
		temperatureK, hours float64
		atmosphere, cooling string
		problem             string
		none                bool
	}{
		// °C to K: + 273.15 (SI Brochure); hours to seconds: × 3600.
		{cell: "800 °C 4 h", temperatureK: 1073.15, hours: 4},
		{cell: "800C/4h WQ", temperatureK: 1073.15, hours: 4, cooling: "WQ"},
		{cell: "4 h at 650 °C in vacuum, furnace cool", temperatureK: 923.15, hours: 4, atmosphere: "vacuum", cooling: "furnace cool"},
		{cell: "2 days at 1023 K", temperatureK: 1023, hours: 48},
		{cell: "700 C 30 min", temperatureK: 973.15, hours: 0.5},
		{cell: "600 °C", problem: "no anneal time"},
		{cell: "4 h", problem: "no anneal temperature"},
		{cell: "800 C 4 h then 600 C 2 h", problem: "more than one"},
		{cell: "as spun", none: true},
		{cell: "none", none: true},
	} {
		t.Run(c.cell, func(t *testing.T) {
			r := oneRow(t, "code;composition;mass (g);anneal", "A-1;Al63Cu25Fe12;10;"+c.cell, runsheet.Options{Operator: "x"})
			if c.problem != "" {
				if !strings.Contains(problems(r), c.problem) {
					t.Errorf("problems %q, want %q", problems(r), c.problem)
				}
				return
			}
			if !r.OK() {
				t.Fatalf("refused: %s", problems(r))
			}
			temp, ok := param(t, r, meltbook.Anneal, "temperature")
			if c.none {
				if ok {
					t.Errorf("anneal read from %q", c.cell)
				}
				return
			}
			tm, _ := param(t, r, meltbook.Anneal, "time")
			if math.Abs(temp.SI-c.temperatureK) > 1e-9 || math.Abs(tm.SI-3600*c.hours) > 1e-9 {
				t.Errorf("%g K for %g s, want %g K for %g s", temp.SI, tm.SI, c.temperatureK, 3600*c.hours)
			}
			atm, _ := param(t, r, meltbook.Anneal, "atmosphere")
			cool, _ := param(t, r, meltbook.Anneal, "cooling")
			if atm.Text != c.atmosphere || cool.Text != c.cooling {
				t.Errorf("atmosphere %q cooling %q, want %q %q", atm.Text, cool.Text, c.atmosphere, c.cooling)
			}
		})
	}
}

func TestMessySheets(t *testing.T) {
	const rows = "code;composition;mass (g);thickness (µm)\r\nA-1;Al63Cu25Fe12;10;35,5\r\n;;;\r\n\r\nA-2;Al62Cu25.5Fe12.5;10;31;;;\r\n"
	utf16le := func(s string) []byte {
		b := []byte{0xFF, 0xFE}
		for _, u := range utf16.Encode([]rune(s)) {
			b = append(b, byte(u), byte(u>>8))
		}
		return b
	}
	latin := bytes.ReplaceAll([]byte(rows), []byte("µ"), []byte{0xB5}) // µ is 0xB5 in Windows-1252
	for _, c := range []struct {
		name     string
		data     []byte
		encoding string
		delim    rune
	}{
		{"utf-8 with bom, crlf", append([]byte("\ufeff"), rows...), "UTF-8 with byte-order mark", ';'},
		{"utf-16le", utf16le(rows), "UTF-16LE", ';'},
		{"windows-1252", latin, "Windows-1252 (the text was not UTF-8)", ';'},
		{"tab", []byte(strings.ReplaceAll(rows, ";", "\t")), "UTF-8", '\t'},
	} {
		t.Run(c.name, func(t *testing.T) {
			sh, err := runsheet.Read(bytes.NewReader(c.data), runsheet.Options{Name: "runs.csv", Operator: "x"})
			if err != nil {
				t.Fatal(err)
			}
			if sh.Encoding != c.encoding || sh.Delimiter != c.delim || !sh.DecimalComma {
				t.Errorf("encoding %q delimiter %q decimal comma %v", sh.Encoding, sh.Delimiter, sh.DecimalComma)
			}
			if len(sh.Rows) != 2 || sh.Blank != 1 || sh.Taken() != 2 {
				t.Fatalf("%d rows, %d blank, %d taken; want 2, 1, 2: %v", len(sh.Rows), sh.Blank, sh.Taken(), sh.Rows)
			}
			if sh.Rows[1].Line != 5 {
				t.Errorf("second row on line %d, want 5", sh.Rows[1].Line)
			}
			if sh.Columns[3].Unit != "µm" {
				t.Errorf("thickness unit %q, want µm", sh.Columns[3].Unit)
			}
			p, _ := param(t, sh.Rows[0], meltbook.MeltSpin, "thickness")
			if math.Abs(p.SI-35.5e-6) > 1e-15 { // 35,5 µm
				t.Errorf("thickness %g m, want 35.5e-6", p.SI)
			}
		})
	}
}

func TestDuplicateCodes(t *testing.T) {
	sh := read(t, "code,composition,mass (g)\nA-1,Al63Cu25Fe12,10\nA-2,Al63Cu25Fe12,10\na-1,Al62Cu25Fe13,10\n", runsheet.Options{Operator: "x"})
	if sh.Taken() != 1 || sh.Rows[1].Melt.Code != "A-2" || !sh.Rows[1].OK() {
		t.Fatalf("taken %d; want only A-2", sh.Taken())
	}
	for _, i := range []int{0, 2} {
		if !strings.Contains(problems(sh.Rows[i]), "also on line") {
			t.Errorf("row %d: %q", i, problems(sh.Rows[i]))
		}
	}
}

func TestTitleLinesAndNotes(t *testing.T) {
	sh := read(t, "Ribbon runs 2026\n\nwho,composition,mass\nIV,Al63Cu25Fe12,10 g\n", runsheet.Options{})
	if sh.HeadingLine != 3 || len(sh.Rows) != 1 || !sh.Rows[0].OK() || sh.Rows[0].Melt.Operator != "IV" {
		t.Fatalf("heading line %d, rows %+v", sh.HeadingLine, sh.Rows)
	}
	if !strings.Contains(strings.Join(sh.Notes, "\n"), "line 1 is above the headings") {
		t.Errorf("notes %q", sh.Notes)
	}
}

func TestRowWithoutOperatorIsRefused(t *testing.T) {
	r := oneRow(t, "code,composition,mass (g)", "A-1,Al63Cu25Fe12,10", runsheet.Options{})
	if !strings.Contains(problems(r), "needs an operator") {
		t.Errorf("problems %q", problems(r))
	}
}

func TestCoolingEstimate(t *testing.T) {
	r := oneRow(t, "code,composition,mass (g),thickness (um),melt temp (C)", "A-1,Al63Cu25Fe12,10,35,1250", runsheet.Options{Operator: "x"})
	rate, ok := param(t, r, meltbook.MeltSpin, "cooling-rate")
	regime, _ := param(t, r, meltbook.MeltSpin, "cooling-regime")
	// Newtonian cooling h·ΔT/(ρ·c_p·t) of a 35 µm Al-Cu-Fe ribbon with
	// h = 10⁵ W/(m²·K) is of order 10⁶ K/s (common practice for melt spinning).
	if !ok || rate.SI < 3e5 || rate.SI > 3e6 {
		t.Errorf("cooling rate %g K/s, want of order 1e6", rate.SI)
	}
	if !strings.Contains(regime.Text, "melt 1250 °C,") || !strings.Contains(regime.Text, "wheel 20 °C (assumed)") {
		t.Errorf("regime %q", regime.Text)
	}
}

func FuzzSheet(f *testing.F) {
	f.Add([]byte("code;composition;mass (g);thickness (um);date;outcome;anneal\r\nA-1;Al63Cu25Fe12;10;35,5;14/03/2026;i-phase 70% + λ;800 °C 4 h WQ\r\n"))
	f.Add([]byte("\ufeffcomposition,mass,wheel speed (rpm),wheel diameter\nAl63Cu25Fe12,10 g,3000,200 mm\n"))
	f.Add([]byte("title\n\nnominal\tweight\tT\n\"Al-25Cu-12Fe\"\t\"10 g\"\t1250 C\n"))
	f.Add([]byte{0xFF, 0xFE, 'c', 0, 'o', 0})
	f.Add([]byte("composition,mass (g),outcome\nAl63Cu25Fe12,10,\"i? + - & 2/1 (P) 30% and β-Al(Cu,Fe), maybe QC\"\n"))
	f.Add([]byte("composition;mass (g);date\nAl63Cu25Fe12;10;03/04/26 10:00\n;;\n\"unterminated"))
	f.Fuzz(func(t *testing.T, data []byte) {
		sh, err := runsheet.Read(bytes.NewReader(data), runsheet.Options{Name: "fuzz.csv", Operator: "fuzzer"})
		if err != nil {
			if meltbook.KindOf(err) != meltbook.Invalid {
				t.Fatalf("error of kind %q: %v", meltbook.KindOf(err), err)
			}
			return
		}
		for _, r := range sh.Rows {
			for _, p := range r.Problems {
				if !strings.HasPrefix(p.Error(), "fuzz.csv line ") {
					t.Errorf("problem %q does not say where", p.Error())
				}
			}
			if !r.OK() {
				continue
			}
			m := r.Melt
			if m.Code == "" {
				m.Code = "F-1"
			}
			if err := m.Validate(); err != nil {
				t.Errorf("line %d taken but invalid: %v", r.Line, err)
			}
			for _, st := range r.Steps {
				if err := st.Validate(); err != nil {
					t.Errorf("line %d taken with an invalid step: %v", r.Line, err)
				}
			}
			_ = r.Summary()
		}
	})
}

func TestFillProblemSaysFill(t *testing.T) {
	r := oneRow(t, "code,composition,mass (g)", "A-1,Al63Cu25Fe12,10", runsheet.Options{Operator: "x", Fill: map[string]string{"wheel-speed": "30 ft/s"}})
	if want := `runs.csv line 2, --fill wheel-speed: "30 ft/s": unknown unit "ft/s"`; !strings.Contains(problems(r), want) {
		t.Errorf("problems %q, want %q", problems(r), want)
	}
}

// BenchmarkRead reads a semicolon sheet of 1000 runs with decimal commas,
// dates, anneals, outcomes and cooling estimates.
func BenchmarkRead(b *testing.B) {
	var sb strings.Builder
	sb.WriteString("Code;Nominal;Mass (g);Operator;Date;Wheel speed (m/s);Thickness (um);Melt temp (C);Anneal;Outcome\r\n")
	for i := 0; i < 1000; i++ {
		fmt.Fprintf(&sb, "RB-%04d;Al6%d,5Cu25Fe1%d,5;10;Ines Varga;%02d.%02d.2026;3%d;3%d,5;1250;800 °C 4 h WQ;i-phase 70%% + λ 30%%\r\n",
			i, i%4, 2-i%3, 1+i%28, 1+i%12, i%10, i%10)
	}
	data := []byte(sb.String())
	b.SetBytes(int64(len(data)))
	for b.Loop() {
		sh, err := runsheet.Read(bytes.NewReader(data), runsheet.Options{Name: "runs.csv"})
		if err != nil || sh.Taken() != 1000 {
			b.Fatalf("%v, %d taken", err, sh.Taken())
		}
	}
}

package main

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"meltbook"
	"meltbook/store/runform"
)

const runFile = `# Al-Cu-Fe series, week 18 (invented runs)
code:         QX-0042
composition:  Al63Cu25Fe12
mass:         10 g
made:         2024-04-29T10:15
weighed:      Al=4.2940g, Cu=4.0131g
weighed:      Fe=1.6929g
arc-remelts:  4
wheel-speed:  30 m/s
melt-temperature: 1250 C
thickness:    32 um
notes:        first of the series;
    button cracked on the third flip

# a generated code follows QX-0042
prefix:       QX
composition:  Al-26Cu-12Fe
mass:         10 g
operator:     bo

composition:  Al62Cu25.5Fe12.5
mass:         8g
prefix:       QX
`

func tempFile(t *testing.T, name, text string) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func TestLogFromFile(t *testing.T) {
	nb := newNotebook(t)
	path := tempFile(t, "week18.runs", runFile)
	out := nb.ok("log", "--file", path)
	golden(t, "log-file.txt", out)
	d := exportedDocument(t, nb)
	if len(d.Melts) != 3 {
		t.Fatalf("%d melts, want 3", len(d.Melts))
	}
	codes := []string{d.Melts[0].Code, d.Melts[1].Code, d.Melts[2].Code}
	if strings.Join(codes, " ") != "QX-0042 QX-0043 QX-0044" {
		t.Errorf("codes %v", codes)
	}
	first := d.Melts[0]
	if first.Notes != "first of the series; button cracked on the third flip" {
		t.Errorf("continued notes %q", first.Notes)
	}
	if want := time.Date(2024, 4, 29, 10, 15, 0, 0, time.UTC); !first.CreatedAt.Equal(want) {
		t.Errorf("made %v, want %v", first.CreatedAt, want)
	}
	if d.Melts[1].Operator != "bo" || d.Melts[2].Operator != "adaeze" {
		t.Errorf("operators %q %q", d.Melts[1].Operator, d.Melts[2].Operator)
	}
	// Al-26Cu-12Fe in balance notation is Al 62, Cu 26, Fe 12 at.%.
	if f := d.Melts[1].Nominal; f[0].Element != "Al" || f[0].Fraction < 0.62-1e-12 || f[0].Fraction > 0.62+1e-12 {
		t.Errorf("balance notation read as %+v", f)
	}
}

func TestLogFileFromStandardInput(t *testing.T) {
	nb := newNotebook(t)
	out, errOut, code := nb.run("composition: Al70Pd20Mn10\nmass: 5g\n", "log", "--file", "-")
	if code != 0 || !strings.Contains(out, "logged M-0001: Al70Pd20Mn10") {
		t.Errorf("exit %d: %s %s", code, out, errOut)
	}
}

// TestLogFileErrors checks that a bad run anywhere in a file names the
// file, line and field, and that no run of the file is written.
func TestLogFileErrors(t *testing.T) {
	nb := newNotebook(t)
	nb.ok("log", "--code", "QX-0001", "--composition", "Al63Cu25Fe12", "--mass", "10g")
	good := "composition: Al63Cu25Fe12\nmass: 10g\n\n"
	tests := []struct {
		name, text string
		code       int
		want       string
	}{
		{"bad thickness in the second run", good + "composition: Al62Cu26Fe12\nmass: 10g\nthickness: -3um\n", exitInvalid, "runs.txt line 6, field thickness: "},
		{"unknown field", good + "composition: Al62Cu26Fe12\ncolour: grey\n", exitInvalid, "runs.txt line 5, field colour: \"colour\" is not a field"},
		{"missing mass", good + "composition: Al62Cu26Fe12\n", exitInvalid, "runs.txt run starting at line 4, field mass: missing"},
		{"no colon", "composition Al63Cu25Fe12\n", exitInvalid, "runs.txt line 1: expected FIELD: VALUE"},
		{"continuation first", "  Al63Cu25Fe12\n", exitInvalid, "runs.txt line 1: an indented line"},
		{"field twice", "composition: Al63Cu25Fe12\nmass: 10g\nmass: 5g\n", exitInvalid, "runs.txt line 3, field mass: mass given twice"},
		{"code in the notebook", good + "code: QX-0001\ncomposition: Al62Cu26Fe12\nmass: 10g\n", exitConflict, "runs.txt line 4, field code: melt QX-0001 already exists"},
		{"code twice in the file", "code: QX-0005\n" + good + "code: QX-0005\n" + good, exitConflict, "runs.txt line 5, field code: code QX-0005 is also given at "},
		{"empty file", "# nothing\n\n", exitInvalid, "no runs"},
		{"not UTF-8", "notes: \xff\n", exitInvalid, "runs.txt line 1: not UTF-8"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			path := filepath.Join(dir, "runs.txt")
			if err := os.WriteFile(path, []byte(tc.text), 0o644); err != nil {
				t.Fatal(err)
			}
			before := nb.export()
			_, errOut, code := nb.run("", "log", "--file", path)
			if code != tc.code {
				t.Fatalf("exit %d, want %d: %s", code, tc.code, errOut)
			}
			if !strings.Contains(errOut, tc.want) {
				t.Errorf("stderr %q lacks %q", errOut, tc.want)
			}
			if nb.export() != before {
				t.Error("the notebook changed although the file was refused")
			}
		})
	}
	if _, errOut, code := nb.run("", "log", "--file", filepath.Join(t.TempDir(), "absent.txt")); code != exitInvalid || !strings.Contains(errOut, "--file") {
		t.Errorf("absent file: exit %d, %q", code, errOut)
	}
}

func FuzzRunFile(f *testing.F) {
	f.Add(runFile)
	f.Add("composition: Al63Cu25Fe12\nmass: 10g\nwheel-speed: 3000rpm\nwheel-diameter: 200mm\nthickness: 30um\n")
	f.Add("composition: Al63Cu25Fe12\nmass: 10g\nweighed: Al=1g,,Cu=\npurity: Al=101\n")
	f.Add("\uFEFFnotes: x\r\n  y\r\n\r\n#c\n")
	f.Add("code: a:b\nmade: 2024-01-01T00:00:00Z\nheat-transfer: 1e5W/m2K\n")
	f.Fuzz(func(t *testing.T, text string) {
		runs, err := readRunFile("fuzz.runs", strings.NewReader(text))
		if err != nil {
			checkWhere(t, err)
			return
		}
		for _, in := range runs {
			b, err := runform.Build(in, "fuzzer", time.UTC)
			if err != nil {
				checkWhere(t, err)
				continue
			}
			if b.New.Melt.Code == "" && b.Prefix == "" {
				t.Fatal("a run without a code and without a prefix to generate one")
			}
		}
	})
}

// checkWhere insists that a run-file error is a user error naming the file.
func checkWhere(t *testing.T, err error) {
	t.Helper()
	var e *meltbook.Error
	if !errors.As(err, &e) {
		t.Fatalf("error %v is not a *meltbook.Error", err)
	}
	if e.Kind == meltbook.Internal {
		t.Fatalf("internal error on user input: %v", err)
	}
	if !strings.Contains(e.Error(), "fuzz.runs") {
		t.Fatalf("error %q does not name the file", e.Error())
	}
}

package main

import (
	"context"
	"encoding/json"
	"math"
	"strings"
	"testing"
	"time"

	"meltbook"
	"meltbook/store"
	"meltbook/store/runform"
)

// fullLog are the flags of a run with every part recorded.
var fullLog = []string{
	"log", "--code", "QX-0001", "--composition", "Al63Cu25Fe12", "--mass", "10g",
	"--weighed", "Al=4.2941g,Cu=4.0131g", "--weighed", "Fe=1692.9mg", "--mass-after", "9.97g",
	"--notes", "first of the Al-Cu-Fe series",
	"--arc-remelts", "4", "--arc-current", "150A", "--arc-atmosphere", "Ar after Ti getter", "--arc-chamber-pressure", "600mbar",
	"--wheel-material", "Cu", "--wheel-speed", "3000rpm", "--wheel-diameter", "200mm",
	"--orifice", "0.8mm", "--gap", "0.3mm", "--ejection-pressure", "0.25bar", "--melt-temperature", "1250C",
	"--chamber-gas", "He", "--chamber-pressure", "40kPa", "--thickness", "30um", "--width", "2mm",
	"--density", "4g/cm3", "--specific-heat", "800J/kgK", "--conductivity", "50W/mK",
}

func exportedDocument(t *testing.T, nb *testNotebook) store.Document {
	t.Helper()
	var d store.Document
	if err := json.Unmarshal([]byte(nb.export()), &d); err != nil {
		t.Fatal(err)
	}
	return d
}

func stepParam(t *testing.T, st store.DocStep, name string) meltbook.Param {
	t.Helper()
	p, ok := st.Param(name)
	if !ok {
		t.Fatalf("step %s has no %s: %+v", st.Kind, name, st.Params)
	}
	return p
}

func closeTo(t *testing.T, what string, got, want, relTol float64) {
	t.Helper()
	if math.Abs(got-want) > relTol*math.Abs(want) {
		t.Errorf("%s = %.9g, want %.9g", what, got, want)
	}
}

func TestLogFromFlags(t *testing.T) {
	nb := newNotebook(t)
	out := nb.ok(fullLog...)
	golden(t, "log-flags.txt", out)
	for _, want := range []string{"logged QX-0001", "Molten alloy", "rules"} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}

	d := exportedDocument(t, nb)
	if len(d.Melts) != 1 || len(d.Melts[0].Samples) != 1 {
		t.Fatalf("want one melt with its own sample, got %+v", d.Melts)
	}
	m := d.Melts[0]
	if m.Code != "QX-0001" || m.Operator != "adaeze" || m.CompositionEntered != "Al63Cu25Fe12" || m.TargetMassGrams != 10 {
		t.Errorf("melt %+v", m.Melt)
	}
	// Planned masses hand-worked with IUPAC 2021 standard atomic weights
	// (Al 26.9815385, Cu 63.546, Fe 55.845), as in TestWeighJSON.
	planned := map[string]float64{"Al": 4.294006, "Cu": 4.013134, "Fe": 1.692860}
	weighed := map[string]float64{"Al": 4.2941, "Cu": 4.0131, "Fe": 1.6929} // typed; 1692.9 mg = 1.6929 g
	for _, l := range m.WeighOut {
		closeTo(t, "planned "+l.Element, l.PlannedGrams, planned[l.Element], 1e-6)
		if l.WeighedGrams == nil || *l.WeighedGrams != weighed[l.Element] {
			t.Errorf("weighed %s = %v, want %g", l.Element, l.WeighedGrams, weighed[l.Element])
		}
	}
	// Loss = 4.2941 + 4.0131 + 1.6929 − 9.97 = 0.0301 g (hand-worked).
	if loss, ok := m.MassLossGrams(); !ok || math.Abs(loss-0.0301) > 1e-9 {
		t.Errorf("mass loss %g g, want 0.0301 g", loss)
	}

	steps := m.Samples[0].Steps
	if len(steps) != 2 || steps[0].Kind != meltbook.ArcMelt || steps[1].Kind != meltbook.MeltSpin {
		t.Fatalf("steps %+v", steps)
	}
	arc, spin := store.DocStep(steps[0]), store.DocStep(steps[1])
	// SI values by the definitions of the units (SI Brochure, 9th ed.):
	// 1 mbar = 100 Pa, 1 bar = 1e5 Pa, T/K = t/°C + 273.15.
	for _, c := range []struct {
		st   store.DocStep
		name string
		si   float64
		unit string
	}{
		{arc, "remelts", 4, ""},
		{arc, "current", 150, "A"},
		{arc, "chamber-pressure", 60000, "mbar"},
		// v = π·D·n = π · 0.2 m · 3000/60 s⁻¹ = 31.4159265 m/s (hand-worked).
		{spin, "wheel-speed", 31.41592653589793, "m/s"},
		{spin, "orifice", 8e-4, "mm"},
		{spin, "gap", 3e-4, "mm"},
		{spin, "ejection-pressure", 25000, "bar"},
		{spin, "melt-temperature", 1523.15, "°C"},
		{spin, "chamber-pressure", 40000, "kPa"},
		{spin, "thickness", 3e-5, "µm"},
		{spin, "width", 2e-3, "mm"},
		// Newtonian rate h·ΔT/(ρ·c_p·t) = 1e5 · (1523.15 − 293.15) / (4000 · 800 · 30e-6)
		// = 1.23e8 / 96 = 1.28125e6 K/s, with the default h = 1e5 W/(m²·K) and
		// wheel at 20 °C (hand-worked).
		{spin, "cooling-rate", 1.28125e6, "K/s"},
	} {
		p := stepParam(t, c.st, c.name)
		closeTo(t, string(c.st.Kind)+"."+c.name, p.SI, c.si, 1e-9)
		if p.Unit != c.unit {
			t.Errorf("%s unit %q, want %q (the unit typed)", c.name, p.Unit, c.unit)
		}
	}
	if p := stepParam(t, arc, "atmosphere"); p.Text != "Ar after Ti getter" {
		t.Errorf("atmosphere %q", p.Text)
	}
	// Bi = h·t/k = 1e5 · 30e-6 / 50 = 0.06 < 0.1: Newtonian (hand-worked).
	if r := stepParam(t, spin, "cooling-regime").Text; !strings.HasPrefix(r, "newtonian, Biot number 0.06;") {
		t.Errorf("cooling regime %q", r)
	}
	if !strings.Contains(spin.Notes, "3000 rpm") || !strings.Contains(spin.Notes, "200 mm") {
		t.Errorf("the rpm and wheel diameter typed are not kept with the step: %q", spin.Notes)
	}
}

func TestLogShowsUnitsBack(t *testing.T) {
	nb := newNotebook(t)
	nb.ok(fullLog...)
	out := nb.ok("show", "QX-0001")
	for _, want := range []string{"600 mbar", "0.25 bar", "1250 °C", "30 µm", "0.8 mm", "31.4159 m/s", "150 A"} {
		if !strings.Contains(out, want) {
			t.Errorf("show lacks %q as typed:\n%s", want, out)
		}
	}
}

func TestLogGeneratesCodes(t *testing.T) {
	nb := newNotebook(t)
	nb.ok("log", "--composition", "Al63Cu25Fe12", "--mass", "10g")
	nb.ok("log", "--composition", "Al63Cu25Fe12", "--mass", "10g", "--code", "QX-0007")
	out := nb.ok("log", "--composition", "Al62Cu26Fe12", "--mass", "5g", "--prefix", "QX")
	if !strings.HasPrefix(out, "logged QX-0008:") {
		t.Errorf("the next QX code after QX-0007 should be QX-0008:\n%s", out)
	}
	if out := nb.ok("list"); !strings.Contains(out, "M-0001") {
		t.Errorf("default prefix M not used:\n%s", out)
	}
}

func TestLogCheckWritesNothing(t *testing.T) {
	nb := newNotebook(t)
	before := nb.export()
	out := nb.ok("log", "--check", "--composition", "Al63Cu25Fe12", "--mass", "10g", "--thickness", "30um")
	if !strings.Contains(out, "would log M-0001") || !strings.Contains(out, "nothing written") {
		t.Errorf("check output:\n%s", out)
	}
	if after := nb.export(); after != before {
		t.Error("--check wrote to the notebook")
	}
}

// TestLogErrors checks that bad input names the field, exits non-zero and
// leaves the notebook exactly as it was.
func TestLogErrors(t *testing.T) {
	nb := newNotebook(t)
	nb.ok("log", "--code", "QX-0001", "--composition", "Al63Cu25Fe12", "--mass", "10g")
	base := []string{"log", "--composition", "Al63Cu25Fe12", "--mass", "10g"}
	tests := []struct {
		name string
		args []string
		code int
		want []string
	}{
		{"unknown unit", append(base, "--gap", "3furlongs"), exitInvalid, []string{"--gap", "unknown unit"}},
		{"negative thickness", append(base, "--thickness", "-30um"), exitInvalid, []string{"--thickness", "negative"}},
		{"zero width", append(base, "--width", "0mm"), exitInvalid, []string{"--width", "more than zero"}},
		{"existing code", append(base, "--code", "QX-0001"), exitConflict, []string{"--code", "QX-0001", "already exists"}},
		{"no composition", []string{"log", "--mass", "10g"}, exitInvalid, []string{"--composition", "missing"}},
		{"bad composition", []string{"log", "--composition", "Al63Cu25Xx12", "--mass", "10g"}, exitInvalid, []string{"--composition"}},
		{"weighed element not in the alloy", append(base, "--weighed", "Mg=1g"), exitInvalid, []string{"--weighed", "Mg is not in the composition"}},
		{"rpm without diameter", append(base, "--wheel-speed", "3000rpm"), exitInvalid, []string{"--wheel-speed", "wheel diameter"}},
		{"estimate input without thickness", append(base, "--heat-transfer", "2e5W/m2K"), exitInvalid, []string{"--heat-transfer", "thickness"}},
		{"remelts not a count", append(base, "--arc-remelts", "four"), exitInvalid, []string{"--arc-remelts", "whole number"}},
		{"current without unit", append(base, "--arc-current", "150"), exitInvalid, []string{"--arc-current", "A"}},
		{"code and prefix", append(base, "--code", "QX-0009", "--prefix", "QX"), exitInvalid, []string{"--prefix"}},
		{"code with a space", append(base, "--code", "QX 9"), exitInvalid, []string{"--code", "spaces"}},
		{"bad time", append(base, "--made", "yesterday"), exitInvalid, []string{"--made", "not a time"}},
		{"file and flags", append(base, "--file", "runs.txt"), exitInvalid, []string{"--file", "not both"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			before := nb.export()
			out, errOut, code := nb.run("", tc.args...)
			if code != tc.code {
				t.Fatalf("exit %d, want %d; stderr %s", code, tc.code, errOut)
			}
			for _, w := range tc.want {
				if !strings.Contains(errOut, w) {
					t.Errorf("stderr %q lacks %q", errOut, w)
				}
			}
			if out != "" {
				t.Errorf("a failed log printed %q", out)
			}
			if after := nb.export(); after != before {
				t.Error("the notebook changed although the command failed")
			}
		})
	}
}

func TestLogPrompts(t *testing.T) {
	nb := newNotebook(t)
	testInteractive = true
	answers := strings.Join([]string{
		"Al63Cu25Xx12", // not an element: asked again
		"Al63Cu25Fe12",
		"",     // mass is required: asked again
		"10 g", // mass
		"",     // code: the next free one
		"9.98g",
		"typed at the prompt",
		"3",       // arc-remelts (arc-current came as a flag, so it is not asked)
		"Ar",      // arc-atmosphere
		"",        // arc-chamber-pressure
		"2500rpm", // wheel-speed in rpm: the diameter is asked next
		"250mm",
		"Cu", "", "", "", "1200C", "", "", "25um", "",
	}, "\n") + "\n"
	out, errOut, code := nb.run(answers, "log", "--arc-current", "140A")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	golden(t, "log-prompts.txt", errOut)
	if !strings.HasPrefix(out, "logged M-0001:") {
		t.Errorf("output %q", out)
	}
	d := exportedDocument(t, nb)
	m := d.Melts[0]
	if m.Notes != "typed at the prompt" || m.MassAfterMeltGrams == nil || *m.MassAfterMeltGrams != 9.98 {
		t.Errorf("melt %+v", m.Melt)
	}
	steps := m.Samples[0].Steps
	if len(steps) != 2 {
		t.Fatalf("steps %+v", steps)
	}
	if p := stepParam(t, store.DocStep(steps[0]), "current"); p.SI != 140 {
		t.Errorf("the --arc-current flag given with the prompts was lost: %+v", p)
	}
	if p := stepParam(t, store.DocStep(steps[0]), "atmosphere"); p.Text != "Ar" {
		t.Errorf("arc atmosphere %q, want Ar", p.Text)
	}
	if _, ok := steps[0].Param("chamber-pressure"); ok {
		t.Error("a skipped prompt recorded a value")
	}
	// v = π · 0.25 m · 2500/60 s⁻¹ = 32.7249235 m/s (hand-worked).
	closeTo(t, "wheel speed", stepParam(t, store.DocStep(steps[1]), "wheel-speed").SI, 32.72492347489368, 1e-9)

	// At the end of the input a required value is an error, not a guess.
	_, errOut, code = nb.run("Al63Cu25Fe12\n", "log")
	if code != exitInvalid || !strings.Contains(errOut, "mass") {
		t.Errorf("input ending before the mass: exit %d, %q", code, errOut)
	}
}

// BenchmarkLog logs one melt with its arc-melting and melt-spinning steps
// through the command, as a person does at the bench.
func BenchmarkLog(b *testing.B) {
	nb := newNotebook(b)
	args := []string{
		"--notebook", nb.path, "--as", "adaeze",
		"log", "--prefix", "QX", "--composition", "Al63Cu25Fe12", "--mass", "10g",
		"--weighed", "Al=4.2941g,Cu=4.0131g,Fe=1.6929g", "--arc-remelts", "4", "--arc-atmosphere", "Ar",
		"--wheel-material", "Cu", "--wheel-speed", "30m/s", "--orifice", "0.8mm", "--gap", "0.3mm",
		"--ejection-pressure", "25kPa", "--melt-temperature", "1250C", "--chamber-gas", "He",
		"--thickness", "30um", "--width", "2mm",
	}
	var discard strings.Builder
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		discard.Reset()
		if code := Run(context.Background(), args, strings.NewReader(""), &discard, &discard); code != 0 {
			b.Fatalf("exit %d: %s", code, discard.String())
		}
	}
}

// BenchmarkBuildRun is the command's own share of logging: reading the
// fields, planning the weigh-out and estimating the cooling rate, without
// the notebook.
func BenchmarkBuildRun(b *testing.B) {
	in := runform.Input{Missing: func(key string) string { return "--" + key }}
	for _, kv := range [][2]string{
		{"composition", "Al63Cu25Fe12"}, {"mass", "10g"}, {"weighed", "Al=4.2941g,Cu=4.0131g,Fe=1.6929g"},
		{"arc-remelts", "4"}, {"arc-atmosphere", "Ar"}, {"wheel-material", "Cu"}, {"wheel-speed", "30m/s"},
		{"orifice", "0.8mm"}, {"gap", "0.3mm"}, {"ejection-pressure", "25kPa"}, {"melt-temperature", "1250C"},
		{"chamber-gas", "He"}, {"thickness", "30um"}, {"width", "2mm"},
	} {
		in.Add(kv[0], kv[1], "--"+kv[0])
	}
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if _, err := runform.Build(in, "adaeze", time.UTC); err != nil {
			b.Fatal(err)
		}
	}
}

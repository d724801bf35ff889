package main

import (
	"context"
	"strings"
	"testing"
	"time"

	"meltbook"
	"meltbook/store"
)

// buildWorkflow fills a notebook with one melt taken through the whole
// day: logged, annealed, measured, looked at in the electron microscope,
// judged by a person and by the indexer, noted and corrected.
func buildWorkflow(t *testing.T) *testNotebook {
	t.Helper()
	nb := newNotebook(t)
	nb.ok(fullLog...)
	nb.later(26 * time.Hour)
	nb.ok("--as", "bo", "anneal", "QX-0001", "--temperature", "700C", "--time", "4h", "--atmosphere", "sealed silica, Ar", "--cooling", "water quench", "--label", "ribbon piece 1")
	nb.later(time.Hour)
	nb.ok("measure", "QX-0001.a1", "--method", "eds", "--composition", "Al62.1Cu25.8Fe12.1", "--uncertainty", "0.5", "--uncertainty", "Fe=0.3", "--notes", "area scan 200 µm")
	nb.ok("symmetry", "QX-0001.a1", "--folds", "5,2,3", "--notes", "three zone axes")
	nb.ok("outcome", "QX-0001.a1", "--kind", "icosahedral", "--lattice", "F", "--fraction", "90%", "--evidence", "XRD: all strong peaks index as F")
	nb.ok("outcome", "QX-0001.a1", "--kind", "crystalline", "--name", "β-AlCuFe (B2)", "--fraction", "0.1", "--evidence", "weak (110) line")
	nb.ok("outcome", "QX-0001", "--kind", "approximant", "--order", "1/1", "--evidence", "split peaks near 2θ 43°")

	// The indexer's proposals come through the store, as the scan
	// commands write them.
	st, err := store.Open(context.Background(), nb.path, store.Options{Now: func() time.Time { return nb.now }})
	if err != nil {
		t.Fatal(err)
	}
	frac := 0.8
	for _, code := range []string{"QX-0001.a1", "QX-0001"} {
		if _, err := st.ProposeOutcome(context.Background(), "meltbook-indexer 0.1", code, meltbook.Outcome{Kind: meltbook.Icosahedral, Lattice: "P", Fraction: &frac, Evidence: "12 of 14 peaks"}); err != nil {
			t.Fatal(err)
		}
	}
	st.Close()

	nb.later(time.Hour)
	nb.ok("note", "QX-0001", "ribbon", "brittle,", "kept", "in", "desiccator")
	nb.ok("note", "QX-0001.a1", "annealed piece darker")
	nb.later(24 * time.Hour)
	nb.ok("amend", "QX-0001", "mass-after=9.95g", "--reason", "re-weighed on the calibrated balance")
	nb.ok("amend", "step:QX-0001:2", "thickness=40um", "--reason", "thickness remeasured with a micrometer")
	return nb
}

func TestShowWholeMelt(t *testing.T) {
	nb := buildWorkflow(t)
	out := nb.ok("show", "QX-0001.a1")
	golden(t, "show-QX-0001.txt", out)
	// Nominal and measured side by side: 62.10 − 63.00 = −0.90 at.%,
	// 25.80 − 25.00 = +0.80, 12.10 − 12.00 = +0.10 (arithmetic).
	if !strings.Contains(out, "-0.90") || !strings.Contains(out, "+0.80") || !strings.Contains(out, "+0.10") {
		t.Errorf("differences missing:\n%s", out)
	}
	// A person's decision is shown apart from, and before, the proposals.
	person := strings.Index(out, "decided by a person")
	automatic := strings.Index(out, "automatic proposals")
	if person < 0 || automatic < 0 || person > automatic {
		t.Errorf("person's outcomes not shown apart from and above the automatic ones:\n%s", out)
	}
	// Raynor valences as commonly quoted (Al 3, Cu 1, Fe −2.66):
	// e/a = 0.63·3 + 0.25·1 − 0.12·2.66 = 1.8208.
	if !strings.Contains(out, "e/a 1.821 (raynor valences)") {
		t.Errorf("e/a missing:\n%s", out)
	}
	for _, want := range []string{"40 µm", "amended step 2 melt-spin.thickness", "why: thickness remeasured with a micrometer", "amended step 2 melt-spin.cooling-rate"} {
		if !strings.Contains(out, want) {
			t.Errorf("show lacks %q", want)
		}
	}
}

// TestAmendReestimatesCooling checks that a new thickness re-estimates the
// cooling rate with the inputs given when the run was logged.
func TestAmendReestimatesCooling(t *testing.T) {
	nb := buildWorkflow(t) // logged with ρ 4 g/cm³, c_p 800 J/(kg·K), k 50 W/(m·K); amended to 40 µm
	spin := exportedDocument(t, nb).Melts[0].Samples[0].Steps[1]
	// h·ΔT/(ρ·c_p·t) = 1e5 · 1230 / (4000 · 800 · 40e-6) = 1.23e8 / 128
	// = 960937.5 K/s; Bi = 1e5 · 40e-6 / 50 = 0.08 (hand-worked).
	closeTo(t, "cooling rate", stepParam(t, spin, "cooling-rate").SI, 960937.5, 1e-9)
	if r := stepParam(t, spin, "cooling-regime").Text; !strings.HasPrefix(r, "newtonian, Biot number 0.08;") || !strings.Contains(r, "ρ 4 g/cm³ (given)") {
		t.Errorf("regime %q", r)
	}
	// A new conductivity given with the amendment replaces the logged one:
	// Bi = 1e5 · 40e-6 / 2 = 2 > 0.1, conduction-limited (hand-worked).
	nb.ok("amend", "step:QX-0001:2", "conductivity=2W/mK", "--reason", "measured alloy value")
	spin = exportedDocument(t, nb).Melts[0].Samples[0].Steps[1]
	if r := stepParam(t, spin, "cooling-regime").Text; !strings.HasPrefix(r, "conduction-limited, Biot number 2;") {
		t.Errorf("regime after a new conductivity %q", r)
	}
	// Removing the thickness removes the estimate.
	nb.ok("amend", "step:QX-0001:2", "thickness=", "--reason", "measurement void")
	spin = exportedDocument(t, nb).Melts[0].Samples[0].Steps[1]
	if _, ok := spin.Param("cooling-rate"); ok {
		t.Error("cooling rate kept without a thickness")
	}
}

func TestShowJSON(t *testing.T) {
	nb := buildWorkflow(t)
	out := nb.ok("show", "QX-0001", "--json")
	for _, want := range []string{`"code": "QX-0001"`, `"depth": 1`, `"source": "automatic"`, `"why": "re-weighed on the calibrated balance"`} {
		if !strings.Contains(out, want) {
			t.Errorf("JSON lacks %s", want)
		}
	}
}

// TestFailuresChangeNothing runs commands that must fail and checks the
// exported notebook before and after each.
func TestFailuresChangeNothing(t *testing.T) {
	nb := buildWorkflow(t)
	tests := []struct {
		args []string
		code int
		want string
	}{
		{[]string{"outcome", "QX-0099", "--kind", "icosahedral"}, exitNotFound, "no sample QX-0099"},
		{[]string{"outcome", "QX-0001", "--kind", "quasicrystal"}, exitInvalid, "--kind"},
		{[]string{"outcome", "QX-0001", "--kind", "approximant"}, exitInvalid, "--order"},
		{[]string{"outcome", "QX-0001", "--kind", "icosahedral", "--fraction", "120%"}, exitInvalid, "--fraction"},
		{[]string{"anneal", "QX-0001", "--temperature", "700C"}, exitInvalid, "--time"},
		{[]string{"anneal", "QX-0001", "--temperature", "700 furlongs", "--time", "4h"}, exitInvalid, "--temperature"},
		{[]string{"anneal", "QX-0099", "--temperature", "700C", "--time", "4h"}, exitNotFound, "QX-0099"},
		{[]string{"measure", "QX-0001", "--method", "XPS", "--composition", "Al63Cu25Fe12"}, exitInvalid, "--method"},
		{[]string{"measure", "QX-0001", "--method", "EDS", "--composition", "Al63Cu25Fe12", "--uncertainty", "Ni=0.5"}, exitInvalid, "--uncertainty"},
		{[]string{"symmetry", "QX-0001", "--folds", "7"}, exitInvalid, "--folds"},
		{[]string{"note", "QX-0099", "text"}, exitNotFound, "QX-0099"},
		{[]string{"amend", "QX-0001", "mass=11g"}, exitInvalid, "an amendment needs a reason"},
		{[]string{"amend", "QX-0001", "colour=grey", "--reason", "r"}, exitInvalid, "colour"},
		{[]string{"amend", "QX-0001", "mass=-1g", "--reason", "r"}, exitInvalid, "mass"},
		{[]string{"amend", "QX-0001", "mass=10g", "--reason", "r"}, exitInvalid, "nothing to amend"},
		{[]string{"amend", "QX-0001", "mass=11g", "label=x", "--reason", "r"}, exitInvalid, "label"},
		{[]string{"amend", "QX-0099", "mass=11g", "--reason", "r"}, exitNotFound, "QX-0099"},
		{[]string{"amend", "step:QX-0001:9", "gap=1mm", "--reason", "r"}, exitNotFound, "no step 9"},
		{[]string{"amend", "step:QX-0001:2", "wheel-speed=3000rpm", "--reason", "r"}, exitInvalid, "wheel diameter"},
		{[]string{"amend", "step:QX-0001:2", "cooling-rate=1e9K/s", "--reason", "r"}, exitInvalid, "cooling-rate"},
		{[]string{"amend", "outcome:999", "fraction=50%", "--reason", "r"}, exitNotFound, "999"},
		{[]string{"amend", "outcome:x", "fraction=50%", "--reason", "r"}, exitInvalid, "TARGET"},
		{[]string{"amend", "sample:3", "label=x", "--reason", "r"}, exitInvalid, "TARGET"},
		{[]string{"show", "QX-0099"}, exitNotFound, "QX-0099"},
		{[]string{"restore", "-"}, exitConflict, "empty"},
	}
	emptyDocument := `{"format": "meltbook-notebook", "version": 1, "melts": [], "history": []}`
	for _, tc := range tests {
		t.Run(strings.Join(tc.args, " "), func(t *testing.T) {
			before := nb.export()
			_, errOut, code := nb.run(emptyDocument, tc.args...)
			if code != tc.code {
				t.Fatalf("exit %d, want %d: %s", code, tc.code, errOut)
			}
			if !strings.Contains(errOut, tc.want) {
				t.Errorf("stderr %q lacks %q", errOut, tc.want)
			}
			if nb.export() != before {
				t.Error("the notebook changed although the command failed")
			}
		})
	}
}

func TestAmendKeepsHistory(t *testing.T) {
	nb := buildWorkflow(t)
	out := nb.ok("amend", "outcome:1", "fraction=85%", "evidence=XRD and SAED", "--reason", "second look at the pattern")
	if !strings.Contains(out, "amended outcome:1 fraction: 0.9 → 0.85") {
		t.Errorf("amend output:\n%s", out)
	}
	nb.ok("amend", "QX-0001.a1", "label=piece A", "--reason", "relabelled")
	nb.ok("amend", "measurement:1", "method=WDS", "--reason", "it was WDS")
	nb.ok("amend", "symmetry:1", "folds=2,3,5,10", "--reason", "ten-fold seen too")
	nb.ok("amend", "note:1", "text=ribbon brittle; kept dry", "--reason", "wording")
	nb.ok("amend", "QX-0001", "weighed=Al=4.2945g", "purity=Cu=99.9", "--reason", "balance log checked")
	hist := nb.ok("history", "QX-0001")
	for _, want := range []string{
		"amended outcome 1 fraction: 0.9 → 0.85; why: second look at the pattern",
		"label: ribbon piece 1 → piece A; why: relabelled",
		"method: EDS → WDS",
		"why: ten-fold seen too",
		"why: wording",
		"weigh-out.Al",
		"weigh-out.Cu",
	} {
		if !strings.Contains(hist, want) {
			t.Errorf("history lacks %q:\n%s", want, hist)
		}
	}
}

func TestConfirmAndRejectProposals(t *testing.T) {
	nb := findNotebook(t) // QX-0004 carries one automatic icosahedral proposal, outcome:4
	if got := foundCodes(t, nb, "--outcome", "icosahedral"); got != "1 3" {
		t.Fatalf("before: %q", got)
	}
	if _, errOut, code := nb.run("", "reject", "outcome:4"); code != exitInvalid || !strings.Contains(errOut, "--reason") {
		t.Errorf("reject without a reason: exit %d, %q", code, errOut)
	}
	if out := nb.ok("confirm", "outcome:4", "--reason", "pattern checked by hand"); out != "confirmed outcome:4\n" {
		t.Errorf("confirm printed %q", out)
	}
	// A confirmed proposal is a standing outcome.
	if got := foundCodes(t, nb, "--outcome", "icosahedral"); got != "1 3 4" {
		t.Errorf("after confirming: %q", got)
	}
	if _, _, code := nb.run("", "confirm", "outcome:4"); code == 0 {
		t.Error("a proposal was confirmed twice")
	}
	if _, _, code := nb.run("", "confirm", "outcome:1"); code == 0 {
		t.Error("a person's outcome was confirmed as if it were a proposal")
	}
	if _, _, code := nb.run("", "reject", "outcome:999", "--reason", "x"); code != exitNotFound {
		t.Errorf("rejecting a missing proposal: exit %d, want %d", code, exitNotFound)
	}
	if _, _, code := nb.run("", "confirm", "4"); code != exitInvalid {
		t.Errorf("a bare number: exit %d, want %d", code, exitInvalid)
	}
}

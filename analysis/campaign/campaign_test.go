package campaign_test

import (
	"errors"
	"math"
	"testing"

	"meltbook"
	"meltbook/analysis/campaign"
	"meltbook/analysis/element"
	"meltbook/analysis/suggest"
	"meltbook/seed"
	"meltbook/store/runsheet"
)

func TestTentativeIsOneWord(t *testing.T) {
	for pkg, word := range map[string]string{"seed": seed.Tentative, "runsheet": runsheet.Tentative} {
		if word != campaign.Tentative {
			t.Errorf("%s marks tentative outcomes %q, campaign reads %q", pkg, word, campaign.Tentative)
		}
	}
}

func person(kind meltbook.PhaseKind, evidence string) meltbook.Outcome {
	return meltbook.Outcome{Kind: kind, Source: meltbook.ByPerson, Status: meltbook.Confirmed, Evidence: evidence}
}

func proposal(kind meltbook.PhaseKind, status meltbook.ProposalStatus) meltbook.Outcome {
	return meltbook.Outcome{Kind: kind, Source: meltbook.ByAutomatic, Status: status}
}

func TestSampleOutcome(t *testing.T) {
	for _, c := range []struct {
		name     string
		outcomes []meltbook.Outcome
		want     suggest.Outcome
		examined bool
	}{
		{"nothing recorded", nil, suggest.NoQuasicrystal, false},
		{"person icosahedral", []meltbook.Outcome{person(meltbook.Icosahedral, "sharp i lines")}, suggest.Quasicrystal, true},
		{"tentative", []meltbook.Outcome{person(meltbook.Icosahedral, "tentative: two weak lines")}, suggest.Ambiguous, true},
		{"tentative and firm", []meltbook.Outcome{person(meltbook.Icosahedral, "tentative: x"), person(meltbook.Icosahedral, "")}, suggest.Quasicrystal, true},
		{"crystalline only", []meltbook.Outcome{person(meltbook.Crystalline, "")}, suggest.NoQuasicrystal, true},
		{"approximant is no quasicrystal", []meltbook.Outcome{person(meltbook.Approximant, "")}, suggest.NoQuasicrystal, true},
		{"pending proposal", []meltbook.Outcome{proposal(meltbook.Icosahedral, meltbook.Proposed)}, suggest.NoQuasicrystal, false},
		{"rejected proposal", []meltbook.Outcome{proposal(meltbook.Icosahedral, meltbook.Rejected), person(meltbook.Crystalline, "")}, suggest.NoQuasicrystal, true},
		{"confirmed proposal", []meltbook.Outcome{proposal(meltbook.Icosahedral, meltbook.Confirmed)}, suggest.Quasicrystal, true},
	} {
		t.Run(c.name, func(t *testing.T) {
			got, ok := campaign.SampleOutcome(meltbook.SampleRecord{Outcomes: c.outcomes})
			if got != c.want || ok != c.examined {
				t.Errorf("got %v, %v; want %v, %v", got, ok, c.want, c.examined)
			}
		})
	}
}

func melt(code string, fractions map[string]float64, samples ...meltbook.SampleRecord) meltbook.MeltRecord {
	var nominal []meltbook.ElementFraction
	for _, el := range []string{"Al", "Cu", "Fe", "Zn", "Mg", "Y"} {
		if x, ok := fractions[el]; ok {
			nominal = append(nominal, meltbook.ElementFraction{Element: el, Fraction: x})
		}
	}
	rate := 1e6
	return meltbook.MeltRecord{Melt: meltbook.Melt{Code: code, Nominal: nominal}, CoolingRateKPerS: &rate, Samples: samples}
}

func sample(code, parent string, steps []meltbook.StepKind, outcomes ...meltbook.Outcome) meltbook.SampleRecord {
	s := meltbook.SampleRecord{Sample: meltbook.Sample{Code: code, ParentCode: parent}, Outcomes: outcomes}
	for _, k := range steps {
		s.Steps = append(s.Steps, meltbook.ProcessStep{Kind: k})
	}
	return s
}

func TestGroup(t *testing.T) {
	spun := []meltbook.StepKind{meltbook.ArcMelt, meltbook.MeltSpin}
	anneal := []meltbook.StepKind{meltbook.Anneal}
	records := []meltbook.MeltRecord{
		melt("Z-1", map[string]float64{"Zn": 0.6, "Mg": 0.3, "Y": 0.1},
			sample("Z-1", "", spun, person(meltbook.Crystalline, "W phase"))),
		melt("A-1", map[string]float64{"Al": 0.63, "Cu": 0.25, "Fe": 0.12},
			sample("A-1", "", spun, person(meltbook.Icosahedral, "")),
			// a piece of a piece: the annealed flag passes down, listed before its parent
			sample("A-1.a1.x1", "A-1.a1", nil, person(meltbook.Approximant, "")),
			sample("A-1.a1", "A-1", anneal, person(meltbook.Crystalline, "β"))),
		melt("A-2", map[string]float64{"Al": 0.65, "Cu": 0.20, "Fe": 0.15},
			sample("A-2", "", spun)),
		melt("A-3", map[string]float64{"Al": 0.62, "Cu": 0.26, "Fe": 0.12},
			sample("A-3", "", spun, person(meltbook.Icosahedral, "tentative: one line"))),
	}
	systems := campaign.Group(records)
	if len(systems) != 2 {
		t.Fatalf("%d systems, want 2", len(systems))
	}
	acf, zmy := systems[0], systems[1]
	if acf.Name != "Al-Cu-Fe" || zmy.Name != "Zn-Mg-Y" {
		t.Fatalf("systems %q, %q; want Al-Cu-Fe (3 melts) before Zn-Mg-Y (1)", acf.Name, zmy.Name)
	}
	// Mean of the three nominal compositions, by hand: Al (0.63+0.65+0.62)/3 = 0.6333.
	if math.Abs(acf.Mean[0].Fraction-0.6333333333) > 1e-9 || acf.Mean[0].Element != "Al" {
		t.Errorf("mean %v", acf.Mean)
	}
	if acf.Samples != 5 || acf.Examined != 4 || len(acf.Points) != 4 {
		t.Errorf("samples %d examined %d points %d; want 5, 4, 4", acf.Samples, acf.Examined, len(acf.Points))
	}
	want := map[campaign.Finding]int{campaign.FoundIcosahedral: 1, campaign.FoundTentative: 1, campaign.FoundNothing: 1}
	for _, f := range campaign.Findings {
		if acf.ByFinding[f] != want[f] {
			t.Errorf("%s: %d melts, want %d", f, acf.ByFinding[f], want[f])
		}
	}
	annealed := map[string]bool{}
	for _, p := range acf.Points {
		annealed[p.Code] = p.Annealed
		if p.CoolingRateKPerS != 1e6 {
			t.Errorf("%s: rate %g", p.Code, p.CoolingRateKPerS)
		}
	}
	if annealed["A-1"] || !annealed["A-1.a1"] || !annealed["A-1.a1.x1"] || annealed["A-3"] {
		t.Errorf("annealed flags %v", annealed)
	}
}

func TestWindow(t *testing.T) {
	raynor, ok := element.LookupScheme("raynor")
	if !ok {
		t.Fatal("no raynor scheme")
	}
	systems := campaign.Group([]meltbook.MeltRecord{
		melt("A-1", map[string]float64{"Al": 0.63, "Cu": 0.25, "Fe": 0.12}),
		melt("Z-1", map[string]float64{"Zn": 0.6, "Mg": 0.3, "Y": 0.1}),
		melt("C-1", map[string]float64{"Cu": 0.6, "Zn": 0.4}),
	})
	for _, c := range []struct {
		system    string
		low, high float64
	}{
		// Tsai, Inoue, Masumoto, J. Non-Cryst. Solids 117-118, 824 (1990): e/a 1.7-1.8.
		{"Al-Cu-Fe", 1.70, 1.80},
		// Zn-based quasicrystals at e/a 2.0-2.15, as analysis/descriptor cites.
		{"Zn-Mg-Y", 2.00, 2.15},
		{"Cu-Zn", 0, 0},
	} {
		for _, s := range systems {
			if s.Name != c.system {
				continue
			}
			w, _, why := s.Window(raynor)
			switch {
			case c.high == 0 && w != nil:
				t.Errorf("%s: window %v, want none", c.system, w)
			case c.high == 0 && why == "":
				t.Errorf("%s: no reason given for no window", c.system)
			case c.high > 0 && (w == nil || w.Low != c.low || w.High != c.high):
				t.Errorf("%s: window %v (%s), want %g-%g", c.system, w, why, c.low, c.high)
			}
		}
	}
}

func TestNext(t *testing.T) {
	raynor, _ := element.LookupScheme("raynor")
	ico := person(meltbook.Icosahedral, "")
	none := person(meltbook.Crystalline, "λ")
	spun := []meltbook.StepKind{meltbook.MeltSpin}
	records := []meltbook.MeltRecord{
		melt("A-1", map[string]float64{"Al": 0.62, "Cu": 0.255, "Fe": 0.125}, sample("A-1", "", spun, ico)),
		melt("A-2", map[string]float64{"Al": 0.63, "Cu": 0.25, "Fe": 0.12}, sample("A-2", "", spun, ico)),
		melt("A-3", map[string]float64{"Al": 0.60, "Cu": 0.30, "Fe": 0.10}, sample("A-3", "", spun, none)),
		melt("A-4", map[string]float64{"Al": 0.70, "Cu": 0.20, "Fe": 0.10}, sample("A-4", "", spun, none)),
	}
	opts := suggest.DefaultOptions()
	opts.Count = 3
	if _, _, err := campaign.Group(records[:2])[0].Next(raynor, opts); !errors.Is(err, campaign.ErrTooFew) {
		t.Errorf("two points: %v, want ErrTooFew", err)
	}
	res, win, err := campaign.Group(records)[0].Next(raynor, opts)
	if err != nil {
		t.Fatal(err)
	}
	if win == nil || len(res.Suggestions) != 3 {
		t.Fatalf("window %v, %d suggestions", win, len(res.Suggestions))
	}
	for _, s := range res.Suggestions {
		// e/a = Σ x·v with Al 3, Cu 1, Fe −2.66 (Raynor's Fe valence as commonly quoted).
		v := map[string]float64{"Al": 3, "Cu": 1, "Fe": -2.66}
		var ea float64
		for _, f := range s.Composition {
			ea += f.Fraction * v[f.Element]
		}
		if ea < 1.70-1e-9 || ea > 1.80+1e-9 {
			t.Errorf("%v: e/a %.4f outside 1.70-1.80", s.Composition, ea)
		}
	}
}

package plot_test

import (
	"testing"

	"meltbook"
	"meltbook/web/plot"
)

func TestClassesUseOkabeItoColoursAndDistinctShapes(t *testing.T) {
	// The eight colours of Okabe & Ito, "Color Universal Design" (2008).
	okabeIto := map[string]bool{
		"#E69F00": true, "#56B4E9": true, "#009E73": true, "#F0E442": true,
		"#0072B2": true, "#D55E00": true, "#CC79A7": true, "#000000": true,
	}
	colours := map[string]plot.Class{}
	shapes := map[plot.Shape]plot.Class{}
	for _, c := range plot.Classes {
		if !okabeIto[c.Colour()] {
			t.Errorf("%s uses %s, which is not an Okabe & Ito colour", c, c.Colour())
		}
		if o, dup := colours[c.Colour()]; dup {
			t.Errorf("%s and %s share colour %s", c, o, c.Colour())
		}
		if o, dup := shapes[c.Shape()]; dup {
			t.Errorf("%s and %s share shape %s", c, o, c.Shape())
		}
		colours[c.Colour()], shapes[c.Shape()] = c, c
		if back, ok := plot.ClassBySlug(c.Slug()); !ok || back != c {
			t.Errorf("ClassBySlug(%q) = %v, %v", c.Slug(), back, ok)
		}
	}
	if len(plot.Classes) != 6 {
		t.Errorf("%d classes, want 6", len(plot.Classes))
	}
}

func TestClassOf(t *testing.T) {
	person := func(k meltbook.PhaseKind) meltbook.Outcome {
		return meltbook.Outcome{Kind: k, Source: meltbook.ByPerson, Status: meltbook.Confirmed}
	}
	auto := func(k meltbook.PhaseKind, s meltbook.ProposalStatus) meltbook.Outcome {
		return meltbook.Outcome{Kind: k, Source: meltbook.ByAutomatic, Status: s}
	}
	// Expected classes follow the rule stated on ClassOf.
	for _, tc := range []struct {
		name     string
		outcomes []meltbook.Outcome
		want     plot.Class
	}{
		{"nothing recorded", nil, plot.ClassUndecided},
		{"icosahedral beside crystalline", []meltbook.Outcome{person(meltbook.Crystalline), person(meltbook.Icosahedral)}, plot.ClassIcosahedral},
		{"crystalline only", []meltbook.Outcome{person(meltbook.Crystalline), person(meltbook.Crystalline)}, plot.ClassCrystalline},
		{"amorphous with crystalline", []meltbook.Outcome{person(meltbook.Crystalline), person(meltbook.Amorphous)}, plot.ClassAmorphous},
		{"approximant", []meltbook.Outcome{person(meltbook.Approximant)}, plot.ClassApproximant},
		{"decagonal over approximant", []meltbook.Outcome{person(meltbook.Approximant), person(meltbook.Decagonal)}, plot.ClassDecagonal},
		{"open proposal does not count", []meltbook.Outcome{auto(meltbook.Icosahedral, meltbook.Proposed)}, plot.ClassUndecided},
		{"rejected proposal does not count", []meltbook.Outcome{auto(meltbook.Icosahedral, meltbook.Rejected), person(meltbook.Crystalline)}, plot.ClassCrystalline},
		{"confirmed proposal counts", []meltbook.Outcome{auto(meltbook.Icosahedral, meltbook.Confirmed)}, plot.ClassIcosahedral},
	} {
		if got := plot.ClassOf(tc.outcomes); got != tc.want {
			t.Errorf("%s: %s, want %s", tc.name, got, tc.want)
		}
	}
}

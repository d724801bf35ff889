package campaign_test

import (
	"fmt"

	"meltbook"
	"meltbook/analysis/campaign"
)

func ExampleGroup() {
	ico := meltbook.Outcome{Kind: meltbook.Icosahedral, Source: meltbook.ByPerson}
	beta := meltbook.Outcome{Kind: meltbook.Crystalline, Name: "β", Source: meltbook.ByPerson}
	records := []meltbook.MeltRecord{
		{Melt: meltbook.Melt{Code: "A-1", Nominal: []meltbook.ElementFraction{{Element: "Al", Fraction: 0.63}, {Element: "Cu", Fraction: 0.25}, {Element: "Fe", Fraction: 0.12}}},
			Samples: []meltbook.SampleRecord{{Sample: meltbook.Sample{Code: "A-1"}, Outcomes: []meltbook.Outcome{ico}}}},
		{Melt: meltbook.Melt{Code: "A-2", Nominal: []meltbook.ElementFraction{{Element: "Cu", Fraction: 0.30}, {Element: "Al", Fraction: 0.60}, {Element: "Fe", Fraction: 0.10}}},
			Samples: []meltbook.SampleRecord{{Sample: meltbook.Sample{Code: "A-2"}, Outcomes: []meltbook.Outcome{beta}}}},
	}
	for _, s := range campaign.Group(records) {
		fmt.Printf("%s: %d melts, %d icosahedral, %d crystalline only\n", s.Name, len(s.Melts),
			s.ByFinding[campaign.FoundIcosahedral], s.ByFinding[campaign.FoundCrystalline])
		for _, p := range s.Points {
			fmt.Println(p.Code, p.Outcome)
		}
	}
	// Output:
	// Al-Cu-Fe: 2 melts, 1 icosahedral, 1 crystalline only
	// A-1 yes
	// A-2 no
}

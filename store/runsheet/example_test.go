package runsheet_test

import (
	"fmt"
	"strings"

	"meltbook/store/runsheet"
)

func ExampleRead() {
	sheet := "Code;Nominal;Mass (g);Wheel speed (m/s);Thickness (um);Date;Outcome\r\n" +
		"RB-1;Al63Cu25Fe12;10;30;35,5;14/03/2026;i-phase 80% + λ 20%\r\n" +
		"RB-2;Al62Cu25,5Fe12,5;10;30 ft/s;33;03/04/2026;QC\r\n"
	sh, err := runsheet.Read(strings.NewReader(sheet), runsheet.Options{Name: "runs.csv", Operator: "Ines Varga"})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("dates:", sh.DatesWhy)
	for _, r := range sh.Rows {
		if r.OK() {
			fmt.Println("taken:", r.Melt.Code, r.Melt.CreatedAt.Format("2006-01-02"), runsheet.OutcomeText(r.Outcomes[0]))
			continue
		}
		for _, p := range r.Problems {
			fmt.Println("refused:", p)
		}
	}
	// Output:
	// dates: day/month, as the dates on line 2 show
	// taken: RB-1 2026-03-14 icosahedral 80%
	// refused: runs.csv line 3, column "Wheel speed (m/s)": "30 ft/s": unknown unit "ft/s" for a speed; use m/s (or a rotation rate in rpm, with the wheel diameter)
}

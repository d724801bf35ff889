package runform_test

import (
	"fmt"
	"time"

	"meltbook/store/runform"
)

// A run typed as a web form or a run file would give it: the values keep
// the unit typed and are stored in SI.
func ExampleBuild() {
	in := runform.Input{Missing: func(key string) string { return "field " + key }}
	in.Add("prefix", "QX", "field prefix")
	in.Add("composition", "Al63Cu25Fe12", "field composition")
	in.Add("mass", "10 g", "field mass")
	in.Add("wheel-speed", "30 m/s", "field wheel-speed")
	in.Add("melt-temperature", "1250 C", "field melt-temperature")
	in.Add("thickness", "30 um", "field thickness")
	run, err := runform.Build(in, "adaeze", time.UTC)
	if err != nil {
		fmt.Println(err)
		return
	}
	m := run.New.Melt
	fmt.Printf("code to generate from %s; %s, %g g, by %s\n", run.Prefix, m.CompositionEntered, m.TargetMassGrams, m.Operator)
	for _, st := range run.New.Steps {
		for _, p := range st.Params {
			if p.Unit != "" && p.Name != "cooling-rate" {
				// 1250 °C = 1523.15 K; 30 µm = 3e-05 m (SI definitions).
				fmt.Printf("%s %s: %g (typed in %s)\n", st.Kind, p.Name, p.SI, p.Unit)
			}
		}
	}
	fmt.Println("cooling rate estimated:", run.Estimate != nil)

	in.Add("gap", "-0.3 mm", "field gap")
	_, err = runform.Build(in, "adaeze", time.UTC)
	fmt.Println(err)
	// Output:
	// code to generate from QX; Al63Cu25Fe12, 10 g, by adaeze
	// melt-spin wheel-speed: 30 (typed in m/s)
	// melt-spin melt-temperature: 1523.15 (typed in °C)
	// melt-spin thickness: 3e-05 (typed in µm)
	// cooling rate estimated: true
	// field gap: "-0.3 mm": a length cannot be negative
}

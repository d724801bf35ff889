package peaks_test

import (
	"encoding/json"
	"fmt"
	"math"
	"strings"

	"meltbook/analysis/peaks"
	"meltbook/analysis/radiation"
	"meltbook/analysis/scanfile"
)

// ExampleFind reads a small monochromated scan and finds its one peak.
func ExampleFind() {
	// An invented scan: 0.02° steps around a Gaussian line at 44.50°
	// (FWHM 0.12°, area 60 counts·degrees) on a level of 100 counts. By
	// hand, d = 1.5405929 Å / (2 sin 22.25°) = 1.5405929/0.757298 = 2.0343 Å.
	var b strings.Builder
	for i := 0; i < 200; i++ {
		x := 42.5 + 0.02*float64(i)
		u := (x - 44.5) / 0.12
		y := 100 + 60/0.12*0.9394372786996513*math.Exp(-4*math.Ln2*u*u)
		fmt.Fprintf(&b, "%.2f %.0f\n", x, y)
	}
	scan, err := scanfile.Read("example.xy", strings.NewReader(b.String()))
	if err != nil {
		panic(err)
	}
	rad, _ := radiation.ParseRadiation("Cu:mono")
	res, err := peaks.Find(scan, rad, peaks.Options{})
	if err != nil {
		panic(err)
	}
	for _, p := range res.Peaks {
		fmt.Printf("2θ %.2f°  d %.4f Å  FWHM %.2f°  area %.0f\n", p.TwoThetaDeg, p.DAngstrom, p.FWHMDeg, p.Area)
	}
	// Output:
	// 2θ 44.50°  d 2.0343 Å  FWHM 0.12°  area 60
}

// ExampleResult_Report shows the JSON a command line prints.
func ExampleResult_Report() {
	res := peaks.Result{
		Radiation: radiation.Radiation{Anode: "Cu", Kalpha1Angstrom: 1.5405929, Kalpha2Angstrom: 1.5444274,
			Kalpha2Ratio: 0.5, Kalpha2: radiation.Kalpha2Present},
		StepDeg:    0.02,
		Background: make([]float64, 3),
		Peaks: []peaks.Peak{{TwoThetaDeg: 44.5, TwoThetaSUDeg: 0.001, DAngstrom: 2.0344, DSUAngstrom: 0.00004,
			Height: 470, HeightSU: 9, Area: 60, AreaSU: 1.2, FWHMDeg: 0.12, FWHMSUDeg: 0.002,
			Eta: 0, EtaSU: math.NaN(), Significance: 41}},
	}
	out, _ := json.Marshal(res.Report())
	fmt.Println(string(out))
	// Output:
	// {"radiation":"Cu","wavelength_angstrom":1.5405929,"step_deg":0.02,"points":3,"peaks":[{"two_theta_deg":44.5,"two_theta_su_deg":0.001,"d_angstrom":2.0344,"d_su_angstrom":4e-05,"height":470,"height_su":9,"area":60,"area_su":1.2,"fwhm_deg":0.12,"fwhm_su_deg":0.002,"eta":0,"eta_su":null,"significance":41}]}
}

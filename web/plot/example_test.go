package plot_test

import (
	"fmt"

	"meltbook"
	"meltbook/web/plot"
)

func ExampleTriangle_Project() {
	al, _ := plot.ParseCorner("Al")
	cu, _ := plot.ParseCorner("Cu")
	feSi, _ := plot.ParseCorner("Fe+Si")
	tri, _ := plot.NewTriangle(al, cu, feSi)
	p, _ := tri.Project([]meltbook.ElementFraction{
		{Element: "Al", Fraction: 0.60}, {Element: "Cu", Fraction: 0.24},
		{Element: "Fe", Fraction: 0.10}, {Element: "Si", Fraction: 0.04},
		{Element: "B", Fraction: 0.02},
	})
	q := p.Point.Cartesian()
	fmt.Printf("%s: %.4f %.4f %.4f, %.0f%% ignored, at (%.4f, %.4f)\n",
		tri.Labels(), p.Point[0], p.Point[1], p.Point[2], 100*p.Ignored, q.X, q.Y)
	// Output: [Al Cu (Fe+Si)]: 0.6122 0.2449 0.1429, 2% ignored, at (0.3163, 0.1237)
}

func ExampleGrid_Isolines() {
	// e/a over Al-Cu-Fe with valences 3, 1 and −2.66.
	g := plot.SampleField(40, plot.ElectronField([3]float64{3, 1, -2.66}))
	for _, line := range g.Isolines(1.75) {
		a, b := line[0], line[len(line)-1]
		fmt.Printf("from Al %.4f Cu %.4f Fe %.4f to Al %.4f Cu %.4f Fe %.4f\n", a[0], a[1], a[2], b[0], b[1], b[2])
	}
	// Output: from Al 0.7792 Cu 0.0000 Fe 0.2208 to Al 0.3750 Cu 0.6250 Fe 0.0000
}

package element_test

import (
	"fmt"
	"strings"

	"meltbook/analysis/element"
)

func ExampleBySymbol() {
	fe, _ := element.BySymbol("Fe")
	fmt.Printf("%s (%s): %.3f g/mol, χ = %.2f, r(CN12) = %.3f Å\n",
		fe.Name, fe.Symbol, fe.AtomicWeight, fe.Electronegativity, fe.MetallicRadiusCN12)
	cd, _ := element.BySymbol("Cd")
	fmt.Println("Cd hazards:", cd.Hazards)
	// Output:
	// iron (Fe): 55.845 g/mol, χ = 1.83, r(CN12) = 1.274 Å
	// Cd hazards: toxic
}

// e/a of Al65Cu20Fe15 under Raynor's valences.
func ExampleLookupScheme() {
	raynor, _ := element.LookupScheme("raynor")
	alloy := []struct {
		symbol   string
		fraction float64
	}{{"Al", 0.65}, {"Cu", 0.20}, {"Fe", 0.15}}
	var ea float64
	for _, p := range alloy {
		v, err := raynor.Require(p.symbol)
		if err != nil {
			fmt.Println(err)
			return
		}
		ea += p.fraction * v
	}
	fmt.Printf("e/a = %.3f\n", ea)

	group, _ := element.LookupScheme("group")
	_, err := group.Require("Fe")
	fmt.Println(err)
	// Output:
	// e/a = 1.751
	// valence scheme "group" has no valence for Fe: Fe is a transition metal; use scheme "raynor", or a scheme file that sets it
}

// A scheme file sets Ti and Zr for Ti-Zr-Ni work on top of raynor; the
// values here only illustrate the format.
func ExampleReadScheme() {
	file := `# Ti-Zr-Ni: early transition metals counted with their group valence
name tizrni
base raynor
Ti 4   group valence
Zr 4   group valence
`
	s, err := element.ReadScheme(strings.NewReader(file), "tizrni.txt")
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, sym := range []string{"Ti", "Zr", "Ni"} {
		v, _ := s.ValenceOf(sym)
		fmt.Printf("%s %g\n", sym, v)
	}

	_, err = element.ReadScheme(strings.NewReader("base raynor\nZr four\n"), "bad.txt")
	fmt.Println(err)
	// Output:
	// Ti 4
	// Zr 4
	// Ni -0.61
	// scheme file bad.txt: line 2, field 2: valence "four" is not a number
}

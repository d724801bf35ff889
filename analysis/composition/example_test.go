package composition_test

import (
	"errors"
	"fmt"

	"meltbook/analysis/composition"
)

func ExampleParse() {
	p, err := composition.Parse("Al63Cu25Fe12")
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, part := range p.Atomic {
		fmt.Printf("%s %.2f\n", part.Element, part.Fraction)
	}
	fmt.Println(p.Notation, p.Scale, p.Total)
	// Output:
	// Al 0.63
	// Cu 0.25
	// Fe 0.12
	// formula percent 100
}

func ExampleParse_balance() {
	p, _ := composition.Parse("Al-24.5Cu-12.3Fe")
	fmt.Println(p.Atomic.Format(2), p.Notation)
	// Output: Al63.2Cu24.5Fe12.3 balance
}

func ExampleParse_group() {
	// 99 parts of Al70Pd20Mn10 and 1 part of B.
	p, _ := composition.Parse("(Al0.7Pd0.2Mn0.1)99B1")
	fmt.Println(p.Atomic.Format(2))
	// Output: Al69.3Pd19.8Mn9.9B1
}

func ExampleParse_weight() {
	p, _ := composition.Parse("Al-30Cu-10Fe wt%")
	fmt.Println(p.Basis, p.Written.Format(1), "->", p.Atomic.Format(1), "at%")
	// Output: weight Al60Cu30Fe10 -> Al77.4Cu16.4Fe6.2 at%
}

func ExampleParse_warnings() {
	p, _ := composition.Parse("Al63Cu25Fe13")
	fmt.Println(p.Atomic.Format(2))
	fmt.Println(p.Warnings)
	// Output:
	// Al62.38Cu24.75Fe12.87
	// [the percentages total 101 rather than 100; normalised]
}

func ExampleParseError() {
	_, err := composition.Parse("Al-25CU-12Fe")
	var pe *composition.ParseError
	if errors.As(err, &pe) {
		fmt.Println(pe.Pos)
		fmt.Println(err)
	}
	// Output:
	// 5
	// composition "Al-25CU-12Fe" at position 5: CU reads as C then U; symbols are case-sensitive (did you mean Cu?)
}

func ExampleComposition_FormatBalance() {
	p, _ := composition.Parse("Zr10Cu60Al30")
	fmt.Println(p.Atomic.FormatBalance(1))
	// Output: Cu-10Zr-30Al
}

func ExampleComposition_FormatWeight() {
	p, _ := composition.Parse("Al63Cu25Fe12")
	s, _ := p.Atomic.FormatWeight(2)
	fmt.Println(s)
	// Output: Al42.94Cu40.13Fe16.93 wt%
}

func ExampleDistance() {
	a, _ := composition.Parse("Al63Cu25Fe12")
	b, _ := composition.Parse("Al62Cu26Fe12")
	fmt.Printf("%.4f\n", composition.Distance(a.Atomic, b.Atomic))
	// Output: 0.0141
}

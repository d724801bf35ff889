package element_test

import (
	"strings"
	"testing"

	"meltbook/analysis/element"
)

var benchSink float64

// BenchmarkBySymbol looks up the elements of a typical quaternary, as the
// composition and descriptor code does per composition.
func BenchmarkBySymbol(b *testing.B) {
	symbols := []string{"Al", "Cu", "Fe", "Si"}
	for i := 0; i < b.N; i++ {
		for _, s := range symbols {
			e, _ := element.BySymbol(s)
			benchSink += e.AtomicWeight
		}
	}
}

// BenchmarkLookupScheme measures handing out a copy of the raynor scheme;
// every call clones it so that callers may change their copy.
func BenchmarkLookupScheme(b *testing.B) {
	for i := 0; i < b.N; i++ {
		s, _ := element.LookupScheme("raynor")
		benchSink += s.Valence["Fe"]
	}
}

func BenchmarkReadScheme(b *testing.B) {
	for i := 0; i < b.N; i++ {
		s, err := element.ReadScheme(strings.NewReader(alPdReFile), "alpdre.txt")
		if err != nil {
			b.Fatal(err)
		}
		benchSink += s.Valence["Pd"]
	}
}

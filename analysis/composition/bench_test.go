package composition_test

import (
	"testing"

	"meltbook/analysis/composition"
)

// BenchmarkParse covers the three common shapes. Target (see the notes):
// about 1 µs per parse, so that parsing plus descriptors stays under 5 µs.
func BenchmarkParse(b *testing.B) {
	for _, in := range []string{"Al63Cu25Fe12", "Al-25Cu-12Fe", "(Al0.7Pd0.2Mn0.1)99B1", "Al-30Cu-10Fe wt%"} {
		b.Run(in, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := composition.Parse(in); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkFormat(b *testing.B) {
	c := mustParse(b, "(Al0.7Pd0.2Mn0.1)99B1")
	b.ReportAllocs()
	for b.Loop() {
		_ = c.Format(2)
	}
}

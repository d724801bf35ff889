package intake_test

import (
	"fmt"
	"testing"

	"meltbook/store/intake"
)

// BenchmarkAdd adds an fcc Al scan of 4001 points to a notebook: read,
// peak search, indexing with the random-list calibration already in the
// process, weighing, and the transaction that stores it. Each iteration
// adds another file (other noise), so that none is a duplicate.
func BenchmarkAdd(b *testing.B) {
	st := mustOpen(b)
	addMelt(b, st, "QA-0001", "Al", 1.0)
	if _, err := intake.Add(ctx, st, "Ada Quill", intake.File{Sample: "QA-0001", Name: "warm.xy", Data: pattern(fccAlLines(), 5000, nil, 0)}, intake.Options{Radiation: "Cu"}); err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		b.StopTimer()
		data := pattern(fccAlLines(), 5000, nil, uint64(i+1))
		b.StartTimer()
		if _, err := intake.Add(ctx, st, "Ada Quill", intake.File{Sample: "QA-0001", Name: fmt.Sprintf("a%d.xy", i), Data: data}, intake.Options{Radiation: "Cu"}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkAddIcosahedral is BenchmarkAdd for an icosahedral pattern on a
// sample whose notebook holds neighbours and electron diffraction.
func BenchmarkAddIcosahedral(b *testing.B) {
	st := mustOpen(b)
	addMelt(b, st, "QI-0001", "Al", 0.65, "Cu", 0.20, "Fe", 0.15)
	if _, err := intake.Add(ctx, st, "Ada Quill", intake.File{Sample: "QI-0001", Name: "warm.xy", Data: pattern(icosahedralFLines(4.46), 4000, nil, 0)}, intake.Options{Radiation: "Cu"}); err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		b.StopTimer()
		data := pattern(icosahedralFLines(4.46), 4000, nil, uint64(i+1))
		b.StartTimer()
		if _, err := intake.Add(ctx, st, "Ada Quill", intake.File{Sample: "QI-0001", Name: fmt.Sprintf("i%d.xy", i), Data: data}, intake.Options{Radiation: "Cu"}); err != nil {
			b.Fatal(err)
		}
	}
}

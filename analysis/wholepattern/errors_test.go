package wholepattern_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"meltbook"
	"meltbook/analysis/crystal"
	"meltbook/analysis/radiation"
	"meltbook/analysis/wholepattern"
)

// TestRefineRejects checks that bad input is refused with an invalid-kind
// error naming the field and, where there is one, the index at fault.
func TestRefineRejects(t *testing.T) {
	n := 200
	x, y := make([]float64, n), make([]float64, n)
	for i := range x {
		x[i] = 30 + 0.05*float64(i)
		y[i] = 100
	}
	al := wholepattern.Phase{Name: "Al", System: crystal.Cubic, Cell: crystal.Cell{A: 4.0495},
		Reflections: []wholepattern.Reflection{{HKL: [3]int{1, 1, 1}, Multiplicity: 8}, {HKL: [3]int{2, 0, 0}, Multiplicity: 6}}}
	rad := cuDoublet(t)
	with := func(f func(x, y []float64, ph *wholepattern.Phase, rad *radiation.Radiation, opt *wholepattern.Options)) func() ([]float64, []float64, []wholepattern.Phase, radiation.Radiation, wholepattern.Options) {
		return func() ([]float64, []float64, []wholepattern.Phase, radiation.Radiation, wholepattern.Options) {
			xx, yy := append([]float64(nil), x...), append([]float64(nil), y...)
			ph := al
			ph.Reflections = append([]wholepattern.Reflection(nil), al.Reflections...)
			r := rad
			var opt wholepattern.Options
			f(xx, yy, &ph, &r, &opt)
			return xx, yy, []wholepattern.Phase{ph}, r, opt
		}
	}
	for _, c := range []struct {
		name, field string
		input       func() ([]float64, []float64, []wholepattern.Phase, radiation.Radiation, wholepattern.Options)
	}{
		{"no points", "two theta", func() ([]float64, []float64, []wholepattern.Phase, radiation.Radiation, wholepattern.Options) {
			return nil, nil, []wholepattern.Phase{al}, rad, wholepattern.Options{}
		}},
		{"unequal lengths", "counts", func() ([]float64, []float64, []wholepattern.Phase, radiation.Radiation, wholepattern.Options) {
			return x, y[:n-1], []wholepattern.Phase{al}, rad, wholepattern.Options{}
		}},
		{"NaN angle", "two theta[7]", with(func(x, y []float64, _ *wholepattern.Phase, _ *radiation.Radiation, _ *wholepattern.Options) {
			x[7] = math.NaN()
		})},
		{"angle out of range", "two theta[0]", with(func(x, y []float64, _ *wholepattern.Phase, _ *radiation.Radiation, _ *wholepattern.Options) {
			x[0] = -1
		})},
		{"unsorted angles", "two theta[12]", with(func(x, y []float64, _ *wholepattern.Phase, _ *radiation.Radiation, _ *wholepattern.Options) {
			x[12] = x[11]
		})},
		{"infinite count", "counts[3]", with(func(x, y []float64, _ *wholepattern.Phase, _ *radiation.Radiation, _ *wholepattern.Options) {
			y[3] = math.Inf(1)
		})},
		{"no positive count", "counts", with(func(x, y []float64, _ *wholepattern.Phase, _ *radiation.Radiation, _ *wholepattern.Options) {
			clear(y)
		})},
		{"no phases", "phases", func() ([]float64, []float64, []wholepattern.Phase, radiation.Radiation, wholepattern.Options) {
			return x, y, nil, rad, wholepattern.Options{}
		}},
		{"zero multiplicity", "phases[0].reflections[1].multiplicity", with(func(_, _ []float64, ph *wholepattern.Phase, _ *radiation.Radiation, _ *wholepattern.Options) {
			ph.Reflections[1].Multiplicity = 0
		})},
		{"negative multiplicity", "phases[0].reflections[0].multiplicity", with(func(_, _ []float64, ph *wholepattern.Phase, _ *radiation.Radiation, _ *wholepattern.Options) {
			ph.Reflections[0].Multiplicity = -2
		})},
		{"000 reflection", "phases[0].reflections[1].hkl", with(func(_, _ []float64, ph *wholepattern.Phase, _ *radiation.Radiation, _ *wholepattern.Options) {
			ph.Reflections[1].HKL = [3]int{}
		})},
		{"no reflections", "phases[0].reflections", with(func(_, _ []float64, ph *wholepattern.Phase, _ *radiation.Radiation, _ *wholepattern.Options) {
			ph.Reflections = nil
		})},
		{"unknown system", "phases[0].system", with(func(_, _ []float64, ph *wholepattern.Phase, _ *radiation.Radiation, _ *wholepattern.Options) {
			ph.System = "icosahedral"
		})},
		{"bad cell", "phases[0].cell", with(func(_, _ []float64, ph *wholepattern.Phase, _ *radiation.Radiation, _ *wholepattern.Options) {
			ph.Cell.A = -4
		})},
		{"monoclinic without angle", "phases[0].cell", with(func(_, _ []float64, ph *wholepattern.Phase, _ *radiation.Radiation, _ *wholepattern.Options) {
			ph.System, ph.Cell = crystal.Monoclinic, crystal.Cell{A: 5, B: 6, C: 7}
		})},
		{"bad radiation", "radiation", with(func(_, _ []float64, _ *wholepattern.Phase, r *radiation.Radiation, _ *wholepattern.Options) {
			r.Kalpha1Angstrom = 0
		})},
		{"empty range", "options.range", with(func(_, _ []float64, _ *wholepattern.Phase, _ *radiation.Radiation, o *wholepattern.Options) {
			o.MinTwoThetaDeg, o.MaxTwoThetaDeg = 40, 35
		})},
		{"range too short", "options.range", with(func(_, _ []float64, _ *wholepattern.Phase, _ *radiation.Radiation, o *wholepattern.Options) {
			o.MinTwoThetaDeg, o.MaxTwoThetaDeg = 30, 30.5
		})},
		{"background terms", "options.background terms", with(func(_, _ []float64, _ *wholepattern.Phase, _ *radiation.Radiation, o *wholepattern.Options) {
			o.BackgroundTerms = 40
		})},
		{"negative cycles", "options.max cycles", with(func(_, _ []float64, _ *wholepattern.Phase, _ *radiation.Radiation, o *wholepattern.Options) {
			o.MaxCycles = -1
		})},
		{"zero shift", "options.start zero shift", with(func(_, _ []float64, _ *wholepattern.Phase, _ *radiation.Radiation, o *wholepattern.Options) {
			o.StartZeroShiftDeg = math.NaN()
		})},
		{"start FWHM", "options.start FWHM", with(func(_, _ []float64, _ *wholepattern.Phase, _ *radiation.Radiation, o *wholepattern.Options) {
			o.StartFWHMDeg = -0.1
		})},
		{"start error", "options.start error fraction", with(func(_, _ []float64, _ *wholepattern.Phase, _ *radiation.Radiation, o *wholepattern.Options) {
			o.StartErrorFraction = 0.2
		})},
	} {
		t.Run(c.name, func(t *testing.T) {
			x, y, ph, r, opt := c.input()
			_, err := wholepattern.Refine(x, y, r, ph, opt)
			if err == nil {
				t.Fatal("no error")
			}
			var me *meltbook.Error
			if !errors.As(err, &me) || me.Kind != meltbook.Invalid {
				t.Fatalf("error %v is not an invalid-input *meltbook.Error", err)
			}
			if me.Field != c.field {
				t.Errorf("field %q, want %q (error: %v)", me.Field, c.field, err)
			}
			if strings.TrimSpace(me.Message) == "" {
				t.Error("empty message")
			}
		})
	}
}

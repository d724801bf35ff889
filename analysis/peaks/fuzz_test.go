package peaks_test

import (
	"math"
	"testing"
	"time"

	"meltbook/analysis/peaks"
	"meltbook/analysis/radiation"
	"meltbook/analysis/scanfile"
)

// FuzzFind feeds arbitrary intensities (two bytes a point, scaled) to
// Find: it must not panic, and every peak it reports must lie inside the
// scan with finite, positive area and width.
func FuzzFind(f *testing.F) {
	f.Add([]byte("\x00\x10\x00\x10\x00\x11\x00\x30\x01\x00\x00\x30\x00\x10\x00\x10\x00\x10\x00\x10\x00\x10\x00\x10\x00\x10\x00\x10\x00\x10\x00\x10\x00\x10\x00\x10\x00\x10\x00\x10\x00\x10"), false)
	f.Add(make([]byte, 80), true)
	f.Fuzz(func(t *testing.T, data []byte, doublet bool) {
		n := len(data) / 2
		if n < scanfile.MinPoints {
			return
		}
		s := scanfile.Scan{TwoThetaDeg: make([]float64, n), Counts: make([]float64, n)}
		for i := 0; i < n; i++ {
			s.TwoThetaDeg[i] = 20 + 0.05*float64(i)
			s.Counts[i] = float64(int(data[2*i])<<8 | int(data[2*i+1]))
		}
		state := radiation.Kalpha2Absent
		if doublet {
			state = radiation.Kalpha2Present
		}
		rad, _ := radiation.FromAnode("Cu", state)
		start := time.Now()
		res, err := peaks.Find(s, rad, peaks.Options{})
		if d := time.Since(start); d > 2*time.Second {
			t.Fatalf("Find took %v on %d points", d, n)
		}
		if err != nil {
			t.Fatalf("Find refused a valid scan: %v", err)
		}
		lo, hi := s.TwoThetaDeg[0], s.TwoThetaDeg[n-1]
		for _, p := range res.Peaks {
			if !(p.TwoThetaDeg > lo && p.TwoThetaDeg < hi) || !(p.Area > 0) || !(p.FWHMDeg > 0) || math.IsInf(p.Area, 0) || math.IsNaN(p.DAngstrom) {
				t.Fatalf("bad peak %+v", p)
			}
		}
		for _, v := range res.Profile {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("profile holds %v", v)
			}
		}
	})
}

package seed_test

import (
	"bytes"
	"math"
	"testing"

	"meltbook"
	"meltbook/analysis/scanfile"
	"meltbook/seed"
)

// outcomesOf maps every sample code of a notebook to its outcomes.
func outcomesOf(nb *seed.Notebook) map[string][]meltbook.Outcome {
	out := map[string][]meltbook.Outcome{}
	for _, r := range nb.Runs {
		out[r.Melt.Code] = r.Outcomes
		for _, d := range r.Derived {
			out[d.Sample.Code] = d.Outcomes
		}
	}
	return out
}

func TestScansAreRepeatableAndReadable(t *testing.T) {
	nb := generate(t, 1)
	a, err := nb.Scans(1)
	if err != nil {
		t.Fatal(err)
	}
	b, _ := nb.Scans(1)
	c, _ := nb.Scans(2)
	if len(a) < 30 || len(a) > 60 {
		t.Errorf("%d scans; want 30-60", len(a))
	}
	if len(a) != len(b) {
		t.Fatalf("%d and %d scans for one seed", len(a), len(b))
	}
	differ := false
	outcomes := outcomesOf(nb)
	for i := range a {
		if a[i].Sample != b[i].Sample || !bytes.Equal(a[i].Data, b[i].Data) {
			t.Fatalf("scan %d differs between two calls with one seed", i)
		}
		differ = differ || i >= len(c) || a[i].Sample != c[i].Sample || !bytes.Equal(a[i].Data, c[i].Data)
		os := outcomes[a[i].Sample]
		if len(os) == 0 {
			t.Errorf("%s has a scan but no outcome", a[i].Sample)
		}
		for _, o := range os {
			if o.Kind == meltbook.Decagonal {
				t.Errorf("%s has a decagonal phase, which the demo draws no pattern for", a[i].Sample)
			}
		}
		s, err := scanfile.Read(a[i].FileName, bytes.NewReader(a[i].Data))
		if err != nil {
			t.Fatalf("%s does not read: %v", a[i].FileName, err)
		}
		// 15° to 90° in steps of 0.02°.
		if s.Len() != 3751 || s.TwoThetaDeg[0] != 15 || s.TwoThetaDeg[s.Len()-1] != 90 {
			t.Errorf("%s: %d points, %g-%g°", a[i].FileName, s.Len(), s.TwoThetaDeg[0], s.TwoThetaDeg[s.Len()-1])
		}
		if a[i].MeasuredAt.IsZero() || a[i].Operator == "" {
			t.Errorf("%s has no date or operator", a[i].FileName)
		}
	}
	if !differ {
		t.Error("seeds 1 and 2 gave the same scans")
	}
}

// A sample the lab found to be fcc Al alone shows the 111 and 200 lines of
// a = 4.0495 Å (from memory: handbook value) at 2θ = 2 asin(λ√s/2a) for Cu
// Kα1 (Hölzer et al. 1997): 38.47° and 44.72° (worked by hand).
func TestAluminiumScanShowsItsLines(t *testing.T) {
	for _, sd := range seeds {
		nb := generate(t, sd)
		scans, err := nb.Scans(sd)
		if err != nil {
			t.Fatal(err)
		}
		outcomes := outcomesOf(nb)
		for _, sc := range scans {
			os := outcomes[sc.Sample]
			if len(os) != 1 || os[0].Name != "Al (fcc)" {
				continue
			}
			s, err := scanfile.Read(sc.FileName, bytes.NewReader(sc.Data))
			if err != nil {
				t.Fatal(err)
			}
			at := func(deg float64) float64 { return s.Counts[int(math.Round((deg-15)/0.02))] }
			for _, line := range []float64{38.47, 44.72} {
				if at(line) < 5*at(line-1.5) {
					t.Errorf("%s: %.0f counts at %.2f° against %.0f at %.2f°; want a line", sc.FileName, at(line), line, at(line-1.5), line-1.5)
				}
			}
			return
		}
	}
	t.Skip("no sample of fcc Al alone among the scans of the pooled seeds")
}

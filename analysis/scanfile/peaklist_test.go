package scanfile_test

import (
	"errors"
	"strings"
	"testing"

	"meltbook/analysis/scanfile"
)

func TestReadPeakList(t *testing.T) {
	in := "# peaks of a ribbon\n2theta  I\n44.72 100\n38.47 62\n\n65.10 31 # weak\n"
	got, err := scanfile.ReadPeakList("p.txt", strings.NewReader(in))
	if err != nil {
		t.Fatal(err)
	}
	// Sorted by 2θ, intensities as written, lines as in the text above.
	want := []scanfile.PeakLine{{38.47, 62, 4}, {44.72, 100, 3}, {65.10, 31, 6}}
	if len(got) != len(want) {
		t.Fatalf("got %d peaks, want %d", len(got), len(want))
	}
	for i := range want {
		if got[i] != want[i] {
			t.Errorf("peak %d = %+v, want %+v", i, got[i], want[i])
		}
	}
	pos, err := scanfile.ReadPeakList("p.csv", strings.NewReader("2theta\n20,5\n30;4\n"))
	if err == nil {
		t.Errorf("mixed separators accepted: %+v", pos)
	}
	only, err := scanfile.ReadPeakList("p.txt", strings.NewReader("20.1\n30.2\n40.3\n"))
	if err != nil || only[0].Intensity != 100 {
		t.Errorf("positions only: %+v, %v", only, err)
	}
	semi, err := scanfile.ReadPeakList("p.csv", strings.NewReader("20,1;5\n30,2;4\n40,3;3\n"))
	if err != nil || semi[0].TwoThetaDeg != 20.1 {
		t.Errorf("decimal commas with semicolons: %+v, %v", semi, err)
	}
}

func TestReadPeakListErrors(t *testing.T) {
	tests := []struct {
		in   string
		kind error
		want string
	}{
		{"20 5\n30 4\n", scanfile.ErrTooFewPoints, "p.txt: 2 peaks"},
		{"20 5\n30 -4\n40 1\n", scanfile.ErrOutOfRange, "p.txt:2:4"},
		{"20 5\n200 4\n40 1\n", scanfile.ErrOutOfRange, "p.txt:2:1"},
		{"20 5\n30 4\n20 1\n", scanfile.ErrNotIncreasing, "p.txt:3"},
		{"20 5\n30 4 1\n40 1\n", scanfile.ErrColumns, "p.txt:2"},
		{"20 5\n30 NaN\n40 1\n", scanfile.ErrNotFinite, "p.txt:2:4"},
		{"20 5 3\n", scanfile.ErrColumns, "p.txt:1"},
	}
	for _, tc := range tests {
		_, err := scanfile.ReadPeakList("p.txt", strings.NewReader(tc.in))
		if !errors.Is(err, tc.kind) {
			t.Errorf("%q: error %v, want kind %v", tc.in, err, tc.kind)
			continue
		}
		if !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%q: error %q does not name %q", tc.in, err, tc.want)
		}
	}
}

func FuzzReadPeakList(f *testing.F) {
	f.Add("44.72 100\n38.47 62\n65.10 31\n")
	f.Add("2theta;I\n20,1;5\n30,2;4\n40,3;3\n")
	f.Add("20\n30\n40\n")
	f.Fuzz(func(t *testing.T, in string) {
		ps, err := scanfile.ReadPeakList("f.txt", strings.NewReader(in))
		if err != nil {
			var e *scanfile.Error
			if !errors.As(err, &e) || e.File != "f.txt" {
				t.Fatalf("error without file: %v", err)
			}
			return
		}
		if len(ps) < scanfile.MinPeakLines {
			t.Fatalf("accepted %d peaks", len(ps))
		}
		for i, p := range ps {
			if !(p.TwoThetaDeg > 0 && p.TwoThetaDeg < 180 && p.Intensity > 0) || (i > 0 && !(p.TwoThetaDeg > ps[i-1].TwoThetaDeg)) {
				t.Fatalf("bad peak %d: %+v", i, p)
			}
		}
	})
}

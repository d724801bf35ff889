package scanfile_test

import (
	"errors"
	"testing"

	"meltbook/analysis/radiation"
	"meltbook/analysis/scanfile"
)

func TestScanRadiation(t *testing.T) {
	cif, err := readFile(t, "good.cif")
	if err != nil {
		t.Fatal(err)
	}
	r, err := cif.Radiation()
	// good.cif states Cu Kα1 1.5405929 Å weight 1 and Kα2 1.5444274 Å
	// weight 0.5 (values of Hölzer et al. 1997, written into the file).
	if err != nil || r.Anode != "Cu" || r.Kalpha1Angstrom != 1.5405929 || r.Kalpha2Angstrom != 1.5444274 ||
		r.Kalpha2Ratio != 0.5 || r.Kalpha2 != radiation.Kalpha2Present {
		t.Errorf("good.cif radiation %+v, %v", r, err)
	}
	rng, _ := readFile(t, "good_range.cif")
	if r, err := rng.Radiation(); err != nil || r.Kalpha1Angstrom != 1.7889960 || r.Kalpha2 != radiation.Kalpha2Absent || r.Anode != "Co" {
		t.Errorf("good_range.cif radiation %+v, %v", r, err)
	}
	if r, err := (scanfile.Scan{Anode: "mo"}).Radiation(); err != nil || r.Kalpha1Angstrom != 0.70931715 || !r.HasKalpha2() {
		t.Errorf("anode-only radiation %+v, %v", r, err)
	}
	xy, _ := readFile(t, "good.xy")
	if _, err := xy.Radiation(); !errors.Is(err, scanfile.ErrNoRadiation) {
		t.Errorf("XY radiation error %v, want ErrNoRadiation", err)
	}
	if _, err := (scanfile.Scan{Anode: "W"}).Radiation(); !errors.Is(err, scanfile.ErrNoRadiation) {
		t.Errorf("unknown anode error %v", err)
	}
}

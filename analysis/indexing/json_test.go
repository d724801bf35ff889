package indexing_test

import (
	"encoding/json"
	"testing"

	"meltbook/analysis/indexing"
)

func TestJSONKeys(t *testing.T) {
	// The command line prints the result as JSON; these keys are its
	// contract. fcc Al lines plus one stray peak (values as in ExampleIndex).
	peaks := []indexing.Peak{
		{TwoThetaDeg: 38.4725, Intensity: 100}, {TwoThetaDeg: 44.7209, Intensity: 48},
		{TwoThetaDeg: 65.0969, Intensity: 31}, {TwoThetaDeg: 78.2295, Intensity: 36},
		{TwoThetaDeg: 82.4363, Intensity: 11}, {TwoThetaDeg: 99.0809, Intensity: 5},
		{TwoThetaDeg: 112.0195, Intensity: 19}, {TwoThetaDeg: 57.0, Intensity: 3},
	}
	res, err := indexing.Index(peaks, 1.54056, indexing.Options{})
	if err != nil {
		t.Fatal(err)
	}
	b, err := json.Marshal(res)
	if err != nil {
		t.Fatal(err)
	}
	var top map[string]json.RawMessage
	if err := json.Unmarshal(b, &top); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"phases", "unexplained", "models"} {
		if _, ok := top[k]; !ok {
			t.Errorf("top level lacks %q: %s", k, b)
		}
	}
	var phases []map[string]json.RawMessage
	if err := json.Unmarshal(top["phases"], &phases); err != nil || len(phases) != 1 {
		t.Fatalf("phases %s: %v", top["phases"], err)
	}
	for _, k := range []string{"kind", "lattice", "a_A", "chance", "peaks", "zero_shift_deg", "figure_of_merit"} {
		if _, ok := phases[0][k]; !ok {
			t.Errorf("phase lacks %q: %s", k, b)
		}
	}
	var unexplained []indexing.Peak
	if err := json.Unmarshal(top["unexplained"], &unexplained); err != nil || len(unexplained) != 1 || unexplained[0].TwoThetaDeg != 57.0 {
		t.Errorf("unexplained %s", top["unexplained"])
	}
	// Icosahedral and approximant phases carry quasilattice_constant_A and
	// order; check the tags on a constructed icosahedral result.
	fams := projectFamilies("P", 7, 0.45)
	ico, _ := icosahedralPeaks(fams, 4.60, cuKa1, 0.42, 20, 100, 0)
	res, err = indexing.Index(ico, cuKa1, indexing.Options{})
	if err != nil || len(res.Phases) != 1 {
		t.Fatalf("icosahedral list: %v %+v", err, res.Phases)
	}
	b, _ = json.Marshal(res.Phases[0])
	var ph map[string]json.RawMessage
	_ = json.Unmarshal(b, &ph)
	for _, k := range []string{"quasilattice_constant_A", "a6_A", "phason_trend"} {
		if _, ok := ph[k]; !ok {
			t.Errorf("icosahedral phase lacks %q: %s", k, b)
		}
	}
	var pk []map[string]json.RawMessage
	_ = json.Unmarshal(ph["peaks"], &pk)
	if len(pk) == 0 || pk[0]["icosahedral"] == nil {
		t.Errorf("icosahedral peak lacks its label: %s", ph["peaks"])
	}
	b, _ = json.Marshal(indexing.Phase{Kind: indexing.Approximant, Order: "1/1"})
	_ = json.Unmarshal(b, &ph)
	if string(ph["order"]) != `"1/1"` {
		t.Errorf("approximant order key: %s", b)
	}
}

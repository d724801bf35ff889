package web_test

import (
	"net/http"
	"net/url"
	"testing"
)

// FuzzMapSettings feeds arbitrary map settings to the map page and its API:
// whatever is typed, the answer is the map or a 400 saying what is wrong,
// never a fault.
func FuzzMapSettings(f *testing.F) {
	f.Add("Al", "Cu", "Fe", "1e5", "", "5", "0.05", "as-spun")
	f.Add("Al", "Cu", "Fe+Si", "", "1e7", "", "", "")
	f.Add("", "", "", "-1", "x", "200", "0", "boiled")
	f.Add("Fe+Fe", "Xx", "(Al", "NaN", "Inf", "-0", "1e-9", "annealed")
	s := newServer(f, mapSamples())
	f.Fuzz(func(t *testing.T, a, b, c, rateMin, rateMax, outside, step, treatment string) {
		q := url.Values{"a": {a}, "b": {b}, "c": {c}, "rate-min": {rateMin}, "rate-max": {rateMax}, "outside": {outside}, "ea-step": {step}, "treatment": {treatment}}
		for _, path := range []string{"/map?", "/api/map?"} {
			res, _ := get(t, s, path+q.Encode())
			if res.StatusCode != http.StatusOK && res.StatusCode != http.StatusBadRequest {
				t.Fatalf("%s%s: status %d", path, q.Encode(), res.StatusCode)
			}
		}
	})
}

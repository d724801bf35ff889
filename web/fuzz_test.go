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

// FuzzLogForm sends arbitrary values to the log form: the answer is the
// new melt (303), or the form back with its message (422, or 409 for a
// code in use), never a fault.
func FuzzLogForm(f *testing.F) {
	f.Add("Al63Cu25Fe12", "10 g", "30 um", "30 m/s", "Al=4.29g", "2031-03-02T09:30", "", "ZR")
	f.Add("Al-25Cu-12Fe", "10", "-3um", "3000 rpm", "Al=,Cu", "yesterday", "ZR-1", "")
	f.Add("(Al0.7Pd0.2Mn0.1)99B1", "1e400 g", "NaN um", "Inf m/s", "Xx=1g", "2031-13-45", "ZR-0001", "Z R")
	f.Add("", "", "", "", "", "", "", "")
	f.Fuzz(func(t *testing.T, comp, mass, thickness, speed, weighed, made, code, prefix string) {
		s := newServer(t, mapSamples())
		fs := openForm(t, s, "/log")
		form := url.Values{"composition": {comp}, "mass": {mass}, "thickness": {thickness}, "wheel-speed": {speed},
			"weighed": {weighed}, "made": {made}, "code": {code}, "prefix": {prefix}, "operator": {"T. Ingram"}}
		res, _ := fs.post(t, s, "/log", form)
		switch res.StatusCode {
		case http.StatusSeeOther, http.StatusUnprocessableEntity, http.StatusConflict:
		default:
			t.Fatalf("%v: status %d", form, res.StatusCode)
		}
	})
}

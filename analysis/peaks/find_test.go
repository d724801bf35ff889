package peaks_test

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"sort"
	"testing"

	"meltbook/analysis/internal/pyref"
	"meltbook/analysis/peaks"
	"meltbook/analysis/radiation"
	"meltbook/analysis/scanfile"
)

// refScript finds and fits peaks with scipy alone: Savitzky-Golay
// smoothing (5 points, quadratic), scipy.signal.find_peaks with a
// prominence of five counting-statistics standard deviations, widths from
// scipy.signal.peak_widths, and scipy.optimize.curve_fit of pseudo-Voigt
// peaks (with a Kα2 copy at its Bragg angle and half the area when
// lambda1/lambda2 are given) plus a straight line, in windows of ±3 FWHM,
// overlapping windows fitted together, weights 1/max(y, 1).
const refScript = `
import json, sys
import numpy as np
from scipy.signal import savgol_filter, find_peaks, peak_widths
from scipy.optimize import curve_fit

d = json.load(sys.stdin)
x = np.array(d["x"]); y = np.array(d["y"])
l1, l2 = d.get("lambda1"), d.get("lambda2")
step = (x[-1] - x[0]) / (len(x) - 1)
LN2 = np.log(2)

def pv(t, c, a, w, eta):
    u = (t - c) / w
    return a * (eta * 2 / (np.pi * w) / (1 + 4 * u * u)
                + (1 - eta) * 2 / w * np.sqrt(LN2 / np.pi) * np.exp(-4 * LN2 * u * u))

def ka2(c):
    return np.degrees(2 * np.arcsin(l2 / l1 * np.sin(np.radians(c) / 2)))

def make_model(xm):
    def model(t, *p):
        f = p[0] + p[1] * (t - xm)
        for k in range((len(p) - 2) // 4):
            c, a, w, eta = p[2 + 4 * k: 6 + 4 * k]
            f = f + pv(t, c, a, w, eta)
            if l1:
                f = f + 0.5 * pv(t, ka2(c), a, w, eta)
        return f
    return model

s = savgol_filter(y, 5, 2)
idx, _ = find_peaks(s, prominence=5 * np.sqrt(np.maximum(s, 1)))
widths = peak_widths(s, idx, rel_height=0.5)[0] * step
if l1:
    # A maximum near the Kα2 angle of a higher one is that line's Kα2.
    keep = [k for k, i in enumerate(idx)
            if not any(s[j] > s[i] and abs(ka2(x[j]) - x[i]) < max(3 * step, w) for j, w in zip(idx, widths))]
    idx, widths = idx[keep], widths[keep]

spans = []
for i, w in zip(idx, widths):
    lo, hi = x[i] - 3 * w, x[i] + 3 * w
    if l1:
        hi += ka2(x[i]) - x[i]
    spans.append([lo, hi, [(i, w)]])
groups = []
for sp in spans:
    if groups and sp[0] <= groups[-1][1]:
        groups[-1][1] = max(groups[-1][1], sp[1])
        groups[-1][2] += sp[2]
    else:
        groups.append(sp)

out = []
for lo, hi, members in groups:
    m = (x >= lo) & (x <= hi)
    xm = 0.5 * (lo + hi)
    p0 = [float(np.min(y[m])), 0.0]
    blo = [-np.inf, -np.inf]
    bhi = [np.inf, np.inf]
    for i, w in members:
        p0 += [x[i], max(s[i] - np.min(s[m]), 1) * w * 1.27, w, 0.5]
        blo += [lo, 0, step / 2, 0]
        bhi += [hi, np.inf, hi - lo, 1]
    popt, pcov = curve_fit(make_model(xm), x[m], y[m], p0=p0, sigma=np.sqrt(np.maximum(y[m], 1)),
                           bounds=(blo, bhi), maxfev=20000)
    su = np.sqrt(np.diag(pcov))
    for k in range(len(members)):
        c, a, w, eta = popt[2 + 4 * k: 6 + 4 * k]
        out.append({"center": c, "center_su": su[2 + 4 * k], "area": a, "fwhm": w, "eta": eta})
json.dump(out, sys.stdout)
`

type refPeak struct {
	Center   float64 `json:"center"`
	CenterSU float64 `json:"center_su"`
	Area     float64 `json:"area"`
	FWHM     float64 `json:"fwhm"`
	Eta      float64 `json:"eta"`
}

func scipyPeaks(t *testing.T, s scanfile.Scan, rad *radiation.Radiation) []refPeak {
	t.Helper()
	in := map[string]any{"x": s.TwoThetaDeg, "y": s.Counts}
	if rad != nil {
		in["lambda1"], in["lambda2"] = rad.Kalpha1Angstrom, rad.Kalpha2Angstrom
	}
	data, _ := json.Marshal(in)
	raw := pyref.Run(t, []string{"scipy.signal", "scipy.optimize", "numpy"}, refScript, data)
	var out []refPeak
	if err := json.Unmarshal(raw, &out); err != nil {
		t.Fatalf("reference output: %v\n%s", err, raw)
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Center < out[j].Center })
	return out
}

// specimenPeaks is an invented single-phase pattern (positions, areas in
// counts·degrees, FWHM in degrees, η) with two overlapping peaks near 43°.
var specimenPeaks = []truePeak{
	{24.5, 60, 0.12, 0.3}, {31.2, 250, 0.15, 0.5}, {36.8, 40, 0.18, 0.6}, {43.1, 500, 0.14, 0.4},
	{43.45, 180, 0.14, 0.4}, {52.7, 120, 0.2, 0.7}, {61.3, 90, 0.22, 0.5}, {74.9, 70, 0.3, 0.6},
}

func specimenBackground(x float64) float64 { return 200 + 150*math.Exp(-(x-20)/20) }

// comparePeaks checks found peaks against the truth put into the scan and
// the scipy reference: same count, and every position within one step
// (0.02°) of both.
func comparePeaks(t *testing.T, got []peaks.Peak, truth []truePeak, ref []refPeak, step float64) {
	t.Helper()
	if len(got) != len(truth) || len(ref) != len(truth) {
		t.Fatalf("found %d peaks, scipy %d, truth %d\nfound: %v\nscipy: %v", len(got), len(ref), len(truth), centers(got), ref)
	}
	for i, p := range got {
		if d := math.Abs(p.TwoThetaDeg - truth[i].center); d > step {
			t.Errorf("peak %d at %.4f°: %.4f° from the true %.2f°", i, p.TwoThetaDeg, d, truth[i].center)
		}
		if d := math.Abs(p.TwoThetaDeg - ref[i].Center); d > step {
			t.Errorf("peak %d at %.4f°: %.4f° from scipy's %.4f°", i, p.TwoThetaDeg, d, ref[i].Center)
		}
		// Both fits see the same counts, but their backgrounds differ
		// (SNIP plus a line against a line alone), which moves the area of
		// weak broad peaks by up to about two standard uncertainties:
		// allow three. Against the area put in, four (pulls of 40 and more
		// fits have an rms near one).
		if d := math.Abs(p.Area - ref[i].Area); d > 3*p.AreaSU {
			t.Errorf("peak %d at %.3f°: area %.1f ± %.1f, scipy %.1f", i, p.TwoThetaDeg, p.Area, p.AreaSU, ref[i].Area)
		}
		if d := math.Abs(p.Area - truth[i].area); d > 4*p.AreaSU {
			t.Errorf("peak %d at %.3f°: area %.1f ± %.1f, put in %.1f", i, p.TwoThetaDeg, p.Area, p.AreaSU, truth[i].area)
		}
		if r := math.Abs(p.FWHMDeg-ref[i].FWHM) / ref[i].FWHM; r > 0.15 {
			t.Errorf("peak %d at %.3f°: FWHM %.4f, scipy %.4f", i, p.TwoThetaDeg, p.FWHMDeg, ref[i].FWHM)
		}
		t.Logf("%.4f±%.4f (scipy %.4f±%.4f, true %.2f)  area %.1f±%.1f (scipy %.1f, true %.0f)  FWHM %.4f (scipy %.4f)  η %.2f (scipy %.2f)",
			p.TwoThetaDeg, p.TwoThetaSUDeg, ref[i].Center, ref[i].CenterSU, truth[i].center, p.Area, p.AreaSU, ref[i].Area, truth[i].area,
			p.FWHMDeg, ref[i].FWHM, p.Eta, ref[i].Eta)
	}
}

func centers(ps []peaks.Peak) []float64 {
	out := make([]float64, len(ps))
	for i, p := range ps {
		out[i] = math.Round(p.TwoThetaDeg*1000) / 1000
	}
	return out
}

func TestFindAgreesWithScipy(t *testing.T) {
	mono, _ := radiation.FromAnode("Cu", radiation.Kalpha2Absent)
	for _, seed := range []uint64{11, 2024, 777} {
		t.Run(fmt.Sprint("seed", seed), func(t *testing.T) {
			s, _ := synthScan(seed, 20, 0.02, 3001, specimenBackground, specimenPeaks, nil)
			res, err := peaks.Find(s, mono, peaks.Options{})
			if err != nil {
				t.Fatal(err)
			}
			comparePeaks(t, res.Peaks, specimenPeaks, scipyPeaks(t, s, nil), 0.02)
			for _, p := range res.Peaks {
				if p.DAngstrom != radiation.TwoThetaToD(p.TwoThetaDeg, 1.5405929) {
					t.Errorf("d of %v° is %v", p.TwoThetaDeg, p.DAngstrom)
				}
			}
		})
	}
}

// doubletPeaks is an invented pattern over a wide range, widths growing
// with angle, so that the Cu Kα2 component goes from an unresolved
// shoulder (25°) to a separate peak (137.5°, about 0.9° away).
var doubletPeaks = []truePeak{
	{25.0, 80, 0.10, 0.4}, {38.2, 150, 0.11, 0.5}, {44.9, 300, 0.12, 0.5}, {65.3, 120, 0.14, 0.5},
	{78.8, 100, 0.16, 0.6}, {99.5, 90, 0.2, 0.6}, {116.9, 110, 0.25, 0.6}, {137.5, 140, 0.32, 0.7},
}

func TestFindKalpha2Doublet(t *testing.T) {
	cu, _ := radiation.FromAnode("Cu", radiation.Kalpha2Present)
	flat := func(x float64) float64 { return 250 - 0.5*(x-20) }
	for _, seed := range []uint64{5, 99} {
		t.Run(fmt.Sprint("seed", seed), func(t *testing.T) {
			s, _ := synthScan(seed, 20, 0.02, 6001, flat, doubletPeaks, &cu)
			res, err := peaks.Find(s, cu, peaks.Options{})
			if err != nil {
				t.Fatal(err)
			}
			// Reported positions are Kα1 ones; no Kα2 line may appear as a
			// peak of its own.
			comparePeaks(t, res.Peaks, doubletPeaks, scipyPeaks(t, s, &cu), 0.02)
		})
	}
}

// The SRM 640f certificate (Table 1) lists the Si line positions for Cu Kα1
// to 0.001°: 111 28.441, 220 47.301, 311 56.120, 400 69.127, 331 76.373,
// 422 88.026, 511 94.947, 440 106.702, 531 114.085, 620 127.535,
// 533 136.882.
var siCertificate = []float64{28.441, 47.301, 56.120, 69.127, 76.373, 88.026, 94.947, 106.702, 114.085, 127.535, 136.882}

func TestZeroShiftFromSilicon(t *testing.T) {
	mono, _ := radiation.FromAnode("Cu", radiation.Kalpha2Absent)
	cases := []struct {
		name        string
		zero, displ float64 // put into the scan: Δ2θ = zero + displ·cos θ
		fitDispl    bool
	}{
		{"zero only", 0.045, 0, false},
		{"zero and displacement", 0.030, -0.040, true},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var ps []truePeak
			for _, tt := range siCertificate {
				shift := c.zero + c.displ*math.Cos(tt/2*math.Pi/180)
				ps = append(ps, truePeak{tt + shift, 60, 0.09 + 0.0008*(tt-28), 0.5})
			}
			// Two specimen lines well away from the Si ones.
			ps = append(ps, truePeak{40.0, 100, 0.15, 0.5}, truePeak{62.5, 80, 0.18, 0.5})
			s, _ := synthScan(31, 20, 0.01, 12501, func(float64) float64 { return 180 }, ps, nil)
			res, err := peaks.Find(s, mono, peaks.Options{Standard: &peaks.SiliconSRM640f, FitDisplacement: c.fitDispl})
			if err != nil {
				t.Fatal(err)
			}
			z := res.ZeroShift
			if z == nil {
				t.Fatalf("no zero shift; notes %v, peaks %v", res.Notes, centers(res.Peaks))
			}
			if len(z.Matches) != len(siCertificate) {
				t.Errorf("%d Si lines matched, want %d", len(z.Matches), len(siCertificate))
			}
			// The certificate positions are rounded to 0.001°, so Z and D
			// can be off by that much on top of their SU.
			if d := math.Abs(z.ZeroDeg - c.zero); d > 3*z.ZeroSUDeg+0.002 {
				t.Errorf("zero %.5f ± %.5f°, put in %.3f°", z.ZeroDeg, z.ZeroSUDeg, c.zero)
			}
			if d := math.Abs(z.DisplacementDeg - c.displ); c.fitDispl && d > 3*z.DisplacementSUDeg+0.003 {
				t.Errorf("displacement %.5f ± %.5f°, put in %.3f°", z.DisplacementDeg, z.DisplacementSUDeg, c.displ)
			}
			t.Logf("Z = %.5f ± %.5f°, D = %.5f ± %.5f°, χ²ν = %.2f", z.ZeroDeg, z.ZeroSUDeg, z.DisplacementDeg, z.DisplacementSUDeg, z.ReducedChiSquare)
			k := 0
			for i, p := range res.Corrected {
				if res.Peaks[i].Standard == "" {
					continue
				}
				if d := math.Abs(p.TwoThetaDeg - siCertificate[k]); d > 3*p.TwoThetaSUDeg+0.001 {
					t.Errorf("corrected %s at %.4f ± %.4f°, certificate %.3f°", res.Peaks[i].Standard, p.TwoThetaDeg, p.TwoThetaSUDeg, siCertificate[k])
				}
				k++
			}
			if res.Peaks[0].Standard != "Si (NIST SRM 640f) 111" {
				t.Errorf("first peak labelled %q", res.Peaks[0].Standard)
			}
		})
	}
}

func TestZeroShiftTooFewLines(t *testing.T) {
	ps := []peaks.Peak{{TwoThetaDeg: 28.46, TwoThetaSUDeg: 0.002}}
	_, err := peaks.FitZeroShift(ps, peaks.SiliconSRM640f, 1.5405929, 0.3, true)
	if !errors.Is(err, peaks.ErrNoStandardPeaks) {
		t.Fatalf("error %v, want ErrNoStandardPeaks", err)
	}
	// One line gives the zero shift alone: 28.46 − 28.4412 (SRM 640f 111,
	// Cu Kα1, hand computation in the radiation tests) = 0.0188°.
	z, err := peaks.FitZeroShift(ps, peaks.SiliconSRM640f, 1.5405929, 0.3, false)
	if err != nil || math.Abs(z.ZeroDeg-0.0188) > 1e-4 || z.ZeroSUDeg != 0.002 {
		t.Errorf("zero %v ± %v, %v; want 0.0188 ± 0.002", z.ZeroDeg, z.ZeroSUDeg, err)
	}
}

func TestStandardReflections(t *testing.T) {
	// Si (Fd-3m) lines below 2θ = 140° with Cu Kα1: the eleven of the SRM
	// 640f certificate table; 200, 222 and 420 are forbidden.
	got := peaks.SiliconSRM640f.Reflections(1.5405929, 0, 140)
	if len(got) != len(siCertificate) {
		t.Fatalf("%d Si lines, want %d", len(got), len(siCertificate))
	}
	for i, r := range got {
		if math.Abs(r.TwoThetaDeg-siCertificate[i]) > 0.0006 {
			t.Errorf("%d%d%d at %.4f°, certificate %.3f°", r.H, r.K, r.L, r.TwoThetaDeg, siCertificate[i])
		}
	}
	// LaB6 (Pm-3m), a = 4.156826 Å (SRM 660c): the first lines are 100,
	// 110, 111, 200 at d = a, a/√2, a/√3, a/2; for 100 by hand,
	// sin θ = 1.5405929/(2·4.156826) = 0.185309, 2θ = 21.3583°.
	lab6 := peaks.LaB6SRM660c.Reflections(1.5405929, 0, 45)
	wantHKL := [][3]int{{1, 0, 0}, {1, 1, 0}, {1, 1, 1}, {2, 0, 0}}
	if len(lab6) != len(wantHKL) {
		t.Fatalf("LaB6 lines %v", lab6)
	}
	for i, r := range lab6 {
		if [3]int{r.H, r.K, r.L} != wantHKL[i] {
			t.Errorf("LaB6 line %d is %d%d%d", i, r.H, r.K, r.L)
		}
	}
	if math.Abs(lab6[0].TwoThetaDeg-21.3583) > 1e-4 {
		t.Errorf("LaB6 100 at %.5f°, want 21.3583°", lab6[0].TwoThetaDeg)
	}
	if _, err := peaks.StandardByName("CeO2"); err == nil {
		t.Error("StandardByName(CeO2) gave no error")
	}
}

// TestUncertaintiesAreHonest repeats one noisy scan with 40 seeds: the
// scatter of the fitted position about the truth, in units of each fit's
// own standard uncertainty, must have a standard deviation near one
// (0.7 … 1.4 allows for 40 samples).
func TestUncertaintiesAreHonest(t *testing.T) {
	mono, _ := radiation.Monochromatic(1.5405929)
	truth := truePeak{45.0, 40, 0.15, 0.5}
	var sum2 float64
	const runs = 40
	for seed := uint64(1); seed <= runs; seed++ {
		s, _ := synthScan(seed, 42, 0.02, 301, func(float64) float64 { return 150 }, []truePeak{truth}, nil)
		res, err := peaks.Find(s, mono, peaks.Options{})
		if err != nil || len(res.Peaks) != 1 {
			t.Fatalf("seed %d: %v, %d peaks", seed, err, len(res.Peaks))
		}
		p := res.Peaks[0]
		pull := (p.TwoThetaDeg - truth.center) / p.TwoThetaSUDeg
		sum2 += pull * pull
	}
	if sd := math.Sqrt(sum2 / runs); sd < 0.7 || sd > 1.4 {
		t.Errorf("position pulls have standard deviation %.2f, want near 1", sd)
	}
}

func TestFindRefusesBadScans(t *testing.T) {
	mono, _ := radiation.Monochromatic(1.54)
	good, _ := synthScan(0, 20, 0.02, 50, func(float64) float64 { return 10 }, nil, nil)
	bad := []scanfile.Scan{
		{TwoThetaDeg: good.TwoThetaDeg[:10], Counts: good.Counts[:10]},
		{TwoThetaDeg: good.TwoThetaDeg, Counts: good.Counts[:49]},
	}
	rev := append([]float64(nil), good.TwoThetaDeg...)
	rev[20], rev[21] = rev[21], rev[20]
	bad = append(bad, scanfile.Scan{TwoThetaDeg: rev, Counts: good.Counts})
	neg := append([]float64(nil), good.Counts...)
	neg[3] = -1
	bad = append(bad, scanfile.Scan{TwoThetaDeg: good.TwoThetaDeg, Counts: neg})
	for i, s := range bad {
		if _, err := peaks.Find(s, mono, peaks.Options{}); !errors.Is(err, peaks.ErrBadScan) {
			t.Errorf("case %d: error %v, want ErrBadScan", i, err)
		}
	}
	if _, err := peaks.Find(good, radiation.Radiation{}, peaks.Options{}); err == nil {
		t.Error("zero radiation accepted")
	}
	// A flat scan has no peaks and no error.
	res, err := peaks.Find(good, mono, peaks.Options{})
	if err != nil || len(res.Peaks) != 0 {
		t.Errorf("flat scan: %v, %d peaks", err, len(res.Peaks))
	}
}

// TestFindWithFileUncertainties: a scan whose file gives √counts as the
// uncertainty of each point must give the same peaks as the counting
// statistics Find assumes without one (Poisson: σ² = counts).
func TestFindWithFileUncertainties(t *testing.T) {
	mono, _ := radiation.FromAnode("Cu", radiation.Kalpha2Absent)
	s, _ := synthScan(11, 20, 0.02, 3001, specimenBackground, specimenPeaks, nil)
	plain, err := peaks.Find(s, mono, peaks.Options{})
	if err != nil {
		t.Fatal(err)
	}
	s.Errors = make([]float64, len(s.Counts))
	for i, c := range s.Counts {
		s.Errors[i] = math.Sqrt(math.Max(c, 1))
	}
	withESD, err := peaks.Find(s, mono, peaks.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(withESD.Peaks) != len(plain.Peaks) {
		t.Fatalf("%d peaks with uncertainties, %d without", len(withESD.Peaks), len(plain.Peaks))
	}
	for i, p := range withESD.Peaks {
		q := plain.Peaks[i]
		// The weights differ only by raw against smoothed counts: the
		// positions must agree well inside one standard uncertainty.
		if d := math.Abs(p.TwoThetaDeg - q.TwoThetaDeg); d > 0.5*q.TwoThetaSUDeg {
			t.Errorf("peak %d: %.4f° with uncertainties, %.4f ± %.4f° without", i, p.TwoThetaDeg, q.TwoThetaDeg, q.TwoThetaSUDeg)
		}
	}
}

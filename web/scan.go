package web

import (
	"math"
	"strconv"
	"strings"

	"meltbook"
	"meltbook/store/intake"
	"meltbook/web/plot"
)

// scanView turns a stored scan into what the scan page draws: its points,
// the background and fitted profile of the peak search, and the peaks of
// the current indexing with the reflection each phase assigned them, the
// internal standard's lines named as such, and every other peak marked
// unexplained.
//
// The background and profile are presentation only: intake.Curves runs
// the peak search again on the stored points with the current indexing's
// radiation and standard, as the intake ran it. Peaks and labels are the
// stored ones.
func scanView(rec *meltbook.ScanRecord) ScanView {
	sc := &rec.Scan
	v := ScanView{
		Scan:      summaryOf(rec),
		Current:   rec.Current(),
		Proposals: rec.Proposals,
		Pattern:   plot.Pattern{TwoThetaDeg: sc.TwoThetaDeg, Counts: sc.Counts, Peaks: []plot.PeakMark{}},
	}
	if bg, fit, err := intake.Curves(rec); err == nil && len(bg) == len(sc.TwoThetaDeg) && len(fit) == len(bg) {
		v.Pattern.Background, v.Pattern.Fit = bg, fit
	}
	if v.Current == nil {
		return v
	}
	labels := peakLabels(v.Current)
	for i, p := range v.Current.Peaks {
		mark := plot.PeakMark{TwoThetaDeg: p.TwoThetaDeg, Label: labels[i]}
		mark.Explained = mark.Label != ""
		v.Pattern.Peaks = append(v.Pattern.Peaks, mark)
	}
	return v
}

// peakLabels names each peak of an indexing by the reflection a phase
// assigned it, "(7,11)" or "422"; with more than one phase the label starts
// with the phase's letter (A for the first). Lines of the internal standard
// are labelled with the standard's element and reflection ("Si 111").
// Unexplained peaks get "".
func peakLabels(x *meltbook.Indexing) []string {
	labels := make([]string, len(x.Peaks))
	for i, p := range x.Peaks {
		if p.Standard != "" {
			f := strings.Fields(p.Standard)
			labels[i] = f[0] + " " + f[len(f)-1]
		}
	}
	for k, ph := range x.Phases {
		for _, a := range ph.Assignments {
			if a.Peak < 0 || a.Peak >= len(labels) || labels[a.Peak] != "" {
				continue
			}
			labels[a.Peak] = a.Label
			if len(x.Phases) > 1 {
				labels[a.Peak] = phaseLetter(k) + " " + a.Label
			}
		}
	}
	for _, u := range x.Unexplained {
		if u >= 0 && u < len(labels) {
			labels[u] = ""
		}
	}
	return labels
}

// phaseLetter names the k-th phase of an indexing: A, B, ...
func phaseLetter(k int) string { return string(rune('A' + k%26)) }

// summaryOf is a stored scan in brief, as MeltScans lists it.
func summaryOf(rec *meltbook.ScanRecord) meltbook.ScanSummary {
	sc := &rec.Scan
	s := meltbook.ScanSummary{
		ID: sc.ID, SampleCode: sc.SampleCode, MeltCode: sc.MeltCode, FileName: sc.FileName, SHA256: sc.SHA256,
		Format: sc.Format, Radiation: sc.Radiation, InternalStandard: sc.InternalStandard, Points: sc.Points(),
		ImportedAt: sc.ImportedAt, ImportedBy: sc.ImportedBy,
	}
	if n := len(sc.TwoThetaDeg); n > 0 {
		s.FromDeg, s.ToDeg = sc.TwoThetaDeg[0], sc.TwoThetaDeg[n-1]
	}
	if cur := rec.Current(); cur != nil {
		s.IndexingVersion = cur.Version
		s.Indexing = indexingText(cur)
	}
	return s
}

// indexingText sums up an indexing: its phases with their constants, and
// how many specimen peaks they explain.
func indexingText(x *meltbook.Indexing) string {
	n := x.SpecimenPeaks()
	if len(x.Phases) == 0 {
		return "no phase beats chance (" + plural(n, "peak") + ")"
	}
	titles := make([]string, len(x.Phases))
	for i := range x.Phases {
		titles[i] = x.Phases[i].Title()
	}
	explained := n - len(x.Unexplained)
	return strings.Join(titles, "; ") + ", " + strconv.Itoa(max(explained, 0)) + " of " + plural(n, "peak")
}

func plural(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return strconv.Itoa(n) + " " + noun + "s"
}

// chanceText writes the probability that random peaks index as well, e.g.
// "1 in 2.3 × 10⁵".
func chanceText(p float64) string {
	switch {
	case !(p > 0):
		return "below 1 in 10¹⁵"
	case p >= 0.01:
		return strconv.FormatFloat(math.Round(1000*p)/10, 'f', -1, 64) + " %"
	}
	return "1 in " + scientific(1/p)
}

// radiationText names a scan's radiation for people: "Cu Kα1/Kα2 (1.5406 Å)",
// "Cu Kα1 (1.5406 Å), Kα2 stripped", "0.7093 Å, monochromatic".
func radiationText(r meltbook.ScanRadiation) string {
	name := r.Anode
	lambda := strconv.FormatFloat(r.Kalpha1Angstrom, 'f', 4, 64) + " Å"
	switch r.Kalpha2 {
	case meltbook.Kalpha2Doublet:
		if name == "" {
			return lambda + " with its Kα2"
		}
		return name + " Kα1/Kα2 (" + lambda + ")"
	case meltbook.Kalpha2Stripped:
		if name == "" {
			return lambda + ", Kα2 stripped"
		}
		return name + " Kα1 (" + lambda + "), Kα2 stripped"
	}
	if name == "" {
		return lambda + ", monochromatic"
	}
	return name + " Kα1 (" + lambda + "), monochromated"
}

package main

import (
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"meltbook"
	"meltbook/analysis/verdict"
	"meltbook/store"
	"meltbook/store/intake"
)

// proposalsOf returns the proposals made by an indexing version.
func proposalsOf(rec *meltbook.ScanRecord, version int) []meltbook.ScanProposal {
	var out []meltbook.ScanProposal
	for _, p := range rec.Proposals {
		if p.IndexingVersion == version {
			out = append(out, p)
		}
	}
	return out
}

// writeScanAdded reports one scan added or re-indexed: the scan, its
// peaks and phases, each proposal with its weighing, and the notes.
func writeScanAdded(w io.Writer, res *intake.Result) error {
	rec := res.Record
	sc := rec.Scan
	x := rec.Current()
	verb := "added"
	if x.Version > 1 {
		verb = fmt.Sprintf("re-indexed (indexing %d)", x.Version)
	}
	fmt.Fprintf(w, "scan %d %s: %s on %s\n", sc.ID, verb, sc.FileName, sc.SampleCode)
	fmt.Fprintf(w, "  %d points, 2θ %.2f-%.2f°, %s, %s\n", sc.Points(), sc.TwoThetaDeg[0], sc.TwoThetaDeg[sc.Points()-1], radiationShown(x.Radiation), sc.Format)
	fmt.Fprintf(w, "  %d peaks; %s\n", len(x.Peaks), store.IndexingBrief(x))
	for _, wg := range res.Weighed {
		v, p := wg.Verdict, wg.Proposal
		if p == nil {
			continue
		}
		fmt.Fprintf(w, "  proposed: %s, confidence %s (%+d)  [outcome:%d]\n", outcomeText(p.Outcome), v.Confidence, v.Points, p.OutcomeID)
		writeReasons(w, "    agrees:       ", v.Agree)
		writeReasons(w, "    disagrees:    ", v.Disagree)
		writeReasons(w, "    not telling:  ", v.Neutral)
	}
	if len(proposalsOf(rec, x.Version)) > 0 {
		fmt.Fprintln(w, "  decide with meltbook confirm outcome:ID or meltbook reject outcome:ID --reason TEXT")
	}
	for _, n := range res.Notes {
		fmt.Fprintf(w, "  note: %s\n", n)
	}
	return nil
}

func writeReasons(w io.Writer, title string, rs []verdict.Reason) {
	for _, r := range rs {
		fmt.Fprintf(w, "%s%s (%+d)\n", title, r.Text, r.Points)
		title = strings.Repeat(" ", len([]rune(title)))
	}
}

// writeScanLine reports one scan of many on a line.
func writeScanLine(w io.Writer, path string, res *intake.Result) {
	rec := res.Record
	x := rec.Current()
	var props []string
	for _, p := range proposalsOf(rec, x.Version) {
		props = append(props, fmt.Sprintf("%s (%s) [outcome:%d]", outcomeText(p.Outcome), p.Confidence, p.OutcomeID))
	}
	proposed := "nothing proposed"
	if len(props) > 0 {
		proposed = "proposed " + strings.Join(props, ", ")
	}
	assumed := ""
	if rec.Scan.Radiation.Assumed {
		assumed = ", radiation assumed " + rec.Scan.Radiation.Text
	}
	fmt.Fprintf(w, "added    %s: scan %d of %s; %s; %s%s\n", path, rec.Scan.ID, rec.Scan.SampleCode, store.IndexingBrief(x), proposed, assumed)
}

// radiationShown writes a radiation, saying when it was assumed.
func radiationShown(r meltbook.ScanRadiation) string {
	s := fmt.Sprintf("%s (λ1 = %.5f Å, Kα2 %s)", r.Text, r.Kalpha1Angstrom, r.Kalpha2)
	if r.Assumed {
		s += ", assumed"
	}
	return s
}

func writeScanList(w io.Writer, code string, scans []meltbook.ScanSummary) error {
	if len(scans) == 0 {
		_, err := fmt.Fprintf(w, "%s has no scans\n", code)
		return err
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "scan\tsample\tfile\tradiation\t2θ (°)\tpoints\timported\tcurrent indexing")
	for _, s := range scans {
		rad := s.Radiation.Text
		if s.Radiation.Assumed {
			rad += " (assumed)"
		}
		fmt.Fprintf(tw, "%d\t%s\t%s\t%s\t%.1f-%.1f\t%d\t%s\t%s\n", s.ID, s.SampleCode, s.FileName, rad, s.FromDeg, s.ToDeg,
			s.Points, shownAt(s.ImportedAt), indexingShort(s))
	}
	return tw.Flush()
}

func indexingShort(s meltbook.ScanSummary) string {
	if s.IndexingVersion > 1 {
		return fmt.Sprintf("%s (indexing %d)", s.Indexing, s.IndexingVersion)
	}
	return s.Indexing
}

// writeScanRecord prints everything about a scan.
func writeScanRecord(w io.Writer, rec *meltbook.ScanRecord) error {
	sc := rec.Scan
	fmt.Fprintf(w, "scan %d of %s (melt %s)\n", sc.ID, sc.SampleCode, sc.MeltCode)
	fmt.Fprintf(w, "  file        %s (%s), SHA-256 %s\n", sc.FileName, sc.Format, sc.SHA256)
	fmt.Fprintf(w, "  imported    %s by %s\n", shownAt(sc.ImportedAt), sc.ImportedBy)
	fmt.Fprintf(w, "  points      %d, 2θ %.3f-%.3f°\n", sc.Points(), sc.TwoThetaDeg[0], sc.TwoThetaDeg[sc.Points()-1])
	fmt.Fprintf(w, "  radiation   %s\n", radiationShown(sc.Radiation))
	if sc.InternalStandard != "" {
		fmt.Fprintf(w, "  standard    %s\n", sc.InternalStandard)
	}
	if sc.Notes != "" {
		fmt.Fprintf(w, "  notes       %s\n", sc.Notes)
	}
	x := rec.Current()
	if x == nil {
		fmt.Fprintln(w, "\nnot indexed")
		return nil
	}
	fmt.Fprintf(w, "\nindexing %d (current), %s by %s for %s", x.Version, shownAt(x.At), x.By, x.RequestedBy)
	if x.Reason != "" {
		fmt.Fprintf(w, ": %s", x.Reason)
	}
	fmt.Fprintf(w, "\n  %s; tolerance %.2f°, chance at most %.2g\n", radiationShown(x.Radiation), x.ToleranceDeg, x.MaxChance)
	if x.ZeroShiftDeg != nil {
		fmt.Fprintf(w, "  zero shift from %s: %+.4f°", x.InternalStandard, *x.ZeroShiftDeg)
		if x.ZeroShiftSUDeg != nil {
			fmt.Fprintf(w, " ± %.4f°", *x.ZeroShiftSUDeg)
		}
		fmt.Fprintln(w)
	}
	labels := make([]string, len(x.Peaks))
	for i, ph := range x.Phases {
		for _, a := range ph.Assignments {
			labels[a.Peak] = fmt.Sprintf("%d: %s", i+1, a.Label)
		}
	}
	for _, u := range x.Unexplained {
		labels[u] = "unexplained"
	}
	fmt.Fprintf(w, "\n  %d peaks\n", len(x.Peaks))
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "  2θ (°)\td (Å)\theight\tarea\tFWHM (°)\t\tphase: index\t")
	for i, p := range x.Peaks {
		label := labels[i]
		if p.Standard != "" {
			label = p.Standard
		}
		fmt.Fprintf(tw, "  %.4f\t%.5f\t%.0f\t%.1f\t%.4f\t\t%s\t\n", p.TwoThetaDeg, p.DAngstrom, p.Height, p.Area, p.FWHMDeg, label)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	if len(x.Phases) == 0 {
		fmt.Fprintln(w, "\n  no phase indexes these peaks better than chance")
	}
	for i, ph := range x.Phases {
		fmt.Fprintf(w, "\n  phase %d: %s\n", i+1, ph.Title())
		if ph.Kind == meltbook.ModelApproximant {
			fmt.Fprintf(w, "    approximant %s of %s (ideal a = %.3f Å)\n", ph.Order, ph.ApproximantOf, ph.IdealAA)
		}
		fmt.Fprintf(w, "    %d peaks, %.0f%% of the intensity, zero shift %+.4f ± %.4f°, rms residual %.4f°\n",
			len(ph.Assignments), 100*ph.ExplainedIntensity, ph.ZeroShiftDeg, ph.ZeroShiftSUDeg, ph.RMSResidualDeg)
		fmt.Fprintf(w, "    figure of merit %.1f, chance %.2g (%s)\n", ph.FigureOfMerit, ph.Chance, ph.ChanceBasis)
		if ph.PhasonStrain {
			fmt.Fprintln(w, "    residuals grow with |G⊥|: a sign of phason strain")
		}
	}
	for _, n := range x.Notes {
		fmt.Fprintf(w, "  note: %s\n", n)
	}
	if len(rec.Proposals) > 0 {
		fmt.Fprintln(w, "\nautomatic proposals")
		for _, p := range rec.Proposals {
			fmt.Fprintf(w, "  %s  %s, confidence %s, from indexing %d  [outcome:%d]\n    %s\n",
				outcomeText(p.Outcome), p.Outcome.Status, p.Confidence, p.IndexingVersion, p.OutcomeID, p.Outcome.Evidence)
		}
	}
	if len(rec.Indexings) > 1 {
		fmt.Fprintln(w, "\nearlier indexings")
		for _, e := range rec.Indexings[:len(rec.Indexings)-1] {
			fmt.Fprintf(w, "  %d  %s  %s; %s\n", e.Version, shownAt(e.At), radiationShown(e.Radiation), store.IndexingBrief(&e))
		}
	}
	fmt.Fprintln(w, "\nhistory")
	for _, h := range rec.History {
		what := h.Entity + " " + h.Action
		if h.Field != "" {
			what += " " + h.Field + ": " + h.Before + " → " + h.After
		}
		if h.Why != "" {
			what += " (" + h.Why + ")"
		}
		fmt.Fprintf(w, "  %s  %s  %s:%d %s\n", shownAt(h.At), h.Who, h.Entity, h.EntityID, strings.TrimPrefix(what, h.Entity+" "))
	}
	return nil
}

package weighout

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"strconv"
	"text/tabwriter"
)

// WriteText writes the sheet as a table for printing: masses rounded to
// 0.1 mg (four decimals in grams), fractions in percent, then the expected
// result, the notes and the cautions.
func (s Sheet) WriteText(w io.Writer) error {
	ew := &errWriter{w: w}
	ew.printf("Weigh-out for %s, button %.4f g\n\n", s.Composition.Format(2), s.TargetGrams)
	tw := tabwriter.NewWriter(ew, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "element\tat.%\twt.%\tpurity\tloss allowance\telement g\tweigh g\t")
	for _, l := range s.Lines {
		purity := strconv.FormatFloat(l.Purity*100, 'f', -1, 64) + "%"
		if l.PurityAssumed {
			purity += " (assumed)"
		}
		loss := "-"
		if l.LossBasis != LossNone {
			loss = strconv.FormatFloat(l.Loss*100, 'f', -1, 64) + "% (" + l.LossBasis + ")"
		}
		fmt.Fprintf(tw, "%s\t%.2f\t%.2f\t%s\t%s\t%.4f\t%.4f\t\n", l.Element, l.AtomicFraction*100,
			l.WeightFraction*100, purity, loss, l.ElementGrams, l.MassGrams)
	}
	var element float64
	for _, l := range s.Lines {
		element += l.ElementGrams
	}
	fmt.Fprintf(tw, "total\t\t\t\t\t%.4f\t%.4f\t\n", element, s.TotalGrams)
	if err := tw.Flush(); err != nil {
		return err
	}
	ew.printf("\nIf the allowed losses happen: about %.4f g of %s.\n", s.ExpectedGrams, s.ExpectedComposition.Format(2))
	ew.printf("If nothing evaporates: %s.\n", s.IfNoLoss.Format(2))
	for _, n := range s.Notes {
		ew.printf("Note: %s\n", n)
	}
	if len(s.Cautions) > 0 {
		ew.printf("\nCautions:\n")
		for _, c := range s.Cautions {
			ew.printf("  - %s\n", c.Text)
		}
	}
	return ew.err
}

type errWriter struct {
	w   io.Writer
	err error
}

func (e *errWriter) Write(p []byte) (int, error) {
	if e.err != nil {
		return 0, e.err
	}
	n, err := e.w.Write(p)
	e.err = err
	return n, err
}

func (e *errWriter) printf(format string, args ...any) { fmt.Fprintf(e, format, args...) }

// csvHeader names the CSV columns; fractions are plain fractions, masses
// in grams at full precision.
var csvHeader = []string{"element", "atomic_fraction", "weight_fraction", "purity", "purity_assumed",
	"loss_allowance", "loss_basis", "element_g", "weigh_g"}

// WriteCSV writes one row per element and a final "total" row, with full
// precision (no rounding).
func (s Sheet) WriteCSV(w io.Writer) error {
	cw := csv.NewWriter(w)
	if err := cw.Write(csvHeader); err != nil {
		return err
	}
	f := func(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }
	var element float64
	for _, l := range s.Lines {
		element += l.ElementGrams
		if err := cw.Write([]string{l.Element, f(l.AtomicFraction), f(l.WeightFraction), f(l.Purity),
			strconv.FormatBool(l.PurityAssumed), f(l.Loss), l.LossBasis, f(l.ElementGrams), f(l.MassGrams)}); err != nil {
			return err
		}
	}
	if err := cw.Write([]string{"total", "1", "1", "", "", "", "", f(element), f(s.TotalGrams)}); err != nil {
		return err
	}
	cw.Flush()
	return cw.Error()
}

type jsonPart struct {
	Element        string  `json:"element"`
	AtomicFraction float64 `json:"atomic_fraction"`
}

type jsonLine struct {
	Element        string  `json:"element"`
	AtomicFraction float64 `json:"atomic_fraction"`
	WeightFraction float64 `json:"weight_fraction"`
	Purity         float64 `json:"purity"`
	PurityAssumed  bool    `json:"purity_assumed"`
	LossAllowance  float64 `json:"loss_allowance"`
	LossBasis      string  `json:"loss_basis"`
	ElementGrams   float64 `json:"element_g"`
	MassGrams      float64 `json:"mass_g"`
}

type jsonCaution struct {
	Kind     string   `json:"kind"`
	Elements []string `json:"elements"`
	Text     string   `json:"text"`
}

type jsonSheet struct {
	Composition         string        `json:"composition"`
	TargetGrams         float64       `json:"target_g"`
	Elements            []jsonLine    `json:"elements"`
	TotalGrams          float64       `json:"total_g"`
	ExpectedGrams       float64       `json:"expected_g"`
	ImpurityGrams       float64       `json:"impurity_g"`
	ExpectedComposition []jsonPart    `json:"expected_composition"`
	IfNoLoss            []jsonPart    `json:"if_no_loss"`
	Notes               []string      `json:"notes"`
	Cautions            []jsonCaution `json:"cautions"`
}

// WriteJSON writes the sheet as one JSON object with an "elements" list
// ({element, mass_g, element_g, purity, loss_allowance, ...}), "total_g"
// and the expected result, at full precision.
func (s Sheet) WriteJSON(w io.Writer) error {
	out := jsonSheet{
		Composition:   s.Composition.Format(2),
		TargetGrams:   s.TargetGrams,
		Elements:      make([]jsonLine, len(s.Lines)),
		TotalGrams:    s.TotalGrams,
		ExpectedGrams: s.ExpectedGrams,
		ImpurityGrams: s.ImpurityGrams,
		Notes:         append([]string{}, s.Notes...),
		Cautions:      make([]jsonCaution, len(s.Cautions)),
	}
	for i, l := range s.Lines {
		out.Elements[i] = jsonLine{l.Element, l.AtomicFraction, l.WeightFraction, l.Purity, l.PurityAssumed,
			l.Loss, l.LossBasis, l.ElementGrams, l.MassGrams}
	}
	for _, p := range s.ExpectedComposition {
		out.ExpectedComposition = append(out.ExpectedComposition, jsonPart{p.Element, p.Fraction})
	}
	for _, p := range s.IfNoLoss {
		out.IfNoLoss = append(out.IfNoLoss, jsonPart{p.Element, p.Fraction})
	}
	for i, c := range s.Cautions {
		out.Cautions[i] = jsonCaution{string(c.Kind), append([]string{}, c.Elements...), c.Text}
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(out)
}

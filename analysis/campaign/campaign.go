// Package campaign groups a notebook's melts into alloy systems, tallies
// what each system's melts gave, and turns its examined samples into the
// points analysis/suggest ranks new compositions from.
//
// An alloy system is the set of elements a melt's nominal composition holds,
// named by decreasing mean fraction over the system's melts ("Al-Cu-Fe").
// A ternary melt is not folded into a quaternary system: its elements say
// what it is.
//
// A sample's standing outcomes are a person's and the automatic proposals a
// person confirmed; pending and rejected proposals do not count. For the
// estimate a sample showed a quasicrystal when a standing outcome is
// icosahedral, ambiguous when its only icosahedral outcomes are tentative
// (evidence starting with Tentative), and none otherwise; a sample with no
// standing outcome was not examined and gives no point.
//
// The package is pure: notebook records in, plain values out.
package campaign

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"

	"meltbook"
	"meltbook/analysis/composition"
	"meltbook/analysis/descriptor"
	"meltbook/analysis/element"
	"meltbook/analysis/suggest"
)

// Tentative starts the evidence of an icosahedral outcome a lab could not
// settle; such an outcome counts as half a quasicrystal.
const Tentative = "tentative"

// Finding is the most telling result among a melt's samples, in order of
// interest to a quasicrystal campaign.
type Finding int

// The findings, most telling first.
const (
	FoundIcosahedral Finding = iota
	FoundTentative
	FoundDecagonal
	FoundApproximant
	FoundAmorphous
	FoundCrystalline
	FoundNothing // no sample has a standing outcome
)

// Findings lists the findings in display order.
var Findings = []Finding{FoundIcosahedral, FoundTentative, FoundDecagonal, FoundApproximant, FoundAmorphous, FoundCrystalline, FoundNothing}

// String returns a column heading for the finding.
func (f Finding) String() string {
	switch f {
	case FoundIcosahedral:
		return "icosahedral"
	case FoundTentative:
		return "tentative i"
	case FoundDecagonal:
		return "decagonal"
	case FoundApproximant:
		return "approximant"
	case FoundAmorphous:
		return "amorphous"
	case FoundCrystalline:
		return "crystalline only"
	}
	return "no result"
}

// System is one alloy system of the notebook.
type System struct {
	// Name joins the elements with hyphens, e.g. "Al-Cu-Fe".
	Name string
	// Elements by decreasing mean nominal fraction over the system's melts.
	Elements []string
	// Melts are the codes of the system's melts, in the order given.
	Melts []string
	// Samples counts all samples of those melts, Examined those with a
	// standing outcome.
	Samples, Examined int
	// ByFinding counts melts by their most telling finding.
	ByFinding map[Finding]int
	// Points are the examined samples, for suggest.
	Points []suggest.Point
	// Mean is the mean nominal composition of the melts.
	Mean composition.Composition
}

// standing reports whether an outcome counts: a person's, or a confirmed
// automatic proposal.
func standing(o meltbook.Outcome) bool {
	return o.Source == meltbook.ByPerson || (o.Source == meltbook.ByAutomatic && o.Status == meltbook.Confirmed)
}

// SampleOutcome returns what a sample showed for the estimate; ok is false
// when it has no standing outcome.
func SampleOutcome(s meltbook.SampleRecord) (out suggest.Outcome, ok bool) {
	out = suggest.NoQuasicrystal
	for _, o := range s.Outcomes {
		if !standing(o) {
			continue
		}
		ok = true
		if o.Kind != meltbook.Icosahedral {
			continue
		}
		if strings.HasPrefix(o.Evidence, Tentative) {
			if out == suggest.NoQuasicrystal {
				out = suggest.Ambiguous
			}
			continue
		}
		out = suggest.Quasicrystal
	}
	return out, ok
}

// finding returns the most telling standing outcome of a sample.
func finding(s meltbook.SampleRecord) Finding {
	best := FoundNothing
	for _, o := range s.Outcomes {
		if !standing(o) {
			continue
		}
		f := FoundCrystalline
		switch o.Kind {
		case meltbook.Icosahedral:
			f = FoundIcosahedral
			if strings.HasPrefix(o.Evidence, Tentative) {
				f = FoundTentative
			}
		case meltbook.Decagonal:
			f = FoundDecagonal
		case meltbook.Approximant:
			f = FoundApproximant
		case meltbook.Amorphous:
			f = FoundAmorphous
		}
		if f < best {
			best = f
		}
	}
	return best
}

// Group sorts melts into systems, largest first (ties by name).
func Group(records []meltbook.MeltRecord) []System {
	bySet := map[string]*System{}
	sums := map[string]map[string]float64{}
	var order []string
	for i := range records {
		rec := &records[i]
		var els []string
		for _, f := range rec.Melt.Nominal {
			if f.Fraction > 0 {
				els = append(els, f.Element)
			}
		}
		if len(els) == 0 {
			continue
		}
		sort.Strings(els)
		key := strings.Join(els, " ")
		sys, ok := bySet[key]
		if !ok {
			sys = &System{ByFinding: map[Finding]int{}}
			bySet[key], sums[key] = sys, map[string]float64{}
			order = append(order, key)
		}
		for _, f := range rec.Melt.Nominal {
			sums[key][f.Element] += f.Fraction
		}
		sys.Melts = append(sys.Melts, rec.Melt.Code)
		addSamples(sys, rec)
	}
	out := make([]System, 0, len(order))
	for _, key := range order {
		sys := bySet[key]
		n := float64(len(sys.Melts))
		for el, s := range sums[key] {
			if s > 0 {
				sys.Mean = append(sys.Mean, composition.Part{Element: el, Fraction: s / n})
			}
		}
		sort.Slice(sys.Mean, func(i, j int) bool {
			a, b := sys.Mean[i], sys.Mean[j]
			if a.Fraction != b.Fraction {
				return a.Fraction > b.Fraction
			}
			return a.Element < b.Element
		})
		for _, p := range sys.Mean {
			sys.Elements = append(sys.Elements, p.Element)
		}
		sys.Name = strings.Join(sys.Elements, "-")
		out = append(out, *sys)
	}
	sort.SliceStable(out, func(i, j int) bool {
		if len(out[i].Melts) != len(out[j].Melts) {
			return len(out[i].Melts) > len(out[j].Melts)
		}
		return out[i].Name < out[j].Name
	})
	return out
}

// addSamples tallies a melt's samples and adds the examined ones as points.
func addSamples(sys *System, rec *meltbook.MeltRecord) {
	comp := make(map[string]float64, len(rec.Melt.Nominal))
	for _, f := range rec.Melt.Nominal {
		if f.Fraction > 0 {
			comp[f.Element] = f.Fraction
		}
	}
	var rate float64
	if rec.CoolingRateKPerS != nil {
		rate = *rec.CoolingRateKPerS
	}
	bySample := make(map[string]*meltbook.SampleRecord, len(rec.Samples))
	for i := range rec.Samples {
		bySample[rec.Samples[i].Code] = &rec.Samples[i]
	}
	// annealed reports whether a sample or a piece it was cut from was
	// annealed; depth bounds the walk against a cycle of parents.
	var annealed func(code string, depth int) bool
	annealed = func(code string, depth int) bool {
		s, ok := bySample[code]
		if !ok || depth > len(rec.Samples) {
			return false
		}
		for _, st := range s.Steps {
			if st.Kind == meltbook.Anneal {
				return true
			}
		}
		return s.ParentCode != "" && annealed(s.ParentCode, depth+1)
	}
	best := FoundNothing
	for _, s := range rec.Samples {
		a := annealed(s.Code, 0)
		sys.Samples++
		if f := finding(s); f < best {
			best = f
		}
		out, ok := SampleOutcome(s)
		if !ok {
			continue
		}
		sys.Examined++
		sys.Points = append(sys.Points, suggest.Point{Code: s.Code, Composition: comp, CoolingRateKPerS: rate, Outcome: out, Annealed: a})
	}
	sys.ByFinding[best]++
}

// Window returns the published e/a window of the system's family with the
// valences of scheme, when scheme counts the system's elements as the
// window's source did; otherwise nil and why not.
func (s System) Window(scheme element.Scheme) (*suggest.Window, *descriptor.Window, string) {
	for _, w := range descriptor.Windows() {
		if !w.Matches(s.Mean) {
			continue
		}
		v := map[string]float64{}
		for _, el := range s.Elements {
			x, ok := scheme.ValenceOf(el)
			if !ok {
				return nil, nil, fmt.Sprintf("the %s scheme has no valence for %s", scheme.Name, el)
			}
			if src, ok := w.Valences[el]; !ok || math.Abs(src-x) > 0.01 {
				return nil, nil, fmt.Sprintf("the %s window counts %s differently from the %s scheme", w.Family, el, scheme.Name)
			}
			v[el] = x
		}
		return &suggest.Window{Low: w.Low, High: w.High, Scheme: scheme.Name, Valences: v}, &w, ""
	}
	return nil, nil, "no published e/a window is held for this family"
}

// ErrTooFew says a system has too few examined samples to suggest from.
var ErrTooFew = errors.New("too few examined samples")

// MinPoints is the fewest examined samples Next suggests from.
const MinPoints = 3

// Next ranks compositions to melt next in the system, with its e/a window
// under scheme when one applies (see Window). opts starts from
// suggest.DefaultOptions; its Elements and Window are set here.
func (s System) Next(scheme element.Scheme, opts suggest.Options) (suggest.Result, *suggest.Window, error) {
	if len(s.Points) < MinPoints {
		return suggest.Result{}, nil, fmt.Errorf("%s: %w (%d; at least %d)", s.Name, ErrTooFew, len(s.Points), MinPoints)
	}
	win, _, _ := s.Window(scheme)
	opts.Elements = s.Elements
	opts.Window = win
	res, err := suggest.Suggest(s.Points, opts)
	if err != nil {
		return res, win, fmt.Errorf("%s: %w", s.Name, err)
	}
	return res, win, nil
}

package seed

import (
	"math"
	"math/rand/v2"
	"time"

	"meltbook/analysis/descriptor"
)

// system is one alloy system of the invented lab: how the lab chose its
// compositions and ran its furnaces, and the hidden truth that decides
// what formed.
type system struct {
	name     string
	elements []string
	melts    int
	from, to time.Time
	// leads are the operators who melt this system, the first most often.
	leads []int

	// The lab's choices: a search centre that moves from start to goal over
	// the campaign with a spread that narrows from spread0 to spread1
	// (atomic fraction, applied to every element but the first), and
	// literature anchors picked now and then. Choices are rounded to
	// 0.5 at.% and kept inside [low, high] per element.
	start, goal       vec
	spread0, spread1  float64
	anchors           []vec
	anchorShare       float64
	low, high         vec
	wheelSpeed        [2]float64 // m/s range the lab used
	composition       func(r *rand.Rand, s *system, progress float64) vec
	nominalPrecision  int  // decimals the lab writes, 1 for 0.5 at.% steps
	balanceByOperator bool // the balance-notation habit applies

	// The truth: the icosahedral phase forms with probability
	//   p = iMax · exp(−d²/(2·iSigma²)) · W(e/a) · C(rate)
	// with d the distance to the segment iRegion, W the soft e/a window of
	// the family when descriptor knows one (edge width eaSoft), C a
	// cooling-rate factor.
	icosa    phase
	iRegion  [2]vec
	iSigma   float64
	iMax     float64
	eaSoft   float64
	coolingC func(s *system, st sample) float64
	// special lists the non-icosahedral structures that may form first
	// (amorphous, decagonal, approximant), in order.
	special func(s *system, st sample) []chance
	// annealedI gives the icosahedral probability after an anneal.
	annealedI func(s *system, st sample) float64
	// compete names the crystalline phases that take the rest.
	compete func(s *system, st sample) []phase
	// win is the family's e/a window from descriptor, when hasWin.
	win    descriptor.Window
	hasWin bool
	// refs are log10 cooling rates the truth refers to, set at start from
	// the cooling estimate of reference ribbons (see calibrate).
	refs map[string]float64

	// Process.
	induction bool
	liquidusC float64 // approximate liquidus near the target, °C
	// meltLoss is the mean fraction of each element's charge lost in
	// melting (drawn ±35 % per melt).
	meltLoss     []float64
	purity       []float64 // mass fraction
	massG        [2]float64
	annealC      [2]float64
	annealH      [2]float64
	annealShare  float64
	annealAtmos  string
	annealNotes  []string
	cautionNotes []string
}

// Campaign dates.
func day(month time.Month, d int) time.Time { return time.Date(2026, month, d, 0, 0, 0, 0, time.UTC) }

// The invented lab's systems. Compositions in at.%; literature anchors are
// compositions commonly cited for each family (from memory); the truth's
// region and widths are invented for the demonstration, placed where the
// published quasicrystals are.
func systems() []*system {
	return []*system{alCuFe(), alCuFeSi(), alPdMn(), alMnSi(), znMgY()}
}

// around draws a composition near the moving centre, or a literature
// anchor.
func around(r *rand.Rand, s *system, progress float64) vec {
	if r.Float64() < s.anchorShare {
		return append(vec(nil), s.anchors[r.IntN(len(s.anchors))]...)
	}
	t := math.Min(1, 1.5*progress)
	sigma := s.spread0 + (s.spread1-s.spread0)*t
	x := make(vec, len(s.elements))
	var rest float64
	for i := 1; i < len(x); i++ {
		c := s.start[i] + t*(s.goal[i]-s.start[i])
		x[i] = c + sigma*r.NormFloat64()
		rest += x[i]
	}
	x[0] = 1 - rest
	return x
}

func alCuFe() *system {
	return &system{
		name: "Al-Cu-Fe", elements: []string{"Al", "Cu", "Fe"}, melts: 40,
		from: day(time.January, 12), to: day(time.June, 26), leads: []int{opAiko, opFemi, opMarit},
		start: at(65, 20, 15), goal: at(62.5, 24.5, 13), spread0: 0.025, spread1: 0.007,
		anchors: []vec{at(65, 20, 15), at(63, 25, 12), at(62, 25.5, 12.5), at(62.5, 24.5, 13),
			at(60, 30, 10), at(70, 20, 10)},
		anchorShare: 0.2, low: at(55, 15, 7), high: at(75, 32, 18), wheelSpeed: [2]float64{18, 42},
		composition: around, nominalPrecision: 1, balanceByOperator: true,

		// As-quenched i-phase from Tsai's Al65Cu20Fe15 to Al62Cu25.5Fe12.5.
		icosa: icosaF, iRegion: [2]vec{at(65, 20, 15), at(62, 25.5, 12.5)}, iSigma: 0.013, iMax: 0.95, eaSoft: 0.015,
		coolingC: func(*system, sample) float64 { return 1 },
		special:  func(*system, sample) []chance { return nil },
		annealedI: func(s *system, st sample) float64 {
			// Above about 750 °C only the stable region around
			// Al62.5Cu24.5Fe13-Al62Cu25.5Fe12.5 stays single icosahedral;
			// Al65Cu20Fe15 turns two-phase (Calvayrac et al., J. Phys. France
			// 51, 417 (1990), read from the abstract). Below, the as-spun
			// state mostly persists.
			if st.annealC >= 750 {
				d := distanceToSegment(st.x, at(62.5, 24.5, 13), at(62, 25.5, 12.5))
				return 0.97 * gauss(d, 0.009) * s.window(st)
			}
			return 0.9 * s.asSpunI(st)
		},
		compete: func(_ *system, st sample) []phase {
			al, cu, fe := st.x[0], st.x[1], st.x[2]
			switch {
			case al < 0.615 || cu > 0.265:
				return []phase{betaAlCuFe, lambdaAlFe}
			case fe > 0.135:
				return []phase{lambdaAlFe, betaAlCuFe}
			case al > 0.66 && fe < 0.11:
				return []phase{omegaAlCuFe, thetaAl2Cu}
			case al > 0.65:
				return []phase{lambdaAlFe, omegaAlCuFe}
			}
			return []phase{betaAlCuFe, lambdaAlFe}
		},

		liquidusC: 1100, meltLoss: []float64{0.003, 0.001, 0},
		purity: []float64{0.99999, 0.9999, 0.9997}, massG: [2]float64{8, 12},
		annealC: [2]float64{600, 850}, annealH: [2]float64{2, 200}, annealShare: 0.4,
		annealAtmos: "sealed silica, evacuated and backfilled with Ar",
	}
}

func alCuFeSi() *system {
	return &system{
		name: "Al-Cu-Fe-Si", elements: []string{"Al", "Cu", "Fe", "Si"}, melts: 14,
		from: day(time.June, 1), to: day(time.October, 16), leads: []int{opYusuf, opAiko},
		anchors:     []vec{at(55, 25.5, 12.5, 7), at(60.5, 25, 12.5, 2), at(58, 25.5, 12.5, 4)},
		anchorShare: 0.3, low: at(50, 22, 10, 0.5), high: at(64, 28, 15, 10), wheelSpeed: [2]float64{20, 40},
		composition: func(r *rand.Rand, s *system, progress float64) vec {
			if r.Float64() < s.anchorShare {
				return append(vec(nil), s.anchors[r.IntN(len(s.anchors))]...)
			}
			// Si replaces Al at fixed Cu25.5Fe12.5, stepping up the Si
			// content over the campaign.
			si := 0.01 + 0.07*progress + 0.01*r.NormFloat64()
			cu := 0.255 + 0.005*r.NormFloat64()
			fe := 0.125 + 0.005*r.NormFloat64()
			return vec{1 - si - cu - fe, cu, fe, si}
		},
		nominalPrecision: 1,

		// As-quenched icosahedral Al55Si7Cu25.5Fe12.5 (and its 1/1
		// approximant after annealing) are published (J. Phys.: Condens.
		// Matter 15 (2003), read from the abstract); the segment joins it
		// to the ternary i-phase.
		icosa: icosaF, iRegion: [2]vec{at(62.5, 25, 12.5, 0), at(55, 25.5, 12.5, 7)}, iSigma: 0.012, iMax: 0.9,
		coolingC: func(*system, sample) float64 { return 1 },
		special: func(s *system, st sample) []chance {
			si := st.x[3]
			if !st.annealed || st.annealC < 650 || si < 0.04 {
				return nil
			}
			d := distanceToSegment(st.x, s.iRegion[0], s.iRegion[1])
			p := 0.9 * gauss(d, 0.015) * logistic((si-0.05)/0.005)
			return []chance{{phase: alphaAlCuFeS, p: p, fraction: [2]float64{0.6, 1}}}
		},
		annealedI: func(s *system, st sample) float64 {
			if st.annealC >= 650 && st.x[3] >= 0.05 {
				return 0.1 * s.asSpunI(st)
			}
			return s.asSpunI(st)
		},
		compete: func(_ *system, st sample) []phase {
			al, cu, fe := st.x[0]+st.x[3], st.x[1], st.x[2]
			switch {
			case al < 0.615 || cu > 0.265:
				return []phase{betaAlCuFe, lambdaAlFe}
			case fe > 0.135:
				return []phase{lambdaAlFe, betaAlCuFe}
			}
			return []phase{betaAlCuFe, lambdaAlFe}
		},

		liquidusC: 1080, meltLoss: []float64{0.003, 0.001, 0, 0},
		purity: []float64{0.99999, 0.9999, 0.9997, 0.99999}, massG: [2]float64{8, 12},
		annealC: [2]float64{650, 850}, annealH: [2]float64{4, 120}, annealShare: 0.6,
		annealAtmos: "sealed silica, evacuated and backfilled with Ar",
	}
}

func alPdMn() *system {
	return &system{
		name: "Al-Pd-Mn", elements: []string{"Al", "Pd", "Mn"}, melts: 34,
		from: day(time.February, 9), to: day(time.August, 28), leads: []int{opDario, opFemi},
		start: at(70, 20, 10), goal: at(70, 21, 9), spread0: 0.02, spread1: 0.007,
		anchors: []vec{at(70.5, 21, 8.5), at(70, 20, 10), at(71, 20, 9), at(72, 19.5, 8.5),
			at(70, 13, 17), at(69, 22, 9)},
		anchorShare: 0.25, low: at(64, 10, 5), high: at(76, 26, 20), wheelSpeed: [2]float64{18, 40},
		composition: around, nominalPrecision: 1, balanceByOperator: true,

		icosa: icosaF, iRegion: [2]vec{at(70, 21, 9), at(70.5, 20.5, 9)}, iSigma: 0.012, iMax: 0.92, eaSoft: 0.015,
		coolingC: func(*system, sample) float64 { return 1 },
		special: func(_ *system, st sample) []chance {
			// The stable decagonal phase near Al70Pd13Mn17 (from memory).
			d := distanceToSegment(st.x, at(70, 13, 17), at(70, 13, 17))
			return []chance{{phase: decagonal, p: 0.85 * gauss(d, 0.015), fraction: [2]float64{0.5, 0.95}}}
		},
		annealedI: func(s *system, st sample) float64 { return math.Min(0.97, 1.05*s.asSpunI(st)) },
		compete: func(_ *system, st sample) []phase {
			al, pd, mn := st.x[0], st.x[1], st.x[2]
			switch {
			case mn > 0.13 && pd < 0.17:
				return []phase{xiAlPdMn, al6Mn}
			case al < 0.69 || pd > 0.22:
				return []phase{betaAlPdMn, xiAlPdMn}
			case al > 0.72:
				return []phase{al6Mn, aluminium}
			}
			return []phase{xiAlPdMn, betaAlPdMn}
		},

		liquidusC: 980, meltLoss: []float64{0.003, 0, 0.025},
		purity: []float64{0.99999, 0.9995, 0.999}, massG: [2]float64{5, 8},
		annealC: [2]float64{700, 800}, annealH: [2]float64{4, 100}, annealShare: 0.35,
		annealAtmos: "sealed silica under Ar",
	}
}

func alMnSi() *system {
	return &system{
		name: "Al-Mn-Si", elements: []string{"Al", "Mn", "Si"}, melts: 22,
		from: day(time.April, 13), to: day(time.September, 25), leads: []int{opYusuf, opMarit},
		start: at(74, 20, 6), goal: at(74, 20, 6), spread0: 0.025, spread1: 0.015,
		anchors:     []vec{at(74, 20, 6), at(86, 14, 0), at(80, 20, 0), at(72.5, 17.5, 10)},
		anchorShare: 0.3, low: at(65, 12, 0), high: at(88, 24, 12), wheelSpeed: [2]float64{15, 50},
		composition: around, nominalPrecision: 1,

		// Metastable P-type i-phase by rapid quenching (Al86Mn14 and
		// Al74Mn20Si6 are the classic compositions, from memory); it needs
		// the thinner ribbons. No e/a window is held for Al-Mn-Si.
		icosa: icosaP, iRegion: [2]vec{at(80, 20, 0), at(73, 20, 7)}, iSigma: 0.025, iMax: 0.9,
		coolingC: func(s *system, st sample) float64 {
			return logistic((st.logRate - s.refs["i"]) / 0.04)
		},
		special: func(s *system, st sample) []chance {
			if st.annealed {
				// The i-phase turns into the α 1/1 cubic approximant (Elser
				// & Henley 1985) when Si is present, otherwise into Al6Mn.
				if st.x[2] < 0.03 {
					return nil
				}
				return []chance{{phase: alphaAlMnSi, p: 0.95, fraction: [2]float64{0.6, 0.9}}}
			}
			// Slower ribbons give the decagonal T-phase instead (from memory).
			d := distanceToSegment(st.x, at(80, 20, 0), at(76, 20, 4))
			p := 0.7 * logistic((s.refs["i"]-st.logRate)/0.04) * gauss(d, 0.04)
			return []chance{{phase: decagonal, p: p, fraction: [2]float64{0.3, 0.8}}}
		},
		annealedI: func(s *system, st sample) float64 {
			if st.annealC < 500 && st.hours < 2 {
				return 0.5 * s.asSpunI(st)
			}
			return 0.03
		},
		compete: func(_ *system, st sample) []phase {
			if st.annealed || st.x[1] < 0.2 {
				return []phase{aluminium, al6Mn}
			}
			return []phase{al4Mn, al6Mn}
		},

		liquidusC: 1150, meltLoss: []float64{0.003, 0.025, 0},
		purity: []float64{0.99999, 0.999, 0.99999}, massG: [2]float64{6, 10},
		annealC: [2]float64{450, 600}, annealH: [2]float64{1, 24}, annealShare: 0.45,
		annealAtmos: "sealed silica under Ar",
	}
}

func znMgY() *system {
	return &system{
		name: "Zn-Mg-Y", elements: []string{"Zn", "Mg", "Y"}, melts: 26,
		from: day(time.March, 16), to: day(time.October, 23), leads: []int{opMarit, opDario},
		start: at(60, 30, 10), goal: at(58.5, 32.5, 9), spread0: 0.025, spread1: 0.01,
		anchors:     []vec{at(60, 30, 10), at(57, 34.5, 8.5), at(50, 42, 8), at(62, 22, 16), at(66, 28, 6)},
		anchorShare: 0.25, low: at(45, 20, 4), high: at(70, 45, 18), wheelSpeed: [2]float64{15, 48},
		composition: around, nominalPrecision: 1,

		// Stable F-type i-phase near Zn60Mg30Y10 to Zn57Mg34.5Y8.5 (from
		// memory); e/a = 2 + x_Y under valences Zn 2, Mg 2, Y 3.
		icosa: icosaF, iRegion: [2]vec{at(60, 30, 10), at(57, 34.5, 8.5)}, iSigma: 0.015, iMax: 0.9, eaSoft: 0.01,
		coolingC: func(*system, sample) float64 { return 1 },
		special: func(s *system, st sample) []chance {
			if st.annealed {
				return nil
			}
			// Mg-rich ribbons spun fast come off amorphous (invented rule).
			p := 0.8 * logistic((st.logRate-s.refs["amorphous"])/0.04) * logistic((st.x[1]-0.34)/0.015)
			return []chance{{phase: amorphous, p: p, fraction: [2]float64{0.5, 1}}}
		},
		annealedI: func(s *system, st sample) float64 {
			d := distanceToSegment(st.x, s.iRegion[0], s.iRegion[1])
			return s.iMax * gauss(d, s.iSigma) * s.window(st)
		},
		compete: func(_ *system, st sample) []phase {
			zn, mg, y := st.x[0], st.x[1], st.x[2]
			switch {
			case y > 0.13:
				return []phase{wMgZnY, mgZn2}
			case zn > 0.63:
				return []phase{mgZn2, zinc}
			case mg > 0.36:
				return []phase{mg7Zn3, mgZn2}
			}
			return []phase{hZnMgY, mgZn2}
		},

		induction: true, liquidusC: 650, meltLoss: []float64{0.03, 0.07, 0},
		purity: []float64{0.9999, 0.9995, 0.999}, massG: [2]float64{8, 12},
		annealC: [2]float64{380, 480}, annealH: [2]float64{10, 200}, annealShare: 0.4,
		annealAtmos: "sealed Ta tube inside evacuated silica",
		annealNotes: []string{"Ta tube because Mg vapour attacks bare silica."},
		cautionNotes: []string{
			"Mg and Y pieces stored under Ar until weighed; swarf and fines go in the metal-fire bin, not the bench bin (local rules first).",
			"Zn/Mg condensate on the chamber wall wiped down wet with extraction on, gloves and mask as in the risk assessment.",
		},
	}
}

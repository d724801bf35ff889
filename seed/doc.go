// Package seed invents meltbook's demonstration notebook: a fictional lab,
// the Rapid Solidification Group of the Quillmere Institute for Materials,
// with five invented operators and 136 melts from January to October 2026
// in five alloy systems (Al-Cu-Fe, Al-Cu-Fe-Si, Al-Pd-Mn, Al-Mn-Si and
// Zn-Mg-Y). No run, name or number comes from a real laboratory.
//
// Generate(seed) is deterministic: math/rand/v2's PCG seeded with the
// caller's seed plans the campaigns, and each run then draws from its own
// PCG stream, so the same seed gives the same notebook value for value.
// The result is plain domain values (meltbook.Melt, ProcessStep, ...), not
// written to any store; Notebook.Document turns it into a store document
// for store.ImportDocument, keeping the invented times and writing one
// "create" history entry per row.
//
// # Codes
//
// Melts are numbered in the order they were made: QR-0001, QR-0002, ...
// ("QR" for Quillmere ribbons). A piece of a ribbon annealed later extends
// its melt's code: QR-0042.a1, QR-0042.a2.
//
// # Process
//
// Aluminium alloys are arc-melted (3-5 remelts, 150-250 A, Ar after a Ti
// getter); Zn-Mg-Y, whose Zn and Mg would boil under the arc, is induction
// melted in a closed crucible (an "other" step). Every melt is then spun:
// Cu or (from June) CuBe wheel at 15-50 m/s, 0.6-1.0 mm orifice, 0.2-1 mm
// gap, 20-60 kPa ejection over-pressure, melt 100-200 K above an
// approximate liquidus, He or Ar at 30-50 kPa. Ribbon thickness falls with
// wheel speed roughly as v^−0.8 (an invented fit, 18-65 µm), width 1-3 mm.
// The cooling rate is the lab's estimate from analysis/cooling with its
// default interface coefficient. Weigh-outs come from analysis/weighout
// with the rule-of-thumb loss allowances; the melting losses of the truth
// (Mn 2.5 %, Zn 3 %, Mg 7 % of the charge) exceed them for Zn and Mg, so
// measured compositions come out a little poor in those.
//
// # The hidden truth
//
// What formed in each sample is drawn from a model invented for the demo,
// placed where the published quasicrystals are:
//
//	p(icosahedral) = p_max · exp(−d²/(2σ²)) · W(e/a) · C(rate)
//
// d is the distance (sqrt(½ Σ Δx²), as in analysis/suggest) from the actual
// composition to a short segment of known i-phase compositions; W is 1
// inside the family's published e/a window held by analysis/descriptor
// (Raynor valences) and falls off as a Gaussian outside it; C is a
// cooling-rate factor. Per system:
//
//   - Al-Cu-Fe: F-type i-phase from Al65Cu20Fe15 to Al62Cu25.5Fe12.5,
//     window 1.70-1.80; competing β-Al(Cu,Fe) (B2), λ-Al13Fe4, ω-Al7Cu2Fe,
//     θ-Al2Cu by side of the region. Anneals at 750 °C or more keep the
//     i-phase only near Al62.5Cu24.5Fe13-Al62Cu25.5Fe12.5.
//   - Al-Cu-Fe-Si: Si for Al up to about 8 at.%; as-spun i-phase, and after
//     an anneal at 650 °C or more with 5 at.% Si or more, a 1/1 cubic
//     approximant (P). No e/a window is held for it.
//   - Al-Pd-Mn: F-type i-phase near Al70Pd21Mn9, window 1.60-1.80; a
//     decagonal phase near Al70Pd13Mn17; β (B2), ξ′ and Al6Mn elsewhere.
//   - Al-Mn-Si: metastable P-type i-phase only in ribbons thinner than about
//     28 µm (C is a steep logistic in log rate); slower ribbons give the
//     decagonal phase; anneals turn it into the α-Al-Mn-Si 1/1 cubic
//     approximant (P) when Si is present. No e/a window is held.
//   - Zn-Mg-Y: F-type i-phase near Zn60Mg30Y10-Zn57Mg34.5Y8.5, window
//     2.00-2.15 (e/a = 2 + x_Y); Mg-rich ribbons thinner than about 26 µm
//     come off partly amorphous; W-Mg3Zn3Y2, MgZn2, Mg7Zn3, Zn and the
//     hexagonal H phase compete.
//
// Whatever the icosahedral phase leaves is shared among the competing
// phases, fractions rounded to 0.05. About 6 % of spins fail (nozzle clog
// or chamber leak: no ribbon to examine; brittle flakes: examined anyway).
//
// # Outcomes
//
// Every outcome is a person's, confirmed. A result the lab could not
// settle is an icosahedral outcome without a fraction whose evidence starts
// with Tentative + ":" (see Tentative). Electron diffraction, on some
// samples, records the symmetries of the main structured phase: 2-, 3- and
// 5-fold for icosahedral, 10- and 2-fold for decagonal, 3- and 2-fold for
// the cubic approximants.
//
// Notes are written in the operators' own voices and carry the usual
// bench cautions (Mg and Y fines, Zn and Mg condensate, Be dust from CuBe
// wheels) while deferring to local rules.
package seed

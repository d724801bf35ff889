package seed

import (
	"fmt"
	"hash/fnv"
	"math"
	"math/rand/v2"
	"sort"
	"strings"
	"time"

	"meltbook"
	"meltbook/analysis/indexing"
	"meltbook/analysis/indexing/icosa"
	"meltbook/analysis/phaselib"
	"meltbook/analysis/powder"
)

// Scan is an invented powder diffraction scan of one sample, as the lab's
// diffractometer exports it: a two-column XY text, 2θ in degrees and counts,
// taken with Cu Kα1/Kα2 (the file, like most XY files, does not say so).
type Scan struct {
	Sample   string
	System   string
	FileName string
	Data     []byte
	// MeasuredAt is when the lab measured and imported it; Operator who.
	MeasuredAt time.Time
	Operator   string
}

// Scan geometry of the invented diffractometer: Cu Kα1 and Kα2 in Å
// (Hölzer et al., Phys. Rev. A 56, 4554 (1997)), intensity ratio one half
// (common practice), 2θ from 15° to 90° in steps of 0.02°.
const (
	scanKa1      = 1.5405929
	scanKa2      = 1.5444274
	scanKa2Ratio = 0.5
	scanFromDeg  = 15.0
	scanToDeg    = 90.0
	scanStepDeg  = 0.02
	// scansPerSystem is how many samples of each alloy system get a scan.
	scansPerSystem = 10
)

// quasilatticeA is the quasilattice constant a_R (Å) of each system's
// icosahedral phase in the invented world, near the values quoted for the
// real families: analysis/indexing.ReferenceFamilies for Al-Cu-Fe (used for
// Al-Cu-Fe-Si too), Al-Pd-Mn and Al-Mn-Si; for Zn-Mg-Y 5.19 Å, from memory
// of the values quoted for i-Zn-Mg-RE phases (about 5.2 Å).
var quasilatticeA = map[string]float64{
	"Al-Cu-Fe":    4.46,
	"Al-Cu-Fe-Si": 4.46,
	"Al-Pd-Mn":    4.56,
	"Al-Mn-Si":    4.60,
	"Zn-Mg-Y":     5.19,
}

// cell is a crystal cell for the demo's crystalline phases: lengths in Å,
// the monoclinic angle β in degrees (90 otherwise), hexagonal when hex is
// set, and the centring (P, I, F or C) that removes reflections.
type cell struct {
	a, b, c, betaDeg float64
	hex              bool
	centring         byte
	// b2 gives the CsCl-type intensities: fundamentals (h+k+l even) strong,
	// superlattice lines weak; simple gives every allowed line one weight
	// (an elemental metal); otherwise each reflection gets an invented,
	// repeatable weight.
	b2, simple bool
	source     string
	// library names the phase-library structure whose computed lines (cell
	// and intensities) the demo draws instead; the fields above are then
	// only a description.
	library string
}

// crystalCells are the cells the demo draws its crystalline phases from,
// by the phase names of the truth model. Intensities are invented except
// where b2 or simple says otherwise; the cells are from memory, rounded.
var crystalCells = map[string]cell{
	"Al (fcc)":                    {a: 4.0495, centring: 'F', simple: true, source: "from memory: handbook value", library: "Al"},
	"β-Al(Cu,Fe) (B2, CsCl type)": {a: 2.91, centring: 'P', b2: true, source: "from memory: about 2.90-2.92 Å", library: "beta-Al(Cu,Fe)"},
	"β-Al(Pd,Mn) (B2, CsCl type)": {a: 3.04, centring: 'P', b2: true, source: "from memory: B2 AlPd about 3.05 Å"},
	"W-Mg3Zn3Y2 (cubic)":          {a: 6.84, centring: 'F', source: "from memory, approximate"},
	"θ-Al2Cu (tetragonal)":        {a: 6.067, b: 6.067, c: 4.877, centring: 'I', source: "from memory", library: "theta-Al2Cu"},
	"ω-Al7Cu2Fe (tetragonal)":     {a: 6.336, b: 6.336, c: 14.87, centring: 'P', source: "from memory"},
	"λ-Al13Fe4 (monoclinic)":      {a: 15.49, b: 8.08, c: 12.48, betaDeg: 107.7, centring: 'C', source: "from memory"},
	"ξ′-Al-Pd-Mn (orthorhombic)":  {a: 23.5, b: 16.6, c: 12.6, centring: 'P', source: "from memory, approximate"},
	"Al6Mn (orthorhombic)":        {a: 6.50, b: 7.55, c: 8.87, centring: 'C', source: "from memory", library: "Al6Mn"},
	"μ-Al4Mn (hexagonal)":         {a: 19.98, c: 24.67, hex: true, centring: 'P', source: "from memory"},
	"MgZn2 (C14 Laves)":           {a: 5.22, c: 8.57, hex: true, centring: 'P', source: "from memory", library: "MgZn2"},
	"Mg7Zn3 (orthorhombic)":       {a: 14.08, b: 14.49, c: 14.03, centring: 'I', source: "from memory, approximate"},
	"Zn (hcp)":                    {a: 2.665, c: 4.947, hex: true, centring: 'P', source: "from memory", library: "Zn"},
	"H-Zn-Mg-Y (hexagonal)":       {a: 14.6, c: 8.7, hex: true, centring: 'P', source: "invented for the demo"},
}

// powderLine is one line of an invented pattern: its d-spacing (Å) and
// relative intensity, and the full width at half maximum in degrees 2θ.
type powderLine struct {
	d, intensity, fwhmDeg float64
}

// Scans invents powder scans for up to ten examined samples of each alloy
// system, chosen with the seed, each consistent with the phases the lab
// decided for the sample: the icosahedral phase's lines from the
// reflection families of analysis/indexing/icosa at the system's
// quasilattice constant, cubic approximants at 2·a_R·(q+pτ)/√(2+τ), the
// crystalline phases from the cells of crystalCells, an amorphous phase as
// a broad halo. Samples with a decagonal phase get no scan (the demo holds
// no decagonal pattern). The same seed gives the same files, byte for byte.
//
// The patterns are invented: line positions follow Bragg's law and the
// cells named, intensities follow simple rules stated beside each model.
func (nb *Notebook) Scans(seed uint64) ([]Scan, error) {
	type candidate struct {
		run      *Run
		sample   string
		made     time.Time
		outcomes []meltbook.Outcome
	}
	bySystem := map[string][]candidate{}
	var systems []string
	for i := range nb.Runs {
		r := &nb.Runs[i]
		add := func(code string, made time.Time, os []meltbook.Outcome) {
			if len(os) == 0 {
				return
			}
			for _, o := range os {
				if o.Kind == meltbook.Decagonal {
					return
				}
			}
			if _, ok := bySystem[r.System]; !ok {
				systems = append(systems, r.System)
			}
			bySystem[r.System] = append(bySystem[r.System], candidate{r, code, made, os})
		}
		add(r.Melt.Code, r.Melt.CreatedAt, r.Outcomes)
		for _, d := range r.Derived {
			add(d.Sample.Code, d.Sample.CreatedAt, d.Outcomes)
		}
	}
	rng := rand.New(rand.NewPCG(seed, 0x5ca115))
	var out []Scan
	for _, sys := range systems {
		cs := bySystem[sys]
		rng.Shuffle(len(cs), func(i, j int) { cs[i], cs[j] = cs[j], cs[i] })
		for _, c := range cs[:min(scansPerSystem, len(cs))] {
			lines, halo, err := samplePattern(sys, c.outcomes)
			if err != nil {
				return nil, fmt.Errorf("scan of %s: %w", c.sample, err)
			}
			op := c.run.Melt.Operator
			if len(c.outcomes) > 0 && c.outcomes[0].RecordedBy != "" {
				op = c.outcomes[0].RecordedBy
			}
			out = append(out, Scan{
				Sample: c.sample, System: sys, FileName: c.sample + "_xrd.xy",
				Data:       writeXY(c.sample, lines, halo, rand.New(rand.NewPCG(seed, hashString(c.sample)))),
				MeasuredAt: c.made.Add(26 * time.Hour), Operator: op,
			})
		}
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Sample < out[j].Sample })
	return out, nil
}

// hashString gives a repeatable 64-bit number for a text.
func hashString(s string) uint64 {
	h := fnv.New64a()
	h.Write([]byte(s))
	return h.Sum64()
}

// samplePattern returns the lines of every phase of a sample, each phase
// scaled to its fraction (a tentative one, without fraction, counts 0.3 and
// is drawn broad and weak), and the height of an amorphous halo (0: none).
func samplePattern(system string, os []meltbook.Outcome) ([]powderLine, float64, error) {
	var lines []powderLine
	halo := 0.0
	for _, o := range os {
		share, fwhm := 0.3, 0.35
		if o.Fraction != nil {
			share, fwhm = *o.Fraction, 0.14
		}
		var ls []powderLine
		switch o.Kind {
		case meltbook.Icosahedral:
			ls = icosahedralLines(o.Lattice, quasilatticeA[system], fwhm)
		case meltbook.Approximant:
			a := indexing.ApproximantFactor(indexing.Order{P: 1, Q: 1}) * quasilatticeA[system]
			if system == "Al-Mn-Si" {
				a = 12.68 // α-AlMnSi, Elser & Henley, Phys. Rev. Lett. 55, 2883 (1985)
			}
			ls = approximantLines(a, quasilatticeA[system], fwhm)
		case meltbook.Amorphous:
			halo += share
			continue
		case meltbook.Crystalline:
			c, ok := crystalCells[o.Name]
			if !ok {
				return nil, 0, fmt.Errorf("no cell for the crystalline phase %q", o.Name)
			}
			if c.library != "" {
				var err error
				if ls, err = libraryLines(c.library, fwhm); err != nil {
					return nil, 0, fmt.Errorf("phase %q: %w", o.Name, err)
				}
			} else {
				ls = crystalLines(o.Name, c, fwhm)
			}
		default:
			return nil, 0, fmt.Errorf("no pattern for a %s phase", o.Kind)
		}
		for _, l := range ls {
			l.intensity *= share
			lines = append(lines, l)
		}
	}
	return lines, halo, nil
}

// lorentzPolarisation is the Lorentz-polarisation factor of an unpolarised
// beam without monochromator at angle 2θ (degrees):
//
//	LP = (1 + cos² 2θ) / (sin² θ · cos θ)
//
// Reference: common practice (powder diffraction).
func lorentzPolarisation(twoThetaDeg float64) float64 {
	t := twoThetaDeg * math.Pi / 360
	c2 := math.Cos(2 * t)
	return (1 + c2*c2) / (math.Sin(t) * math.Sin(t) * math.Cos(t))
}

// twoThetaOf is 2θ in degrees of spacing d (Å) for Cu Kα1, ok false when
// out of reach.
func twoThetaOf(d float64) (float64, bool) {
	s := scanKa1 / (2 * d)
	if s >= 1 {
		return 0, false
	}
	return 2 * math.Asin(s) * 180 / math.Pi, true
}

// normalise scales line intensities so that the strongest is 1 and drops
// lines weaker than the floor (a fraction of the strongest) or outside the
// scan.
func normalise(ls []powderLine, floor float64) []powderLine {
	top := 0.0
	var in []powderLine
	for _, l := range ls {
		if tt, ok := twoThetaOf(l.d); ok && tt >= scanFromDeg && tt <= scanToDeg {
			in = append(in, l)
			top = math.Max(top, l.intensity)
		}
	}
	var out []powderLine
	for _, l := range in {
		if l.intensity/top >= floor {
			l.intensity /= top
			out = append(out, l)
		}
	}
	return out
}

// icosahedralLines lists the lines of an icosahedral phase of lattice type
// P or F with quasilattice constant aR (Å). Intensities follow a common
// rough model (from memory): multiplicity times a fall-off with the
// perpendicular-space component, the Fourier transform of the atomic
// surfaces,
//
//	I ∝ m · exp(−(|G⊥|·a6 / 0.18)²) · LP(2θ)
//
// keeping the lines of at least 2 % of the strongest, the ones a laboratory
// scan of a ribbon shows.
func icosahedralLines(lattice string, aR, fwhm float64) []powderLine {
	lat := icosa.Primitive
	if lattice == "F" {
		lat = icosa.FaceCentred
	}
	a6 := aR * math.Sqrt2
	maxParallel := a6 * 2 * math.Sin(scanToDeg*math.Pi/360) / scanKa1
	var ls []powderLine
	for _, f := range icosa.Families(lat, maxParallel, 0.5) {
		d := a6 / f.Parallel
		tt, ok := twoThetaOf(d)
		if !ok {
			continue
		}
		w := float64(f.Multiplicity) * math.Exp(-math.Pow(f.Perp/0.18, 2)) * lorentzPolarisation(tt)
		ls = append(ls, powderLine{d: d, intensity: w, fwhmDeg: fwhm})
	}
	return normalise(ls, 0.02)
}

// approximantLines lists the lines of a cubic P approximant of cell a (Å)
// whose icosahedral parent has quasilattice constant aR: each allowed line
// takes the intensity of the parent's lines near it in Q (within 1.5 %), so
// that its strong lines sit near the icosahedral strong ones, as they do in
// real approximants.
func approximantLines(a, aR, fwhm float64) []powderLine {
	parent := icosahedralLines("P", aR, fwhm)
	var ls []powderLine
	maxS := int(math.Pow(2*a*math.Sin(scanToDeg*math.Pi/360)/scanKa1, 2))
	for s := 1; s <= maxS; s++ {
		if !sumOfThreeSquares(s) {
			continue
		}
		d := a / math.Sqrt(float64(s))
		w := 0.0
		for _, p := range parent {
			rel := math.Abs(p.d-d) / d
			w += p.intensity * math.Exp(-math.Pow(rel/0.006, 2))
		}
		ls = append(ls, powderLine{d: d, intensity: w, fwhmDeg: fwhm})
	}
	return normalise(ls, 0.03)
}

// sumOfThreeSquares reports whether s = h² + k² + l² for some integers.
func sumOfThreeSquares(s int) bool {
	for h := 0; h*h <= s; h++ {
		for k := 0; h*h+k*k <= s; k++ {
			l := int(math.Round(math.Sqrt(float64(s - h*h - k*k))))
			if h*h+k*k+l*l == s {
				return true
			}
		}
	}
	return false
}

// libraryLines lists the lines the phase library computes for a phase
// from its structure (see analysis/phaselib and analysis/powder) at the
// demo's Kα1, keeping those of at least 0.5 % of the strongest in range.
func libraryLines(key string, fwhm float64) ([]powderLine, error) {
	lib, err := phaselib.Builtin()
	if err != nil {
		return nil, err
	}
	p, err := lib.Find(key)
	if err != nil {
		return nil, err
	}
	lines, err := p.Lines(powder.Options{WavelengthA: scanKa1, TwoThetaMaxDeg: scanToDeg})
	if err != nil {
		return nil, err
	}
	ls := make([]powderLine, 0, len(lines))
	for _, l := range lines {
		ls = append(ls, powderLine{d: l.DSpacingA, intensity: l.Intensity, fwhmDeg: fwhm})
	}
	return normalise(ls, 0.005), nil
}

// crystalLines lists the lines of a crystalline phase: every reflection
// the centring allows, summed over equal d (so that multiplicity counts),
// or for a complex cell one invented weight per line, times LP and a
// Debye-Waller-like fall-off exp(−2B s²) with B = 1 Å² and s = 1/(2d).
func crystalLines(name string, c cell, fwhm float64) []powderLine {
	b, cc, beta := c.b, c.c, c.betaDeg
	if b == 0 {
		b = c.a
	}
	if cc == 0 {
		cc = c.a
	}
	if beta == 0 {
		beta = 90
	}
	dMin := scanKa1 / (2 * math.Sin(scanToDeg*math.Pi/360))
	sinB, cosB := math.Sin(beta*math.Pi/180), math.Cos(beta*math.Pi/180)
	inv2 := func(h, k, l int) float64 {
		fh, fk, fl := float64(h), float64(k), float64(l)
		if c.hex {
			return 4.0/3*(fh*fh+fh*fk+fk*fk)/(c.a*c.a) + fl*fl/(cc*cc)
		}
		return (fh*fh/(c.a*c.a) + fk*fk*sinB*sinB/(b*b) + fl*fl/(cc*cc) - 2*fh*fl*cosB/(c.a*cc)) / (sinB * sinB)
	}
	hMax, kMax, lMax := int(c.a/dMin)+1, int(b/dMin)+1, int(cc/dMin)+1
	groups := map[int64]*powderLine{}
	for h := -hMax; h <= hMax; h++ {
		for k := -kMax; k <= kMax; k++ {
			for l := -lMax; l <= lMax; l++ {
				if h == 0 && k == 0 && l == 0 || !allowed(c.centring, h, k, l) {
					continue
				}
				q2 := inv2(h, k, l)
				if q2 <= 0 || 1/math.Sqrt(q2) < dMin {
					continue
				}
				d := 1 / math.Sqrt(q2)
				w := 1.0
				if c.b2 && (h+k+l)%2 != 0 {
					w = 0.12
				}
				key := int64(math.Round(d * 1e4))
				if g, ok := groups[key]; ok {
					g.intensity += w
				} else {
					groups[key] = &powderLine{d: d, intensity: w, fwhmDeg: fwhm}
				}
			}
		}
	}
	var ls []powderLine
	for key, g := range groups {
		tt, ok := twoThetaOf(g.d)
		if !ok {
			continue
		}
		if !c.b2 && !c.simple {
			g.intensity = inventedWeight(name, key)
		}
		s := 1 / (2 * g.d)
		g.intensity *= lorentzPolarisation(tt) * math.Exp(-2*s*s)
		ls = append(ls, *g)
	}
	sort.Slice(ls, func(i, j int) bool { return ls[i].d > ls[j].d })
	floor := 0.005
	if !c.b2 && !c.simple {
		// Complex cells: keep the lines a laboratory scan shows clearly.
		floor = 0.2
	}
	return normalise(ls, floor)
}

// allowed applies the centring's reflection conditions: I h+k+l even; F
// h, k, l all odd or all even; C h+k even.
//
// Reference: International Tables for Crystallography Vol. A, general
// reflection conditions (common practice).
func allowed(centring byte, h, k, l int) bool {
	switch centring {
	case 'I':
		return (h+k+l)%2 == 0
	case 'F':
		return (h%2 == 0) == (k%2 == 0) && (k%2 == 0) == (l%2 == 0)
	case 'C':
		return (h+k)%2 == 0
	}
	return true
}

// inventedWeight is a repeatable weight in (0, 1] for the line of a named
// phase at d-spacing key (10⁻⁴ Å), mostly small with a few strong lines,
// as real patterns of complex phases look. It is invented.
func inventedWeight(name string, key int64) float64 {
	f := fnv.New64a()
	f.Write([]byte(name))
	f.Write([]byte(fmt.Sprint(key)))
	u := float64(f.Sum64()%1_000_000) / 1_000_000
	return 0.05 + math.Pow(u, 4)
}

// writeXY draws the pattern: a background falling from low angle, each line
// as a Gaussian Kα1 peak with its Kα2 partner at the Bragg angle of Kα2
// (half as high), a halo for an amorphous share, and Poisson counting noise
// from rng.
func writeXY(sample string, lines []powderLine, haloShare float64, rng *rand.Rand) []byte {
	var b strings.Builder
	fmt.Fprintf(&b, "# %s  Quillmere RSG powder diffractometer, Bragg-Brentano\n", sample)
	b.WriteString("# 2Theta(deg)  Counts\n")
	const peakCounts = 3200.0
	n := int(math.Round((scanToDeg - scanFromDeg) / scanStepDeg))
	type peak struct{ centre, sigma, height float64 }
	var ps []peak
	for _, l := range lines {
		for _, w := range []struct{ lambda, scale float64 }{{scanKa1, 1}, {scanKa2, scanKa2Ratio}} {
			s := w.lambda / (2 * l.d)
			if s >= 1 {
				continue
			}
			ps = append(ps, peak{2 * math.Asin(s) * 180 / math.Pi, l.fwhmDeg / (2 * math.Sqrt(2*math.Ln2)), w.scale * peakCounts * l.intensity})
		}
	}
	// A metallic glass halo near Q = 2.75 Å⁻¹ (invented, in the range where
	// metallic glasses scatter), 6.5° wide.
	haloCentre := 2 * math.Asin(2.75*scanKa1/(4*math.Pi)) * 180 / math.Pi
	haloSigma := 6.5 / (2 * math.Sqrt(2*math.Ln2))
	for i := 0; i <= n; i++ {
		tt := scanFromDeg + scanStepDeg*float64(i)
		y := 90 + 260*math.Exp(-(tt-scanFromDeg)/12)
		y += haloShare * 900 * math.Exp(-(tt-haloCentre)*(tt-haloCentre)/(2*haloSigma*haloSigma))
		for _, p := range ps {
			if d := tt - p.centre; math.Abs(d) < 8*p.sigma {
				y += p.height * math.Exp(-d*d/(2*p.sigma*p.sigma))
			}
		}
		fmt.Fprintf(&b, "%.2f %d\n", tt, poissonCount(rng, y))
	}
	return []byte(b.String())
}

// poissonCount draws a count of mean mu: Knuth's method below 30, the
// normal approximation above.
func poissonCount(rng *rand.Rand, mu float64) int {
	if mu > 30 {
		return max(0, int(math.Round(mu+math.Sqrt(mu)*rng.NormFloat64())))
	}
	l, k, p := math.Exp(-mu), 0, 1.0
	for {
		p *= rng.Float64()
		if p <= l {
			return k
		}
		k++
	}
}

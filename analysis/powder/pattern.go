package powder

import (
	"cmp"
	"fmt"
	"math"
	"math/cmplx"
	"slices"

	"meltbook"
	"meltbook/analysis/crystal"
)

// Line is one computed powder line: a family of reflections at its Bragg
// angle.
type Line struct {
	Reflection
	TwoThetaDeg float64 // 2θ in degrees
	F2          float64 // |F|² of one member of the family, e², displacement included
	LP          float64 // Lorentz–polarisation factor
	Intensity   float64 // Multiplicity·F2·LP (arbitrary absolute scale)
}

// Options sets up a pattern calculation.
type Options struct {
	WavelengthA              float64 // X-ray wavelength in Å, required, e.g. 1.5405929 (Cu Kα1)
	TwoThetaMaxDeg           float64 // largest 2θ in degrees, in (0°, 180°); 120° when 0
	MonochromatorTwoThetaDeg float64 // 2θ of a crystal monochromator in degrees, in [0°, 180°); 0 for none
}

// DefaultTwoThetaMaxDeg is the 2θ limit used when Options.TwoThetaMaxDeg
// is zero.
const DefaultTwoThetaMaxDeg = 120

// Pattern computes the powder lines of structure s from the first
// reflection up to Options.TwoThetaMaxDeg, in order of increasing 2θ
// (the order of Reflections).
//
// Each family of Reflections with d ≥ λ/(2 sin θmax) gives a line at
//
//	sinθ = λ/(2d),   s = sinθ/λ = 1/(2d)
//
// with the structure factor of one member over every atom of the cell
// (Structure.Atoms), occupancy included,
//
//	F(h) = Σⱼ occⱼ f0ⱼ(s) exp(−Bⱼ s²) exp(2πi h·xⱼ),   Bⱼ = 8π² Uⱼ
//
// (f0 from ScatteringFactor; no anomalous dispersion), and the intensity
//
//	I = m |F|² LP,   LP = (1 + cos²2θm cos²2θ) / (sin²θ cosθ (1 + cos²2θm))
//
// where m is the multiplicity and 2θm the monochromator angle. LP is the
// powder Lorentz factor 1/(sin²θ cosθ) of a Bragg–Brentano
// diffractometer times the polarisation factor for an unpolarised tube
// beam and an ideally mosaic monochromator crystal whose plane of
// diffraction is that of the sample (2θm = 0: no monochromator, factor
// (1 + cos²2θ)/2). Absorption, preferred orientation and extinction are
// not included. Lines beyond 2θmax are dropped.
//
// Errors: a wavelength that is not positive, limits out of range, an
// invalid cell or site, an element without a form factor, or a limit that
// reaches beyond s = 2 Å⁻¹, where the form-factor fit ends.
//
// Reference: International Tables for Crystallography Vol. C, §6.2.2
// (Lorentz and polarisation factors) and §6.1.1 (form factors);
// L. V. Azároff, Acta Cryst. 8, 701 (1955) (polarisation with a crystal
// monochromator).
func Pattern(s crystal.Structure, opt Options) ([]Line, error) {
	lambda := opt.WavelengthA
	if !(lambda > 0) || math.IsInf(lambda, 0) {
		return nil, meltbook.Errorf(meltbook.Invalid, "wavelength", "%g Å is not a positive wavelength", lambda)
	}
	tthMax := opt.TwoThetaMaxDeg
	if tthMax == 0 {
		tthMax = DefaultTwoThetaMaxDeg
	}
	if !(tthMax > 0 && tthMax < 180) {
		return nil, meltbook.Errorf(meltbook.Invalid, "2θ maximum", "%g° is not an angle in (0°, 180°): LP grows without bound at 180°", opt.TwoThetaMaxDeg)
	}
	mono := opt.MonochromatorTwoThetaDeg
	if !(mono >= 0 && mono < 180) {
		return nil, meltbook.Errorf(meltbook.Invalid, "monochromator 2θ", "%g° is not an angle in [0°, 180°)", mono)
	}
	if err := s.Validate(); err != nil {
		return nil, err
	}
	sinMax := math.Sin(tthMax * math.Pi / 360)
	if sMax := sinMax / lambda; sMax > MaxSinThetaOverLambda {
		return nil, meltbook.Errorf(meltbook.Invalid, "2θ maximum", "%g° at λ = %g Å reaches sinθ/λ = %.3g Å⁻¹, beyond the %g Å⁻¹ range of the form-factor fit", tthMax, lambda, sMax, MaxSinThetaOverLambda)
	}
	sc, err := newScatterers(s)
	if err != nil {
		return nil, err
	}
	fams, err := families(s, lambda/(2*sinMax))
	if err != nil {
		return nil, err
	}
	c2m := math.Cos(mono * math.Pi / 180)
	c2m *= c2m
	f2 := sc.structureFactors(fams)
	lines := make([]Line, 0, len(fams))
	for i, f := range fams {
		sinT := lambda / (2 * f.DSpacingA) // ≤ sin θmax (1 + 1e-12) < 1
		theta := math.Asin(sinT)
		tth := 2 * theta * 180 / math.Pi
		if tth > tthMax*(1+1e-12) {
			continue
		}
		c2t := math.Cos(2 * theta)
		cosT := math.Cos(theta)
		lp := (1 + c2m*c2t*c2t) / (sinT * sinT * cosT * (1 + c2m))
		lines = append(lines, Line{
			Reflection:  f.Reflection,
			TwoThetaDeg: tth,
			F2:          f2[i],
			LP:          lp,
			Intensity:   float64(f.Multiplicity) * f2[i] * lp,
		})
	}
	return lines, nil
}

// scatterers holds what the structure factor needs: the atoms grouped by
// site, each site's weight terms, and tables of exp(2πi n x) per atom.
type scatterers struct {
	elements []formFactor // distinct elements
	bs       []float64    // distinct B = 8π²U, Å²
	sites    []scatterSite
	natoms   int
	limit    [3]int
	phase    [3][]complex128 // phase[axis][(n+limit)·natoms + atom] = exp(2πi n x_atom)
	f0, dw   []float64       // scratch: f0 per element, exp(−B s²) per B
	fract    [][3]float64
}

type scatterSite struct {
	occupancy     float64
	element, b    int // indexes into elements and bs
	first, beyond int // atoms [first, beyond)
}

// newScatterers looks up every site's element and collects the atoms.
func newScatterers(s crystal.Structure) (*scatterers, error) {
	sc := &scatterers{}
	elementIndex := map[string]int{}
	bIndex := map[float64]int{}
	for _, site := range s.Sites {
		ff, ok := lookupFormFactor(site.Element)
		if !ok {
			return nil, meltbook.Errorf(meltbook.Invalid, fmt.Sprintf("site %s element", site.Label), "%q is not an element from H to U with a tabulated X-ray form factor", site.Element)
		}
		ei, ok := elementIndex[ff.Symbol]
		if !ok {
			ei = len(sc.elements)
			elementIndex[ff.Symbol] = ei
			sc.elements = append(sc.elements, ff)
		}
		b := 8 * math.Pi * math.Pi * site.UisoA2
		bi, ok := bIndex[b]
		if !ok {
			bi = len(sc.bs)
			bIndex[b] = bi
			sc.bs = append(sc.bs, b)
		}
		sc.sites = append(sc.sites, scatterSite{occupancy: site.Occupancy, element: ei, b: bi})
	}
	atoms := s.Atoms()
	// Atoms comes site by site; keep it so whatever its order, since each
	// site's atoms are summed as one run.
	slices.SortStableFunc(atoms, func(a, b crystal.Atom) int { return cmp.Compare(a.Site, b.Site) })
	sc.natoms = len(atoms)
	sc.fract = make([][3]float64, len(atoms))
	for i := range sc.sites {
		sc.sites[i].first = -1
	}
	for j, a := range atoms {
		sc.fract[j] = a.Fract
		st := &sc.sites[a.Site]
		if st.first < 0 {
			st.first = j
		}
		st.beyond = j + 1
	}
	for i := range sc.sites {
		if sc.sites[i].first < 0 {
			sc.sites[i].first, sc.sites[i].beyond = 0, 0
		}
	}
	sc.f0 = make([]float64, len(sc.elements))
	sc.dw = make([]float64, len(sc.bs))
	return sc, nil
}

// structureFactors returns |F|² of each family's representative. The
// phase exp(2πi (hx + ky + lz)) of each atom is the product of three
// tabulated factors; families are taken in groups of equal (h, k) so that
// the product of the first two is formed once per group.
func (sc *scatterers) structureFactors(fams []family) []float64 {
	for _, f := range fams {
		for i, v := range f.HKL {
			if v < 0 {
				v = -v
			}
			sc.limit[i] = max(sc.limit[i], v)
		}
	}
	n := sc.natoms
	for axis := 0; axis < 3; axis++ {
		lim := sc.limit[axis]
		t := make([]complex128, (2*lim+1)*n)
		for j, x := range sc.fract {
			e := cmplx.Rect(1, 2*math.Pi*x[axis])
			p := complex(1, 0)
			t[lim*n+j] = p
			for m := 1; m <= lim; m++ {
				if m%16 == 0 {
					// a fresh value now and then keeps rounding from piling up
					p = cmplx.Rect(1, 2*math.Pi*float64(m)*x[axis])
				} else {
					p *= e
				}
				t[(lim+m)*n+j] = p
				t[(lim-m)*n+j] = cmplx.Conj(p)
			}
		}
		sc.phase[axis] = t
	}

	// Counting sort of the families by (h, k).
	nk := 2*sc.limit[1] + 1
	start := make([]int, (2*sc.limit[0]+1)*nk+1)
	bucket := func(h [3]int) int { return (h[0]+sc.limit[0])*nk + h[1] + sc.limit[1] }
	for _, f := range fams {
		start[bucket(f.HKL)+1]++
	}
	for i := 1; i < len(start); i++ {
		start[i] += start[i-1]
	}
	order := make([]int, len(fams))
	fill := make([]int, len(start))
	copy(fill, start)
	for i, f := range fams {
		b := bucket(f.HKL)
		order[fill[b]] = i
		fill[b]++
	}

	out := make([]float64, len(fams))
	pxy := make([]complex128, n)
	for b := 0; b+1 < len(start); b++ {
		group := order[start[b]:start[b+1]]
		if len(group) == 0 {
			continue
		}
		h := fams[group[0]].HKL
		px := sc.phase[0][(h[0]+sc.limit[0])*n : (h[0]+sc.limit[0]+1)*n]
		py := sc.phase[1][(h[1]+sc.limit[1])*n : (h[1]+sc.limit[1]+1)*n]
		for j := range pxy {
			pxy[j] = px[j] * py[j]
		}
		for _, i := range group {
			l := fams[i].HKL[2]
			pz := sc.phase[2][(l+sc.limit[2])*n : (l+sc.limit[2]+1)*n]
			out[i] = sc.f2(pxy, pz, 1/(2*fams[i].DSpacingA))
		}
	}
	return out
}

// f2 returns |F|² at s = sinθ/λ from the atoms' phases pxy·pz.
func (sc *scatterers) f2(pxy, pz []complex128, s float64) float64 {
	s2 := s * s
	for i, e := range sc.elements {
		sc.f0[i] = e.at(s)
	}
	for i, b := range sc.bs {
		sc.dw[i] = math.Exp(-b * s2)
	}
	var f complex128
	for _, st := range sc.sites {
		var sum complex128
		for j := st.first; j < st.beyond; j++ {
			sum += pxy[j] * pz[j]
		}
		w := st.occupancy * sc.f0[st.element] * sc.dw[st.b]
		f += complex(w, 0) * sum
	}
	return real(f)*real(f) + imag(f)*imag(f)
}

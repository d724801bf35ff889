package seed

import (
	"math"

	"meltbook"
)

// vec is a composition as atomic fractions in a system's element order.
type vec []float64

// phase is one phase the truth model can produce, with the rotational
// symmetries electron diffraction of it would show.
type phase struct {
	kind    meltbook.PhaseKind
	lattice string
	order   string
	name    string
	folds   []int
}

// The phases of the invented world. Names follow the usual labels in the
// literature of each system (common practice); crystal systems from memory.
var (
	icosaF    = phase{kind: meltbook.Icosahedral, lattice: "F", folds: []int{2, 3, 5}}
	icosaP    = phase{kind: meltbook.Icosahedral, lattice: "P", folds: []int{2, 3, 5}}
	decagonal = phase{kind: meltbook.Decagonal, folds: []int{2, 10}}
	amorphous = phase{kind: meltbook.Amorphous}

	betaAlCuFe   = crystal("β-Al(Cu,Fe) (B2, CsCl type)", 2, 3, 4)
	lambdaAlFe   = crystal("λ-Al13Fe4 (monoclinic)", 2)
	omegaAlCuFe  = crystal("ω-Al7Cu2Fe (tetragonal)", 2, 4)
	thetaAl2Cu   = crystal("θ-Al2Cu (tetragonal)", 2, 4)
	betaAlPdMn   = crystal("β-Al(Pd,Mn) (B2, CsCl type)", 2, 3, 4)
	xiAlPdMn     = crystal("ξ′-Al-Pd-Mn (orthorhombic)", 2)
	al6Mn        = crystal("Al6Mn (orthorhombic)", 2)
	al4Mn        = crystal("μ-Al4Mn (hexagonal)", 2, 6)
	aluminium    = crystal("Al (fcc)", 2, 3, 4)
	wMgZnY       = crystal("W-Mg3Zn3Y2 (cubic)", 2, 3, 4)
	mgZn2        = crystal("MgZn2 (C14 Laves)", 2, 6)
	mg7Zn3       = crystal("Mg7Zn3 (orthorhombic)", 2)
	zinc         = crystal("Zn (hcp)", 2, 6)
	hZnMgY       = crystal("H-Zn-Mg-Y (hexagonal)", 2, 6)
	alphaAlMnSi  = phase{kind: meltbook.Approximant, lattice: "P", order: "1/1", name: "α-Al-Mn-Si (Pm-3)", folds: []int{2, 3}}
	alphaAlCuFeS = phase{kind: meltbook.Approximant, lattice: "P", order: "1/1", name: "α-Al-Cu-Fe-Si", folds: []int{2, 3}}
)

func crystal(name string, folds ...int) phase {
	return phase{kind: meltbook.Crystalline, name: name, folds: folds}
}

// sample is what the truth model knows about one piece: its actual (not
// nominal) composition, e/a, cooling rate and heat treatment.
type sample struct {
	x        vec
	ea       float64 // raynor e/a
	logRate  float64 // log10 of the cooling rate in K/s
	annealed bool
	annealC  float64 // anneal temperature, °C
	hours    float64
}

// chance is a phase with the probability that it forms and how much of
// the sample it takes when it does.
type chance struct {
	phase    phase
	p        float64
	fraction [2]float64
}

// distanceToSegment is the distance d = sqrt(½ Σ (x − p)²) from x to the
// nearest point p of the segment ab (a = b for a point), the distance used
// by analysis/suggest: moving δ of fraction between two elements is δ.
func distanceToSegment(x, a, b vec) float64 {
	var ab2, t float64
	for i := range x {
		d := b[i] - a[i]
		ab2 += d * d
		t += (x[i] - a[i]) * d
	}
	if ab2 > 0 {
		t = math.Max(0, math.Min(1, t/ab2))
	} else {
		t = 0
	}
	var s float64
	for i := range x {
		d := x[i] - (a[i] + t*(b[i]-a[i]))
		s += d * d
	}
	return math.Sqrt(s / 2)
}

// gauss is exp(−d²/(2σ²)).
func gauss(d, sigma float64) float64 { return math.Exp(-d * d / (2 * sigma * sigma)) }

// logistic is 1/(1 + e^(−z)).
func logistic(z float64) float64 { return 1 / (1 + math.Exp(-z)) }

// softWindow is 1 inside [lo, hi] and falls off outside as a Gaussian of
// width s in the distance to the nearer edge:
//
//	W = exp(−(dist/s)²/2),  dist = max(0, lo − e/a, e/a − hi)
func softWindow(ea, lo, hi, s float64) float64 {
	d := math.Max(0, math.Max(lo-ea, ea-hi))
	return gauss(d, s)
}

// at makes a composition from atomic percentages.
func at(percent ...float64) vec {
	v := make(vec, len(percent))
	for i, p := range percent {
		v[i] = p / 100
	}
	return v
}

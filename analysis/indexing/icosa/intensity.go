package icosa

import "math"

// DefaultPhasonDebyeWaller is the default B⊥ of Intensity, in units of
// a6² (dimensionless): exp(−B⊥·(|G⊥|·a6)²) with B⊥ = 1 weakens a family
// at |G⊥|·a6 = 0.45 by 18 % and one at 0.8 by 47 %. At a6 = 6.3 Å it is
// B⊥ ≈ 40 Å², of the order reported for as-grown icosahedral phases (from
// memory; published values range from a few to about a hundred Å²). It is
// kept mild on purpose: the spherical window already sets the fall-off, and
// a large B⊥ would hide the weak high-|G⊥| lines that real patterns show.
const DefaultPhasonDebyeWaller = 1.0

// triacontahedronVolume is the volume of the rhombic triacontahedron of
// unit edge, 4√(5+2√5) ≈ 12.3107 (common practice; the solid is the
// zonohedron of the six 5-fold vectors, ten prolate and ten oblate golden
// rhombohedra).
var triacontahedronVolume = 4 * math.Sqrt(5+2*math.Sqrt(5))

// WindowVolume returns the volume, in units of a6³, of the atomic surface
// (acceptance window) of the simplest cut-and-project model of lattice
// type lat, one window per lattice node:
//
//	P: V = 4√(5+2√5)·(a6/√2)³ ≈ 4.3525 a6³
//	F: V = 2·V_P        I: V = V_P / 2
//
// For P the window is the projection onto perpendicular space of the unit
// cell of the direct hypercubic lattice, whose six edges project to 5-fold
// vectors of length a6/√2: the rhombic triacontahedron of edge a6/√2. The
// module's point density in physical space is V/V₆ with V₆ the volume of
// the direct 6D primitive cell. In the P setting of a6 the F module's
// direct lattice has points of even index sum (V₆ = 2a6⁶) and the I
// module's direct lattice adds the body centre (V₆ = a6⁶/2); the windows
// here scale with V₆ so that every type fills physical space at the
// density of the P tiling of the same a6.
//
// Reference: V. Elser, Acta Cryst. A42, 36 (1986) (the window as the
// projected hypercube); C. Janot, Quasicrystals: A Primer, 2nd ed., Oxford
// (1994), ch. 4 (atomic surfaces and the density rule) — from memory.
func WindowVolume(lat Lattice) float64 {
	v := triacontahedronVolume / (2 * math.Sqrt2)
	switch lat {
	case Primitive:
		return v
	case FaceCentred:
		return 2 * v
	case BodyCentred:
		return v / 2
	}
	panic("icosa: unknown lattice " + lat.String())
}

// WindowRadius returns the radius, in units of a6, of the sphere with the
// volume of the lattice type's window (see WindowVolume):
//
//	R = (3V / 4π)^(1/3)   (P: R ≈ 1.0131 a6, F: 1.2764 a6, I: 0.8041 a6)
//
// Reference: see WindowVolume.
func WindowRadius(lat Lattice) float64 {
	return math.Cbrt(3 * WindowVolume(lat) / (4 * math.Pi))
}

// SphereFormFactor returns the Fourier transform of a uniform ball,
// normalised to 1 at x = 0:
//
//	g(x) = 3 (sin x − x cos x) / x³,   x = 2π·|G⊥|·R
//
// with R the radius of the ball. It is zero first at x ≈ 4.4934.
//
// Reference: common practice (the form factor of a uniform sphere, e.g.
// A. Guinier, X-Ray Diffraction, Freeman (1963), §10); for spherical
// atomic surfaces, C. Janot, Quasicrystals: A Primer, 2nd ed. (1994),
// ch. 4 (from memory).
func SphereFormFactor(x float64) float64 {
	x = math.Abs(x)
	if x < 1e-3 {
		// 1 − x²/10 + x⁴/280 − …
		return 1 - x*x/10 + x*x*x*x/280
	}
	return 3 * (math.Sin(x) - x*math.Cos(x)) / (x * x * x)
}

// Radii of the P window (the rhombic triacontahedron of edge e = a6/√2)
// relative to the radius of the sphere of its volume, 1.4324·e: its
// in-radius τ²/√(1+τ²)·e = 1.3764·e (the centres of the faces) and its
// largest radius τ·e = 1.6180·e (the 5-fold vertices). Common practice
// (solid geometry of the rhombic triacontahedron).
var (
	windowInner = Tau * Tau / math.Sqrt(1+Tau*Tau) / math.Cbrt(3*triacontahedronVolume/(4*math.Pi))
	windowOuter = Tau / math.Cbrt(3*triacontahedronVolume/(4*math.Pi))
)

// radiusSteps is the number of radii the window form factor is averaged
// over (midpoint rule).
const radiusSteps = 8

// WindowFormFactor2 returns the squared form factor of the window of
// lattice type lat at perpendicular wave number perp = |G⊥|·a6: the
// squared sphere form factor averaged over radii r spread evenly between
// the in-radius and the 5-fold radius of the triacontahedron, scaled to the
// lattice type's window (R = WindowRadius(lat)),
//
//	⟨g²⟩ = (1/n) Σₖ g(2π·perp·rₖ)²,  rₖ = R·(ρᵢ + (k+½)(ρₒ−ρᵢ)/n), k = 0…n−1
//
// with ρᵢ = 0.9609 and ρₒ = 1.1296 the triacontahedron's in-radius and
// largest radius over the equal-volume sphere's, n = 8. A polyhedral
// window's transform has no zeros on whole spheres of G⊥; the spread
// fills the zeros of the single sphere as the facets of the real window
// do, while ⟨g²⟩ follows g² closely below the first zero.
//
// Reference: common practice (sphere form factor, see SphereFormFactor;
// an average over a distribution of radii, as for polydisperse spheres).
func WindowFormFactor2(lat Lattice, perp float64) float64 {
	r := WindowRadius(lat)
	sum := 0.0
	for k := 0; k < radiusSteps; k++ {
		rho := windowInner + (float64(k)+0.5)*(windowOuter-windowInner)/radiusSteps
		g := SphereFormFactor(2 * math.Pi * perp * r * rho)
		sum += g * g
	}
	return sum / radiusSteps
}

// Intensity returns the predicted integrated intensity of the family,
// Lorentz–polarisation factor left out, in a model of one spherical
// atomic surface per node of the module of lattice type lat:
//
//	I = m · ⟨g(2π·|G⊥|·R)²⟩ · exp(−B⊥·(|G⊥|·a6)²)
//
// with m the multiplicity, g the sphere form factor, R = WindowRadius(lat)
// and ⟨⟩ the average over radii of WindowFormFactor2, and B⊥ (units of
// a6², see DefaultPhasonDebyeWaller) the phason Debye–Waller factor. The
// parallel-space atomic form factor and thermal Debye–Waller factor,
// common to all models, are left out.
//
// Reference: V. Elser, Acta Cryst. A42, 36 (1986) for the structure
// factor of a cut-and-project set as the window's Fourier transform at
// G⊥; C. Janot, Quasicrystals: A Primer, 2nd ed. (1994), ch. 4 (from
// memory).
func Intensity(f Family, lat Lattice, bPerp float64) float64 {
	return float64(f.Multiplicity) * WindowFormFactor2(lat, f.Perp) * math.Exp(-bPerp*f.Perp*f.Perp)
}

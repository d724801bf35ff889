package radiation

import "math"

const degree = math.Pi / 180

// TwoThetaToD returns the d-spacing in Å of a reflection seen at the
// diffraction angle twoThetaDeg (degrees) with wavelength lambdaA (Å):
//
//	d = λ / (2 sin θ)
//
// The angle must lie in (0°, 180°] and the wavelength be positive; otherwise
// the result is NaN.
//
// Reference: Bragg's law, W. L. Bragg, Proc. Camb. Phil. Soc. 17, 43 (1913).
func TwoThetaToD(twoThetaDeg, lambdaA float64) float64 {
	if !(twoThetaDeg > 0 && twoThetaDeg <= 180) || !(lambdaA > 0) || math.IsInf(lambdaA, 0) {
		return math.NaN()
	}
	return lambdaA / (2 * math.Sin(twoThetaDeg/2*degree))
}

// DToTwoTheta returns the diffraction angle 2θ in degrees at which planes of
// spacing dA (Å) reflect the wavelength lambdaA (Å):
//
//	2θ = 2 asin(λ / 2d)
//
// ok is false, and the angle NaN, when the reflection cannot be reached
// (λ/2d > 1) or an input is not positive and finite.
//
// Reference: Bragg's law, W. L. Bragg, Proc. Camb. Phil. Soc. 17, 43 (1913).
func DToTwoTheta(dA, lambdaA float64) (twoThetaDeg float64, ok bool) {
	if !(dA > 0) || !(lambdaA > 0) || math.IsInf(dA, 0) || math.IsInf(lambdaA, 0) {
		return math.NaN(), false
	}
	s := lambdaA / (2 * dA)
	if s > 1 {
		return math.NaN(), false
	}
	return 2 * math.Asin(s) / degree, true
}

// TwoThetaToQ returns the magnitude of the scattering vector in Å⁻¹:
//
//	Q = 4π sin θ / λ = 2π / d
//
// The angle must lie in [0°, 180°] and the wavelength be positive; otherwise
// the result is NaN.
//
// Reference: common practice.
func TwoThetaToQ(twoThetaDeg, lambdaA float64) float64 {
	if !(twoThetaDeg >= 0 && twoThetaDeg <= 180) || !(lambdaA > 0) || math.IsInf(lambdaA, 0) {
		return math.NaN()
	}
	return 4 * math.Pi * math.Sin(twoThetaDeg/2*degree) / lambdaA
}

// QToTwoTheta returns the angle 2θ in degrees at which the scattering vector
// of magnitude qPerA (Å⁻¹) is reached with wavelength lambdaA (Å):
//
//	2θ = 2 asin(Qλ / 4π)
//
// ok is false, and the angle NaN, when Qλ/4π > 1 or an input is negative or
// not finite.
//
// Reference: common practice.
func QToTwoTheta(qPerA, lambdaA float64) (twoThetaDeg float64, ok bool) {
	if !(qPerA >= 0) || !(lambdaA > 0) || math.IsInf(qPerA, 0) || math.IsInf(lambdaA, 0) {
		return math.NaN(), false
	}
	s := qPerA * lambdaA / (4 * math.Pi)
	if s > 1 {
		return math.NaN(), false
	}
	return 2 * math.Asin(s) / degree, true
}

// DToQ returns Q = 2π/d in Å⁻¹ for a d-spacing in Å (NaN unless d > 0).
//
// Reference: common practice.
func DToQ(dA float64) float64 {
	if !(dA > 0) {
		return math.NaN()
	}
	return 2 * math.Pi / dA
}

// QToD returns d = 2π/Q in Å for Q in Å⁻¹ (NaN unless Q > 0).
//
// Reference: common practice.
func QToD(qPerA float64) float64 {
	if !(qPerA > 0) {
		return math.NaN()
	}
	return 2 * math.Pi / qPerA
}

// DoubletTwoTheta returns the angle at which the second line of a doublet
// (wavelength lambda2A) reflects from the planes that send the first line
// (lambda1A) to twoTheta1Deg:
//
//	sin θ₂ = (λ₂/λ₁) sin θ₁
//
// ok is false, and the angle NaN, when the second line cannot reach those
// planes or an input is out of range.
//
// Reference: Bragg's law; common practice for the Kα1/Kα2 doublet.
func DoubletTwoTheta(twoTheta1Deg, lambda1A, lambda2A float64) (twoTheta2Deg float64, ok bool) {
	d := TwoThetaToD(twoTheta1Deg, lambda1A)
	if math.IsNaN(d) {
		return math.NaN(), false
	}
	return DToTwoTheta(d, lambda2A)
}

// DSU propagates a standard uncertainty of 2θ (degrees) into one of d (Å),
// at angle twoThetaDeg and wavelength lambdaA:
//
//	u(d) = d · cot θ · u(θ),  u(θ) = u(2θ)/2 in radians
//
// The result is NaN where d is undefined.
//
// Reference: first-order propagation of Bragg's law, common practice.
func DSU(twoThetaDeg, twoThetaSUDeg, lambdaA float64) float64 {
	d := TwoThetaToD(twoThetaDeg, lambdaA)
	theta := twoThetaDeg / 2 * degree
	return math.Abs(d/math.Tan(theta)) * twoThetaSUDeg / 2 * degree
}

package peaks

import (
	"fmt"
	"math"
)

// StripKalpha2 removes the Kα2 component from y measured at the increasing
// angles twoThetaDeg, given the Kα1 and Kα2 wavelengths (Å) and the
// intensity ratio I(Kα2)/I(Kα1). Working upwards in angle, each point loses
// ratio times the already stripped intensity at the angle whose Kα2
// reflection falls there:
//
//	I₁(2θ) = I(2θ) − R · I₁(2θ′),   sin θ′ = (λ₁/λ₂) sin θ
//
// with I₁(2θ′) interpolated linearly between points. Points whose 2θ′ lies
// before the first point are left as they are. Apply it to
// background-subtracted intensity: a flat background would otherwise lose
// the fraction R/(1+R) of its level. The result has the length of y.
//
// Reference: W. A. Rachinger, J. Sci. Instrum. 25, 254 (1948),
// doi:10.1088/0950-7671/25/7/125.
func StripKalpha2(twoThetaDeg, y []float64, lambda1A, lambda2A, ratio float64) []float64 {
	if len(twoThetaDeg) != len(y) {
		panic(fmt.Sprintf("peaks: StripKalpha2 with %d angles and %d intensities", len(twoThetaDeg), len(y)))
	}
	out := make([]float64, len(y))
	stripInto(out, twoThetaDeg, y, lambda1A, lambda2A, ratio)
	return out
}

func stripInto(out, x, y []float64, lambda1, lambda2, ratio float64) {
	k := lambda1 / lambda2
	j := 0
	for i := range y {
		out[i] = y[i]
		s := k * math.Sin(x[i]/2*degree)
		if s > 1 {
			continue
		}
		x1 := 2 * math.Asin(s) / degree
		if x1 < x[0] {
			continue
		}
		for j+1 < i && x[j+1] <= x1 {
			j++
		}
		f := (x1 - x[j]) / (x[j+1] - x[j])
		if j+1 == i {
			// 2θ′ lies between the previous point and this one, so the
			// interpolation involves the unknown I₁ here: solve
			// I₁ = I − R·((1−f)·I₁[j] + f·I₁).
			out[i] = (y[i] - ratio*(1-f)*out[j]) / (1 + ratio*f)
			continue
		}
		out[i] = y[i] - ratio*(out[j]+f*(out[j+1]-out[j]))
	}
}

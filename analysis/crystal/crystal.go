package crystal

import (
	"fmt"
	"math"

	"meltbook"
)

// System is a crystal system.
type System string

// The seven crystal systems.
const (
	Triclinic    System = "triclinic"
	Monoclinic   System = "monoclinic"
	Orthorhombic System = "orthorhombic"
	Tetragonal   System = "tetragonal"
	Trigonal     System = "trigonal"
	Hexagonal    System = "hexagonal"
	Cubic        System = "cubic"
)

// Cell is a unit cell: edges a, b, c in Å and angles α, β, γ in degrees.
type Cell struct {
	A, B, C            float64 // Å
	Alpha, Beta, Gamma float64 // degrees
}

// Validate checks that the edges are positive and that the angles make a
// cell of positive volume.
func (c Cell) Validate() error {
	for _, e := range []struct {
		name string
		v    float64
	}{{"a", c.A}, {"b", c.B}, {"c", c.C}} {
		if !(e.v > 0) || math.IsInf(e.v, 0) {
			return meltbook.Errorf(meltbook.Invalid, "cell "+e.name, "%g Å is not a positive length", e.v)
		}
	}
	for _, e := range []struct {
		name string
		v    float64
	}{{"alpha", c.Alpha}, {"beta", c.Beta}, {"gamma", c.Gamma}} {
		if !(e.v > 0 && e.v < 180) {
			return meltbook.Errorf(meltbook.Invalid, "cell "+e.name, "%g° is not an angle in (0°, 180°)", e.v)
		}
	}
	if !(c.volumeFactor() > 1e-6) {
		return meltbook.Errorf(meltbook.Invalid, "cell", "angles α = %g°, β = %g°, γ = %g° make no cell of positive volume", c.Alpha, c.Beta, c.Gamma)
	}
	return nil
}

func cosd(x float64) float64 { return math.Cos(x * math.Pi / 180) }
func sind(x float64) float64 { return math.Sin(x * math.Pi / 180) }

// volumeFactor is 1 − cos²α − cos²β − cos²γ + 2 cosα cosβ cosγ.
func (c Cell) volumeFactor() float64 {
	ca, cb, cg := cosd(c.Alpha), cosd(c.Beta), cosd(c.Gamma)
	return 1 - ca*ca - cb*cb - cg*cg + 2*ca*cb*cg
}

// Volume returns the cell volume in Å³:
//
//	V = abc·√(1 − cos²α − cos²β − cos²γ + 2 cosα cosβ cosγ)
//
// Reference: International Tables for Crystallography Vol. B, 1.1.2.
func (c Cell) Volume() float64 {
	return c.A * c.B * c.C * math.Sqrt(math.Max(c.volumeFactor(), 0))
}

// Metric returns the direct metric tensor G with Gᵢⱼ = aᵢ·aⱼ in Å².
//
// Reference: International Tables for Crystallography Vol. B, 1.1.2.
func (c Cell) Metric() [3][3]float64 {
	ca, cb, cg := cosd(c.Alpha), cosd(c.Beta), cosd(c.Gamma)
	return [3][3]float64{
		{c.A * c.A, c.A * c.B * cg, c.A * c.C * cb},
		{c.A * c.B * cg, c.B * c.B, c.B * c.C * ca},
		{c.A * c.C * cb, c.B * c.C * ca, c.C * c.C},
	}
}

// ReciprocalMetric returns G* = G⁻¹ in Å⁻², so that for a reflection h
//
//	1/d² = hᵀ G* h
//
// Reference: International Tables for Crystallography Vol. B, 1.1.3.
func (c Cell) ReciprocalMetric() [3][3]float64 {
	g := c.Metric()
	det := g[0][0]*(g[1][1]*g[2][2]-g[1][2]*g[2][1]) -
		g[0][1]*(g[1][0]*g[2][2]-g[1][2]*g[2][0]) +
		g[0][2]*(g[1][0]*g[2][1]-g[1][1]*g[2][0])
	var inv [3][3]float64
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			// cofactor of g[j][i]
			r0, r1 := (j+1)%3, (j+2)%3
			c0, c1 := (i+1)%3, (i+2)%3
			inv[i][j] = (g[r0][c0]*g[r1][c1] - g[r0][c1]*g[r1][c0]) / det
		}
	}
	return inv
}

// InverseDSquared returns 1/d² in Å⁻² of reflection (h, k, l):
//
//	1/d² = hᵀ G* h
//
// Reference: International Tables for Crystallography Vol. B, 1.1.3.
func (c Cell) InverseDSquared(h, k, l int) float64 {
	gs := c.ReciprocalMetric()
	v := [3]float64{float64(h), float64(k), float64(l)}
	s := 0.0
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			s += v[i] * gs[i][j] * v[j]
		}
	}
	return s
}

// DSpacing returns d in Å of reflection (h, k, l); +Inf for (0, 0, 0).
func (c Cell) DSpacing(h, k, l int) float64 {
	return 1 / math.Sqrt(c.InverseDSquared(h, k, l))
}

// Scaled returns the cell with every edge multiplied by f, angles kept.
func (c Cell) Scaled(f float64) Cell {
	c.A, c.B, c.C = c.A*f, c.B*f, c.C*f
	return c
}

// String writes the cell as "a = 6.067 Å, c = 4.877 Å" style text, giving
// only the constants the system leaves free.
func (c Cell) String(sys System) string {
	switch sys {
	case Cubic:
		return fmt.Sprintf("a = %.4g Å", c.A)
	case Tetragonal, Hexagonal:
		return fmt.Sprintf("a = %.4g Å, c = %.4g Å", c.A, c.C)
	case Trigonal:
		if c.Gamma > 119.9 && c.Gamma < 120.1 {
			return fmt.Sprintf("a = %.4g Å, c = %.4g Å", c.A, c.C)
		}
		return fmt.Sprintf("a = %.4g Å, α = %.4g°", c.A, c.Alpha)
	case Orthorhombic:
		return fmt.Sprintf("a = %.4g Å, b = %.4g Å, c = %.4g Å", c.A, c.B, c.C)
	case Monoclinic:
		return fmt.Sprintf("a = %.4g Å, b = %.4g Å, c = %.4g Å, β = %.4g°", c.A, c.B, c.C, c.Beta)
	}
	return fmt.Sprintf("a = %.4g Å, b = %.4g Å, c = %.4g Å, α = %.4g°, β = %.4g°, γ = %.4g°", c.A, c.B, c.C, c.Alpha, c.Beta, c.Gamma)
}

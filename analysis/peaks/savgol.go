package peaks

import (
	"fmt"

	"gonum.org/v1/gonum/mat"
)

// SavitzkyGolay holds the least-squares polynomial filter of one window
// and order: for each position t = −m … m within a window of 2m+1 equally
// spaced points, the weights that give the value at t of the polynomial of
// the given order fitted to the window.
type SavitzkyGolay struct {
	halfWidth, order int
	// pinv is the (order+1) × (2m+1) pseudo-inverse of the Vandermonde
	// matrix A[i][j] = (i − m)^j: row j gives polynomial coefficient j.
	pinv *mat.Dense
	// center holds the smoothing weights for the middle point; edge[t+m]
	// those for position t, used for the first and last m points.
	center []float64
	edge   [][]float64
}

// NewSavitzkyGolay builds the filter fitting polynomials of the given order
// to windows of 2·halfWidth + 1 points. It needs halfWidth ≥ 1 and
// 0 ≤ order ≤ 2·halfWidth.
//
// The weights are the rows of the least-squares pseudo-inverse
//
//	C = (AᵀA)⁻¹Aᵀ,  A[i][j] = (i − m)^j,  i = 0 … 2m, j = 0 … order
//
// computed by QR factorisation.
//
// Reference: A. Savitzky and M. J. E. Golay, Anal. Chem. 36, 1627 (1964),
// doi:10.1021/ac60214a047.
func NewSavitzkyGolay(halfWidth, order int) (*SavitzkyGolay, error) {
	if halfWidth < 1 {
		return nil, fmt.Errorf("savitzky-golay: half-width %d points; need at least 1", halfWidth)
	}
	w := 2*halfWidth + 1
	if order < 0 || order >= w {
		return nil, fmt.Errorf("savitzky-golay: polynomial order %d must be between 0 and %d for a %d-point window", order, w-1, w)
	}
	a := mat.NewDense(w, order+1, nil)
	for i := 0; i < w; i++ {
		t := float64(i - halfWidth)
		p := 1.0
		for j := 0; j <= order; j++ {
			a.Set(i, j, p)
			p *= t
		}
	}
	var qr mat.QR
	qr.Factorize(a)
	var pinv mat.Dense
	if err := qr.SolveTo(&pinv, false, eye(w)); err != nil {
		return nil, fmt.Errorf("savitzky-golay: %w", err)
	}
	sg := &SavitzkyGolay{halfWidth: halfWidth, order: order, pinv: &pinv}
	sg.edge = make([][]float64, w)
	for t := -halfWidth; t <= halfWidth; t++ {
		sg.edge[t+halfWidth] = sg.weightsAt(t, 0)
	}
	sg.center = sg.edge[halfWidth]
	return sg, nil
}

func eye(n int) *mat.Dense {
	m := mat.NewDense(n, n, nil)
	for i := 0; i < n; i++ {
		m.Set(i, i, 1)
	}
	return m
}

// Coefficients returns the weights that give the derivative-th derivative
// (in units of the step to that power) at the window's middle point:
// derivative 0 smooths. derivative must lie in [0, order].
func (sg *SavitzkyGolay) Coefficients(derivative int) []float64 {
	if derivative < 0 || derivative > sg.order {
		panic(fmt.Sprintf("peaks: Savitzky-Golay derivative %d outside [0, %d]", derivative, sg.order))
	}
	return sg.weightsAt(0, derivative)
}

// weightsAt returns the weights of the derivative-th derivative of the
// fitted polynomial at position t (−m … m) of the window:
//
//	w_i = Σ_j  j!/(j−d)! · t^(j−d) · C[j][i]
func (sg *SavitzkyGolay) weightsAt(t, derivative int) []float64 {
	w := 2*sg.halfWidth + 1
	out := make([]float64, w)
	for j := derivative; j <= sg.order; j++ {
		f := 1.0
		for k := j; k > j-derivative; k-- {
			f *= float64(k)
		}
		for k := 0; k < j-derivative; k++ {
			f *= float64(t)
		}
		if f == 0 {
			continue
		}
		for i := 0; i < w; i++ {
			out[i] += f * sg.pinv.At(j, i)
		}
	}
	return out
}

// VarianceFactor returns Σ c_i² of the smoothing weights: the factor by
// which the filter scales the variance of uncorrelated noise.
func (sg *SavitzkyGolay) VarianceFactor() float64 {
	s := 0.0
	for _, c := range sg.center {
		s += c * c
	}
	return s
}

// Smooth returns y smoothed by the filter. The first and last halfWidth
// points take the value of the polynomial fitted to the first or last full
// window. y needs at least 2·halfWidth + 1 points.
func (sg *SavitzkyGolay) Smooth(y []float64) ([]float64, error) {
	out := make([]float64, len(y))
	return out, sg.smoothInto(out, y)
}

func (sg *SavitzkyGolay) smoothInto(out, y []float64) error {
	m := sg.halfWidth
	n := len(y)
	if n < 2*m+1 {
		return fmt.Errorf("savitzky-golay: %d points, fewer than the %d-point window", n, 2*m+1)
	}
	c := sg.center
	for i := m; i < n-m; i++ {
		s := 0.0
		win := y[i-m : i+m+1]
		for k, ck := range c {
			s += ck * win[k]
		}
		out[i] = s
	}
	for i := 0; i < m; i++ {
		head := sg.edge[i]
		tail := sg.edge[2*m-i]
		var s, e float64
		for k := range head {
			s += head[k] * y[k]
			e += tail[k] * y[n-2*m-1+k]
		}
		out[i] = s
		out[n-1-i] = e
	}
	return nil
}

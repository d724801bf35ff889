package crystal

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"meltbook"
)

// fractionDenominator is the finest fraction of a cell edge a translation
// is recognised as: every translation of the 230 space groups in any
// setting of International Tables Vol. A is a multiple of 1/24.
const fractionDenominator = 24

// snapTolerance is how close a decimal translation (0.3333, 0.125) must be
// to a multiple of 1/24 to be taken as that fraction.
const snapTolerance = 5e-4

// ParseOperation reads a symmetry operation in the xyz form of CIF
// (_space_group_symop_operation_xyz, _symmetry_equiv_pos_as_xyz):
// three comma-separated expressions in x, y, z such as
//
//	x,y,z   -y,x-y,z+1/3   1/2+x, -y, z   x-y,-y,-z+1/2   +x,+y,+z
//
// Letters may be upper case, terms may come in any order, spaces are
// ignored and translations may be fractions (1/3) or decimals (0.3333,
// .25); a decimal within 5·10⁻⁴ of a multiple of 1/24 is taken as that
// fraction. Translations are kept as written (see Normalised).
//
// Reference: IUCr, CIF core dictionary, _space_group_symop_operation_xyz.
func ParseOperation(s string) (Operation, error) {
	var op Operation
	parts := strings.Split(s, ",")
	if len(parts) != 3 {
		return op, meltbook.Errorf(meltbook.Invalid, "symmetry operation", "%q does not have three comma-separated parts like x,y,z", s)
	}
	for i, p := range parts {
		row, t, err := parseOperationRow(p)
		if err != nil {
			return Operation{}, meltbook.Errorf(meltbook.Invalid, "symmetry operation", "%q: part %d %q: %s", s, i+1, strings.TrimSpace(p), err)
		}
		op.R[i] = row
		op.T[i] = t
	}
	if d := op.Determinant(); d != 1 && d != -1 {
		return Operation{}, meltbook.Errorf(meltbook.Invalid, "symmetry operation", "%q is not a symmetry operation: its matrix has determinant %d, not ±1", s, d)
	}
	return op, nil
}

// parseOperationRow reads one expression such as "-x+y+1/2".
func parseOperationRow(p string) (row [3]int, t float64, err error) {
	p = strings.ToLower(strings.Join(strings.Fields(p), ""))
	if p == "" {
		return row, 0, fmt.Errorf("is empty")
	}
	terms := 0
	for i := 0; i < len(p); {
		sign := 1
		if p[i] == '+' || p[i] == '-' {
			if p[i] == '-' {
				sign = -1
			}
			i++
		} else if terms > 0 {
			return row, 0, fmt.Errorf("needs + or - before %q", p[i:])
		}
		if i >= len(p) {
			return row, 0, fmt.Errorf("ends with a sign")
		}
		switch c := p[i]; {
		case c == 'x' || c == 'y' || c == 'z':
			row[c-'x'] += sign
			i++
		case c == '.' || (c >= '0' && c <= '9'):
			j := i
			for j < len(p) && (p[j] == '.' || p[j] == '/' || (p[j] >= '0' && p[j] <= '9')) {
				j++
			}
			v, nerr := parseTranslation(p[i:j])
			if nerr != nil {
				return row, 0, nerr
			}
			if j < len(p) && p[j] >= 'x' && p[j] <= 'z' {
				return row, 0, fmt.Errorf("coefficient %q before %c: only ±x, ±y, ±z terms are allowed", p[i:j], p[j])
			}
			if j < len(p) && p[j] == '*' {
				return row, 0, fmt.Errorf("coefficient %q: only ±x, ±y, ±z terms are allowed", p[i:j])
			}
			t += float64(sign) * v
			i = j
		default:
			return row, 0, fmt.Errorf("unexpected %q", string(c))
		}
		terms++
	}
	for _, r := range row {
		if r < -1 || r > 1 {
			return row, 0, fmt.Errorf("a coordinate appears more than once")
		}
	}
	if math.IsNaN(t) || math.IsInf(t, 0) {
		return row, 0, fmt.Errorf("translation is not a finite number")
	}
	return row, t, nil
}

// parseTranslation reads "1/2", "0.5", ".25" or "1".
func parseTranslation(s string) (float64, error) {
	if num, den, ok := strings.Cut(s, "/"); ok {
		n, err1 := strconv.Atoi(num)
		d, err2 := strconv.Atoi(den)
		if err1 != nil || err2 != nil || d <= 0 || len(num) > 6 || len(den) > 6 {
			return 0, fmt.Errorf("%q is not a fraction such as 1/2", s)
		}
		return float64(n) / float64(d), nil
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		return 0, fmt.Errorf("%q is not a number", s)
	}
	return snapFraction(v), nil
}

// snapFraction returns the nearest multiple of 1/24 when v is within
// snapTolerance of it, else v.
func snapFraction(v float64) float64 {
	n := math.Round(v * fractionDenominator)
	if math.Abs(v-n/fractionDenominator) <= snapTolerance {
		return n / fractionDenominator
	}
	return v
}

// Determinant returns det R: +1 for a proper operation, −1 for an improper
// one.
func (o Operation) Determinant() int {
	r := o.R
	return r[0][0]*(r[1][1]*r[2][2]-r[1][2]*r[2][1]) -
		r[0][1]*(r[1][0]*r[2][2]-r[1][2]*r[2][0]) +
		r[0][2]*(r[1][0]*r[2][1]-r[1][1]*r[2][0])
}

// Normalised returns the operation with each translation reduced into
// [0, 1): t ← t − ⌊t⌋, with values within 10⁻⁹ of 1 set to 0.
func (o Operation) Normalised() Operation {
	for i := range o.T {
		o.T[i] -= math.Floor(o.T[i])
		if o.T[i] >= 1-1e-9 {
			o.T[i] = 0
		}
	}
	return o
}

// Then returns the operation that applies o first and p after it:
//
//	x' = Rp·(Ro·x + to) + tp = (Rp·Ro)·x + (Rp·to + tp)
//
// Translations are not reduced.
//
// Reference: International Tables for Crystallography Vol. A, 1.2.2.
func (o Operation) Then(p Operation) Operation {
	return p.Compose(o)
}

// Compose returns o∘p, the operation that applies p first and o after it:
//
//	x' = Ro·(Rp·x + tp) + to = (Ro·Rp)·x + (Ro·tp + to)
//
// Translations are not reduced.
//
// Reference: International Tables for Crystallography Vol. A, 1.2.2.
func (o Operation) Compose(p Operation) Operation {
	var c Operation
	for i := 0; i < 3; i++ {
		c.T[i] = o.T[i]
		for j := 0; j < 3; j++ {
			c.T[i] += float64(o.R[i][j]) * p.T[j]
			for k := 0; k < 3; k++ {
				c.R[i][j] += o.R[i][k] * p.R[k][j]
			}
		}
	}
	return c
}

// Inverse returns the operation undoing o:
//
//	x = R⁻¹·x' − R⁻¹·t
//
// R⁻¹ is integral since det R = ±1; Inverse panics on a matrix of any
// other determinant (programmer misuse).
func (o Operation) Inverse() Operation {
	d := o.Determinant()
	if d != 1 && d != -1 {
		panic(fmt.Sprintf("crystal: inverse of an operation with determinant %d", d))
	}
	var inv Operation
	r := o.R
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			r0, r1 := (j+1)%3, (j+2)%3
			c0, c1 := (i+1)%3, (i+2)%3
			inv.R[i][j] = (r[r0][c0]*r[r1][c1] - r[r0][c1]*r[r1][c0]) * d
		}
	}
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			inv.T[i] -= float64(inv.R[i][j]) * o.T[j]
		}
	}
	return inv
}

// Equal reports whether o and p have the same matrix and translations that
// differ by at most tol in each component.
func (o Operation) Equal(p Operation, tol float64) bool {
	if o.R != p.R {
		return false
	}
	for i := range o.T {
		if math.Abs(o.T[i]-p.T[i]) > tol {
			return false
		}
	}
	return true
}

// EqualModLattice reports whether o and p have the same matrix and
// translations that differ by a lattice vector (whole numbers of cell
// edges) within tol in each component.
func (o Operation) EqualModLattice(p Operation, tol float64) bool {
	if o.R != p.R {
		return false
	}
	for i := range o.T {
		d := o.T[i] - p.T[i]
		if math.Abs(d-math.Round(d)) > tol {
			return false
		}
	}
	return true
}

// String writes the operation in the canonical xyz form: terms in the
// order x, y, z, then the translation as a reduced fraction when it is a
// multiple of 1/24 (else as a decimal), no spaces, e.g. "-y,x-y,z+1/3".
func (o Operation) String() string {
	var b strings.Builder
	for i := 0; i < 3; i++ {
		if i > 0 {
			b.WriteByte(',')
		}
		n := 0
		for j := 0; j < 3; j++ {
			c := o.R[i][j]
			if c == 0 {
				continue
			}
			switch {
			case c == -1:
				b.WriteByte('-')
			case c < 0:
				fmt.Fprintf(&b, "%d", c)
			case n > 0 && c == 1:
				b.WriteByte('+')
			case c > 1:
				if n > 0 {
					b.WriteByte('+')
				}
				fmt.Fprintf(&b, "%d", c)
			}
			b.WriteByte("xyz"[j])
			n++
		}
		t := o.T[i]
		if t != 0 || n == 0 {
			if t > 0 && n > 0 {
				b.WriteByte('+')
			}
			b.WriteString(formatTranslation(t))
		}
	}
	return b.String()
}

// formatTranslation writes t as "1/3", "-1/2", "1" or a decimal.
func formatTranslation(t float64) string {
	n := t * fractionDenominator
	if math.Abs(n-math.Round(n)) > 1e-6 {
		return strconv.FormatFloat(t, 'g', -1, 64)
	}
	num, den := int(math.Round(n)), fractionDenominator
	g := gcd(abs(num), den)
	num, den = num/g, den/g
	if den == 1 {
		return strconv.Itoa(num)
	}
	return fmt.Sprintf("%d/%d", num, den)
}

func gcd(a, b int) int {
	for b != 0 {
		a, b = b, a%b
	}
	return a
}

func abs(a int) int {
	if a < 0 {
		return -a
	}
	return a
}

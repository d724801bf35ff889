package crystal

import (
	"fmt"
	"strconv"
	"strings"

	"meltbook"
)

// hallDenominator is the common denominator of every translation a Hall
// symbol can produce: halves, thirds, quarters, sixths and the twelfths of
// an origin shift all are multiples of 1/24.
const hallDenominator = 24

// exactOp is an operation with its translation in 24ths of the cell edges,
// reduced into [0, 24), so that group closure is exact.
type exactOp struct {
	R [3][3]int
	T [3]int
}

var exactIdentity = exactOp{R: Identity.R}

func (o exactOp) compose(p exactOp) exactOp {
	var c exactOp
	for i := 0; i < 3; i++ {
		c.T[i] = o.T[i]
		for j := 0; j < 3; j++ {
			c.T[i] += o.R[i][j] * p.T[j]
			for k := 0; k < 3; k++ {
				c.R[i][j] += o.R[i][k] * p.R[k][j]
			}
		}
	}
	return c.reduced()
}

func (o exactOp) reduced() exactOp {
	for i := range o.T {
		o.T[i] = ((o.T[i] % hallDenominator) + hallDenominator) % hallDenominator
	}
	return o
}

func (o exactOp) operation() Operation {
	op := Operation{R: o.R}
	for i := range o.T {
		op.T[i] = float64(o.T[i]) / hallDenominator
	}
	return op
}

// hallCentring gives the centring translations (in 24ths) of each lattice
// symbol of a Hall symbol.
var hallCentring = map[byte][][3]int{
	'P': nil,
	'A': {{0, 12, 12}},
	'B': {{12, 0, 12}},
	'C': {{12, 12, 0}},
	'I': {{12, 12, 12}},
	'R': {{16, 8, 8}, {8, 16, 16}},
	'S': {{8, 8, 16}, {16, 16, 8}},
	'T': {{8, 16, 8}, {16, 8, 16}},
	'F': {{0, 12, 12}, {12, 0, 12}, {12, 12, 0}},
}

// hallTranslation gives the translation symbols of a Hall symbol, in 24ths.
var hallTranslation = map[byte][3]int{
	'a': {12, 0, 0}, 'b': {0, 12, 0}, 'c': {0, 0, 12}, 'n': {12, 12, 12},
	'u': {6, 0, 0}, 'v': {0, 6, 0}, 'w': {0, 0, 6}, 'd': {6, 6, 6},
}

// hallRotation gives the proper rotation matrices of a Hall symbol keyed
// by order and axis: x, y, z, the face diagonals ' and " followed by the
// preceding axis they are taken against ("2'z" is the 2-fold along a−b,
// "2\"z" along a+b) and the body diagonal "3*".
var hallRotation = map[string][3][3]int{
	"2x":   {{1, 0, 0}, {0, -1, 0}, {0, 0, -1}},
	"2y":   {{-1, 0, 0}, {0, 1, 0}, {0, 0, -1}},
	"2z":   {{-1, 0, 0}, {0, -1, 0}, {0, 0, 1}},
	"3x":   {{1, 0, 0}, {0, 0, -1}, {0, 1, -1}},
	"3y":   {{-1, 0, 1}, {0, 1, 0}, {-1, 0, 0}},
	"3z":   {{0, -1, 0}, {1, -1, 0}, {0, 0, 1}},
	"4x":   {{1, 0, 0}, {0, 0, -1}, {0, 1, 0}},
	"4y":   {{0, 0, 1}, {0, 1, 0}, {-1, 0, 0}},
	"4z":   {{0, -1, 0}, {1, 0, 0}, {0, 0, 1}},
	"6x":   {{1, 0, 0}, {0, 1, -1}, {0, 1, 0}},
	"6y":   {{0, 0, 1}, {0, 1, 0}, {-1, 0, 1}},
	"6z":   {{1, -1, 0}, {1, 0, 0}, {0, 0, 1}},
	"2'x":  {{-1, 0, 0}, {0, 0, -1}, {0, -1, 0}},
	"2'y":  {{0, 0, -1}, {0, -1, 0}, {-1, 0, 0}},
	"2'z":  {{0, -1, 0}, {-1, 0, 0}, {0, 0, -1}},
	"2\"x": {{-1, 0, 0}, {0, 0, 1}, {0, 1, 0}},
	"2\"y": {{0, 0, 1}, {0, -1, 0}, {1, 0, 0}},
	"2\"z": {{0, 1, 0}, {1, 0, 0}, {0, 0, -1}},
	"3*":   {{0, 0, 1}, {1, 0, 0}, {0, 1, 0}},
}

// HallOperations returns every operation of the conventional cell (the
// centring translations included) of the space group a Hall symbol
// describes, translations normalised to [0, 1):
//
//	L N₁ N₂ … (V)
//
// L is the lattice symbol (P A B C I R S T F), preceded by "-" for a
// centrosymmetric group; each matrix symbol N is an order 1, 2, 3, 4 or 6,
// "-" for an improper rotation, an axis (x, y, z, ' or " for face
// diagonals, * for the body diagonal; by default z for the first, x for a
// 2 after a 2 or 4, ' for a 2 after a 3 or 6, * for a 3 in third place),
// a screw digit and translation letters (a b c n u v w d). The optional
// change of basis V is an origin shift in twelfths, "(0 0 1)", or in xyz
// form, "(x,y,z+1/12)"; each operation S becomes V·S·V⁻¹. The group is the
// closure of the generators modulo lattice translations.
//
// Reference: S. R. Hall, Acta Cryst. A37, 517–525 (1981),
// doi:10.1107/S0567739481001228; International Tables for Crystallography
// Vol. B, 1.4, Table A1.4.2.
func HallOperations(hall string) ([]Operation, error) {
	ops, err := parseHall(hall)
	if err != nil {
		return nil, meltbook.Errorf(meltbook.Invalid, "Hall symbol", "%q: %s", hall, err)
	}
	out := make([]Operation, len(ops))
	for i, o := range ops {
		out[i] = o.operation()
	}
	return out, nil
}

func parseHall(hall string) ([]exactOp, error) {
	s := strings.TrimSpace(hall)
	var shift *exactOp
	if i := strings.IndexByte(s, '('); i >= 0 {
		j := strings.LastIndexByte(s, ')')
		if j < i || strings.TrimSpace(s[j+1:]) != "" {
			return nil, fmt.Errorf("the change of basis is not closed by \")\" at the end")
		}
		v, err := parseChangeOfBasis(s[i+1 : j])
		if err != nil {
			return nil, err
		}
		shift = &v
		s = s[:i]
	}
	fields := strings.Fields(s)
	if len(fields) == 0 {
		return nil, fmt.Errorf("is empty")
	}
	lat := fields[0]
	var gens []exactOp
	if strings.HasPrefix(lat, "-") {
		gens = append(gens, exactOp{R: [3][3]int{{-1, 0, 0}, {0, -1, 0}, {0, 0, -1}}})
		lat = lat[1:]
	}
	if len(lat) != 1 {
		return nil, fmt.Errorf("lattice symbol %q is not one of P A B C I R S T F", fields[0])
	}
	cen, ok := hallCentring[lat[0]]
	if !ok {
		return nil, fmt.Errorf("lattice symbol %q is not one of P A B C I R S T F", fields[0])
	}
	for _, c := range cen {
		gens = append(gens, exactOp{R: Identity.R, T: c})
	}
	if len(fields) == 1 {
		return nil, fmt.Errorf("has no matrix symbol after the lattice symbol")
	}
	prevN, prevAxis := 0, byte('z')
	for i, f := range fields[1:] {
		op, n, axis, err := parseHallMatrix(f, i, prevN, prevAxis)
		if err != nil {
			return nil, err
		}
		gens = append(gens, op)
		prevN = n
		if axis == 'x' || axis == 'y' || axis == 'z' {
			prevAxis = axis
		}
	}
	ops, ok := closeGroup(gens)
	if !ok {
		return nil, fmt.Errorf("generates more than 192 operations, so no space group")
	}
	if shift != nil {
		inv := shift.inverse()
		for k, o := range ops {
			ops[k] = shift.compose(o).compose(inv)
		}
	}
	return ops, nil
}

// parseHallMatrix reads one matrix symbol such as "-4bw", "2\"c", "61",
// "3*"; i is its place (0 for the first after the lattice symbol).
func parseHallMatrix(f string, i, prevN int, prevAxis byte) (op exactOp, n int, axis byte, err error) {
	s := f
	improper := false
	if strings.HasPrefix(s, "-") {
		improper = true
		s = s[1:]
	}
	if s == "" || !strings.ContainsRune("12346", rune(s[0])) {
		return op, 0, 0, fmt.Errorf("matrix symbol %q does not start with an order 1, 2, 3, 4 or 6", f)
	}
	n = int(s[0] - '0')
	screw := 0
	var trans [3]int
	for _, c := range []byte(s[1:]) {
		switch {
		case c >= '1' && c <= '5':
			if screw != 0 || int(c-'0') >= n {
				return op, 0, 0, fmt.Errorf("matrix symbol %q: screw %c does not fit order %d", f, c, n)
			}
			screw = int(c - '0')
		case strings.IndexByte("xyz'\"*", c) >= 0:
			if axis != 0 {
				return op, 0, 0, fmt.Errorf("matrix symbol %q names two axes", f)
			}
			axis = c
		default:
			t, ok := hallTranslation[c]
			if !ok {
				return op, 0, 0, fmt.Errorf("matrix symbol %q: %q is no axis, screw or translation symbol", f, c)
			}
			for k := range trans {
				trans[k] += t[k]
			}
		}
	}
	if n == 1 {
		op.R = Identity.R
	} else {
		if axis == 0 {
			switch {
			case i == 0:
				axis = 'z'
			case i == 1 && n == 2 && (prevN == 2 || prevN == 4):
				axis = 'x'
			case i == 1 && n == 2 && (prevN == 3 || prevN == 6):
				axis = '\''
			case i == 2 && n == 3:
				axis = '*'
			default:
				return op, 0, 0, fmt.Errorf("matrix symbol %q needs an axis here", f)
			}
		}
		key := strconv.Itoa(n) + string(axis)
		if axis == '\'' || axis == '"' {
			key += string(prevAxis)
		}
		r, ok := hallRotation[key]
		if !ok {
			return op, 0, 0, fmt.Errorf("matrix symbol %q: there is no %d-fold axis along %c", f, n, axis)
		}
		op.R = r
	}
	if screw != 0 {
		k := strings.IndexByte("xyz", axis)
		if k < 0 {
			return op, 0, 0, fmt.Errorf("matrix symbol %q: a screw needs axis x, y or z", f)
		}
		trans[k] += screw * hallDenominator / n
	}
	if improper {
		for a := range op.R {
			for b := range op.R[a] {
				op.R[a][b] = -op.R[a][b]
			}
		}
	}
	op.T = trans
	return op.reduced(), n, axis, nil
}

// parseChangeOfBasis reads the inside of "(0 0 1)" (an origin shift in
// twelfths) or of "(x,y,z+1/12)" (a shift in xyz form).
func parseChangeOfBasis(s string) (exactOp, error) {
	if strings.Contains(s, ",") {
		op, err := ParseOperation(s)
		if err != nil {
			return exactOp{}, fmt.Errorf("change of basis %q is not an xyz operation", s)
		}
		if op.R != Identity.R {
			return exactOp{}, fmt.Errorf("change of basis %q: only an origin shift is supported", s)
		}
		var v exactOp
		v.R = Identity.R
		for i, t := range op.T {
			q := t * hallDenominator
			r := int(q + 0.5)
			if t < 0 {
				r = -int(-q + 0.5)
			}
			if d := q - float64(r); d > 1e-6 || d < -1e-6 {
				return exactOp{}, fmt.Errorf("change of basis %q: shift %g is not a multiple of 1/24", s, t)
			}
			v.T[i] = r
		}
		return v.reduced(), nil
	}
	parts := strings.Fields(s)
	if len(parts) != 3 {
		return exactOp{}, fmt.Errorf("change of basis %q is not three twelfths like (0 0 1)", s)
	}
	v := exactOp{R: Identity.R}
	for i, p := range parts {
		k, err := strconv.Atoi(p)
		if err != nil {
			return exactOp{}, fmt.Errorf("change of basis %q: %q is not a whole number of twelfths", s, p)
		}
		v.T[i] = 2 * k
	}
	return v.reduced(), nil
}

// inverse of an origin shift (identity matrix).
func (o exactOp) inverse() exactOp {
	v := exactOp{R: o.R}
	for i := range o.T {
		v.T[i] = -o.T[i]
	}
	return v.reduced()
}

// maxOperations is the most operations a conventional cell can have:
// 48 point operations times the four centring translations of F.
const maxOperations = 192

// closeGroup returns the closure of the generators modulo lattice
// translations, the identity first and in order of discovery after it;
// false when it grows beyond maxOperations (no space group).
func closeGroup(gens []exactOp) ([]exactOp, bool) {
	ops := []exactOp{exactIdentity}
	seen := map[exactOp]bool{exactIdentity: true}
	for k := 0; k < len(ops); k++ {
		for _, g := range gens {
			c := g.compose(ops[k])
			if !seen[c] {
				seen[c] = true
				ops = append(ops, c)
				if len(ops) > maxOperations {
					return nil, false
				}
			}
		}
	}
	return ops, true
}

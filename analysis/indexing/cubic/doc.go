// Package cubic lists the powder lines of the cubic Bravais lattices P, I
// and F: which hkl the centring allows and how they group into lines of
// equal h² + k² + l².
//
// Reference: International Tables for Crystallography Vol. A, reflection
// conditions of the centred cells (I: h+k+l = 2n; F: h, k, l all odd or all
// even).
package cubic

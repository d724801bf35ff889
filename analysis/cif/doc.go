// Package cif reads the syntax of CIF 1.1 files: data blocks, data items,
// loops, quoted values and text fields, and the numbers with standard
// uncertainty in parentheses that CIF writes. It knows no dictionary; the
// readers of structures and powder patterns pick the items they need,
// accepting the old and the new names of a tag.
//
// Errors name file:line:col.
//
// Reference: S. R. Hall, F. H. Allen, I. D. Brown, Acta Cryst. A47, 655
// (1991), doi:10.1107/S010876739101067X; IUCr, CIF 1.1 syntax
// specification.
package cif

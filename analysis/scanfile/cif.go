package scanfile

import (
	"errors"

	"meltbook/analysis/cif"
)

// parseCIF reads every data block of a CIF file with the CIF syntax
// package, turning its syntax errors into this package's ErrSyntax.
func parseCIF(file string, data []byte) ([]*cif.Block, error) {
	blocks, err := cif.Parse(file, data)
	var ce *cif.Error
	if errors.As(err, &ce) {
		return nil, &Error{File: ce.File, Line: ce.Line, Column: ce.Col, Err: ErrSyntax, Msg: ce.Msg}
	}
	return blocks, err
}

// at is the place of a value in the file.
func at(v cif.Value) pos { return pos{v.Line, v.Col} }

// column returns the index of tag in the loop, or -1.
func column(lp *cif.Loop, tag string) int {
	c, _ := lp.Column(tag)
	return c
}

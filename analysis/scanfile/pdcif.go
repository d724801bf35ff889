package scanfile

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"meltbook/analysis/cif"
)

// Tags of the pdCIF dictionary read here, in order of preference.
var (
	twoThetaTags  = []string{"_pd_meas_2theta_scan", "_pd_meas_angle_2theta", "_pd_proc_2theta_corrected"}
	intensityTags = []string{"_pd_meas_counts_total", "_pd_meas_intensity_total", "_pd_proc_intensity_total"}
	rangePrefixes = []string{"_pd_meas_2theta_range_", "_pd_proc_2theta_range_"}
)

const (
	tagWavelength       = "_diffrn_radiation_wavelength"
	tagWavelengthWeight = "_diffrn_radiation_wavelength_wt"
	tagTarget           = "_diffrn_source_target"
)

// readPowderCIF reads the first data block of a CIF file that holds a
// looped intensity column; see the package documentation.
func readPowderCIF(file string, data []byte) (Scan, error) {
	blocks, err := parseCIF(file, data)
	if err != nil {
		return Scan{}, err
	}
	var (
		block *cif.Block
		loop  *cif.Loop
		iCol  = -1
		iTag  string
	)
search:
	for _, b := range blocks {
		for _, t := range intensityTags {
			for _, lp := range b.Loops {
				if c := column(lp, t); c >= 0 {
					block, loop, iCol, iTag = b, lp, c, t
					break search
				}
			}
		}
	}
	if block == nil {
		return Scan{}, &Error{File: file, Err: ErrNoData,
			Msg: "no data block has a looped intensity (" + strings.Join(intensityTags, ", ") + ")"}
	}

	s := Scan{Format: FormatPowderCIF, Items: map[string]string{}}
	for tag, v := range block.Items {
		s.Items[tag] = v.Text
	}

	// 2θ: a looped column, else the range items.
	tCol, tTag := -1, ""
	for _, t := range twoThetaTags {
		if c := column(loop, t); c >= 0 {
			tCol, tTag = c, t
			break
		}
	}
	var rangeTwoTheta []float64
	if tCol < 0 {
		rangeTwoTheta, err = twoThetaFromRange(file, block, loop)
		if err != nil {
			return Scan{}, err
		}
	}

	pts := make([]point, len(loop.Rows))
	withESD := 0
	for i, row := range loop.Rows {
		p := &pts[i]
		v, su, hasSU, err := cifNumber(file, row[iCol], iTag)
		if err != nil {
			return Scan{}, err
		}
		p.counts, p.esd, p.countsAt, p.countsName = v, su, at(row[iCol]), iTag
		p.esdAt, p.esdName = at(row[iCol]), iTag+" uncertainty"
		if hasSU {
			withESD++
		}
		if tCol >= 0 {
			if p.twoTheta, _, _, err = cifNumber(file, row[tCol], tTag); err != nil {
				return Scan{}, err
			}
			p.twoThetaAt, p.twoThetaName = at(row[tCol]), tTag
		} else {
			p.twoTheta, p.twoThetaAt, p.twoThetaName = rangeTwoTheta[i], at(row[iCol]), "2θ from the range items"
		}
	}
	if withESD != 0 && withESD != len(pts) {
		for _, row := range loop.Rows {
			if _, _, has, _ := cifNumber(file, row[iCol], iTag); !has {
				return Scan{}, &Error{File: file, Line: row[iCol].Line, Column: row[iCol].Col, Err: ErrMissing,
					Msg: fmt.Sprintf("%s: value %q has no standard uncertainty in parentheses; %d other values of the loop have one", iTag, row[iCol].Text, withESD)}
			}
		}
	}
	if err := finish(file, pts, withESD > 0, &s); err != nil {
		return Scan{}, err
	}
	if s.Wavelengths, err = wavelengths(file, block, blocks); err != nil {
		return Scan{}, err
	}
	if t, ok := block.Items[tagTarget]; ok && t.Text != "?" && t.Text != "." {
		s.Anode = t.Text
	} else {
		for _, b := range blocks {
			if t, ok := b.Items[tagTarget]; ok && t.Text != "?" && t.Text != "." {
				s.Anode = t.Text
				break
			}
		}
	}
	return s, nil
}

// twoThetaFromRange builds 2θ from _pd_meas_2theta_range_min, _max and
// _inc (or the _pd_proc_ items): min + i·inc for i = 0 … n−1, where
// n = round((max − min)/inc) + 1 must equal the loop's row count and
// min + (n−1)·inc must meet max within a hundredth of a step.
func twoThetaFromRange(file string, block *cif.Block, loop *cif.Loop) ([]float64, error) {
	for _, prefix := range rangePrefixes {
		minTok, ok1 := block.Items[prefix+"min"]
		maxTok, ok2 := block.Items[prefix+"max"]
		incTok, ok3 := block.Items[prefix+"inc"]
		if !ok1 && !ok2 && !ok3 {
			continue
		}
		for _, it := range []struct {
			ok  bool
			tag string
		}{{ok1, "min"}, {ok2, "max"}, {ok3, "inc"}} {
			if !it.ok {
				return nil, &Error{File: file, Err: ErrMissing,
					Msg: fmt.Sprintf("data_%s: 2θ is not looped and %s%s is missing", block.Name, prefix, it.tag)}
			}
		}
		lo, _, _, err := cifNumber(file, minTok, prefix+"min")
		if err != nil {
			return nil, err
		}
		hi, _, _, err := cifNumber(file, maxTok, prefix+"max")
		if err != nil {
			return nil, err
		}
		inc, _, _, err := cifNumber(file, incTok, prefix+"inc")
		if err != nil {
			return nil, err
		}
		if !(inc > 0) || !(hi > lo) {
			return nil, &Error{File: file, Line: incTok.Line, Column: incTok.Col, Err: ErrOutOfRange,
				Msg: fmt.Sprintf("2θ range min %v, max %v, inc %v: need max > min and inc > 0", lo, hi, inc)}
		}
		steps := (hi - lo) / inc
		n := math.Round(steps) + 1
		if math.Abs(steps-(n-1)) > 0.01 || n > MaxBytes {
			return nil, &Error{File: file, Line: incTok.Line, Column: incTok.Col, Err: ErrOutOfRange,
				Msg: fmt.Sprintf("2θ range %v to %v is not a whole number of %v° steps", lo, hi, inc)}
		}
		if int(n) != len(loop.Rows) {
			return nil, &Error{File: file, Line: loop.Line, Column: loop.Col, Err: ErrColumns,
				Msg: fmt.Sprintf("2θ range %v to %v by %v gives %d points but the loop has %d rows", lo, hi, inc, int(n), len(loop.Rows))}
		}
		out := make([]float64, int(n))
		for i := range out {
			out[i] = lo + float64(i)*inc
		}
		return out, nil
	}
	return nil, &Error{File: file, Line: loop.Line, Column: loop.Col, Err: ErrMissing,
		Msg: "loop gives intensities but no 2θ: loop " + strings.Join(twoThetaTags, ", ") +
			" or give _pd_meas_2theta_range_min, _max and _inc"}
}

// wavelengths reads _diffrn_radiation_wavelength (looped or not, with
// optional _wt) from the pattern block, else from the first block that has
// it.
func wavelengths(file string, block *cif.Block, blocks []*cif.Block) ([]Wavelength, error) {
	order := append([]*cif.Block{block}, blocks...)
	for _, b := range order {
		if t, ok := b.Items[tagWavelength]; ok {
			if t.Text == "?" || t.Text == "." {
				return nil, nil
			}
			v, _, _, err := cifNumber(file, t, tagWavelength)
			if err != nil {
				return nil, err
			}
			w := Wavelength{Angstrom: v}
			if wt, ok := b.Items[tagWavelengthWeight]; ok {
				if w.Weight, _, _, err = cifNumber(file, wt, tagWavelengthWeight); err != nil {
					return nil, err
				}
			}
			return []Wavelength{w}, checkWavelengths(file, []Wavelength{w}, t)
		}
		for _, lp := range b.Loops {
			c := column(lp, tagWavelength)
			if c < 0 {
				continue
			}
			cw := column(lp, tagWavelengthWeight)
			var out []Wavelength
			for _, row := range lp.Rows {
				v, _, _, err := cifNumber(file, row[c], tagWavelength)
				if err != nil {
					return nil, err
				}
				w := Wavelength{Angstrom: v}
				if cw >= 0 {
					if w.Weight, _, _, err = cifNumber(file, row[cw], tagWavelengthWeight); err != nil {
						return nil, err
					}
				}
				out = append(out, w)
				if err := checkWavelengths(file, out[len(out)-1:], row[c]); err != nil {
					return nil, err
				}
			}
			return out, nil
		}
	}
	return nil, nil
}

func checkWavelengths(file string, ws []Wavelength, at cif.Value) error {
	for _, w := range ws {
		if !(w.Angstrom > 0) || w.Weight < 0 {
			return &Error{File: file, Line: at.Line, Column: at.Col, Err: ErrOutOfRange,
				Msg: fmt.Sprintf("%s: wavelength %v Å with weight %v: need a positive wavelength and a non-negative weight", tagWavelength, w.Angstrom, w.Weight)}
		}
	}
	return nil
}

// cifNumber reads a CIF numeric value with an optional standard
// uncertainty (cif.Value.Number) and reports a fault with the file, line,
// column and tag.
func cifNumber(file string, t cif.Value, tag string) (v, su float64, hasSU bool, err error) {
	v, su, hasSU, err = t.Number()
	if err == nil {
		return v, su, hasSU, nil
	}
	kind := ErrNotNumber
	switch {
	case errors.Is(err, cif.ErrUnknown):
		kind = ErrMissing
	case errors.Is(err, cif.ErrNotFinite):
		kind = ErrNotFinite
	}
	e := &valueError{t.Text, kind}
	return 0, 0, false, &Error{File: file, Line: t.Line, Column: t.Col, Err: kind, Msg: fmt.Sprintf("%s: %v", tag, e)}
}

package main

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strconv"

	"meltbook"
	"meltbook/analysis/peaks"
	"meltbook/analysis/radiation"
	"meltbook/analysis/scanfile"
)

// radiationFlags are the flags that say which X-rays a scan was taken with.
type radiationFlags struct {
	anode      string // "Cu", "Cu:stripped", "Mo:mono"
	wavelength string // "1.5406" or "1.5406/1.5444"
	standard   string // internal standard: Si or LaB6
}

// readScan reads a scan file, turning reader errors (which carry file, line
// and column) into user errors.
func readScan(path string) (scanfile.Scan, error) {
	f, err := os.Open(path)
	if err != nil {
		return scanfile.Scan{}, meltbook.Errorf(meltbook.NotFound, path, "%v", errors.Unwrap(err))
	}
	defer f.Close()
	s, err := scanfile.Read(filepath.Base(path), f)
	if err != nil {
		return s, invalid(err)
	}
	return s, nil
}

// resolve chooses the radiation: the flags, else what the file states, else
// Cu with Kα2, said in a note.
func (r radiationFlags) resolve(s scanfile.Scan) (rad radiation.Radiation, note string, err error) {
	switch {
	case r.anode != "" && r.wavelength != "":
		return rad, "", invalidFlag("--anode", "give --anode or --wavelength, not both")
	case r.anode != "":
		rad, err = radiation.ParseRadiation(r.anode)
		if err != nil {
			return rad, "", invalidFlag("--anode", err.Error())
		}
		return rad, "", nil
	case r.wavelength != "":
		if _, perr := strconv.ParseFloat(r.wavelength, 64); perr == nil {
			rad, err = radiation.ParseRadiation(r.wavelength + ":mono")
		} else {
			rad, err = radiation.ParseRadiation(r.wavelength)
		}
		if err != nil {
			return rad, "", invalidFlag("--wavelength", err.Error())
		}
		return rad, "", nil
	}
	if rad, err = s.Radiation(); err == nil {
		return rad, "", nil
	}
	rad, err = radiation.ParseRadiation("Cu")
	return rad, "the file does not state its radiation: Cu Kα1/Kα2 assumed (give --anode or --wavelength)", err
}

// peakOptions turns the flags into peak-search options.
func (r radiationFlags) peakOptions() (peaks.Options, error) {
	var opt peaks.Options
	if r.standard != "" {
		std, err := peaks.StandardByName(r.standard)
		if err != nil {
			return opt, invalidFlag("--standard", err.Error())
		}
		opt.Standard = &std
	}
	return opt, nil
}

// findPeaks reads a scan and runs the peak search, printing any note.
func (a *app) findPeaks(path string, r radiationFlags) (scanfile.Scan, peaks.Result, error) {
	s, err := readScan(path)
	if err != nil {
		return s, peaks.Result{}, err
	}
	rad, note, err := r.resolve(s)
	if err != nil {
		return s, peaks.Result{}, err
	}
	if note != "" {
		fmt.Fprintln(a.stderr, "note:", note)
	}
	opt, err := r.peakOptions()
	if err != nil {
		return s, peaks.Result{}, err
	}
	res, err := peaks.Find(s, rad, opt)
	if err != nil {
		return s, res, meltbook.Errorf(meltbook.Invalid, path, "%v", err)
	}
	return s, res, nil
}

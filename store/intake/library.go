package intake

import (
	"context"

	"meltbook"
	"meltbook/analysis/indexing"
	"meltbook/analysis/phaselib"
	"meltbook/analysis/radiation"
	"meltbook/store"
)

// knownPhases returns the library phases the search-match tries on a scan
// of the sample: the built-in library, the notebook's phase-library
// folder and opt.LibraryDirs, narrowed to the phases whose elements the
// sample's nominal composition holds (all of them when it names none),
// with their lines at the scan's Kα1 wavelength.
func knownPhases(ctx context.Context, st *store.Store, ev *store.SampleEvidence, rad radiation.Radiation, opt Options) ([]indexing.KnownPhase, error) {
	dir, err := st.Setting(ctx, store.SettingPhaseLibrary)
	if err != nil {
		return nil, err
	}
	lib, err := LoadLibrary(dir, opt.LibraryDirs...)
	if err != nil {
		return nil, err
	}
	var els []string
	for _, f := range ev.Nominal {
		els = append(els, f.Element)
	}
	known, err := phaselib.KnownPhases(lib.ForElements(els), rad.Kalpha1Angstrom)
	if err != nil {
		return nil, meltbook.Errorf(meltbook.Invalid, "phase library", "%v", err)
	}
	return known, nil
}

// LoadLibrary loads the built-in phase library with the notebook's folder
// (the phase-library setting, "" for none) and further folders; an error
// in the notebook's folder says that the setting names it.
func LoadLibrary(notebookDir string, dirs ...string) (*phaselib.Library, error) {
	lib, err := phaselib.Load(append([]string{notebookDir}, dirs...)...)
	if err != nil && notebookDir != "" {
		if _, e := phaselib.Load(notebookDir); e != nil {
			return nil, meltbook.Errorf(meltbook.Invalid, "setting "+store.SettingPhaseLibrary, "%v (change it with `meltbook setting %s DIR`)", e, store.SettingPhaseLibrary)
		}
	}
	return lib, err
}

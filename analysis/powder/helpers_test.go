package powder_test

import (
	"os"
	"path/filepath"
	"sort"
	"testing"

	"meltbook/analysis/crystal"
)

// CuKalpha1A is the Cu Kα1 wavelength in Å (Hölzer et al., Phys. Rev. A
// 56, 4554 (1997)).
const CuKalpha1A = 1.5405929

// namedStructure is a structure read from a CIF file of the repository.
type namedStructure struct {
	Path string // absolute
	crystal.Structure
}

// referenceCIFs reads the first structure of every CIF of the phase
// library and of the crystal package's test data; files that do not parse
// are logged and left out.
func referenceCIFs(t testing.TB) []namedStructure {
	t.Helper()
	var paths []string
	for _, pattern := range []string{"../phaselib/phases/*.cif", "../crystal/testdata/*.cif"} {
		m, err := filepath.Glob(pattern)
		if err != nil {
			t.Fatal(err)
		}
		paths = append(paths, m...)
	}
	sort.Strings(paths)
	var out []namedStructure
	for _, p := range paths {
		data, err := os.ReadFile(p)
		if err != nil {
			t.Fatal(err)
		}
		ss, err := crystal.ReadCIF(filepath.Base(p), data)
		if err != nil || len(ss) == 0 {
			t.Logf("%s: left out, does not parse: %v", p, err)
			continue
		}
		abs, err := filepath.Abs(p)
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, namedStructure{Path: abs, Structure: ss[0]})
	}
	if len(out) == 0 {
		t.Fatal("no CIF file parsed")
	}
	return out
}

// readStructure reads the first structure of one CIF file.
func readStructure(t testing.TB, path string) crystal.Structure {
	t.Helper()
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	ss, err := crystal.ReadCIF(filepath.Base(path), data)
	if err != nil {
		t.Fatal(err)
	}
	return ss[0]
}

// withoutDisplacement returns s with U = 0 on every site.
func withoutDisplacement(s crystal.Structure) crystal.Structure {
	sites := make([]crystal.Site, len(s.Sites))
	copy(sites, s.Sites)
	for i := range sites {
		sites[i].UisoA2 = 0
	}
	s.Sites = sites
	return s
}

package phaselib

import (
	"crypto/sha256"
	"embed"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"sync"

	"meltbook"
	"meltbook/analysis/crystal"
)

// Phase is one crystalline phase of the library.
type Phase struct {
	// Name is the name as displayed, with Greek letters ("θ-Al2Cu"); Key
	// is its ASCII spelling ("theta-Al2Cu"), which Find also accepts.
	Name, Key string
	Structure crystal.Structure
	// Elements are the distinct elements of its sites, sorted.
	Elements []string
	// Origin is "built in" or the file the phase was read from; Provenance
	// the file's "# Provenance:" comment, which says what of the structure
	// was checked and how.
	Origin, Provenance string
	digest             [32]byte // of the file, for the line cache
}

// BuiltIn is the Origin of an embedded phase.
const BuiltIn = "built in"

// Library is a set of phases with distinct names.
type Library struct {
	phases []Phase
}

//go:embed phases/*.cif
var embedded embed.FS

var (
	builtinOnce sync.Once
	builtinLib  *Library
	builtinErr  error
)

// Builtin returns the embedded library. It is read once per process; an
// error means a broken build, and says which file and line.
func Builtin() (*Library, error) {
	builtinOnce.Do(func() {
		var phases []Phase
		err := fs.WalkDir(embedded, "phases", func(path string, d fs.DirEntry, err error) error {
			if err != nil || d.IsDir() || !strings.HasSuffix(path, ".cif") {
				return err
			}
			data, err := embedded.ReadFile(path)
			if err != nil {
				return err
			}
			ps, err := Parse(path, data)
			if err != nil {
				return err
			}
			for i := range ps {
				ps[i].Origin = BuiltIn
			}
			phases = append(phases, ps...)
			return nil
		})
		if err != nil {
			builtinErr = err
			return
		}
		builtinLib, builtinErr = newLibrary(phases, nil)
	})
	return builtinLib, builtinErr
}

// Load returns the built-in library extended by every *.cif file of the
// given folders (not their sub-folders). A user's phase whose name equals
// a built-in one replaces it; two user files naming the same phase are an
// error naming both. A folder that does not exist is an error; an empty
// folder name is skipped.
func Load(dirs ...string) (*Library, error) {
	base, err := Builtin()
	if err != nil {
		return nil, err
	}
	var user []Phase
	for _, dir := range dirs {
		if strings.TrimSpace(dir) == "" {
			continue
		}
		entries, err := os.ReadDir(dir)
		if err != nil {
			return nil, meltbook.Errorf(meltbook.Invalid, "phase library folder", "%v", err)
		}
		for _, e := range entries {
			if e.IsDir() || !strings.EqualFold(filepath.Ext(e.Name()), ".cif") {
				continue
			}
			path := filepath.Join(dir, e.Name())
			data, err := os.ReadFile(path)
			if err != nil {
				return nil, meltbook.Errorf(meltbook.Invalid, path, "%v", err)
			}
			ps, err := Parse(path, data)
			if err != nil {
				return nil, err
			}
			for i := range ps {
				ps[i].Origin = path
			}
			user = append(user, ps...)
		}
	}
	return newLibrary(base.phases, user)
}

// newLibrary joins base and user phases; user phases replace base phases
// of the same name and must be distinct among themselves.
func newLibrary(base, user []Phase) (*Library, error) {
	byKey := map[string]int{}
	var out []Phase
	add := func(p Phase, replace bool) error {
		k := foldKey(p.Key)
		if i, ok := byKey[k]; ok {
			if replace && out[i].Origin == BuiltIn {
				out[i] = p
				return nil
			}
			return meltbook.Errorf(meltbook.Invalid, p.Origin, "phase %q is also defined in %s; give one of them another _chemical_name_common", p.Name, out[i].Origin)
		}
		byKey[k] = len(out)
		out = append(out, p)
		return nil
	}
	for _, p := range base {
		if err := add(p, false); err != nil {
			return nil, err
		}
	}
	for _, p := range user {
		if err := add(p, true); err != nil {
			return nil, err
		}
	}
	sort.SliceStable(out, func(i, j int) bool { return foldKey(out[i].Key) < foldKey(out[j].Key) })
	return &Library{phases: out}, nil
}

// Parse reads the phases of one CIF file: one per data block. The file
// name is used in messages only.
func Parse(file string, data []byte) ([]Phase, error) {
	structures, err := crystal.ReadCIF(file, data)
	if err != nil {
		return nil, err
	}
	if len(structures) == 0 {
		return nil, meltbook.Errorf(meltbook.Invalid, file, "holds no crystal structure (no data block with a cell and atom sites)")
	}
	digest := sha256.Sum256(data)
	prov := provenance(data)
	out := make([]Phase, 0, len(structures))
	for _, s := range structures {
		if strings.TrimSpace(s.Name) == "" {
			return nil, meltbook.Errorf(meltbook.Invalid, file, "a data block has no name")
		}
		p := Phase{
			Name:       DisplayName(s.Name),
			Key:        ASCIIName(s.Name),
			Structure:  s,
			Elements:   elements(s),
			Provenance: prov,
			digest:     digest,
		}
		p.Structure.Name = p.Name
		out = append(out, p)
	}
	return out, nil
}

// provenance returns the text of the "# Provenance:" comment and the
// comment lines that follow it, joined by spaces.
func provenance(data []byte) string {
	var parts []string
	in := false
	for _, line := range strings.Split(string(data), "\n") {
		line = strings.TrimRight(line, "\r")
		switch {
		case strings.HasPrefix(line, "# Provenance:"):
			in = true
			parts = append(parts, strings.TrimSpace(strings.TrimPrefix(line, "# Provenance:")))
		case in && strings.HasPrefix(line, "#"):
			parts = append(parts, strings.TrimSpace(strings.TrimPrefix(line, "#")))
		default:
			in = false
		}
	}
	return strings.Join(parts, " ")
}

func elements(s crystal.Structure) []string {
	seen := map[string]bool{}
	var out []string
	for _, site := range s.Sites {
		if !seen[site.Element] {
			seen[site.Element] = true
			out = append(out, site.Element)
		}
	}
	sort.Strings(out)
	return out
}

// Phases returns the library's phases sorted by name.
func (l *Library) Phases() []Phase { return append([]Phase(nil), l.phases...) }

// Len is the number of phases.
func (l *Library) Len() int { return len(l.phases) }

// ErrNoPhase is returned (wrapped) by Find for a name the library lacks.
var ErrNoPhase = errors.New("no such phase")

// Find returns the phase of the given name: its displayed name, its ASCII
// spelling or the CIF markup, compared without regard to case.
func (l *Library) Find(name string) (Phase, error) {
	k := foldKey(ASCIIName(name))
	for _, p := range l.phases {
		if foldKey(p.Key) == k {
			return p, nil
		}
	}
	names := make([]string, len(l.phases))
	for i, p := range l.phases {
		names[i] = p.Key
	}
	return Phase{}, fmt.Errorf("%w %q in the phase library (it holds %s)", ErrNoPhase, name, strings.Join(names, ", "))
}

// ForElements returns the phases every element of which is among els,
// the elements of a composition; with no elements, every phase.
func (l *Library) ForElements(els []string) []Phase {
	if len(els) == 0 {
		return l.Phases()
	}
	have := map[string]bool{}
	for _, e := range els {
		have[e] = true
	}
	var out []Phase
	for _, p := range l.phases {
		ok := true
		for _, e := range p.Elements {
			ok = ok && have[e]
		}
		if ok {
			out = append(out, p)
		}
	}
	return out
}

func foldKey(s string) string { return strings.ToLower(strings.Join(strings.Fields(s), "")) }

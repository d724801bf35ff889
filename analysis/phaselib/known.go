package phaselib

import (
	"fmt"
	"strings"
	"sync"

	"meltbook/analysis/crystal"
	"meltbook/analysis/indexing"
	"meltbook/analysis/powder"
	"meltbook/analysis/wholepattern"
)

// LinesTwoThetaMaxDeg is how far in 2θ the lines handed to the indexer
// reach; the indexer compares only the lines within a scan's range.
const LinesTwoThetaMaxDeg = 150

// Kind returns the indexer's crystal-system kind of a structure:
// trigonal groups are reported as rhombohedral when their lattice is R
// (in either setting) and as hexagonal otherwise, because a primitive
// trigonal lattice has the hexagonal metric.
func Kind(s crystal.Structure) indexing.Kind {
	switch s.Group.System {
	case crystal.Cubic:
		return indexing.Cubic
	case crystal.Tetragonal:
		return indexing.Tetragonal
	case crystal.Hexagonal:
		return indexing.Hexagonal
	case crystal.Trigonal:
		if centring(s) == "R" {
			return indexing.Rhombohedral
		}
		return indexing.Hexagonal
	case crystal.Orthorhombic:
		return indexing.Orthorhombic
	case crystal.Monoclinic:
		return indexing.Monoclinic
	}
	return indexing.Triclinic
}

// centring is the lattice letter of the structure's group; a rhombohedral
// group in its rhombohedral-axes setting is R too.
func centring(s crystal.Structure) string {
	if s.Group.System == crystal.Trigonal && s.Group.Setting == "R" {
		return "R"
	}
	if s.Group.Centring == 0 {
		return "P"
	}
	return string(s.Group.Centring)
}

// SpaceGroupSymbol is the short Hermann–Mauguin symbol without spaces,
// e.g. "I4/mcm", "P63/mmc", "Fd-3m".
func SpaceGroupSymbol(s crystal.Structure) string {
	return strings.Join(strings.Fields(s.Group.HM), "")
}

// Lines returns the phase's computed powder lines at the wavelength of the
// options (see powder.Pattern).
func (p Phase) Lines(opt powder.Options) ([]powder.Line, error) {
	lines, err := powder.Pattern(p.Structure, opt)
	if err != nil {
		return nil, fmt.Errorf("phase %s (%s): %w", p.Name, p.Origin, err)
	}
	return lines, nil
}

type cacheKey struct {
	digest [32]byte
	name   string
	lambda float64
}

var (
	cacheMu sync.Mutex
	cache   = map[cacheKey]indexing.KnownPhase{}
)

// Known returns the phase as the indexer's search-match takes it, with its
// lines at wavelength lambdaA (Å) out to LinesTwoThetaMaxDeg. Results are
// kept per file content and wavelength for the life of the process.
func (p Phase) Known(lambdaA float64) (indexing.KnownPhase, error) {
	key := cacheKey{p.digest, p.Key, lambdaA}
	cacheMu.Lock()
	k, ok := cache[key]
	cacheMu.Unlock()
	if ok {
		return k, nil
	}
	lines, err := p.Lines(powder.Options{WavelengthA: lambdaA, TwoThetaMaxDeg: LinesTwoThetaMaxDeg})
	if err != nil {
		return indexing.KnownPhase{}, err
	}
	k = indexing.KnownPhase{
		Name:       p.Name,
		Formula:    p.Structure.Formula,
		System:     Kind(p.Structure),
		Centring:   centring(p.Structure),
		SpaceGroup: SpaceGroupSymbol(p.Structure),
		Reference:  p.Structure.Reference,
		Cell:       p.Structure.Cell,
		Lines:      make([]indexing.KnownLine, 0, len(lines)),
	}
	for _, l := range lines {
		k.Lines = append(k.Lines, indexing.KnownLine{DSpacingA: l.DSpacingA, Intensity: l.Intensity, HKL: l.HKL})
	}
	cacheMu.Lock()
	cache[key] = k
	cacheMu.Unlock()
	return k, nil
}

// KnownPhases converts phases for the indexer at wavelength lambdaA.
func KnownPhases(phases []Phase, lambdaA float64) ([]indexing.KnownPhase, error) {
	out := make([]indexing.KnownPhase, 0, len(phases))
	for _, p := range phases {
		k, err := p.Known(lambdaA)
		if err != nil {
			return nil, err
		}
		out = append(out, k)
	}
	return out, nil
}

// WholePattern returns the phase for a Le Bail refinement
// (analysis/wholepattern): its crystal system, its cell scaled by scale
// (the search-match's fitted cell over the published one; 1 for the
// published cell) and its reflection families down to dMinA.
func (p Phase) WholePattern(scale, dMinA float64) (wholepattern.Phase, error) {
	if !(scale > 0) {
		scale = 1
	}
	s := p.Structure
	s.Cell = s.Cell.Scaled(scale)
	refl, err := powder.Reflections(s, dMinA)
	if err != nil {
		return wholepattern.Phase{}, fmt.Errorf("phase %s: %w", p.Name, err)
	}
	out := wholepattern.Phase{Name: p.Name, System: s.Group.System, Cell: s.Cell, Reflections: make([]wholepattern.Reflection, len(refl))}
	for i, r := range refl {
		out.Reflections[i] = wholepattern.Reflection{HKL: r.HKL, Multiplicity: r.Multiplicity}
	}
	return out, nil
}

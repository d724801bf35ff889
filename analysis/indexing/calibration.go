package indexing

import (
	"math"
	"sort"
)

// CalibrationVersion identifies the search that calibration scores come
// from. It changes whenever the search, the scoring or the random lists
// change, so that scores kept from an older build are not used.
const CalibrationVersion = "indexing-null-4"

// verifyLists is how many random lists of a loaded calibration entry are
// scored again on first use; any difference discards the entry.
const verifyLists = 4

// Calibration is a snapshot of the random-list scores behind every chance
// computed so far in this process (see Chance in the package
// documentation), for a program to keep between runs: computing them takes
// from a fraction of a second to seconds per peak count and 2θ range, while
// a kept snapshot makes the first indexing of a run as fast as the later
// ones.
type Calibration struct {
	Version string             `json:"version"`
	Entries []CalibrationEntry `json:"entries"`
}

// CalibrationEntry holds the best scores of the random lists of one model,
// peak count, 2θ range, wavelength, tolerance and zero-shift limit, in the
// order the lists are drawn.
type CalibrationEntry struct {
	Model             string `json:"model"`
	Peaks             int    `json:"peaks"`
	FromDeg           int    `json:"from_deg"`
	ToDeg             int    `json:"to_deg"`
	WavelengthMicroA  int64  `json:"wavelength_micro_A"`
	ToleranceMicroDeg int64  `json:"tolerance_micro_deg"`
	MaxZeroMicroDeg   int64  `json:"max_zero_micro_deg"`
	// Decoys names the structured decoys the scores come from; empty for
	// uniform random lists.
	Decoys string    `json:"decoys,omitempty"`
	Scores []float64 `json:"scores"`
}

func (e CalibrationEntry) key() nullKey {
	return nullKey{model: e.Model, n: e.Peaks, lo: e.FromDeg, hi: e.ToDeg,
		lambda: e.WavelengthMicroA, tol: e.ToleranceMicroDeg, maxZero: e.MaxZeroMicroDeg, set: decoySet(e.Decoys)}
}

// SnapshotCalibration returns every random-list score computed or loaded
// in this process (loaded ones not yet checked included, as loaded),
// entries in a fixed order.
func SnapshotCalibration() Calibration {
	c := Calibration{Version: CalibrationVersion, Entries: []CalibrationEntry{}}
	nullCache.Range(func(k, v any) bool {
		key, d := k.(nullKey), v.(*nullDist)
		d.mu.Lock()
		defer d.mu.Unlock()
		if len(d.scores) == 0 {
			return true
		}
		c.Entries = append(c.Entries, CalibrationEntry{Model: key.model, Peaks: key.n, FromDeg: key.lo, ToDeg: key.hi,
			WavelengthMicroA: key.lambda, ToleranceMicroDeg: key.tol, MaxZeroMicroDeg: key.maxZero,
			Decoys: string(key.set), Scores: append([]float64(nil), d.scores...)})
		return true
	})
	sort.Slice(c.Entries, func(i, j int) bool { return c.Entries[i].less(c.Entries[j]) })
	return c
}

func (e CalibrationEntry) less(f CalibrationEntry) bool {
	switch {
	case e.Model != f.Model:
		return e.Model < f.Model
	case e.Peaks != f.Peaks:
		return e.Peaks < f.Peaks
	case e.FromDeg != f.FromDeg:
		return e.FromDeg < f.FromDeg
	case e.ToDeg != f.ToDeg:
		return e.ToDeg < f.ToDeg
	case e.WavelengthMicroA != f.WavelengthMicroA:
		return e.WavelengthMicroA < f.WavelengthMicroA
	case e.ToleranceMicroDeg != f.ToleranceMicroDeg:
		return e.ToleranceMicroDeg < f.ToleranceMicroDeg
	case e.MaxZeroMicroDeg != f.MaxZeroMicroDeg:
		return e.MaxZeroMicroDeg < f.MaxZeroMicroDeg
	}
	if e.Decoys != f.Decoys {
		return e.Decoys < f.Decoys
	}
	return false
}

// LoadCalibration adds the entries of a snapshot that this process has not
// computed itself, and returns how many it took. A snapshot of another
// CalibrationVersion is ignored, as are entries with impossible values.
// Loaded scores are trusted only after a check on first use: the first few
// random lists of the entry are scored again, and any difference discards
// the entry, which is then computed afresh.
func LoadCalibration(c Calibration) int {
	if c.Version != CalibrationVersion {
		return 0
	}
	taken := 0
	for _, e := range c.Entries {
		if _, known := decoyClasses[decoySet(e.Decoys)]; !known && e.Decoys != "" {
			continue
		}
		if e.Peaks < 1 || e.ToDeg <= e.FromDeg || len(e.Scores) < verifyLists || len(e.Scores) > nullLarge {
			continue
		}
		ok := true
		for _, s := range e.Scores {
			ok = ok && s >= 0 && !math.IsInf(s, 0)
		}
		if !ok {
			continue
		}
		d := &nullDist{sorted: map[int][]float64{}, scores: append([]float64(nil), e.Scores...), unverified: true}
		if _, loaded := nullCache.LoadOrStore(e.key(), d); !loaded {
			taken++
		}
	}
	return taken
}

// verify scores the first random lists of a loaded entry again and drops
// the loaded scores unless every one matches. The caller holds d.mu.
func (d *nullDist) verify(m *model, key nullKey, cfg searchConfig) {
	if !d.unverified {
		return
	}
	d.unverified = false
	for i := 0; i < verifyLists && i < len(d.scores); i++ {
		if key.score(m, cfg, i) != d.scores[i] {
			d.scores = nil
			d.sorted = map[int][]float64{}
			return
		}
	}
}

package intake

import (
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"

	"meltbook/analysis/indexing"
)

// calibrationFile is the cache file's name under the user's cache folder.
const calibrationFile = "indexing-calibration.json"

// DefaultCalibrationPath returns where the indexing calibration is kept:
// meltbook/indexing-calibration.json under the user's cache folder
// ($XDG_CACHE_HOME, else ~/.cache).
func DefaultCalibrationPath() (string, error) {
	dir, err := os.UserCacheDir()
	if err != nil {
		return "", fmt.Errorf("no cache folder for the indexing calibration: %w", err)
	}
	return filepath.Join(dir, "meltbook", calibrationFile), nil
}

// LoadCalibration loads the indexing calibration kept at path into this
// process (see indexing.LoadCalibration) and returns how many entries it
// took. A missing file takes none and is no error; a damaged or foreign one
// is reported and ignored by the caller's choice (nothing is loaded from
// it). Scores are checked on first use, so a stale file costs time, never
// a wrong chance.
func LoadCalibration(path string) (int, error) {
	b, err := os.ReadFile(path)
	if errors.Is(err, fs.ErrNotExist) {
		return 0, nil
	}
	if err != nil {
		return 0, fmt.Errorf("read indexing calibration: %w", err)
	}
	var c indexing.Calibration
	if err := json.Unmarshal(b, &c); err != nil {
		return 0, fmt.Errorf("read indexing calibration %s: %w", path, err)
	}
	return indexing.LoadCalibration(c), nil
}

// SaveCalibration writes this process's indexing calibration to path when
// it holds more scores than the file does, merging the file's entries that
// this process lacks. The file is replaced atomically (written beside it,
// then renamed), so a concurrent reader sees the old or the new file whole.
func SaveCalibration(path string) error {
	// Take what the file holds first, so that entries another process
	// wrote since this one started are kept; a damaged file is replaced.
	var kept indexing.Calibration
	if old, err := os.ReadFile(path); err == nil && json.Unmarshal(old, &kept) == nil {
		indexing.LoadCalibration(kept)
	}
	snap := indexing.SnapshotCalibration()
	if kept.Version == snap.Version && countScores(kept) >= countScores(snap) {
		return nil
	}
	b, err := json.Marshal(snap)
	if err != nil {
		return fmt.Errorf("write indexing calibration: %w", err)
	}
	dir := filepath.Dir(path)
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return fmt.Errorf("write indexing calibration: %w", err)
	}
	tmp, err := os.CreateTemp(dir, "."+calibrationFile+".*")
	if err != nil {
		return fmt.Errorf("write indexing calibration: %w", err)
	}
	if _, err := tmp.Write(b); err != nil {
		tmp.Close()
		os.Remove(tmp.Name())
		return fmt.Errorf("write indexing calibration: %w", err)
	}
	if err := tmp.Close(); err != nil {
		os.Remove(tmp.Name())
		return fmt.Errorf("write indexing calibration: %w", err)
	}
	if err := os.Rename(tmp.Name(), path); err != nil {
		os.Remove(tmp.Name())
		return fmt.Errorf("write indexing calibration: %w", err)
	}
	return nil
}

func countScores(c indexing.Calibration) int {
	n := 0
	for _, e := range c.Entries {
		n += len(e.Scores)
	}
	return n
}

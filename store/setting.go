package store

import (
	"context"
	"database/sql"
	"fmt"
	"sort"
	"strings"

	"meltbook"
)

// Setting names a user may set. Other rows of notebook_setting belong to
// the program (the valence-table fingerprint, the import stamp) and are not
// settings of the user's.
const (
	// SettingPhaseLibrary is a folder of CIF files whose phases the
	// indexer tries beside the built-in phase library.
	SettingPhaseLibrary = "phase-library"
)

// settingHelp describes each user setting.
var settingHelp = map[string]string{
	SettingPhaseLibrary: "folder of CIF files added to the built-in phase library when scans are indexed",
}

// SettingNames returns the names of the settings a user may set, sorted,
// with a line of help each.
func SettingNames() map[string]string {
	out := make(map[string]string, len(settingHelp))
	for k, v := range settingHelp {
		out[k] = v
	}
	return out
}

func checkSettingName(name string) error {
	if _, ok := settingHelp[name]; ok {
		return nil
	}
	names := make([]string, 0, len(settingHelp))
	for k := range settingHelp {
		names = append(names, k)
	}
	sort.Strings(names)
	return meltbook.Errorf(invalid, "setting", "%q is not a setting (there are: %s)", name, strings.Join(names, ", "))
}

// Setting returns the value of a user setting, "" when it is not set.
func (s *Store) Setting(ctx context.Context, name string) (string, error) {
	if err := checkSettingName(name); err != nil {
		return "", err
	}
	var v string
	err := s.read(ctx, func(t *txn) error {
		err := t.queryRow(`SELECT value FROM notebook_setting WHERE name = ?`, name).Scan(&v)
		if err == sql.ErrNoRows {
			v = ""
			return nil
		}
		return err
	})
	if err != nil {
		return "", fmt.Errorf("setting %s: %w", name, err)
	}
	return v, nil
}

// SetSetting sets (or, with an empty value, clears) a user setting, and
// records the change in the history with who made it.
func (s *Store) SetSetting(ctx context.Context, who, name, value string) error {
	if err := checkSettingName(name); err != nil {
		return err
	}
	value = strings.TrimSpace(value)
	return s.write(ctx, who, func(t *txn) error {
		var before string
		err := t.queryRow(`SELECT value FROM notebook_setting WHERE name = ?`, name).Scan(&before)
		if err != nil && err != sql.ErrNoRows {
			return fmt.Errorf("setting %s: %w", name, err)
		}
		if before == value {
			return meltbook.Errorf(invalid, "setting", "%s is already %q", name, value)
		}
		if value == "" {
			_, err = t.exec(`DELETE FROM notebook_setting WHERE name = ?`, name)
		} else {
			_, err = t.exec(`INSERT INTO notebook_setting (name, value) VALUES (?, ?)
				ON CONFLICT (name) DO UPDATE SET value = excluded.value`, name, value)
		}
		if err != nil {
			return fmt.Errorf("setting %s: %w", name, err)
		}
		_, err = t.record(0, "setting", 0, "amend", change{field: name, before: before, after: value}, "")
		return err
	})
}

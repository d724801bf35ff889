package store

import (
	"context"
	"crypto/sha256"
	"database/sql"
	"encoding/hex"
	"errors"
	"fmt"
	"slices"
	"sort"
	"strings"

	"meltbook"
)

// eOverA is the mean number of valence electrons per atom of a
// composition under a valence table:
//
//	e/a = Σ_i x_i · v_i
//
// with x_i the atomic fraction and v_i the valence of element i, over the
// elements with x_i > 0. ok is false when the table has no valence for one
// of them. Reference: common practice (Hume-Rothery electron concentration).
func eOverA(fractions []meltbook.ElementFraction, valence map[string]float64) (value float64, ok bool) {
	if len(fractions) == 0 {
		return 0, false
	}
	for _, f := range fractions {
		if f.Fraction <= 0 {
			continue
		}
		v, has := valence[f.Element]
		if !has {
			return 0, false
		}
		value += f.Fraction * v
	}
	return value, true
}

// elementSet is the melt's element_set column: the elements present
// (fraction > 0), sorted and comma-wrapped, e.g. ",Al,Cu,Fe,".
func elementSet(nominal []meltbook.ElementFraction) string {
	var els []string
	for _, f := range nominal {
		if f.Fraction > 0 {
			els = append(els, f.Element)
		}
	}
	sort.Strings(els)
	return "," + strings.Join(slices.Compact(els), ",") + ","
}

// eOverAColumns returns the values of the e_over_a_group and
// e_over_a_raynor columns for a nominal composition (nil when undefined).
func (s *Store) eOverAColumns(nominal []meltbook.ElementFraction) (group, raynor any) {
	col := func(scheme string) any {
		table, ok := s.valences[scheme]
		if !ok {
			return nil
		}
		if v, ok := eOverA(nominal, table); ok {
			return v
		}
		return nil
	}
	return col("group"), col("raynor")
}

// valenceFingerprint identifies the valence tables the stored e/a columns
// were computed with.
func (s *Store) valenceFingerprint() string {
	h := sha256.New()
	for _, scheme := range KeptSchemes {
		table, ok := s.valences[scheme]
		if !ok {
			continue
		}
		elements := make([]string, 0, len(table))
		for el := range table {
			elements = append(elements, el)
		}
		sort.Strings(elements)
		fmt.Fprintf(h, "%s\n", scheme)
		for _, el := range elements {
			fmt.Fprintf(h, "%s=%s\n", el, formatFloat(table[el]))
		}
	}
	return hex.EncodeToString(h.Sum(nil))
}

const fingerprintSetting = "valence-fingerprint"

// syncDerived recomputes every melt's stored e/a when the notebook is
// opened with other valence tables than the ones it was computed with.
func (s *Store) syncDerived(ctx context.Context) error {
	fp := s.valenceFingerprint()
	var stored string
	err := s.db.QueryRowContext(ctx, `SELECT value FROM notebook_setting WHERE name = ?`, fingerprintSetting).Scan(&stored)
	if err != nil && !errors.Is(err, sql.ErrNoRows) {
		return fmt.Errorf("valence tables: %w", err)
	}
	if stored == fp {
		return nil
	}
	return s.write(ctx, "meltbook", func(t *txn) error {
		return t.recomputeEOverA(fp)
	})
}

// recomputeEOverA rewrites the e/a columns of every melt. They are derived
// values, so the history does not record this.
func (t *txn) recomputeEOverA(fingerprint string) error {
	rows, err := t.query(`SELECT melt_id, element, fraction FROM melt_element ORDER BY melt_id, position`)
	if err != nil {
		return fmt.Errorf("recompute e/a: %w", err)
	}
	compositions := map[int64][]meltbook.ElementFraction{}
	var ids []int64
	for rows.Next() {
		var id int64
		var f meltbook.ElementFraction
		if err := rows.Scan(&id, &f.Element, &f.Fraction); err != nil {
			rows.Close()
			return fmt.Errorf("recompute e/a: %w", err)
		}
		if _, seen := compositions[id]; !seen {
			ids = append(ids, id)
		}
		compositions[id] = append(compositions[id], f)
	}
	rows.Close()
	if err := rows.Err(); err != nil {
		return fmt.Errorf("recompute e/a: %w", err)
	}
	for _, id := range ids {
		group, raynor := t.s.eOverAColumns(compositions[id])
		if _, err := t.exec(`UPDATE melt SET e_over_a_group = ?, e_over_a_raynor = ? WHERE id = ?`, group, raynor, id); err != nil {
			return fmt.Errorf("recompute e/a: %w", err)
		}
	}
	if _, err := t.exec(`INSERT INTO notebook_setting (name, value) VALUES (?, ?)
		ON CONFLICT (name) DO UPDATE SET value = excluded.value`, fingerprintSetting, fingerprint); err != nil {
		return fmt.Errorf("recompute e/a: %w", err)
	}
	return nil
}

package store

import (
	"context"
	"fmt"

	"meltbook"
)

// NearbySample is a sample of another melt whose nominal composition lies
// near a given one, with the outcomes that stand on it.
type NearbySample struct {
	SampleCode string
	MeltCode   string
	// Nominal is the melt's nominal composition.
	Nominal []meltbook.ElementFraction
	// Outcomes are the standing ones: a person's, and proposals a person
	// confirmed.
	Outcomes []meltbook.Outcome
}

// SamplesNear returns the samples of melts other than exceptMelt that have
// a standing outcome and whose nominal composition may lie within
// withinFraction of nominal: the major element of nominal is within
// ±withinFraction (atomic fraction) in the melt. The caller measures the
// distance it wants; every sample within that Euclidean distance in
// composition space passes this test, since no one element can differ by
// more than the distance.
func (s *Store) SamplesNear(ctx context.Context, nominal []meltbook.ElementFraction, withinFraction float64, exceptMelt string) ([]NearbySample, error) {
	if len(nominal) == 0 {
		return nil, meltbook.Errorf(invalid, "composition", "no composition to look near")
	}
	if !(withinFraction >= 0 && withinFraction <= 1) {
		return nil, meltbook.Errorf(invalid, "distance", "%g is not an atomic fraction between 0 and 1", withinFraction)
	}
	major := nominal[0]
	for _, f := range nominal {
		if f.Fraction > major.Fraction {
			major = f
		}
	}
	var out []NearbySample
	err := s.read(ctx, func(t *txn) error {
		rows, err := t.query(`SELECT `+outcomeColumns+`, m.code, m.id FROM melt_element me
				JOIN melt m ON m.id = me.melt_id
				JOIN sample sa ON sa.melt_id = m.id
				JOIN outcome o ON o.sample_id = sa.id
			WHERE me.element = ? AND me.fraction BETWEEN ? AND ? AND m.code <> ?
			  AND (o.source = 'person' OR o.status = 'confirmed')
			ORDER BY m.code, sa.code, `+outcomeRank+`, o.id`,
			major.Element, major.Fraction-withinFraction, major.Fraction+withinFraction, exceptMelt)
		if err != nil {
			return fmt.Errorf("samples near %s: %w", formatFractions(nominal), err)
		}
		defer rows.Close()
		meltOf := map[string]int64{}
		for rows.Next() {
			var melt string
			var meltID int64
			o, err := scanOutcome(scanExtra{rows, []any{&melt, &meltID}})
			if err != nil {
				return fmt.Errorf("samples near: %w", err)
			}
			if n := len(out); n == 0 || out[n-1].SampleCode != o.SampleCode {
				out = append(out, NearbySample{SampleCode: o.SampleCode, MeltCode: melt})
				meltOf[melt] = meltID
			}
			out[len(out)-1].Outcomes = append(out[len(out)-1].Outcomes, *o)
		}
		if err := rows.Err(); err != nil {
			return fmt.Errorf("samples near: %w", err)
		}
		rows.Close()
		nominals := map[string][]meltbook.ElementFraction{}
		for i := range out {
			code := out[i].MeltCode
			if _, ok := nominals[code]; !ok {
				if nominals[code], err = t.nominalByMeltID(meltOf[code]); err != nil {
					return err
				}
			}
			out[i].Nominal = nominals[code]
		}
		return nil
	})
	return out, err
}

func (t *txn) nominalByMeltID(id int64) ([]meltbook.ElementFraction, error) {
	rows, err := t.query(`SELECT element, fraction FROM melt_element WHERE melt_id = ? ORDER BY position`, id)
	if err != nil {
		return nil, fmt.Errorf("composition of melt %d: %w", id, err)
	}
	defer rows.Close()
	var out []meltbook.ElementFraction
	for rows.Next() {
		var f meltbook.ElementFraction
		if err := rows.Scan(&f.Element, &f.Fraction); err != nil {
			return nil, fmt.Errorf("composition of melt %d: %w", id, err)
		}
		out = append(out, f)
	}
	return out, rows.Err()
}

// SampleEvidence is what the notebook holds about a sample that bears on
// which phases it has, apart from its scans: its melt's nominal
// composition and the symmetries electron diffraction saw on it.
type SampleEvidence struct {
	Sample   meltbook.Sample
	MeltCode string
	Nominal  []meltbook.ElementFraction
	Symmetry []meltbook.SymmetryObservation
}

// SampleEvidence returns the evidence on a sample other than its scans.
func (s *Store) SampleEvidence(ctx context.Context, sampleCode string) (*SampleEvidence, error) {
	var out *SampleEvidence
	err := s.read(ctx, func(t *txn) error {
		sa, err := t.sampleByCode(sampleCode)
		if err != nil {
			return err
		}
		m, err := t.meltByID(sa.MeltID)
		if err != nil {
			return err
		}
		rows, err := t.query(`SELECT `+observationColumns+` FROM symmetry_observation WHERE sample_id = ? ORDER BY id`, sa.ID)
		if err != nil {
			return fmt.Errorf("sample %s observations: %w", sa.Code, err)
		}
		obs, err := t.scanObservations(rows)
		if err != nil {
			return fmt.Errorf("sample %s observations: %w", sa.Code, err)
		}
		out = &SampleEvidence{Sample: *sa, MeltCode: m.Code, Nominal: m.Nominal, Symmetry: obs}
		return nil
	})
	return out, err
}

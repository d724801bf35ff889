package store

import (
	"context"
	"database/sql"
	"fmt"
	"strings"

	"meltbook"
)

func (t *txn) insertNote(n *meltbook.Note) error {
	var sample any
	if n.SampleID != nil {
		sample = *n.SampleID
	}
	n.At = n.At.UTC()
	id, err := t.insert(`INSERT INTO note (id, melt_id, sample_id, author, written_at, body) VALUES (?, ?, ?, ?, ?, ?) RETURNING id`,
		idArg(n.ID), n.MeltID, sample, n.Author, formatTime(n.At), n.Text)
	if err != nil {
		return fmt.Errorf("note: %w", err)
	}
	n.ID = id
	return t.recordCreate(n.MeltID, "note", n.ID, n)
}

// AddNote writes a dated note by who on a melt or on one of its samples:
// code is a melt's code (the note is on the melt) or a derived sample's.
func (s *Store) AddNote(ctx context.Context, who, code, text string) (*meltbook.Note, error) {
	if strings.TrimSpace(text) == "" {
		return nil, meltbook.Errorf(invalid, "text", "a note needs some text")
	}
	n := &meltbook.Note{Author: who, Text: text}
	err := s.write(ctx, who, func(t *txn) error {
		sa, err := t.sampleByCode(code)
		if err != nil {
			return err
		}
		n.MeltID = sa.MeltID
		if sa.ParentID != nil {
			n.SampleID, n.SampleCode = &sa.ID, sa.Code
		}
		n.At = t.now
		return t.insertNote(n)
	})
	if err != nil {
		return nil, err
	}
	return n, nil
}

const noteColumns = `n.id, n.melt_id, n.sample_id, COALESCE(sa.code, ''), n.author, n.written_at, n.body`

func scanNote(sc interface{ Scan(...any) error }) (*meltbook.Note, error) {
	var n meltbook.Note
	var sample sql.NullInt64
	var at string
	if err := sc.Scan(&n.ID, &n.MeltID, &sample, &n.SampleCode, &n.Author, &at, &n.Text); err != nil {
		return nil, err
	}
	if sample.Valid {
		id := sample.Int64
		n.SampleID = &id
	}
	var err error
	n.At, err = parseTime(at)
	return &n, err
}

// AmendNote changes a note's text, with a reason.
func (s *Store) AmendNote(ctx context.Context, who string, id int64, u meltbook.NoteUpdate, why string) ([]meltbook.HistoryEntry, error) {
	if err := needReason(why); err != nil {
		return nil, err
	}
	var out []meltbook.HistoryEntry
	err := s.write(ctx, who, func(t *txn) error {
		n, err := scanNote(t.queryRow(`SELECT `+noteColumns+` FROM note n LEFT JOIN sample sa ON sa.id = n.sample_id WHERE n.id = ?`, id))
		if err == sql.ErrNoRows {
			return meltbook.Errorf(notFound, "note", "no note %d in the notebook", id)
		}
		if err != nil {
			return fmt.Errorf("note %d: %w", id, err)
		}
		var cs []change
		if u.Text != nil && *u.Text != n.Text {
			if strings.TrimSpace(*u.Text) == "" {
				return meltbook.Errorf(invalid, "text", "a note needs some text")
			}
			cs = append(cs, change{"text", n.Text, *u.Text})
			if _, err := t.exec(`UPDATE note SET body = ? WHERE id = ?`, *u.Text, id); err != nil {
				return fmt.Errorf("amend note %d: %w", id, err)
			}
		}
		out, err = t.recordAmendment(n.MeltID, "note", id, cs, why)
		return err
	})
	return out, err
}

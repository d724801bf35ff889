package store_test

import (
	"bytes"
	"context"
	"encoding/json"
	"testing"

	"meltbook"
	"meltbook/store"
)

func TestSettingSetReadClear(t *testing.T) {
	ctx := context.Background()
	s := MustOpen(t)
	if v, err := s.Setting(ctx, store.SettingPhaseLibrary); err != nil || v != "" {
		t.Fatalf("unset setting = %q, %v; want empty", v, err)
	}
	if err := s.SetSetting(ctx, "ana", store.SettingPhaseLibrary, " /lab/cif "); err != nil {
		t.Fatal(err)
	}
	if v, _ := s.Setting(ctx, store.SettingPhaseLibrary); v != "/lab/cif" {
		t.Fatalf("setting = %q, want /lab/cif (trimmed)", v)
	}
	if err := s.SetSetting(ctx, "ana", store.SettingPhaseLibrary, "/lab/cif"); meltbook.KindOf(err) != meltbook.Invalid {
		t.Fatalf("setting the same value again: %v, want an Invalid error", err)
	}
	if err := s.SetSetting(ctx, "ben", store.SettingPhaseLibrary, ""); err != nil {
		t.Fatal(err)
	}
	if v, _ := s.Setting(ctx, store.SettingPhaseLibrary); v != "" {
		t.Fatalf("cleared setting = %q", v)
	}
	// Both changes are in the history, with who made them and the values.
	var d store.Document
	if err := json.NewDecoder(bytes.NewReader(export(t, s))).Decode(&d); err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, h := range d.History {
		if h.Entity == "setting" {
			got = append(got, h.Who+":"+h.Field+":"+h.Before+"→"+h.After)
		}
	}
	want := []string{"ana:phase-library:→/lab/cif", "ben:phase-library:/lab/cif→"}
	if len(got) != len(want) || got[0] != want[0] || got[1] != want[1] {
		t.Fatalf("history of the setting = %q, want %q", got, want)
	}
}

func TestSettingUnknownNameRefused(t *testing.T) {
	ctx := context.Background()
	s := MustOpen(t)
	before := export(t, s)
	for _, name := range []string{"imported", "analyzed-melts", "phase library"} {
		if err := s.SetSetting(ctx, "ana", name, "x"); meltbook.KindOf(err) != meltbook.Invalid {
			t.Errorf("SetSetting(%q) = %v, want Invalid", name, err)
		}
		if _, err := s.Setting(ctx, name); meltbook.KindOf(err) != meltbook.Invalid {
			t.Errorf("Setting(%q) = %v, want Invalid", name, err)
		}
	}
	if !bytes.Equal(before, export(t, s)) {
		t.Fatal("a refused setting changed the notebook")
	}
}

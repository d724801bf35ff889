package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestExportRestoreRoundTrip exports a notebook holding every kind of
// record and its history, a scan indexed twice included, restores it into
// a new notebook and exports that: the two documents must be identical.
func TestExportRestoreRoundTrip(t *testing.T) {
	nb := buildWorkflow(t)
	nb.ok("amend", "outcome:1", "fraction=85%", "--reason", "second look")
	nb.ok("scan", "add", "QX-0001.a1", alScan(t, t.TempDir(), "QX-0001.a1_al.xy", 3))
	nb.ok("scan", "reindex", "1", "--reason", "narrower tolerance", "--tolerance", "0.08")
	first := filepath.Join(t.TempDir(), "notebook.json")
	if out := nb.ok("export", first); out != "" {
		t.Errorf("export to a file printed %q", out)
	}
	data, err := os.ReadFile(first)
	if err != nil {
		t.Fatal(err)
	}

	copyPath := filepath.Join(t.TempDir(), "sub", "copy.db")
	out, errOut, code := nb.run("", "--notebook", copyPath, "restore", first)
	if code != 0 {
		t.Fatalf("restore: exit %d: %s", code, errOut)
	}
	if !strings.Contains(out, "restored") {
		t.Errorf("restore printed %q", out)
	}
	again, errOut, code := nb.run("", "--notebook", copyPath, "export")
	if code != 0 {
		t.Fatalf("export of the copy: exit %d: %s", code, errOut)
	}
	if again != string(data) {
		t.Errorf("the restored notebook exports differently:\n--- first\n%s\n--- again\n%s", data, again)
	}
	// The copy shows the same melt and scan, history included.
	if a, b := nb.ok("show", "QX-0001"), nb.ok("--notebook", copyPath, "show", "QX-0001"); a != b {
		t.Errorf("show differs after the round trip:\n%s\n---\n%s", a, b)
	}
	if a, b := nb.ok("scan", "show", "1"), nb.ok("--notebook", copyPath, "scan", "show", "1"); a != b || !strings.Contains(a, "narrower tolerance") {
		t.Errorf("scan show differs after the round trip:\n%s\n---\n%s", a, b)
	}

	// Export never overwrites a file.
	if _, errOut, code := nb.run("", "export", first); code != exitConflict || !strings.Contains(errOut, "already exists") {
		t.Errorf("export over an existing file: exit %d, %q", code, errOut)
	}
}

func TestRestoreBadDocument(t *testing.T) {
	nb := newNotebook(t)
	bad := filepath.Join(t.TempDir(), "bad.json")
	if err := os.WriteFile(bad, []byte(`{"format": "meltbook-notebook", "version": 1, "melts": [{"id": 1, "code": "", "nominal": []}], "history": []}`), 0o644); err != nil {
		t.Fatal(err)
	}
	fresh := filepath.Join(t.TempDir(), "fresh.db")
	_, errOut, code := nb.run("", "--notebook", fresh, "restore", bad)
	if code != exitInvalid || !strings.Contains(errOut, "bad.json") {
		t.Errorf("bad document: exit %d, %q", code, errOut)
	}
	if _, err := os.Stat(fresh); !os.IsNotExist(err) {
		t.Errorf("a notebook created for a refused document was left behind (%v)", err)
	}
	// An existing empty notebook stays usable and empty.
	before := nb.export()
	if _, _, code := nb.run("", "restore", bad); code != exitInvalid {
		t.Errorf("bad document into the test notebook: exit %d", code)
	}
	if nb.export() != before {
		t.Error("a refused document changed the notebook")
	}
}

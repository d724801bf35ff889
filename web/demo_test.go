package web_test

import (
	"bytes"
	"context"
	"io"
	"mime/multipart"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"sync"
	"testing"
	"time"

	"meltbook/seed"
	"meltbook/store"
	"meltbook/store/intake"
)

func TestMain(m *testing.M) {
	code := m.Run()
	if demo.dir != "" {
		os.RemoveAll(demo.dir)
	}
	os.Exit(code)
}

// demo is the demonstration notebook (package seed, seed 1) with its
// invented scans, built once per run of the test binary as `meltbook demo`
// builds it; each test gets a copy of the file.
var demo struct {
	once  sync.Once
	dir   string
	path  string
	nb    *seed.Notebook
	scans []seed.Scan
	err   error
}

// demoSeed is the seed of the demonstration notebook the README shows.
const demoSeed = 1

// demoStore opens a fresh copy of the demonstration notebook.
func demoStore(t testing.TB) (*store.Store, *seed.Notebook, []seed.Scan) {
	t.Helper()
	demo.once.Do(func() { demo.err = buildDemo() })
	if demo.err != nil {
		t.Fatal(demo.err)
	}
	data, err := os.ReadFile(demo.path)
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "demo.db")
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	st, err := store.Open(context.Background(), path, storeOptions())
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { st.Close() })
	return st, demo.nb, demo.scans
}

func buildDemo() error {
	ctx := context.Background()
	var err error
	if demo.dir, err = os.MkdirTemp("", "meltbook-web-demo-"); err != nil {
		return err
	}
	demo.path = filepath.Join(demo.dir, "demo.db")
	if demo.nb, err = seed.Generate(demoSeed); err != nil {
		return err
	}
	doc, err := demo.nb.Document()
	if err != nil {
		return err
	}
	if demo.scans, err = demo.nb.Scans(demoSeed); err != nil {
		return err
	}
	// Each scan is stored as imported when the lab measured it.
	var at time.Time
	opt := storeOptions()
	opt.Now = func() time.Time { return at }
	st, err := store.Init(ctx, demo.path, opt)
	if err != nil {
		return err
	}
	defer st.Close()
	if err := st.ImportDocument(ctx, "meltbook demo", doc); err != nil {
		return err
	}
	for _, s := range demo.scans {
		at = s.MeasuredAt
		if _, err := intake.Add(ctx, st, s.Operator, intake.File{Sample: s.Sample, Name: s.FileName, Data: s.Data}, intake.Options{Radiation: "Cu"}); err != nil {
			return err
		}
	}
	return st.Close()
}

// postFile sends a multipart form with one file, as a browser's upload.
func (fs formSession) postFile(t *testing.T, h http.Handler, target string, fields map[string]string, fileName string, data []byte) (*http.Response, string) {
	t.Helper()
	var body bytes.Buffer
	mw := multipart.NewWriter(&body)
	if _, ok := fields["form_key"]; !ok {
		mw.WriteField("form_key", fs.key)
	}
	for k, v := range fields {
		mw.WriteField(k, v)
	}
	if fileName != "" {
		fw, err := mw.CreateFormFile("file", fileName)
		if err != nil {
			t.Fatal(err)
		}
		io.Copy(fw, bytes.NewReader(data))
	}
	mw.Close()
	r := httptest.NewRequest(http.MethodPost, target, &body)
	r.Header.Set("Content-Type", mw.FormDataContentType())
	if fs.cookie != nil {
		r.AddCookie(fs.cookie)
	}
	return do(t, h, r)
}

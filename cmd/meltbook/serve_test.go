package main

import (
	"bytes"
	"context"
	"io"
	"net/http"
	"net/url"
	"path/filepath"
	"regexp"
	"strings"
	"sync"
	"testing"
	"time"
)

// syncBuffer is a buffer a running command writes to while the test reads.
type syncBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (s *syncBuffer) Write(p []byte) (int, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.Write(p)
}

func (s *syncBuffer) String() string {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.String()
}

var openLine = regexp.MustCompile(`open (http://\S+) in a browser; Ctrl-C stops`)

// serving is meltbook running in-process until stop is called.
type serving struct {
	url       string
	out, errs *syncBuffer
	stop      func() int
}

// startServing runs meltbook with args until it prints the address to
// open; stop cancels its context, as Ctrl-C does, and returns the exit
// code. Every wait is bounded.
func startServing(t *testing.T, args ...string) *serving {
	t.Helper()
	// The indexing calibration is kept in the cache folder.
	t.Setenv("XDG_CACHE_HOME", t.TempDir())
	ctx, cancel := context.WithCancel(context.Background())
	s := &serving{out: &syncBuffer{}, errs: &syncBuffer{}}
	done := make(chan int, 1)
	go func() { done <- Run(ctx, args, strings.NewReader(""), s.out, s.errs) }()
	deadline := time.After(2 * time.Minute)
	for s.url == "" {
		select {
		case code := <-done:
			cancel()
			t.Fatalf("meltbook %s ended (exit %d) before serving:\n%s\n%s", strings.Join(args, " "), code, s.out, s.errs)
		case <-deadline:
			cancel()
			t.Fatalf("meltbook %s printed no address to open in 2 minutes:\n%s", strings.Join(args, " "), s.out)
		case <-time.After(20 * time.Millisecond):
			if m := openLine.FindStringSubmatch(s.out.String()); m != nil {
				s.url = m[1]
			}
		}
	}
	stopped := false
	s.stop = func() int {
		if stopped {
			return -1
		}
		stopped = true
		cancel()
		select {
		case code := <-done:
			return code
		case <-time.After(30 * time.Second):
			t.Fatal("meltbook did not stop within 30 s of Ctrl-C")
			return -1
		}
	}
	t.Cleanup(func() { s.stop() })
	return s
}

// fetch GETs a URL with a bounded wait and returns the status and body.
func fetch(t *testing.T, u string) (int, string) {
	t.Helper()
	client := &http.Client{Timeout: 20 * time.Second}
	res, err := client.Get(u)
	if err != nil {
		t.Fatal(err)
	}
	defer res.Body.Close()
	body, err := io.ReadAll(res.Body)
	if err != nil {
		t.Fatal(err)
	}
	return res.StatusCode, string(body)
}

func TestServeServesTheNotebook(t *testing.T) {
	path := filepath.Join(t.TempDir(), "notebook.db")
	if _, errOut, code := runCLI(t, "", "--notebook", path, "init"); code != 0 {
		t.Fatal(errOut)
	}
	if _, errOut, code := runCLI(t, "", "--notebook", path, "--as", "adaeze", "log", "--code", "QX-0042", "--composition", "Al63Cu25Fe12", "--mass", "10g", "--thickness", "30um"); code != 0 {
		t.Fatal(errOut)
	}
	s := startServing(t, "--notebook", path, "serve")
	if !strings.HasPrefix(s.url, "http://127.0.0.1:") || strings.Contains(s.url, "token") {
		t.Errorf("address %q; want 127.0.0.1 on a free port, without a token", s.url)
	}
	if !strings.Contains(s.out.String(), "Serving the notebook "+path) {
		t.Errorf("output does not name the notebook:\n%s", s.out)
	}
	if status, body := fetch(t, s.url); status != http.StatusOK || !strings.Contains(body, "<strong>1</strong> melts") {
		t.Errorf("overview: %d\n%s", status, body)
	}
	if status, body := fetch(t, s.url+"runs"); status != http.StatusOK || !strings.Contains(body, `href="/runs/QX-0042"`) {
		t.Errorf("run list: %d, lists QX-0042: %v", status, strings.Contains(body, "QX-0042"))
	}
	if code := s.stop(); code != exitOK {
		t.Errorf("exit %d after Ctrl-C; stderr:\n%s", code, s.errs)
	}
	if !strings.HasSuffix(s.out.String(), "stopped serving\n") {
		t.Errorf("output after stopping:\n%s", s.out)
	}
	if _, err := (&http.Client{Timeout: 5 * time.Second}).Get(s.url); err == nil {
		t.Error("the server still answers after stopping")
	}
}

func TestServeWithATokenRefusesRequestsWithoutIt(t *testing.T) {
	path := filepath.Join(t.TempDir(), "notebook.db")
	if _, errOut, code := runCLI(t, "", "--notebook", path, "init"); code != 0 {
		t.Fatal(errOut)
	}
	const token = "invented-token-for-the-test-0123456789"
	t.Setenv(tokenEnv, token)
	s := startServing(t, "--notebook", path, "serve", "--listen", "127.0.0.1:0")
	u, err := url.Parse(s.url)
	if err != nil {
		t.Fatal(err)
	}
	if u.Query().Get("token") != token {
		t.Fatalf("address %q does not carry the token from $%s", s.url, tokenEnv)
	}
	base := "http://" + u.Host + "/api/summary"
	if status, _ := fetch(t, base); status != http.StatusUnauthorized {
		t.Errorf("without the token: %d, want 401", status)
	}
	if status, _ := fetch(t, base+"?token="+token); status != http.StatusOK {
		t.Errorf("with the token: %d, want 200", status)
	}
}

func TestServeBeyondThisMachineMakesAToken(t *testing.T) {
	path := filepath.Join(t.TempDir(), "notebook.db")
	if _, errOut, code := runCLI(t, "", "--notebook", path, "init"); code != 0 {
		t.Fatal(errOut)
	}
	t.Setenv(tokenEnv, "")
	s := startServing(t, "--notebook", path, "serve", "--listen", "0.0.0.0:0")
	u, err := url.Parse(s.url)
	if err != nil {
		t.Fatal(err)
	}
	token := u.Query().Get("token")
	if len(token) < 40 || !strings.Contains(s.out.String(), "needs the access token") {
		t.Fatalf("address %q, output:\n%s\nwant a made-up token and a word about it", s.url, s.out)
	}
	base := "http://127.0.0.1:" + u.Port() + "/api/summary"
	if status, _ := fetch(t, base); status != http.StatusUnauthorized {
		t.Errorf("without the token: %d, want 401", status)
	}
	if status, _ := fetch(t, base+"?token="+token); status != http.StatusOK {
		t.Errorf("with the token: %d, want 200", status)
	}
}

func TestServeRefusesBadSettings(t *testing.T) {
	path := filepath.Join(t.TempDir(), "notebook.db")
	if _, errOut, code := runCLI(t, "", "--notebook", path, "init"); code != 0 {
		t.Fatal(errOut)
	}
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"--listen", "somewhere"}, `--listen: cannot serve on "somewhere"`},
		{[]string{"--listen", "127.0.0.1:99999"}, "--listen: cannot serve"},
		{[]string{"--token", "short"}, "--token: an access token needs at least 16 characters"},
	} {
		_, errOut, code := runCLI(t, "", append([]string{"--notebook", path, "serve"}, tc.args...)...)
		if code != exitInvalid || !strings.Contains(errOut, tc.want) {
			t.Errorf("%v: exit %d, stderr %q; want exit 2 saying %q", tc.args, code, errOut, tc.want)
		}
	}
	if _, errOut, code := runCLI(t, "", "--notebook", filepath.Join(t.TempDir(), "none.db"), "serve"); code != exitNotFound || !strings.Contains(errOut, "meltbook init") {
		t.Errorf("no notebook: exit %d, %q", code, errOut)
	}
}

// TestDemoServes runs the README's command: it builds the demo, says what
// to melt next, then serves the demo notebook until Ctrl-C.
func TestDemoServes(t *testing.T) {
	path := filepath.Join(t.TempDir(), "demo.db")
	s := startServing(t, "--notebook", path, "demo")
	out := s.out.String()
	if i, j := strings.Index(out, "WHAT TO TRY NEXT"), strings.Index(out, "open http://"); i < 0 || j < i {
		t.Errorf("the address should follow the suggestions:\n%s", out)
	}
	status, body := fetch(t, s.url+"map?a=Al&b=Cu&c=Fe")
	if status != http.StatusOK || !strings.Contains(body, `class="marks"`) {
		t.Errorf("demo map: %d", status)
	}
	if status, body := fetch(t, s.url+"runs/QR-0001"); status != http.StatusOK || !strings.Contains(body, "Melt QR-0001") {
		t.Errorf("demo run QR-0001: %d", status)
	}
	if code := s.stop(); code != exitOK {
		t.Errorf("exit %d after Ctrl-C; stderr:\n%s", code, s.errs)
	}
}

package web_test

import (
	"encoding/json"
	"io"
	"log/slog"
	"net/http"
	"net/http/httptest"
	"net/url"
	"strings"
	"testing"
	"time"

	"meltbook/web"
)

func TestTokenIsRequiredOnEveryRequest(t *testing.T) {
	const token = "a-long-enough-invented-token-0123456789"
	s := newServer(t, mapSamples(), func(c *web.Config) { c.Token = token })

	for _, path := range []string{"/", "/runs", "/map", "/static/meltbook.css", "/api/summary", "/nowhere"} {
		res, body := get(t, s, path)
		if res.StatusCode != http.StatusUnauthorized {
			t.Errorf("GET %s without token: %d, want 401", path, res.StatusCode)
		}
		if strings.Contains(body, "ZR-1") {
			t.Errorf("GET %s without token leaked notebook content", path)
		}
	}
	res, body := get(t, s, "/api/summary")
	if ct := res.Header.Get("Content-Type"); !strings.HasPrefix(ct, "application/json") || !strings.Contains(body, `"kind":"unauthorised"`) {
		t.Errorf("API refusal is %q: %s", ct, body)
	}
	res, body = get(t, s, "/?token=wrong")
	if res.StatusCode != http.StatusUnauthorized || !strings.Contains(body, "access token") {
		t.Errorf("wrong token: %d", res.StatusCode)
	}

	// Header.
	r := httptest.NewRequest(http.MethodGet, "/api/summary", nil)
	r.Header.Set("Authorization", "Bearer "+token)
	if res, _ := do(t, s, r); res.StatusCode != http.StatusOK {
		t.Errorf("bearer token: %d", res.StatusCode)
	}
	// Query on an API call: answered directly.
	if res, _ := get(t, s, "/api/summary?token="+token); res.StatusCode != http.StatusOK {
		t.Errorf("API with token in query: %d", res.StatusCode)
	}
	// Query on a page: cookie, then a redirect without the token.
	res, _ = get(t, s, "/map?a=Al&b=Cu&c=Fe&token="+token)
	if res.StatusCode != http.StatusSeeOther || res.Header.Get("Location") != "/map?a=Al&b=Cu&c=Fe" {
		t.Fatalf("page with token: %d to %q, want 303 to /map?a=Al&b=Cu&c=Fe", res.StatusCode, res.Header.Get("Location"))
	}
	var cookie *http.Cookie
	for _, c := range res.Cookies() {
		if c.Name == "meltbook_access" {
			cookie = c
		}
	}
	if cookie == nil || !cookie.HttpOnly || cookie.SameSite != http.SameSiteStrictMode {
		t.Fatalf("token cookie %+v, want HttpOnly and SameSite=Strict", cookie)
	}
	r = httptest.NewRequest(http.MethodGet, "/map?a=Al&b=Cu&c=Fe", nil)
	r.AddCookie(cookie)
	if res, _ := do(t, s, r); res.StatusCode != http.StatusOK {
		t.Errorf("page with token cookie: %d", res.StatusCode)
	}
}

func TestListenOnLoopbackNeedsNoTokenButChecksTheHost(t *testing.T) {
	s := newServer(t, mapSamples())
	u, err := s.Listen("127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer s.Shutdown(t.Context())
	if !strings.HasPrefix(u, "http://127.0.0.1:") || strings.Contains(u, "token") || s.Token() != "" {
		t.Fatalf("Listen = %q (token %q), want a loopback URL without token", u, s.Token())
	}
	client := &http.Client{Timeout: 10 * time.Second}
	res, err := client.Get(u + "api/summary")
	if err != nil {
		t.Fatal(err)
	}
	res.Body.Close()
	if res.StatusCode != http.StatusOK {
		t.Errorf("GET %s: %d", u, res.StatusCode)
	}
	// A page asked for under another name, as after DNS rebinding.
	r, _ := http.NewRequest(http.MethodGet, u, nil)
	r.Host = "notebook.attacker.example"
	res, err = client.Do(r)
	if err != nil {
		t.Fatal(err)
	}
	res.Body.Close()
	if res.StatusCode != http.StatusForbidden {
		t.Errorf("foreign Host header: %d, want 403", res.StatusCode)
	}
	if _, err := s.Listen("127.0.0.1:0"); err == nil {
		t.Error("a second Listen was accepted")
	}
}

func TestListenOnAnotherAddressMakesAToken(t *testing.T) {
	s := newServer(t, mapSamples())
	u, err := s.Listen("0.0.0.0:0")
	if err != nil {
		t.Skipf("cannot listen on all interfaces here: %v", err)
	}
	defer s.Shutdown(t.Context())
	parsed, err := url.Parse(u)
	if err != nil {
		t.Fatal(err)
	}
	token := parsed.Query().Get("token")
	if len(token) < 40 || token != s.Token() {
		t.Fatalf("URL %q carries token %q, server has %q", u, token, s.Token())
	}
	base := "http://127.0.0.1:" + parsed.Port() + "/api/summary"
	client := &http.Client{Timeout: 10 * time.Second}
	for _, tc := range []struct {
		url  string
		want int
	}{{base, http.StatusUnauthorized}, {base + "?token=" + token, http.StatusOK}} {
		res, err := client.Get(tc.url)
		if err != nil {
			t.Fatal(err)
		}
		io.Copy(io.Discard, res.Body)
		res.Body.Close()
		if res.StatusCode != tc.want {
			t.Errorf("GET %s: %d, want %d", strings.Replace(tc.url, token, "TOKEN", 1), res.StatusCode, tc.want)
		}
	}
}

func TestFormsNeedTheirKey(t *testing.T) {
	s := newServer(t, mapSamples())
	fs := openForm(t, s, "/runs/ZR-1")
	note := func() url.Values {
		return url.Values{"author": {"T. Ingram"}, "text": {"Ribbon brittle, kept for XRD."}}
	}

	for _, tc := range []struct {
		name string
		fs   formSession
	}{
		{"no cookie, no key", formSession{}},
		{"key without its cookie", formSession{key: fs.key}},
		{"cookie without a key", formSession{cookie: fs.cookie}},
		{"another browser's key", formSession{cookie: fs.cookie, key: openForm(t, s, "/runs/ZR-2").key}},
	} {
		res, body := tc.fs.post(t, s, "/runs/ZR-1/notes", note())
		if res.StatusCode != http.StatusForbidden || !strings.Contains(body, "Reload the page") {
			t.Errorf("%s: %d, want 403", tc.name, res.StatusCode)
		}
	}
	// Sent from another site, even with a good key.
	form := note()
	form.Set("form_key", fs.key)
	r := httptest.NewRequest(http.MethodPost, "/runs/ZR-1/notes", strings.NewReader(form.Encode()))
	r.Header.Set("Content-Type", "application/x-www-form-urlencoded")
	r.Header.Set("Sec-Fetch-Site", "cross-site")
	r.AddCookie(fs.cookie)
	if res, _ := do(t, s, r); res.StatusCode != http.StatusForbidden {
		t.Errorf("cross-site post: %d, want 403", res.StatusCode)
	}
	// The real thing.
	res, _ := fs.post(t, s, "/runs/ZR-1/notes", note())
	if res.StatusCode != http.StatusSeeOther || res.Header.Get("Location") != "/runs/ZR-1#notes" {
		t.Fatalf("good post: %d to %q", res.StatusCode, res.Header.Get("Location"))
	}
	if _, body := get(t, s, "/runs/ZR-1"); !strings.Contains(body, "Ribbon brittle, kept for XRD.") {
		t.Error("the note is not on the run page")
	}
}

func TestBodyLimit(t *testing.T) {
	s := newServer(t, mapSamples(), func(c *web.Config) { c.MaxBodyBytes = 4096 })
	fs := openForm(t, s, "/runs/ZR-1")
	big := url.Values{"author": {"T. Ingram"}, "text": {strings.Repeat("long note ", 1000)}}
	res, body := fs.post(t, s, "/runs/ZR-1/notes", big)
	if res.StatusCode != http.StatusRequestEntityTooLarge || !strings.Contains(body, "larger than") {
		t.Errorf("declared large body: %d, want 413", res.StatusCode)
	}
	// The same without a declared length, so the limit trips while reading.
	big.Set("form_key", fs.key)
	r := httptest.NewRequest(http.MethodPost, "/runs/ZR-1/notes", io.MultiReader(strings.NewReader(big.Encode())))
	r.ContentLength = -1
	r.Header.Set("Content-Type", "application/x-www-form-urlencoded")
	r.AddCookie(fs.cookie)
	if res, _ := do(t, s, r); res.StatusCode != http.StatusRequestEntityTooLarge {
		t.Errorf("streamed large body: %d, want 413", res.StatusCode)
	}
}

func TestSecurityHeadersOnEveryAnswer(t *testing.T) {
	s := newServer(t, mapSamples())
	for _, path := range []string{"/", "/map", "/api/find", "/runs/NOPE", "/static/meltbook.js"} {
		res, _ := get(t, s, path)
		csp := res.Header.Get("Content-Security-Policy")
		if !strings.Contains(csp, "default-src 'self'") || !strings.Contains(csp, "script-src 'self'") || strings.Contains(csp, "unsafe-inline") {
			t.Errorf("%s: CSP %q", path, csp)
		}
		if res.Header.Get("X-Content-Type-Options") != "nosniff" || res.Header.Get("X-Frame-Options") != "DENY" {
			t.Errorf("%s: missing nosniff or frame header", path)
		}
	}
}

func TestErrorTable(t *testing.T) {
	nb := mapSamples()
	var logged strings.Builder
	s := newServer(t, nb, func(c *web.Config) { c.Log = slog.New(slog.NewTextHandler(&logged, nil)) })
	fs := openForm(t, s, "/runs/ZR-1")
	type answer struct {
		status int
		json   bool
		kind   string
		field  string
	}
	for _, tc := range []struct {
		name string
		req  func() (*http.Response, string)
		want answer
	}{
		{"unknown page", func() (*http.Response, string) { return get(t, s, "/nowhere") }, answer{404, false, "", ""}},
		{"unknown melt, page", func() (*http.Response, string) { return get(t, s, "/runs/ZR-99") }, answer{404, false, "", ""}},
		{"unknown melt, API", func() (*http.Response, string) { return get(t, s, "/api/runs/ZR-99") }, answer{404, true, "not found", "code"}},
		{"page asked for as JSON", func() (*http.Response, string) {
			r := httptest.NewRequest(http.MethodGet, "/runs/ZR-99", nil)
			r.Header.Set("Accept", "application/json")
			return do(t, s, r)
		}, answer{404, true, "not found", "code"}},
		{"bad filter value, API", func() (*http.Response, string) { return get(t, s, "/api/find?ea=1.7-1.8") }, answer{400, true, "invalid", "ea"}},
		{"unknown filter, API", func() (*http.Response, string) { return get(t, s, "/api/find?colour=red") }, answer{400, true, "invalid", "colour"}},
		{"bad filter value, page", func() (*http.Response, string) { return get(t, s, "/runs?ea=1.7-1.8") }, answer{400, false, "", ""}},
		{"bad scan number", func() (*http.Response, string) { return get(t, s, "/api/scans/x") }, answer{400, true, "invalid", "id"}},
		{"bad map corner, API", func() (*http.Response, string) { return get(t, s, "/api/map?a=Al&b=Cu&c=Xq") }, answer{400, true, "invalid", "c"}},
		{"empty note", func() (*http.Response, string) {
			return fs.post(t, s, "/runs/ZR-1/notes", url.Values{"author": {"T. Ingram"}, "text": {"  "}})
		}, answer{422, false, "", ""}},
		{"clashing note", func() (*http.Response, string) {
			return fs.post(t, s, "/runs/ZR-1/notes", url.Values{"author": {"T. Ingram"}, "text": {"CLASH"}})
		}, answer{409, false, "", ""}},
		{"store fault", func() (*http.Response, string) {
			return fs.post(t, s, "/runs/ZR-1/notes", url.Values{"author": {"T. Ingram"}, "text": {"BREAK"}})
		}, answer{500, false, "", ""}},
		{"method not allowed", func() (*http.Response, string) {
			return do(t, s, httptest.NewRequest(http.MethodDelete, "/api/find", nil))
		}, answer{405, true, "method not allowed", ""}},
	} {
		res, body := tc.req()
		if res.StatusCode != tc.want.status {
			t.Errorf("%s: status %d, want %d", tc.name, res.StatusCode, tc.want.status)
		}
		ct := res.Header.Get("Content-Type")
		if tc.want.json {
			var e struct {
				Error struct {
					Status  int    `json:"status"`
					Kind    string `json:"kind"`
					Field   string `json:"field"`
					Message string `json:"message"`
				} `json:"error"`
			}
			if !strings.HasPrefix(ct, "application/json") || json.Unmarshal([]byte(body), &e) != nil {
				t.Errorf("%s: %q body %s, want a JSON error", tc.name, ct, body)
				continue
			}
			if e.Error.Status != tc.want.status || e.Error.Kind != tc.want.kind || e.Error.Field != tc.want.field || e.Error.Message == "" {
				t.Errorf("%s: JSON error %+v, want kind %q field %q", tc.name, e.Error, tc.want.kind, tc.want.field)
			}
		} else if !strings.HasPrefix(ct, "text/html") || !strings.Contains(body, "<h1>") {
			t.Errorf("%s: %q, want an HTML page", tc.name, ct)
		}
		if strings.Contains(body, "/var/secret") {
			t.Errorf("%s: the page shows an internal detail", tc.name)
		}
	}

	if !strings.Contains(logged.String(), "/var/secret/notebook.db is full") {
		t.Errorf("the internal fault was not logged: %q", logged.String())
	}

	// A fault in the store is internal on every read.
	nb.fault = io.ErrUnexpectedEOF
	res, body := get(t, s, "/api/summary")
	if res.StatusCode != 500 || !strings.Contains(body, `"kind":"internal"`) || strings.Contains(body, "unexpected EOF") {
		t.Errorf("store fault on the API: %d %s", res.StatusCode, body)
	}
}

package web

import (
	"context"
	"crypto/hmac"
	"crypto/rand"
	"crypto/sha256"
	"crypto/subtle"
	"encoding/base64"
	"errors"
	"net/http"
	"net/url"
	"strings"

	"meltbook"
)

// Access token.
//
// When the server needs a token (Config.Token, or Listen on an address that
// is not loopback) every request must carry it, in one of three ways:
//
//   - the header "Authorization: Bearer <token>", for scripts;
//   - the query parameter token=<token>: the URL that Listen returns has
//     it. A page request with it gets the token as a cookie and is
//     redirected to the same address without it, so that the token does
//     not stay in the address bar, the history or a Referer header;
//     an /api/ request with it is simply answered;
//   - the cookie set that way (HttpOnly, SameSite=Strict).
//
// Anything else is refused with 401, before any other work. Tokens are
// compared in constant time. The cookie travels in clear over plain HTTP,
// so a token protects a trusted network, not an open one.
const (
	tokenParam  = "token"
	tokenCookie = "meltbook_access"
	csrfCookie  = "meltbook_form"
	csrfField   = "form_key"
	csrfHeader  = "X-Form-Key"
)

// contentSecurityPolicy allows only what meltbook itself serves: no inline
// scripts or styles, nothing from other hosts. blob: and data: images let
// the page turn an SVG into a PNG for download.
const contentSecurityPolicy = "default-src 'self'; img-src 'self' data: blob:; style-src 'self'; script-src 'self'; " +
	"object-src 'none'; base-uri 'none'; form-action 'self'; frame-ancestors 'none'"

func (s *Server) securityHeaders(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		h := w.Header()
		h.Set("Content-Security-Policy", contentSecurityPolicy)
		h.Set("X-Content-Type-Options", "nosniff")
		h.Set("X-Frame-Options", "DENY")
		h.Set("Referrer-Policy", "no-referrer")
		h.Set("Cross-Origin-Opener-Policy", "same-origin")
		h.Set("Cross-Origin-Resource-Policy", "same-origin")
		h.Set("Cache-Control", "no-store")
		next.ServeHTTP(w, r)
	})
}

// checkHost refuses requests naming another host when the server listens
// on loopback without a token (see Listen).
func (s *Server) checkHost(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		s.mu.Lock()
		allowed := s.loopbackHosts
		s.mu.Unlock()
		if allowed != nil && !allowed[strings.ToLower(r.Host)] {
			s.fail(w, r, meltbook.Errorf(kindForbidden, "", "This server answers only to the address it printed when it started, not to %q.", r.Host))
			return
		}
		next.ServeHTTP(w, r)
	})
}

func (s *Server) requireToken(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		token := s.Token()
		if token == "" {
			next.ServeHTTP(w, r)
			return
		}
		if auth, ok := strings.CutPrefix(r.Header.Get("Authorization"), "Bearer "); ok && sameSecret(auth, token) {
			next.ServeHTTP(w, r)
			return
		}
		if q := r.URL.Query(); q.Has(tokenParam) && sameSecret(q.Get(tokenParam), token) {
			if strings.HasPrefix(r.URL.Path, "/api/") || r.Method != http.MethodGet {
				next.ServeHTTP(w, r)
				return
			}
			http.SetCookie(w, &http.Cookie{Name: tokenCookie, Value: token, Path: "/", HttpOnly: true, SameSite: http.SameSiteStrictMode})
			q.Del(tokenParam)
			u := url.URL{Path: r.URL.Path, RawQuery: q.Encode()}
			http.Redirect(w, r, u.String(), http.StatusSeeOther)
			return
		}
		if c, err := r.Cookie(tokenCookie); err == nil && sameSecret(c.Value, token) {
			next.ServeHTTP(w, r)
			return
		}
		s.fail(w, r, meltbook.Errorf(kindUnauthorised, "", "Open the address meltbook printed when it started (it carries the token), or send the header \"Authorization: Bearer <token>\"."))
	})
}

func sameSecret(given, want string) bool {
	return subtle.ConstantTimeCompare([]byte(given), []byte(want)) == 1
}

// limitBody caps every request body at Config.MaxBodyBytes, a scan upload
// at Config.MaxUploadBytes; reading past it fails with
// *http.MaxBytesError, which the error table maps to 413.
func (s *Server) limitBody(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		limit := s.cfg.MaxBodyBytes
		if isUpload(r) {
			limit = s.cfg.MaxUploadBytes
		}
		if r.ContentLength > limit {
			s.fail(w, r, &http.MaxBytesError{Limit: limit})
			return
		}
		r.Body = http.MaxBytesReader(w, r.Body, limit)
		next.ServeHTTP(w, r)
	})
}

// isUpload reports whether r posts a scan file (POST /runs/{code}/scans).
func isUpload(r *http.Request) bool {
	rest, ok := strings.CutPrefix(r.URL.Path, "/runs/")
	return r.Method == http.MethodPost && ok && strings.HasSuffix(rest, "/scans") && strings.Count(rest, "/") == 1
}

// Forms are protected against cross-site submission twice over:
//
//   - the browser's own signals: Go's CrossOriginProtection refuses a
//     request whose Sec-Fetch-Site or Origin header shows another site;
//   - a signed double-submit key: each browser gets a random nonce in the
//     cookie meltbook_form, and every form carries form_key =
//     HMAC-SHA256(server secret, nonce). A POST must bring both, and they
//     must match. The secret is made anew each time the server starts, so
//     forms from an earlier run are refused and must be reloaded.
//
// Scripts may send the key in the X-Form-Key header instead of a field.

type csrfKeyType struct{}

// formCookie makes sure the browser has a form nonce and puts the matching
// form key in the request's context for the page's forms.
func (s *Server) formCookie(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		nonce := formNonce(r)
		if nonce == "" {
			b := make([]byte, 18)
			rand.Read(b)
			nonce = base64.RawURLEncoding.EncodeToString(b)
			http.SetCookie(w, &http.Cookie{Name: csrfCookie, Value: nonce, Path: "/", HttpOnly: true, SameSite: http.SameSiteStrictMode})
		}
		ctx := context.WithValue(r.Context(), csrfKeyType{}, s.formKey(nonce))
		next.ServeHTTP(w, r.WithContext(ctx))
	})
}

func formNonce(r *http.Request) string {
	if c, err := r.Cookie(csrfCookie); err == nil && len(c.Value) >= 16 {
		return c.Value
	}
	return ""
}

// requireFormKey guards every route that changes the notebook: the request
// must come from this site and carry the form key of its nonce.
func (s *Server) requireFormKey(next http.Handler) http.Handler {
	crossOrigin := http.NewCrossOriginProtection()
	crossOrigin.SetDenyHandler(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		s.fail(w, r, meltbook.Errorf(kindForbidden, "", "The form was sent from another site."))
	}))
	return crossOrigin.Handler(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		given := r.Header.Get(csrfHeader)
		if given == "" {
			// Reading the form here reads the body, within its limit; an
			// upload is held in memory, as its limit is small.
			var err error
			if strings.HasPrefix(r.Header.Get("Content-Type"), "multipart/form-data") {
				err = r.ParseMultipartForm(s.cfg.MaxUploadBytes)
			} else {
				err = r.ParseForm()
			}
			if err != nil {
				s.fail(w, r, bodyError(err))
				return
			}
			given = r.PostForm.Get(csrfField)
		}
		nonce := formNonce(r)
		if nonce == "" || !sameSecret(given, s.formKey(nonce)) {
			s.fail(w, r, meltbook.Errorf(kindForbidden, "", "The form's key is missing or out of date (the server may have restarted). Reload the page and send it again; what you typed is kept only in the page you came from."))
			return
		}
		next.ServeHTTP(w, r)
	}))
}

// formKey is HMAC-SHA256(secret, nonce) in URL-safe base64.
func (s *Server) formKey(nonce string) string {
	m := hmac.New(sha256.New, s.csrfKey)
	m.Write([]byte(nonce))
	return base64.RawURLEncoding.EncodeToString(m.Sum(nil))
}

// formKeyOf returns the form key to put in the forms of r's page.
func formKeyOf(r *http.Request) string {
	k, _ := r.Context().Value(csrfKeyType{}).(string)
	return k
}

// bodyError turns a failure to read a request body into a user error; a
// body over its limit keeps its *http.MaxBytesError for the error table.
func bodyError(err error) error {
	var tooLarge *http.MaxBytesError
	if errors.As(err, &tooLarge) {
		return err
	}
	return meltbook.Errorf(meltbook.Invalid, "", "the form could not be read: %v", err)
}

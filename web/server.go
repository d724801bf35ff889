package web

import (
	"context"
	"crypto/rand"
	"encoding/base64"
	"errors"
	"fmt"
	"log/slog"
	"net"
	"net/http"
	"net/url"
	"os"
	"slices"
	"strconv"
	"sync"
	"time"

	"github.com/go-chi/chi/v5"
	"github.com/go-chi/chi/v5/middleware"

	"meltbook"
	"meltbook/analysis/descriptor"
	"meltbook/analysis/element"
	"meltbook/store"
	"meltbook/store/intake"
	"meltbook/store/query"
)

// Config is what a Server needs.
type Config struct {
	// Notebook is the store behind the pages; required.
	Notebook Notebook
	// Schemes are the valence schemes offered for e/a on the maps; the
	// first is the default. When empty, the built-in schemes are offered,
	// query.DefaultScheme first, as the find filters use it.
	Schemes []element.Scheme
	// Location reads dates typed without a zone in the filters; nil means
	// the machine's local time.
	Location *time.Location
	// SizeMismatch computes the atomic size mismatch δ in percent of a
	// composition for the e/a-δ map; nil means SizeMismatchCN12.
	SizeMismatch func([]meltbook.ElementFraction) (float64, error)
	// Token, when set, must accompany every request (see the package
	// documentation). When empty, Listen makes one for any address that is
	// not a loopback address.
	Token string
	// Author fills the author field of new notes, e.g. the user's login.
	Author string
	// MaxBodyBytes caps the body of any request but a scan upload;
	// default 1 MiB.
	MaxBodyBytes int64
	// MaxUploadBytes caps a scan upload; default 8 MiB.
	MaxUploadBytes int64
	// AddScan brings an uploaded scan file into the notebook: reads it,
	// finds and indexes its peaks, stores it and proposes outcomes. Nil
	// means intake.Add on Notebook when it is a *store.Store; otherwise the
	// pages offer no upload.
	AddScan func(ctx context.Context, who string, f intake.File, opt intake.Options) (*intake.Result, error)
	// Log receives internal errors; nil means slog.Default().
	Log *slog.Logger
}

// DefaultMaxBodyBytes is the body limit when Config.MaxBodyBytes is zero.
const DefaultMaxBodyBytes = 1 << 20

// DefaultMaxUploadBytes is the scan upload limit when
// Config.MaxUploadBytes is zero.
const DefaultMaxUploadBytes = 8 << 20

// Server serves the notebook's pages and JSON API.
type Server struct {
	cfg      Config
	nb       Notebook
	log      *slog.Logger
	location *time.Location
	csrfKey  []byte
	pages    *pages
	router   chi.Router

	mu sync.Mutex
	// token and loopbackHosts are fixed before serving starts.
	token         string
	loopbackHosts map[string]bool
	http          *http.Server
}

// NewServer builds a server on cfg. It fails when cfg has no notebook.
func NewServer(cfg Config) (*Server, error) {
	if cfg.Notebook == nil {
		return nil, errors.New("web: no notebook to serve")
	}
	if cfg.MaxBodyBytes <= 0 {
		cfg.MaxBodyBytes = DefaultMaxBodyBytes
	}
	if cfg.MaxUploadBytes <= 0 {
		cfg.MaxUploadBytes = DefaultMaxUploadBytes
	}
	if st, ok := cfg.Notebook.(*store.Store); ok && cfg.AddScan == nil {
		cfg.AddScan = func(ctx context.Context, who string, f intake.File, opt intake.Options) (*intake.Result, error) {
			return intake.Add(ctx, st, who, f, opt)
		}
	}
	if cfg.SizeMismatch == nil {
		cfg.SizeMismatch = SizeMismatchCN12
	}
	if len(cfg.Schemes) == 0 {
		names := append([]string{query.DefaultScheme}, element.SchemeNames()...)
		for _, name := range names {
			sc, ok := element.LookupScheme(name)
			if ok && !slices.ContainsFunc(cfg.Schemes, func(c element.Scheme) bool { return c.Name == name }) {
				cfg.Schemes = append(cfg.Schemes, sc)
			}
		}
	}
	s := &Server{cfg: cfg, nb: cfg.Notebook, log: cfg.Log, token: cfg.Token, location: cfg.Location}
	if s.log == nil {
		s.log = slog.Default()
	}
	if s.location == nil {
		s.location = time.Local
	}
	s.csrfKey = make([]byte, 32)
	rand.Read(s.csrfKey)
	p, err := loadPages()
	if err != nil {
		return nil, err
	}
	s.pages = p
	s.router = s.routes()
	return s, nil
}

// ServeHTTP serves one request.
func (s *Server) ServeHTTP(w http.ResponseWriter, r *http.Request) { s.router.ServeHTTP(w, r) }

func (s *Server) routes() chi.Router {
	r := chi.NewRouter()
	r.Use(middleware.Recoverer)
	r.Use(s.securityHeaders)
	r.Use(s.checkHost)
	r.Use(s.requireToken)
	r.Use(s.limitBody)
	// Level 1: a map page of 10 000 samples gzips in a fraction of the
	// time of the default level and still shrinks about sevenfold.
	r.Use(middleware.Compress(1, "text/html", "text/css", "text/csv", "text/javascript", "application/json", "image/svg+xml"))
	r.Use(s.formCookie)
	r.NotFound(func(w http.ResponseWriter, r *http.Request) {
		s.fail(w, r, meltbook.Errorf(meltbook.NotFound, "", "There is no page at %s.", r.URL.Path))
	})
	r.MethodNotAllowed(func(w http.ResponseWriter, r *http.Request) {
		s.fail(w, r, meltbook.Errorf(kindMethodNotAllowed, "", "%s is not possible at %s.", r.Method, r.URL.Path))
	})

	r.Get("/static/{name}", s.serveAsset)
	r.Get("/", s.overview)
	r.Get("/runs", s.runs)
	r.Get("/runs.csv", s.runsCSV)
	r.Get("/runs/{code}", s.run)
	r.Get("/log", s.logForm)
	// Every route that changes the notebook goes in this group.
	r.Group(func(r chi.Router) {
		r.Use(s.requireFormKey)
		r.Post("/log", s.logRun)
		r.Post("/runs/{code}/notes", s.addNote)
		r.Post("/runs/{code}/outcomes", s.addOutcome)
		r.Post("/runs/{code}/proposals/{id}", s.decideProposal)
		r.Post("/runs/{code}/amend", s.amend)
		r.Post("/runs/{code}/scans", s.uploadScan)
	})
	r.Get("/scans/{id}", s.scan)
	r.Get("/map", s.compositionMap)
	r.Get("/map.svg", s.compositionMapSVG)
	r.Get("/descriptors", s.descriptorMaps)

	r.Route("/api", func(r chi.Router) {
		r.Get("/summary", s.apiSummary)
		r.Get("/filters", s.apiFilters)
		r.Get("/runs", s.apiRuns)
		r.Get("/find", s.apiFind)
		r.Get("/runs/{code}", s.apiRun)
		r.Get("/scans/{id}", s.apiScan)
		r.Get("/map", s.apiMap)
	})
	return r
}

// Token returns the access token requests must carry, "" when none is
// needed.
func (s *Server) Token() string {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.token
}

// Listen binds addr and serves in the background until Shutdown. An empty
// addr means 127.0.0.1 on a free port, and port 0 always picks a free one.
// On an address that is not loopback an access token is required: the one
// in Config, else a new random one. It returns the URL to open, carrying
// the token when one is needed.
func (s *Server) Listen(addr string) (string, error) {
	if addr == "" {
		addr = "127.0.0.1:0"
	}
	host, _, err := net.SplitHostPort(addr)
	if err != nil {
		return "", meltbook.Errorf(meltbook.Invalid, "address", "%q is not host:port (%v)", addr, err)
	}
	ln, err := net.Listen("tcp", addr)
	if err != nil {
		return "", fmt.Errorf("listen on %s: %w", addr, err)
	}
	port := strconv.Itoa(ln.Addr().(*net.TCPAddr).Port)

	s.mu.Lock()
	defer s.mu.Unlock()
	if s.http != nil {
		ln.Close()
		return "", errors.New("web: server is already listening")
	}
	urlHost := host
	if isLoopback(host) {
		if s.token == "" {
			// Without a token, only names of this machine may reach the
			// pages, so that another site cannot rebind its own name to
			// 127.0.0.1 and read the notebook through a visitor's browser.
			s.loopbackHosts = map[string]bool{net.JoinHostPort(host, port): true}
			for _, h := range []string{"127.0.0.1", "localhost", "::1"} {
				s.loopbackHosts[net.JoinHostPort(h, port)] = true
			}
		}
	} else if s.token == "" {
		s.token = newToken()
	}
	if ip := net.ParseIP(host); host == "" || ip != nil && ip.IsUnspecified() {
		if name, err := os.Hostname(); err == nil {
			urlHost = name
		}
	}
	u := url.URL{Scheme: "http", Host: net.JoinHostPort(urlHost, port), Path: "/"}
	if s.token != "" {
		u.RawQuery = url.Values{tokenParam: {s.token}}.Encode()
	}
	s.http = &http.Server{
		Handler:           s,
		ReadHeaderTimeout: 10 * time.Second,
		ReadTimeout:       2 * time.Minute,
		WriteTimeout:      2 * time.Minute,
		IdleTimeout:       2 * time.Minute,
		MaxHeaderBytes:    64 << 10,
	}
	go func(hs *http.Server) {
		if err := hs.Serve(ln); err != nil && !errors.Is(err, http.ErrServerClosed) {
			s.log.Error("web server stopped", "err", err)
		}
	}(s.http)
	return u.String(), nil
}

// Shutdown stops serving, letting requests in flight finish until ctx ends.
func (s *Server) Shutdown(ctx context.Context) error {
	s.mu.Lock()
	hs := s.http
	s.mu.Unlock()
	if hs == nil {
		return nil
	}
	return hs.Shutdown(ctx)
}

// SizeMismatchCN12 is the atomic size mismatch δ (%) of a composition from
// the CN12 metallic radii of package element, by
// descriptor.SizeMismatchPercent; fractions are taken relative to their
// total. An element without a tabulated radius is an error naming it.
func SizeMismatchCN12(comp []meltbook.ElementFraction) (float64, error) {
	x := make([]float64, len(comp))
	r := make([]float64, len(comp))
	var total float64
	for i, ef := range comp {
		e, ok := element.BySymbol(ef.Element)
		if !ok || !e.HasMetallicRadius() {
			return 0, fmt.Errorf("no CN12 metallic radius for %s", ef.Element)
		}
		x[i], r[i] = ef.Fraction, e.MetallicRadiusCN12
		total += ef.Fraction
	}
	if !(total > 0) {
		return 0, errors.New("composition has no positive total")
	}
	for i := range x {
		x[i] /= total
	}
	return descriptor.SizeMismatchPercent(x, r), nil
}

func isLoopback(host string) bool {
	if host == "localhost" {
		return true
	}
	ip := net.ParseIP(host)
	return ip != nil && ip.IsLoopback()
}

// newToken returns 32 random bytes in URL-safe base64.
func newToken() string {
	b := make([]byte, 32)
	rand.Read(b)
	return base64.RawURLEncoding.EncodeToString(b)
}

package web

import (
	"encoding/json"
	"net/http"
	"strconv"

	"github.com/go-chi/chi/v5"

	"meltbook/store/query"
)

// The JSON API mirrors the pages:
//
//	GET /api/summary        store.Summary
//	GET /api/filters        []query.Field, the find vocabulary
//	GET /api/runs?…         {"total": n, "rows": []query.Row}: one page of the run table (filters, sort, desc, page)
//	GET /api/find?…         []query.Row: every match (up to MaxExportRows), as the find command prints it
//	GET /api/runs/{code}    meltbook.MeltRecord
//	GET /api/scans/{id}     ScanView
//	GET /api/map?…          the composition map's points, shares and e/a lines
//
// Errors come as {"error": {"status", "kind", "field", "message"}} with the
// status from the error table.

func writeJSON(w http.ResponseWriter, v any) {
	w.Header().Set("Content-Type", "application/json; charset=utf-8")
	enc := json.NewEncoder(w)
	enc.SetEscapeHTML(false)
	enc.Encode(v)
}

func (s *Server) apiSummary(w http.ResponseWriter, r *http.Request) {
	sum, err := s.nb.Summary(r.Context())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	writeJSON(w, sum)
}

func (s *Server) apiFilters(w http.ResponseWriter, r *http.Request) {
	writeJSON(w, query.Fields())
}

// runsJSON is one page of /api/runs.
type runsJSON struct {
	Total int         `json:"total"`
	Rows  []query.Row `json:"rows"`
}

func (s *Server) apiRuns(w http.ResponseWriter, r *http.Request) {
	f, err := s.parseFind(r.URL.Query())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	found, total, err := s.nb.FindMelts(r.Context(), f)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	writeJSON(w, runsJSON{Total: total, Rows: query.Rows(found)})
}

func (s *Server) apiFind(w http.ResponseWriter, r *http.Request) {
	found, total, err := s.findAll(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	w.Header().Set("X-Total-Count", strconv.Itoa(total))
	writeJSON(w, query.Rows(found))
}

func (s *Server) apiRun(w http.ResponseWriter, r *http.Request) {
	p, err := s.loadRun(r, chi.URLParam(r, "code"))
	if err != nil {
		s.fail(w, r, err)
		return
	}
	writeJSON(w, p.Run)
}

func (s *Server) apiScan(w http.ResponseWriter, r *http.Request) {
	id, err := scanID(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	rec, err := s.nb.ScanRecord(r.Context(), id)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	writeJSON(w, scanView(rec))
}

func (s *Server) apiMap(w http.ResponseWriter, r *http.Request) {
	d, err := s.buildCompositionMap(r)
	if err == nil {
		err = d.Controls.firstError()
	}
	if err != nil {
		s.fail(w, r, err)
		return
	}
	writeJSON(w, d)
}

package web

import (
	"encoding/json"
	"net/http"

	"github.com/go-chi/chi/v5"
)

// The JSON API mirrors the pages:
//
//	GET /api/summary        Summary
//	GET /api/filters        []FilterField, the find vocabulary
//	GET /api/runs?…         RunPage, one page of the run table (sort, desc, page, filters)
//	GET /api/find?…         RunPage with every match (up to MaxExportRows), the find command's JSON
//	GET /api/runs/{code}    RunDetail
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
	writeJSON(w, s.nb.FilterFields())
}

func (s *Server) apiRuns(w http.ResponseWriter, r *http.Request) {
	rq, _, err := s.parseRunQuery(r.URL.Query())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	page, err := s.nb.FindRuns(r.Context(), rq)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	writeJSON(w, page)
}

func (s *Server) apiFind(w http.ResponseWriter, r *http.Request) {
	rq, _, err := s.parseRunQuery(r.URL.Query())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	all, err := s.allRuns(r, rq, MaxExportRows)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	if all.Runs == nil {
		all.Runs = []RunRow{}
	}
	writeJSON(w, all)
}

func (s *Server) apiRun(w http.ResponseWriter, r *http.Request) {
	d, err := s.nb.Run(r.Context(), chi.URLParam(r, "code"))
	if err != nil {
		s.fail(w, r, err)
		return
	}
	writeJSON(w, d)
}

func (s *Server) apiScan(w http.ResponseWriter, r *http.Request) {
	id, err := scanID(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	sv, err := s.nb.Scan(r.Context(), id)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	writeJSON(w, sv)
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

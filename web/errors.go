package web

import (
	"encoding/json"
	"errors"
	"net/http"
	"strings"

	"meltbook"
)

// Kinds of error that only the web layer raises; they travel as
// *meltbook.Error like the rest so that one table maps them all.
const (
	kindUnauthorised     meltbook.ErrorKind = "unauthorised"
	kindForbidden        meltbook.ErrorKind = "forbidden"
	kindTooLarge         meltbook.ErrorKind = "too large"
	kindMethodNotAllowed meltbook.ErrorKind = "method not allowed"
)

// statusRow is one line of the error table.
type statusRow struct {
	status int
	// bodyStatus, when set, replaces status for a request whose body was
	// at fault (a submitted form or upload): 422 says the request was
	// understood but its content does not hold up.
	bodyStatus int
	title      string
}

// statusTable is the one place where an error kind becomes an HTTP status.
var statusTable = map[meltbook.ErrorKind]statusRow{
	meltbook.Invalid:     {http.StatusBadRequest, http.StatusUnprocessableEntity, "Something in the request is not right"},
	meltbook.NotFound:    {http.StatusNotFound, 0, "Not in this notebook"},
	meltbook.Conflict:    {http.StatusConflict, 0, "That clashes with what the notebook holds"},
	meltbook.Internal:    {http.StatusInternalServerError, 0, "meltbook ran into a fault"},
	kindUnauthorised:     {http.StatusUnauthorized, 0, "This notebook needs its access token"},
	kindForbidden:        {http.StatusForbidden, 0, "Refused"},
	kindTooLarge:         {http.StatusRequestEntityTooLarge, 0, "Too much data in one request"},
	kindMethodNotAllowed: {http.StatusMethodNotAllowed, 0, "That action is not possible here"},
}

// kindOf is meltbook.KindOf, except that a body over its size limit counts
// as kindTooLarge.
func kindOf(err error) meltbook.ErrorKind {
	var tooLarge *http.MaxBytesError
	if errors.As(err, &tooLarge) {
		return kindTooLarge
	}
	return meltbook.KindOf(err)
}

// statusOf returns the HTTP status and page title for err in request r.
func statusOf(err error, r *http.Request) (int, string) {
	row, ok := statusTable[kindOf(err)]
	if !ok {
		row = statusTable[meltbook.Internal]
	}
	if row.bodyStatus != 0 && hasBody(r) {
		return row.bodyStatus, row.title
	}
	return row.status, row.title
}

func hasBody(r *http.Request) bool {
	switch r.Method {
	case http.MethodPost, http.MethodPut, http.MethodPatch:
		return true
	}
	return false
}

// wantsJSON reports whether the client should get errors as JSON: every
// /api/ path, and any request that asks for JSON first.
func wantsJSON(r *http.Request) bool {
	return strings.HasPrefix(r.URL.Path, "/api/") ||
		strings.HasPrefix(r.Header.Get("Accept"), "application/json")
}

// errorBody is the JSON form of an error.
type errorBody struct {
	Error struct {
		Status  int    `json:"status"`
		Kind    string `json:"kind"`
		Field   string `json:"field,omitempty"`
		Message string `json:"message"`
	} `json:"error"`
}

// errorPage is what the HTML error template receives.
type errorPage struct {
	Status  int
	Title   string
	Field   string
	Message string
}

// fail answers a request with err: JSON for API clients, a page for people.
// Internal errors are logged in full and shown without detail.
func (s *Server) fail(w http.ResponseWriter, r *http.Request, err error) {
	status, title := statusOf(err, r)
	kind := kindOf(err)
	var field, message string
	var e *meltbook.Error
	switch {
	case kind == kindTooLarge && !errors.As(err, &e):
		message = "The request is larger than this server accepts."
	case kind == meltbook.Internal || !errors.As(err, &e):
		s.log.Error("request failed", "method", r.Method, "path", r.URL.Path, "err", err)
		message = "The fault has been logged where meltbook was started. Nothing was changed by this request unless the page said so."
		kind = meltbook.Internal
	default:
		field, message = e.Field, e.Message
	}
	if wantsJSON(r) {
		var body errorBody
		body.Error.Status, body.Error.Kind, body.Error.Field, body.Error.Message = status, string(kind), field, message
		w.Header().Set("Content-Type", "application/json; charset=utf-8")
		w.WriteHeader(status)
		json.NewEncoder(w).Encode(body)
		return
	}
	s.render(w, r, status, "error", title, errorPage{Status: status, Title: title, Field: field, Message: message})
}

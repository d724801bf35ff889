// Package web serves the notebook as local web pages and a JSON API: an
// overview, the run table (the find command's filters, sortable, paged,
// CSV), each run, each diffraction scan with a pattern that zooms along 2θ
// and its indexed peaks labelled, the composition map on a Gibbs triangle
// with e/a isolines, descriptor maps (e/a against δ and against cooling
// rate), and forms to log a melt, correct a value, add a scan, record an
// outcome, decide a proposal and add a note.
//
// # Starting a server
//
//	srv, err := web.NewServer(web.Config{
//		Notebook:     st,                 // a *store.Store, as it is (see Notebook)
//		Author:       os.Getenv("USER"),  // fills "by" in fresh forms
//		Log:          slog.New(slog.NewTextHandler(stderr, nil)),
//	})
//	url, err := srv.Listen(addr)          // "" = 127.0.0.1 on a free port
//	fmt.Fprintln(stdout, "meltbook is at", url)
//	<-ctx.Done()
//	srv.Shutdown(shutdownCtx)
//
// Server is also an http.Handler, which is how the tests use it.
//
// # Who may connect
//
// On a loopback address no token is needed, but a request must name the
// host it was sent to (127.0.0.1, localhost or [::1] with the port), so that
// another web site cannot rebind its name to this machine and read the
// notebook through a visitor's browser. On any other address every request
// needs the access token (Config.Token, or a random one Listen makes and puts
// in the URL it returns); see requireToken for the three ways to present it.
//
// # Forms
//
// Every route that changes the notebook is in one router group behind
// requireFormKey: the browser's Sec-Fetch-Site or Origin must show this
// site, and the form must carry the key derived from the browser's form
// cookie with a secret made at start-up (a signed double submit). A form
// that fails validation comes back with status 422, the message beside
// the field at fault, and everything typed kept (but a file, which no
// browser fills in again).
//
// The log and amend forms read their values with package runform, as the
// log and amend commands do, so units, checks and messages are the same. A
// scan upload (multipart, at most Config.MaxUploadBytes) goes through
// Config.AddScan, by default the scan intake on the store, and opens the
// new scan with its proposals.
//
// # Errors
//
// Every error becomes a status in one table (statusTable in errors.go),
// keyed by meltbook.KindOf: invalid 400 (422 for a submitted form), not
// found 404, conflict 409, internal 500, plus the web's own refusals (401
// without token, 403 for a bad form key or foreign host, 405, 413 for a body
// over Config.MaxBodyBytes or an upload over Config.MaxUploadBytes). People get an HTML page, /api/ callers and
// requests that accept JSON first get {"error": {...}}. Internal errors are
// logged in full and shown without detail.
//
// # Pages
//
// Templates and assets are embedded; nothing is fetched from another host,
// there are no inline scripts or styles (the Content-Security-Policy forbids
// them), and the figures are SVG drawn on the server by package plot. Asset
// URLs carry a content hash and may be cached for good.
package web

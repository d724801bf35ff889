package web

import (
	"errors"
	"io"
	"net/http"
	"slices"
	"strconv"
	"strings"

	"github.com/go-chi/chi/v5"

	"meltbook"
	"meltbook/store/intake"
)

// A scan upload goes through the intake, as `meltbook scan add` does:
// the file is read, its peaks found and fitted, indexed, weighed against
// what the notebook knows of the sample, and stored with the automatic
// proposals, all or nothing. The page then opens the new scan, where the
// proposals wait to be confirmed or rejected.

// scanForm is the upload form of one sample as typed. A browser never
// lets a page fill in a file input again, so a refused upload keeps the
// other fields and asks for the file anew.
type scanForm struct {
	Sample, Radiation, Standard, Notes, By string
	Errors                                 map[string]string
	// Error belongs to no single field; Duplicate names the scan that
	// already holds the file.
	Error     string
	Duplicate int64
}

// scanRadiations are the radiations the form suggests, in the syntax of
// radiation.ParseRadiation; anything else it reads may be typed.
var scanRadiations = []struct{ Value, Label string }{
	{"Cu", "Cu Kα1/Kα2 in the scan"},
	{"Cu:stripped", "Cu, Kα2 stripped"},
	{"Cu:mono", "Cu Kα1, monochromated"},
	{"Co", "Co Kα1/Kα2 in the scan"},
	{"Mo", "Mo Kα1/Kα2 in the scan"},
}

// scanStandards are the internal standards the intake knows.
var scanStandards = []string{"Si", "LaB6"}

func (s *Server) uploadScan(w http.ResponseWriter, r *http.Request) {
	p, err := s.loadRun(r, chi.URLParam(r, "code"))
	if err != nil {
		s.fail(w, r, err)
		return
	}
	if s.cfg.AddScan == nil {
		s.fail(w, r, meltbook.Errorf(kindMethodNotAllowed, "", "This server takes no scan uploads."))
		return
	}
	melt := p.Run.Melt.Code
	pf := r.PostForm
	form := scanForm{Sample: pf.Get("sample"), Radiation: strings.TrimSpace(pf.Get("radiation")), Standard: pf.Get("standard"),
		Notes: strings.TrimSpace(pf.Get("notes")), By: strings.TrimSpace(pf.Get("by")), Errors: map[string]string{}}
	if !slices.ContainsFunc(p.Run.Samples, func(sr meltbook.SampleRecord) bool { return sr.Code == form.Sample }) {
		s.fail(w, r, meltbook.Errorf(meltbook.Invalid, "sample", "%q is not a sample of %s", form.Sample, melt))
		return
	}
	if form.Standard != "" && !slices.Contains(scanStandards, form.Standard) {
		form.Errors["standard"] = "Choose Si, LaB6 or none."
	}
	if form.By == "" {
		form.Errors["by"] = "Say who measured or imports the scan."
	}
	var file intake.File
	if r.MultipartForm == nil {
		form.Errors["file"] = "Send the form as a file upload (multipart/form-data)."
	} else if fh, header, err := r.FormFile("file"); err != nil {
		form.Errors["file"] = "Choose the scan file (XY, XYE, CSV or powder CIF)."
	} else {
		data, err := io.ReadAll(fh)
		fh.Close()
		if err != nil {
			s.fail(w, r, bodyError(err))
			return
		}
		if len(data) == 0 {
			form.Errors["file"] = header.Filename + " is empty."
		}
		file = intake.File{Sample: form.Sample, Name: header.Filename, Data: data}
	}
	if len(form.Errors) == 0 {
		res, err := s.cfg.AddScan(r.Context(), form.By, file, intake.Options{Radiation: form.Radiation, Standard: form.Standard, Notes: form.Notes})
		switch {
		case err == nil && res.Duplicate != nil:
			form.Duplicate = res.Duplicate.ID
			form.Errors["file"] = file.Name + " is already in the notebook for " + form.Sample + ", as scan " + strconv.FormatInt(res.Duplicate.ID, 10) + "; nothing was added."
		case err == nil && res.Record != nil:
			http.Redirect(w, r, "/scans/"+strconv.FormatInt(res.Record.Scan.ID, 10)+"#proposals", http.StatusSeeOther)
			return
		case err == nil:
			s.fail(w, r, errors.New("the intake returned neither a scan nor a duplicate"))
			return
		default:
			var e *meltbook.Error
			if kind := kindOf(err); kind != meltbook.Invalid || !errors.As(err, &e) {
				s.fail(w, r, err)
				return
			}
			switch field := strings.ToLower(e.Field); {
			case strings.Contains(field, "radiation"):
				form.Errors["radiation"] = e.Message
			case strings.Contains(field, "standard"):
				form.Errors["standard"] = e.Message
			default:
				form.Errors["file"] = e.Error()
			}
		}
	}
	if form.Errors["file"] == "" && form.Duplicate == 0 {
		form.Error = "Choose the file again: a browser does not keep it in a form sent back."
	}
	status, _ := statusOf(meltbook.Errorf(meltbook.Invalid, "", "upload"), r)
	if form.Duplicate != 0 {
		status = http.StatusConflict
	}
	p.Upload, p.Focus = form, form.Sample
	p.Note = noteForm{Author: s.cfg.Author}
	s.render(w, r, status, "run", melt, p)
}

package server

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"net/http"
	"strings"

	"github.com/go-chi/chi/v5"

	"larder/internal/importer"
	"larder/internal/store"
	"larder/web"
)

// Imports go in three steps: the files are uploaded and kept (import_uploads),
// the preview reads them with the person's answers (date order, column
// mapping, units) and shows what would be added, left out as already
// recorded, or refused with its line, column and reason; confirming reads
// them again with the same answers and writes all good rows in one
// transaction. The answers travel in the URL and the confirm form, so the
// server keeps nothing between requests but the upload.

// mountDataRoutes adds the pages that move a practice's data in and out.
func (s *Server) mountDataRoutes(r chi.Router) {
	r.Get("/clients/{clientID}/import", s.importPage)
	r.Post("/clients/{clientID}/import", s.importUpload)
	r.Get("/import/template/{kind}", s.importTemplate)
	r.Get("/imports/{uploadID}", s.importPreview)
	r.Post("/imports/{uploadID}", s.importConfirm)
	r.With(s.requireAdmin).Get("/import", s.practiceImportPage)
	r.With(s.requireAdmin).Post("/import", s.importUpload)
}

// maxUploadBytes bounds one upload: 100,000 rows of CSV are about 4 MB,
// and a handful of activity files rarely pass 20 MB.
const maxUploadBytes = 64 << 20

func (s *Server) importPage(w http.ResponseWriter, r *http.Request) {
	c, ok := s.ClientFromURL(w, r)
	if !ok {
		return
	}
	s.Render(w, r, http.StatusOK, "Import for "+c.Name, "clients", web.ImportPage(web.ImportPageData{Client: &c}))
}

func (s *Server) practiceImportPage(w http.ResponseWriter, r *http.Request) {
	s.Render(w, r, http.StatusOK, "Import for the practice", "clients", web.ImportPage(web.ImportPageData{}))
}

func (s *Server) importUpload(w http.ResponseWriter, r *http.Request) {
	var client *store.Client
	if chi.URLParam(r, "clientID") != "" {
		c, ok := s.ClientFromURL(w, r)
		if !ok {
			return
		}
		client = &c
	}
	refuse := func(msg string) {
		s.Render(w, r, http.StatusUnprocessableEntity, "Import", "clients", web.ImportPage(web.ImportPageData{Client: client, Error: msg}))
	}
	r.Body = http.MaxBytesReader(w, r.Body, maxUploadBytes)
	if err := r.ParseMultipartForm(16 << 20); err != nil {
		var tooBig *http.MaxBytesError
		if errors.As(err, &tooBig) {
			refuse("The files are larger than 64 MB together; import them in smaller groups.")
			return
		}
		refuse("The upload could not be read. Choose the file again.")
		return
	}
	kind := r.PostFormValue("kind")
	switch kind {
	case string(importer.KindBodyMass), string(importer.KindTraining):
	case "activity":
		if client == nil {
			refuse("Activity files are imported from a client's page.")
			return
		}
	default:
		refuse("Choose what the file holds.")
		return
	}
	headers := r.MultipartForm.File["file"]
	if len(headers) == 0 {
		refuse("Choose a file first.")
		return
	}
	if kind != "activity" && len(headers) > 1 {
		refuse("Choose one CSV file at a time.")
		return
	}
	up := store.Upload{CreatedBy: CurrentUser(r).ID, Kind: kind}
	if client != nil {
		up.ClientID = &client.ID
	}
	for _, h := range headers {
		f, err := h.Open()
		if err != nil {
			refuse("The file " + h.Filename + " could not be read. Choose it again.")
			return
		}
		data, err := io.ReadAll(f)
		f.Close()
		if err != nil {
			refuse("The file " + h.Filename + " could not be read. Choose it again.")
			return
		}
		up.Files = append(up.Files, store.UploadFile{Name: h.Filename, Content: data})
	}
	if err := s.Store.SaveUpload(r.Context(), &up); err != nil {
		s.ServerError(w, r, err)
		return
	}
	Redirect(w, r, web.Path("imports", up.ID))
}

// importTemplate serves an empty CSV with the header row the import reads,
// and one example row so the formats are plain.
func (s *Server) importTemplate(w http.ResponseWriter, r *http.Request) {
	kind := importer.Kind(strings.TrimSuffix(chi.URLParam(r, "kind"), ".csv"))
	practice := r.URL.Query().Get("practice") == "1"
	var example map[string]string
	switch kind {
	case importer.KindBodyMass:
		example = map[string]string{importer.FieldDate: "2026-03-01", importer.FieldMass: "70.5", importer.FieldUnit: "kg",
			importer.FieldBodyFat: "", importer.FieldMethod: "scale, morning, fasted"}
	case importer.KindTraining:
		example = map[string]string{importer.FieldDate: "2026-03-01", importer.FieldStart: "07:30", importer.FieldModality: "running",
			importer.FieldDuration: "1:15:00", importer.FieldDistance: "14.2", importer.FieldRPE: "6", importer.FieldStatus: "done"}
	default:
		s.NotFound(w, r)
		return
	}
	example[importer.FieldClient] = "Name Surname"
	example[importer.FieldBirth] = "1995-04-03"
	w.Header().Set("Content-Type", "text/csv; charset=utf-8")
	w.Header().Set("Content-Disposition", fmt.Sprintf(`attachment; filename="larder-%s-template.csv"`, strings.ReplaceAll(string(kind), "_", "-")))
	cw := csv.NewWriter(w)
	_ = cw.Write(importer.TemplateHeader(kind, practice))
	var row []string
	for _, f := range importer.Fields(kind, practice) {
		row = append(row, example[f.Key])
	}
	_ = cw.Write(row)
	cw.Flush()
}

// uploadFromURL loads the signed-in user's upload named by {uploadID} and
// its client, answering the request itself when it cannot.
func (s *Server) uploadFromURL(w http.ResponseWriter, r *http.Request) (store.Upload, *store.Client, bool) {
	id, ok := s.ParamID(w, r, "uploadID")
	if !ok {
		return store.Upload{}, nil, false
	}
	up, err := s.Store.UploadByID(r.Context(), id, CurrentUser(r).ID)
	if err != nil {
		if errors.Is(err, store.ErrNotFound) {
			s.Render(w, r, http.StatusNotFound, "Import not found", "clients", web.Message("Import not found",
				"This import is not waiting any more: it was confirmed, or it is more than a day old. Upload the file again."))
			return up, nil, false
		}
		s.ServerError(w, r, err)
		return up, nil, false
	}
	if up.ClientID == nil {
		if !CurrentUser(r).IsAdmin() {
			s.Forbidden(w, r)
			return up, nil, false
		}
		return up, nil, true
	}
	c, err := s.Store.ClientByID(r.Context(), *up.ClientID)
	if err != nil {
		s.StoreError(w, r, err)
		return up, nil, false
	}
	return up, &c, true
}

func (s *Server) importPreview(w http.ResponseWriter, r *http.Request) {
	up, c, ok := s.uploadFromURL(w, r)
	if !ok {
		return
	}
	p, err := s.readUpload(r.Context(), up, c, r.URL.Query())
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	if !p.view.Questions {
		if err := s.previewRows(r.Context(), p); err != nil {
			s.ServerError(w, r, err)
			return
		}
	}
	s.Render(w, r, http.StatusOK, "Import preview", "clients", web.ImportPreview(p.view))
}

func (s *Server) importConfirm(w http.ResponseWriter, r *http.Request) {
	up, c, ok := s.uploadFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	ctx := r.Context()
	p, err := s.readUpload(ctx, up, c, r.PostForm)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	if p.view.Questions {
		s.Render(w, r, http.StatusUnprocessableEntity, "Import preview", "clients", web.ImportPreview(p.view))
		return
	}
	var res store.ImportResult
	if p.mass != nil || up.Kind == string(importer.KindBodyMass) {
		res, err = s.Store.ImportBodyMass(ctx, Actor(r), p.view.Files, p.mass)
	} else {
		res, err = s.Store.ImportTraining(ctx, Actor(r), p.view.Files, p.sessions)
	}
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	if err := s.Store.DeleteUpload(ctx, up.ID); err != nil {
		s.Log.Warn("delete upload", "id", up.ID, "err", err)
	}
	msg := fmt.Sprintf("Imported %d %s.", res.Added, p.view.KindLabel)
	if n := len(res.Duplicates); n > 0 {
		msg += fmt.Sprintf(" %d already recorded were left out.", n)
	}
	if n := len(p.view.Problems); n > 0 {
		msg += fmt.Sprintf(" %d rows with errors were left out.", n)
	}
	s.Flash(r, msg)
	if c != nil {
		Redirect(w, r, web.Path("clients", c.ID))
		return
	}
	Redirect(w, r, "/clients")
}

// answerKeys are the parameters an import reads besides column mappings.
var answerKeys = []string{"date_order", "mass_unit", "default_zone", "time_zone", "default_modality"}

// importTimeZones are offered for activity files, which record UTC.
var importTimeZones = []string{"UTC", "Europe/London", "Europe/Dublin", "Europe/Lisbon", "Europe/Paris", "Europe/Berlin", "Europe/Oslo",
	"Europe/Stockholm", "Europe/Helsinki", "Europe/Athens", "Africa/Johannesburg", "America/New_York", "America/Chicago", "America/Denver",
	"America/Los_Angeles", "America/Sao_Paulo", "Asia/Tokyo", "Asia/Singapore", "Australia/Perth", "Australia/Sydney", "Pacific/Auckland"}

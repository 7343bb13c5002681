package server

import (
	"archive/zip"
	"bytes"
	"encoding/csv"
	"fmt"
	"io"
	"net/http"
	"slices"
	"strings"

	"github.com/go-chi/chi/v5"

	"larder/internal/sheet"
	"larder/internal/store"
	"larder/web"
)

// A client's data goes out as CSV files (UTF-8 with a byte-order mark, so
// spreadsheets read accents right; ISO dates) and as one zip of all of them
// with the sheet of every published plan: the client's copy of their
// record. Every export is audited. An admin may erase a client after typing
// their name; the audit log keeps a tombstone.

func (s *Server) mountExportRoutes(r chi.Router) {
	r.Get("/clients/{clientID}/data", s.clientDataPage)
	r.Get("/clients/{clientID}/export/{file}", s.clientExport)
	r.With(s.requireAdmin).Post("/clients/{clientID}/erase", s.clientErase)
}

func (s *Server) clientDataPage(w http.ResponseWriter, r *http.Request) {
	c, ok := s.ClientFromURL(w, r)
	if !ok {
		return
	}
	s.Render(w, r, http.StatusOK, "Export and erasure · "+c.Name, "clients", web.ClientDataPage(web.ClientDataData{Client: c, IsAdmin: CurrentUser(r).IsAdmin()}))
}

func writeCSV(w io.Writer, t store.ExportTable) error {
	if _, err := io.WriteString(w, "\ufeff"); err != nil {
		return err
	}
	// RFC 4180: records end in CRLF; fields holding a comma, a quote or a
	// line break are quoted.
	cw := csv.NewWriter(w)
	cw.UseCRLF = true
	if err := cw.Write(t.Header); err != nil {
		return err
	}
	if err := cw.WriteAll(t.Rows); err != nil {
		return err
	}
	cw.Flush()
	return cw.Error()
}

func (s *Server) clientExport(w http.ResponseWriter, r *http.Request) {
	c, ok := s.ClientFromURL(w, r)
	if !ok {
		return
	}
	file := chi.URLParam(r, "file")
	if file == "record.zip" {
		s.clientRecordZip(w, r, c)
		return
	}
	table, ok := strings.CutSuffix(file, ".csv")
	if !ok || !slices.Contains(store.ExportTables, table) {
		s.NotFound(w, r)
		return
	}
	t, err := s.Store.ExportClient(r.Context(), c.ID, table, c.Unit)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	if err := s.Store.Audit(r.Context(), Actor(r), "export", "client", c.ID, map[string]any{"client_id": c.ID, "file": file, "rows": len(t.Rows)}); err != nil {
		s.ServerError(w, r, err)
		return
	}
	w.Header().Set("Content-Type", "text/csv; charset=utf-8")
	w.Header().Set("Content-Disposition", fmt.Sprintf(`attachment; filename="%s-%s.csv"`, fileWord(c.Name), table))
	w.Header().Set("Cache-Control", "no-store")
	if err := writeCSV(w, t); err != nil {
		s.Log.Warn("export", "client", c.ID, "err", err)
	}
}

// clientRecordZip builds the whole zip in memory before sending, so a
// failure gives an error page instead of a cut-off file.
func (s *Server) clientRecordZip(w http.ResponseWriter, r *http.Request, c store.Client) {
	ctx := r.Context()
	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	for _, name := range store.ExportTables {
		t, err := s.Store.ExportClient(ctx, c.ID, name, c.Unit)
		if err != nil {
			s.ServerError(w, r, err)
			return
		}
		f, err := zw.Create(name + ".csv")
		if err == nil {
			err = writeCSV(f, t)
		}
		if err != nil {
			s.ServerError(w, r, err)
			return
		}
	}
	plans, err := s.Store.PublishedPlans(ctx, c.ID)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	for _, pp := range plans {
		pdf, err := s.planSheetPDF(r, c, pp.Plan, pp.Version, sheet.A4, sheet.FormStaff)
		if err != nil {
			s.ServerError(w, r, err)
			return
		}
		f, err := zw.Create(fmt.Sprintf("plan-sheets/%s-plan-%d-v%d.pdf", fileWord(pp.Plan.Title), pp.Plan.ID, pp.Version.Version))
		if err == nil {
			_, err = f.Write(pdf)
		}
		if err != nil {
			s.ServerError(w, r, err)
			return
		}
	}
	if err := zw.Close(); err != nil {
		s.ServerError(w, r, err)
		return
	}
	if err := s.Store.Audit(ctx, Actor(r), "export", "client", c.ID, map[string]any{"client_id": c.ID, "file": "record.zip", "plan_sheets": len(plans)}); err != nil {
		s.ServerError(w, r, err)
		return
	}
	w.Header().Set("Content-Type", "application/zip")
	w.Header().Set("Content-Disposition", fmt.Sprintf(`attachment; filename="%s-record.zip"`, fileWord(c.Name)))
	w.Header().Set("Cache-Control", "no-store")
	_, _ = w.Write(buf.Bytes())
}

func (s *Server) clientErase(w http.ResponseWriter, r *http.Request) {
	c, ok := s.ClientFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	typed := strings.TrimSpace(r.PostForm.Get("confirm_name"))
	if !strings.EqualFold(strings.Join(strings.Fields(typed), " "), strings.Join(strings.Fields(c.Name), " ")) {
		msg := "That is not the name of this client. Type " + c.Name + " exactly as shown to erase them. Nothing was erased."
		if typed == "" {
			msg = "Type the client's name to confirm. Nothing was erased."
		}
		s.Render(w, r, http.StatusUnprocessableEntity, "Export and erasure · "+c.Name, "clients",
			web.ClientDataPage(web.ClientDataData{Client: c, IsAdmin: true, EraseErr: msg, Typed: typed}))
		return
	}
	if err := s.Store.EraseClient(r.Context(), Actor(r), c.ID); err != nil {
		s.StoreError(w, r, err)
		return
	}
	s.Flash(r, fmt.Sprintf("Client number %d is erased with all their records.", c.ID))
	Redirect(w, r, "/clients")
}

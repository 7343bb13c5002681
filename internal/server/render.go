package server

import (
	"context"
	"errors"
	"net/http"
	"strconv"
	"strings"

	"larder/internal/mass"

	"github.com/jackc/pgx/v5/pgconn"

	"github.com/a-h/templ"
	"github.com/go-chi/chi/v5"

	"larder/internal/auth"
	"larder/internal/store"
	"larder/web"
)

// Render writes a full page: the layout around body, with status.
func (s *Server) Render(w http.ResponseWriter, r *http.Request, status int, title, nav string, body templ.Component) {
	p := web.Page{Title: title, Nav: nav, User: CurrentUser(r)}
	p.PracticeName = s.PracticeName(r)
	if p.User != nil {
		p.Flash = s.Sessions.PopString(r.Context(), auth.KeyFlash)
	}
	w.Header().Set("Content-Type", "text/html; charset=utf-8")
	w.Header().Set("Cache-Control", "no-store")
	if err := writePage(renderCtx(r), w, status, web.Layout(p, body)); err != nil {
		s.Log.Error("render", "path", logPath(r), "err", err)
	}
}

// renderCtx is the context pages render under: the request's, without its
// time limit (timeLimit). templ renders nothing under a context that is
// done, and the limit is there to bound waits on the database, not to blank
// a page whose data has been loaded. A browser that went away still ends
// the writes: they fail on the closed connection.
func renderCtx(r *http.Request) context.Context { return context.WithoutCancel(r.Context()) }

// PracticeName is the practice_name setting, or the default: as read with
// the signed-in user at the start of this request (loadUser), else read now.
func (s *Server) PracticeName(r *http.Request) string {
	if name, ok := r.Context().Value(practiceKey).(string); ok {
		return name
	}
	name, err := s.Store.Setting(r.Context(), store.SettingPracticeName, store.DefaultPracticeName)
	if err != nil {
		s.Log.Warn("practice name", "err", err)
	}
	return name
}

// PracticeMassUnit is the unit body masses are shown in for clients who
// chose none: the mass_unit setting, or kg.
func (s *Server) PracticeMassUnit(r *http.Request) mass.Unit {
	u, err := s.Store.Setting(r.Context(), store.SettingMassUnit, string(mass.Default))
	if err != nil {
		s.Log.Warn("mass unit", "err", err)
	}
	return mass.Or(mass.Unit(u), mass.Default)
}

// Flash stores a one-time notice shown on the next page.
func (s *Server) Flash(r *http.Request, msg string) {
	s.Sessions.Put(r.Context(), auth.KeyFlash, msg)
}

// Redirect answers a successful POST with 303 See Other.
func Redirect(w http.ResponseWriter, r *http.Request, url string) {
	http.Redirect(w, r, url, http.StatusSeeOther)
}

// ServerError answers an error a handler cannot handle itself: the "try
// again" 503 when the database is unreachable or did not answer in time
// (Unavailable), a 422 page when the database refused text it cannot hold (a
// NUL or bytes that are not UTF-8) that no form check caught, such as a
// search term, and otherwise a logged 500 (JSON on the API).
func (s *Server) ServerError(w http.ResponseWriter, r *http.Request, err error) {
	if dbUnavailable(err) {
		s.Unavailable(w, r, err)
		return
	}
	if isUntextError(err) {
		s.Log.Info("refused text the database cannot hold", "method", r.Method, "path", logPath(r))
		s.Render(w, r, http.StatusUnprocessableEntity, "Text not accepted", "",
			web.Message("Text not accepted", "What was sent holds characters that cannot be saved or searched for (a NUL character or damaged text). Nothing was changed. Go back, retype it and try again."))
		return
	}
	s.Log.Error("server error", "method", r.Method, "path", logPath(r), "err", err)
	if strings.HasPrefix(r.URL.Path, "/api/") {
		writeJSON(w, http.StatusInternalServerError, map[string]string{"error": "the request could not be completed because of a problem on the server"})
		return
	}
	s.Render(w, r, http.StatusInternalServerError, "Error", "",
		web.Message("Something went wrong", "The request could not be completed because of a problem on our side. Nothing was changed. Please try again; if it keeps happening, tell your administrator."))
}

// NotFound shows a plain 404 page.
func (s *Server) NotFound(w http.ResponseWriter, r *http.Request) {
	s.Render(w, r, http.StatusNotFound, "Not found", "", web.Message("Not found", "There is nothing at this address. It may have been deleted."))
}

// MethodNotAllowed answers an address opened the wrong way — most often a
// form's address (shown in the address bar after a refused form) opened
// again from there — with a page in words instead of an empty 405.
func (s *Server) MethodNotAllowed(w http.ResponseWriter, r *http.Request) {
	s.Render(w, r, http.StatusMethodNotAllowed, "Nothing to show here", "", web.Message("Nothing to show here",
		"This address only receives a filled-in form, so there is no page to open at it. Go back to the page you came from, or start again from Clients."))
}

// Forbidden shows a plain 403 page.
func (s *Server) Forbidden(w http.ResponseWriter, r *http.Request) {
	s.Render(w, r, http.StatusForbidden, "Not allowed", "", web.Message("Not allowed", "Only an administrator of the practice can open this page."))
}

// ParamID reads a numeric URL parameter such as {clientID}; ok is false
// (and a 404 has been written) when it is not a positive number.
func (s *Server) ParamID(w http.ResponseWriter, r *http.Request, name string) (int64, bool) {
	id, err := strconv.ParseInt(chi.URLParam(r, name), 10, 64)
	if err != nil || id <= 0 {
		s.NotFound(w, r)
		return 0, false
	}
	return id, true
}

// ClientFromURL loads the client named by {clientID}; ok is false (and a
// response has been written) when there is none.
func (s *Server) ClientFromURL(w http.ResponseWriter, r *http.Request) (store.Client, bool) {
	id, ok := s.ParamID(w, r, "clientID")
	if !ok {
		return store.Client{}, false
	}
	c, err := s.Store.ClientByID(r.Context(), id)
	if err != nil {
		s.StoreError(w, r, err)
		return store.Client{}, false
	}
	return c, true
}

// StoreError answers a store error: 404 for ErrNotFound, else 500.
func (s *Server) StoreError(w http.ResponseWriter, r *http.Request, err error) {
	if err == store.ErrNotFound {
		s.NotFound(w, r)
		return
	}
	s.ServerError(w, r, err)
}

// ParseForm parses a POST body (limited to 1 MiB); false means a 400 was written.
func (s *Server) ParseForm(w http.ResponseWriter, r *http.Request) bool {
	r.Body = http.MaxBytesReader(w, r.Body, 1<<20)
	if err := r.ParseForm(); err != nil {
		http.Error(w, "The form could not be read.", http.StatusBadRequest)
		return false
	}
	return true
}

// isUntextError is PostgreSQL's "invalid byte sequence" (SQLSTATE 22021).
func isUntextError(err error) bool {
	var pe *pgconn.PgError
	return errors.As(err, &pe) && pe.Code == "22021"
}

func isForeignKeyViolation(err error) bool {
	var pe *pgconn.PgError
	return errors.As(err, &pe) && pe.Code == "23503"
}

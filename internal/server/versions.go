package server

import (
	"context"
	"net/http"
	"strconv"

	"larder/internal/forms"
	"larder/internal/store"
)

// staleMessage is shown above an edit form whose save was refused because
// the record changed after the form was opened.
const staleMessage = "Someone saved a change to this record after you opened this form, so nothing was saved: saving would have silently undone their change. " +
	"What you typed is kept below. Open the record in another tab to see their change; saving this form again replaces it with what is below."

// formVersion is the record version an edit form was opened at; -1 when the
// form has none (an old tab, a script), which no row matches.
func formVersion(r *http.Request) int {
	v, err := strconv.Atoi(r.PostForm.Get("version"))
	if err != nil || v < 0 {
		return -1
	}
	return v
}

// setVersion puts the current version of a record into an edit form.
func (s *Server) setVersion(r *http.Request, f forms.Form, table string, key any) error {
	v, err := s.Store.RecordVersion(r.Context(), table, key)
	if err != nil {
		return err
	}
	f.Values.Set("version", strconv.Itoa(v))
	return nil
}

// guarded is the request's context under which the next store write goes
// through only if the record is still at the form's version.
func guarded(r *http.Request, table string, key any) context.Context {
	return store.ExpectVersion(r.Context(), table, key, formVersion(r))
}

// refuseStale marks f with the stale-form message and the record's current
// version, so that a second, deliberate save goes through.
func (s *Server) refuseStale(r *http.Request, f forms.Form, table string, key any) error {
	f.Errors.Add("version", staleMessage)
	return s.setVersion(r, f, table, key)
}

package server

import (
	"net/http"
	"strconv"

	"github.com/go-chi/chi/v5"

	"larder/internal/forms"
	"larder/internal/store"
	"larder/web"
)

// recordRead records, after a page of a client's health data has been
// shown (status 200), who opened what and when: kind is a store.Read*
// kind, and the client, plan and version come from the route's
// {clientID}, {planID} and {version}. Refused and missing pages are not
// reads. It wraps a route with r.With(s.recordRead(kind)).
func (s *Server) recordRead(kind string) func(http.Handler) http.Handler {
	return func(next http.Handler) http.Handler {
		return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
			// The read is recorded when the handler commits to a 200, before
			// the body goes out, so whoever has the page also has its row.
			rw := &readRecorder{ResponseWriter: w, record: func(status int) {
				if status != http.StatusOK || CurrentUser(r) == nil {
					return
				}
				rec := store.ReadRecord{Kind: kind, Path: r.URL.Path}
				rec.ClientID, _ = strconv.ParseInt(chi.URLParam(r, "clientID"), 10, 64)
				rec.PlanID, _ = strconv.ParseInt(chi.URLParam(r, "planID"), 10, 64)
				rec.Version, _ = strconv.Atoi(chi.URLParam(r, "version"))
				// A read that cannot be recorded is logged as an error so an
				// operator sees the gap; the page still goes out.
				if err := s.Store.AuditRead(r.Context(), Actor(r), rec); err != nil {
					s.Log.Error("record a read of health data", "kind", kind, "client", rec.ClientID, "err", err)
				}
			}}
			next.ServeHTTP(rw, r)
		})
	}
}

// readRecorder calls record once, with the status, when the response's
// header is written (explicitly or by the first Write).
type readRecorder struct {
	http.ResponseWriter
	record  func(status int)
	written bool
}

func (w *readRecorder) WriteHeader(code int) {
	if !w.written {
		w.written = true
		w.record(code)
	}
	w.ResponseWriter.WriteHeader(code)
}

func (w *readRecorder) Write(b []byte) (int, error) {
	if !w.written {
		w.WriteHeader(http.StatusOK)
	}
	return w.ResponseWriter.Write(b)
}

// Unwrap lets http.ResponseController reach the underlying writer.
func (w *readRecorder) Unwrap() http.ResponseWriter { return w.ResponseWriter }

type readsQuery struct {
	Client int64 `form:"client" label:"Client" validate:"omitempty,min=1"`
	User   int64 `form:"user" label:"Staff member" validate:"omitempty,min=1"`
	Before int64 `form:"before" label:"Before" validate:"omitempty,min=1"`
}

const readsPerPage = 100

// readsPage lists who opened which client's record, plan, sheet or export
// (admins only), newest first, for the practice or one client or person.
func (s *Server) readsPage(w http.ResponseWriter, r *http.Request) {
	var q readsQuery
	if f := forms.Decode(r.URL.Query(), &q); f.Has() {
		s.Render(w, r, http.StatusBadRequest, "Who opened what", "team",
			web.Message("Who opened what", "This list is filtered by a client or staff member number from a link on this page; the address given has one that is not a number."))
		return
	}
	reads, err := s.Store.ListReads(r.Context(), store.ReadFilter{ClientID: q.Client, UserID: q.User, BeforeID: q.Before, Limit: readsPerPage + 1})
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	d := web.ReadsData{Reads: reads, Client: q.Client, User: q.User}
	if len(reads) > readsPerPage {
		d.Reads = reads[:readsPerPage]
		d.Older = d.Reads[readsPerPage-1].ID
	}
	s.Render(w, r, http.StatusOK, "Who opened what", "team", web.Reads(d))
}

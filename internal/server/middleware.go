package server

import (
	"context"
	"errors"
	"net/http"
	"net/url"
	"runtime/debug"
	"strings"
	"time"

	"github.com/go-chi/chi/v5/middleware"

	"larder/internal/auth"
	"larder/internal/store"
)

type ctxKey int

const (
	userKey ctxKey = iota
	// practiceKey holds the practice's name read with the signed-in user.
	practiceKey
	// signInKey holds the *signInFound that findSession fills.
	signInKey
)

// signInFound is what findSession read with the request's session: the
// user it signs in, read in the same query (see store.SessionWithUser).
type signInFound struct {
	ok bool
	in store.SignIn
}

// findSession is the session manager's find: the session's data and, into
// the request's signInFound (put there by session), its user.
func findSession(st *store.Store) func(ctx context.Context, token string) ([]byte, bool, error) {
	return func(ctx context.Context, token string) ([]byte, bool, error) {
		data, found, in, err := st.SessionWithUser(ctx, token)
		if f, ok := ctx.Value(signInKey).(*signInFound); ok && found && err == nil {
			*f = signInFound{ok: true, in: in}
		}
		return data, found, err
	}
}

// session loads the request's session (scs) and its signed-in user
// (loadUser), both from one query when the session's row names its user.
func (s *Server) session(next http.Handler) http.Handler {
	h := s.Sessions.LoadAndSave(s.loadUser(next))
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		h.ServeHTTP(w, r.WithContext(context.WithValue(r.Context(), signInKey, &signInFound{})))
	})
}

// CurrentUser returns the signed-in user, or nil on public pages.
func CurrentUser(r *http.Request) *store.User {
	u, _ := r.Context().Value(userKey).(*store.User)
	return u
}

// Actor is the signed-in user as the audit log names them.
func Actor(r *http.Request) store.Actor {
	if u := CurrentUser(r); u != nil {
		return store.Actor(u.ID)
	}
	return store.System
}

// logRequests writes one structured log line per request.
func (s *Server) logRequests(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		start := time.Now()
		ww := middleware.NewWrapResponseWriter(w, r.ProtoMajor)
		next.ServeHTTP(ww, r)
		s.Log.Info("request", "method", r.Method, "path", logPath(r), "query_keys", logQuery(r), "status", ww.Status(),
			"bytes", ww.BytesWritten(), "duration_ms", time.Since(start).Milliseconds())
	})
}

// recoverPanics turns a handler panic into a logged 500 page.
func (s *Server) recoverPanics(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		defer func() {
			if v := recover(); v != nil {
				if v == http.ErrAbortHandler {
					panic(v)
				}
				s.Log.Error("panic", "path", logPath(r), "value", v, "stack", string(debug.Stack()))
				http.Error(w, "Something went wrong on our side. Please try again.", http.StatusInternalServerError)
			}
		}()
		next.ServeHTTP(w, r)
	})
}

// timeLimit gives each request a deadline: the database calls it makes
// (waiting for a pooled connection included) give up when it passes, and
// the handler answers with the "try again" page (see ServerError) instead of
// holding the browser, and a connection, for as long as the database hangs.
// The context is what bounds the work; nothing here writes a response, so a
// handler that finishes in time is unaffected.
func (s *Server) timeLimit(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		ctx, cancel := context.WithTimeout(r.Context(), s.requestTimeout)
		defer cancel()
		next.ServeHTTP(w, r.WithContext(ctx))
	})
}

// loadUser puts the signed-in user (if any) into the request context,
// after keeping the session's idle limit (auth.Touch). The user and the
// session's row are read from the database on every request (with the
// session itself, see session), so a disabled account, a changed role or an
// ended session takes effect at once.
func (s *Server) loadUser(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		id := s.Sessions.GetInt64(r.Context(), auth.KeyUserID)
		if id == 0 {
			next.ServeHTTP(w, r)
			return
		}
		switch alive, err := auth.Touch(r.Context(), s.Sessions, s.sessionNow()); {
		case err != nil:
			s.ServerError(w, r, err)
			return
		case !alive:
			next.ServeHTTP(w, r) // signed out by the idle limit
			return
		}
		// The session's own row must still exist: a password change, a reset
		// or "End" on the account page removes it, and with it this sign-in.
		// It and the user were read with the session when the session's row
		// names the same ones as its data; otherwise (a row saved before it
		// named them) they are read now.
		sid := s.Sessions.GetInt64(r.Context(), auth.KeySessionID)
		var (
			u        store.User
			practice string
			err      error
		)
		if f, _ := r.Context().Value(signInKey).(*signInFound); f != nil && f.ok && f.in.UserID == id && f.in.SessionID == sid {
			if u, practice = f.in.User, f.in.Practice; !f.in.Live {
				err = store.ErrNotFound
			}
		} else {
			u, practice, err = s.Store.SessionUser(r.Context(), id, sid)
		}
		switch {
		case errors.Is(err, store.ErrNotFound) || (err == nil && u.Disabled):
			_ = s.Sessions.Destroy(r.Context())
		case err != nil:
			s.ServerError(w, r, err)
			return
		default:
			ctx := context.WithValue(r.Context(), userKey, &u)
			r = r.WithContext(context.WithValue(ctx, practiceKey, practice))
		}
		next.ServeHTTP(w, r)
	})
}

// requireUser sends anonymous visitors to the sign-in page, remembering
// where they were going.
func (s *Server) requireUser(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		if CurrentUser(r) == nil {
			if strings.HasPrefix(r.URL.Path, "/api/") {
				// Scripts get a status they can act on, not a sign-in page.
				writeJSON(w, http.StatusUnauthorized, map[string]string{"error": "sign in first: POST /signin with email and password, then send the session cookie"})
				return
			}
			next := r.URL.RequestURI()
			if r.Method != http.MethodGet {
				next = "/"
			}
			http.Redirect(w, r, "/signin?next="+url.QueryEscape(next), http.StatusSeeOther)
			return
		}
		next.ServeHTTP(w, r)
	})
}

// requireAdmin refuses staff pages meant for admins to everyone else.
func (s *Server) requireAdmin(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		if u := CurrentUser(r); u == nil || !u.IsAdmin() {
			s.Forbidden(w, r)
			return
		}
		next.ServeHTTP(w, r)
	})
}

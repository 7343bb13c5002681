package server

import (
	"errors"
	"net"
	"net/http"

	"larder/internal/auth"
	"larder/internal/forms"
	"larder/internal/store"
	"larder/web"
)

// clientAddress is the address a request came from (no port), as recorded
// for a sign-in and used to limit guessing from one place.
func clientAddress(r *http.Request) string {
	host, _, err := net.SplitHostPort(r.RemoteAddr)
	if err != nil {
		return r.RemoteAddr
	}
	return host
}

// startSession signs u in on this browser: a new cookie token (a session id
// planted before sign-in is useless after), and a staff_sessions row that the
// account page lists and a password change can end.
func (s *Server) startSession(r *http.Request, u store.User) error {
	if err := s.Sessions.RenewToken(r.Context()); err != nil {
		return err
	}
	sid, err := s.Store.StartSession(r.Context(), u.ID, s.Now().Add(auth.SessionLifetime), clientAddress(r), r.UserAgent())
	if err != nil {
		return err
	}
	s.Sessions.Put(r.Context(), auth.KeyUserID, u.ID)
	s.Sessions.Put(r.Context(), auth.KeySessionID, sid)
	s.Sessions.Put(r.Context(), auth.KeySeen, s.sessionNow().Unix())
	return nil
}

// currentSessionID is the staff_sessions row of the signed-in request.
func (s *Server) currentSessionID(r *http.Request) int64 {
	return s.Sessions.GetInt64(r.Context(), auth.KeySessionID)
}

func (s *Server) accountPage(w http.ResponseWriter, r *http.Request) {
	s.renderAccount(w, r, http.StatusOK, forms.New())
}

func (s *Server) renderAccount(w http.ResponseWriter, r *http.Request, status int, f forms.Form) {
	u := CurrentUser(r)
	sessions, err := s.Store.ListSessions(r.Context(), u.ID)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	s.Render(w, r, status, "My account", "account", web.Account(web.AccountData{
		User: *u, Password: f, Sessions: sessions, Current: s.currentSessionID(r),
	}))
}

// endSession ends one of the signed-in user's own sessions (another device
// left signed in); ending the current one is a sign-out.
func (s *Server) endSession(w http.ResponseWriter, r *http.Request) {
	id, ok := s.ParamID(w, r, "sessionID")
	if !ok {
		return
	}
	u := CurrentUser(r)
	if err := s.Store.EndSession(r.Context(), Actor(r), u.ID, id); err != nil {
		if errors.Is(err, store.ErrNotFound) {
			s.Flash(r, "That session had already ended.")
			Redirect(w, r, "/account")
			return
		}
		s.ServerError(w, r, err)
		return
	}
	if id == s.currentSessionID(r) {
		if err := s.Sessions.Destroy(r.Context()); err != nil {
			s.ServerError(w, r, err)
			return
		}
		Redirect(w, r, "/signin?signed_out=1")
		return
	}
	s.Flash(r, "That session is ended: the device using it is signed out.")
	Redirect(w, r, "/account")
}

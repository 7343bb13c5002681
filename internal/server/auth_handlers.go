package server

import (
	"errors"
	"fmt"
	"net/http"
	"strings"

	"larder/internal/auth"
	"larder/internal/forms"
	"larder/internal/store"
	"larder/web"
)

type signInForm struct {
	Email    string `form:"email" label:"Email" validate:"required,max=254"`
	Password string `form:"password" label:"Password" validate:"required,max=200"`
	Next     string `form:"next"`
}

// dummyHash is checked when an email is unknown, so a wrong email takes as
// long as a wrong password and does not reveal who has an account.
var dummyHash, _ = auth.HashPassword("not a real password, only for timing")

func (s *Server) signInPage(w http.ResponseWriter, r *http.Request) {
	if n, err := s.Store.CountUsers(r.Context()); err == nil && n == 0 {
		http.Redirect(w, r, "/setup", http.StatusSeeOther)
		return
	}
	if CurrentUser(r) != nil {
		http.Redirect(w, r, safeNext(r.URL.Query().Get("next")), http.StatusSeeOther)
		return
	}
	f := forms.New()
	f.Values.Set("next", r.URL.Query().Get("next"))
	notice := ""
	if r.URL.Query().Has("signed_out") {
		// On a shared clinic computer the next person should see that the last one left.
		notice = "You have signed out."
	}
	s.Render(w, r, http.StatusOK, "Sign in", "", web.SignIn(f, notice))
}

func (s *Server) signIn(w http.ResponseWriter, r *http.Request) {
	if !s.ParseForm(w, r) {
		return
	}
	var in signInForm
	f := forms.Decode(r.PostForm, &in)
	f.Values.Del("password")
	if f.Has() {
		s.Render(w, r, http.StatusUnprocessableEntity, "Sign in", "", web.SignIn(f, ""))
		return
	}
	address := clientAddress(r)
	counts, err := s.Store.SignInFailures(r.Context(), in.Email, address, signInWindow)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	if wait, whole := signInWait(counts); wait > 0 {
		// The password is not even checked, so guessing during a wait gains nothing.
		s.Log.Warn("sign-in refused: too soon after failures", "address", address, "wait_s", int(wait.Seconds()))
		w.Header().Set("Retry-After", fmt.Sprint(int(wait.Seconds())+1))
		f.Errors.Add("password", throttleMessage(wait, whole))
		s.Render(w, r, http.StatusTooManyRequests, "Sign in", "", web.SignIn(f, ""))
		return
	}
	u, err := s.Store.UserByEmail(r.Context(), in.Email)
	if err != nil && !errors.Is(err, store.ErrNotFound) {
		s.ServerError(w, r, err)
		return
	}
	hash := u.PasswordHash
	if err != nil {
		hash = dummyHash
	}
	ok, herr := auth.CheckPassword(hash, in.Password)
	if herr != nil {
		s.Log.Error("stored password hash unreadable", "user", u.ID, "err", herr)
	}
	switch {
	case err != nil || !ok:
		s.Log.Info("sign-in refused", "address", address)
		reason := "wrong password"
		if err != nil {
			reason = "unknown email"
		}
		if err := s.Store.RecordSignInFailure(r.Context(), in.Email, address, u.ID, reason); err != nil {
			s.Log.Warn("record sign-in failure", "err", err)
		}
		f.Errors.Add("password", "The email or password is not right. Please try again.")
		s.Render(w, r, http.StatusUnauthorized, "Sign in", "", web.SignIn(f, ""))
		return
	case u.Disabled:
		f.Errors.Add("email", "This account is disabled. Ask an administrator of the practice to enable it.")
		s.Render(w, r, http.StatusForbidden, "Sign in", "", web.SignIn(f, ""))
		return
	}
	if err := s.startSession(r, u); err != nil {
		s.ServerError(w, r, err)
		return
	}
	if err := s.Store.ClearSignInFailures(r.Context(), in.Email, address); err != nil {
		s.Log.Warn("clear sign-in failures", "err", err)
	}
	if err := s.Store.Audit(r.Context(), store.Actor(u.ID), "sign_in", "user", u.ID, nil); err != nil {
		s.Log.Warn("audit sign-in", "err", err)
	}
	Redirect(w, r, safeNext(in.Next))
}

func (s *Server) signOut(w http.ResponseWriter, r *http.Request) {
	if u := CurrentUser(r); u != nil {
		if err := s.Store.SignOut(r.Context(), u.ID, s.currentSessionID(r)); err != nil {
			s.Log.Warn("sign-out", "err", err)
		}
	}
	// Destroy deletes the session row, so the old cookie is worthless even if copied.
	if err := s.Sessions.Destroy(r.Context()); err != nil {
		s.ServerError(w, r, err)
		return
	}
	Redirect(w, r, "/signin?signed_out=1")
}

type setupForm struct {
	PracticeName string `form:"practice_name" label:"Practice name" validate:"required,max=120"`
	Name         string `form:"name" label:"Your name" validate:"required,max=200"`
	Email        string `form:"email" label:"Email" validate:"required,email,max=254"`
	Password     string `form:"password" label:"Password" validate:"required,min=10,max=200"`
	Confirm      string `form:"confirm" label:"Password again" validate:"required,eqfield=Password" msg:"The two passwords do not match."`
}

// setupPage makes the first admin; it exists only while there is no user.
func (s *Server) setupPage(w http.ResponseWriter, r *http.Request) {
	n, err := s.Store.CountUsers(r.Context())
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	if n > 0 {
		s.NotFound(w, r)
		return
	}
	s.Render(w, r, http.StatusOK, "Set up", "", web.Setup(forms.New()))
}

func (s *Server) setup(w http.ResponseWriter, r *http.Request) {
	if !s.ParseForm(w, r) {
		return
	}
	var in setupForm
	f := forms.Decode(r.PostForm, &in)
	if f.Err("password") == "" && auth.IsCommonPassword(in.Password) {
		f.Errors.Add("password", auth.CommonPasswordMessage)
	}
	f.Values.Del("password")
	f.Values.Del("confirm")
	if f.Has() {
		s.Render(w, r, http.StatusUnprocessableEntity, "Set up", "", web.Setup(f))
		return
	}
	hash, err := auth.HashPassword(in.Password)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	u := store.User{Email: in.Email, Name: in.Name, PasswordHash: hash, Role: store.RoleAdmin}
	if err := s.Store.CreateFirstUser(r.Context(), &u); err != nil {
		if errors.Is(err, store.ErrUsersExist) {
			s.NotFound(w, r)
			return
		}
		s.ServerError(w, r, err)
		return
	}
	if err := s.Store.SetSetting(r.Context(), store.Actor(u.ID), store.SettingPracticeName, strings.TrimSpace(in.PracticeName)); err != nil {
		s.ServerError(w, r, err)
		return
	}
	if err := s.startSession(r, u); err != nil {
		s.ServerError(w, r, err)
		return
	}
	s.Flash(r, "Welcome. Your practice is set up; add your first client.")
	Redirect(w, r, "/clients")
}

type passwordForm struct {
	Current string `form:"current" label:"Current password" validate:"required,max=200"`
	New     string `form:"new" label:"New password" validate:"required,min=10,max=200"`
	Confirm string `form:"confirm" label:"New password again" validate:"required,eqfield=New" msg:"The two new passwords do not match."`
}

func (s *Server) changePassword(w http.ResponseWriter, r *http.Request) {
	if !s.ParseForm(w, r) {
		return
	}
	u := CurrentUser(r)
	var in passwordForm
	f := forms.Decode(r.PostForm, &in)
	f.Values = nil // never send passwords back
	if !f.Has() {
		if ok, _ := auth.CheckPassword(u.PasswordHash, in.Current); !ok {
			f.Errors.Add("current", "The current password is not right.")
		} else if auth.IsCommonPassword(in.New) {
			f.Errors.Add("new", auth.CommonPasswordMessage)
		}
	}
	if f.Has() {
		s.renderAccount(w, r, http.StatusUnprocessableEntity, f)
		return
	}
	hash, err := auth.HashPassword(in.New)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	// Every other session of this user ends with the change (whoever knew
	// the old password is signed out); this one gets a fresh token.
	if err := s.Store.SetUserPassword(r.Context(), Actor(r), u.ID, hash, s.currentSessionID(r)); err != nil {
		s.ServerError(w, r, err)
		return
	}
	if err := s.Sessions.RenewToken(r.Context()); err != nil {
		s.ServerError(w, r, err)
		return
	}
	s.Flash(r, "Your password is changed. Any other device signed in as you is signed out.")
	Redirect(w, r, "/account")
}

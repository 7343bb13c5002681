package server

import (
	"errors"
	"net/http"
	"strings"

	"larder/internal/auth"
	"larder/internal/forms"
	"larder/internal/store"
	"larder/web"
)

// The Team page: admins add staff, change roles, disable or enable
// accounts, reset passwords, and name the practice.

func (s *Server) teamPage(w http.ResponseWriter, r *http.Request) {
	s.renderTeam(w, r, http.StatusOK, forms.New(), forms.Form{}, "")
}

// renderTeam shows the Team page. secret, when set, is a notice holding a
// new password: it is written into this one response (sent with
// Cache-Control: no-store) and nowhere else — not into the session, whose
// row would keep it, nor into a log.
func (s *Server) renderTeam(w http.ResponseWriter, r *http.Request, status int, add, practice forms.Form, secret string) {
	users, err := s.Store.ListUsers(r.Context())
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	if add.Values == nil {
		add = forms.New()
	}
	if add.Get("role") == "" {
		add.Values.Set("role", store.RoleDietitian)
	}
	if practice.Values == nil {
		practice = forms.New()
		practice.Values.Set("practice_name", s.PracticeName(r))
		zone, err := s.Store.Setting(r.Context(), store.SettingPracticeTimeZone, store.DefaultPracticeTimeZone)
		if err != nil {
			s.ServerError(w, r, err)
			return
		}
		practice.Values.Set("practice_time_zone", zone)
		practice.Values.Set("mass_unit", string(s.PracticeMassUnit(r)))
	}
	recent, err := s.Store.RecentAudit(r.Context(), 20)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	s.Render(w, r, status, "Team", "team", web.Team(web.TeamData{
		Me: *CurrentUser(r), Users: users, Add: add, Practice: practice, Recent: recent, Secret: secret,
	}))
}

func (s *Server) teamAdd(w http.ResponseWriter, r *http.Request) {
	if !s.ParseForm(w, r) {
		return
	}
	var in newUserForm
	f := forms.Decode(r.PostForm, &in)
	if in.Password != "" && f.Err("password") == "" && auth.IsCommonPassword(in.Password) {
		f.Errors.Add("password", auth.CommonPasswordMessage)
	}
	f.Values.Del("password")
	if f.Has() {
		s.renderTeam(w, r, http.StatusUnprocessableEntity, f, forms.Form{}, "")
		return
	}
	password := in.Password
	generated := password == ""
	if generated {
		password = auth.GeneratePassword()
	}
	hash, err := auth.HashPassword(password)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	u := store.User{Name: in.Name, Email: in.Email, Role: in.Role, PasswordHash: hash}
	if err := s.Store.CreateUser(r.Context(), Actor(r), &u); err != nil {
		if errors.Is(err, store.ErrEmailTaken) {
			f.Errors.Add("email", "Someone on the team already signs in with this email.")
			s.renderTeam(w, r, http.StatusUnprocessableEntity, f, forms.Form{}, "")
			return
		}
		s.ServerError(w, r, err)
		return
	}
	msg := u.Name + " can now sign in as " + u.Email + "."
	if generated {
		s.renderTeam(w, r, http.StatusOK, forms.New(), forms.Form{}, msg+" Their password is "+password+
			" — give it to them privately now: it is shown only this once. They can change it under their name at the top of the page.")
		return
	}
	s.Flash(r, msg)
	Redirect(w, r, "/team")
}

// teamUser loads the user of {userID} and refuses changes to oneself that
// would lock the practice out (an admin demoting or disabling themselves).
func (s *Server) teamUser(w http.ResponseWriter, r *http.Request) (store.User, bool) {
	id, ok := s.ParamID(w, r, "userID")
	if !ok {
		return store.User{}, false
	}
	u, err := s.Store.UserByID(r.Context(), id)
	if err != nil {
		s.StoreError(w, r, err)
		return u, false
	}
	return u, true
}

func (s *Server) teamRole(w http.ResponseWriter, r *http.Request) {
	u, ok := s.teamUser(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	var in roleForm
	if f := forms.Decode(r.PostForm, &in); f.Has() {
		s.Flash(r, f.Err("role"))
		Redirect(w, r, "/team")
		return
	}
	if u.ID == CurrentUser(r).ID && in.Role != store.RoleAdmin {
		s.Flash(r, "You cannot take away your own administrator role; ask another administrator.")
		Redirect(w, r, "/team")
		return
	}
	if err := s.Store.SetUserRole(r.Context(), Actor(r), u.ID, in.Role); err != nil {
		s.StoreError(w, r, err)
		return
	}
	s.Flash(r, u.Name+" is now "+strings.ToLower(web.RoleLabel(in.Role))+".")
	Redirect(w, r, "/team")
}

func (s *Server) teamDisable(w http.ResponseWriter, r *http.Request) {
	u, ok := s.teamUser(w, r)
	if !ok {
		return
	}
	if u.ID == CurrentUser(r).ID {
		s.Flash(r, "You cannot disable your own account.")
		Redirect(w, r, "/team")
		return
	}
	if err := s.Store.SetUserDisabled(r.Context(), Actor(r), u.ID, true); err != nil {
		s.StoreError(w, r, err)
		return
	}
	s.Flash(r, u.Name+" is disabled and can no longer sign in.")
	Redirect(w, r, "/team")
}

func (s *Server) teamEnable(w http.ResponseWriter, r *http.Request) {
	u, ok := s.teamUser(w, r)
	if !ok {
		return
	}
	if err := s.Store.SetUserDisabled(r.Context(), Actor(r), u.ID, false); err != nil {
		s.StoreError(w, r, err)
		return
	}
	s.Flash(r, u.Name+" can sign in again.")
	Redirect(w, r, "/team")
}

func (s *Server) teamResetPassword(w http.ResponseWriter, r *http.Request) {
	u, ok := s.teamUser(w, r)
	if !ok {
		return
	}
	password := auth.GeneratePassword()
	hash, err := auth.HashPassword(password)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	// A reset ends every session of the user; resetting one's own password
	// keeps (and renews) only the session doing it.
	var keep int64
	self := u.ID == CurrentUser(r).ID
	if self {
		keep = s.currentSessionID(r)
	}
	if err := s.Store.SetUserPassword(r.Context(), Actor(r), u.ID, hash, keep); err != nil {
		s.StoreError(w, r, err)
		return
	}
	if self {
		if err := s.Sessions.RenewToken(r.Context()); err != nil {
			s.ServerError(w, r, err)
			return
		}
	}
	s.renderTeam(w, r, http.StatusOK, forms.New(), forms.Form{}, "New password for "+u.Name+": "+password+
		" — give it to them privately now: it is shown only this once. Any device signed in as them is signed out. They can change it under their name at the top of the page.")
}

func (s *Server) teamPractice(w http.ResponseWriter, r *http.Request) {
	if !s.ParseForm(w, r) {
		return
	}
	var in practiceForm
	f := forms.Decode(r.PostForm, &in)
	if f.Has() {
		s.renderTeam(w, r, http.StatusUnprocessableEntity, forms.Form{}, f, "")
		return
	}
	if err := s.Store.SetSetting(r.Context(), Actor(r), store.SettingPracticeName, in.PracticeName); err != nil {
		s.ServerError(w, r, err)
		return
	}
	if err := s.Store.SetSetting(r.Context(), Actor(r), store.SettingPracticeTimeZone, in.TimeZone); err != nil {
		s.ServerError(w, r, err)
		return
	}
	if in.MassUnit != "" && in.MassUnit != string(s.PracticeMassUnit(r)) {
		if err := s.Store.SetSetting(r.Context(), Actor(r), store.SettingMassUnit, in.MassUnit); err != nil {
			s.ServerError(w, r, err)
			return
		}
	}
	s.Flash(r, "Practice details saved.")
	Redirect(w, r, "/team")
}

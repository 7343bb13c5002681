package server

import (
	"errors"
	"net/http"
	"strconv"
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
	s.renderTeamData(w, r, status, web.TeamData{Add: add, Practice: practice, Secret: secret})
}

// renderTeamData shows the Team page with d's forms (and refused change, if
// any); it loads the team, the practice's name and the recent changes.
func (s *Server) renderTeamData(w http.ResponseWriter, r *http.Request, status int, d web.TeamData) {
	users, err := s.Store.ListUsers(r.Context())
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	if d.Add.Values == nil {
		d.Add = forms.New()
	}
	if d.Add.Get("role") == "" {
		d.Add.Values.Set("role", store.RoleDietitian)
	}
	if d.Practice.Values == nil {
		d.Practice = forms.New()
		d.Practice.Values.Set("practice_name", s.PracticeName(r))
		zone, err := s.Store.Setting(r.Context(), store.SettingPracticeTimeZone, store.DefaultPracticeTimeZone)
		if err != nil {
			s.ServerError(w, r, err)
			return
		}
		d.Practice.Values.Set("practice_time_zone", zone)
		d.Practice.Values.Set("mass_unit", string(s.PracticeMassUnit(r)))
		if err := s.setPracticeVersion(r, d.Practice); err != nil {
			s.ServerError(w, r, err)
			return
		}
	}
	recent, err := s.Store.RecentAudit(r.Context(), 20)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	d.Me, d.Users, d.Recent = *CurrentUser(r), users, recent
	s.Render(w, r, status, "Team", "team", web.Team(d))
}

// staleAccount answers a change to a staff account made from a Team page
// opened before someone else changed that account: nothing is saved, the
// page is shown again with the account as it is now, what was chosen is kept
// in its row, and the row's forms carry the account's current version, so
// pressing again goes through on purpose.
func (s *Server) staleAccount(w http.ResponseWriter, r *http.Request, u store.User, role string) {
	msg := "Someone changed " + u.Name + "'s account after you opened this page, so nothing was saved. "
	if role != "" {
		msg += "The row shows the account as it is now, with the role you chose still selected: press Change again to save it."
	} else {
		msg += "The row shows the account as it is now: press the button again if you still mean it."
	}
	s.renderTeamData(w, r, http.StatusConflict, web.TeamData{Stale: web.TeamStale{UserID: u.ID, Role: role, Message: msg}})
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
	if err := s.Store.SetUserRole(guarded(r, store.VersionUser, u.ID), Actor(r), u.ID, in.Role); err != nil {
		if errors.Is(err, store.ErrStale) {
			s.staleAccount(w, r, u, in.Role)
			return
		}
		s.StoreError(w, r, err)
		return
	}
	s.Flash(r, u.Name+" is now "+strings.ToLower(web.RoleLabel(in.Role))+".")
	Redirect(w, r, "/team")
}

func (s *Server) teamDisable(w http.ResponseWriter, r *http.Request) {
	u, ok := s.teamUser(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	if u.ID == CurrentUser(r).ID {
		s.Flash(r, "You cannot disable your own account.")
		Redirect(w, r, "/team")
		return
	}
	if err := s.Store.SetUserDisabled(guarded(r, store.VersionUser, u.ID), Actor(r), u.ID, true); err != nil {
		if errors.Is(err, store.ErrStale) {
			s.staleAccount(w, r, u, "")
			return
		}
		s.StoreError(w, r, err)
		return
	}
	s.Flash(r, u.Name+" is disabled and can no longer sign in.")
	Redirect(w, r, "/team")
}

func (s *Server) teamEnable(w http.ResponseWriter, r *http.Request) {
	u, ok := s.teamUser(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	if err := s.Store.SetUserDisabled(guarded(r, store.VersionUser, u.ID), Actor(r), u.ID, false); err != nil {
		if errors.Is(err, store.ErrStale) {
			s.staleAccount(w, r, u, "")
			return
		}
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
	unit := in.MassUnit
	if unit == "" { // a form without the unit keeps the practice's
		unit = string(s.PracticeMassUnit(r))
	}
	err := s.Store.SetSettingsAt(r.Context(), Actor(r), practiceFormVersions(r), []store.SettingValue{
		{Key: store.SettingPracticeName, Value: in.PracticeName}, {Key: store.SettingPracticeTimeZone, Value: in.TimeZone},
		{Key: store.SettingMassUnit, Value: unit}})
	if errors.Is(err, store.ErrStale) {
		f.Errors.Add("version", staleMessage)
		if err := s.setPracticeVersion(r, f); err != nil {
			s.ServerError(w, r, err)
			return
		}
		s.renderTeam(w, r, http.StatusConflict, forms.Form{}, f, "")
		return
	}
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	s.Flash(r, "Practice details saved.")
	Redirect(w, r, "/team")
}

// The practice form saves three settings at once, in one transaction, so its
// "version" holds the version of each in this order: "3.1.0".
var practiceKeys = []string{store.SettingPracticeName, store.SettingPracticeTimeZone, store.SettingMassUnit}

// setPracticeVersion puts the practice settings' current versions into f.
func (s *Server) setPracticeVersion(r *http.Request, f forms.Form) error {
	parts := make([]string, len(practiceKeys))
	for i, key := range practiceKeys {
		v, err := s.Store.RecordVersion(r.Context(), store.VersionSetting, key)
		if err != nil {
			return err
		}
		parts[i] = strconv.Itoa(v)
	}
	f.Values.Set("version", strings.Join(parts, "."))
	return nil
}

// practiceFormVersions reads the versions the practice form was opened at;
// a missing or damaged one is -1, which no setting has.
func practiceFormVersions(r *http.Request) []int {
	parts := strings.Split(r.PostForm.Get("version"), ".")
	out := make([]int, len(practiceKeys))
	for i := range out {
		out[i] = -1
		if len(parts) == len(practiceKeys) {
			if v, err := strconv.Atoi(parts[i]); err == nil && v >= 0 {
				out[i] = v
			}
		}
	}
	return out
}

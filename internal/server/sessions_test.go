package server

import (
	"net/http"
	"net/url"
	"strings"
	"testing"

	"larder/internal/store"
)

// sessionCookie is the browser's current session token.
func (b *browser) sessionCookie() string {
	u, _ := url.Parse(b.a.srv.URL)
	for _, c := range b.c.Jar.Cookies(u) {
		if c.Name == "larder_session" {
			return c.Value
		}
	}
	return ""
}

// signInAgain signs an existing user in on a new browser.
func (a *app) signInAgain(u store.User, password string) *browser {
	a.t.Helper()
	b := a.browser()
	if res := b.post("/signin", url.Values{"email": {u.Email}, "password": {password}}); res.status != http.StatusSeeOther || res.location != "/" {
		a.t.Fatalf("sign-in: %d to %q, want 303 to the overview", res.status, res.location)
	}
	return b
}

// Changing one's password signs out every other browser of that user, keeps
// this one signed in on a new token, and leaves other users alone.
func TestPasswordChangeEndsOtherSessions(t *testing.T) {
	a := newApp(t)
	b, u := a.signedIn(store.RoleDietitian)
	phone := a.signInAgain(u, testPassword)
	other, _ := a.signedIn(store.RoleDietitian)
	before := b.sessionCookie()

	b.post("/account/password", url.Values{"current": {testPassword}, "new": {"another long password"}, "confirm": {"another long password"}}).
		mustRedirect(t, "/account")

	if after := b.sessionCookie(); after == before || after == "" {
		t.Errorf("session token not renewed on password change: %q → %q", before, after)
	}
	if res := b.get("/clients"); res.status != http.StatusOK {
		t.Fatalf("the browser that changed the password was signed out: %d", res.status)
	}
	phone.get("/clients").mustRedirect(t, "/signin")
	if res := other.get("/clients"); res.status != http.StatusOK {
		t.Fatalf("another user's session ended: %d", res.status)
	}
	if n := a.count(`SELECT count(*) FROM staff_sessions WHERE user_id = $1`, u.ID); n != 1 {
		t.Errorf("%d session rows left for the user, want 1", n)
	}
}

// An admin's reset ends every session of the member; the new password is
// shown once in the response and is in no database row (sessions included).
func TestPasswordResetEndsSessionsAndIsNotStored(t *testing.T) {
	a := newApp(t)
	admin, _ := a.signedIn(store.RoleAdmin)
	member, u := a.signedIn(store.RoleDietitian)

	res := admin.post("/team/"+itoa(u.ID)+"/password", nil)
	if res.status != http.StatusOK {
		t.Fatalf("reset: status %d\n%s", res.status, res.body)
	}
	const lead = "New password for " // the notice names the password right after the name
	i := strings.Index(res.body, lead+u.Name+": ")
	if i < 0 {
		t.Fatalf("reset page does not show the new password\n%s", res.body)
	}
	password := res.body[i+len(lead+u.Name+": "):]
	password = password[:strings.IndexByte(password, ' ')]
	if len(password) != 16 {
		t.Fatalf("odd password %q", password)
	}
	member.get("/clients").mustRedirect(t, "/signin")

	// Not in any session row (the old flash kept it there), nor anywhere else.
	if n := a.count(`SELECT count(*) FROM sessions WHERE position($1::bytea in data) > 0`, []byte(password)); n != 0 {
		t.Errorf("the new password sits in %d session rows", n)
	}
	if n := a.count(`SELECT count(*) FROM audit_log WHERE detail::text LIKE '%' || $1 || '%'`, password); n != 0 {
		t.Errorf("the new password sits in %d audit rows", n)
	}
	// Shown once: the next page does not show it again.
	admin.get("/team").mustContain(t, "Team")
	if strings.Contains(admin.get("/team").body, password) {
		t.Error("the new password is shown again on the next page")
	}
	a.signInAgain(u, password)
}

// A generated password for a new member is shown once and stored in no
// session row either.
func TestGeneratedPasswordNotInSession(t *testing.T) {
	a := newApp(t)
	admin, _ := a.signedIn(store.RoleAdmin)
	email := unique("new") + "@example.org"
	res := admin.post("/team", url.Values{"name": {"New Member"}, "email": {email}, "role": {"dietitian"}})
	if res.status != http.StatusOK {
		t.Fatalf("add: status %d\n%s", res.status, res.body)
	}
	i := strings.Index(res.body, "Their password is ")
	if i < 0 {
		t.Fatalf("no password shown\n%s", res.body)
	}
	password := res.body[i+len("Their password is "):]
	password = password[:strings.IndexByte(password, ' ')]
	if n := a.count(`SELECT count(*) FROM sessions WHERE position($1::bytea in data) > 0`, []byte(password)); n != 0 {
		t.Errorf("the generated password sits in %d session rows", n)
	}
	if strings.Contains(admin.get("/team").body, password) {
		t.Error("the generated password is shown again")
	}
}

// A staff member sees their sessions on the account page and can end one;
// nobody can end another person's session by its number.
func TestOwnSessionsListAndEnd(t *testing.T) {
	a := newApp(t)
	b, u := a.signedIn(store.RoleDietitian)
	phone := a.signInAgain(u, testPassword)
	other, ou := a.signedIn(store.RoleDietitian)

	page := b.get("/account")
	page.mustContain(t, "Signed in as you", "this browser", "127.0.0.1")
	var ids []int64
	rows, err := a.st.ListSessions(t.Context(), u.ID)
	if err != nil || len(rows) != 2 {
		t.Fatalf("sessions of the user: %v %v", rows, err)
	}
	for _, r := range rows {
		ids = append(ids, r.ID)
	}
	phoneID := ids[0] // newest first: the phone signed in second

	// Another user cannot end it.
	if res := other.post("/account/sessions/"+itoa(phoneID)+"/end", nil); res.status != http.StatusSeeOther {
		t.Fatalf("other user's end: %d", res.status)
	}
	if res := phone.get("/clients"); res.status != http.StatusOK {
		t.Fatalf("another user ended the phone's session: %d", res.status)
	}
	_ = ou

	b.post("/account/sessions/"+itoa(phoneID)+"/end", nil).mustRedirect(t, "/account")
	phone.get("/clients").mustRedirect(t, "/signin")
	if res := b.get("/clients"); res.status != http.StatusOK {
		t.Fatalf("ending the phone's session signed this browser out: %d", res.status)
	}
	// Ending this browser's own row is a sign-out.
	b.post("/account/sessions/"+itoa(ids[1])+"/end", nil).mustRedirect(t, "/signin?signed_out=1")
	b.get("/clients").mustRedirect(t, "/signin")
}

// Signing out removes the session's row, so a copied cookie is worthless.
func TestSignOutEndsSessionRow(t *testing.T) {
	a := newApp(t)
	b, u := a.signedIn(store.RoleDietitian)
	b.post("/signout", nil).mustRedirect(t, "/signin")
	if n := a.count(`SELECT count(*) FROM staff_sessions WHERE user_id = $1`, u.ID); n != 0 {
		t.Errorf("%d session rows left after sign-out", n)
	}
}

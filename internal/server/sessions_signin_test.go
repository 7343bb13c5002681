package server

import (
	"context"
	"net/http"
	"strings"
	"testing"

	"larder/internal/store"
)

// A saved session's row names its user and staff session, so one query
// reads both; the row's copy is only trusted where it agrees with the
// session's own data. A row saved before it named them (NULLs) still signs
// its user in, and a row naming someone else signs in the data's user, not
// them. Ending the staff session signs the browser out on its next page.
func TestSessionRowNamesItsUser(t *testing.T) {
	a := newApp(t)
	ctx := context.Background()
	b, u := a.signedIn(store.RoleDietitian)
	other, ou := a.signedIn(store.RoleAdmin)
	var uid, sid, staffSession int64
	if err := a.st.Pool.QueryRow(ctx, `SELECT s.user_id, s.staff_session_id, ss.id FROM sessions s
		JOIN staff_sessions ss ON ss.user_id = $2 WHERE s.token = $1`, b.sessionCookie(), u.ID).Scan(&uid, &sid, &staffSession); err != nil {
		t.Fatal(err)
	}
	if uid != u.ID || sid != staffSession {
		t.Fatalf("session row names user %d and staff session %d, want %d and %d", uid, sid, u.ID, staffSession)
	}
	account := func(b *browser) response {
		t.Helper()
		res := b.get("/account")
		if res.status != http.StatusOK {
			t.Fatalf("account page: %d to %q", res.status, res.location)
		}
		return res
	}
	account(b).mustContain(t, u.Email)

	// A row from before the columns: read the old way, still signed in.
	if _, err := a.st.Pool.Exec(ctx, `UPDATE sessions SET user_id = NULL, staff_session_id = NULL WHERE token = $1`, b.sessionCookie()); err != nil {
		t.Fatal(err)
	}
	account(b).mustContain(t, u.Email)

	// A row whose copy names another signed-in admin: the data decides.
	if _, err := a.st.Pool.Exec(ctx, `UPDATE sessions SET (user_id, staff_session_id) = (SELECT user_id, staff_session_id FROM sessions WHERE token = $2)
		WHERE token = $1`, b.sessionCookie(), other.sessionCookie()); err != nil {
		t.Fatal(err)
	}
	if res := account(b); !strings.Contains(res.body, u.Email) || strings.Contains(res.body, ou.Email) {
		t.Fatalf("a session whose row names another user showed the account of %s", ou.Email)
	}
	if res := b.get("/team"); res.status != http.StatusForbidden {
		t.Fatalf("a dietitian's session whose row names an admin opened the Team page: %d", res.status)
	}

	// The staff session ended elsewhere: signed out on the next page.
	if _, err := a.st.Pool.Exec(ctx, `DELETE FROM staff_sessions WHERE user_id = $1`, ou.ID); err != nil {
		t.Fatal(err)
	}
	if res := other.get("/account"); res.status != http.StatusSeeOther || !strings.HasPrefix(res.location, "/signin") {
		t.Fatalf("after its staff session was ended: %d to %q, want a redirect to sign in", res.status, res.location)
	}
}

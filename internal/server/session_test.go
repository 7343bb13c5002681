package server

import (
	"context"
	"net/http"
	"net/http/httptest"
	"net/url"
	"testing"
	"time"

	"larder/internal/auth"
	"larder/internal/store"
	"larder/internal/testdb"
)

// A signed-in page view that changes nothing in the session does not write
// the session row; activity is still recorded once a minute, and two idle
// hours still end the session.
func TestSessionNotRewrittenOnEveryRequest(t *testing.T) {
	clock := testNow
	st := store.New(testdb.Pool(t))
	s := New(Config{Store: st, SessionCleanup: -1, Now: func() time.Time { return clock }})
	s.sessionNow = func() time.Time { return clock }
	a := &app{t: t, st: st}
	a.srv = httptest.NewServer(s)
	t.Cleanup(func() { a.srv.Close(); s.Close() })
	u := a.user(store.RoleDietitian, false)
	b := a.browser()
	b.post("/signin", url.Values{"email": {u.Email}, "password": {testPassword}}).mustRedirect(t, "/")
	srvURL, _ := url.Parse(a.srv.URL)
	var token string
	for _, c := range b.c.Jar.Cookies(srvURL) {
		if c.Name == "larder_session" {
			token = c.Value
		}
	}
	if token == "" {
		t.Fatal("no session cookie after sign-in")
	}
	row := func() (data []byte, expiry time.Time, ok bool) {
		err := st.Pool.QueryRow(context.Background(), `SELECT data, expiry FROM sessions WHERE token = $1`, token).Scan(&data, &expiry)
		return data, expiry, err == nil
	}
	data0, exp0, ok := row()
	if !ok {
		t.Fatal("session row missing")
	}
	for _, after := range []time.Duration{10 * time.Second, 30 * time.Second, 59 * time.Second} {
		clock = testNow.Add(after)
		if res := b.get("/clients"); res.status != http.StatusOK {
			t.Fatalf("clients page at +%s: %d", after, res.status)
		}
		data, exp, _ := row()
		if string(data) != string(data0) || !exp.Equal(exp0) {
			t.Fatalf("the session row was rewritten by a view at +%s that changed nothing", after)
		}
	}
	// A minute on, the activity is recorded (one write).
	clock = testNow.Add(90 * time.Second)
	b.get("/clients")
	if data, _, _ := row(); string(data) == string(data0) {
		t.Fatal("activity after a minute was not recorded")
	}
	// Within the idle limit of the last recorded activity the session lives…
	clock = clock.Add(auth.IdleTimeout - time.Minute)
	if res := b.get("/clients"); res.status != http.StatusOK {
		t.Fatalf("session ended before the idle limit: %d", res.status)
	}
	// …and after two idle hours it ends.
	clock = clock.Add(auth.IdleTimeout + time.Second)
	b.get("/clients").mustRedirect(t, "/signin")
	if _, _, ok := row(); ok {
		t.Fatal("the idle session's row is still there")
	}
}

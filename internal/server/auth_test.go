package server

import (
	"context"
	"encoding/json"
	"net/http"
	"net/http/httptest"
	"net/url"
	"strings"
	"testing"
	"time"

	"github.com/jackc/pgx/v5/pgxpool"

	"larder/internal/store"
	"larder/internal/testdb"
)

func TestSignIn(t *testing.T) {
	a := newApp(t)
	u := a.user(store.RoleDietitian, false)

	t.Run("success", func(t *testing.T) {
		b := a.browser()
		b.post("/signin", url.Values{"email": {strings.ToUpper(u.Email)}, "password": {testPassword}, "next": {"/clients?q=x"}}).
			mustRedirect(t, "/clients?q=x")
		res := b.get("/clients")
		if res.status != http.StatusOK {
			t.Fatalf("clients after sign-in: %d", res.status)
		}
		res.mustContain(t, u.Name, "Sign out")
		if n := a.count(`SELECT count(*) FROM audit_log WHERE action = 'sign_in' AND user_id = $1`, u.ID); n != 1 {
			t.Fatalf("sign-in audit rows = %d", n)
		}
	})
	t.Run("wrong password", func(t *testing.T) {
		b := a.browser()
		res := b.post("/signin", url.Values{"email": {u.Email}, "password": {"not the password"}})
		if res.status != http.StatusUnauthorized {
			t.Fatalf("status %d", res.status)
		}
		res.mustContain(t, "The email or password is not right.", `value="`+u.Email+`"`)
		if strings.Contains(res.body, "not the password") {
			t.Fatal("the typed password was sent back in the page")
		}
		b.get("/clients").mustRedirect(t, "/signin")
	})
	t.Run("unknown email", func(t *testing.T) {
		res := a.browser().post("/signin", url.Values{"email": {"nobody-here@example.org"}, "password": {testPassword}})
		if res.status != http.StatusUnauthorized {
			t.Fatalf("status %d", res.status)
		}
		res.mustContain(t, "The email or password is not right.")
	})
	t.Run("disabled user", func(t *testing.T) {
		d := a.user(store.RoleAdmin, true)
		b := a.browser()
		res := b.post("/signin", url.Values{"email": {d.Email}, "password": {testPassword}})
		if res.status != http.StatusForbidden {
			t.Fatalf("status %d", res.status)
		}
		res.mustContain(t, "This account is disabled.")
		b.get("/clients").mustRedirect(t, "/signin")
	})
	t.Run("empty form", func(t *testing.T) {
		res := a.browser().post("/signin", url.Values{})
		res.mustContain(t, "Email is required.", "Password is required.")
	})
	t.Run("next cannot leave the site", func(t *testing.T) {
		res := a.browser().post("/signin", url.Values{"email": {u.Email}, "password": {testPassword}, "next": {"//evil.example/x"}})
		if res.status != http.StatusSeeOther || res.location != "/" {
			t.Fatalf("sign-in with a foreign next: %d to %q, want 303 to the overview /", res.status, res.location)
		}
	})
	t.Run("without next the overview comes first", func(t *testing.T) {
		b := a.browser()
		res := b.post("/signin", url.Values{"email": {u.Email}, "password": {testPassword}})
		if res.status != http.StatusSeeOther || res.location != "/" {
			t.Fatalf("sign-in: %d to %q, want 303 to /", res.status, res.location)
		}
		page := b.get("/")
		if page.status != http.StatusOK {
			t.Fatalf("overview: %d", page.status)
		}
		page.mustContain(t, "<h1>Overview</h1>", `href="/" aria-current="page"`, "Events in the next 21 days")
	})
}

func TestDisablingEndsSessions(t *testing.T) {
	a := newApp(t)
	b, u := a.signedIn(store.RoleDietitian)
	if res := b.get("/clients"); res.status != http.StatusOK {
		t.Fatalf("status %d", res.status)
	}
	if err := a.st.SetUserDisabled(context.Background(), store.System, u.ID, true); err != nil {
		t.Fatal(err)
	}
	b.get("/clients").mustRedirect(t, "/signin")
}

func TestSignOutEndsSessionServerSide(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	srvURL, _ := url.Parse(a.srv.URL)
	cookies := b.c.Jar.Cookies(srvURL)
	if len(cookies) == 0 {
		t.Fatal("no session cookie after sign-in")
	}
	before := a.count(`SELECT count(*) FROM sessions`)
	out := b.post("/signout", nil)
	out.mustRedirect(t, "/signin")
	// The person who signed out is told so on the page they land on.
	b.get(out.location).mustContain(t, "You have signed out.")
	if strings.Contains(b.get("/signin").body, "You have signed out.") {
		t.Error("the sign-out notice shows on a plain visit to the sign-in page")
	}
	if after := a.count(`SELECT count(*) FROM sessions`); after != before-1 {
		t.Fatalf("sessions rows %d before sign-out, %d after", before, after)
	}
	// Replaying the old cookie must not work.
	replay := a.browser()
	replay.c.Jar.SetCookies(srvURL, cookies)
	replay.get("/clients").mustRedirect(t, "/signin")
}

func TestSessionCookieFlags(t *testing.T) {
	a := newApp(t)
	u := a.user(store.RoleDietitian, false)
	req, _ := http.NewRequest(http.MethodPost, a.srv.URL+"/signin", strings.NewReader(url.Values{"email": {u.Email}, "password": {testPassword}}.Encode()))
	req.Header.Set("Content-Type", "application/x-www-form-urlencoded")
	resp, err := (&http.Client{CheckRedirect: func(*http.Request, []*http.Request) error { return http.ErrUseLastResponse }}).Do(req)
	if err != nil {
		t.Fatal(err)
	}
	resp.Body.Close()
	var found bool
	for _, c := range resp.Cookies() {
		if c.Name == "larder_session" {
			found = true
			if !c.HttpOnly || c.SameSite != http.SameSiteLaxMode || c.Secure {
				t.Fatalf("cookie flags: HttpOnly=%v SameSite=%v Secure=%v", c.HttpOnly, c.SameSite, c.Secure)
			}
		}
	}
	if !found {
		t.Fatal("no larder_session cookie")
	}

	// With SecureCookies the cookie is Secure.
	s := New(Config{Store: a.st, SessionCleanup: -1, SecureCookies: true})
	defer s.Close()
	rec := httptest.NewRecorder()
	r := httptest.NewRequest(http.MethodPost, "/signin", strings.NewReader(url.Values{"email": {u.Email}, "password": {testPassword}}.Encode()))
	r.Header.Set("Content-Type", "application/x-www-form-urlencoded")
	s.ServeHTTP(rec, r)
	if !strings.Contains(rec.Header().Get("Set-Cookie"), "Secure") {
		t.Fatalf("Set-Cookie without Secure: %q", rec.Header().Get("Set-Cookie"))
	}
}

// Every staff page sends an anonymous visitor to sign-in.
func TestAnonymousRedirectedToSignIn(t *testing.T) {
	a := newApp(t)
	c := a.newClient(unique("Anon Client"))
	b := a.browser()
	cid := "/clients/" + itoa(c.ID)
	for _, path := range []string{
		"/", "/clients", "/clients?q=a&show=all", "/clients/new", cid, cid + "/edit",
		cid + "/body-mass/new", cid + "/body-mass/1/edit", cid + "/training/new", cid + "/training/1/edit",
		cid + "/events/new", cid + "/events/1/edit", "/team", "/account",
	} {
		res := b.get(path)
		if path == "/" {
			// "/" is itself a staff page: it sends the visitor on to sign-in.
			res.mustRedirect(t, "/signin?next=%2F")
			continue
		}
		res.mustRedirect(t, "/signin?next="+url.QueryEscape(path))
	}
	for _, path := range []string{"/clients", cid, cid + "/archive", cid + "/body-mass", cid + "/training", cid + "/events", "/team", "/account/password"} {
		b.post(path, url.Values{"name": {"x"}}).mustRedirect(t, "/signin")
	}
	if n := a.count(`SELECT count(*) FROM clients WHERE name = 'x'`); n != 0 {
		t.Fatalf("anonymous POST created %d clients", n)
	}
}

func TestRoles(t *testing.T) {
	a := newApp(t)
	diet, _ := a.signedIn(store.RoleDietitian)
	admin, _ := a.signedIn(store.RoleAdmin)
	victim := a.user(store.RoleDietitian, false)
	vid := itoa(victim.ID)

	if res := diet.get("/team"); res.status != http.StatusForbidden {
		t.Fatalf("dietitian GET /team: %d", res.status)
	}
	if res := diet.get("/clients"); strings.Contains(res.body, `href="/team"`) {
		t.Fatal("dietitian's nav shows Team")
	}
	for _, path := range []string{"/team", "/team/practice", "/team/" + vid + "/role", "/team/" + vid + "/disable", "/team/" + vid + "/password"} {
		if res := diet.post(path, url.Values{"role": {"admin"}, "name": {"Sneaky"}, "email": {unique("sneaky") + "@example.org"}, "practice_name": {"Hijacked"}}); res.status != http.StatusForbidden {
			t.Fatalf("dietitian POST %s: %d", path, res.status)
		}
	}
	if u, _ := a.st.UserByID(context.Background(), victim.ID); u.Role != store.RoleDietitian || u.Disabled {
		t.Fatalf("dietitian changed another user: %+v", u)
	}
	res := admin.get("/team")
	if res.status != http.StatusOK {
		t.Fatalf("admin GET /team: %d", res.status)
	}
	res.mustContain(t, victim.Email)
}

func TestCrossSitePostRefused(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleAdmin)
	name := unique("Forged Client")
	form := url.Values{"name": {name}, "sex": {"male"}}
	if res := b.post("/clients", form, "Sec-Fetch-Site", "cross-site"); res.status != http.StatusForbidden {
		t.Fatalf("cross-site POST (Sec-Fetch-Site): %d", res.status)
	}
	if res := b.post("/clients", form, "Origin", "https://evil.example"); res.status != http.StatusForbidden {
		t.Fatalf("cross-origin POST (Origin): %d", res.status)
	}
	if n := a.count(`SELECT count(*) FROM clients WHERE name = $1`, name); n != 0 {
		t.Fatalf("forged POST created %d clients", n)
	}
	// The same form from our own pages goes through.
	b.post("/clients", form, "Sec-Fetch-Site", "same-origin").mustRedirect(t, "/clients/")
	if n := a.count(`SELECT count(*) FROM clients WHERE name = $1`, name); n != 1 {
		t.Fatalf("same-origin POST created %d clients", n)
	}
}

func TestSetupOnlyWhileNoUser(t *testing.T) {
	pool, _ := testdb.Empty(t)
	if _, err := store.Migrate(context.Background(), pool); err != nil {
		t.Fatal(err)
	}
	st := store.New(pool)
	s := New(Config{Store: st, SessionCleanup: -1, Now: func() time.Time { return testNow }})
	hs := httptest.NewServer(s)
	defer func() { hs.Close(); s.Close() }()
	a := &app{t: t, st: st, srv: hs}
	b := a.browser()

	b.get("/signin").mustRedirect(t, "/setup")
	b.get("/clients").mustRedirect(t, "/signin")
	res := b.post("/setup", url.Values{"practice_name": {"Riverbend Nutrition"}, "name": {"First Admin"}, "email": {"first@example.org"},
		"password": {"short"}, "confirm": {"different"}})
	res.mustContain(t, "Password must be at least 10 characters.", "The two passwords do not match.", `value="Riverbend Nutrition"`)
	b.post("/setup", url.Values{"practice_name": {"Riverbend Nutrition"}, "name": {"First Admin"}, "email": {"first@example.org"},
		"password": {testPassword}, "confirm": {testPassword}}).mustRedirect(t, "/clients")
	b.get("/clients").mustContain(t, "Riverbend Nutrition", "First Admin")
	u, err := st.UserByEmail(context.Background(), "first@example.org")
	if err != nil || u.Role != store.RoleAdmin {
		t.Fatalf("first user: %+v %v", u, err)
	}
	// Once a user exists the page is gone, and a second POST makes nobody.
	if res := a.browser().get("/setup"); res.status != http.StatusNotFound {
		t.Fatalf("setup after first user: %d", res.status)
	}
	a.browser().post("/setup", url.Values{"practice_name": {"X"}, "name": {"Second"}, "email": {"second@example.org"},
		"password": {testPassword}, "confirm": {testPassword}})
	if n, _ := st.CountUsers(context.Background()); n != 1 {
		t.Fatalf("users after second setup POST: %d", n)
	}
}

func TestHealthz(t *testing.T) {
	a := newApp(t)
	res := a.browser().get("/healthz")
	if res.status != http.StatusOK {
		t.Fatalf("healthz: %d %s", res.status, res.body)
	}
	var body map[string]any
	if err := json.Unmarshal([]byte(res.body), &body); err != nil || body["status"] != "ok" {
		t.Fatalf("healthz body %q: %v", res.body, err)
	}

	// A pool that cannot reach the database: closed before use.
	pool, err := pgxpool.New(context.Background(), testdb.DSN(t))
	if err != nil {
		t.Fatal(err)
	}
	pool.Close()
	s := New(Config{Store: store.New(pool), SessionCleanup: -1})
	defer s.Close()
	rec := httptest.NewRecorder()
	s.ServeHTTP(rec, httptest.NewRequest(http.MethodGet, "/healthz", nil))
	if rec.Code != http.StatusServiceUnavailable {
		t.Fatalf("healthz with closed pool: %d", rec.Code)
	}
	if err := json.Unmarshal(rec.Body.Bytes(), &body); err != nil || body["status"] != "unavailable" {
		t.Fatalf("healthz body %q: %v", rec.Body.String(), err)
	}
}

func TestSecurityHeaders(t *testing.T) {
	a := newApp(t)
	resp, err := http.Get(a.srv.URL + "/signin")
	if err != nil {
		t.Fatal(err)
	}
	resp.Body.Close()
	if resp.Header.Get("X-Frame-Options") != "DENY" || resp.Header.Get("X-Content-Type-Options") != "nosniff" ||
		!strings.Contains(resp.Header.Get("Content-Security-Policy"), "frame-ancestors 'none'") {
		t.Fatalf("headers %v", resp.Header)
	}
}

func TestChangeOwnPassword(t *testing.T) {
	a := newApp(t)
	b, u := a.signedIn(store.RoleDietitian)
	res := b.post("/account/password", url.Values{"current": {"wrong one!!"}, "new": {"another long password"}, "confirm": {"another long password"}})
	res.mustContain(t, "The current password is not right.")
	res = b.post("/account/password", url.Values{"current": {testPassword}, "new": {"short"}, "confirm": {"other"}})
	res.mustContain(t, "New password must be at least 10 characters.", "The two new passwords do not match.")
	b.post("/account/password", url.Values{"current": {testPassword}, "new": {"another long password"}, "confirm": {"another long password"}}).
		mustRedirect(t, "/account")
	fresh := a.browser()
	fresh.post("/signin", url.Values{"email": {u.Email}, "password": {testPassword}})
	fresh.get("/clients").mustRedirect(t, "/signin")
	if res := fresh.post("/signin", url.Values{"email": {u.Email}, "password": {"another long password"}}); res.status != http.StatusSeeOther || res.location != "/" {
		t.Fatalf("sign-in with the new password: %d to %q", res.status, res.location)
	}
}

package server

import (
	"context"
	"fmt"
	"io"
	"net/http"
	"net/http/cookiejar"
	"net/http/httptest"
	"net/url"
	"os"
	"strings"
	"sync/atomic"
	"testing"
	"time"

	"larder/internal/auth"
	"larder/internal/store"
	"larder/internal/testdb"
)

func TestMain(m *testing.M) { os.Exit(testdb.Main(m)) }

// testNow is the fixed clock of the HTTP tests: 1 March 2027, 10:00 UTC.
var testNow = time.Date(2027, 3, 1, 10, 0, 0, 0, time.UTC)

const testPassword = "a long test password"

var seq atomic.Int64

// unique gives a string no other test in this package uses.
func unique(prefix string) string {
	return fmt.Sprintf("%s-%d-%d", prefix, time.Now().UnixNano()%1e9, seq.Add(1))
}

type app struct {
	t   *testing.T
	st  *store.Store
	srv *httptest.Server
}

func newApp(t *testing.T) *app {
	t.Helper()
	st := store.New(testdb.Pool(t))
	s := New(Config{Store: st, SessionCleanup: -1, Now: func() time.Time { return testNow }})
	hs := httptest.NewServer(s)
	t.Cleanup(func() { hs.Close(); s.Close() })
	return &app{t: t, st: st, srv: hs}
}

// user makes a staff account with testPassword.
func (a *app) user(role string, disabled bool) store.User {
	a.t.Helper()
	hash, err := auth.HashPassword(testPassword)
	if err != nil {
		a.t.Fatal(err)
	}
	u := store.User{Email: unique("staff") + "@example.org", Name: unique("Staff"), Role: role, Disabled: disabled, PasswordHash: hash}
	if err := a.st.CreateUser(context.Background(), store.System, &u); err != nil {
		a.t.Fatal(err)
	}
	return u
}

// browser is one person's cookie jar against the app; it does not follow
// redirects so tests can see them.
type browser struct {
	a *app
	c *http.Client
}

func (a *app) browser() *browser {
	jar, _ := cookiejar.New(nil)
	return &browser{a: a, c: &http.Client{Jar: jar, CheckRedirect: func(*http.Request, []*http.Request) error { return http.ErrUseLastResponse }}}
}

// signedIn is a browser signed in as a new user of the role.
func (a *app) signedIn(role string) (*browser, store.User) {
	a.t.Helper()
	u := a.user(role, false)
	b := a.browser()
	res := b.post("/signin", url.Values{"email": {u.Email}, "password": {testPassword}})
	if res.status != http.StatusSeeOther {
		a.t.Fatalf("sign-in as %s: status %d\n%s", u.Email, res.status, res.body)
	}
	return b, u
}

type response struct {
	status   int
	location string
	body     string
}

func (b *browser) do(req *http.Request) response {
	b.a.t.Helper()
	resp, err := b.c.Do(req)
	if err != nil {
		b.a.t.Fatal(err)
	}
	defer resp.Body.Close()
	body, _ := io.ReadAll(resp.Body)
	return response{status: resp.StatusCode, location: resp.Header.Get("Location"), body: string(body)}
}

func (b *browser) get(path string) response {
	b.a.t.Helper()
	req, _ := http.NewRequest(http.MethodGet, b.a.srv.URL+path, nil)
	return b.do(req)
}

func (b *browser) post(path string, v url.Values, headers ...string) response {
	b.a.t.Helper()
	req, _ := http.NewRequest(http.MethodPost, b.a.srv.URL+path, strings.NewReader(v.Encode()))
	req.Header.Set("Content-Type", "application/x-www-form-urlencoded")
	for i := 0; i+1 < len(headers); i += 2 {
		req.Header.Set(headers[i], headers[i+1])
	}
	return b.do(req)
}

// mustRedirect checks a 303 to a location starting with prefix.
func (r response) mustRedirect(t *testing.T, prefix string) {
	t.Helper()
	if r.status != http.StatusSeeOther || !strings.HasPrefix(r.location, prefix) {
		t.Fatalf("want 303 to %s…, got %d to %q\n%s", prefix, r.status, r.location, r.body)
	}
}

func (r response) mustContain(t *testing.T, parts ...string) {
	t.Helper()
	for _, p := range parts {
		if !strings.Contains(r.body, p) {
			t.Fatalf("page lacks %q (status %d)\n%s", p, r.status, r.body)
		}
	}
}

// newClient adds a client through the store and returns it.
func (a *app) newClient(name string) store.Client {
	a.t.Helper()
	h := 170.0
	c := store.Client{Name: name, Sex: store.SexFemale, HeightCm: &h, Sport: "Running"}
	if err := a.st.CreateClient(context.Background(), store.System, &c); err != nil {
		a.t.Fatal(err)
	}
	return c
}

func (a *app) count(sql string, args ...any) int {
	a.t.Helper()
	var n int
	if err := a.st.Pool.QueryRow(context.Background(), sql, args...).Scan(&n); err != nil {
		a.t.Fatal(err)
	}
	return n
}

func itoa(n int64) string { return fmt.Sprint(n) }

package server

import (
	"context"
	"fmt"
	"net/http"
	"net/http/httptest"
	"net/url"
	"strings"
	"testing"
	"time"

	"larder/internal/store"
)

// signInFrom posts a sign-in as if from address (the test server's own
// requests all come from 127.0.0.1).
func signInFrom(s *Server, email, password, address string) *httptest.ResponseRecorder {
	rec := httptest.NewRecorder()
	r := httptest.NewRequest(http.MethodPost, "/signin", strings.NewReader(url.Values{"email": {email}, "password": {password}}.Encode()))
	r.Header.Set("Content-Type", "application/x-www-form-urlencoded")
	r.RemoteAddr = address + ":40000"
	s.ServeHTTP(rec, r)
	return rec
}

// testAddress is an address in a documentation range no other test uses.
func testAddress() string { return fmt.Sprintf("203.0.113.%d", seq.Add(1)%250+1) }

// Wrong guesses from one address make that address wait, with growing
// waits; the owner, from their own network, signs in at once (the old rule
// paused the email for everyone after 10 failures). Every failure is in the
// audit log.
func TestSignInThrottlePerAddressNotPerAccount(t *testing.T) {
	a := newApp(t)
	s := New(Config{Store: a.st, SessionCleanup: -1})
	defer s.Close()
	u := a.user(store.RoleAdmin, false)
	attacker, owner := testAddress(), testAddress()

	for i := 0; i < pairFree; i++ {
		if rec := signInFrom(s, u.Email, fmt.Sprint("guess ", i), attacker); rec.Code != http.StatusUnauthorized {
			t.Fatalf("guess %d: status %d", i, rec.Code)
		}
	}
	// One more failure goes over the free tries: the next try must wait.
	signInFrom(s, u.Email, "guess again", attacker)
	rec := signInFrom(s, strings.ToUpper(u.Email), testPassword, attacker)
	if rec.Code != http.StatusTooManyRequests {
		t.Fatalf("right password from the guessing address right away: %d, want 429", rec.Code)
	}
	if !strings.Contains(rec.Body.String(), "Too many wrong passwords for this email from your network. Wait ") ||
		!strings.Contains(rec.Body.String(), "Your account is not locked") || rec.Header().Get("Retry-After") == "" {
		t.Fatalf("throttle message or Retry-After missing:\n%s", rec.Body.String())
	}
	// The owner, elsewhere, is not kept out.
	if rec := signInFrom(s, u.Email, testPassword, owner); rec.Code != http.StatusSeeOther {
		t.Fatalf("owner from another address: %d, want 303\n%s", rec.Code, rec.Body.String())
	}
	// Once the wait is over the attacker's address may try again.
	if _, err := a.st.Pool.Exec(context.Background(), `UPDATE signin_failures SET at = at - interval '10 seconds' WHERE address = $1`, attacker); err != nil {
		t.Fatal(err)
	}
	if rec := signInFrom(s, u.Email, testPassword, attacker); rec.Code != http.StatusSeeOther {
		t.Fatalf("after the wait: %d, want 303", rec.Code)
	}
	if n := a.count(`SELECT count(*) FROM signin_failures WHERE address = $1`, attacker); n != 0 {
		t.Errorf("%d failures of the pair kept after a good sign-in", n)
	}
	if n := a.count(`SELECT count(*) FROM audit_log WHERE action = 'sign_in_failed' AND entity_id = $1 AND detail->>'address' = $2 AND detail->>'reason' = 'wrong password'`, u.ID, attacker); n != pairFree+1 {
		t.Errorf("%d failed sign-ins in the audit log, want %d", n, pairFree+1)
	}
}

// One address trying many accounts (password spraying) is slowed as a
// whole, while other addresses are not.
func TestSignInThrottlePerAddress(t *testing.T) {
	a := newApp(t)
	s := New(Config{Store: a.st, SessionCleanup: -1})
	defer s.Close()
	u := a.user(store.RoleDietitian, false)
	sprayer := testAddress()
	for i := 0; i <= addressFree; i++ {
		if rec := signInFrom(s, unique("nobody")+"@example.org", "Password2024!", sprayer); rec.Code != http.StatusUnauthorized {
			t.Fatalf("spray %d: %d", i, rec.Code)
		}
	}
	rec := signInFrom(s, u.Email, testPassword, sprayer)
	if rec.Code != http.StatusTooManyRequests || !strings.Contains(rec.Body.String(), "Too many wrong passwords from your network.") {
		t.Fatalf("spraying address not slowed: %d\n%s", rec.Code, rec.Body.String())
	}
	if rec := signInFrom(s, u.Email, testPassword, testAddress()); rec.Code != http.StatusSeeOther {
		t.Fatalf("another address: %d", rec.Code)
	}
	if n := a.count(`SELECT count(*) FROM audit_log WHERE action = 'sign_in_failed' AND entity_id IS NULL AND detail->>'address' = $1 AND detail->>'reason' = 'unknown email'`, sprayer); n != addressFree+1 {
		t.Errorf("%d unknown-email failures in the audit log, want %d", n, addressFree+1)
	}
}

// The wait grows with each failure past the free tries, to a ceiling.
func TestGrowingWait(t *testing.T) {
	for _, c := range []struct {
		n    int
		want time.Duration
	}{{0, 0}, {5, 0}, {6, time.Second}, {7, 2 * time.Second}, {8, 4 * time.Second}, {15, 512 * time.Second}, {16, 15 * time.Minute}, {1000, 15 * time.Minute}} {
		if got := growingWait(c.n, pairFree, pairMaxWait); got != c.want {
			t.Errorf("growingWait(%d) = %v, want %v", c.n, got, c.want)
		}
	}
	if got := waitWords(90 * time.Second); got != "2 minutes" {
		t.Errorf("waitWords(90s) = %q", got)
	}
	if got := waitWords(1500 * time.Millisecond); got != "2 seconds" {
		t.Errorf("waitWords(1.5s) = %q", got)
	}
}

// The most common passwords are refused wherever a password is chosen,
// beside the field.
func TestCommonPasswordsRefused(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleAdmin)
	res := b.post("/account/password", url.Values{"current": {testPassword}, "new": {"Password123"}, "confirm": {"Password123"}})
	if res.status != http.StatusUnprocessableEntity {
		t.Fatalf("common new password: %d", res.status)
	}
	res.mustContain(t, "This password is one of the most common ones")
	res = b.post("/team", url.Values{"name": {"Common"}, "email": {unique("common") + "@example.org"}, "role": {"dietitian"}, "password": {"1234567890"}})
	if res.status != http.StatusUnprocessableEntity {
		t.Fatalf("common password for a new member: %d", res.status)
	}
	res.mustContain(t, "This password is one of the most common ones")
	// A good passphrase still works.
	b.post("/account/password", url.Values{"current": {testPassword}, "new": {"kettle orbit spinach"}, "confirm": {"kettle orbit spinach"}}).mustRedirect(t, "/account")
}

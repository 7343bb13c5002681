package server

import (
	"encoding/json"
	"net/http"
	"net/http/httptest"
	"regexp"
	"strings"
	"testing"

	"larder/internal/store"
	"larder/internal/testdb"
)

// inlineCode finds what a strict Content-Security-Policy refuses: a script
// element without src, a style element, a style attribute or an on…
// event-handler attribute.
var inlineCode = regexp.MustCompile(`(?i)<script(\s[^>]*)?>\s*[^<\s]|<script>|<style[\s>]|\sstyle\s*=|\son[a-z]+\s*=`)

// Pages work under the policy: they carry no inline script or style, the
// policy allows nothing inline, and HTTPS-only is announced only when the
// app is served behind TLS.
func TestContentSecurityPolicyAndNoInlineCode(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Ada Inline"))
	p, _ := storePlan(t, a, c.ID, "Build week", weekRequest("2027-03-01", 5), true, "")
	created := b.post("/clients/"+itoa(c.ID)+"/links", map[string][]string{"label": {"phone"}, "expires_days": {"90"}})
	token := linkRe.FindStringSubmatch(created.body)[1]
	_, phone := getPublic(t, a, "/c/"+token)
	pages := map[string]string{
		"sign-in":      a.browser().get("/signin").body,
		"clients":      b.get("/clients").body,
		"client":       b.get("/clients/" + itoa(c.ID)).body,
		"plan":         b.get("/clients/" + itoa(c.ID) + "/plans/" + itoa(p.ID)).body,
		"new plan":     b.get("/clients/" + itoa(c.ID) + "/plans/new").body,
		"link created": created.body,
		"phone page":   phone,
	}
	for name, body := range pages {
		if len(body) < 200 {
			t.Errorf("%s: page too short to check:\n%s", name, body)
		}
		if m := inlineCode.FindString(body); m != "" {
			i := strings.Index(body, m)
			t.Errorf("%s page has inline code %q near:\n%.200s", name, m, body[i:])
		}
	}
	if !strings.Contains(pages["plan"], "<svg") {
		t.Error("plan page has no chart to check")
	}

	res, err := http.Get(a.srv.URL + "/signin")
	if err != nil {
		t.Fatal(err)
	}
	res.Body.Close()
	csp := res.Header.Get("Content-Security-Policy")
	for _, want := range []string{"default-src 'self'", "script-src 'self'", "style-src 'self'", "object-src 'none'", "frame-ancestors 'none'"} {
		if !strings.Contains(csp, want+";") && !strings.HasSuffix(csp, want) {
			t.Errorf("CSP %q lacks %q", csp, want)
		}
	}
	if strings.Contains(csp, "unsafe-inline") || strings.Contains(csp, "unsafe-eval") {
		t.Errorf("CSP %q allows inline code", csp)
	}
	if h := res.Header.Get("Strict-Transport-Security"); h != "" {
		t.Errorf("HSTS %q sent without secure cookies (plain HTTP)", h)
	}

	s := New(Config{Store: a.st, SessionCleanup: -1, SecureCookies: true})
	defer s.Close()
	rec := httptest.NewRecorder()
	s.ServeHTTP(rec, httptest.NewRequest(http.MethodGet, "/signin", nil))
	if h := rec.Header().Get("Strict-Transport-Security"); !strings.HasPrefix(h, "max-age=") || h == "max-age=0" {
		t.Errorf("with secure cookies HSTS is %q, want a max-age", h)
	}
}

// The static folder serves files, never a listing of what it holds.
func TestStaticHasNoDirectoryListing(t *testing.T) {
	a := newApp(t)
	for _, path := range []string{"/static/", "/static/.", "/static/%2e/"} {
		res := a.browser().get(path)
		if res.status != http.StatusNotFound || strings.Contains(res.body, "app.css") {
			t.Errorf("GET %s: %d, want 404 without a listing\n%.300s", path, res.status, res.body)
		}
	}
	for _, path := range []string{"/static/app.css", "/static/copy.js", "/static/client.css"} {
		if res := a.browser().get(path); res.status != http.StatusOK {
			t.Errorf("GET %s: %d", path, res.status)
		}
	}
}

// An anonymous health check learns only ok or unavailable; staff see the
// pool's figures.
func TestHealthzDetailsOnlyForStaff(t *testing.T) {
	a := newApp(t)
	var body map[string]any
	res := a.browser().get("/healthz")
	if err := json.Unmarshal([]byte(res.body), &body); err != nil || res.status != http.StatusOK {
		t.Fatalf("healthz: %d %q %v", res.status, res.body, err)
	}
	if len(body) != 1 || body["status"] != "ok" {
		t.Errorf("anonymous healthz says %v, want only status ok", body)
	}
	b, _ := a.signedIn(store.RoleDietitian)
	res = b.get("/healthz")
	body = nil
	if err := json.Unmarshal([]byte(res.body), &body); err != nil || body["status"] != "ok" || body["database"] != "ok" || body["connections"] == nil {
		t.Errorf("staff healthz says %v (%v), want status, database and connections", body, err)
	}

	// Unreachable: still one word for anyone.
	pool, _ := testdb.Empty(t)
	pool.Close()
	s := New(Config{Store: store.New(pool), SessionCleanup: -1})
	defer s.Close()
	rec := httptest.NewRecorder()
	s.ServeHTTP(rec, httptest.NewRequest(http.MethodGet, "/healthz", nil))
	body = nil
	if err := json.Unmarshal(rec.Body.Bytes(), &body); err != nil || rec.Code != http.StatusServiceUnavailable || len(body) != 1 || body["status"] != "unavailable" {
		t.Errorf("anonymous healthz with the database gone: %d %s", rec.Code, rec.Body)
	}
}

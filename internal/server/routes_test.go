package server

import (
	"context"
	"crypto/rand"
	"encoding/base64"
	"fmt"
	"net/http"
	"net/http/httptest"
	"regexp"
	"sort"
	"strings"
	"testing"
	"time"

	"github.com/go-chi/chi/v5"

	"larder/internal/auth"
	"larder/internal/store"
	"larder/internal/testdb"
)

// publicRoutes answer without a staff session. Every other route the router
// has, including any added later, must send an anonymous visitor to sign in.
var publicRoutes = map[string]bool{
	"/static/*":            true,
	"/healthz":             true,
	"/signin":              true,
	"/setup":               true,
	"/signout":             true,
	"/sources":             true,
	"/c/{token}":           true,
	"/c/{token}/plan.ics":  true,
	"/c/{token}/sheet.pdf": true,
}

var routeParam = regexp.MustCompile(`\{([^}:]+)(:[^}]*)?\}`)

// route is one method and pattern of the router with its placeholders
// filled in.
type route struct{ method, pattern, path string }

// walkRoutes lists every route of the server's chi router, with each URL
// parameter replaced by fill(name).
func walkRoutes(t *testing.T, s *Server, fill func(name string) string) []route {
	t.Helper()
	var out []route
	err := chi.Walk(s.handler.(chi.Routes), func(method, pattern string, _ http.Handler, _ ...func(http.Handler) http.Handler) error {
		path := routeParam.ReplaceAllStringFunc(pattern, func(m string) string {
			return fill(routeParam.FindStringSubmatch(m)[1])
		})
		path = strings.ReplaceAll(path, "/*", "/app.css")
		out = append(out, route{method, pattern, path})
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	sort.Slice(out, func(i, j int) bool { return out[i].pattern+out[i].method < out[j].pattern+out[j].method })
	return out
}

// fingerprint sums up every table but the sessions, so a refused request
// can be shown to have changed nothing.
func fingerprint(t *testing.T, st *store.Store) string {
	t.Helper()
	ctx := context.Background()
	rows, err := st.Pool.Query(ctx, `SELECT tablename FROM pg_tables WHERE schemaname = 'public' AND tablename <> 'sessions' ORDER BY 1`)
	if err != nil {
		t.Fatal(err)
	}
	var tables []string
	for rows.Next() {
		var n string
		if err := rows.Scan(&n); err != nil {
			t.Fatal(err)
		}
		tables = append(tables, n)
	}
	rows.Close()
	var sb strings.Builder
	for _, tb := range tables {
		var sum string
		q := fmt.Sprintf(`SELECT count(*)::text || ':' || coalesce(md5(string_agg(t::text, '|' ORDER BY t::text)), '') FROM %q t`, tb)
		if err := st.Pool.QueryRow(ctx, q).Scan(&sum); err != nil {
			t.Fatal(err)
		}
		sb.WriteString(tb + "=" + sum + "\n")
	}
	return sb.String()
}

func (b *browser) call(method, path string) response {
	b.a.t.Helper()
	req, _ := http.NewRequest(method, b.a.srv.URL+path, strings.NewReader(""))
	if method != http.MethodGet && method != http.MethodHead {
		req.Header.Set("Content-Type", "application/x-www-form-urlencoded")
	}
	return b.do(req)
}

// Every route of the router, found by walking it: anonymous visitors are
// sent to sign in (401 on the API), a dietitian is refused admin routes
// with 403 before anything changes, and client-link routes answer 404 to
// a token that is not a live link.
func TestRouteTable(t *testing.T) {
	st := store.New(testdb.Pool(t))
	s := New(Config{Store: st, SessionCleanup: -1, Now: func() time.Time { return testNow }})
	hs := httptest.NewServer(s)
	t.Cleanup(func() { hs.Close(); s.Close() })
	a := &app{t: t, st: st, srv: hs}

	admin, _ := a.signedIn(store.RoleAdmin)
	diet, _ := a.signedIn(store.RoleDietitian)
	victim := a.user(store.RoleDietitian, false) // the target of team actions
	c := a.newClient(unique("Ada Routes"))
	p, _ := storePlan(t, a, c.ID, "Build week", weekRequest("2027-03-01", 5), true, "")
	makeLink(t, admin, c.ID, "phone")
	other := a.newClient(unique("Bea Routes"))
	revoked := makeLink(t, admin, other.ID, "old")
	if _, err := st.Pool.Exec(context.Background(), `UPDATE client_links SET revoked_at = now() WHERE client_id = $1`, other.ID); err != nil {
		t.Fatal(err)
	}
	raw := make([]byte, auth.LinkTokenBytes)
	rand.Read(raw)
	stranger := base64.RawURLEncoding.EncodeToString(raw)

	fill := func(token string) func(string) string {
		return func(name string) string {
			switch name {
			case "clientID":
				return itoa(c.ID)
			case "planID":
				return itoa(p.ID)
			case "userID":
				return itoa(victim.ID)
			case "token":
				return token
			}
			return "1"
		}
	}
	routes := walkRoutes(t, s, fill(stranger))
	if len(routes) < 40 {
		t.Fatalf("walked only %d routes", len(routes))
	}

	t.Run("anonymous", func(t *testing.T) {
		before := fingerprint(t, st)
		for _, rt := range routes {
			if publicRoutes[rt.pattern] {
				continue
			}
			res := a.browser().call(rt.method, rt.path)
			switch {
			case strings.HasPrefix(rt.pattern, "/api/"):
				if res.status != http.StatusUnauthorized {
					t.Errorf("anonymous %s %s: %d, want 401", rt.method, rt.path, res.status)
				}
			case res.status != http.StatusSeeOther || !strings.HasPrefix(res.location, "/signin"):
				t.Errorf("anonymous %s %s: %d to %q, want 303 to /signin", rt.method, rt.path, res.status, res.location)
			}
		}
		if fingerprint(t, st) != before {
			t.Error("anonymous requests changed the database")
		}
	})

	t.Run("dietitian on admin routes", func(t *testing.T) {
		var refused []route
		for _, rt := range routes {
			if publicRoutes[rt.pattern] || rt.pattern == "/signout" {
				continue
			}
			// Routes a dietitian may use can change things (and reads are
			// audited); a refused one must change nothing at all.
			before := fingerprint(t, st)
			if res := diet.call(rt.method, rt.path); res.status == http.StatusForbidden {
				refused = append(refused, rt)
				if after := fingerprint(t, st); after != before {
					t.Errorf("%s %s refused a dietitian but changed the database:\nbefore %s\nafter %s", rt.method, rt.path, before, after)
				}
			}
		}
		// Admin routes are those an admin may use and a dietitian may not;
		// the team page and food edits are among them.
		seen := map[string]bool{}
		for _, rt := range refused {
			seen[rt.method+" "+rt.pattern] = true
		}
		for _, want := range []string{"GET /team", "POST /team/{userID}/role", "POST /foods"} {
			if !seen[want] {
				t.Errorf("%s is not refused to a dietitian", want)
			}
		}
		for _, rt := range refused {
			if res := admin.call(rt.method, rt.path); res.status == http.StatusForbidden {
				t.Errorf("%s %s refused to an admin too: the 403 is not about the role", rt.method, rt.path)
			}
		}
		t.Logf("%d of %d routes are admin-only", len(refused), len(routes))
	})

	t.Run("client link with another token", func(t *testing.T) {
		n := 0
		for _, token := range []string{stranger, revoked, "short", strings.Repeat("A", 43)} {
			for _, rt := range walkRoutes(t, s, fill(token)) {
				if !strings.Contains(rt.pattern, "{token}") {
					continue
				}
				n++
				res := a.browser().call(rt.method, rt.path)
				if res.status != http.StatusNotFound || strings.Contains(res.body, c.Name) || strings.Contains(res.body, other.Name) {
					t.Errorf("%s %s: %d, want 404 showing no client", rt.method, rt.pattern, res.status)
				}
			}
		}
		if n == 0 {
			t.Fatal("no client-link routes found")
		}
	})
}

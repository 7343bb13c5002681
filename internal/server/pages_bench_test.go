package server

import (
	"context"
	"fmt"
	"io"
	"net/http"
	"net/http/cookiejar"
	"net/http/httptest"
	"net/url"
	"strings"
	"testing"
	"time"

	"larder/internal/demo"
	"larder/internal/store"
	"larder/internal/testdb"
)

// BenchmarkPages serves the pages the load program measures (the phone
// page and the staff pages of the demo's largest plan), in-process with no
// network between, for profiling:
//
//	go test -run '^$' -bench Pages -cpuprofile cpu.out ./internal/server
func BenchmarkPages(b *testing.B) {
	ctx := context.Background()
	st := store.New(testdb.Pool(b))
	old := demo.Now
	demo.Now = func() time.Time { return testNow }
	res, err := demo.Run(ctx, st, "demo password for benchmarks")
	demo.Now = old
	if err != nil {
		b.Fatal(err)
	}
	s := New(Config{Store: st, SessionCleanup: -1, Now: func() time.Time { return testNow }})
	defer s.Close()
	hs := httptest.NewServer(s)
	defer hs.Close()
	jar, _ := cookiejar.New(nil)
	c := &http.Client{Jar: jar, CheckRedirect: func(*http.Request, []*http.Request) error { return http.ErrUseLastResponse }}
	pw := res.Password
	if pw == "" {
		pw = "demo password for benchmarks"
	}
	resp, err := c.PostForm(hs.URL+"/signin", url.Values{"email": {demo.Email}, "password": {pw}})
	if err != nil {
		b.Fatal(err)
	}
	resp.Body.Close()
	u, _ := url.Parse(hs.URL)
	var cookie string
	for _, ck := range jar.Cookies(u) {
		cookie = ck.Name + "=" + ck.Value
	}
	var clientID, planID int64
	var version int
	if err := st.Pool.QueryRow(ctx, `SELECT p.client_id, p.id, v.version FROM plans p
		JOIN plan_versions v ON v.plan_id = p.id AND v.status = 'published'
		ORDER BY length(v.result::text) DESC LIMIT 1`).Scan(&clientID, &planID, &version); err != nil {
		b.Fatal(err)
	}
	plan := fmt.Sprintf("/clients/%d/plans/%d", clientID, planID)
	draft := version
	if err := st.Pool.QueryRow(ctx, `SELECT version FROM plan_versions WHERE plan_id = $1 AND status = 'draft'`, planID).Scan(&draft); err != nil {
		resp, err := c.PostForm(hs.URL+plan+"/revise", url.Values{"from": {fmt.Sprint(version)}})
		if err != nil {
			b.Fatal(err)
		}
		resp.Body.Close()
		if err := st.Pool.QueryRow(ctx, `SELECT version FROM plan_versions WHERE plan_id = $1 AND status = 'draft'`, planID).Scan(&draft); err != nil {
			b.Fatal(err)
		}
	}
	resp, err = c.PostForm(hs.URL+fmt.Sprintf("/clients/%d/links", clientID), url.Values{"label": {"Benchmark"}, "expires_days": {"30"}})
	if err != nil {
		b.Fatal(err)
	}
	body, _ := io.ReadAll(resp.Body)
	resp.Body.Close()
	m := linkRe.FindStringSubmatch(string(body))
	if m == nil {
		b.Fatal("making a client link showed no link")
	}
	for _, pg := range []struct{ name, path string }{
		{"phone", "/c/" + m[1]},
		{"client", fmt.Sprintf("/clients/%d", clientID)},
		{"published", fmt.Sprintf("%s/versions/%d", plan, version)},
		{"draft", fmt.Sprintf("%s/versions/%d", plan, draft)},
	} {
		b.Run(pg.name, func(b *testing.B) {
			for b.Loop() {
				req := httptest.NewRequest(http.MethodGet, pg.path, nil)
				if !strings.HasPrefix(pg.path, "/c/") {
					req.Header.Set("Cookie", cookie)
				}
				w := httptest.NewRecorder()
				s.ServeHTTP(w, req)
				if w.Code != http.StatusOK {
					b.Fatalf("%s: %d", pg.path, w.Code)
				}
			}
		})
	}
}

package server

import (
	"bytes"
	"log/slog"
	"net/http"
	"net/http/httptest"
	"strings"
	"sync"
	"testing"
	"time"

	"larder/internal/store"
	"larder/internal/testdb"
)

// lockedBuffer collects log output written from the server's goroutines.
type lockedBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (l *lockedBuffer) Write(p []byte) (int, error) {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.Write(p)
}

func (l *lockedBuffer) String() string {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.String()
}

// newLoggedApp is newApp with the server's log captured.
func newLoggedApp(t *testing.T) (*app, *lockedBuffer) {
	t.Helper()
	var logs lockedBuffer
	st := store.New(testdb.Pool(t))
	s := New(Config{Store: st, SessionCleanup: -1, Now: func() time.Time { return testNow },
		Logger: slog.New(slog.NewTextHandler(&logs, &slog.HandlerOptions{Level: slog.LevelDebug}))})
	hs := httptest.NewServer(s)
	t.Cleanup(func() { hs.Close(); s.Close() })
	return &app{t: t, st: st, srv: hs}, &logs
}

// Whoever reads the request log must not find a key to a client's plan in
// it, nor what staff searched for.
func TestRequestLogCarriesNoLinkToken(t *testing.T) {
	a, logs := newLoggedApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Ada Logcheck"))
	token := makeLink(t, b, c.ID, "phone")
	for _, path := range []string{"/c/" + token, "/c/" + token + "/plan.ics", "/c/" + token + "/no-such-page", "/c/" + token + "?token=" + token} {
		res, _ := getPublic(t, a, path)
		if res.StatusCode == http.StatusInternalServerError {
			t.Fatalf("%s: status %d", path, res.StatusCode)
		}
	}
	b.get("/clients?q=Ada+Logcheck")
	out := logs.String()
	if !strings.Contains(out, "path=/c/"+redacted+"/plan.ics") {
		t.Fatalf("the calendar request is not in the log with its token redacted:\n%s", out)
	}
	if strings.Contains(out, token) || strings.Contains(out, token[:20]) {
		t.Fatalf("the link token is in the log:\n%s", out)
	}
	if strings.Contains(out, "Logcheck") {
		t.Fatalf("a client search term is in the log:\n%s", out)
	}
	if !strings.Contains(out, "query_keys=q") {
		t.Fatalf("the search request's query keys are not logged:\n%s", out)
	}
}

func TestLogPath(t *testing.T) {
	tok := strings.Repeat("Ab3_-", 9)[:43]
	cases := map[string]string{
		"/clients/12/plans/3":        "/clients/12/plans/3",
		"/c/" + tok:                  "/c/" + redacted,
		"/c/" + tok + "/plan.ics":    "/c/" + redacted + "/plan.ics",
		"/x/" + tok + "/y":           "/x/" + redacted + "/y", // no route matched
		"/static/larder.css":         "/static/larder.css",
		"/reset/" + tok[:32] + "/go": "/reset/" + redacted + "/go",
	}
	for path, want := range cases {
		r := httptest.NewRequest(http.MethodGet, path, nil)
		if got := logPath(r); got != want {
			t.Errorf("logPath(%s) = %s, want %s", path, got, want)
		}
	}
	r := httptest.NewRequest(http.MethodGet, "/clients?q=Ada&token=abc&next=%2Fx", nil)
	if got := logQuery(r); got != "next,q,token" {
		t.Errorf("logQuery = %q, want only the keys", got)
	}
}

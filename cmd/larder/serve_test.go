package main

import (
	"bytes"
	"context"
	"io"
	"net/http"
	"os"
	"regexp"
	"strings"
	"sync"
	"testing"
	"time"

	"larder/internal/testdb"
)

func TestMain(m *testing.M) { os.Exit(testdb.Main(m)) }

// syncBuffer is a bytes.Buffer safe to read while the server writes to it.
type syncBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (s *syncBuffer) Write(p []byte) (int, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.Write(p)
}
func (s *syncBuffer) String() string { s.mu.Lock(); defer s.mu.Unlock(); return s.b.String() }

func TestCommandsAgainstDatabaseURL(t *testing.T) {
	t.Setenv("DATABASE_URL", testdb.DSN(t))
	ctx := context.Background()
	var out, errs bytes.Buffer

	if code := runMigrate(ctx, nil, &out, &errs); code != 0 || !strings.Contains(out.String(), "Migrations applied: 0.") {
		t.Fatalf("migrate: code %d, out %q, err %q", code, out.String(), errs.String())
	}

	out.Reset()
	if code := runUser(ctx, []string{"add", "--admin", "--email", "cli-admin@example.org", "--name", "Cli Admin"}, &out, &errs); code != 0 {
		t.Fatalf("user add: code %d, %s", code, errs.String())
	}
	if !regexp.MustCompile(`Added Cli Admin <cli-admin@example.org> as admin.\nPassword: \S{16}\n`).MatchString(out.String()) {
		t.Fatalf("user add printed %q", out.String())
	}
	errs.Reset()
	if code := runUser(ctx, []string{"add", "--email", "CLI-ADMIN@example.org", "--name", "Twin"}, io.Discard, &errs); code != 1 ||
		!strings.Contains(errs.String(), "someone already signs in as CLI-ADMIN@example.org") {
		t.Fatalf("duplicate user add: code %d, %q", code, errs.String())
	}
	errs.Reset()
	if code := runUser(ctx, []string{"add", "--email", "nope", "--password", "short"}, io.Discard, &errs); code != 2 ||
		!strings.Contains(errs.String(), "--email must be an email address") || !strings.Contains(errs.String(), "--name is required") ||
		!strings.Contains(errs.String(), "the password must be 10 to 200 characters long") {
		t.Fatalf("bad user add: code %d, %q", code, errs.String())
	}

	out.Reset()
	if code := runDemo(ctx, []string{"--password", "cli demo password"}, &out, &errs); code != 0 ||
		!strings.Contains(out.String(), "demo@example.org / password: cli demo password") {
		t.Fatalf("demo: code %d, %q %q", code, out.String(), errs.String())
	}
	out.Reset()
	if code := runDemo(ctx, nil, &out, &errs); code != 0 || !strings.Contains(out.String(), "demo@example.org (password unchanged; run with --password to set a new one)") {
		t.Fatalf("second demo: code %d, %q", code, out.String())
	}
}

func TestServeAnswersAndShutsDown(t *testing.T) {
	t.Setenv("DATABASE_URL", testdb.DSN(t))
	ctx, cancel := context.WithCancel(context.Background())
	t.Setenv("LARDER_DB_MAX_CONNS", "5") // the flag below wins over it
	out, logs := &syncBuffer{}, &syncBuffer{}
	done := make(chan int, 1)
	go func() { done <- runServe(ctx, []string{"--addr", "127.0.0.1:0", "--db-max-conns", "3"}, out, logs) }()

	addr := regexp.MustCompile(`serving on (http://\S+)/`)
	var base string
	for i := 0; i < 200 && base == ""; i++ {
		if m := addr.FindStringSubmatch(out.String()); m != nil {
			base = m[1]
		}
		time.Sleep(50 * time.Millisecond)
	}
	if base == "" {
		cancel()
		t.Fatalf("server did not start: %q", out.String())
	}
	res, err := http.Get(base + "/healthz")
	if err != nil {
		t.Fatal(err)
	}
	body, _ := io.ReadAll(res.Body)
	res.Body.Close()
	if res.StatusCode != http.StatusOK || !strings.Contains(string(body), `"status":"ok"`) {
		t.Fatalf("healthz: %d %s", res.StatusCode, body)
	}
	if !strings.Contains(logs.String(), "max_conns=3") {
		t.Errorf("--db-max-conns 3 not in effect; log: %s", logs.String())
	}
	cancel() // what SIGINT/SIGTERM do through main's context
	select {
	case code := <-done:
		if code != 0 {
			t.Fatalf("serve exited with %d", code)
		}
	case <-time.After(20 * time.Second):
		t.Fatal("serve did not shut down")
	}
}

func TestServeRejectsBadFlags(t *testing.T) {
	var errs bytes.Buffer
	if code := runServe(context.Background(), []string{"--no-such-flag"}, io.Discard, &errs); code != 2 {
		t.Fatalf("code %d", code)
	}
	errs.Reset()
	if code := runServe(context.Background(), []string{"--db-max-conns", "0"}, io.Discard, &errs); code != 2 ||
		!strings.Contains(errs.String(), "--db-max-conns must be a whole number from 1 to 10000") {
		t.Fatalf("--db-max-conns 0: code %d, %q", code, errs.String())
	}
}

func TestDBMaxConnsFromEnvironment(t *testing.T) {
	t.Setenv("LARDER_DB_MAX_CONNS", "7")
	if got := envInt("LARDER_DB_MAX_CONNS", 4); got != 7 {
		t.Errorf("LARDER_DB_MAX_CONNS=7 read as %d", got)
	}
	t.Setenv("LARDER_DB_MAX_CONNS", "many")
	if got := envInt("LARDER_DB_MAX_CONNS", 4); got != 4 {
		t.Errorf("LARDER_DB_MAX_CONNS=many read as %d, want the default 4", got)
	}
}

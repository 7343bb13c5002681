package server

import (
	"context"
	"errors"
	"fmt"
	"io"
	"net"
	"net/http"
	"net/http/httptest"
	"net/url"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgconn"
	"github.com/jackc/pgx/v5/pgxpool"

	"larder/internal/store"
	"larder/internal/testdb"
)

// faultProxy stands between the app and PostgreSQL on loopback so a test can
// do to the database's network what an operator sees go wrong: cut it (every
// connection closed, new ones refused), stall it (connections stay open but
// no byte goes through, as with a hung server or a dropped route), and
// restore it.
type faultProxy struct {
	ln                net.Listener
	network, upstream string

	mu      sync.Mutex
	changed *sync.Cond // signalled when mode or closed changes
	mode    proxyMode
	closed  bool
	conns   map[net.Conn]struct{}
	wg      sync.WaitGroup
}

type proxyMode int

const (
	proxyOpen proxyMode = iota
	proxyCut
	proxyStalled
)

// startFaultProxy listens on a free loopback port and forwards to the
// database of dsn (its Unix socket or TCP address).
func startFaultProxy(t *testing.T, dsn string) (p *faultProxy, proxiedDSN string) {
	t.Helper()
	cfg, err := pgconn.ParseConfig(dsn)
	if err != nil {
		t.Fatal(err)
	}
	p = &faultProxy{network: "tcp", upstream: net.JoinHostPort(cfg.Host, fmt.Sprint(cfg.Port)), conns: map[net.Conn]struct{}{}}
	if strings.HasPrefix(cfg.Host, "/") {
		p.network, p.upstream = "unix", fmt.Sprintf("%s/.s.PGSQL.%d", cfg.Host, cfg.Port)
	}
	p.changed = sync.NewCond(&p.mu)
	if p.ln, err = net.Listen("tcp", "127.0.0.1:0"); err != nil {
		t.Fatal(err)
	}
	p.wg.Add(1)
	go p.accept()
	u := url.URL{Scheme: "postgres", Host: p.ln.Addr().String(), Path: "/" + cfg.Database, RawQuery: "sslmode=disable"}
	u.User = url.User(cfg.User)
	if cfg.Password != "" {
		u.User = url.UserPassword(cfg.User, cfg.Password)
	}
	return p, u.String()
}

func (p *faultProxy) accept() {
	defer p.wg.Done()
	for {
		c, err := p.ln.Accept()
		if err != nil {
			return // listener closed
		}
		p.mu.Lock()
		refuse := p.mode == proxyCut || p.closed
		p.mu.Unlock()
		if refuse {
			c.Close()
			continue
		}
		up, err := net.DialTimeout(p.network, p.upstream, 2*time.Second)
		if err != nil {
			c.Close()
			continue
		}
		p.mu.Lock()
		if p.closed {
			p.mu.Unlock()
			c.Close()
			up.Close()
			continue
		}
		p.conns[c], p.conns[up] = struct{}{}, struct{}{}
		p.wg.Add(2)
		p.mu.Unlock()
		go p.pipe(up, c)
		go p.pipe(c, up)
	}
}

// pipe copies src to dst, holding each chunk while the proxy is stalled and
// ending both connections when either side closes or the proxy is cut.
func (p *faultProxy) pipe(dst, src net.Conn) {
	defer p.wg.Done()
	defer func() {
		dst.Close()
		src.Close()
		p.mu.Lock()
		delete(p.conns, dst)
		delete(p.conns, src)
		p.mu.Unlock()
	}()
	buf := make([]byte, 32<<10)
	for {
		n, err := src.Read(buf)
		if n > 0 {
			if !p.waitOpen() {
				return
			}
			if _, err := dst.Write(buf[:n]); err != nil {
				return
			}
		}
		if err != nil {
			return
		}
	}
}

// waitOpen blocks while the proxy is stalled; false means the connection
// must end (cut, or the test is over).
func (p *faultProxy) waitOpen() bool {
	p.mu.Lock()
	defer p.mu.Unlock()
	for p.mode == proxyStalled && !p.closed {
		p.changed.Wait()
	}
	return p.mode == proxyOpen && !p.closed
}

func (p *faultProxy) set(m proxyMode) {
	p.mu.Lock()
	p.mode = m
	if m == proxyCut {
		for c := range p.conns {
			c.Close() // unblocks the pipes' reads and writes
		}
	}
	p.changed.Broadcast()
	p.mu.Unlock()
}

func (p *faultProxy) cut()     { p.set(proxyCut) }
func (p *faultProxy) stall()   { p.set(proxyStalled) }
func (p *faultProxy) restore() { p.set(proxyOpen) }

// close ends everything and waits (at most a few seconds) for the proxy's
// goroutines; closing a net.Conn unblocks its pending Read and Write.
func (p *faultProxy) close(t *testing.T) {
	p.ln.Close()
	p.mu.Lock()
	p.closed = true
	for c := range p.conns {
		c.Close()
	}
	p.changed.Broadcast()
	p.mu.Unlock()
	done := make(chan struct{})
	go func() { p.wg.Wait(); close(done) }()
	select {
	case <-done:
	case <-time.After(5 * time.Second):
		t.Error("the proxy's goroutines did not end")
	}
}

// The request time limit and the pool's connect timeout of the fault test:
// short, so that a hung database is answered within a couple of seconds.
const (
	faultRequestTimeout = time.Second
	faultConnectTimeout = 500 * time.Millisecond
	// faultAnswerWithin is how soon a 503 must come; well above the limits
	// (a loaded CI machine), well below the client's own timeout.
	faultAnswerWithin = 4 * time.Second
)

// TestDatabaseFaultsThroughProxy runs the app on a database reached through
// faultProxy: while the database is cut or stalled, staff pages, the API and
// client links answer a 503 with Retry-After (not a 500, not a hang); after it
// is restored, pages answer 200 again without a restart; and a write cut in
// the middle leaves no row behind.
func TestDatabaseFaultsThroughProxy(t *testing.T) {
	// However the database misbehaves, this test ends: every request below
	// has a client timeout, and this watchdog stops the whole binary with
	// all stacks if something still blocks.
	watchdog := time.AfterFunc(90*time.Second, func() { panic("TestDatabaseFaultsThroughProxy hung") })
	t.Cleanup(func() { watchdog.Stop() }) // cleanups run last-registered first: this one after all others

	direct := store.New(testdb.Pool(t)) // for setup and checks, not through the proxy
	proxy, proxied := startFaultProxy(t, testdb.DSN(t))
	ctx, cancel := context.WithTimeout(context.Background(), 60*time.Second)
	defer cancel()
	pool, err := store.OpenPool(ctx, proxied, store.PoolOptions{
		MaxConns: 4, ConnectTimeout: faultConnectTimeout,
		StatementTimeout: 2 * time.Second, LockTimeout: time.Second, IdleInTxTimeout: 5 * time.Second,
	})
	if err != nil {
		t.Fatal(err)
	}
	st := store.New(pool)
	s := New(Config{Store: st, SessionCleanup: -1, Now: func() time.Time { return testNow }, RequestTimeout: faultRequestTimeout})
	hs := httptest.NewServer(s)
	t.Cleanup(func() {
		hs.CloseClientConnections()
		hs.Close()
		s.Close()
		proxy.close(t) // before the pool, so no connection of it can block
		closed := make(chan struct{})
		go func() { pool.Close(); close(closed) }()
		select {
		case <-closed:
		case <-time.After(5 * time.Second):
			t.Error("the pool did not close")
		}
	})

	a := &app{t: t, st: direct, srv: hs}
	b, _ := a.signedIn(store.RoleDietitian)
	b.c.Timeout = 10 * time.Second
	api := func() (response, http.Header) {
		t.Helper()
		req, _ := http.NewRequest(http.MethodPost, hs.URL+"/api/v1/compute", strings.NewReader(`{}`))
		req.Header.Set("Content-Type", "application/json")
		resp, err := b.c.Do(req)
		if err != nil {
			t.Fatalf("API: %v", err)
		}
		defer resp.Body.Close()
		body, _ := io.ReadAll(resp.Body)
		return response{status: resp.StatusCode, body: string(body)}, resp.Header
	}
	linkToken := strings.Repeat("A", 43) // no such link: the lookup needs the database all the same
	anon := a.browser()
	anon.c.Timeout = 10 * time.Second

	// unavailable checks one fault: a staff page, the API, a client link and
	// a form post each answer 503 in time, and the form saved nothing.
	unavailable := func(fault string) {
		t.Helper()
		start := time.Now()
		page := b.get("/clients")
		if page.status != http.StatusServiceUnavailable || !strings.Contains(page.body, "Try again shortly") || !strings.Contains(page.body, "<main>") {
			t.Errorf("%s: GET /clients: %d\n%q", fault, page.status, page.body)
		}
		if d := time.Since(start); d > faultAnswerWithin {
			t.Errorf("%s: the staff page took %v", fault, d)
		}
		start = time.Now()
		res, h := api()
		if res.status != http.StatusServiceUnavailable || !strings.Contains(res.body, `"error"`) ||
			!strings.HasPrefix(h.Get("Content-Type"), "application/json") || h.Get("Retry-After") != "30" {
			t.Errorf("%s: POST /api/v1/compute: %d %v\n%s", fault, res.status, h, res.body)
		}
		if d := time.Since(start); d > faultAnswerWithin {
			t.Errorf("%s: the API took %v", fault, d)
		}
		start = time.Now()
		link := anon.get("/c/" + linkToken)
		if link.status != http.StatusServiceUnavailable || !strings.Contains(link.body, "your link still works") {
			t.Errorf("%s: client link: %d\n%s", fault, link.status, link.body)
		}
		if d := time.Since(start); d > faultAnswerWithin {
			t.Errorf("%s: the client link took %v", fault, d)
		}
		name := unique("Unsaved Client")
		start = time.Now()
		if res := b.post("/clients", url.Values{"name": {name}, "sex": {"female"}}); res.status != http.StatusServiceUnavailable {
			t.Errorf("%s: POST /clients: %d\n%s", fault, res.status, res.body)
		}
		if d := time.Since(start); d > faultAnswerWithin {
			t.Errorf("%s: the form post took %v", fault, d)
		}
		if n := a.count(`SELECT count(*) FROM clients WHERE name = $1`, name); n != 0 {
			t.Errorf("%s: the refused form saved %d clients", fault, n)
		}
	}
	recovered := func(after string) {
		t.Helper()
		if res := b.get("/clients"); res.status != http.StatusOK {
			t.Fatalf("after %s: GET /clients: %d\n%s", after, res.status, res.body)
		}
		if res, _ := api(); res.status != http.StatusUnprocessableEntity { // {} is not a complete request
			t.Errorf("after %s: API: %d\n%s", after, res.status, res.body)
		}
		if res := anon.get("/c/" + linkToken); res.status != http.StatusNotFound {
			t.Errorf("after %s: unknown client link: %d", after, res.status)
		}
		name := unique("Saved Client")
		b.post("/clients", url.Values{"name": {name}, "sex": {"female"}}).mustRedirect(t, "/clients/")
		if n := a.count(`SELECT count(*) FROM clients WHERE name = $1`, name); n != 1 {
			t.Errorf("after %s: the form saved %d clients", after, n)
		}
	}

	recovered("start")

	// Every pooled connection busy elsewhere: no request gets one in time.
	var held []*pgxpool.Conn
	for range pool.Config().MaxConns {
		c, err := pool.Acquire(ctx)
		if err != nil {
			t.Fatal(err)
		}
		held = append(held, c)
	}
	start := time.Now()
	if res := b.get("/clients"); res.status != http.StatusServiceUnavailable || !strings.Contains(res.body, "Try again shortly") {
		t.Errorf("pool exhausted: GET /clients: %d\n%s", res.status, res.body)
	}
	if d := time.Since(start); d > faultAnswerWithin {
		t.Errorf("pool exhausted: the page took %v", d)
	}
	for _, c := range held {
		c.Release()
	}
	recovered("the pool was exhausted")

	proxy.cut()
	unavailable("cut")
	proxy.restore()
	recovered("a cut")

	proxy.stall()
	unavailable("stall")
	proxy.restore()
	recovered("a stall")

	// A write cut between its two statements: the client row went in, the
	// audit row did not. The transaction never commits, so neither stays.
	name := unique("Half Written")
	err = st.InTx(ctx, func(tx pgx.Tx) error {
		var id int64
		if err := tx.QueryRow(ctx, `INSERT INTO clients (name, sex) VALUES ($1, 'male') RETURNING id`, name).Scan(&id); err != nil {
			return err
		}
		proxy.cut()
		return store.AuditTx(ctx, tx, store.System, "create", "client", id, nil)
	})
	if err == nil || !dbUnavailable(err) {
		t.Fatalf("a write cut mid-way returned %v, want a database fault", err)
	}
	proxy.restore()
	if n := a.count(`SELECT count(*) FROM clients WHERE name = $1`, name); n != 0 {
		t.Errorf("a write cut mid-way left %d client rows", n)
	}
	recovered("a write cut mid-way")
}

// TestDatabaseFaultsAreNotBugs checks the line between the two: errors a
// passing fault gives are 503s, errors of a wrong query or of Larder itself
// stay 500s.
func TestDatabaseFaultsAreNotBugs(t *testing.T) {
	ctx := context.Background()
	pool := testdb.Pool(t)
	_, syntax := pool.Exec(ctx, `SELEC 1`)
	_, missing := pool.Exec(ctx, `SELECT no_such_column FROM clients`)
	_, divZero := pool.Exec(ctx, `SELECT 1/0`)
	for _, err := range []error{syntax, missing, divZero, errors.New("a bug"), store.ErrNotFound, pgx.ErrNoRows} {
		if err == nil {
			t.Fatal("a wrong query succeeded")
		}
		if dbUnavailable(err) {
			t.Errorf("%v counted as the database being unavailable", err)
		}
	}
	shortCtx, cancel := context.WithTimeout(ctx, 50*time.Millisecond)
	defer cancel()
	_, slow := pool.Exec(shortCtx, `SELECT pg_sleep(2)`)
	_, refused := pgx.Connect(ctx, "postgres://nobody@127.0.0.1:1/none?connect_timeout=2")
	for _, err := range []error{slow, refused, &pgconn.PgError{Code: "57014"}, &pgconn.PgError{Code: "08006"}, &pgconn.PgError{Code: "53300"}} {
		if !dbUnavailable(err) {
			t.Errorf("%v not counted as the database being unavailable", err)
		}
	}

	// The answers: a bug is a 500 page (JSON on the API), a fault a 503.
	s := New(Config{Store: store.New(pool), SessionCleanup: -1})
	defer s.Close()
	for _, c := range []struct {
		path, want string
		err        error
		status     int
	}{
		{"/clients", "Something went wrong", errors.New("a bug"), http.StatusInternalServerError},
		{"/api/v1/compute", `"error"`, errors.New("a bug"), http.StatusInternalServerError},
		{"/clients", "Try again shortly", slow, http.StatusServiceUnavailable},
		{"/api/v1/compute", `"error"`, refused, http.StatusServiceUnavailable},
	} {
		rec := httptest.NewRecorder()
		req := httptest.NewRequest(http.MethodGet, c.path, nil)
		s.Sessions.LoadAndSave(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) { s.ServerError(w, r, c.err) })).ServeHTTP(rec, req)
		if rec.Code != c.status || !strings.Contains(rec.Body.String(), c.want) {
			t.Errorf("%s with %v: %d\n%s", c.path, c.err, rec.Code, rec.Body.String())
		}
		if (c.status == http.StatusServiceUnavailable) != (rec.Header().Get("Retry-After") != "") {
			t.Errorf("%s with %v: Retry-After %q", c.path, c.err, rec.Header().Get("Retry-After"))
		}
	}
}

// unreachableServer serves the app on a pool whose database address refuses
// every connection, and returns its URL.
func unreachableServer(t *testing.T) string {
	t.Helper()
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	addr := ln.Addr().String()
	ln.Close() // nothing listens there now: connections are refused at once
	pool, err := store.OpenPool(context.Background(), "postgres://nobody@"+addr+"/none?sslmode=disable", store.PoolOptions{MaxConns: 2, ConnectTimeout: 2 * time.Second})
	if err != nil {
		t.Fatal(err)
	}
	s := New(Config{Store: store.New(pool), SessionCleanup: -1, RequestTimeout: 3 * time.Second})
	hs := httptest.NewServer(s)
	t.Cleanup(func() { hs.Close(); s.Close(); pool.Close() })
	return hs.URL
}

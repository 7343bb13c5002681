package server

import (
	"context"
	"net/http"
	"net/http/httptest"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgxpool"

	"larder/internal/store"
	"larder/internal/testdb"
)

// tripCounter counts the database round trips a request makes: each query
// or statement sent alone is one, a pgx batch (pipeline) is one.
type tripCounter struct {
	mu  sync.Mutex
	sql []string
}

func (c *tripCounter) TraceQueryStart(ctx context.Context, _ *pgx.Conn, d pgx.TraceQueryStartData) context.Context {
	if _, inBatch := ctx.Value(batchKey{}).(bool); !inBatch {
		c.add(d.SQL)
	}
	return ctx
}
func (c *tripCounter) TraceQueryEnd(context.Context, *pgx.Conn, pgx.TraceQueryEndData) {}

type batchKey struct{}

func (c *tripCounter) TraceBatchStart(ctx context.Context, _ *pgx.Conn, d pgx.TraceBatchStartData) context.Context {
	var parts []string
	for _, q := range d.Batch.QueuedQueries {
		parts = append(parts, q.SQL)
	}
	c.add("BATCH[" + strings.Join(parts, " ; ") + "]")
	return context.WithValue(ctx, batchKey{}, true)
}
func (c *tripCounter) TraceBatchQuery(context.Context, *pgx.Conn, pgx.TraceBatchQueryData) {}
func (c *tripCounter) TraceBatchEnd(context.Context, *pgx.Conn, pgx.TraceBatchEndData)     {}

func (c *tripCounter) add(sql string) {
	c.mu.Lock()
	defer c.mu.Unlock()
	c.sql = append(c.sql, strings.Join(strings.Fields(sql), " "))
}

// take returns what was counted since the last take and starts again.
func (c *tripCounter) take() []string {
	c.mu.Lock()
	defer c.mu.Unlock()
	s := c.sql
	c.sql = nil
	return s
}

// countingApp is newApp on a pool of its own whose round trips are counted.
func countingApp(t *testing.T) (*app, *tripCounter) {
	t.Helper()
	cfg, err := pgxpool.ParseConfig(testdb.DSN(t))
	if err != nil {
		t.Fatal(err)
	}
	tc := &tripCounter{}
	cfg.ConnConfig.Tracer = tc
	pool, err := pgxpool.NewWithConfig(context.Background(), cfg)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(pool.Close)
	st := store.New(pool)
	s := New(Config{Store: st, SessionCleanup: -1, Now: func() time.Time { return testNow }})
	hs := httptest.NewServer(s)
	t.Cleanup(func() { hs.Close(); s.Close() })
	return &app{t: t, st: st, srv: hs}, tc
}

// The staff pages a dietitian opens most, and the athlete's phone page,
// make a bounded number of database round trips once warm (the statement
// cache filled, the published version decoded once). A staff page needs
// three: the session with its user (and the practice name), the page's
// reads in one batch, and the row recording the read. The bounds are what the
// pages need, so a new per-request query shows up here first.
func TestRoundTripsPerPage(t *testing.T) {
	a, tc := countingApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Rhea Roundtrip"))
	p, _ := storePlan(t, a, c.ID, "Counted week", weekRequest("2027-03-01", 3), true, "")
	token := makeLink(t, b, c.ID, "")
	if res := b.post("/clients/"+itoa(c.ID)+"/plans/"+itoa(p.ID)+"/revise", map[string][]string{"from": {"1"}}); res.status != http.StatusSeeOther {
		t.Fatalf("revise: %d\n%s", res.status, res.body)
	}
	plan := "/clients/" + itoa(c.ID) + "/plans/" + itoa(p.ID)
	for _, pg := range []struct {
		name, path string
		staff      bool
		max        int
	}{
		{"client page", "/clients/" + itoa(c.ID), true, 3},
		{"published plan page", plan + "/versions/1", true, 3},
		{"draft plan page", plan + "/versions/2", true, 3},
		{"phone page", "/c/" + token, false, 1},
	} {
		get := func() int {
			if pg.staff {
				return b.get(pg.path).status
			}
			res, _ := getPublic(t, a, pg.path)
			return res.StatusCode
		}
		for range 2 { // warm: statements prepared, caches filled
			if st := get(); st != http.StatusOK {
				t.Fatalf("%s: status %d", pg.name, st)
			}
		}
		tc.take()
		get()
		trips := tc.take()
		t.Logf("%s: %d round trips\n  %s", pg.name, len(trips), strings.Join(trips, "\n  "))
		if len(trips) > pg.max {
			t.Errorf("%s: %d round trips, want at most %d", pg.name, len(trips), pg.max)
		}
	}
}

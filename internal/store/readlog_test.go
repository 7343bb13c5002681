package store_test

import (
	"context"
	"fmt"
	"sync"
	"testing"
	"time"

	"github.com/jackc/pgx/v5/pgxpool"

	"larder/internal/store"
	"larder/internal/testdb"
)

// Reads recorded at once by many requests are all written, each request
// returning only once its own row is in; the commit without a WAL flush is
// that statement's alone: the connection it ran on is back to the server's
// synchronous_commit for whatever runs next.
func TestAuditReadGroupCommit(t *testing.T) {
	ctx := context.Background()
	cfg, err := pgxpool.ParseConfig(testdb.DSN(t))
	if err != nil {
		t.Fatal(err)
	}
	cfg.MaxConns = 1 // every statement on the one connection the reads used
	// The test database may run without flushes; this connection does.
	cfg.ConnConfig.RuntimeParams["synchronous_commit"] = "on"
	pool, err := pgxpool.NewWithConfig(ctx, cfg)
	if err != nil {
		t.Fatal(err)
	}
	defer pool.Close()
	st := store.New(pool)
	clientID := 900000000 + time.Now().UnixNano()%100000000
	const n = 60
	var wg sync.WaitGroup
	errs := make(chan error, n)
	for i := range n {
		wg.Add(1)
		go func() {
			defer wg.Done()
			path := fmt.Sprintf("/clients/%d/read-%d", clientID, i)
			if err := st.AuditRead(ctx, store.System, store.ReadRecord{Kind: store.ReadClient, ClientID: clientID, Path: path}); err != nil {
				errs <- err
				return
			}
			// Returned: the row is committed and seen by anyone.
			var seen int
			if err := testdb.Pool(t).QueryRow(ctx, `SELECT count(*) FROM audit_log WHERE action = 'view' AND detail->>'path' = $1`, path).Scan(&seen); err != nil {
				errs <- err
				return
			}
			if seen != 1 {
				errs <- fmt.Errorf("read %d: %d rows once AuditRead returned, want 1", i, seen)
			}
		}()
	}
	wg.Wait()
	close(errs)
	for err := range errs {
		t.Error(err)
	}
	var rows int
	if err := pool.QueryRow(ctx, `SELECT count(*) FROM audit_log WHERE action = 'view' AND entity = 'client'
		AND entity_id = $1 AND (detail->>'client_id')::bigint = $1`, clientID).Scan(&rows); err != nil {
		t.Fatal(err)
	}
	if rows != n {
		t.Errorf("%d read rows, want %d", rows, n)
	}
	var after string
	if err := pool.QueryRow(ctx, `SELECT current_setting('synchronous_commit')`).Scan(&after); err != nil {
		t.Fatal(err)
	}
	if after != "on" {
		t.Errorf("synchronous_commit on the pool's connection is %q after the reads, want on", after)
	}
}

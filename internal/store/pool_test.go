package store_test

import (
	"context"
	"errors"
	"runtime"
	"testing"
	"time"

	"github.com/jackc/pgx/v5/pgconn"

	"larder/internal/store"
	"larder/internal/testdb"
)

func TestOpenPoolSetsLimitsOnEveryConnection(t *testing.T) {
	ctx, cancel := context.WithTimeout(context.Background(), 20*time.Second)
	defer cancel()
	pool, err := store.OpenPool(ctx, testdb.DSN(t), store.PoolOptions{
		MaxConns: 3, StatementTimeout: 300 * time.Millisecond, LockTimeout: 200 * time.Millisecond, IdleInTxTimeout: 2 * time.Second,
	})
	if err != nil {
		t.Fatal(err)
	}
	defer pool.Close()
	if got := pool.Config().MaxConns; got != 3 {
		t.Errorf("MaxConns = %d, want 3", got)
	}
	for name, want := range map[string]string{"statement_timeout": "300ms", "lock_timeout": "200ms", "idle_in_transaction_session_timeout": "2s"} {
		var got string
		if err := pool.QueryRow(ctx, "SELECT current_setting($1)", name).Scan(&got); err != nil {
			t.Fatal(err)
		}
		if got != want {
			t.Errorf("%s = %q, want %q", name, got, want)
		}
	}
	// The server itself ends a statement that runs past the limit.
	start := time.Now()
	_, err = pool.Exec(ctx, "SELECT pg_sleep(5)")
	var pe *pgconn.PgError
	if !errors.As(err, &pe) || pe.Code != "57014" {
		t.Fatalf("pg_sleep(5) under a 300 ms statement_timeout: %v", err)
	}
	if d := time.Since(start); d > 3*time.Second {
		t.Errorf("the statement ran %v", d)
	}
}

func TestOpenPoolKeepsTheDSNsOwnSettings(t *testing.T) {
	ctx, cancel := context.WithTimeout(context.Background(), 20*time.Second)
	defer cancel()
	pool, err := store.OpenPool(ctx, testdb.DSN(t)+"&statement_timeout=4000", store.ServeLimits(0))
	if err != nil {
		t.Fatal(err)
	}
	defer pool.Close()
	var got string
	if err := pool.QueryRow(ctx, "SHOW statement_timeout").Scan(&got); err != nil {
		t.Fatal(err)
	}
	if got != "4s" {
		t.Errorf("statement_timeout = %q, want the DSN's 4s", got)
	}
	if want := int32(max(4, 4*runtime.NumCPU())); pool.Config().MaxConns != want || store.DefaultMaxConns() != want {
		t.Errorf("MaxConns = %d, DefaultMaxConns %d, want %d", pool.Config().MaxConns, store.DefaultMaxConns(), want)
	}
}

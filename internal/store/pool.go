package store

import (
	"context"
	"runtime"
	"strconv"
	"time"

	"github.com/jackc/pgx/v5/pgxpool"
)

// PoolOptions sizes the connection pool and bounds how long the database may
// keep a request waiting. A zero duration leaves that limit to the server's
// own setting (none, by PostgreSQL's defaults), as migrations need: one may
// rewrite a large table for longer than any page should wait.
type PoolOptions struct {
	// MaxConns is the most connections open at once; 0 means DefaultMaxConns.
	MaxConns int32
	// ConnectTimeout bounds opening one connection (a host that does not
	// answer); a connect_timeout in the DSN wins.
	ConnectTimeout time.Duration
	// StatementTimeout, LockTimeout and IdleInTxTimeout are PostgreSQL's
	// statement_timeout, lock_timeout and idle_in_transaction_session_timeout,
	// sent as run-time parameters when each connection opens. The server
	// then ends a runaway query, a wait for a row another transaction holds,
	// and a transaction left open by a client that went away, even when the
	// app cannot. A value the DSN sets itself wins.
	StatementTimeout time.Duration
	LockTimeout      time.Duration
	IdleInTxTimeout  time.Duration
}

// DefaultMaxConns is the pool size for this machine: four connections a CPU,
// and never fewer than four. Most of a request's database time is waiting on
// the network and the disk, not on this machine's CPUs, so a few connections
// a core keep the cores busy; far more would only queue inside PostgreSQL.
func DefaultMaxConns() int32 { return int32(max(4, 4*runtime.NumCPU())) }

// ServeLimits are the limits of the web server's pool: a page should answer
// within a few seconds, and one that waits on the database for longer is
// answered "try again" (see the server's request time limit) instead of
// holding a connection that others queue for.
func ServeLimits(maxConns int32) PoolOptions {
	return PoolOptions{
		MaxConns:         maxConns,
		ConnectTimeout:   5 * time.Second,
		StatementTimeout: 10 * time.Second,
		LockTimeout:      5 * time.Second,
		IdleInTxTimeout:  30 * time.Second,
	}
}

// OpenPool opens a pool on dsn with opt's limits. It does not wait for a
// connection; Ping to find out whether the database answers.
func OpenPool(ctx context.Context, dsn string, opt PoolOptions) (*pgxpool.Pool, error) {
	cfg, err := pgxpool.ParseConfig(dsn)
	if err != nil {
		return nil, err
	}
	cfg.MaxConns = opt.MaxConns
	if cfg.MaxConns <= 0 {
		cfg.MaxConns = DefaultMaxConns()
	}
	if cfg.ConnConfig.ConnectTimeout == 0 && opt.ConnectTimeout > 0 {
		cfg.ConnConfig.ConnectTimeout = opt.ConnectTimeout
	}
	setParam := func(name string, d time.Duration) {
		if d <= 0 {
			return
		}
		if _, set := cfg.ConnConfig.RuntimeParams[name]; set {
			return
		}
		cfg.ConnConfig.RuntimeParams[name] = strconv.FormatInt(d.Milliseconds(), 10)
	}
	setParam("statement_timeout", opt.StatementTimeout)
	setParam("lock_timeout", opt.LockTimeout)
	setParam("idle_in_transaction_session_timeout", opt.IdleInTxTimeout)
	return pgxpool.NewWithConfig(ctx, cfg)
}

package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"log/slog"
	"net"
	"net/http"
	"os"
	"strconv"
	"time"

	"github.com/jackc/pgx/v5/pgxpool"

	"larder/internal/demo"
	"larder/internal/server"
	"larder/internal/store"
)

// envOr returns the environment variable's value, or def when unset.
func envOr(name, def string) string {
	if v, ok := os.LookupEnv(name); ok && v != "" {
		return v
	}
	return def
}

// envBool reads a true/false environment variable (1, true, yes, on).
func envBool(name string) bool {
	v, err := strconv.ParseBool(os.Getenv(name))
	return err == nil && v
}

func newLogger(w io.Writer) *slog.Logger {
	return slog.New(slog.NewTextHandler(w, &slog.HandlerOptions{Level: slog.LevelInfo}))
}

// connect opens the database (DATABASE_URL or the private cluster), checks
// it answers and applies any migrations not yet applied. close releases the
// pool and stops the private cluster. opt's limits hold for the pool handed
// back; migrations run on a pool of their own without statement limits, since
// one may rewrite a large table for longer than a page may wait.
func connect(ctx context.Context, dataDir string, log *slog.Logger, opt store.PoolOptions) (st *store.Store, applied int, close func(), err error) {
	dsn, cleanup, err := openDatabase(ctx, dataDir, log)
	if err != nil {
		return nil, 0, nil, err
	}
	open := func(opt store.PoolOptions) (*pgxpool.Pool, error) {
		pool, err := store.OpenPool(ctx, dsn, opt)
		if err != nil {
			return nil, err
		}
		pingCtx, cancel := context.WithTimeout(ctx, 15*time.Second)
		defer cancel()
		if err := pool.Ping(pingCtx); err != nil {
			pool.Close()
			return nil, err
		}
		return pool, nil
	}
	migratePool, err := open(store.PoolOptions{MaxConns: 2})
	if err != nil {
		cleanup()
		return nil, 0, nil, fmt.Errorf("cannot reach the database: %w", err)
	}
	applied, err = store.Migrate(ctx, migratePool)
	migratePool.Close()
	if err != nil {
		cleanup()
		return nil, 0, nil, err
	}
	pool, err := open(opt)
	if err != nil {
		cleanup()
		return nil, 0, nil, fmt.Errorf("cannot reach the database: %w", err)
	}
	return store.New(pool), applied, func() { pool.Close(); cleanup() }, nil
}

// envInt reads a whole-number environment variable, or def when unset or
// not a number (the flag's own parsing then reports nothing: the default
// shown in --help is what applies).
func envInt(name string, def int) int {
	if v, err := strconv.Atoi(os.Getenv(name)); err == nil {
		return v
	}
	return def
}

func runServe(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("serve", flag.ContinueOnError)
	fs.SetOutput(stderr)
	addr := fs.String("addr", envOr("LARDER_ADDR", "127.0.0.1:8080"), "address to listen on, HOST:PORT (env LARDER_ADDR)")
	dataDir := fs.String("data-dir", defaultDataDir(), "folder of the private PostgreSQL cluster when DATABASE_URL is not set (env LARDER_DATA_DIR)")
	withDemo := fs.Bool("demo", envBool("LARDER_DEMO"), "load the demo practice before serving (env LARDER_DEMO)")
	password := fs.String("password", os.Getenv("LARDER_DEMO_PASSWORD"), "password of the demo login with --demo (env LARDER_DEMO_PASSWORD)")
	secure := fs.Bool("secure-cookies", envBool("LARDER_SECURE_COOKIES"), "mark the session cookie Secure; set when served over HTTPS (env LARDER_SECURE_COOKIES)")
	maxConns := fs.Int("db-max-conns", envInt("LARDER_DB_MAX_CONNS", int(store.DefaultMaxConns())), "most database connections open at once; the default is 4 a CPU, at least 4 (env LARDER_DB_MAX_CONNS)")
	if err := fs.Parse(args); err != nil {
		return 2
	}
	if *maxConns < 1 || *maxConns > 10000 {
		fmt.Fprintln(stderr, "larder: --db-max-conns must be a whole number from 1 to 10000")
		return 2
	}
	log := newLogger(stderr)

	st, applied, closeDB, err := connect(ctx, *dataDir, log, store.ServeLimits(int32(*maxConns)))
	if err != nil {
		fmt.Fprintln(stderr, "larder:", err)
		return 1
	}
	defer closeDB()
	log.Info("database ready", "migrations_applied", applied, "max_conns", st.Pool.Config().MaxConns)

	if *withDemo {
		login, err := demo.Load(ctx, st, *password)
		if err != nil {
			fmt.Fprintln(stderr, "larder: demo:", err)
			return 1
		}
		fmt.Fprintln(stdout, "Demo practice loaded. Sign in as", login)
	}

	srv := server.New(server.Config{Store: st, Logger: log, SecureCookies: *secure})
	defer srv.Close()
	hs := &http.Server{
		Addr:              *addr,
		Handler:           srv,
		ReadHeaderTimeout: 10 * time.Second,
		ReadTimeout:       30 * time.Second,
		WriteTimeout:      60 * time.Second,
		IdleTimeout:       120 * time.Second,
		ErrorLog:          slog.NewLogLogger(log.Handler(), slog.LevelWarn),
	}
	ln, err := net.Listen("tcp", *addr)
	if err != nil {
		fmt.Fprintln(stderr, "larder: cannot listen:", err)
		return 1
	}
	fmt.Fprintf(stdout, "Larder is serving on http://%s/\n", ln.Addr())
	if n, err := st.CountUsers(ctx); err == nil && n == 0 {
		fmt.Fprintf(stdout, "No staff account exists yet: open http://%s/setup or run `larder user add --admin`.\n", ln.Addr())
	}

	served := make(chan error, 1)
	go func() { served <- hs.Serve(ln) }()
	select {
	case err := <-served:
		if !errors.Is(err, http.ErrServerClosed) {
			fmt.Fprintln(stderr, "larder:", err)
			return 1
		}
	case <-ctx.Done():
		log.Info("shutting down")
		shutCtx, cancel := context.WithTimeout(context.Background(), 15*time.Second)
		defer cancel()
		if err := hs.Shutdown(shutCtx); err != nil {
			log.Error("shutdown", "err", err)
		}
	}
	return 0
}

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
// pool and stops the private cluster.
func connect(ctx context.Context, dataDir string, log *slog.Logger) (st *store.Store, applied int, close func(), err error) {
	dsn, cleanup, err := openDatabase(ctx, dataDir, log)
	if err != nil {
		return nil, 0, nil, err
	}
	pool, err := pgxpool.New(ctx, dsn)
	if err == nil {
		pingCtx, cancel := context.WithTimeout(ctx, 15*time.Second)
		err = pool.Ping(pingCtx)
		cancel()
		if err != nil {
			pool.Close()
		}
	}
	if err != nil {
		cleanup()
		return nil, 0, nil, fmt.Errorf("cannot reach the database: %w", err)
	}
	close = func() { pool.Close(); cleanup() }
	applied, err = store.Migrate(ctx, pool)
	if err != nil {
		close()
		return nil, 0, nil, err
	}
	return store.New(pool), applied, close, nil
}

func runServe(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("serve", flag.ContinueOnError)
	fs.SetOutput(stderr)
	addr := fs.String("addr", envOr("LARDER_ADDR", "127.0.0.1:8080"), "address to listen on, HOST:PORT (env LARDER_ADDR)")
	dataDir := fs.String("data-dir", defaultDataDir(), "folder of the private PostgreSQL cluster when DATABASE_URL is not set (env LARDER_DATA_DIR)")
	withDemo := fs.Bool("demo", envBool("LARDER_DEMO"), "load the demo practice before serving (env LARDER_DEMO)")
	password := fs.String("password", os.Getenv("LARDER_DEMO_PASSWORD"), "password of the demo login with --demo (env LARDER_DEMO_PASSWORD)")
	secure := fs.Bool("secure-cookies", envBool("LARDER_SECURE_COOKIES"), "mark the session cookie Secure; set when served over HTTPS (env LARDER_SECURE_COOKIES)")
	if err := fs.Parse(args); err != nil {
		return 2
	}
	log := newLogger(stderr)

	st, applied, closeDB, err := connect(ctx, *dataDir, log)
	if err != nil {
		fmt.Fprintln(stderr, "larder:", err)
		return 1
	}
	defer closeDB()
	log.Info("database ready", "migrations_applied", applied)

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

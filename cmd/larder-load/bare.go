package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"net"
	"net/http"
	"time"

	"larder/internal/store"
)

// runBare is the yardstick: a plain net/http handler that makes one pgx
// query per request and writes its answer. It runs as a process of its own
// (the load program starts itself with "bare"), so the app and the
// yardstick each have a process and neither shares the load generator's.
func runBare(args []string, stderr io.Writer) int {
	fs := flag.NewFlagSet("bare", flag.ContinueOnError)
	addr := fs.String("addr", "127.0.0.1:8117", "where to listen")
	dsn := fs.String("dsn", "", "database to query")
	maxConns := fs.Int("db-max-conns", int(store.DefaultMaxConns()), "pool size, the app's")
	if err := fs.Parse(args); err != nil {
		return 2
	}
	ctx := context.Background()
	pool, err := store.OpenPool(ctx, *dsn, store.PoolOptions{MaxConns: int32(*maxConns)})
	if err != nil {
		fmt.Fprintln(stderr, "bare:", err)
		return 1
	}
	defer pool.Close()
	h := http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		var name string
		if err := pool.QueryRow(r.Context(), `SELECT value FROM settings WHERE key = 'practice_name'`).Scan(&name); err != nil {
			http.Error(w, err.Error(), http.StatusInternalServerError)
			return
		}
		w.Header().Set("Content-Type", "text/plain; charset=utf-8")
		fmt.Fprintf(w, "%s\n", name)
	})
	ln, err := net.Listen("tcp", *addr)
	if err != nil {
		fmt.Fprintln(stderr, "bare:", err)
		return 1
	}
	hs := &http.Server{Handler: h, ReadHeaderTimeout: 10 * time.Second}
	if err := hs.Serve(ln); err != nil {
		fmt.Fprintln(stderr, "bare:", err)
		return 1
	}
	return 0
}

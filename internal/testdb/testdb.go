// Package testdb gives each test package a real PostgreSQL database of its
// own: a fresh database on TEST_DATABASE_URL's server when that is set, or
// else on a private cluster started for the package. The database is
// migrated once and dropped when the package's tests end.
package testdb

import (
	"context"
	"crypto/rand"
	"encoding/hex"
	"fmt"
	"net/url"
	"os"
	"sync"
	"testing"
	"time"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgxpool"

	"larder/internal/pgcluster"
	"larder/internal/store"
)

var (
	adminDSN    string // a database on the server we may CREATE/DROP from
	serverDSN   func(db string) string
	unavailable string // why no database can be had

	mu       sync.Mutex
	pool     *pgxpool.Pool
	poolErr  error
	created  []string
	mainName string
)

// Main sets up the package's database server, runs the tests and cleans up.
// Use it as: func TestMain(m *testing.M) { os.Exit(testdb.Main(m)) }
func Main(m *testing.M) int {
	var cluster *pgcluster.Cluster
	if u := os.Getenv("TEST_DATABASE_URL"); u != "" {
		adminDSN = u
		serverDSN = func(db string) string { return withDatabase(u, db) }
	} else if _, err := pgcluster.FindBinDir(); err == nil {
		dir, err := os.MkdirTemp("/tmp", "ltdb")
		if err == nil {
			err = os.Chmod(dir, 0o755) // the postgres user must reach it when we are root
		}
		if err != nil {
			fmt.Fprintln(os.Stderr, "testdb:", err)
			return 1
		}
		defer os.RemoveAll(dir)
		cluster, err = pgcluster.Start(context.Background(), pgcluster.Options{DataDir: dir + "/pg", UnsafeFastForTests: true})
		if err != nil {
			fmt.Fprintln(os.Stderr, "testdb:", err)
			return 1
		}
		defer cluster.Stop()
		adminDSN = cluster.DSN("postgres")
		serverDSN = cluster.DSN
	} else {
		unavailable = "no PostgreSQL for tests: set TEST_DATABASE_URL or install PostgreSQL (" + err.Error() + ")"
		if os.Getenv("LARDER_TEST_REQUIRE_DB") == "1" {
			fmt.Fprintln(os.Stderr, "testdb:", unavailable)
			return 1
		}
	}
	code := m.Run()
	mu.Lock()
	if pool != nil {
		pool.Close()
	}
	names := created
	mu.Unlock()
	for _, n := range names {
		if err := drop(n); err != nil {
			fmt.Fprintln(os.Stderr, "testdb: drop", n, err)
		}
	}
	return code
}

// Pool is the package's migrated database, shared by its tests; make test
// data unique (names, emails) so tests do not see each other's rows.
func Pool(t testing.TB) *pgxpool.Pool {
	t.Helper()
	need(t)
	mu.Lock()
	defer mu.Unlock()
	if pool == nil && poolErr == nil {
		var name string
		name, poolErr = create()
		if poolErr == nil {
			mainName = name
			pool, poolErr = connect(serverDSN(name))
		}
		if poolErr == nil {
			_, poolErr = store.Migrate(context.Background(), pool)
		}
	}
	if poolErr != nil {
		t.Fatalf("testdb: %v", poolErr)
	}
	return pool
}

// DSN is the connection string of the database Pool returns.
func DSN(t testing.TB) string {
	Pool(t)
	return serverDSN(mainName)
}

// Empty returns a pool on a new database with no migrations applied; it is
// closed and dropped when the test ends.
func Empty(t testing.TB) (*pgxpool.Pool, string) {
	t.Helper()
	need(t)
	mu.Lock()
	name, err := create()
	mu.Unlock()
	if err != nil {
		t.Fatalf("testdb: %v", err)
	}
	dsn := serverDSN(name)
	p, err := connect(dsn)
	if err != nil {
		t.Fatalf("testdb: %v", err)
	}
	t.Cleanup(p.Close)
	return p, dsn
}

func need(t testing.TB) {
	if serverDSN == nil {
		if unavailable == "" {
			unavailable = "testdb.Main was not called from TestMain"
		}
		t.Skip(unavailable)
	}
}

func create() (string, error) {
	b := make([]byte, 6)
	rand.Read(b)
	name := "larder_test_" + hex.EncodeToString(b)
	ctx, cancel := context.WithTimeout(context.Background(), 30*time.Second)
	defer cancel()
	conn, err := pgx.Connect(ctx, adminDSN)
	if err != nil {
		return "", err
	}
	defer conn.Close(ctx)
	if _, err := conn.Exec(ctx, "CREATE DATABASE "+name); err != nil {
		return "", err
	}
	created = append(created, name)
	return name, nil
}

func drop(name string) error {
	ctx, cancel := context.WithTimeout(context.Background(), 30*time.Second)
	defer cancel()
	conn, err := pgx.Connect(ctx, adminDSN)
	if err != nil {
		return err
	}
	defer conn.Close(ctx)
	_, err = conn.Exec(ctx, "DROP DATABASE IF EXISTS "+name+" WITH (FORCE)")
	return err
}

func connect(dsn string) (*pgxpool.Pool, error) {
	cfg, err := pgxpool.ParseConfig(dsn)
	if err != nil {
		return nil, err
	}
	cfg.MaxConns = 8
	return pgxpool.NewWithConfig(context.Background(), cfg)
}

func withDatabase(dsn, db string) string {
	u, err := url.Parse(dsn)
	if err != nil || u.Scheme == "" {
		// key=value form
		return dsn + " dbname=" + db
	}
	u.Path = "/" + db
	return u.String()
}

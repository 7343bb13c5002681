package testdb

import (
	"context"
	"io/fs"
	"os"
	"testing"

	"larder/internal/store"
	"larder/migrations"
)

func TestMain(m *testing.M) { os.Exit(Main(m)) }

// Migrations go up from an empty database, and a second run applies nothing
// and loses nothing.
func TestMigrationsUpFromEmptyAndIdempotent(t *testing.T) {
	ctx := context.Background()
	pool, _ := Empty(t)
	files, err := fs.Glob(migrations.FS, "*.sql")
	if err != nil || len(files) == 0 {
		t.Fatalf("no embedded migrations: %v", err)
	}
	n, err := store.Migrate(ctx, pool)
	if err != nil {
		t.Fatal(err)
	}
	if n != len(files) {
		t.Fatalf("first run applied %d migrations, want all %d", n, len(files))
	}
	if _, err := pool.Exec(ctx, `CREATE TABLE keepme (v int); INSERT INTO keepme VALUES (42)`); err != nil {
		t.Fatal(err)
	}
	n, err = store.Migrate(ctx, pool)
	if err != nil {
		t.Fatal(err)
	}
	if n != 0 {
		t.Errorf("second run applied %d migrations, want 0", n)
	}
	var v int
	if err := pool.QueryRow(ctx, `SELECT v FROM keepme`).Scan(&v); err != nil || v != 42 {
		t.Errorf("data lost across a second migrate: v=%d err=%v", v, err)
	}
}

// Each Pool is a database of this package's own, already migrated.
func TestPoolIsMigratedAndOwn(t *testing.T) {
	ctx := context.Background()
	p := Pool(t)
	var db string
	if err := p.QueryRow(ctx, `SELECT current_database()`).Scan(&db); err != nil {
		t.Fatal(err)
	}
	if len(db) < len("larder_test_") || db[:len("larder_test_")] != "larder_test_" {
		t.Errorf("pool database %q is not a per-package test database", db)
	}
	var version int64
	if err := p.QueryRow(ctx, `SELECT max(version_id) FROM goose_db_version`).Scan(&version); err != nil {
		t.Fatal(err)
	}
	if version < 1 {
		t.Errorf("pool database not migrated: version %d", version)
	}
}

package store

import (
	"context"
	"fmt"
	"io/fs"
	"strconv"
	"strings"

	"github.com/jackc/pgx/v5/pgxpool"
	"github.com/jackc/pgx/v5/stdlib"
	"github.com/pressly/goose/v3"
	"github.com/pressly/goose/v3/lock"

	"larder/migrations"
)

// Migrate applies every embedded migration not yet applied and reports how
// many ran. A second call applies nothing. goose takes a PostgreSQL advisory
// lock, so several app servers starting at once do not race.
func Migrate(ctx context.Context, pool *pgxpool.Pool) (int, error) {
	db := stdlib.OpenDBFromPool(pool)
	defer db.Close()
	locker, err := lock.NewPostgresSessionLocker()
	if err != nil {
		return 0, fmt.Errorf("migration lock: %w", err)
	}
	// Out-of-order migrations are applied: work developed in parallel lands
	// with numbers below ones already applied, and a database that ran the
	// higher ones first must still take the lower ones rather than refuse
	// to start. Each migration is written to stand on its own.
	provider, err := goose.NewProvider(goose.DialectPostgres, db, migrations.FS,
		goose.WithSessionLocker(locker), goose.WithAllowOutofOrder(true))
	if err != nil {
		return 0, fmt.Errorf("migrations: %w", err)
	}
	results, err := provider.Up(ctx)
	if err != nil {
		return len(results), fmt.Errorf("migrate: %w", err)
	}
	return len(results), nil
}

// SchemaVersion is the newest migration this binary carries (the goose
// version a database has once Migrate has run), read from the embedded
// files' numbers.
func SchemaVersion() (int64, error) {
	entries, err := fs.ReadDir(migrations.FS, ".")
	if err != nil {
		return 0, err
	}
	var newest int64
	for _, e := range entries {
		name := e.Name()
		if !strings.HasSuffix(name, ".sql") {
			continue
		}
		num, _, _ := strings.Cut(name, "_")
		v, err := strconv.ParseInt(num, 10, 64)
		if err != nil {
			return 0, fmt.Errorf("migration %s: no number", name)
		}
		newest = max(newest, v)
	}
	return newest, nil
}

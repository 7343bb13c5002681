package store_test

import (
	"context"
	"io/fs"
	"testing"
	"testing/fstest"

	"github.com/jackc/pgx/v5/stdlib"
	"github.com/pressly/goose/v3"

	"larder/internal/store"
	"larder/internal/testdb"
	"larder/migrations"
)

// A database migrated by a build that lacked one migration numbered below its
// newest (work from two branches landing in either order) must take that
// migration on the next start instead of refusing to serve.
func TestMigrateAppliesAMissingLowerMigration(t *testing.T) {
	ctx := context.Background()
	pool, _ := testdb.Empty(t)

	entries, err := fs.ReadDir(migrations.FS, ".")
	if err != nil {
		t.Fatal(err)
	}
	var sqlFiles []string
	for _, e := range entries {
		if len(e.Name()) > 4 && e.Name()[len(e.Name())-4:] == ".sql" {
			sqlFiles = append(sqlFiles, e.Name())
		}
	}
	if len(sqlFiles) < 3 {
		t.Fatalf("only %d migrations embedded", len(sqlFiles))
	}
	// Leave out the second newest: the newest then sits above a gap.
	skipped := sqlFiles[len(sqlFiles)-2]
	older := fstest.MapFS{}
	for _, name := range sqlFiles {
		if name == skipped {
			continue
		}
		b, err := fs.ReadFile(migrations.FS, name)
		if err != nil {
			t.Fatal(err)
		}
		older[name] = &fstest.MapFile{Data: b}
	}
	db := stdlib.OpenDBFromPool(pool)
	defer db.Close()
	p, err := goose.NewProvider(goose.DialectPostgres, db, older)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := p.Up(ctx); err != nil {
		t.Fatalf("migrating without %s: %v", skipped, err)
	}

	n, err := store.Migrate(ctx, pool)
	if err != nil {
		t.Fatalf("Migrate refused a database missing %s: %v", skipped, err)
	}
	if n != 1 {
		t.Errorf("Migrate applied %d migrations, want 1 (%s)", n, skipped)
	}
}

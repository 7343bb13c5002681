package main

import (
	"bytes"
	"context"
	"path/filepath"
	"strings"
	"testing"

	"larder/internal/store"
	"larder/internal/testdb"
)

// A backup taken, then a change, then a restore: the database is as it was
// at the backup.
func TestBackupAndRestore(t *testing.T) {
	if _, err := pgTool("pg_dump"); err != nil {
		t.Skip(err)
	}
	ctx := context.Background()
	pool, dsn := testdb.Empty(t)
	if _, err := store.Migrate(ctx, pool); err != nil {
		t.Fatal(err)
	}
	st := store.New(pool)
	kept := store.Client{Name: "Backup Kept", Sex: store.SexFemale}
	if err := st.CreateClient(ctx, store.System, &kept); err != nil {
		t.Fatal(err)
	}
	t.Setenv("DATABASE_URL", dsn)
	file := filepath.Join(t.TempDir(), "larder.dump")
	var out, errs bytes.Buffer
	if code := runBackup(ctx, []string{"--out", file}, &out, &errs); code != 0 || !strings.Contains(out.String(), "Backup written to "+file) {
		t.Fatalf("backup: code %d, %q, %q", code, out.String(), errs.String())
	}
	errs.Reset()
	if code := runBackup(ctx, []string{"--out", file}, &out, &errs); code != 2 || !strings.Contains(errs.String(), "exists already") {
		t.Fatalf("backup over an existing file: code %d, %q", code, errs.String())
	}

	later := store.Client{Name: "After Backup", Sex: store.SexMale}
	if err := st.CreateClient(ctx, store.System, &later); err != nil {
		t.Fatal(err)
	}
	errs.Reset()
	if code := runRestore(ctx, []string{"--in", file}, &out, &errs); code != 2 || !strings.Contains(errs.String(), "--yes is needed") {
		t.Fatalf("restore without --yes: code %d, %q", code, errs.String())
	}
	errs.Reset()
	if code := runRestore(ctx, []string{"--in", file + ".missing", "--yes"}, &out, &errs); code != 2 || !strings.Contains(errs.String(), "does not exist") {
		t.Fatalf("restore of a missing file: code %d, %q", code, errs.String())
	}
	// The pool's connections would hold locks the restore must take.
	pool.Reset()
	out.Reset()
	errs.Reset()
	if code := runRestore(ctx, []string{"--in", file, "--yes"}, &out, &errs); code != 0 {
		t.Fatalf("restore: code %d, %q", code, errs.String())
	}
	var names []string
	rows, err := pool.Query(ctx, `SELECT name FROM clients ORDER BY name`)
	if err != nil {
		t.Fatal(err)
	}
	for rows.Next() {
		var n string
		rows.Scan(&n)
		names = append(names, n)
	}
	if len(names) != 1 || names[0] != "Backup Kept" {
		t.Fatalf("clients after restore = %v, want only the one saved before the backup", names)
	}
	if n, err := store.Migrate(ctx, pool); err != nil || n != 0 {
		t.Fatalf("migrations after restore: %d applied, %v", n, err)
	}
}

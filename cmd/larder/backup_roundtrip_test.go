package main

import (
	"bytes"
	"context"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"filippo.io/age"
	"github.com/jackc/pgx/v5/pgxpool"

	"larder/internal/demo"
	"larder/internal/store"
	"larder/internal/testdb"
)

// filledDB is a migrated database holding the demo practice, a signed-in
// session and a failed sign-in.
func filledDB(t *testing.T) (*pgxpool.Pool, string) {
	t.Helper()
	if _, err := pgTool("pg_dump"); err != nil {
		t.Skip(err)
	}
	ctx := context.Background()
	pool, dsn := testdb.Empty(t)
	if _, err := store.Migrate(ctx, pool); err != nil {
		t.Fatal(err)
	}
	st := store.New(pool)
	if _, err := demo.Load(ctx, st, "demo password for the backup test"); err != nil {
		t.Fatal(err)
	}
	var uid int64
	if err := pool.QueryRow(ctx, `SELECT min(id) FROM users`).Scan(&uid); err != nil {
		t.Fatal(err)
	}
	if _, err := st.StartSession(ctx, uid, time.Now().Add(time.Hour), "192.0.2.1", "test browser"); err != nil {
		t.Fatal(err)
	}
	if _, err := pool.Exec(ctx, `INSERT INTO sessions (token, data, expiry) VALUES ('live-session-token', 'x', now() + interval '1 hour')`); err != nil {
		t.Fatal(err)
	}
	if err := st.RecordSignInFailure(ctx, "someone@example.org", "192.0.2.9", 0, "unknown email"); err != nil {
		t.Fatal(err)
	}
	return pool, dsn
}

// tableFingerprints is, for every table of the public schema, its row count
// and an md5 of all its rows in a fixed order.
func tableFingerprints(t *testing.T, pool *pgxpool.Pool) map[string]string {
	t.Helper()
	ctx := context.Background()
	rows, err := pool.Query(ctx, `SELECT table_name FROM information_schema.tables WHERE table_schema = 'public' AND table_type = 'BASE TABLE' ORDER BY 1`)
	if err != nil {
		t.Fatal(err)
	}
	var tables []string
	for rows.Next() {
		var n string
		if err := rows.Scan(&n); err != nil {
			t.Fatal(err)
		}
		tables = append(tables, n)
	}
	if rows.Err() != nil {
		t.Fatal(rows.Err())
	}
	out := map[string]string{}
	for _, tbl := range tables {
		var n int
		var sum string
		q := `SELECT count(*), coalesce(md5(string_agg(x::text, E'\n' ORDER BY x::text)), '') FROM "` + tbl + `" x`
		if err := pool.QueryRow(ctx, q).Scan(&n, &sum); err != nil {
			t.Fatalf("%s: %v", tbl, err)
		}
		out[tbl] = strconv.Itoa(n) + " " + sum
	}
	return out
}

// restoreInto restores file into a new empty database and returns its pool.
func restoreInto(t *testing.T, file string, extra ...string) (*pgxpool.Pool, int, string) {
	t.Helper()
	pool, dsn := testdb.Empty(t)
	t.Setenv("DATABASE_URL", dsn)
	var out, errs bytes.Buffer
	code := runRestore(context.Background(), append([]string{"--in", file, "--yes"}, extra...), &out, &errs)
	pool.Reset()
	return pool, code, out.String() + errs.String()
}

// A backup restored into an empty database gives every table back row for
// row, but for live sign-ins, which are left out; the file is readable by
// its owner only.
func TestBackupRoundTripEveryTable(t *testing.T) {
	src, dsn := filledDB(t)
	ctx := context.Background()
	t.Setenv("DATABASE_URL", dsn)
	file := filepath.Join(t.TempDir(), "larder.dump")
	var out, errs bytes.Buffer
	if code := runBackup(ctx, []string{"--out", file}, &out, &errs); code != 0 {
		t.Fatalf("backup: %d %s", code, errs.String())
	}
	fi, err := os.Stat(file)
	if err != nil {
		t.Fatal(err)
	}
	if mode := fi.Mode().Perm(); mode != 0o600 {
		t.Errorf("backup file mode %o, want 600", mode)
	}
	raw, _ := os.ReadFile(file)
	if bytes.Contains(raw, []byte("live-session-token")) {
		t.Error("the backup holds a live session token")
	}

	want := tableFingerprints(t, src)
	dst, code, msg := restoreInto(t, file)
	if code != 0 {
		t.Fatalf("restore: %d %s", code, msg)
	}
	got := tableFingerprints(t, dst)
	if len(want) < 10 {
		t.Fatalf("only %d tables compared: %v", len(want), want)
	}
	for tbl, w := range want {
		g, ok := got[tbl]
		switch {
		case !ok:
			t.Errorf("table %s missing after restore", tbl)
		case slices.Contains(notBackedUp, tbl):
			if !strings.HasPrefix(g, "0 ") || strings.HasPrefix(w, "0 ") {
				t.Errorf("%s: %s before, %s after; want rows before and none after", tbl, w, g)
			}
		case g != w:
			t.Errorf("table %s differs after restore: %s before, %s after", tbl, w, g)
		}
	}
	for tbl := range got {
		if _, ok := want[tbl]; !ok {
			t.Errorf("table %s appeared after restore", tbl)
		}
	}
}

// With --recipient the file is age-encrypted: no plaintext in it, useless
// without the identity, restored with it.
func TestBackupEncryptedToRecipient(t *testing.T) {
	src, dsn := filledDB(t)
	ctx := context.Background()
	id, err := age.GenerateX25519Identity()
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	keyFile := filepath.Join(dir, "key.txt")
	if err := os.WriteFile(keyFile, []byte(id.String()+"\n"), 0o600); err != nil {
		t.Fatal(err)
	}
	t.Setenv("DATABASE_URL", dsn)
	file := filepath.Join(dir, "larder.dump.age")
	var out, errs bytes.Buffer
	if code := runBackup(ctx, []string{"--out", file, "--recipient", "not-a-key"}, &out, &errs); code != 2 || !strings.Contains(errs.String(), "--recipient must be an age public key") {
		t.Fatalf("bad recipient: %d %s", code, errs.String())
	}
	if code := runBackup(ctx, []string{"--out", file, "--recipient", id.Recipient().String()}, &out, &errs); code != 0 {
		t.Fatalf("backup: %d %s", code, errs.String())
	}
	raw, _ := os.ReadFile(file)
	var client string
	if err := src.QueryRow(ctx, `SELECT name FROM clients ORDER BY id LIMIT 1`).Scan(&client); err != nil {
		t.Fatal(err)
	}
	if !bytes.HasPrefix(raw, []byte("age-encryption.org/v1")) || bytes.Contains(raw, []byte(client)) || bytes.Contains(raw, []byte("PGDMP")) {
		t.Fatalf("the file is not age-encrypted (%q…)", raw[:min(40, len(raw))])
	}
	if _, code, msg := restoreInto(t, file); code == 0 || !strings.Contains(msg, "the backup is encrypted") {
		t.Fatalf("restore without identity: %d %s", code, msg)
	}
	dst, code, msg := restoreInto(t, file, "--identity", keyFile)
	if code != 0 {
		t.Fatalf("restore with identity: %d %s", code, msg)
	}
	if w, g := tableFingerprints(t, src)["clients"], tableFingerprints(t, dst)["clients"]; w != g {
		t.Fatalf("clients differ after an encrypted round trip: %s / %s", w, g)
	}
}

// A backup from a newer schema than this program's is refused, and the
// target database is left as it was.
func TestRestoreRefusesNewerSchema(t *testing.T) {
	src, dsn := filledDB(t)
	ctx := context.Background()
	known, err := store.SchemaVersion()
	if err != nil || known < 35 {
		t.Fatalf("schema version %d, %v", known, err)
	}
	if _, err := src.Exec(ctx, `INSERT INTO goose_db_version (version_id, is_applied) VALUES ($1, true)`, known+1); err != nil {
		t.Fatal(err)
	}
	t.Setenv("DATABASE_URL", dsn)
	file := filepath.Join(t.TempDir(), "newer.dump")
	var out, errs bytes.Buffer
	if code := runBackup(ctx, []string{"--out", file}, &out, &errs); code != 0 {
		t.Fatalf("backup: %d %s", code, errs.String())
	}
	dst, code, msg := restoreInto(t, file)
	if code != 1 || !strings.Contains(msg, "the backup comes from a newer Larder") {
		t.Fatalf("restore of a newer backup: %d %s", code, msg)
	}
	var tables int
	if err := dst.QueryRow(ctx, `SELECT count(*) FROM information_schema.tables WHERE table_schema = 'public'`).Scan(&tables); err != nil || tables != 0 {
		t.Fatalf("the target database was changed: %d tables, %v", tables, err)
	}
}

// The migration table of a backup is read as pg_restore prints it.
func TestNewestApplied(t *testing.T) {
	sql := "SET x;\nCOPY public.goose_db_version (id, version_id, is_applied, tstamp) FROM stdin;\n1\t0\tt\t2026-01-01\n2\t36\tt\t2026-01-01\n3\t40\tf\t2026-01-01\n\\.\n"
	if v, err := newestApplied(sql); err != nil || v != 36 {
		t.Fatalf("newestApplied = %d, %v; want 36", v, err)
	}
	if _, err := newestApplied("SET x;\n"); err == nil {
		t.Fatal("a dump without the migration table was accepted")
	}
}

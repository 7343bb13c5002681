package pgcluster

import (
	"context"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/jackc/pgx/v5"
)

func shortTempDir(t *testing.T) string {
	t.Helper()
	// t.TempDir paths can be too long for a Unix socket; /tmp is short and
	// open to the postgres user when the tests run as root.
	dir, err := os.MkdirTemp("/tmp", "lpg")
	if err != nil {
		t.Fatal(err)
	}
	if err := os.Chmod(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { os.RemoveAll(dir) })
	return dir
}

func TestStartServesOnSocketAndStops(t *testing.T) {
	if _, err := FindBinDir(); err != nil {
		if os.Getenv("LARDER_TEST_REQUIRE_DB") == "1" {
			t.Fatal(err)
		}
		t.Skip(err)
	}
	ctx := context.Background()
	dir := filepath.Join(shortTempDir(t), "pg")
	c, err := Start(ctx, Options{DataDir: dir})
	if err != nil {
		t.Fatal(err)
	}
	conn, err := pgx.Connect(ctx, c.DSN("larder"))
	if err != nil {
		c.Stop()
		t.Fatal(err)
	}
	var listen string
	if err := conn.QueryRow(ctx, "SHOW listen_addresses").Scan(&listen); err != nil {
		t.Fatal(err)
	}
	conn.Close(ctx)
	if listen != "" {
		t.Errorf("listen_addresses = %q, want no TCP listener", listen)
	}
	// The cluster that holds a practice's records keeps PostgreSQL's crash
	// safety: an OS crash or power cut must not corrupt committed rows.
	if off, err := c.NotDurable(ctx); err != nil || len(off) > 0 {
		t.Errorf("default private cluster has crash safety off: %v (err %v)", off, err)
	}
	// A second Start joins the running cluster instead of failing, and does
	// not own it.
	c2, err := Start(ctx, Options{DataDir: dir})
	if err != nil {
		t.Fatalf("second start: %v", err)
	}
	if c2.owned {
		t.Error("second start claims to own a cluster it did not start")
	}
	if err := c.Stop(); err != nil {
		t.Fatal(err)
	}
	if _, err := pgx.Connect(ctx, c.DSN("larder")); err == nil {
		t.Error("cluster still answers after Stop")
	}
	// Restart keeps the data: the database made on first start is still there.
	c3, err := Start(ctx, Options{DataDir: dir})
	if err != nil {
		t.Fatalf("restart: %v", err)
	}
	defer c3.Stop()
	conn, err = pgx.Connect(ctx, c3.DSN("larder"))
	if err != nil {
		t.Fatal(err)
	}
	conn.Close(ctx)
}

func TestNoServerProgramsSaysWhatToDo(t *testing.T) {
	_, err := Start(context.Background(), Options{DataDir: shortTempDir(t), BinDir: "/nonexistent"})
	if !errors.Is(err, ErrNoServer) {
		t.Fatalf("start without server programs: got %v, want ErrNoServer", err)
	}
	for _, want := range []string{"install PostgreSQL", "DATABASE_URL"} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("message %q does not name the way out %q", err, want)
		}
	}
}

// The fast mode is for throwaway test clusters only, and it really is
// different: without it the durability check above would prove nothing.
func TestUnsafeFastForTestsTurnsDurabilityOff(t *testing.T) {
	if _, err := FindBinDir(); err != nil {
		if os.Getenv("LARDER_TEST_REQUIRE_DB") == "1" {
			t.Fatal(err)
		}
		t.Skip(err)
	}
	ctx := context.Background()
	c, err := Start(ctx, Options{DataDir: filepath.Join(shortTempDir(t), "pg"), UnsafeFastForTests: true})
	if err != nil {
		t.Fatal(err)
	}
	defer c.Stop()
	off, err := c.NotDurable(ctx)
	if err != nil {
		t.Fatal(err)
	}
	if strings.Join(off, ",") != "fsync,full_page_writes,synchronous_commit" {
		t.Errorf("fast test cluster turned off %v, want fsync, full_page_writes and synchronous_commit", off)
	}
}

package main

import (
	"context"
	"flag"
	"fmt"
	"io"

	"larder/internal/store"
)

// runMigrate applies any migrations not yet applied and says how many ran.
func runMigrate(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("migrate", flag.ContinueOnError)
	fs.SetOutput(stderr)
	dataDir := fs.String("data-dir", defaultDataDir(), "folder of the private PostgreSQL cluster when DATABASE_URL is not set (env LARDER_DATA_DIR)")
	if err := fs.Parse(args); err != nil {
		return 2
	}
	_, applied, closeDB, err := connect(ctx, *dataDir, newLogger(stderr), store.PoolOptions{})
	if err != nil {
		fmt.Fprintln(stderr, "larder:", err)
		return 1
	}
	defer closeDB()
	fmt.Fprintf(stdout, "Migrations applied: %d.\n", applied)
	return 0
}

package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"os"

	"larder/internal/demo"
	"larder/internal/store"
)

// runDemo loads the demo practice (again, harmlessly) and prints its login.
func runDemo(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("demo", flag.ContinueOnError)
	fs.SetOutput(stderr)
	dataDir := fs.String("data-dir", defaultDataDir(), "folder of the private PostgreSQL cluster when DATABASE_URL is not set (env LARDER_DATA_DIR)")
	password := fs.String("password", os.Getenv("LARDER_DEMO_PASSWORD"), "password of the demo login; generated when empty for a new login (env LARDER_DEMO_PASSWORD)")
	if err := fs.Parse(args); err != nil {
		return 2
	}
	st, _, closeDB, err := connect(ctx, *dataDir, newLogger(stderr), store.PoolOptions{})
	if err != nil {
		fmt.Fprintln(stderr, "larder:", err)
		return 1
	}
	defer closeDB()
	login, err := demo.Load(ctx, st, *password)
	if err != nil {
		fmt.Fprintln(stderr, "larder: demo:", err)
		return 1
	}
	fmt.Fprintln(stdout, "Demo practice loaded. Sign in as", login)
	return 0
}

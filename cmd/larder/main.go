// Command larder is Larder's one binary: it serves the web app, applies
// migrations, loads the demo practice, manages staff users and computes
// plans from JSON on the command line.
package main

import (
	"context"
	"fmt"
	"io"
	"os"
	"os/signal"
	"syscall"
)

const usage = `larder — carbohydrate plans for sports dietitians

Usage:
  larder serve   [--addr 127.0.0.1:8080] [--data-dir DIR] [--demo] [--password P]
  larder migrate [--data-dir DIR]
  larder demo    [--data-dir DIR] [--password P]
  larder user    add --email E --name N [--admin] [--password P]
  larder compute [--in request.json]     (reads stdin when --in is absent)
  larder backup  [--out FILE]            (the whole database, pg_dump custom format)
  larder restore --in FILE --yes         (replaces everything in the database)

With DATABASE_URL set, larder uses that PostgreSQL database; otherwise it runs
a private PostgreSQL cluster in --data-dir (env LARDER_DATA_DIR).
`

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	code := run(ctx, os.Args[1:], os.Stdin, os.Stdout, os.Stderr)
	stop()
	os.Exit(code)
}

func run(ctx context.Context, args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		fmt.Fprint(stderr, usage)
		return 2
	}
	rest := args[1:]
	switch args[0] {
	case "serve":
		return runServe(ctx, rest, stdout, stderr)
	case "migrate":
		return runMigrate(ctx, rest, stdout, stderr)
	case "demo":
		return runDemo(ctx, rest, stdout, stderr)
	case "user":
		return runUser(ctx, rest, stdout, stderr)
	case "compute":
		return runCompute(rest, stdin, stdout, stderr)
	case "backup":
		return runBackup(ctx, rest, stdout, stderr)
	case "restore":
		return runRestore(ctx, rest, stdout, stderr)
	case "help", "-h", "--help":
		fmt.Fprint(stdout, usage)
		return 0
	default:
		fmt.Fprintf(stderr, "larder: unknown command %q\n\n%s", args[0], usage)
		return 2
	}
}

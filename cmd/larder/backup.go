package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"time"

	"larder/internal/pgcluster"
)

// pgTool finds a PostgreSQL client program: beside the server programs
// first (their versions match the private cluster), then on PATH.
func pgTool(name string) (string, error) {
	if dir, err := pgcluster.FindBinDir(); err == nil {
		if p := filepath.Join(dir, name); fileExists(p) {
			return p, nil
		}
	}
	if p, err := exec.LookPath(name); err == nil {
		return p, nil
	}
	return "", fmt.Errorf("%s was not found: install PostgreSQL's client programs (for example `apt-get install postgresql-client`)", name)
}

func fileExists(p string) bool {
	fi, err := os.Stat(p)
	return err == nil && !fi.IsDir()
}

// runBackup writes the whole database — everything Larder keeps — to one
// file in pg_dump's custom format.
func runBackup(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("backup", flag.ContinueOnError)
	fs.SetOutput(stderr)
	dataDir := fs.String("data-dir", defaultDataDir(), "folder of the private PostgreSQL cluster when DATABASE_URL is not set (env LARDER_DATA_DIR)")
	out := fs.String("out", "larder-"+time.Now().UTC().Format("20060102-150405")+".dump", "file to write")
	if err := fs.Parse(args); err != nil {
		return 2
	}
	if fileExists(*out) {
		fmt.Fprintf(stderr, "larder: backup: %s exists already; choose another --out\n", *out)
		return 2
	}
	dump, err := pgTool("pg_dump")
	if err != nil {
		fmt.Fprintln(stderr, "larder: backup:", err)
		return 1
	}
	log := newLogger(stderr)
	dsn, cleanup, err := openDatabase(ctx, *dataDir, log)
	if err != nil {
		fmt.Fprintln(stderr, "larder:", err)
		return 1
	}
	defer cleanup()
	cmd := exec.CommandContext(ctx, dump, "--format=custom", "--no-owner", "--no-privileges", "--file", *out, "--dbname", dsn)
	cmd.Stderr = stderr
	if err := cmd.Run(); err != nil {
		os.Remove(*out)
		fmt.Fprintln(stderr, "larder: backup failed:", err)
		return 1
	}
	fi, _ := os.Stat(*out)
	fmt.Fprintf(stdout, "Backup written to %s (%d bytes). Restore it with: larder restore --in %s --yes\n", *out, fi.Size(), *out)
	return 0
}

// runRestore replaces the database's contents with a backup. It asks for
// --yes because everything saved since the backup is lost.
func runRestore(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("restore", flag.ContinueOnError)
	fs.SetOutput(stderr)
	dataDir := fs.String("data-dir", defaultDataDir(), "folder of the private PostgreSQL cluster when DATABASE_URL is not set (env LARDER_DATA_DIR)")
	in := fs.String("in", "", "backup file written by larder backup")
	yes := fs.Bool("yes", false, "confirm: replace everything in the database with the backup")
	if err := fs.Parse(args); err != nil {
		return 2
	}
	var problems []string
	if *in == "" {
		problems = append(problems, "--in names the backup file to restore")
	} else if !fileExists(*in) {
		problems = append(problems, fmt.Sprintf("--in: %s does not exist", *in))
	}
	if !*yes {
		problems = append(problems, "--yes is needed: restoring replaces everything in the database, and whatever was saved after the backup is lost")
	}
	if len(problems) > 0 {
		for _, p := range problems {
			fmt.Fprintln(stderr, "larder: restore:", p)
		}
		return 2
	}
	restore, err := pgTool("pg_restore")
	if err != nil {
		fmt.Fprintln(stderr, "larder: restore:", err)
		return 1
	}
	log := newLogger(stderr)
	dsn, cleanup, err := openDatabase(ctx, *dataDir, log)
	if err != nil {
		fmt.Fprintln(stderr, "larder:", err)
		return 1
	}
	defer cleanup()
	// One transaction: a failed restore leaves the database as it was.
	cmd := exec.CommandContext(ctx, restore, "--clean", "--if-exists", "--no-owner", "--no-privileges", "--single-transaction", "--exit-on-error", "--dbname", dsn, *in)
	cmd.Stderr = stderr
	if err := cmd.Run(); err != nil {
		var ee *exec.ExitError
		if errors.As(err, &ee) {
			fmt.Fprintln(stderr, "larder: restore failed; the database is unchanged")
		} else {
			fmt.Fprintln(stderr, "larder: restore failed:", err)
		}
		return 1
	}
	fmt.Fprintf(stdout, "Restored %s. Start the server again so sessions and caches begin afresh.\n", *in)
	return 0
}

package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"time"

	"filippo.io/age"

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

// notBackedUp are tables whose rows a backup leaves out (their structure is
// kept): live sign-ins, whose tokens would let whoever holds the file in, and
// restored would sign people back in; and recent failed sign-ins, which mean
// nothing later.
var notBackedUp = []string{"sessions", "staff_sessions", "signin_failures"}

// runBackup writes the whole database — everything Larder keeps but live
// sign-ins — to one file in pg_dump's custom format, readable only by its
// owner (0600: it holds health data and password hashes), and, with
// --recipient, encrypted with age so that only the holder of the matching
// identity can read it.
func runBackup(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("backup", flag.ContinueOnError)
	fs.SetOutput(stderr)
	dataDir := fs.String("data-dir", defaultDataDir(), "folder of the private PostgreSQL cluster when DATABASE_URL is not set (env LARDER_DATA_DIR)")
	out := fs.String("out", "larder-"+time.Now().UTC().Format("20060102-150405")+".dump", "file to write (created readable by you only)")
	recipient := fs.String("recipient", "", "encrypt to this age public key (age1…), so the file is useless without its identity; restore with --identity")
	if err := fs.Parse(args); err != nil {
		return 2
	}
	var rcpt age.Recipient
	if *recipient != "" {
		r, err := age.ParseX25519Recipient(strings.TrimSpace(*recipient))
		if err != nil {
			fmt.Fprintln(stderr, "larder: backup: --recipient must be an age public key starting age1 (made with age-keygen):", err)
			return 2
		}
		rcpt = r
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

	// Created here, not by pg_dump, so it is 0600 from its first byte
	// whatever the umask, and never replaces an existing file.
	f, err := os.OpenFile(*out, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o600)
	if err != nil {
		fmt.Fprintln(stderr, "larder: backup:", err)
		return 1
	}
	if err := writeDump(ctx, dump, dsn, f, rcpt, stderr); err != nil {
		f.Close()
		os.Remove(*out)
		fmt.Fprintln(stderr, "larder: backup failed:", err)
		return 1
	}
	if err := f.Close(); err != nil {
		os.Remove(*out)
		fmt.Fprintln(stderr, "larder: backup failed:", err)
		return 1
	}
	fi, _ := os.Stat(*out)
	how := "Restore it with: larder restore --in " + *out + " --yes"
	if rcpt != nil {
		how = "It is encrypted; restore it with: larder restore --in " + *out + " --identity KEYFILE --yes"
	}
	fmt.Fprintf(stdout, "Backup written to %s (%d bytes, readable by you only). %s\n", *out, fi.Size(), how)
	return 0
}

// writeDump runs pg_dump into w, through age when rcpt is set.
func writeDump(ctx context.Context, dump, dsn string, w io.Writer, rcpt age.Recipient, stderr io.Writer) error {
	args := []string{"--format=custom", "--no-owner", "--no-privileges", "--dbname", dsn}
	for _, t := range notBackedUp {
		args = append(args, "--exclude-table-data="+t)
	}
	var enc io.WriteCloser
	if rcpt != nil {
		var err error
		if enc, err = age.Encrypt(w, rcpt); err != nil {
			return err
		}
		w = enc
	}
	cmd := exec.CommandContext(ctx, dump, args...)
	cmd.Stdout = w
	cmd.Stderr = stderr
	if err := cmd.Run(); err != nil {
		return err
	}
	if enc != nil {
		return enc.Close()
	}
	return nil
}

package main

import (
	"bufio"
	"bytes"
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/exec"
	"strconv"
	"strings"

	"filippo.io/age"

	"larder/internal/store"
)

// ageHeader starts every file age encrypts.
const ageHeader = "age-encryption.org/v1"

// openBackup opens a backup for reading, decrypting it when it is
// encrypted (identityFile names the age identity to do so).
func openBackup(path, identityFile string) (io.ReadCloser, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	br := bufio.NewReader(f)
	head, _ := br.Peek(len(ageHeader))
	if string(head) != ageHeader {
		return struct {
			io.Reader
			io.Closer
		}{br, f}, nil
	}
	if identityFile == "" {
		f.Close()
		return nil, errors.New("the backup is encrypted: give the age identity file that matches its recipient with --identity")
	}
	kf, err := os.Open(identityFile)
	if err != nil {
		f.Close()
		return nil, fmt.Errorf("--identity: %w", err)
	}
	ids, err := age.ParseIdentities(kf)
	kf.Close()
	if err != nil {
		f.Close()
		return nil, fmt.Errorf("--identity: %w", err)
	}
	r, err := age.Decrypt(br, ids...)
	if err != nil {
		f.Close()
		return nil, fmt.Errorf("the backup cannot be decrypted with that identity: %w", err)
	}
	return struct {
		io.Reader
		io.Closer
	}{r, f}, nil
}

// backupSchemaVersion is the newest migration applied in the database the
// backup was taken from, read from its goose_db_version table.
func backupSchemaVersion(ctx context.Context, restore, path, identity string) (int64, error) {
	in, err := openBackup(path, identity)
	if err != nil {
		return 0, err
	}
	defer in.Close()
	var out, errs bytes.Buffer
	cmd := exec.CommandContext(ctx, restore, "--data-only", "--table=goose_db_version", "--file=-")
	cmd.Stdin, cmd.Stdout, cmd.Stderr = in, &out, &errs
	if err := cmd.Run(); err != nil {
		return 0, fmt.Errorf("the file is not a backup pg_restore can read (%v): %s", err, strings.TrimSpace(errs.String()))
	}
	return newestApplied(out.String())
}

// newestApplied reads pg_restore's COPY block of goose_db_version and
// returns the highest version_id marked applied.
func newestApplied(sql string) (int64, error) {
	var cols []string
	var newest int64 = -1
	inCopy := false
	for _, line := range strings.Split(sql, "\n") {
		switch {
		case strings.HasPrefix(line, "COPY ") && strings.Contains(line, "goose_db_version"):
			open, close := strings.Index(line, "("), strings.Index(line, ")")
			if open < 0 || close < open {
				return 0, errors.New("the backup's migration table is unreadable")
			}
			cols = strings.Split(line[open+1:close], ", ")
			inCopy = true
		case inCopy && line == `\.`:
			inCopy = false
		case inCopy:
			fields := strings.Split(line, "\t")
			if len(fields) != len(cols) {
				return 0, errors.New("the backup's migration table is unreadable")
			}
			var version int64 = -1
			applied := false
			for i, c := range cols {
				switch c {
				case "version_id":
					version, _ = strconv.ParseInt(fields[i], 10, 64)
				case "is_applied":
					applied = fields[i] == "t"
				}
			}
			if applied && version > newest {
				newest = version
			}
		}
	}
	if newest < 0 {
		return 0, errors.New("the file holds no Larder migration table: it is not a Larder backup")
	}
	return newest, nil
}

// runRestore replaces the database's contents with a backup. It asks for
// --yes because everything saved since the backup is lost, and refuses a
// backup from a newer Larder, whose tables this program does not know.
func runRestore(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("restore", flag.ContinueOnError)
	fs.SetOutput(stderr)
	dataDir := fs.String("data-dir", defaultDataDir(), "folder of the private PostgreSQL cluster when DATABASE_URL is not set (env LARDER_DATA_DIR)")
	in := fs.String("in", "", "backup file written by larder backup")
	identity := fs.String("identity", "", "age identity file (AGE-SECRET-KEY-…) for an encrypted backup")
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
	have, err := backupSchemaVersion(ctx, restore, *in, *identity)
	if err != nil {
		fmt.Fprintln(stderr, "larder: restore:", err)
		return 1
	}
	known, err := store.SchemaVersion()
	if err != nil {
		fmt.Fprintln(stderr, "larder: restore:", err)
		return 1
	}
	if have > known {
		fmt.Fprintf(stderr, "larder: restore: the backup comes from a newer Larder (schema version %d; this program knows up to %d). Restore it with that version or a later one; nothing was changed.\n", have, known)
		return 1
	}
	log := newLogger(stderr)
	dsn, cleanup, err := openDatabase(ctx, *dataDir, log)
	if err != nil {
		fmt.Fprintln(stderr, "larder:", err)
		return 1
	}
	defer cleanup()
	src, err := openBackup(*in, *identity)
	if err != nil {
		fmt.Fprintln(stderr, "larder: restore:", err)
		return 1
	}
	defer src.Close()
	// One transaction: a failed restore leaves the database as it was.
	cmd := exec.CommandContext(ctx, restore, "--clean", "--if-exists", "--no-owner", "--no-privileges", "--single-transaction", "--exit-on-error", "--dbname", dsn)
	cmd.Stdin = src
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
	fmt.Fprintf(stdout, "Restored %s (schema version %d). Nobody is signed in: sign-ins are not kept in backups. Start the server again; it applies any newer migrations.\n", *in, have)
	return 0
}

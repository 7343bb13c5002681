// Package pgcluster runs a private PostgreSQL cluster for Larder when no
// DATABASE_URL is given: it finds the installed server programs, creates a
// cluster in a folder of its own, serves it on a Unix socket inside that
// folder only (so no TCP port can clash) and stops it again.
package pgcluster

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"log/slog"
	"net/url"
	"os"
	"os/exec"
	"os/user"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"syscall"
	"time"

	"github.com/jackc/pgx/v5"
)

// Superuser is the role initdb creates; the same name on every machine keeps
// DSNs predictable whatever OS user runs the cluster.
const Superuser = "larder"

// ErrNoServer says no PostgreSQL server programs were found.
var ErrNoServer = errors.New("no PostgreSQL server programs (initdb, pg_ctl) were found: install PostgreSQL (for example `apt-get install postgresql`) or set DATABASE_URL to a database you already have")

// Options configure Start.
type Options struct {
	DataDir string       // folder for the cluster; created when missing
	Logger  *slog.Logger // optional
	BinDir  string       // optional; found automatically when empty

	// UnsafeFastForTests turns off fsync and full_page_writes so throwaway
	// test clusters start and migrate quickly. A cluster run this way can be
	// corrupted by an OS crash or power cut, so only internal/testdb sets it;
	// the private cluster that holds a practice's records never does.
	UnsafeFastForTests bool
}

// Cluster is a running private cluster.
type Cluster struct {
	dir     string
	binDir  string
	owned   bool // false when the cluster was already running and we only joined it
	log     *slog.Logger
	runAs   *syscall.Credential
	sockDir string
}

// FindBinDir returns the folder holding initdb and pg_ctl: pg_config's
// --bindir first, then the newest /usr/lib/postgresql/*/bin, then PATH.
func FindBinDir() (string, error) {
	has := hasServer
	if out, err := exec.Command("pg_config", "--bindir").Output(); err == nil {
		if dir := strings.TrimSpace(string(out)); has(dir) {
			return dir, nil
		}
	}
	dirs, _ := filepath.Glob("/usr/lib/postgresql/*/bin")
	sort.Slice(dirs, func(i, j int) bool { return pgVersion(dirs[i]) > pgVersion(dirs[j]) })
	for _, d := range dirs {
		if has(d) {
			return d, nil
		}
	}
	if p, err := exec.LookPath("initdb"); err == nil && has(filepath.Dir(p)) {
		return filepath.Dir(p), nil
	}
	return "", ErrNoServer
}

func hasServer(dir string) bool {
	for _, p := range []string{"initdb", "pg_ctl", "postgres"} {
		if fi, err := os.Stat(filepath.Join(dir, p)); err != nil || fi.IsDir() {
			return false
		}
	}
	return true
}

func pgVersion(binDir string) float64 {
	v, _ := strconv.ParseFloat(filepath.Base(filepath.Dir(binDir)), 64)
	return v
}

// Start creates the cluster if needed and starts it, or joins it when it is
// already running from an earlier start.
func Start(ctx context.Context, opt Options) (*Cluster, error) {
	if opt.DataDir == "" {
		return nil, errors.New("pgcluster: no data folder given")
	}
	log := opt.Logger
	if log == nil {
		log = slog.New(slog.DiscardHandler)
	}
	bin := opt.BinDir
	if bin != "" && !hasServer(bin) {
		return nil, ErrNoServer
	}
	if bin == "" {
		var err error
		if bin, err = FindBinDir(); err != nil {
			return nil, err
		}
	}
	dir, err := filepath.Abs(opt.DataDir)
	if err != nil {
		return nil, err
	}
	c := &Cluster{dir: dir, binDir: bin, log: log, sockDir: filepath.Join(dir, "run")}
	// The socket path must fit in sockaddr_un (107 bytes).
	if n := len(filepath.Join(c.sockDir, ".s.PGSQL.5432")); n > 100 {
		return nil, fmt.Errorf("pgcluster: data folder path %q is too long for a Unix socket (%d bytes); choose a shorter --data-dir", dir, n)
	}
	if os.Geteuid() == 0 {
		// PostgreSQL refuses to run as root, so the cluster belongs to the
		// postgres system user.
		cred, err := systemUser("postgres")
		if err != nil {
			return nil, fmt.Errorf("pgcluster: running as root needs the postgres system user: %w", err)
		}
		c.runAs = cred
	}
	if err := c.prepareDirs(); err != nil {
		return nil, err
	}
	pgdata := filepath.Join(dir, "data")
	if _, err := os.Stat(filepath.Join(pgdata, "PG_VERSION")); errors.Is(err, os.ErrNotExist) {
		log.Info("creating private PostgreSQL cluster", "dir", pgdata)
		args := []string{"-D", pgdata, "-U", Superuser, "-A", "trust", "-E", "UTF8"}
		if opt.UnsafeFastForTests {
			// initdb normally syncs its files to disk before returning.
			args = append(args, "--no-sync")
		}
		if out, err := c.run(ctx, "initdb", append(args, "--locale=C.UTF-8")...); err != nil {
			// Older initdb versions lack C.UTF-8 on some systems; retry with C.
			if out2, err2 := c.run(ctx, "initdb", append(args, "--locale=C")...); err2 != nil {
				return nil, fmt.Errorf("pgcluster: initdb failed: %v\n%s\n%s", err2, out, out2)
			}
		}
	}
	if _, err := c.run(ctx, "pg_ctl", "status", "-D", pgdata); err == nil {
		log.Info("joining private PostgreSQL cluster already running", "dir", pgdata)
	} else {
		// PostgreSQL's own defaults (fsync, full_page_writes, synchronous
		// commit) are what keep committed records through a crash; only a
		// throwaway test cluster gives them up for speed.
		opts := fmt.Sprintf("-c listen_addresses='' -c unix_socket_directories='%s'", c.sockDir)
		if opt.UnsafeFastForTests {
			opts += " -c fsync=off -c full_page_writes=off -c synchronous_commit=off"
		}
		out, err := c.run(ctx, "pg_ctl", "start", "-D", pgdata, "-w", "-t", "60", "-l", filepath.Join(dir, "postgres.log"), "-o", opts)
		if err != nil {
			logTail, _ := os.ReadFile(filepath.Join(dir, "postgres.log"))
			if len(logTail) > 2000 {
				logTail = logTail[len(logTail)-2000:]
			}
			return nil, fmt.Errorf("pgcluster: could not start PostgreSQL: %v\n%s\n%s", err, out, logTail)
		}
		c.owned = true
	}
	if err := c.ensureDatabase(ctx, "larder"); err != nil {
		c.Stop()
		return nil, err
	}
	if !opt.UnsafeFastForTests {
		// A cluster we only joined may have been started by an older
		// version with durability off; say so rather than trust it.
		if off, err := c.NotDurable(ctx); err == nil && len(off) > 0 {
			log.Warn("private PostgreSQL cluster runs without crash safety; stop it (pg_ctl stop) so the next start restores it", "off", strings.Join(off, ","), "dir", pgdata)
		}
	}
	return c, nil
}

// NotDurable names the crash-safety settings (fsync, full_page_writes,
// synchronous_commit) that the running cluster has turned off.
func (c *Cluster) NotDurable(ctx context.Context) ([]string, error) {
	conn, err := pgx.Connect(ctx, c.DSN("postgres"))
	if err != nil {
		return nil, err
	}
	defer conn.Close(ctx)
	var off []string
	for _, name := range []string{"fsync", "full_page_writes", "synchronous_commit"} {
		var v string
		if err := conn.QueryRow(ctx, "SELECT current_setting($1)", name).Scan(&v); err != nil {
			return nil, err
		}
		if v == "off" {
			off = append(off, name)
		}
	}
	return off, nil
}

func (c *Cluster) prepareDirs() error {
	for _, d := range []string{c.dir, c.sockDir} {
		if err := os.MkdirAll(d, 0o700); err != nil {
			return fmt.Errorf("pgcluster: %w", err)
		}
		if c.runAs != nil {
			if err := os.Chown(d, int(c.runAs.Uid), int(c.runAs.Gid)); err != nil {
				return fmt.Errorf("pgcluster: %w", err)
			}
		}
	}
	if c.runAs != nil {
		// The postgres user must be able to reach the folder.
		for p := filepath.Dir(c.dir); p != "/" && p != "."; p = filepath.Dir(p) {
			fi, err := os.Stat(p)
			if err != nil {
				return err
			}
			if fi.Mode().Perm()&0o001 == 0 {
				return fmt.Errorf("pgcluster: the postgres user cannot enter %s; choose a --data-dir outside it (for example /var/lib/larder)", p)
			}
		}
	}
	return nil
}

func (c *Cluster) run(ctx context.Context, prog string, args ...string) ([]byte, error) {
	cmd := exec.CommandContext(ctx, filepath.Join(c.binDir, prog), args...)
	var out bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &out
	cmd.Dir = c.dir
	cmd.Env = append(os.Environ(), "LC_ALL=C.UTF-8")
	if c.runAs != nil {
		cmd.SysProcAttr = &syscall.SysProcAttr{Credential: c.runAs}
		cmd.Env = append(cmd.Env, "HOME="+c.dir)
	}
	// pg_ctl start leaves the server running in its own process group so a
	// Ctrl-C in the terminal does not kill it before we stop it cleanly.
	if cmd.SysProcAttr == nil {
		cmd.SysProcAttr = &syscall.SysProcAttr{}
	}
	cmd.SysProcAttr.Setpgid = true
	err := cmd.Run()
	return out.Bytes(), err
}

func (c *Cluster) ensureDatabase(ctx context.Context, name string) error {
	var conn *pgx.Conn
	var err error
	for i := 0; i < 50; i++ {
		if conn, err = pgx.Connect(ctx, c.DSN("postgres")); err == nil {
			break
		}
		time.Sleep(100 * time.Millisecond)
	}
	if err != nil {
		return fmt.Errorf("pgcluster: connect: %w", err)
	}
	defer conn.Close(ctx)
	var exists bool
	if err := conn.QueryRow(ctx, "SELECT EXISTS (SELECT 1 FROM pg_database WHERE datname = $1)", name).Scan(&exists); err != nil {
		return err
	}
	if !exists {
		if _, err := conn.Exec(ctx, "CREATE DATABASE "+pgx.Identifier{name}.Sanitize()); err != nil {
			return fmt.Errorf("pgcluster: create database: %w", err)
		}
	}
	return nil
}

// DSN is a connection string for database db on the cluster's socket.
func (c *Cluster) DSN(db string) string {
	q := url.Values{"host": {c.sockDir}}
	return (&url.URL{Scheme: "postgres", User: url.User(Superuser), Path: "/" + db, RawQuery: q.Encode()}).String()
}

// Dir is the cluster's folder.
func (c *Cluster) Dir() string { return c.dir }

// Stop shuts the cluster down if this process started it.
func (c *Cluster) Stop() error {
	if c == nil || !c.owned {
		return nil
	}
	c.owned = false
	ctx, cancel := context.WithTimeout(context.Background(), 60*time.Second)
	defer cancel()
	out, err := c.run(ctx, "pg_ctl", "stop", "-D", filepath.Join(c.dir, "data"), "-m", "fast", "-w")
	if err != nil {
		return fmt.Errorf("pgcluster: stop: %v: %s", err, out)
	}
	c.log.Info("stopped private PostgreSQL cluster", "dir", c.dir)
	return nil
}

func systemUser(name string) (*syscall.Credential, error) {
	u, err := user.Lookup(name)
	if err != nil {
		return nil, err
	}
	uid, err := strconv.ParseUint(u.Uid, 10, 32)
	if err != nil {
		return nil, err
	}
	gid, err := strconv.ParseUint(u.Gid, 10, 32)
	if err != nil {
		return nil, err
	}
	return &syscall.Credential{Uid: uint32(uid), Gid: uint32(gid)}, nil
}

// DefaultDataDir is a per-user folder for the private cluster. Root's home
// is closed to the postgres user, so root gets a system folder instead.
func DefaultDataDir() string {
	if os.Geteuid() == 0 {
		return "/var/lib/larder"
	}
	if d := os.Getenv("XDG_DATA_HOME"); d != "" {
		return filepath.Join(d, "larder")
	}
	if h, err := os.UserHomeDir(); err == nil {
		return filepath.Join(h, ".local", "share", "larder")
	}
	return filepath.Join(os.TempDir(), "larder-"+strconv.Itoa(os.Getuid()))
}

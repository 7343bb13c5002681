package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"net/http"
	"net/http/cookiejar"
	"net/url"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"syscall"
	"time"

	"github.com/jackc/pgx/v5"

	"larder/internal/pgcluster"
)

// privateDB creates a fresh database for the run on the server of adminDSN
// (or on a private cluster in tmp when adminDSN is empty) and returns its
// DSN and a function that drops it again.
func privateDB(ctx context.Context, adminDSN, tmp string) (dsn string, drop func(), err error) {
	var stopCluster func()
	if adminDSN == "" {
		c, err := pgcluster.Start(ctx, pgcluster.Options{DataDir: filepath.Join(tmp, "pg")})
		if err != nil {
			return "", nil, err
		}
		adminDSN, stopCluster = c.DSN("postgres"), func() { _ = c.Stop() }
	}
	name := fmt.Sprintf("larder_load_%d", os.Getpid())
	conn, err := pgx.Connect(ctx, adminDSN)
	if err != nil {
		return "", nil, err
	}
	defer conn.Close(ctx)
	if _, err := conn.Exec(ctx, "CREATE DATABASE "+pgx.Identifier{name}.Sanitize()); err != nil {
		return "", nil, err
	}
	u, err := url.Parse(adminDSN)
	if err != nil {
		return "", nil, err
	}
	u.Path = "/" + name
	drop = func() {
		ctx, cancel := context.WithTimeout(context.Background(), 30*time.Second)
		defer cancel()
		if c, err := pgx.Connect(ctx, adminDSN); err == nil {
			_, _ = c.Exec(ctx, "DROP DATABASE IF EXISTS "+pgx.Identifier{name}.Sanitize()+" WITH (FORCE)")
			c.Close(ctx)
		}
		if stopCluster != nil {
			stopCluster()
		}
	}
	return u.String(), drop, nil
}

// buildApp builds cmd/larder from the module this program runs in.
func buildApp(ctx context.Context, dir string) (string, error) {
	bin := filepath.Join(dir, "larder")
	cmd := exec.CommandContext(ctx, "go", "build", "-o", bin, "./cmd/larder")
	cmd.Stdout, cmd.Stderr = os.Stderr, os.Stderr
	return bin, cmd.Run()
}

// proc is a child process the run started; stop ends it by its own id.
type proc struct{ cmd *exec.Cmd }

func start(name string, args []string, env []string, log io.Writer) (*proc, error) {
	cmd := exec.Command(name, args...)
	cmd.Env = append(os.Environ(), env...)
	cmd.Stdout, cmd.Stderr = log, log
	if err := cmd.Start(); err != nil {
		return nil, err
	}
	return &proc{cmd: cmd}, nil
}

func (p *proc) stop() {
	if p == nil || p.cmd.Process == nil {
		return
	}
	_ = p.cmd.Process.Signal(syscall.SIGTERM)
	done := make(chan struct{})
	go func() { _ = p.cmd.Wait(); close(done) }()
	select {
	case <-done:
	case <-time.After(20 * time.Second):
		_ = p.cmd.Process.Kill()
		<-done
	}
}

// memory reads the process's resident set now and at its peak, in MB.
func (p *proc) memory() (rss, peak float64) {
	b, err := os.ReadFile(fmt.Sprintf("/proc/%d/status", p.cmd.Process.Pid))
	if err != nil {
		return 0, 0
	}
	for _, line := range strings.Split(string(b), "\n") {
		f := strings.Fields(line)
		if len(f) < 2 {
			continue
		}
		kb, _ := strconv.ParseFloat(f[1], 64)
		switch f[0] {
		case "VmRSS:":
			rss = kb / 1024
		case "VmHWM:":
			peak = kb / 1024
		}
	}
	return rss, peak
}

// waitUp polls url until it answers 200 or the deadline passes.
func waitUp(ctx context.Context, url string, within time.Duration) error {
	deadline := time.Now().Add(within)
	for time.Now().Before(deadline) {
		if resp, err := http.Get(url); err == nil {
			resp.Body.Close()
			if resp.StatusCode == http.StatusOK {
				return nil
			}
		}
		select {
		case <-ctx.Done():
			return ctx.Err()
		case <-time.After(200 * time.Millisecond):
		}
	}
	return fmt.Errorf("%s did not answer within %s", url, within)
}

// targets are the addresses the run loads.
type targets struct {
	phone, calendar, client, published, draft, pdf string
	jar                                            http.CookieJar
}

var linkRE = regexp.MustCompile(`/c/([A-Za-z0-9_-]{20,})`)

// prepare signs in as the demo login, picks the demo's largest published
// plan, starts a draft of it and makes a client link, all through the
// app's own pages as a dietitian would.
func prepare(ctx context.Context, base, dsn, password string) (targets, error) {
	var t targets
	jar, _ := cookiejar.New(nil)
	t.jar = jar
	c := newClient(1, jar)
	post := func(path string, form url.Values) (*http.Response, string, error) {
		resp, err := c.PostForm(base+path, form)
		if err != nil {
			return nil, "", err
		}
		defer resp.Body.Close()
		b, err := io.ReadAll(resp.Body)
		return resp, string(b), err
	}
	resp, _, err := post("/signin", url.Values{"email": {"demo@example.org"}, "password": {password}})
	if err != nil {
		return t, err
	}
	if resp.StatusCode != http.StatusSeeOther {
		return t, fmt.Errorf("sign-in answered %s", resp.Status)
	}
	conn, err := pgx.Connect(ctx, dsn)
	if err != nil {
		return t, err
	}
	defer conn.Close(ctx)
	var clientID, planID int64
	var version int
	if err := conn.QueryRow(ctx, `SELECT p.client_id, p.id, v.version FROM plans p
		JOIN plan_versions v ON v.plan_id = p.id AND v.status = 'published'
		ORDER BY length(v.result::text) DESC LIMIT 1`).Scan(&clientID, &planID, &version); err != nil {
		return t, fmt.Errorf("no published demo plan: %w", err)
	}
	plan := fmt.Sprintf("/clients/%d/plans/%d", clientID, planID)
	resp, _, err = post(plan+"/revise", url.Values{"from": {strconv.Itoa(version)}})
	if err != nil {
		return t, err
	}
	var draft int
	if err := conn.QueryRow(ctx, `SELECT version FROM plan_versions WHERE plan_id = $1 AND status = 'draft'`, planID).Scan(&draft); err != nil {
		return t, fmt.Errorf("starting a draft answered %s: %w", resp.Status, err)
	}
	_, body, err := post(fmt.Sprintf("/clients/%d/links", clientID), url.Values{"label": {"Load test"}, "expires_days": {"30"}})
	if err != nil {
		return t, err
	}
	m := linkRE.FindStringSubmatch(body)
	if m == nil {
		return t, errors.New("making a client link showed no link")
	}
	t.phone = base + "/c/" + m[1]
	t.calendar = t.phone + "/plan.ics"
	t.client = fmt.Sprintf("%s/clients/%d", base, clientID)
	t.published = fmt.Sprintf("%s%s/versions/%d", base, plan, version)
	t.draft = fmt.Sprintf("%s%s/versions/%d", base, plan, draft)
	t.pdf = base + plan + "/sheet.pdf"
	return t, nil
}

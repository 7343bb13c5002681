// Command larder-load measures Larder's pages under load beside a yardstick.
//
// It creates a private database (on the PostgreSQL server named by --pg, or
// on a private cluster when none is named), builds and starts the app on it
// with the demo practice, starts a bare net/http handler that makes one pgx
// query per request, and then loads each page in interleaved pairs with the
// bare handler: bare, page, bare, page… Each run is bounded by a duration
// and a request count and goes to loopback only, so the program stops by
// itself. It prints requests per second, p50, p99, errors and the page's
// share of the bare handler's throughput (the median of the per-pair
// ratios), and the app's memory. It is a measuring tool, not a test.
//
//	go run ./cmd/larder-load                 # from the repository root
//	go run ./cmd/larder-load --duration 5s --pairs 3
package main

import (
	"context"
	"crypto/rand"
	"encoding/hex"
	"flag"
	"fmt"
	"io"
	"os"
	"os/signal"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"syscall"
	"text/tabwriter"
	"time"

	"larder/internal/store"
)

func main() {
	if len(os.Args) > 1 && os.Args[1] == "bare" {
		os.Exit(runBare(os.Args[2:], os.Stderr))
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	os.Exit(run(ctx, os.Args[1:], os.Stdout, os.Stderr))
}

// page is one row of the report.
type page struct {
	name    string
	url     func(targets) string
	conns   int
	staff   bool // needs the signed-in cookie
	latency bool // judged by median latency, not by a share of the bare handler
}

var pages = []page{
	{name: "phone page /c/{token}", url: func(t targets) string { return t.phone }, conns: 64},
	{name: "calendar feed", url: func(t targets) string { return t.calendar }, conns: 64},
	{name: "/healthz", url: func(t targets) string { return "" }, conns: 64},
	{name: "staff client page", url: func(t targets) string { return t.client }, conns: 16, staff: true},
	{name: "published plan page", url: func(t targets) string { return t.published }, conns: 16, staff: true},
	{name: "draft plan page", url: func(t targets) string { return t.draft }, conns: 16, staff: true},
	{name: "PDF sheet", url: func(t targets) string { return t.pdf }, conns: 1, staff: true, latency: true},
}

func run(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("larder-load", flag.ContinueOnError)
	fs.SetOutput(stderr)
	pg := fs.String("pg", os.Getenv("TEST_DATABASE_URL"), "PostgreSQL server to make the private database on, as a DSN of a database to connect to (default $TEST_DATABASE_URL; empty: a private cluster)")
	appPort := fs.Int("app-port", 8107, "loopback port for the app")
	barePort := fs.Int("bare-port", 8117, "loopback port for the bare handler")
	duration := fs.Duration("duration", 4*time.Second, "length of each run")
	maxReqs := fs.Int64("requests", 200000, "request budget of each run")
	pairs := fs.Int("pairs", 3, "interleaved bare/page pairs per page")
	larder := fs.String("larder", "", "larder binary to start (default: go build ./cmd/larder)")
	only := fs.String("only", "", "load only the page whose name contains this")
	maxConns := fs.Int("db-max-conns", int(store.DefaultMaxConns()), "database pool size of the app (its --db-max-conns) and of the bare handler alike; the default is the app's own for this machine")
	if err := fs.Parse(args); err != nil {
		return 2
	}
	if *maxConns < 1 {
		fmt.Fprintln(stderr, "larder-load: --db-max-conns must be at least 1")
		return 2
	}
	fail := func(what string, err error) int {
		fmt.Fprintf(stderr, "larder-load: %s: %v\n", what, err)
		return 1
	}
	tmp, err := os.MkdirTemp("", "larder-load-")
	if err != nil {
		return fail("temp dir", err)
	}
	defer os.RemoveAll(tmp)

	dsn, drop, err := privateDB(ctx, *pg, tmp)
	if err != nil {
		return fail("database", err)
	}
	defer drop()
	bin := *larder
	if bin == "" {
		if bin, err = buildApp(ctx, tmp); err != nil {
			return fail("build", err)
		}
	}
	self, err := os.Executable()
	if err != nil {
		return fail("own path", err)
	}
	logf, err := os.Create(filepath.Join(tmp, "app.log"))
	if err != nil {
		return fail("log", err)
	}
	defer logf.Close()

	pw := make([]byte, 12)
	_, _ = rand.Read(pw)
	password := hex.EncodeToString(pw)
	appBase := fmt.Sprintf("http://127.0.0.1:%d", *appPort)
	bareURL := fmt.Sprintf("http://127.0.0.1:%d/", *barePort)
	pool := strconv.Itoa(*maxConns)
	app, err := start(bin, []string{"serve", "--addr", fmt.Sprintf("127.0.0.1:%d", *appPort), "--demo", "--password", password, "--db-max-conns", pool},
		[]string{"DATABASE_URL=" + dsn}, logf)
	if err != nil {
		return fail("start app", err)
	}
	defer app.stop()
	bare, err := start(self, []string{"bare", "--addr", fmt.Sprintf("127.0.0.1:%d", *barePort), "--dsn", dsn, "--db-max-conns", pool}, nil, logf)
	if err != nil {
		return fail("start bare handler", err)
	}
	defer bare.stop()
	if err := waitUp(ctx, appBase+"/healthz", 60*time.Second); err != nil {
		return fail("app", err)
	}
	if err := waitUp(ctx, bareURL, 30*time.Second); err != nil {
		return fail("bare handler", err)
	}
	t, err := prepare(ctx, appBase, dsn, password)
	if err != nil {
		return fail("prepare", err)
	}

	fmt.Fprintf(stdout, "larder-load: %d CPU, %s per run, %d pairs, loopback, database pool %d connections (app and bare handler); app log %s\n", runtime.NumCPU(), *duration, *pairs, *maxConns, logf.Name())
	if la, err := os.ReadFile("/proc/loadavg"); err == nil {
		fmt.Fprintf(stdout, "load average before the run: %s\n", strings.Join(strings.Fields(string(la))[:3], " "))
	}
	fmt.Fprintln(stdout)
	tw := tabwriter.NewWriter(stdout, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "page\tconns\treq/s\tp50 ms\tp99 ms\terrors\tbare req/s\tbare p99 ms\tratio\t")
	for _, p := range pages {
		if *only != "" && !strings.Contains(p.name, *only) {
			continue
		}
		u := p.url(t)
		if u == "" {
			u = appBase + "/healthz"
		}
		row, err := measure(ctx, p, u, bareURL, t, *duration, *maxReqs, *pairs)
		if err != nil {
			return fail(p.name, err)
		}
		fmt.Fprintln(tw, row)
	}
	tw.Flush()
	rss, peak := app.memory()
	fmt.Fprintf(stdout, "\napp memory: %.0f MB resident now, %.0f MB peak\n", rss, peak)
	if la, err := os.ReadFile("/proc/loadavg"); err == nil {
		fmt.Fprintf(stdout, "load average after the run: %s\n", strings.Join(strings.Fields(string(la))[:3], " "))
	}
	return 0
}

// measure runs the pairs for one page and formats its row.
func measure(ctx context.Context, p page, u, bareURL string, t targets, d time.Duration, maxReqs int64, pairs int) (string, error) {
	appClient := newClient(p.conns, nil)
	if p.staff {
		appClient = newClient(p.conns, t.jar)
	}
	bareClient := newClient(p.conns, nil)
	var ratios, rps, bareRPS []float64
	var p50s, p99s, bareP99s []time.Duration
	errs := 0
	// A short warm-up first: connections, caches and and first-use costs are not what a steady state costs.
	shot{url: u, conns: p.conns, duration: d / 4, maxReqs: maxReqs, client: appClient}.run(ctx)
	for range pairs {
		if ctx.Err() != nil {
			return "", ctx.Err()
		}
		b := shot{url: bareURL, conns: p.conns, duration: d, maxReqs: maxReqs, client: bareClient}.run(ctx)
		a := shot{url: u, conns: p.conns, duration: d, maxReqs: maxReqs, client: appClient}.run(ctx)
		if b.rps() > 0 {
			ratios = append(ratios, a.rps()/b.rps())
		}
		rps, bareRPS = append(rps, a.rps()), append(bareRPS, b.rps())
		p50s, p99s, bareP99s = append(p50s, a.p50), append(p99s, a.p99), append(bareP99s, b.p99)
		errs += a.errors
	}
	ms := func(x time.Duration) string { return fmt.Sprintf("%.1f", float64(x)/float64(time.Millisecond)) }
	return fmt.Sprintf("%s\t%d\t%.0f\t%s\t%s\t%d\t%.0f\t%s\t%.1f %%\t", p.name, p.conns, median(rps), ms(medianDur(p50s)), ms(medianDur(p99s)),
		errs, median(bareRPS), ms(medianDur(bareP99s)), 100*median(ratios)), nil
}

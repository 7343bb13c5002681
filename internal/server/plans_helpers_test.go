package server

import (
	"context"
	"strconv"
	"testing"
	"time"

	"larder/internal/demo"
)

func itoa64(n int64) string { return strconv.FormatInt(n, 10) }

// loadDemo loads the demo practice with its clock at the tests' clock, so
// its events lie ahead of the server's "now". The demo loader is idempotent:
// every test may call it.
func loadDemo(t *testing.T, a *app) demo.Result {
	t.Helper()
	old := demo.Now
	demo.Now = func() time.Time { return testNow }
	defer func() { demo.Now = old }()
	res, err := demo.Run(context.Background(), a.st, "demo password for tests")
	if err != nil {
		t.Fatal(err)
	}
	if res.Password == "" {
		res.Password = "demo password for tests"
	}
	return res
}

func TestHoursWords(t *testing.T) {
	for _, c := range []struct {
		min  float64
		want string
	}{{45, "45 min"}, {59.6, "1 h 00 min"}, {195, "3 h 15 min"}, {250, "4 h 10 min"}} {
		if got := hoursWords(c.min); got != c.want {
			t.Errorf("hoursWords(%v) = %q, want %q", c.min, got, c.want)
		}
	}
}

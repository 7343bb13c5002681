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

package main

import (
	"context"
	"io"
	"net/http"
	"slices"
	"sync"
	"sync/atomic"
	"time"
)

// shot is one bounded run against one URL: conns workers send GETs until
// the duration is over or the request budget is spent, whichever comes
// first, so a run always stops by itself.
type shot struct {
	url      string
	conns    int
	duration time.Duration
	maxReqs  int64
	client   *http.Client // carries the staff cookie where a page needs one
}

// result is what a shot measured.
type result struct {
	reqs     int
	errors   int
	elapsed  time.Duration
	p50, p99 time.Duration
}

func (r result) rps() float64 {
	if r.elapsed <= 0 {
		return 0
	}
	return float64(r.reqs) / r.elapsed.Seconds()
}

// newClient keeps up to conns connections open to one host (loopback), as
// a load tool with a fixed connection count does.
func newClient(conns int, jar http.CookieJar) *http.Client {
	tr := &http.Transport{
		MaxIdleConns:        conns,
		MaxIdleConnsPerHost: conns,
		MaxConnsPerHost:     conns,
		IdleConnTimeout:     time.Minute,
		DisableCompression:  true,
	}
	return &http.Client{Transport: tr, Jar: jar, Timeout: 30 * time.Second,
		CheckRedirect: func(*http.Request, []*http.Request) error { return http.ErrUseLastResponse }}
}

// run fires the shot. Anything but a 200 counts as an error.
func (s shot) run(ctx context.Context) result {
	ctx, cancel := context.WithTimeout(ctx, s.duration)
	defer cancel()
	var sent atomic.Int64
	lat := make([][]time.Duration, s.conns)
	errs := make([]int, s.conns)
	var wg sync.WaitGroup
	start := time.Now()
	for w := range s.conns {
		wg.Add(1)
		go func() {
			defer wg.Done()
			buf := make([]byte, 32<<10)
			for ctx.Err() == nil && sent.Add(1) <= s.maxReqs {
				req, _ := http.NewRequestWithContext(ctx, http.MethodGet, s.url, nil)
				t0 := time.Now()
				resp, err := s.client.Do(req)
				if err != nil {
					if ctx.Err() != nil {
						return // cut off by the end of the run, not a failure
					}
					errs[w]++
					continue
				}
				_, err = io.CopyBuffer(io.Discard, resp.Body, buf)
				resp.Body.Close()
				if err != nil && ctx.Err() != nil {
					return
				}
				d := time.Since(t0)
				if err != nil || resp.StatusCode != http.StatusOK {
					errs[w]++
				}
				lat[w] = append(lat[w], d)
			}
		}()
	}
	wg.Wait()
	res := result{elapsed: time.Since(start)}
	var all []time.Duration
	for w := range s.conns {
		all = append(all, lat[w]...)
		res.errors += errs[w]
	}
	res.reqs = len(all)
	if len(all) > 0 {
		slices.Sort(all)
		res.p50 = all[len(all)/2]
		res.p99 = all[min(len(all)-1, len(all)*99/100)]
	}
	return res
}

func median(xs []float64) float64 {
	if len(xs) == 0 {
		return 0
	}
	s := slices.Clone(xs)
	slices.Sort(s)
	if len(s)%2 == 1 {
		return s[len(s)/2]
	}
	return (s[len(s)/2-1] + s[len(s)/2]) / 2
}

func medianDur(xs []time.Duration) time.Duration {
	f := make([]float64, len(xs))
	for i, x := range xs {
		f[i] = float64(x)
	}
	return time.Duration(median(f))
}

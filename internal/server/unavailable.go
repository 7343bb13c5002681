package server

import (
	"context"
	"errors"
	"io"
	"net"
	"net/http"
	"strconv"
	"strings"
	"time"

	"github.com/jackc/pgx/v5/pgconn"

	"larder/internal/store"
	"larder/web"
)

// retryAfter is what a 503 asks the browser or script to wait: about as long
// as PostgreSQL takes to restart or a network path to come back.
const retryAfter = 30 * time.Second

// dbUnavailable reports whether err means the database could not be reached
// or did not answer in time — a fault of the surroundings that passes, worth
// a "try again" 503 — rather than a bug in a query or in Larder (a 500).
func dbUnavailable(err error) bool {
	if err == nil {
		return false
	}
	// The request's time limit passed (a hung database, or no pooled
	// connection came free), or pgx gave up on a network deadline.
	if errors.Is(err, context.DeadlineExceeded) || errors.Is(err, context.Canceled) || pgconn.Timeout(err) {
		return true
	}
	// No connection could be opened, or one in use was cut or closed.
	var ce *pgconn.ConnectError
	var ne net.Error
	if errors.As(err, &ce) || errors.As(err, &ne) || errors.Is(err, pgconn.ErrConnClosed) {
		return true
	}
	var pe *pgconn.PgError
	if errors.As(err, &pe) {
		switch {
		case strings.HasPrefix(pe.Code, "08"): // connection exception
			return true
		case strings.HasPrefix(pe.Code, "53"): // insufficient resources: too many connections, disk full, out of memory
			return true
		}
		switch pe.Code {
		case "57014", // query_canceled: statement_timeout, or our own deadline
			"55P03",                   // lock_not_available: lock_timeout
			"25P03",                   // idle_in_transaction_session_timeout
			"57P01", "57P02", "57P03", // admin/crash shutdown, cannot connect now (starting up)
			"40001", "40P01": // serialization failure, deadlock: the same request succeeds when sent again
			return true
		}
		return false
	}
	// A connection cut while pgx read an answer surfaces as the reader's
	// EOF; pgconn's own errors say when nothing was sent yet.
	return errors.Is(err, io.EOF) || errors.Is(err, io.ErrUnexpectedEOF) || pgconn.SafeToRetry(err)
}

// Unavailable answers a request the database could not serve: a 503 with
// Retry-After, as JSON on the API, as the client's own page on a client link,
// and as a staff page otherwise. It makes no database call of its own (the
// practice's name is not read, nor the session touched), since the database
// has just failed. A change the request asked for was made whole or not at
// all: every write is one transaction, which PostgreSQL rolls back when its
// connection fails before the commit. (A commit sent just as the network
// failed may still have gone through; the page says to check.)
func (s *Server) Unavailable(w http.ResponseWriter, r *http.Request, err error) {
	s.Log.Warn("database unavailable", "method", r.Method, "path", logPath(r), "err", err)
	h := w.Header()
	h.Set("Retry-After", strconv.Itoa(int(retryAfter.Seconds())))
	h.Set("Cache-Control", "no-store")
	const status = http.StatusServiceUnavailable
	ctx := renderCtx(r) // the request's deadline has often passed by now
	switch {
	case strings.HasPrefix(r.URL.Path, "/api/"):
		writeJSON(w, status, map[string]string{"error": "the database is not answering; a change this request asked for was made whole or not at all; try again in a minute"})
	case strings.HasPrefix(r.URL.Path, "/c/"):
		h.Set("Content-Type", "text/html; charset=utf-8")
		w.WriteHeader(status)
		if err := web.ClientLinkUnavailable().Render(ctx, w); err != nil {
			s.Log.Error("render", "path", "/c/…", "err", err)
		}
	default:
		h.Set("Content-Type", "text/html; charset=utf-8")
		w.WriteHeader(status)
		p := web.Page{Title: "Try again shortly", User: CurrentUser(r), PracticeName: store.DefaultPracticeName}
		if err := web.Layout(p, web.Unavailable()).Render(ctx, w); err != nil {
			s.Log.Error("render", "path", logPath(r), "err", err)
		}
	}
}

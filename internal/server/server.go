// Package server owns Larder's HTTP surface: the chi router, middleware
// (request logs, recovery, sign-in, roles, cross-origin protection), and the
// handlers of the staff pages. Handlers decode and validate a form, call the
// store, and render a web component; nothing else happens here.
package server

import (
	"log/slog"
	"net/http"
	"time"

	"github.com/alexedwards/scs/v2"
	lru "github.com/hashicorp/golang-lru/v2"

	"larder/internal/auth"
	"larder/internal/store"
)

// Config is what New needs.
type Config struct {
	Store  *store.Store
	Logger *slog.Logger // nil: discard
	// SecureCookies marks the session cookie Secure (serve behind TLS).
	SecureCookies bool
	// SessionCleanup is passed to auth.SessionOptions.CleanupInterval.
	SessionCleanup time.Duration
	// Now returns the current time; nil means time.Now (tests fix the clock).
	Now func() time.Time
	// RequestTimeout bounds a request's work (its database calls, the wait
	// for a pooled connection among them); 0 means DefaultRequestTimeout.
	RequestTimeout time.Duration
}

// DefaultRequestTimeout is how long a page may wait on the database before
// it is answered "try again": longer than any page takes when the database
// is well, short enough that a hung database does not hold every browser.
const DefaultRequestTimeout = 15 * time.Second

// Server holds what every handler needs. Handlers of other files (plans,
// foods) use the same fields and helpers.
type Server struct {
	Store    *store.Store
	Sessions *scs.SessionManager
	Log      *slog.Logger
	Now      func() time.Time
	// sessionNow is the wall clock of session idle limits, kept apart from
	// Now (which tests set to a plan's dates) like scs's own lifetimes.
	sessionNow func() time.Time
	// calendars keeps built client calendar feeds by calendarKey.
	calendars *lru.Cache[string, []byte]
	// phonePages keeps rendered phone pages by phonePageKey.
	phonePages *lru.Cache[string, []byte]
	// charts keeps drawn charts by a hash of their input (see drawn).
	charts *chartCache
	// details keeps rendered plan bodies by a hash of their input (see
	// renderDetail).
	details *planDetailCache

	secureCookies  bool // served behind TLS: also send HSTS
	requestTimeout time.Duration
	handler        http.Handler
}

// New builds the server and its routes.
func New(cfg Config) *Server {
	log := cfg.Logger
	if log == nil {
		log = slog.New(slog.DiscardHandler)
	}
	now := cfg.Now
	if now == nil {
		now = time.Now
	}
	s := &Server{
		Store: cfg.Store,
		Sessions: auth.NewSessionManager(cfg.Store.Pool, auth.SessionOptions{Secure: cfg.SecureCookies, CleanupInterval: cfg.SessionCleanup,
			Find: findSession(cfg.Store)}),
		Log:        log,
		Now:        now,
		sessionNow: time.Now,
		calendars:  newCalendarCache(),
		phonePages: newPhonePageCache(),
		charts:     newChartCache(),
		details:    newPlanDetailCache(planDetailCacheBytes),

		secureCookies:  cfg.SecureCookies,
		requestTimeout: cfg.RequestTimeout,
	}
	if s.requestTimeout <= 0 {
		s.requestTimeout = DefaultRequestTimeout
	}
	// A session that cannot be read or saved is a database fault like any
	// other: scs's own answer would be a bare 500.
	s.Sessions.ErrorFunc = s.ServerError
	s.handler = s.routes()
	return s
}

// ServeHTTP makes Server an http.Handler.
func (s *Server) ServeHTTP(w http.ResponseWriter, r *http.Request) { s.handler.ServeHTTP(w, r) }

// Close stops background work (the expired-session sweeper).
func (s *Server) Close() { auth.StopCleanup(s.Sessions) }

// Today is the current date at midnight UTC, the form used for date columns.
func (s *Server) Today() time.Time {
	y, m, d := s.Now().Date()
	return time.Date(y, m, d, 0, 0, 0, 0, time.UTC)
}

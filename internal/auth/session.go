package auth

import (
	"net/http"
	"time"

	"github.com/alexedwards/scs/pgxstore"
	"github.com/alexedwards/scs/v2"
	"github.com/jackc/pgx/v5/pgxpool"
)

// SessionOptions configures staff sessions.
type SessionOptions struct {
	// Secure marks the cookie Secure; set it when the app is served over
	// TLS (directly or behind a proxy that terminates TLS).
	Secure bool
	// CleanupInterval is how often expired sessions are deleted; 0 means
	// every 5 minutes, a negative value never (tests).
	CleanupInterval time.Duration
}

// Session keys.
const (
	KeyUserID = "user_id"
	// KeySessionID names the staff_sessions row of this sign-in; the
	// session signs nobody in once that row is gone.
	KeySessionID = "session_id"
	KeyFlash     = "flash"
)

// SessionLifetime is the longest a staff session lasts, however busy.
const SessionLifetime = 12 * time.Hour

// NewSessionManager returns a session manager storing sessions in the
// sessions table of pool. Sessions last at most 12 hours and end after 2
// idle hours: a clinic workstation left signed in does not stay open.
func NewSessionManager(pool *pgxpool.Pool, opt SessionOptions) *scs.SessionManager {
	m := scs.New()
	switch {
	case opt.CleanupInterval < 0:
		m.Store = pgxstore.NewWithCleanupInterval(pool, 0)
	case opt.CleanupInterval == 0:
		m.Store = pgxstore.New(pool)
	default:
		m.Store = pgxstore.NewWithCleanupInterval(pool, opt.CleanupInterval)
	}
	m.Lifetime = SessionLifetime
	m.IdleTimeout = 2 * time.Hour
	m.Cookie.Name = "larder_session"
	m.Cookie.HttpOnly = true
	m.Cookie.SameSite = http.SameSiteLaxMode
	m.Cookie.Secure = opt.Secure
	m.Cookie.Path = "/"
	return m
}

// StopCleanup stops the expired-session sweeper of a manager made by
// NewSessionManager, if it runs one.
func StopCleanup(m *scs.SessionManager) {
	if s, ok := m.Store.(*pgxstore.PostgresStore); ok {
		s.StopCleanup()
	}
}

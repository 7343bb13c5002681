package auth

import (
	"context"
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
	// Find, when set, reads a session's data by its token in place of the
	// store's own query (the server reads the session's user with it); nil
	// means the plain query.
	Find func(ctx context.Context, token string) (data []byte, found bool, err error)
}

// Session keys.
const (
	KeyUserID = "user_id"
	// KeySessionID names the staff_sessions row of this sign-in; the
	// session signs nobody in once that row is gone.
	KeySessionID = "session_id"
	KeyFlash     = "flash"
	// KeySeen is the last activity recorded in a signed-in session, in
	// Unix seconds (see Touch).
	KeySeen = "seen"
)

// Sessions end after IdleTimeout without a request: a clinic workstation
// left signed in does not stay open.
const (
	IdleTimeout = 2 * time.Hour
	// touchEvery is how stale the recorded activity may grow before a
	// request records it anew: a session costs one write a minute at most,
	// not one a request, and the idle limit is kept to within a minute.
	touchEvery = time.Minute
)

// SessionLifetime is the longest a staff session lasts, however busy.
const SessionLifetime = 12 * time.Hour

// NewSessionManager returns a session manager storing sessions in the
// sessions table of pool. The idle limit is kept by Touch rather than by
// the manager's own IdleTimeout, which rewrites the session row on every
// request to move its expiry.
func NewSessionManager(pool *pgxpool.Pool, opt SessionOptions) *scs.SessionManager {
	m := scs.New()
	var ps *pgxstore.PostgresStore
	switch {
	case opt.CleanupInterval < 0:
		ps = pgxstore.NewWithCleanupInterval(pool, 0)
	case opt.CleanupInterval == 0:
		ps = pgxstore.New(pool)
	default:
		ps = pgxstore.NewWithCleanupInterval(pool, opt.CleanupInterval)
	}
	m.Store = sessionStore{PostgresStore: ps, pool: pool, find: opt.Find}
	m.Codec = codec{}
	m.Lifetime = SessionLifetime
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
	if s, ok := m.Store.(sessionStore); ok {
		s.StopCleanup()
	}
}

// Touch keeps a signed-in session's idle limit at now. A session idle for
// longer than IdleTimeout is destroyed and Touch reports false; otherwise
// the activity is recorded when the recorded one is older than touchEvery
// (or missing, as right after sign-in), and unchanged sessions are not
// written back at all.
func Touch(ctx context.Context, m *scs.SessionManager, now time.Time) (alive bool, err error) {
	seen := m.GetInt64(ctx, KeySeen)
	if seen != 0 && now.Sub(time.Unix(seen, 0)) > IdleTimeout {
		return false, m.Destroy(ctx)
	}
	if seen == 0 || now.Sub(time.Unix(seen, 0)) >= touchEvery {
		m.Put(ctx, KeySeen, now.Unix())
	}
	return true, nil
}

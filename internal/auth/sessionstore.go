package auth

import (
	"context"
	"errors"
	"time"

	"github.com/alexedwards/scs/pgxstore"
	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgxpool"
)

// sessionStore is scs's PostgreSQL store with the request's context passed
// to every query. pgxstore's own Find, Commit and Delete run under
// context.Background(), so on a hung database a request waited for the
// session row without end, past the request's time limit; with these
// methods (which scs prefers when a store has them) the wait ends with the
// request's deadline and the page answers "try again". The SQL is pgxstore's
// own, on the same sessions table.
//
// Saving a session also copies the staff member and staff_sessions row it
// signs in (KeyUserID, KeySessionID) into columns of its row, so that find
// (SessionOptions.Find) can read the session with its user in one query.
type sessionStore struct {
	*pgxstore.PostgresStore
	pool *pgxpool.Pool
	find func(ctx context.Context, token string) ([]byte, bool, error)
}

func (s sessionStore) FindCtx(ctx context.Context, token string) ([]byte, bool, error) {
	if s.find != nil {
		return s.find(ctx, token)
	}
	var b []byte
	err := s.pool.QueryRow(ctx, "SELECT data FROM sessions WHERE token = $1 AND current_timestamp < expiry", token).Scan(&b)
	if errors.Is(err, pgx.ErrNoRows) {
		return nil, false, nil
	}
	if err != nil {
		return nil, false, err
	}
	return b, true, nil
}

func (s sessionStore) CommitCtx(ctx context.Context, token string, b []byte, expiry time.Time) error {
	var userID, sessionID *int64
	if _, values, err := (codec{}).Decode(b); err == nil {
		userID, sessionID = int64Value(values, KeyUserID), int64Value(values, KeySessionID)
	}
	_, err := s.pool.Exec(ctx, `INSERT INTO sessions (token, data, expiry, user_id, staff_session_id) VALUES ($1, $2, $3, $4, $5)
		ON CONFLICT (token) DO UPDATE SET data = EXCLUDED.data, expiry = EXCLUDED.expiry,
			user_id = EXCLUDED.user_id, staff_session_id = EXCLUDED.staff_session_id`, token, b, expiry, userID, sessionID)
	return err
}

// int64Value is values[key] when it is an int64, else nil (NULL).
func int64Value(values map[string]any, key string) *int64 {
	if v, ok := values[key].(int64); ok {
		return &v
	}
	return nil
}

func (s sessionStore) DeleteCtx(ctx context.Context, token string) error {
	_, err := s.pool.Exec(ctx, "DELETE FROM sessions WHERE token = $1", token)
	return err
}

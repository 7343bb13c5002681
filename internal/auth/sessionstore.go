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
type sessionStore struct {
	*pgxstore.PostgresStore
	pool *pgxpool.Pool
}

func (s sessionStore) FindCtx(ctx context.Context, token string) ([]byte, bool, error) {
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
	_, err := s.pool.Exec(ctx, "INSERT INTO sessions (token, data, expiry) VALUES ($1, $2, $3) ON CONFLICT (token) DO UPDATE SET data = EXCLUDED.data, expiry = EXCLUDED.expiry", token, b, expiry)
	return err
}

func (s sessionStore) DeleteCtx(ctx context.Context, token string) error {
	_, err := s.pool.Exec(ctx, "DELETE FROM sessions WHERE token = $1", token)
	return err
}

package store

import (
	"context"
	"time"
)

// SignInFailures counts the failed sign-ins for an email since a moment.
func (s *Store) SignInFailures(ctx context.Context, email string, since time.Time) (int, error) {
	var n int
	err := s.Pool.QueryRow(ctx, `SELECT count(*) FROM signin_failures WHERE lower(email) = lower($1) AND at >= $2`, email, since).Scan(&n)
	return n, err
}

// RecordSignInFailure notes one failed sign-in, and forgets those older
// than a day so the table stays small.
func (s *Store) RecordSignInFailure(ctx context.Context, email string) error {
	_, err := s.Pool.Exec(ctx, `WITH gone AS (DELETE FROM signin_failures WHERE at < now() - interval '1 day')
		INSERT INTO signin_failures (email) VALUES ($1)`, email)
	return err
}

// ClearSignInFailures forgets an email's failures after a good sign-in.
func (s *Store) ClearSignInFailures(ctx context.Context, email string) error {
	_, err := s.Pool.Exec(ctx, `DELETE FROM signin_failures WHERE lower(email) = lower($1)`, email)
	return err
}

package store

import (
	"context"
	"time"
)

// SignInFailureCounts are the recent failed sign-ins that the sign-in
// throttle weighs: those of one email from one address, and those of any
// email from that address, each with the time of the latest. Now is the
// database's clock, so every app server measures waits alike.
type SignInFailureCounts struct {
	Pair, Address         int
	PairLast, AddressLast time.Time
	Now                   time.Time
}

// SignInFailures counts the failed sign-ins within window before now, for
// email (any case) from address, and for address alone.
func (s *Store) SignInFailures(ctx context.Context, email, address string, window time.Duration) (SignInFailureCounts, error) {
	var c SignInFailureCounts
	var pairLast, addrLast *time.Time
	err := s.Pool.QueryRow(ctx, `SELECT
			count(*) FILTER (WHERE lower(email) = lower($1)),
			max(at) FILTER (WHERE lower(email) = lower($1)),
			count(*), max(at), now()
		FROM signin_failures WHERE address = $2 AND at >= now() - make_interval(secs => $3)`,
		email, address, window.Seconds()).Scan(&c.Pair, &pairLast, &c.Address, &addrLast, &c.Now)
	if pairLast != nil {
		c.PairLast = *pairLast
	}
	if addrLast != nil {
		c.AddressLast = *addrLast
	}
	return c, err
}

// RecordSignInFailure notes one failed sign-in and records it in the audit
// log (with the account, when the email is one), and forgets failures
// older than a day so the table stays small.
func (s *Store) RecordSignInFailure(ctx context.Context, email, address string, userID int64, reason string) error {
	_, err := s.Pool.Exec(ctx, `WITH gone AS (DELETE FROM signin_failures WHERE at < now() - interval '1 day'),
		failed AS (INSERT INTO signin_failures (email, address) VALUES ($1, $2))
		INSERT INTO audit_log (user_id, action, entity, entity_id, detail)
		VALUES (NULL, 'sign_in_failed', 'user', $3, jsonb_build_object('email', $1::text, 'address', $2::text, 'reason', $4::text))`,
		clip(email, 254), clip(address, 64), nullID(userID), reason)
	return err
}

func nullID(id int64) *int64 {
	if id == 0 {
		return nil
	}
	return &id
}

// ClearSignInFailures forgets the failures of an email from an address
// after a good sign-in there; other addresses' failures still count.
func (s *Store) ClearSignInFailures(ctx context.Context, email, address string) error {
	_, err := s.Pool.Exec(ctx, `DELETE FROM signin_failures WHERE lower(email) = lower($1) AND address = $2`, email, address)
	return err
}

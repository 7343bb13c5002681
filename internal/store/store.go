// Package store owns Larder's PostgreSQL access: one file per aggregate
// (users, clients, body mass, training, events, settings, audit log). Every
// write that changes data records its audit row in the same transaction, so
// the log never claims a change that did not happen, nor misses one that did.
package store

import (
	"context"
	"errors"
	"strings"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgconn"
	"github.com/jackc/pgx/v5/pgxpool"
)

// Store is the application's handle on PostgreSQL.
type Store struct {
	Pool *pgxpool.Pool
	// frozen keeps decoded published versions (see FrozenVersionByID);
	// nil (a Store made without New) caches nothing.
	frozen *frozenCache
	// drafts keeps decoded drafts by id and revision (see fillDrafts).
	drafts *draftCache
	// reads writes recorded reads by group commit (see readLog).
	reads *readLog
}

// New wraps a connection pool.
func New(pool *pgxpool.Pool) *Store {
	return &Store{Pool: pool, frozen: newFrozenCache(), drafts: newDraftCache(), reads: &readLog{}}
}

// ErrNotFound is returned when a row asked for by id does not exist (or does
// not belong to the client named in the request).
var ErrNotFound = errors.New("store: not found")

// Actor identifies who makes a change, for the audit log: a staff user's id,
// or System (0) for the command line and the demo loader.
type Actor int64

// System is the actor of changes made outside a signed-in session.
const System Actor = 0

// inTx runs fn in one transaction: committed when fn returns nil, rolled back
// otherwise. Under ExpectVersion the row's version is locked and checked
// first, in the same transaction.
func (s *Store) inTx(ctx context.Context, fn func(pgx.Tx) error) error {
	return pgx.BeginFunc(ctx, s.Pool, func(tx pgx.Tx) error {
		if err := checkGuard(ctx, tx); err != nil {
			return err
		}
		return fn(tx)
	})
}

// InTx is inTx for other packages that must write several things at once
// (the demo loader); they record their own audit rows with AuditTx.
func (s *Store) InTx(ctx context.Context, fn func(pgx.Tx) error) error {
	return s.inTx(ctx, fn)
}

// Ping reports whether the database answers.
func (s *Store) Ping(ctx context.Context) error { return s.Pool.Ping(ctx) }

func isUniqueViolation(err error) bool {
	var pe *pgconn.PgError
	return errors.As(err, &pe) && pe.Code == "23505"
}

func notFound(err error) error {
	if errors.Is(err, pgx.ErrNoRows) {
		return ErrNotFound
	}
	return err
}

// likePattern turns free text into an ILIKE pattern matching it anywhere,
// with the pattern characters of the text itself escaped.
func likePattern(q string) string {
	r := strings.NewReplacer(`\`, `\\`, `%`, `\%`, `_`, `\_`)
	return "%" + r.Replace(strings.TrimSpace(q)) + "%"
}

// execOne runs a statement expected to touch exactly one row.
func execOne(ctx context.Context, tx pgx.Tx, sql string, args ...any) error {
	tag, err := tx.Exec(ctx, sql, args...)
	if err != nil {
		return err
	}
	if tag.RowsAffected() == 0 {
		return ErrNotFound
	}
	return nil
}

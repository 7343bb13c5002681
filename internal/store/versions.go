package store

import (
	"context"
	"errors"
	"fmt"

	"github.com/jackc/pgx/v5"
)

// Versioned tables and the column that names one of their rows. Each has a
// version column that a trigger raises on every update (migration 00038).
const (
	VersionBodyMass = "body_mass"
	VersionTraining = "training_sessions"
	VersionEvent    = "events"
	VersionFood     = "foods"
	VersionUser     = "users"
	VersionSetting  = "settings"
)

var versionKey = map[string]string{
	VersionBodyMass: "id", VersionTraining: "id", VersionEvent: "id",
	VersionFood: "id", VersionUser: "id", VersionSetting: "key",
}

// ErrStale is returned by a write made under ExpectVersion when the row has
// changed since the form was opened (its version is no longer the one
// expected). Nothing was written.
var ErrStale = errors.New("store: the record changed since it was loaded")

type versionGuard struct {
	table string
	key   any
	want  int
}

type guardCtxKey struct{}

// ExpectVersion returns a context under which the next write transaction of
// the store first locks the row key of table and goes on only if its version
// is want (0: the row must not exist yet, as for a setting never saved);
// otherwise it returns ErrStale. Lock and check share the write's
// transaction, so two saves from the same version cannot both pass.
func ExpectVersion(ctx context.Context, table string, key any, want int) context.Context {
	return context.WithValue(ctx, guardCtxKey{}, versionGuard{table: table, key: key, want: want})
}

// checkGuard runs the check of ExpectVersion, if ctx carries one, inside tx.
func checkGuard(ctx context.Context, tx pgx.Tx) error {
	g, ok := ctx.Value(guardCtxKey{}).(versionGuard)
	if !ok {
		return nil
	}
	col, ok := versionKey[g.table]
	if !ok {
		return fmt.Errorf("store: %q is not a versioned table", g.table)
	}
	var have int
	err := tx.QueryRow(ctx, `SELECT version FROM `+g.table+` WHERE `+col+` = $1 FOR UPDATE`, g.key).Scan(&have)
	if errors.Is(err, pgx.ErrNoRows) {
		if g.want == 0 {
			return nil
		}
		return ErrNotFound
	}
	if err != nil {
		return err
	}
	if have != g.want {
		return ErrStale
	}
	return nil
}

// RecordVersion is the current version of row key of a versioned table (0
// when there is no such row).
func (s *Store) RecordVersion(ctx context.Context, table string, key any) (int, error) {
	col, ok := versionKey[table]
	if !ok {
		return 0, fmt.Errorf("store: %q is not a versioned table", table)
	}
	var v int
	err := s.Pool.QueryRow(ctx, `SELECT version FROM `+table+` WHERE `+col+` = $1`, key).Scan(&v)
	if errors.Is(err, pgx.ErrNoRows) {
		return 0, nil
	}
	return v, err
}

package store

import (
	"context"
	"errors"

	"github.com/jackc/pgx/v5"
)

// Setting keys.
const (
	SettingPracticeName = "practice_name" // shown in every page's header and on sheets
	SettingMassUnit     = "mass_unit"     // kg or lb: the unit body masses are shown in unless a client chose one
)

// DefaultPracticeName is shown until an admin names the practice.
const DefaultPracticeName = "Larder practice"

// Setting returns a setting's value, or def when it is not set.
func (s *Store) Setting(ctx context.Context, key, def string) (string, error) {
	var v string
	err := s.Pool.QueryRow(ctx, `SELECT value FROM settings WHERE key = $1`, key).Scan(&v)
	if errors.Is(err, pgx.ErrNoRows) {
		return def, nil
	}
	if err != nil {
		return def, err
	}
	return v, nil
}

// SetSetting stores a setting's value.
func (s *Store) SetSetting(ctx context.Context, actor Actor, key, value string) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		if _, err := tx.Exec(ctx, `INSERT INTO settings (key, value) VALUES ($1, $2)
			ON CONFLICT (key) DO UPDATE SET value = excluded.value`, key, value); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "update", "setting", 0, map[string]any{"key": key, "value": value})
	})
}

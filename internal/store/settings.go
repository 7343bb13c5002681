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

// SettingValue is one setting to save.
type SettingValue struct{ Key, Value string }

// SetSettingsAt saves several settings in one transaction, each only if its
// row is still at the version in want (0: never saved); otherwise nothing is
// saved and ErrStale returned. Rows that exist are locked while they are
// checked, so two saves from the same versions of them cannot both pass.
func (s *Store) SetSettingsAt(ctx context.Context, actor Actor, want []int, values []SettingValue) error {
	if len(want) != len(values) {
		return errors.New("store: one version per setting")
	}
	return s.inTx(ctx, func(tx pgx.Tx) error {
		for i, sv := range values {
			var have int
			err := tx.QueryRow(ctx, `SELECT version FROM settings WHERE key = $1 FOR UPDATE`, sv.Key).Scan(&have)
			if err != nil && !errors.Is(err, pgx.ErrNoRows) {
				return err
			}
			if have != want[i] {
				return ErrStale
			}
		}
		for _, sv := range values {
			if _, err := tx.Exec(ctx, `INSERT INTO settings (key, value) VALUES ($1, $2)
				ON CONFLICT (key) DO UPDATE SET value = excluded.value`, sv.Key, sv.Value); err != nil {
				return err
			}
			if err := AuditTx(ctx, tx, actor, "update", "setting", 0, map[string]any{"key": sv.Key, "value": sv.Value}); err != nil {
				return err
			}
		}
		return nil
	})
}

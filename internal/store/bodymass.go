package store

import (
	"context"
	"time"

	"github.com/jackc/pgx/v5"
)

// BodyMass is one body-mass measurement. Mass is kept in kg; EnteredUnit
// remembers whether the person typed kg or lb, so the form can show it back.
type BodyMass struct {
	ID          int64
	ClientID    int64
	MeasuredOn  time.Time // date only
	MassKg      float64
	BodyFatPct  *float64
	Method      string // free text, e.g. "scale, morning fasted", "DXA", "skinfolds"
	EnteredUnit string // kg | lb
	CreatedAt   time.Time
}

const bodyMassCols = `id, client_id, measured_on, mass_kg::float8, body_fat_pct::float8, method, entered_unit, created_at`

const listBodyMassSQL = `SELECT ` + bodyMassCols + ` FROM body_mass WHERE client_id = $1
	ORDER BY measured_on DESC, id DESC`

func scanBodyMass(row pgx.Row) (BodyMass, error) {
	var m BodyMass
	err := row.Scan(&m.ID, &m.ClientID, &m.MeasuredOn, &m.MassKg, &m.BodyFatPct, &m.Method, &m.EnteredUnit, &m.CreatedAt)
	return m, notFound(err)
}

// ListBodyMass lists a client's measurements, newest first.
func (s *Store) ListBodyMass(ctx context.Context, clientID int64) ([]BodyMass, error) {
	rows, err := s.Pool.Query(ctx, listBodyMassSQL, clientID)
	if err != nil {
		return nil, err
	}
	return pgx.CollectRows(rows, func(r pgx.CollectableRow) (BodyMass, error) { return scanBodyMass(r) })
}

// LatestBodyMass returns the client's newest measurement, or ErrNotFound.
func (s *Store) LatestBodyMass(ctx context.Context, clientID int64) (BodyMass, error) {
	return scanBodyMass(s.Pool.QueryRow(ctx, `SELECT `+bodyMassCols+` FROM body_mass WHERE client_id = $1
		ORDER BY measured_on DESC, id DESC LIMIT 1`, clientID))
}

// LatestBodyFat returns the newest measurement that recorded body fat, or ErrNotFound.
func (s *Store) LatestBodyFat(ctx context.Context, clientID int64) (BodyMass, error) {
	return scanBodyMass(s.Pool.QueryRow(ctx, `SELECT `+bodyMassCols+` FROM body_mass WHERE client_id = $1
		AND body_fat_pct IS NOT NULL ORDER BY measured_on DESC, id DESC LIMIT 1`, clientID))
}

// BodyMassByID loads one measurement of a client.
func (s *Store) BodyMassByID(ctx context.Context, clientID, id int64) (BodyMass, error) {
	return scanBodyMass(s.Pool.QueryRow(ctx, `SELECT `+bodyMassCols+` FROM body_mass WHERE client_id = $1 AND id = $2`, clientID, id))
}

func bodyMassDetail(m *BodyMass) map[string]any {
	return map[string]any{"client_id": m.ClientID, "measured_on": m.MeasuredOn.Format(time.DateOnly),
		"mass_kg": m.MassKg, "body_fat_pct": m.BodyFatPct, "entered_unit": m.EnteredUnit}
}

// AddBodyMass records a measurement; m.ID is filled in.
func (s *Store) AddBodyMass(ctx context.Context, actor Actor, m *BodyMass) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		if err := tx.QueryRow(ctx, `INSERT INTO body_mass (client_id, measured_on, mass_kg, body_fat_pct, method, entered_unit)
			VALUES ($1, $2, $3, $4, $5, $6) RETURNING id, created_at`,
			m.ClientID, m.MeasuredOn, m.MassKg, m.BodyFatPct, m.Method, m.EnteredUnit).Scan(&m.ID, &m.CreatedAt); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "create", "body_mass", m.ID, bodyMassDetail(m))
	})
}

// UpdateBodyMass saves a corrected measurement.
func (s *Store) UpdateBodyMass(ctx context.Context, actor Actor, m *BodyMass) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		if err := execOne(ctx, tx, `UPDATE body_mass SET measured_on = $3, mass_kg = $4, body_fat_pct = $5, method = $6, entered_unit = $7
			WHERE client_id = $1 AND id = $2`,
			m.ClientID, m.ID, m.MeasuredOn, m.MassKg, m.BodyFatPct, m.Method, m.EnteredUnit); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "update", "body_mass", m.ID, bodyMassDetail(m))
	})
}

// DeleteBodyMass removes a measurement entered by mistake; the audit row
// keeps what it said.
func (s *Store) DeleteBodyMass(ctx context.Context, actor Actor, clientID, id int64) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		m, err := scanBodyMass(tx.QueryRow(ctx, `DELETE FROM body_mass WHERE client_id = $1 AND id = $2 RETURNING `+bodyMassCols, clientID, id))
		if err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "delete", "body_mass", id, bodyMassDetail(&m))
	})
}

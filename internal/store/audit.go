package store

import (
	"context"
	"encoding/json"
	"fmt"
	"time"

	"github.com/jackc/pgx/v5"
)

// AuditEntry is one row of the audit log.
type AuditEntry struct {
	ID       int64
	At       time.Time
	UserID   *int64
	UserName string // empty for System
	Action   string // e.g. "create", "update", "archive", "delete", "sign_in"
	Entity   string // e.g. "client", "body_mass", "user"
	EntityID *int64
	Detail   json.RawMessage
}

// AuditTx records one audit row inside tx. detail is marshalled to JSON (nil
// gives {}).
func AuditTx(ctx context.Context, tx pgx.Tx, actor Actor, action, entity string, entityID int64, detail any) error {
	if detail == nil {
		detail = map[string]any{}
	}
	b, err := json.Marshal(detail)
	if err != nil {
		return fmt.Errorf("audit detail: %w", err)
	}
	var uid, eid *int64
	if actor != System {
		v := int64(actor)
		uid = &v
	}
	if entityID != 0 {
		eid = &entityID
	}
	_, err = tx.Exec(ctx,
		`INSERT INTO audit_log (user_id, action, entity, entity_id, detail) VALUES ($1, $2, $3, $4, $5)`,
		uid, action, entity, eid, b)
	return err
}

// Audit records an event that changes no other row (for example a sign-in).
func (s *Store) Audit(ctx context.Context, actor Actor, action, entity string, entityID int64, detail any) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		return AuditTx(ctx, tx, actor, action, entity, entityID, detail)
	})
}

const auditCols = `a.id, a.at, a.user_id, coalesce(u.name, ''), a.action, a.entity, a.entity_id, a.detail`

const auditForClientSQL = `SELECT ` + auditCols + ` FROM audit_log a LEFT JOIN users u ON u.id = a.user_id
	WHERE ((a.entity = 'client' AND a.entity_id = $1) OR (a.detail->>'client_id')::bigint = $1) AND a.action <> 'view'
	ORDER BY a.at DESC, a.id DESC LIMIT $2`

func scanAudit(rows pgx.Rows) ([]AuditEntry, error) {
	return pgx.CollectRows(rows, func(r pgx.CollectableRow) (AuditEntry, error) {
		var e AuditEntry
		err := r.Scan(&e.ID, &e.At, &e.UserID, &e.UserName, &e.Action, &e.Entity, &e.EntityID, &e.Detail)
		return e, err
	})
}

// AuditFor lists the newest audit rows of one entity (e.g. "client", 12).
func (s *Store) AuditFor(ctx context.Context, entity string, entityID int64, limit int) ([]AuditEntry, error) {
	rows, err := s.Pool.Query(ctx, `SELECT `+auditCols+` FROM audit_log a LEFT JOIN users u ON u.id = a.user_id
		WHERE a.entity = $1 AND a.entity_id = $2 AND a.action <> 'view' ORDER BY a.at DESC, a.id DESC LIMIT $3`, entity, entityID, limit)
	if err != nil {
		return nil, err
	}
	return scanAudit(rows)
}

// AuditForClient lists the newest audit rows about a client or any of its
// records (body mass, training, events), which carry client_id in detail;
// reads are left out (ListReads lists those).
func (s *Store) AuditForClient(ctx context.Context, clientID int64, limit int) ([]AuditEntry, error) {
	rows, err := s.Pool.Query(ctx, auditForClientSQL, clientID, limit)
	if err != nil {
		return nil, err
	}
	return scanAudit(rows)
}

// RecentAudit lists the newest audit rows of the whole practice, reads
// left out (ListReads lists those).
func (s *Store) RecentAudit(ctx context.Context, limit int) ([]AuditEntry, error) {
	rows, err := s.Pool.Query(ctx, `SELECT `+auditCols+` FROM audit_log a LEFT JOIN users u ON u.id = a.user_id
		WHERE a.action <> 'view'
		ORDER BY a.at DESC, a.id DESC LIMIT $1`, limit)
	if err != nil {
		return nil, err
	}
	return scanAudit(rows)
}

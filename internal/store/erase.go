package store

import (
	"context"

	"github.com/jackc/pgx/v5"
)

// EraseClient deletes a client and every row of theirs — body mass,
// training, events, plans with their versions, days, feeds and food choices,
// client links, pending uploads (all by ON DELETE CASCADE) — and the audit
// rows that describe them, which hold their health data. What stays is one
// tombstone: who erased which client id, and when, with no name and no
// health data. Archiving is the default way to put a client aside; erasure
// is for a client who asks for it.
func (s *Store) EraseClient(ctx context.Context, actor Actor, id int64) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		var exists bool
		if err := tx.QueryRow(ctx, `SELECT true FROM clients WHERE id = $1 FOR UPDATE`, id).Scan(&exists); err != nil {
			return notFound(err)
		}
		// Audit rows about the client, its records (which carry client_id),
		// its plans and its links (named by their own ids).
		if _, err := tx.Exec(ctx, `DELETE FROM audit_log a WHERE
			(a.entity = 'client' AND a.entity_id = $1)
			OR (a.detail ? 'client_id' AND a.detail->>'client_id' = $1::text)
			OR (a.entity = 'plan' AND a.entity_id IN (SELECT id FROM plans WHERE client_id = $1))
			OR (a.entity = 'client_link' AND a.entity_id IN (SELECT id FROM client_links WHERE client_id = $1))`, id); err != nil {
			return err
		}
		if _, err := tx.Exec(ctx, `DELETE FROM clients WHERE id = $1`, id); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "erase", "client", id, nil)
	})
}

package store

import (
	"context"
	"time"

	"github.com/jackc/pgx/v5"
)

// DietaryNeeds are a client's recorded dietary needs: codes of menu.Needs
// and a free-text line. ConfirmedAt is when a dietitian last saved them;
// until then the needs named in the recorded cautions apply as well.
type DietaryNeeds struct {
	Codes       []string
	Other       string
	ConfirmedAt *time.Time
	Revision    int
}

// Confirmed tells whether a dietitian has saved the needs at least once.
func (d DietaryNeeds) Confirmed() bool { return d.ConfirmedAt != nil }

const dietaryNeedsSQL = `SELECT dietary_needs, dietary_needs_other, dietary_needs_confirmed_at, dietary_needs_revision
	FROM clients WHERE id = $1`

// ClientDietaryNeeds loads a client's dietary needs.
func (s *Store) ClientDietaryNeeds(ctx context.Context, clientID int64) (DietaryNeeds, error) {
	var d DietaryNeeds
	err := s.Pool.QueryRow(ctx, dietaryNeedsSQL, clientID).Scan(&d.Codes, &d.Other, &d.ConfirmedAt, &d.Revision)
	return d, notFound(err)
}

// SaveDietaryNeeds records a client's dietary needs, provided the caller
// edited revision `revision` of them (ErrStaleRevision otherwise; nothing
// is written). The audit row keeps the codes, not the free text.
func (s *Store) SaveDietaryNeeds(ctx context.Context, actor Actor, clientID int64, revision int, d DietaryNeeds) error {
	if d.Codes == nil {
		d.Codes = []string{}
	}
	return s.inTx(ctx, func(tx pgx.Tx) error {
		var current int
		if err := tx.QueryRow(ctx, `SELECT dietary_needs_revision FROM clients WHERE id = $1 FOR UPDATE`, clientID).Scan(&current); err != nil {
			return notFound(err)
		}
		if current != revision {
			return ErrStaleRevision
		}
		if _, err := tx.Exec(ctx, `UPDATE clients SET dietary_needs = $2, dietary_needs_other = $3,
			dietary_needs_confirmed_at = now(), dietary_needs_revision = dietary_needs_revision + 1 WHERE id = $1`,
			clientID, d.Codes, d.Other); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "update", "client_dietary_needs", clientID, map[string]any{"needs": d.Codes})
	})
}

// ClientDrafts loads the draft versions of a client's plans.
func (s *Store) ClientDrafts(ctx context.Context, clientID int64) ([]PlanVersion, error) {
	rows, err := s.Pool.Query(ctx, `SELECT `+versionCols+versionFrom+`JOIN plans p ON p.id = v.plan_id
		WHERE p.client_id = $1 AND v.status = 'draft' ORDER BY v.id`, clientID)
	if err != nil {
		return nil, err
	}
	return pgx.CollectRows(rows, func(r pgx.CollectableRow) (PlanVersion, error) { return scanVersion(r) })
}

// SetDraftSuggestions replaces the food suggestions stored with a draft's
// feeds (by FeedKey), as when the client's dietary needs change; the
// draft's figures and revision stay as they are. A version that is no
// longer a draft is left alone (ErrNotDraft).
func (s *Store) SetDraftSuggestions(ctx context.Context, versionID int64, sugg map[string]string) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		var status string
		if err := tx.QueryRow(ctx, `SELECT status FROM plan_versions WHERE id = $1 FOR UPDATE`, versionID).Scan(&status); err != nil {
			return notFound(err)
		}
		if status != PlanDraft {
			return ErrNotDraft
		}
		rows, err := tx.Query(ctx, `SELECT id, kind, on_date::text, feed_index FROM plan_feeds WHERE plan_version_id = $1`, versionID)
		if err != nil {
			return err
		}
		type feed struct {
			id   int64
			text string
		}
		var feeds []feed
		for rows.Next() {
			var id int64
			var kind, date string
			var i int
			if err := rows.Scan(&id, &kind, &date, &i); err != nil {
				rows.Close()
				return err
			}
			feeds = append(feeds, feed{id, sugg[FeedKey(kind, date, i)]})
		}
		rows.Close()
		if err := rows.Err(); err != nil {
			return err
		}
		b := &pgx.Batch{}
		for _, f := range feeds {
			b.Queue(`UPDATE plan_feeds SET suggestion = $2 WHERE id = $1`, f.id, f.text)
		}
		return tx.SendBatch(ctx, b).Close()
	})
}

package store

import (
	"context"
	"errors"
	"time"

	"github.com/jackc/pgx/v5"
)

// ClientLink is a client's personal link. The token itself is never
// stored; TokenHash is its SHA-256 (see auth.NewLinkToken).
type ClientLink struct {
	ID            int64
	ClientID      int64
	TokenHash     []byte
	Label         string
	CreatedBy     *int64
	CreatedByName string
	CreatedAt     time.Time
	ExpiresAt     time.Time
	RevokedAt     *time.Time
	LastUsedAt    *time.Time
}

// Client link statuses, as of a moment.
const (
	LinkActive  = "active"
	LinkExpired = "expired"
	LinkRevoked = "revoked"
)

// Status is the link's state at now: revoked wins over expired.
func (l ClientLink) Status(now time.Time) string {
	switch {
	case l.RevokedAt != nil:
		return LinkRevoked
	case !now.Before(l.ExpiresAt):
		return LinkExpired
	default:
		return LinkActive
	}
}

// ErrLinkRevoked is returned when revoking a link that is already revoked.
var ErrLinkRevoked = errors.New("store: the link is already revoked")

const linkCols = `l.id, l.client_id, l.token_hash, l.label, l.created_by, coalesce(u.name, ''), l.created_at, l.expires_at, l.revoked_at, l.last_used_at`

const linkFrom = ` FROM client_links l LEFT JOIN users u ON u.id = l.created_by `

func linkDest(l *ClientLink) []any {
	return []any{&l.ID, &l.ClientID, &l.TokenHash, &l.Label, &l.CreatedBy, &l.CreatedByName, &l.CreatedAt, &l.ExpiresAt, &l.RevokedAt, &l.LastUsedAt}
}

// CreateClientLink records a link of l.ClientID with l.TokenHash, l.Label,
// l.CreatedAt and l.ExpiresAt; l.ID is filled in. The audit row names the
// client and the expiry, never the token or its hash.
func (s *Store) CreateClientLink(ctx context.Context, actor Actor, l *ClientLink) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		l.CreatedBy = actorID(actor)
		if err := tx.QueryRow(ctx, `INSERT INTO client_links (client_id, token_hash, label, created_by, created_at, expires_at)
			VALUES ($1, $2, $3, $4, $5, $6) RETURNING id`,
			l.ClientID, l.TokenHash, l.Label, l.CreatedBy, l.CreatedAt, l.ExpiresAt).Scan(&l.ID); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "create", "client_link", l.ID, map[string]any{
			"client_id": l.ClientID, "label": l.Label, "expires_at": l.ExpiresAt.UTC().Format(time.RFC3339)})
	})
}

// ClientLinks lists a client's links, newest first.
func (s *Store) ClientLinks(ctx context.Context, clientID int64) ([]ClientLink, error) {
	return collectLinks(s.Pool.Query(ctx, clientLinksSQL, clientID))
}

const clientLinksSQL = `SELECT ` + linkCols + linkFrom + `WHERE l.client_id = $1 ORDER BY l.created_at DESC, l.id DESC`

func collectLinks(rows pgx.Rows, err error) ([]ClientLink, error) {
	if err != nil {
		return nil, err
	}
	return pgx.CollectRows(rows, func(r pgx.CollectableRow) (ClientLink, error) {
		var l ClientLink
		err := r.Scan(linkDest(&l)...)
		return l, err
	})
}

// RevokeClientLink revokes link id of a client at `at`; ErrNotFound when
// the client has no such link, ErrLinkRevoked when it was revoked before.
func (s *Store) RevokeClientLink(ctx context.Context, actor Actor, clientID, id int64, at time.Time) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		var revoked *time.Time
		var label string
		if err := tx.QueryRow(ctx, `SELECT revoked_at, label FROM client_links WHERE client_id = $1 AND id = $2 FOR UPDATE`,
			clientID, id).Scan(&revoked, &label); err != nil {
			return notFound(err)
		}
		if revoked != nil {
			return ErrLinkRevoked
		}
		if _, err := tx.Exec(ctx, `UPDATE client_links SET revoked_at = $2 WHERE id = $1`, id, at); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "revoke", "client_link", id, map[string]any{"client_id": clientID, "label": label})
	})
}

// PublishedPlan is a plan with its published version.
type PublishedPlan struct {
	Plan    Plan
	Version PlanVersion
	// Suggestions are the food suggestions stored with the version's feeds,
	// by FeedKey.
	Suggestions map[string]string
}

package store

import (
	"context"
	"time"

	"github.com/jackc/pgx/v5"

	"larder/internal/mass"
)

// LinkUseEvery is how often a link's last use is written: a client
// reloading the phone page all day costs one write an hour, not one a
// view, and the staff still see the hour it was last opened.
const LinkUseEvery = time.Hour

// LinkOpen is everything a client's link opens, read in one round trip:
// the link, the few fields of its client the public pages show, the
// practice's name and the client's published plans. The recorded cautions
// are not among them: only the note the dietitian shared reaches the
// athlete, and what is never read cannot leak.
type LinkOpen struct {
	Link       ClientLink // without CreatedByName
	ClientName string
	// SharedNote is the health note the dietitian chose to share.
	SharedNote string
	// ShowFigures: the dietitian chose to show energy and body-mass figures.
	ShowFigures bool
	// MassUnit is the unit the client's body masses are shown in.
	MassUnit     mass.Unit
	PracticeName string
	Plans        []PublishedRef // oldest plan first
}

// PublishedRef names a plan's published version; FrozenVersionByID loads
// its content.
type PublishedRef struct {
	Plan      Plan
	VersionID int64
	// EventName is the name of the plan's event, "" when it has none.
	EventName string
}

// OpenClientLink finds the link whose token hashes to hash and that is
// neither revoked nor expired at now, of a client who is not archived,
// with what its pages show. Any other case (unknown, expired, revoked,
// archived client) is ErrNotFound alike, so callers cannot tell them apart
// and neither can the person holding the link. The link's use is recorded
// when none was recorded within LinkUseEvery.
//
// The plans are joined LATERAL to the link, so the link found by its token
// drives the lookup whatever the planner knows of the tables: with a plain
// join and no statistics (a young database of a few clients) PostgreSQL
// read every client's plans first and kept the one whose link matched,
// twice the buffers and half the speed of this form.
func (s *Store) OpenClientLink(ctx context.Context, hash []byte, now time.Time) (LinkOpen, error) {
	rows, err := s.Pool.Query(ctx, `SELECT l.id, l.client_id, l.token_hash, l.label, l.created_by, l.created_at, l.expires_at,
			l.revoked_at, l.last_used_at, c.name, c.shared_note, c.athlete_sees_energy_mass,
			coalesce(c.mass_unit, (SELECT value FROM settings WHERE key = 'mass_unit'), 'kg'),
			coalesce((SELECT value FROM settings WHERE key = $3), $4),
			p.id, p.event_id, p.kind, p.protocol, p.title, p.created_by, p.created_at, p.updated_at, p.version_id, coalesce(p.event_name, '')
		FROM client_links l JOIN clients c ON c.id = l.client_id
		LEFT JOIN LATERAL (SELECT p.id, p.event_id, p.kind, p.protocol, p.title, p.created_by, p.created_at, p.updated_at,
				v.id AS version_id, e.name AS event_name
			FROM plans p JOIN plan_versions v ON v.plan_id = p.id AND v.status = 'published'
			LEFT JOIN events e ON e.id = p.event_id AND e.client_id = p.client_id
			WHERE p.client_id = l.client_id) p ON true
		WHERE l.token_hash = $1 AND l.revoked_at IS NULL AND l.expires_at > $2 AND c.archived_at IS NULL
		ORDER BY p.created_at, p.id`, hash, now, SettingPracticeName, DefaultPracticeName)
	if err != nil {
		return LinkOpen{}, err
	}
	var o LinkOpen
	found := false
	for rows.Next() {
		l := &o.Link
		var pid, vid *int64
		var kind, protocol, title *string
		var created, updated *time.Time
		var p Plan
		var event string
		if err := rows.Scan(&l.ID, &l.ClientID, &l.TokenHash, &l.Label, &l.CreatedBy, &l.CreatedAt, &l.ExpiresAt,
			&l.RevokedAt, &l.LastUsedAt, &o.ClientName, &o.SharedNote, &o.ShowFigures, &o.MassUnit, &o.PracticeName,
			&pid, &p.EventID, &kind, &protocol, &title, &p.CreatedBy, &created, &updated, &vid, &event); err != nil {
			rows.Close()
			return LinkOpen{}, err
		}
		found = true
		if pid == nil || vid == nil {
			continue // the client has no published plan
		}
		p.ID, p.ClientID, p.Kind, p.Protocol, p.Title, p.CreatedAt, p.UpdatedAt = *pid, l.ClientID, *kind, *protocol, *title, *created, *updated
		o.Plans = append(o.Plans, PublishedRef{Plan: p, VersionID: *vid, EventName: event})
	}
	if err := rows.Err(); err != nil {
		return LinkOpen{}, err
	}
	if !found {
		return LinkOpen{}, ErrNotFound
	}
	if l := o.Link; l.LastUsedAt == nil || !now.Before(l.LastUsedAt.Add(LinkUseEvery)) {
		if err := s.recordLinkUse(ctx, l.ID, now); err != nil {
			return LinkOpen{}, err
		}
		o.Link.LastUsedAt = &now
	}
	return o, nil
}

// recordLinkUse writes now as the link's last use unless another view (on
// this app server or another) recorded one within LinkUseEvery meanwhile.
func (s *Store) recordLinkUse(ctx context.Context, id int64, now time.Time) error {
	_, err := s.Pool.Exec(ctx, `UPDATE client_links SET last_used_at = $2
		WHERE id = $1 AND (last_used_at IS NULL OR last_used_at <= $3)`, id, now, now.Add(-LinkUseEvery))
	return err
}

// PublishedPlans loads every plan of a client that has a published version,
// with that version and its stored food suggestions, oldest plan first.
// Drafts and superseded versions are never part of it. Versions come from
// the cache of frozen versions when they are there.
func (s *Store) PublishedPlans(ctx context.Context, clientID int64) ([]PublishedPlan, error) {
	rows, err := s.Pool.Query(ctx, `SELECT `+planCols+`, v.id FROM plans p
		JOIN plan_versions v ON v.plan_id = p.id AND v.status = 'published'
		WHERE p.client_id = $1 ORDER BY p.created_at, p.id`, clientID)
	if err != nil {
		return nil, err
	}
	refs, err := pgx.CollectRows(rows, func(r pgx.CollectableRow) (PublishedRef, error) {
		var ref PublishedRef
		err := r.Scan(append(planDest(&ref.Plan), &ref.VersionID)...)
		return ref, err
	})
	if err != nil {
		return nil, err
	}
	return s.LoadPublished(ctx, refs)
}

// LoadPublished loads the versions refs name (from the cache when there),
// as published plans. A version superseded since refs were read is
// still returned: the caller saw it as published a moment ago.
func (s *Store) LoadPublished(ctx context.Context, refs []PublishedRef) ([]PublishedPlan, error) {
	out := make([]PublishedPlan, 0, len(refs))
	for _, ref := range refs {
		fv, err := s.FrozenVersionByID(ctx, ref.VersionID)
		if err != nil {
			return nil, err
		}
		v := fv.Version
		v.Status = PlanPublished
		out = append(out, PublishedPlan{Plan: ref.Plan, Version: v, Suggestions: fv.Suggestions})
	}
	return out, nil
}

package store

import (
	"context"
	"time"

	"github.com/jackc/pgx/v5"

	"larder/internal/menu"
)

// Reads gathers independent reads of one page and sends them to the
// database together, as one pgx batch: one round trip instead of one per
// list, and one snapshot, since the batch runs as one implicit
// transaction. Queue each read with the methods below (each fills its
// destination), then call Store.Read. A Reads is used once.
type Reads struct {
	b pgx.Batch
	// after runs once the batch is read, in order: work that needs its
	// results (the cached content of frozen versions).
	after []func(ctx context.Context, s *Store) error
}

// Read sends the queued reads and fills their destinations. The first
// error is returned (ErrNotFound when a single row asked for is missing).
func (s *Store) Read(ctx context.Context, r *Reads) error {
	if r.b.Len() > 0 {
		if err := s.Pool.SendBatch(ctx, &r.b).Close(); err != nil {
			return err
		}
	}
	for _, fn := range r.after {
		if err := fn(ctx, s); err != nil {
			return err
		}
	}
	return nil
}

func (r *Reads) rows(sql string, fn func(pgx.Rows) error, args ...any) {
	r.b.Queue(sql, args...).Query(fn)
}

func (r *Reads) row(sql string, fn func(pgx.Row) error, args ...any) {
	r.b.Queue(sql, args...).QueryRow(fn)
}

// Client reads a client (ClientByID).
func (r *Reads) Client(id int64, dst *Client) {
	r.row(clientByIDSQL, func(row pgx.Row) error { return notFound(row.Scan(clientDest(dst)...)) }, id)
}

// DietaryNeeds reads a client's dietary needs (ClientDietaryNeeds).
func (r *Reads) DietaryNeeds(clientID int64, dst *DietaryNeeds) {
	r.row(dietaryNeedsSQL, func(row pgx.Row) error {
		return notFound(row.Scan(&dst.Codes, &dst.Other, &dst.ConfirmedAt, &dst.Revision))
	}, clientID)
}

// BodyMass reads a client's body-mass history (ListBodyMass).
func (r *Reads) BodyMass(clientID int64, dst *[]BodyMass) {
	r.rows(listBodyMassSQL, func(rows pgx.Rows) (err error) {
		*dst, err = pgx.CollectRows(rows, func(r pgx.CollectableRow) (BodyMass, error) { return scanBodyMass(r) })
		return err
	}, clientID)
}

// Training reads a client's training log (ListTraining).
func (r *Reads) Training(clientID int64, dst *[]TrainingSession) {
	r.rows(listTrainingSQL, func(rows pgx.Rows) (err error) {
		*dst, err = collectTraining(rows, nil)
		return err
	}, clientID)
}

// TrainingBetween reads a client's sessions between two dates (TrainingBetween).
func (r *Reads) TrainingBetween(clientID int64, from, to time.Time, dst *[]TrainingSession) {
	r.rows(trainingBetweenSQL, func(rows pgx.Rows) (err error) {
		*dst, err = collectTraining(rows, nil)
		return err
	}, clientID, from.Format(time.DateOnly), to.Format(time.DateOnly))
}

// RecentTraining reads a client's sessions from one date to another (both
// included), newest first as Training lists them, and how many sessions
// the whole log holds: the client page shows a window of a log that grows
// without bound, and offers the rest by its count.
func (r *Reads) RecentTraining(clientID int64, from, to time.Time, dst *[]TrainingSession, total *int) {
	r.rows(recentTrainingSQL, func(rows pgx.Rows) (err error) {
		*dst, err = collectTraining(rows, nil)
		return err
	}, clientID, from.Format(time.DateOnly), to.Format(time.DateOnly))
	r.row(countTrainingSQL, func(row pgx.Row) error { return row.Scan(total) }, clientID)
}

// Events reads a client's events (ListEvents).
func (r *Reads) Events(clientID int64, dst *[]Event) {
	r.rows(listEventsSQL, func(rows pgx.Rows) (err error) {
		*dst, err = pgx.CollectRows(rows, func(r pgx.CollectableRow) (Event, error) { return scanEvent(r) })
		return err
	}, clientID)
}

// AuditForClient reads the newest changes to a client's records (AuditForClient).
func (r *Reads) AuditForClient(clientID int64, limit int, dst *[]AuditEntry) {
	r.rows(auditForClientSQL, func(rows pgx.Rows) (err error) {
		*dst, err = scanAudit(rows)
		return err
	}, clientID, limit)
}

// Plans reads a client's plans (ListPlans).
func (r *Reads) Plans(clientID int64, dst *[]PlanRow) {
	r.rows(listPlansSQL, func(rows pgx.Rows) (err error) {
		*dst, err = collectPlanRows(rows, nil)
		return err
	}, clientID)
}

// ClientLinks reads a client's links (ClientLinks).
func (r *Reads) ClientLinks(clientID int64, dst *[]ClientLink) {
	r.rows(clientLinksSQL, func(rows pgx.Rows) (err error) {
		*dst, err = collectLinks(rows, nil)
		return err
	}, clientID)
}

// Plan reads a plan of a client (PlanByID).
func (r *Reads) Plan(clientID, id int64, dst *Plan) {
	r.row(planByIDSQL, func(row pgx.Row) error { return notFound(row.Scan(planDest(dst)...)) }, clientID, id)
}

// PlanVersions reads a plan's versions, newest first (PlanVersions), for
// a page to show: their content comes from the caches of frozen versions
// and of drafts (read after the batch when it is not there yet), and is
// shared with them: read it, never modify it.
func (r *Reads) PlanVersions(planID int64, dst *[]PlanVersion) {
	var frozen, drafts []int
	r.rows(planVersionsBareSQL, func(rows pgx.Rows) error {
		var err error
		*dst, frozen, drafts, err = collectListedVersions(rows)
		return err
	}, planID)
	r.after = append(r.after, func(ctx context.Context, s *Store) error {
		if err := s.fillFrozen(ctx, *dst, frozen); err != nil {
			return err
		}
		return s.fillDrafts(ctx, *dst, drafts)
	})
}

// DraftSuggestions reads the food plan of each feed (FeedSuggestions: the
// dietitian's choice, else the stored suggestion) of a plan's version
// number `version` when it is a draft; a frozen version's come from the
// cache, so dst stays empty for one.
func (r *Reads) DraftSuggestions(planID int64, version int, dst *map[string]string) {
	r.rows(feedPlansSelect+`WHERE f.plan_version_id = (SELECT id FROM plan_versions
		WHERE plan_id = $1 AND version = $2 AND status = 'draft')`+feedPlansOrder, func(rows pgx.Rows) (err error) {
		*dst, err = collectFeedPlans(rows)
		return err
	}, planID, version)
}

// FeedChoices reads the dietitian's food choices of a plan's version number
// `version` (FeedChoices).
func (r *Reads) FeedChoices(planID int64, version int, dst *map[string][]menu.ChoiceLine) {
	r.rows(feedChoicesSelect+`WHERE plan_version_id = (SELECT id FROM plan_versions
		WHERE plan_id = $1 AND version = $2)`+feedChoicesOrder, func(rows pgx.Rows) (err error) {
		*dst, err = collectFeedChoices(rows)
		return err
	}, planID, version)
}

package store

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"time"

	"github.com/jackc/pgx/v5"

	"larder/internal/fuel"
	"larder/internal/menu"
)

// Plan statuses of a version.
const (
	PlanDraft      = "draft"
	PlanPublished  = "published"
	PlanSuperseded = "superseded"
)

// Plan is a client's plan; its content lives in numbered versions.
type Plan struct {
	ID        int64
	ClientID  int64
	EventID   *int64
	Kind      string // loading | race | repletion | week
	Protocol  string // two-day | one-day | three-day, or empty
	Title     string
	CreatedBy *int64
	CreatedAt time.Time
	UpdatedAt time.Time
}

// PlanVersion is one version of a plan.
type PlanVersion struct {
	ID            int64
	PlanID        int64
	Version       int
	Status        string
	Request       fuel.Request
	Result        fuel.Plan
	BodyMassKg    float64
	BodyMassOn    *time.Time // date of the measurement used; nil when typed in
	Revision      int
	CreatedByName string
	CreatedAt     time.Time
	UpdatedByName string
	UpdatedAt     time.Time
	PublishedAt   *time.Time
	Notes         PlanNotes // the dietitian's notes to the athlete
}

// PlanContent is what a save writes into a draft version.
type PlanContent struct {
	Request    fuel.Request
	Result     fuel.Plan
	BodyMassKg float64
	BodyMassOn *time.Time
	// Suggestions are the food suggestions shown with feeds, keyed by
	// FeedKey; they are kept in plan_feeds for the sheet.
	Suggestions map[string]string
	// Notes to the athlete; nil keeps the version's notes as they are.
	Notes *PlanNotes
}

// FeedKey names one feed of a plan for Suggestions: kind is "day",
// "pre_event" or "repletion"; index is 0-based within the day (or the
// repletion window).
func FeedKey(kind, date string, index int) string { return menu.FeedKey(kind, date, index) }

// PlanRow is a plan as listed on a client's page.
type PlanRow struct {
	Plan
	ClientName       string
	LatestVersion    int
	LatestStatus     string
	PublishedVersion *int
	UpdatedAt        time.Time
}

// Errors of plan saves.
var (
	// ErrStaleRevision: someone else saved the draft since it was opened.
	ErrStaleRevision = errors.New("store: the draft was changed by someone else since you opened it")
	// ErrNotDraft: the version is published or superseded and cannot change.
	ErrNotDraft = errors.New("store: this version is no longer a draft")
)

const planCols = `p.id, p.client_id, p.event_id, p.kind, p.protocol, p.title, p.created_by, p.created_at, p.updated_at`

func planDest(p *Plan) []any {
	return []any{&p.ID, &p.ClientID, &p.EventID, &p.Kind, &p.Protocol, &p.Title, &p.CreatedBy, &p.CreatedAt, &p.UpdatedAt}
}

const versionCols = `v.id, v.plan_id, v.version, v.status, v.request, v.result, v.body_mass_kg::float8, v.body_mass_on,
	v.revision, coalesce(cu.name, ''), v.created_at, coalesce(uu.name, ''), v.updated_at, v.published_at, v.athlete_notes`

const versionFrom = ` FROM plan_versions v LEFT JOIN users cu ON cu.id = v.created_by LEFT JOIN users uu ON uu.id = v.updated_by `

func scanVersion(row pgx.Row) (PlanVersion, error) {
	v, req, res, err := scanVersionRow(row)
	if err != nil {
		return v, err
	}
	return v, decodeContent(&v, req, res)
}

// scanVersionRow scans a row of versionCols (or versionListCols), leaving
// the request and result as the JSON read, for the caller to decode or to
// take from the cache.
func scanVersionRow(row pgx.Row) (v PlanVersion, req, res []byte, err error) {
	err = row.Scan(&v.ID, &v.PlanID, &v.Version, &v.Status, &req, &res, &v.BodyMassKg, &v.BodyMassOn,
		&v.Revision, &v.CreatedByName, &v.CreatedAt, &v.UpdatedByName, &v.UpdatedAt, &v.PublishedAt, &v.Notes)
	return v, req, res, notFound(err)
}

func actorID(a Actor) *int64 {
	if a == System {
		return nil
	}
	v := int64(a)
	return &v
}

// CreatePlan records a plan with its first version as a draft; p.ID is
// filled in and the new version returned.
func (s *Store) CreatePlan(ctx context.Context, actor Actor, p *Plan, c PlanContent) (PlanVersion, error) {
	var v PlanVersion
	err := s.inTx(ctx, func(tx pgx.Tx) error {
		if err := tx.QueryRow(ctx, `INSERT INTO plans (client_id, event_id, kind, protocol, title, created_by)
			VALUES ($1, $2, $3, $4, $5, $6) RETURNING id, created_at, updated_at`,
			p.ClientID, p.EventID, p.Kind, p.Protocol, p.Title, actorID(actor)).Scan(&p.ID, &p.CreatedAt, &p.UpdatedAt); err != nil {
			return err
		}
		id, err := insertVersion(ctx, tx, actor, p.ID, 1, c)
		if err != nil {
			return err
		}
		if err := AuditTx(ctx, tx, actor, "create", "plan", p.ID, map[string]any{"client_id": p.ClientID, "kind": p.Kind, "title": p.Title, "version": 1}); err != nil {
			return err
		}
		v, err = scanVersion(tx.QueryRow(ctx, `SELECT `+versionCols+versionFrom+`WHERE v.id = $1`, id))
		return err
	})
	return v, err
}

func insertVersion(ctx context.Context, tx pgx.Tx, actor Actor, planID int64, number int, c PlanContent) (int64, error) {
	req, res, err := marshalContent(c)
	if err != nil {
		return 0, err
	}
	var id int64
	notes := PlanNotes{}
	if c.Notes != nil {
		notes = *c.Notes
	}
	if err := tx.QueryRow(ctx, `INSERT INTO plan_versions (plan_id, version, status, request, result, body_mass_kg, body_mass_on, created_by, updated_by, athlete_notes)
		VALUES ($1, $2, 'draft', $3, $4, $5, $6, $7, $7, $8) RETURNING id`,
		planID, number, req, res, c.BodyMassKg, c.BodyMassOn, actorID(actor), notes).Scan(&id); err != nil {
		return 0, err
	}
	return id, writeRows(ctx, tx, id, c)
}

func marshalContent(c PlanContent) (req, res []byte, err error) {
	if req, err = json.Marshal(c.Request); err != nil {
		return nil, nil, fmt.Errorf("plan request: %w", err)
	}
	if res, err = json.Marshal(c.Result); err != nil {
		return nil, nil, fmt.Errorf("plan result: %w", err)
	}
	return req, res, nil
}

// writeRows replaces the flattened days and feeds of a draft version.
func writeRows(ctx context.Context, tx pgx.Tx, versionID int64, c PlanContent) error {
	if _, err := tx.Exec(ctx, `DELETE FROM plan_days WHERE plan_version_id = $1`, versionID); err != nil {
		return err
	}
	if _, err := tx.Exec(ctx, `DELETE FROM plan_feeds WHERE plan_version_id = $1`, versionID); err != nil {
		return err
	}
	b := &pgx.Batch{}
	feed := func(kind, date string, i int, f fuel.Feed) {
		b.Queue(`INSERT INTO plan_feeds (plan_version_id, kind, on_date, feed_index, at, label, cho_g, protein_g, overridden, suggestion)
			VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10)`,
			versionID, kind, date, i, f.At, f.Label, f.ChoG, f.ProteinG, f.Overridden, c.Suggestions[FeedKey(kind, date, i)])
	}
	for _, d := range c.Result.Days {
		b.Queue(`INSERT INTO plan_days (plan_version_id, on_date, role, load_band, training_min, cho_g_per_kg, cho_g, protein_g, fat_g, energy_kcal, low_fibre, overridden)
			VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12)`,
			versionID, d.Date, d.Role, d.LoadBand, d.TrainingMin, d.ChoGPerKg, d.ChoG, d.ProteinG, d.FatG, d.EnergyKcal, d.LowFibre, d.Overridden)
		for i, f := range d.Feeds {
			feed("day", d.Date, i, f)
		}
	}
	if m := c.Result.PreEventMeal; m != nil {
		feed("pre_event", menu.FeedDate(c.Result, m.At), 0, fuel.Feed{At: m.At, Label: "pre-event meal", ChoG: m.ChoG})
	}
	if r := c.Result.Repletion; r != nil {
		for i, f := range r.Feeds {
			feed("repletion", menu.FeedDate(c.Result, f.At), i, f)
		}
	}
	return tx.SendBatch(ctx, b).Close()
}

// SaveDraft writes new content into a draft version, provided the caller
// edited revision `revision` of it. It returns the version as saved, or
// ErrStaleRevision when someone saved in between (nothing is written), or
// ErrNotDraft when the version has been published meanwhile.
func (s *Store) SaveDraft(ctx context.Context, actor Actor, versionID int64, revision int, c PlanContent) (PlanVersion, error) {
	var v PlanVersion
	err := s.inTx(ctx, func(tx pgx.Tx) error {
		if err := lockDraft(ctx, tx, versionID, revision); err != nil {
			return err
		}
		req, res, err := marshalContent(c)
		if err != nil {
			return err
		}
		if _, err := tx.Exec(ctx, `UPDATE plan_versions SET request = $2, result = $3, body_mass_kg = $4, body_mass_on = $5,
			revision = revision + 1, updated_by = $6, updated_at = now(), athlete_notes = coalesce($7, athlete_notes) WHERE id = $1`,
			versionID, req, res, c.BodyMassKg, c.BodyMassOn, actorID(actor), c.Notes); err != nil {
			return err
		}
		if err := writeRows(ctx, tx, versionID, c); err != nil {
			return err
		}
		if v, err = scanVersion(tx.QueryRow(ctx, `SELECT `+versionCols+versionFrom+`WHERE v.id = $1`, versionID)); err != nil {
			return err
		}
		if _, err := tx.Exec(ctx, `UPDATE plans SET updated_at = now() WHERE id = $1`, v.PlanID); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "update", "plan", v.PlanID, map[string]any{"version": v.Version, "revision": v.Revision})
	})
	return v, err
}

// lockDraft locks a draft version row and checks the caller's revision.
func lockDraft(ctx context.Context, tx pgx.Tx, versionID int64, revision int) error {
	var status string
	var current int
	if err := tx.QueryRow(ctx, `SELECT status, revision FROM plan_versions WHERE id = $1 FOR UPDATE`, versionID).Scan(&status, &current); err != nil {
		return notFound(err)
	}
	if status != PlanDraft {
		return ErrNotDraft
	}
	if current != revision {
		return ErrStaleRevision
	}
	return nil
}

// Publish saves content into the draft (under the same revision check as
// SaveDraft) and publishes it; the previously published version, if any,
// becomes superseded and stays readable.
func (s *Store) Publish(ctx context.Context, actor Actor, versionID int64, revision int, c PlanContent) (PlanVersion, error) {
	var v PlanVersion
	err := s.inTx(ctx, func(tx pgx.Tx) error {
		if err := lockDraft(ctx, tx, versionID, revision); err != nil {
			return err
		}
		req, res, err := marshalContent(c)
		if err != nil {
			return err
		}
		var planID int64
		if err := tx.QueryRow(ctx, `SELECT plan_id FROM plan_versions WHERE id = $1`, versionID).Scan(&planID); err != nil {
			return err
		}
		if _, err := tx.Exec(ctx, `UPDATE plan_versions SET status = 'superseded' WHERE plan_id = $1 AND status = 'published'`, planID); err != nil {
			return err
		}
		if _, err := tx.Exec(ctx, `UPDATE plan_versions SET request = $2, result = $3, body_mass_kg = $4, body_mass_on = $5,
			revision = revision + 1, updated_by = $6, updated_at = now(), athlete_notes = coalesce($7, athlete_notes) WHERE id = $1`,
			versionID, req, res, c.BodyMassKg, c.BodyMassOn, actorID(actor), c.Notes); err != nil {
			return err
		}
		if err := writeRows(ctx, tx, versionID, c); err != nil {
			return err
		}
		if _, err := tx.Exec(ctx, `UPDATE plan_versions SET status = 'published', published_at = now(), published_by = $2 WHERE id = $1`,
			versionID, actorID(actor)); err != nil {
			return err
		}
		if _, err := tx.Exec(ctx, `UPDATE plans SET updated_at = now() WHERE id = $1`, planID); err != nil {
			return err
		}
		if v, err = scanVersion(tx.QueryRow(ctx, `SELECT `+versionCols+versionFrom+`WHERE v.id = $1`, versionID)); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "publish", "plan", planID, map[string]any{"version": v.Version})
	})
	return v, err
}

// NewVersion starts a new draft version of a plan from the content of
// version `from`. When the plan already has a draft, that draft is returned
// instead, so that two people revising at once work on the same draft (and
// the revision check keeps them from overwriting each other).
func (s *Store) NewVersion(ctx context.Context, actor Actor, planID int64, from int64) (PlanVersion, error) {
	return s.NewVersionWith(ctx, actor, planID, from, nil)
}

// NewVersionWith is NewVersion with the new draft's food suggestions made
// afresh (by FeedKey, from the current foods list) instead of copied; nil
// copies them. The dietitian's food choices are copied either way. An
// existing draft is returned unchanged.
func (s *Store) NewVersionWith(ctx context.Context, actor Actor, planID int64, from int64, fresh map[string]string) (PlanVersion, error) {
	var v PlanVersion
	err := s.inTx(ctx, func(tx pgx.Tx) error {
		// Lock the plan so that two revisions started at once number correctly.
		if _, err := tx.Exec(ctx, `SELECT 1 FROM plans WHERE id = $1 FOR UPDATE`, planID); err != nil {
			return err
		}
		draft, err := scanVersion(tx.QueryRow(ctx, `SELECT `+versionCols+versionFrom+`WHERE v.plan_id = $1 AND v.status = 'draft'`, planID))
		if err == nil {
			v = draft
			return nil
		}
		if !errors.Is(err, ErrNotFound) {
			return err
		}
		src, err := scanVersion(tx.QueryRow(ctx, `SELECT `+versionCols+versionFrom+`WHERE v.plan_id = $1 AND v.id = $2`, planID, from))
		if err != nil {
			return err
		}
		var next int
		if err := tx.QueryRow(ctx, `SELECT max(version) + 1 FROM plan_versions WHERE plan_id = $1`, planID).Scan(&next); err != nil {
			return err
		}
		sugg := fresh
		if sugg == nil {
			if sugg, err = computedSuggestionsOf(ctx, tx, src.ID); err != nil {
				return err
			}
		}
		id, err := insertVersion(ctx, tx, actor, planID, next, PlanContent{
			Request: src.Request, Result: src.Result, BodyMassKg: src.BodyMassKg, BodyMassOn: src.BodyMassOn, Suggestions: sugg,
			Notes: &src.Notes})
		if err != nil {
			return err
		}
		// The dietitian's food choices go with the content: a new version
		// keeps them whatever the fresh suggestions say.
		if err := copyFeedChoices(ctx, tx, src.ID, id); err != nil {
			return err
		}
		if v, err = scanVersion(tx.QueryRow(ctx, `SELECT `+versionCols+versionFrom+`WHERE v.id = $1`, id)); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "revise", "plan", planID, map[string]any{"version": next, "from_version": src.Version})
	})
	return v, err
}

const planByIDSQL = `SELECT ` + planCols + ` FROM plans p WHERE p.client_id = $1 AND p.id = $2`

// PlanByID loads a plan of a client.
func (s *Store) PlanByID(ctx context.Context, clientID, id int64) (Plan, error) {
	var p Plan
	err := s.Pool.QueryRow(ctx, planByIDSQL, clientID, id).Scan(planDest(&p)...)
	return p, notFound(err)
}

// ListPlans lists a client's plans (all clients when clientID is 0), most
// recently changed first, with their latest and published version numbers.
func (s *Store) ListPlans(ctx context.Context, clientID int64) ([]PlanRow, error) {
	return collectPlanRows(s.Pool.Query(ctx, listPlansSQL, clientID))
}

const listPlansSQL = `SELECT ` + planCols + `, c.name, lv.version, lv.status, pv.version, p.updated_at
	FROM plans p JOIN clients c ON c.id = p.client_id
	JOIN LATERAL (SELECT version, status FROM plan_versions WHERE plan_id = p.id ORDER BY version DESC LIMIT 1) lv ON true
	LEFT JOIN plan_versions pv ON pv.plan_id = p.id AND pv.status = 'published'
	WHERE $1 = 0 OR p.client_id = $1
	ORDER BY p.updated_at DESC, p.id DESC`

func collectPlanRows(rows pgx.Rows, err error) ([]PlanRow, error) {
	if err != nil {
		return nil, err
	}
	return pgx.CollectRows(rows, func(r pgx.CollectableRow) (PlanRow, error) {
		var pr PlanRow
		dest := append(planDest(&pr.Plan), &pr.ClientName, &pr.LatestVersion, &pr.LatestStatus, &pr.PublishedVersion, &pr.UpdatedAt)
		err := r.Scan(dest...)
		return pr, err
	})
}

// DiscardDraft deletes a draft version, provided the caller saw revision
// `revision` of it; a plan left without versions is deleted too. It reports
// whether the plan itself went. Published and superseded versions cannot be
// discarded (ErrNotDraft).
func (s *Store) DiscardDraft(ctx context.Context, actor Actor, versionID int64, revision int) (planGone bool, err error) {
	err = s.inTx(ctx, func(tx pgx.Tx) error {
		if err := lockDraft(ctx, tx, versionID, revision); err != nil {
			return err
		}
		var planID int64
		var number int
		if err := tx.QueryRow(ctx, `DELETE FROM plan_versions WHERE id = $1 RETURNING plan_id, version`, versionID).Scan(&planID, &number); err != nil {
			return err
		}
		var left int
		if err := tx.QueryRow(ctx, `SELECT count(*) FROM plan_versions WHERE plan_id = $1`, planID).Scan(&left); err != nil {
			return err
		}
		if left == 0 {
			if _, err := tx.Exec(ctx, `DELETE FROM plans WHERE id = $1`, planID); err != nil {
				return err
			}
			planGone = true
		}
		return AuditTx(ctx, tx, actor, "discard", "plan", planID, map[string]any{"version": number, "plan_deleted": planGone})
	})
	return planGone, err
}

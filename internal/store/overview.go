package store

import (
	"context"
	"time"

	"github.com/jackc/pgx/v5"
)

// SettingPracticeTimeZone is the IANA zone the practice works in: the
// overview's "today" and its day counts are dates there.
const SettingPracticeTimeZone = "practice_time_zone"

// DefaultPracticeTimeZone is used until an admin names the practice's zone.
const DefaultPracticeTimeZone = "UTC"

// The overview's horizons, in days of the practice's calendar. They are
// the practice's working rhythm (common practice for a sports dietitian's
// week), not physiology: an event three weeks out still leaves time for a
// loading plan and a trial of race fuelling in training; a body mass two
// weeks old is too old to scale an event's g/kg targets on without asking;
// a draft untouched for a week has probably been forgotten.
const (
	OverviewEventDays = 21 // events on today … today + 21 are listed
	StaleMassDays     = 14 // a latest body mass before today − 14 is stale
	OldDraftDays      = 7  // a draft last saved before today − 7 is old
	// OverviewLimit bounds each list; the page says when there are more.
	OverviewLimit = 100
)

// Overview is what needs doing across the practice, for the first page
// after sign-in. Archived clients are left out of every list.
type Overview struct {
	Today time.Time // the practice's date, at midnight UTC
	Zone  string    // the practice's time zone
	// Events start between now and the end of today + OverviewEventDays,
	// soonest first.
	Events []OverviewEvent
	// StaleMass are clients with an event ahead whose latest body mass is
	// older than StaleMassDays (or who have none), by their next event.
	StaleMass []OverviewMass
	// Unopened are published plans still running (a day on or after
	// today) that no link of their client was opened since publication.
	Unopened []OverviewPlan
	// OldDrafts are drafts last saved more than OldDraftDays ago, oldest first.
	OldDrafts []OverviewDraft
	// More names the lists cut at OverviewLimit ("events", "mass", "unopened", "drafts").
	More map[string]bool
}

// OverviewEvent is an event coming up and where its plans stand.
type OverviewEvent struct {
	EventID    int64
	ClientID   int64
	ClientName string
	Name       string
	StartsAt   time.Time
	TimeZone   string // the event's own zone, in which its start is shown
	DaysAway   int    // practice days from today to the event's date
	// PublishedPlanID is the latest-published plan for the event, 0 if none;
	// Published counts the event's plans with a published version.
	PublishedPlanID int64
	Published       int
	// DraftPlanID is the most recently saved plan with a draft, 0 if none.
	DraftPlanID int64
}

// OverviewMass is a client whose body mass should be measured again.
type OverviewMass struct {
	ClientID   int64
	ClientName string
	LatestOn   *time.Time // nil when no body mass was ever recorded
	DaysOld    int        // days since LatestOn; 0 when LatestOn is nil
	EventName  string
	EventStart time.Time
	EventZone  string
}

// OverviewPlan is a published plan its athlete has not opened.
type OverviewPlan struct {
	PlanID      int64
	ClientID    int64
	ClientName  string
	Title       string
	PublishedAt time.Time
	// LiveLinks counts the client's links that still open (not revoked,
	// not expired); with none, the athlete has no way to see the plan.
	LiveLinks int
}

// OverviewDraft is a draft left unsaved for a while.
type OverviewDraft struct {
	PlanID     int64
	ClientID   int64
	ClientName string
	Title      string
	Version    int
	UpdatedAt  time.Time
	DaysOld    int
}

// overviewDay is a CTE naming the practice's zone and today's date there
// at $1 (now): every list counts days in it, so they agree with each
// other and with the calendar on the dietitian's wall.
const overviewDay = `WITH z AS (SELECT zone, (($1::timestamptz) AT TIME ZONE zone)::date AS today
	FROM (SELECT coalesce((SELECT value FROM settings WHERE key = '` + SettingPracticeTimeZone + `'), '` + DefaultPracticeTimeZone + `') AS zone) s) `

// PracticeOverview reads the four lists of the overview at now, in one
// round trip (a batch of one query per list).
func (s *Store) PracticeOverview(ctx context.Context, now time.Time) (Overview, error) {
	o := Overview{More: map[string]bool{}}
	limit := OverviewLimit + 1
	b := &pgx.Batch{}
	b.Queue(overviewDay+`SELECT zone, today FROM z`, now).QueryRow(func(row pgx.Row) error {
		return row.Scan(&o.Zone, &o.Today)
	})
	b.Queue(overviewDay+`SELECT e.id, e.client_id, c.name, e.name, e.starts_at, e.time_zone,
			(e.starts_at AT TIME ZONE z.zone)::date - z.today,
			coalesce(pub.plan_id, 0), coalesce(pub.n, 0), coalesce(dr.plan_id, 0)
		FROM z, events e JOIN clients c ON c.id = e.client_id AND c.archived_at IS NULL
		LEFT JOIN LATERAL (SELECT (array_agg(p.id ORDER BY v.published_at DESC, p.id DESC))[1] AS plan_id, count(*) AS n
			FROM plans p JOIN plan_versions v ON v.plan_id = p.id AND v.status = 'published'
			WHERE p.event_id = e.id AND p.client_id = e.client_id) pub ON true
		LEFT JOIN LATERAL (SELECT p.id AS plan_id FROM plans p JOIN plan_versions v ON v.plan_id = p.id AND v.status = 'draft'
			WHERE p.event_id = e.id AND p.client_id = e.client_id ORDER BY v.updated_at DESC, p.id DESC LIMIT 1) dr ON true
		WHERE e.starts_at >= $1 AND (e.starts_at AT TIME ZONE z.zone)::date <= z.today + $2::int
		ORDER BY e.starts_at, e.id LIMIT $3`, now, OverviewEventDays, limit).Query(func(rows pgx.Rows) error {
		var err error
		o.Events, err = pgx.CollectRows(rows, func(r pgx.CollectableRow) (OverviewEvent, error) {
			var e OverviewEvent
			err := r.Scan(&e.EventID, &e.ClientID, &e.ClientName, &e.Name, &e.StartsAt, &e.TimeZone, &e.DaysAway,
				&e.PublishedPlanID, &e.Published, &e.DraftPlanID)
			return e, err
		})
		return err
	})
	b.Queue(overviewDay+`SELECT c.id, c.name, m.on_date, coalesce(z.today - m.on_date, 0), ne.name, ne.starts_at, ne.time_zone
		FROM z, clients c
		JOIN LATERAL (SELECT e.name, e.starts_at, e.time_zone FROM events e
			WHERE e.client_id = c.id AND e.starts_at >= $1 ORDER BY e.starts_at, e.id LIMIT 1) ne ON true
		LEFT JOIN LATERAL (SELECT max(measured_on) AS on_date FROM body_mass WHERE client_id = c.id) m ON true
		WHERE c.archived_at IS NULL AND (m.on_date IS NULL OR m.on_date < z.today - $2::int)
		ORDER BY ne.starts_at, c.id LIMIT $3`, now, StaleMassDays, limit).Query(func(rows pgx.Rows) error {
		var err error
		o.StaleMass, err = pgx.CollectRows(rows, func(r pgx.CollectableRow) (OverviewMass, error) {
			var m OverviewMass
			err := r.Scan(&m.ClientID, &m.ClientName, &m.LatestOn, &m.DaysOld, &m.EventName, &m.EventStart, &m.EventZone)
			return m, err
		})
		return err
	})
	// A link's use is written at most once an hour (LinkUseEvery), so a
	// plan opened within the hour after an earlier view shows here until
	// the next recorded use: the list errs towards asking once more.
	b.Queue(overviewDay+`SELECT p.id, p.client_id, c.name, p.title, v.published_at,
			(SELECT count(*) FROM client_links l WHERE l.client_id = p.client_id AND l.revoked_at IS NULL AND l.expires_at > $1)
		FROM z, plans p JOIN plan_versions v ON v.plan_id = p.id AND v.status = 'published'
		JOIN clients c ON c.id = p.client_id AND c.archived_at IS NULL
		WHERE NOT EXISTS (SELECT 1 FROM client_links l WHERE l.client_id = p.client_id AND l.last_used_at >= v.published_at)
		  AND EXISTS (SELECT 1 FROM plan_days d WHERE d.plan_version_id = v.id AND d.on_date >= z.today)
		ORDER BY v.published_at, p.id LIMIT $2`, now, limit).Query(func(rows pgx.Rows) error {
		var err error
		o.Unopened, err = pgx.CollectRows(rows, func(r pgx.CollectableRow) (OverviewPlan, error) {
			var p OverviewPlan
			err := r.Scan(&p.PlanID, &p.ClientID, &p.ClientName, &p.Title, &p.PublishedAt, &p.LiveLinks)
			return p, err
		})
		return err
	})
	b.Queue(overviewDay+`SELECT p.id, p.client_id, c.name, p.title, v.version, v.updated_at,
			z.today - (v.updated_at AT TIME ZONE z.zone)::date
		FROM z, plan_versions v JOIN plans p ON p.id = v.plan_id
		JOIN clients c ON c.id = p.client_id AND c.archived_at IS NULL
		WHERE v.status = 'draft' AND (v.updated_at AT TIME ZONE z.zone)::date < z.today - $2::int
		ORDER BY v.updated_at, p.id LIMIT $3`, now, OldDraftDays, limit).Query(func(rows pgx.Rows) error {
		var err error
		o.OldDrafts, err = pgx.CollectRows(rows, func(r pgx.CollectableRow) (OverviewDraft, error) {
			var d OverviewDraft
			err := r.Scan(&d.PlanID, &d.ClientID, &d.ClientName, &d.Title, &d.Version, &d.UpdatedAt, &d.DaysOld)
			return d, err
		})
		return err
	})
	if err := s.Pool.SendBatch(ctx, b).Close(); err != nil {
		return Overview{}, err
	}
	o.Events, o.More["events"] = cut(o.Events)
	o.StaleMass, o.More["mass"] = cut(o.StaleMass)
	o.Unopened, o.More["unopened"] = cut(o.Unopened)
	o.OldDrafts, o.More["drafts"] = cut(o.OldDrafts)
	return o, nil
}

// cut keeps the first OverviewLimit rows and says whether there were more.
func cut[T any](rows []T) ([]T, bool) {
	if len(rows) > OverviewLimit {
		return rows[:OverviewLimit], true
	}
	return rows, false
}

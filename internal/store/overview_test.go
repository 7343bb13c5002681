package store_test

import (
	"context"
	"slices"
	"sync/atomic"
	"testing"
	"time"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgxpool"

	"larder/internal/fuel"
	"larder/internal/store"
	"larder/internal/testdb"
)

// overviewFixture makes records for the overview's lists and remembers the
// clients it made: the test database is shared by the package, so each
// check looks only at these clients.
type overviewFixture struct {
	t       *testing.T
	st      *store.Store
	clients []int64
}

func (f *overviewFixture) client(name string, archived bool) store.Client {
	f.t.Helper()
	ctx := context.Background()
	c := store.Client{Name: uniq(name), Sex: store.SexFemale}
	if err := f.st.CreateClient(ctx, store.System, &c); err != nil {
		f.t.Fatal(err)
	}
	if archived {
		if err := f.st.ArchiveClient(ctx, store.System, c.ID); err != nil {
			f.t.Fatal(err)
		}
	}
	f.clients = append(f.clients, c.ID)
	return c
}

func (f *overviewFixture) event(clientID int64, name string, at time.Time) int64 {
	f.t.Helper()
	e := store.Event{ClientID: clientID, Name: name, StartsAt: at, TimeZone: "Europe/London", Modality: "run",
		ExpectedDurationMin: 60, Days: 1, Priority: "A"}
	if err := f.st.AddEvent(context.Background(), store.System, &e); err != nil {
		f.t.Fatal(err)
	}
	return e.ID
}

func (f *overviewFixture) mass(clientID int64, on string) {
	f.t.Helper()
	d, _ := time.Parse(time.DateOnly, on)
	m := store.BodyMass{ClientID: clientID, MeasuredOn: d, MassKg: 60, EnteredUnit: "kg"}
	if err := f.st.AddBodyMass(context.Background(), store.System, &m); err != nil {
		f.t.Fatal(err)
	}
}

// plan makes a week plan of 3 days from start, tied to an event when
// eventID is not 0, published when publish is set; it returns the plan
// and the version.
func (f *overviewFixture) plan(clientID, eventID int64, start string, publish bool) (store.Plan, store.PlanVersion) {
	f.t.Helper()
	ctx := context.Background()
	req := fuel.Request{Kind: fuel.KindWeek, StartDate: start, Days: 3, Athlete: fuel.Athlete{Sex: "female", BodyMassKg: 60}}
	res, err := fuel.Compute(req)
	if err != nil {
		f.t.Fatal(err)
	}
	content := store.PlanContent{Request: req, Result: res, BodyMassKg: 60}
	p := store.Plan{ClientID: clientID, Kind: fuel.KindWeek, Title: uniq("Week")}
	if eventID != 0 {
		p.EventID = &eventID
	}
	v, err := f.st.CreatePlan(ctx, store.System, &p, content)
	if err != nil {
		f.t.Fatal(err)
	}
	if publish {
		if v, err = f.st.Publish(ctx, store.System, v.ID, v.Revision, content); err != nil {
			f.t.Fatal(err)
		}
	}
	return p, v
}

func (f *overviewFixture) exec(sql string, args ...any) {
	f.t.Helper()
	if _, err := f.st.Pool.Exec(context.Background(), sql, args...); err != nil {
		f.t.Fatal(err)
	}
}

func (f *overviewFixture) mine(id int64) bool { return slices.Contains(f.clients, id) }

// The overview in a practice at UTC+12: "today" is the practice's date, so
// the edges fall at midnight in Auckland, not in UTC. Each edge is placed
// where the UTC calendar would give the other answer.
func TestPracticeOverview(t *testing.T) {
	ctx := context.Background()
	st := store.New(testdb.Pool(t))
	f := &overviewFixture{t: t, st: st}
	if err := st.SetSetting(ctx, store.System, store.SettingPracticeTimeZone, "Pacific/Auckland"); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { f.exec(`DELETE FROM settings WHERE key = $1`, store.SettingPracticeTimeZone) })
	// 13:00 UTC on 10 June 2027 is 01:00 on 11 June in Auckland (NZST, UTC+12).
	now := time.Date(2027, 6, 10, 13, 0, 0, 0, time.UTC)
	akl, _ := time.LoadLocation("Pacific/Auckland")

	// Events. 2 July 23:00 in Auckland is day 21 there (day 22 in UTC);
	// 3 July 00:30 in Auckland is day 22.
	racer := f.client("Racer", false)
	day21 := f.event(racer.ID, "Day 21", time.Date(2027, 7, 2, 23, 0, 0, 0, akl))
	f.event(racer.ID, "Day 22", time.Date(2027, 7, 3, 0, 30, 0, 0, akl))
	f.event(racer.ID, "Started an hour ago", now.Add(-time.Hour))
	withPlan := f.event(racer.ID, "Published", now.AddDate(0, 0, 5))
	pubPlan, _ := f.plan(racer.ID, withPlan, "2027-06-14", true)
	withDraft := f.event(racer.ID, "Draft only", now.AddDate(0, 0, 6))
	draftPlan, draftV := f.plan(racer.ID, withDraft, "2027-06-15", false)
	f.exec(`UPDATE plan_versions SET updated_at = $2 WHERE id = $1`, draftV.ID, now.Add(-24*time.Hour)) // saved yesterday
	archived := f.client("Archived racer", true)
	f.event(archived.ID, "Archived client's race", now.AddDate(0, 0, 3))
	f.mass(archived.ID, "2027-01-01")

	// Body mass. Today in Auckland is 11 June: 28 May is exactly 14 days
	// old (not stale), 27 May is 15 (stale; only 14 by the UTC date).
	fresh := f.client("Measured 14 days ago", false)
	f.mass(fresh.ID, "2027-05-01")
	f.mass(fresh.ID, "2027-05-28")
	f.event(fresh.ID, "Fresh race", now.AddDate(0, 2, 0))
	stale := f.client("Measured 15 days ago", false)
	f.mass(stale.ID, "2027-05-27")
	f.event(stale.ID, "Stale race", now.AddDate(0, 2, 0))
	never := f.client("Never measured", false)
	f.event(never.ID, "Unmeasured race", now.AddDate(0, 3, 0))
	noEvent := f.client("Stale, nothing ahead", false)
	f.mass(noEvent.ID, "2027-01-01")
	f.event(noEvent.ID, "Last year's race", now.AddDate(0, 0, -2))

	// Published plans and their links.
	unseen := f.client("Link never opened", false)
	unseenPlan, _ := f.plan(unseen.ID, 0, "2027-06-11", true)
	link := func(clientID int64, lastUsed *time.Time) {
		l := store.ClientLink{ClientID: clientID, TokenHash: linkHash(uniq("ov")), CreatedAt: now.AddDate(0, 0, -40), ExpiresAt: now.AddDate(0, 0, 50)}
		if err := st.CreateClientLink(ctx, store.System, &l); err != nil {
			t.Fatal(err)
		}
		f.exec(`UPDATE client_links SET last_used_at = $2 WHERE id = $1`, l.ID, lastUsed)
	}
	link(unseen.ID, nil)
	seen := f.client("Opened after publishing", false)
	_, seenV := f.plan(seen.ID, 0, "2027-06-11", true)
	link(seen.ID, ptr(seenV.PublishedAt.Add(time.Minute)))
	before := f.client("Opened before publishing", false)
	beforePlan, beforeV := f.plan(before.ID, 0, "2027-06-11", true)
	link(before.ID, ptr(beforeV.PublishedAt.Add(-2*time.Hour)))
	over := f.client("Plan over", false)
	f.plan(over.ID, 0, "2027-06-01", true) // 1-3 June, all before today
	noLink := f.client("No link", false)
	noLinkPlan, _ := f.plan(noLink.ID, 0, "2027-06-12", true)
	archivedPlanClient := f.client("Archived with plan", false)
	f.plan(archivedPlanClient.ID, 0, "2027-06-12", true)
	if err := st.ArchiveClient(ctx, store.System, archivedPlanClient.ID); err != nil {
		t.Fatal(err)
	}

	// Drafts: saved on 4 June (Auckland) is 7 days old, on 3 June 8.
	drafter := f.client("Drafter", false)
	_, week7 := f.plan(drafter.ID, 0, "2027-07-01", false)
	f.exec(`UPDATE plan_versions SET updated_at = $2 WHERE id = $1`, week7.ID, time.Date(2027, 6, 4, 0, 30, 0, 0, akl))
	old8, week8 := f.plan(drafter.ID, 0, "2027-07-01", false)
	// 23:30 on 3 June in Auckland is 8 days before its 11 June; by the
	// UTC calendar (11:30 on 3 June, today 10 June) it would be only 7.
	f.exec(`UPDATE plan_versions SET updated_at = $2 WHERE id = $1`, week8.ID, time.Date(2027, 6, 3, 23, 30, 0, 0, akl))
	archivedDraftClient := f.client("Archived drafter", false)
	_, archivedDraft := f.plan(archivedDraftClient.ID, 0, "2027-07-01", false)
	f.exec(`UPDATE plan_versions SET updated_at = $2 WHERE id = $1`, archivedDraft.ID, now.AddDate(0, 0, -30))
	if err := st.ArchiveClient(ctx, store.System, archivedDraftClient.ID); err != nil {
		t.Fatal(err)
	}

	o, err := st.PracticeOverview(ctx, now)
	if err != nil {
		t.Fatal(err)
	}
	if o.Zone != "Pacific/Auckland" || o.Today.Format(time.DateOnly) != "2027-06-11" {
		t.Fatalf("practice day: %s %s", o.Zone, o.Today)
	}

	var events []string
	for _, e := range o.Events {
		if f.mine(e.ClientID) {
			events = append(events, e.Name)
		}
		switch e.EventID {
		case day21:
			if e.DaysAway != 21 || e.Published != 0 || e.PublishedPlanID != 0 || e.DraftPlanID != 0 {
				t.Errorf("day-21 event: %+v", e)
			}
		case withPlan:
			if e.Published != 1 || e.PublishedPlanID != pubPlan.ID || e.DraftPlanID != 0 || e.DaysAway != 5 {
				t.Errorf("event with a published plan: %+v", e)
			}
		case withDraft:
			if e.Published != 0 || e.DraftPlanID != draftPlan.ID {
				t.Errorf("event with a draft: %+v", e)
			}
		}
	}
	if want := []string{"Published", "Draft only", "Day 21"}; !slices.Equal(events, want) {
		t.Errorf("events listed %q, want %q (soonest first; day 22, started and archived left out)", events, want)
	}

	var mass []int64
	for _, m := range o.StaleMass {
		if !f.mine(m.ClientID) {
			continue
		}
		mass = append(mass, m.ClientID)
		switch m.ClientID {
		case stale.ID:
			if m.LatestOn == nil || m.LatestOn.Format(time.DateOnly) != "2027-05-27" || m.DaysOld != 15 || m.EventName != "Stale race" {
				t.Errorf("stale client: %+v", m)
			}
		case never.ID:
			if m.LatestOn != nil || m.EventName != "Unmeasured race" {
				t.Errorf("never-measured client: %+v", m)
			}
		}
	}
	// racer (no body mass, events ahead) is there too; the 14-day-old,
	// the one with nothing ahead and the archived client are not.
	if want := []int64{racer.ID, stale.ID, never.ID}; !slices.Equal(mass, want) {
		t.Errorf("stale body mass lists clients %v, want %v", mass, want)
	}

	var unopened []int64
	for _, p := range o.Unopened {
		if !f.mine(p.ClientID) {
			continue
		}
		unopened = append(unopened, p.PlanID)
		switch p.PlanID {
		case unseenPlan.ID:
			if p.LiveLinks != 1 {
				t.Errorf("plan with an unopened link: %+v", p)
			}
		case noLinkPlan.ID:
			if p.LiveLinks != 0 {
				t.Errorf("plan without a link: %+v", p)
			}
		}
	}
	// pubPlan (racer has no link) is unseen too; the plan seen after
	// publishing, the plan that is over and the archived client's are not.
	if want := []int64{pubPlan.ID, unseenPlan.ID, beforePlan.ID, noLinkPlan.ID}; !sameSet(unopened, want) {
		t.Errorf("unopened plans %v, want %v", unopened, want)
	}

	var drafts []int64
	for _, d := range o.OldDrafts {
		if f.mine(d.ClientID) {
			drafts = append(drafts, d.PlanID)
			if d.DaysOld != 8 {
				t.Errorf("old draft: %+v", d)
			}
		}
	}
	if want := []int64{old8.ID}; !slices.Equal(drafts, want) {
		t.Errorf("old drafts %v, want %v (7 days old and archived left out)", drafts, want)
	}
}

// Without a practice time zone the overview counts days in UTC.
func TestPracticeOverviewDefaultsToUTC(t *testing.T) {
	ctx := context.Background()
	st := store.New(testdb.Pool(t))
	f := &overviewFixture{t: t, st: st}
	f.exec(`DELETE FROM settings WHERE key = $1`, store.SettingPracticeTimeZone)
	now := time.Date(2027, 6, 10, 13, 0, 0, 0, time.UTC)
	c := f.client("UTC racer", false)
	in := f.event(c.ID, "UTC day 21", time.Date(2027, 7, 1, 23, 59, 0, 0, time.UTC))
	out := f.event(c.ID, "UTC day 22", time.Date(2027, 7, 2, 0, 0, 0, 0, time.UTC))
	o, err := st.PracticeOverview(ctx, now)
	if err != nil {
		t.Fatal(err)
	}
	if o.Zone != store.DefaultPracticeTimeZone || o.Today.Format(time.DateOnly) != "2027-06-10" {
		t.Fatalf("practice day: %s %s", o.Zone, o.Today)
	}
	var got []int64
	for _, e := range o.Events {
		if f.mine(e.ClientID) {
			got = append(got, e.EventID)
		}
	}
	if !slices.Equal(got, []int64{in}) || in == out {
		t.Fatalf("events %v, want only %d", got, in)
	}
}

func ptr[T any](v T) *T { return &v }

func sameSet(a, b []int64) bool {
	a, b = slices.Clone(a), slices.Clone(b)
	slices.Sort(a)
	slices.Sort(b)
	return slices.Equal(a, b)
}

// roundTrips counts what a pool sends: single queries and batches.
type roundTrips struct{ queries, batches atomic.Int64 }

func (c *roundTrips) TraceQueryStart(ctx context.Context, _ *pgx.Conn, _ pgx.TraceQueryStartData) context.Context {
	c.queries.Add(1)
	return ctx
}
func (c *roundTrips) TraceQueryEnd(context.Context, *pgx.Conn, pgx.TraceQueryEndData) {}
func (c *roundTrips) TraceBatchStart(ctx context.Context, _ *pgx.Conn, _ pgx.TraceBatchStartData) context.Context {
	c.batches.Add(1)
	return ctx
}
func (c *roundTrips) TraceBatchQuery(context.Context, *pgx.Conn, pgx.TraceBatchQueryData) {}
func (c *roundTrips) TraceBatchEnd(context.Context, *pgx.Conn, pgx.TraceBatchEndData)     {}

// The overview's four lists (and the practice's day) come in one round trip.
func TestPracticeOverviewOneRoundTrip(t *testing.T) {
	ctx := context.Background()
	cfg, err := pgxpool.ParseConfig(testdb.DSN(t))
	if err != nil {
		t.Fatal(err)
	}
	trips := &roundTrips{}
	cfg.ConnConfig.Tracer = trips
	pool, err := pgxpool.NewWithConfig(ctx, cfg)
	if err != nil {
		t.Fatal(err)
	}
	defer pool.Close()
	if err := pool.Ping(ctx); err != nil {
		t.Fatal(err)
	}
	if _, err := store.New(pool).PracticeOverview(ctx, time.Now()); err != nil {
		t.Fatal(err)
	}
	if q, b := trips.queries.Load(), trips.batches.Load(); q != 0 || b != 1 {
		t.Fatalf("overview sent %d queries and %d batches, want one batch", q, b)
	}
}

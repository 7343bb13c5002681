package server

import (
	"context"
	"net/http"
	"net/http/httptest"
	"strings"
	"sync/atomic"
	"testing"
	"time"

	"larder/internal/fuel"
	"larder/internal/mass"
	"larder/internal/store"
	"larder/internal/testdb"
)

// The phone page's rendered body is kept by phonePageKey. Each input of the
// page is changed here from outside the app (plain SQL, as another app
// server or a staff page would) after a view that came from the cache,
// and the very next view must show the change. A new published version
// is proved the same way by TestClientLinkCachedVersionNeverStale.

// phoneApp is an app whose clock the test moves, with its Server at hand
// to tell a view served from the cache of rendered pages.
type phoneApp struct {
	*app
	s     *Server
	clock *atomic.Int64 // Unix seconds
}

func newPhoneApp(t *testing.T) phoneApp {
	t.Helper()
	clock := &atomic.Int64{}
	clock.Store(testNow.Unix())
	st := store.New(testdb.Pool(t))
	s := New(Config{Store: st, SessionCleanup: -1, Now: func() time.Time { return time.Unix(clock.Load(), 0).UTC() }})
	hs := httptest.NewServer(s)
	t.Cleanup(func() { hs.Close(); s.Close() })
	return phoneApp{app: &app{t: t, st: st, srv: hs}, s: s, clock: clock}
}

// view gets the phone page of token; cached reports that it was served
// from the cache of rendered pages (no page was added to it).
func (p phoneApp) view(t *testing.T, token string) (status int, body string, cached bool) {
	t.Helper()
	n := p.s.phonePages.Len()
	res, body := getPublic(t, p.app, "/c/"+token)
	return res.StatusCode, body, res.StatusCode == http.StatusOK && p.s.phonePages.Len() == n
}

func (p phoneApp) exec(t *testing.T, sql string, args ...any) {
	t.Helper()
	if _, err := p.st.Pool.Exec(context.Background(), sql, args...); err != nil {
		t.Fatal(err)
	}
}

// keepSetting puts a practice setting back as it was when the test ends:
// the settings are shared by every test of the package.
func (p phoneApp) keepSetting(t *testing.T, key string) {
	t.Helper()
	var old *string
	_ = p.st.Pool.QueryRow(context.Background(), `SELECT value FROM settings WHERE key = $1`, key).Scan(&old)
	t.Cleanup(func() {
		ctx := context.Background()
		if old == nil {
			_, _ = p.st.Pool.Exec(ctx, `DELETE FROM settings WHERE key = $1`, key)
			return
		}
		_, _ = p.st.Pool.Exec(ctx, `UPDATE settings SET value = $2 WHERE key = $1`, key, *old)
	})
}

func (p phoneApp) setSetting(t *testing.T, key, value string) {
	t.Helper()
	p.exec(t, `INSERT INTO settings (key, value) VALUES ($1, $2) ON CONFLICT (key) DO UPDATE SET value = $2`, key, value)
}

// phoneIDs names the rows a case changes.
type phoneIDs struct{ client, event int64 }

func TestPhonePageCacheSeesEveryChange(t *testing.T) {
	p := newPhoneApp(t)
	b, _ := p.signedIn(store.RoleDietitian)
	kg, lb := mass.Text(64, mass.KG), mass.Text(64, mass.LB)
	at := func(h, m int) time.Time { return time.Date(2027, 3, 1, h, m, 0, 0, time.UTC) }
	for _, tc := range []struct {
		name   string
		zone   string    // the plan's zone; "" is Europe/London
		event  bool      // a race-day plan for an event, instead of a week
		noPlan bool      // no published plan at all
		start  time.Time // the clock at the first views; zero is testNow
		setup  func(t *testing.T, ids phoneIDs)
		change func(t *testing.T, ids phoneIDs)
		before string // shown before the change, gone after it
		after  string // shown after the change ("" with gone)
		gone   bool   // after the change the link answers 404
	}{
		{name: "revoked link", gone: true, before: "Hello Nora",
			change: func(t *testing.T, ids phoneIDs) {
				p.exec(t, `UPDATE client_links SET revoked_at = now() WHERE client_id = $1`, ids.client)
			}},
		{name: "expired link", gone: true, before: "Hello Nora",
			change: func(t *testing.T, ids phoneIDs) {
				p.clock.Store(testNow.Add(100 * 24 * time.Hour).Unix()) // made for 90 days
			}},
		{name: "archived client", gone: true, before: "Hello Nora",
			change: func(t *testing.T, ids phoneIDs) {
				p.exec(t, `UPDATE clients SET archived_at = now() WHERE id = $1`, ids.client)
			}},
		{name: "note no longer shared", before: "Carry your reliever inhaler", after: "Hello Nora",
			setup: func(t *testing.T, ids phoneIDs) {
				p.exec(t, `UPDATE clients SET shared_note = 'Carry your reliever inhaler.' WHERE id = $1`, ids.client)
			},
			change: func(t *testing.T, ids phoneIDs) {
				p.exec(t, `UPDATE clients SET shared_note = '' WHERE id = $1`, ids.client)
			}},
		{name: "shared note changed", before: "Carry your reliever inhaler", after: "Take your gluten-free bars",
			setup: func(t *testing.T, ids phoneIDs) {
				p.exec(t, `UPDATE clients SET shared_note = 'Carry your reliever inhaler.' WHERE id = $1`, ids.client)
			},
			change: func(t *testing.T, ids phoneIDs) {
				p.exec(t, `UPDATE clients SET shared_note = 'Take your gluten-free bars.' WHERE id = $1`, ids.client)
			}},
		{name: "figures hidden", before: "Worked out for a body mass of", after: "Hello Nora",
			setup: func(t *testing.T, ids phoneIDs) {
				p.exec(t, `UPDATE clients SET athlete_sees_energy_mass = true, mass_unit = 'kg' WHERE id = $1`, ids.client)
			},
			change: func(t *testing.T, ids phoneIDs) {
				p.exec(t, `UPDATE clients SET athlete_sees_energy_mass = false WHERE id = $1`, ids.client)
			}},
		{name: "client's unit", before: kg, after: lb,
			setup: func(t *testing.T, ids phoneIDs) {
				p.exec(t, `UPDATE clients SET athlete_sees_energy_mass = true, mass_unit = 'kg' WHERE id = $1`, ids.client)
			},
			change: func(t *testing.T, ids phoneIDs) {
				p.exec(t, `UPDATE clients SET mass_unit = 'lb' WHERE id = $1`, ids.client)
			}},
		{name: "practice's unit", before: kg, after: lb,
			setup: func(t *testing.T, ids phoneIDs) {
				p.keepSetting(t, "mass_unit")
				p.setSetting(t, "mass_unit", "kg")
				p.exec(t, `UPDATE clients SET athlete_sees_energy_mass = true, mass_unit = NULL WHERE id = $1`, ids.client)
			},
			change: func(t *testing.T, ids phoneIDs) { p.setSetting(t, "mass_unit", "lb") }},
		{name: "practice name", before: "Harbourside Sports Dietetics", after: "Northgate Fuelling Clinic",
			setup: func(t *testing.T, ids phoneIDs) {
				p.keepSetting(t, store.SettingPracticeName)
				p.setSetting(t, store.SettingPracticeName, "Harbourside Sports Dietetics")
			},
			change: func(t *testing.T, ids phoneIDs) {
				p.setSetting(t, store.SettingPracticeName, "Northgate Fuelling Clinic")
			}},
		{name: "client's name", before: "Hello Nora", after: "Hello Ingrid",
			change: func(t *testing.T, ids phoneIDs) {
				p.exec(t, `UPDATE clients SET name = 'Ingrid Phone' WHERE id = $1`, ids.client)
			}},
		{name: "event renamed", event: true, before: "Ferncliff Trail 30: start", after: "Ferncliff Night Trail: start",
			change: func(t *testing.T, ids phoneIDs) {
				p.exec(t, `UPDATE events SET name = 'Ferncliff Night Trail' WHERE id = $1`, ids.event)
			}},
		{name: "day turns", before: "Monday 1 March 2027", after: "Tuesday 2 March 2027",
			change: func(t *testing.T, ids phoneIDs) { p.clock.Store(testNow.Add(24 * time.Hour).Unix()) }},
		// With no plan the page still gives the date, in UTC.
		{name: "day turns without a plan", noPlan: true, before: "Monday 1 March 2027", after: "Tuesday 2 March 2027",
			change: func(t *testing.T, ids phoneIDs) { p.clock.Store(testNow.Add(24 * time.Hour).Unix()) }},
		// 22:30 and 23:30 UTC are one UTC day but two days in Oslo (UTC+1).
		{name: "day turns in the plan's zone", zone: "Europe/Oslo", start: at(22, 30),
			before: "Monday 1 March 2027", after: "Tuesday 2 March 2027",
			change: func(t *testing.T, ids phoneIDs) { p.clock.Store(at(23, 30).Unix()) }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			start := tc.start
			if start.IsZero() {
				start = testNow
			}
			p.clock.Store(start.Unix())
			c := p.newClient(unique("Nora Phone"))
			ids := phoneIDs{client: c.ID}
			switch {
			case tc.noPlan:
			case tc.event:
				ids.event = publishRaceDay(t, p.app, c.ID)
			default:
				req := weekRequest("2027-03-01", 3)
				if tc.zone != "" {
					req.TimeZone = tc.zone
				}
				storePlan(t, p.app, c.ID, "Week before the race", req, true, "")
			}
			if tc.setup != nil {
				tc.setup(t, ids)
			}
			token := makeLink(t, b, c.ID, "")
			_, first, _ := p.view(t, token)
			status, body, cached := p.view(t, token)
			if status != http.StatusOK || !cached || body != first {
				t.Fatalf("second view: status %d, from the cache %t, same page %t", status, cached, body == first)
			}
			response{body: body}.mustContain(t, tc.before)

			tc.change(t, ids)
			status, body, _ = p.view(t, token)
			if tc.gone {
				if status != http.StatusNotFound || strings.Contains(body, tc.before) {
					t.Fatalf("after the change: status %d, want 404 without the page\n%s", status, body)
				}
				return
			}
			if status != http.StatusOK || strings.Contains(body, tc.before) {
				t.Fatalf("after the change: status %d, still shows %q\n%s", status, tc.before, body)
			}
			response{body: body}.mustContain(t, tc.after)
		})
	}
}

// Two links of one client each get a page with their own calendar and
// sheet addresses, not the other's from the cache.
func TestPhonePageCacheKeepsLinksApart(t *testing.T) {
	p := newPhoneApp(t)
	b, _ := p.signedIn(store.RoleDietitian)
	c := p.newClient(unique("Nora Twolinks"))
	storePlan(t, p.app, c.ID, "Week", weekRequest("2027-03-01", 3), true, "")
	one, two := makeLink(t, b, c.ID, "phone"), makeLink(t, b, c.ID, "tablet")
	for range 2 {
		for _, tok := range []string{one, two} {
			_, body, _ := p.view(t, tok)
			response{body: body}.mustContain(t, "/c/"+tok+"/plan.ics", "/c/"+tok+"/sheet.pdf")
		}
	}
}

// publishRaceDay publishes a race-day plan for a new event of the client
// on testNow's day and returns the event's id.
func publishRaceDay(t *testing.T, a *app, clientID int64) int64 {
	t.Helper()
	ctx := context.Background()
	dist := 30.0
	ev := store.Event{ClientID: clientID, Name: "Ferncliff Trail 30", StartsAt: time.Date(2027, 3, 1, 10, 30, 0, 0, time.UTC),
		TimeZone: "Europe/London", Modality: "run", DistanceKm: &dist, ExpectedDurationMin: 165, Days: 1, Priority: "A"}
	if err := a.st.AddEvent(ctx, store.System, &ev); err != nil {
		t.Fatal(err)
	}
	req := fuel.Request{Kind: fuel.KindRace, TimeZone: "Europe/London", EatingOccasions: 5,
		Athlete: fuel.Athlete{Sex: "female", BodyMassKg: 58},
		Event:   &fuel.Event{StartsAt: ev.StartsAt, Modality: "run", DistanceKm: &dist, ExpectedDurationMin: 165}}
	plan, err := fuel.Compute(req)
	if err != nil {
		t.Fatal(err)
	}
	content := store.PlanContent{Request: req, Result: plan, BodyMassKg: 58}
	pl := store.Plan{ClientID: clientID, EventID: &ev.ID, Kind: fuel.KindRace, Title: "Race day"}
	v, err := a.st.CreatePlan(ctx, store.System, &pl, content)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := a.st.Publish(ctx, store.System, v.ID, v.Revision, content); err != nil {
		t.Fatal(err)
	}
	return ev.ID
}

package server

import (
	"context"
	"net/http"
	"net/url"
	"strings"
	"testing"
	"time"

	"larder/internal/store"
)

func TestClientCreateEditArchive(t *testing.T) {
	a := newApp(t)
	b, u := a.signedIn(store.RoleDietitian)
	// The new-client form has a way back, like every other form.
	b.get("/clients/new").mustContain(t, `<a class="button secondary" href="/clients">Cancel</a>`)
	name := unique("Ada Lindqvist")
	res := b.post("/clients", url.Values{"name": {name}, "sex": {"female"}, "date_of_birth": {"1994-06-02"}, "height_cm": {"168,5"},
		"sport": {"Marathon"}, "cautions": {"Coeliac disease"}, "notes": {"Prefers rice."}})
	res.mustRedirect(t, "/clients/")
	cid := strings.TrimPrefix(res.location, "/clients/")

	page := b.get(res.location)
	page.mustContain(t, name, "Client "+name+" added.", "Recorded cautions", "Coeliac disease", "168.5 cm", "32 y", "Prefers rice.")

	var c store.Client
	rows, err := a.st.ListClients(context.Background(), store.ClientFilter{Query: name})
	if err != nil || len(rows) != 1 {
		t.Fatalf("search for new client: %d rows, %v", len(rows), err)
	}
	c = rows[0].Client
	if c.HeightCm == nil || *c.HeightCm != 168.5 || c.DateOfBirth == nil || c.DateOfBirth.Format("2006-01-02") != "1994-06-02" {
		t.Fatalf("stored client %+v", c)
	}
	// Audit row by the signed-in user in the same change.
	if n := a.count(`SELECT count(*) FROM audit_log WHERE entity = 'client' AND entity_id = $1 AND action = 'create' AND user_id = $2`, c.ID, u.ID); n != 1 {
		t.Fatalf("create audit rows = %d", n)
	}

	edit := b.get("/clients/" + cid + "/edit")
	edit.mustContain(t, `value="`+name+`"`, `value="1994-06-02"`, "Coeliac disease")
	b.post("/clients/"+cid, url.Values{"name": {name + " Berg"}, "sex": {"female"}, "sport": {"Half marathon"}, "loaded": {hiddenValue(t, edit.body, "loaded")}}).mustRedirect(t, "/clients/"+cid)
	c, _ = a.st.ClientByID(context.Background(), c.ID)
	if c.Name != name+" Berg" || c.Sport != "Half marathon" || c.HeightCm != nil || c.Cautions != "" {
		t.Fatalf("edited client %+v", c)
	}

	b.post("/clients/"+cid+"/archive", nil).mustRedirect(t, "/clients/"+cid)
	if c, _ = a.st.ClientByID(context.Background(), c.ID); !c.Archived() {
		t.Fatal("not archived")
	}
	b.get("/clients/"+cid).mustContain(t, "is archived") // the notice, shown once
	if strings.Contains(b.get("/clients?q="+url.QueryEscape(name)).body, `href="/clients/`+cid+`"`) {
		t.Fatal("archived client in the active list")
	}
	b.get("/clients?show=archived&q="+url.QueryEscape(name)).mustContain(t, `href="/clients/`+cid+`"`, `class="badge archived"`)
	b.get("/clients?show=all&q="+url.QueryEscape(name)).mustContain(t, `href="/clients/`+cid+`"`)
	b.post("/clients/"+cid+"/unarchive", nil).mustRedirect(t, "/clients/"+cid)
	if c, _ = a.st.ClientByID(context.Background(), c.ID); c.Archived() {
		t.Fatal("still archived")
	}
	b.get("/clients/" + cid) // the notice
	b.get("/clients?q="+url.QueryEscape(name)).mustContain(t, `href="/clients/`+cid+`"`)
	if strings.Contains(b.get("/clients?show=archived&q="+url.QueryEscape(name)).body, `href="/clients/`+cid+`"`) {
		t.Fatal("unarchived client in the archived list")
	}
	for _, action := range []string{"update", "archive", "unarchive"} {
		if n := a.count(`SELECT count(*) FROM audit_log WHERE entity = 'client' AND entity_id = $1 AND action = $2 AND user_id = $3`, c.ID, action, u.ID); n != 1 {
			t.Fatalf("%s audit rows = %d", action, n)
		}
	}
	// The client page lists the changes.
	b.get("/clients/"+cid).mustContain(t, "Recent changes", "archived client ("+name+" Berg)", "created client ("+name+")", u.Name)

	if res := b.get("/clients/999999999"); res.status != http.StatusNotFound {
		t.Fatalf("missing client: %d", res.status)
	}
	if res := b.get("/clients/abc"); res.status != http.StatusNotFound {
		t.Fatalf("bad client id: %d", res.status)
	}
}

func TestBodyMassAddEditDelete(t *testing.T) {
	a := newApp(t)
	b, u := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Mass Client"))
	base := "/clients/" + itoa(c.ID)
	ctx := context.Background()

	b.post(base+"/body-mass", url.Values{"measured_on": {"2027-02-20"}, "mass": {"61.4"}, "unit": {"kg"}, "body_fat_pct": {"21.5"}, "method": {"DXA"}}).
		mustRedirect(t, base)
	// 150 lb = 150 × 0.45359237 kg = 68.04 kg (international pound; common practice).
	b.post(base+"/body-mass", url.Values{"measured_on": {"2027-03-01"}, "mass": {"150"}, "unit": {"lb"}}).mustRedirect(t, base)
	list, err := a.st.ListBodyMass(ctx, c.ID)
	if err != nil || len(list) != 2 {
		t.Fatalf("%d measurements, %v", len(list), err)
	}
	if list[0].MassKg != 68.04 || list[0].EnteredUnit != "lb" || list[1].MassKg != 61.4 || *list[1].BodyFatPct != 21.5 {
		t.Fatalf("stored %+v / %+v", list[0], list[1])
	}
	// Newest first on the page, in the client's unit (the practice's kg):
	// 68.04 kg shows as 68.0 kg; its edit form shows it in kg too, and
	// saved unchanged it keeps the kg and the unit it was typed in.
	page := b.get(base)
	page.mustContain(t, "68.0 kg", "61.4 kg", "21.5 %")
	b.get(base+"/body-mass/"+itoa(list[0].ID)+"/edit").mustContain(t, `name="mass" value="68.04"`, `name="unit" value="kg" checked`)
	b.post(base+"/body-mass/"+itoa(list[0].ID), url.Values{"version": {"1"}, "measured_on": {"2027-03-01"}, "mass": {"68.04"}, "unit": {"kg"}}).mustRedirect(t, base)
	if m, _ := a.st.BodyMassByID(ctx, c.ID, list[0].ID); m.MassKg != 68.04 || m.EnteredUnit != "lb" {
		t.Fatalf("saved unchanged: %v kg typed in %q, want 68.04 kg typed in lb", m.MassKg, m.EnteredUnit)
	}
	if strings.Index(page.body, "Mon 1 Mar 2027") > strings.Index(page.body, "Sat 20 Feb 2027") {
		t.Fatal("body-mass history is not newest first")
	}

	id := itoa(list[1].ID)
	b.get(base+"/body-mass/"+id+"/edit").mustContain(t, `value="61.4"`, `value="21.5"`, `value="DXA"`)
	b.post(base+"/body-mass/"+id, url.Values{"version": {"1"}, "measured_on": {"2027-02-21"}, "mass": {"61.9"}, "unit": {"kg"}}).mustRedirect(t, base)
	m, _ := a.st.BodyMassByID(ctx, c.ID, list[1].ID)
	if m.MassKg != 61.9 || m.BodyFatPct != nil || m.MeasuredOn.Format("2006-01-02") != "2027-02-21" {
		t.Fatalf("edited %+v", m)
	}
	b.post(base+"/body-mass/"+id+"/delete", nil).mustRedirect(t, base)
	if _, err := a.st.BodyMassByID(ctx, c.ID, list[1].ID); err != store.ErrNotFound {
		t.Fatalf("after delete: %v", err)
	}
	for _, action := range []string{"create", "update", "delete"} {
		if n := a.count(`SELECT count(*) FROM audit_log WHERE entity = 'body_mass' AND action = $1 AND user_id = $2 AND (detail->>'client_id')::bigint = $3`, action, u.ID, c.ID); n < 1 {
			t.Fatalf("no %s audit row", action)
		}
	}

	// Another client's URL cannot reach this measurement.
	other := a.newClient(unique("Other Client"))
	if res := b.get("/clients/" + itoa(other.ID) + "/body-mass/" + itoa(list[0].ID) + "/edit"); res.status != http.StatusNotFound {
		t.Fatalf("cross-client edit page: %d", res.status)
	}
	if res := b.post("/clients/"+itoa(other.ID)+"/body-mass/"+itoa(list[0].ID)+"/delete", nil); res.status != http.StatusNotFound {
		t.Fatalf("cross-client delete: %d", res.status)
	}
}

func TestTrainingAddEditDelete(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Training Client"))
	base := "/clients/" + itoa(c.ID)
	ctx := context.Background()

	b.post(base+"/training", url.Values{"on_date": {"2027-02-27"}, "start_time": {"06:30"}, "modality": {"run"}, "duration_min": {"75"},
		"intensity_kind": {"rpe"}, "rpe": {"7"}, "zone": {"tempo"}, "distance_km": {"14.2"}, "status": {"done"}, "notes": {"hills"}}).mustRedirect(t, base)
	b.post(base+"/training", url.Values{"on_date": {"2027-03-03"}, "modality": {"cycle"}, "duration_min": {"120"},
		"intensity_kind": {"pct_vo2max"}, "pct_vo2max": {"72.5"}, "status": {"planned"}}).mustRedirect(t, base)
	b.post(base+"/training", url.Values{"on_date": {"2027-03-01"}, "start_time": {"17:00"}, "modality": {"row"}, "duration_min": {"60"},
		"intensity_kind": {"zone"}, "zone": {"threshold"}, "status": {"done"}}).mustRedirect(t, base)

	list, err := a.st.ListTraining(ctx, c.ID)
	if err != nil || len(list) != 3 {
		t.Fatalf("%d sessions, %v", len(list), err)
	}
	// Newest first.
	if list[0].Modality != "cycle" || list[1].Modality != "row" || list[2].Modality != "run" {
		t.Fatalf("order: %s %s %s", list[0].Modality, list[1].Modality, list[2].Modality)
	}
	run := list[2]
	if run.StartTime != "06:30" || run.IntensityKind != "rpe" || *run.IntensityValue != 7 || run.IntensityZone != "" || *run.DistanceKm != 14.2 {
		t.Fatalf("run stored as %+v", run)
	}
	if list[1].IntensityZone != "threshold" || list[1].IntensityValue != nil || list[0].StartTime != "" || list[0].Status != "planned" {
		t.Fatalf("row/cycle stored as %+v / %+v", list[1], list[0])
	}
	b.get(base).mustContain(t, "RPE 7", "72.5% VO2max", "threshold zone", "1 h 15 min", "14.2 km")

	id := itoa(run.ID)
	b.get(base+"/training/"+id+"/edit").mustContain(t, `value="06:30"`, `value="75"`, `value="14.2"`)
	b.post(base+"/training/"+id, url.Values{"version": {"1"}, "on_date": {"2027-02-27"}, "modality": {"run"}, "duration_min": {"80"},
		"intensity_kind": {"zone"}, "zone": {"endurance"}, "status": {"done"}}).mustRedirect(t, base)
	run, _ = a.st.TrainingByID(ctx, c.ID, run.ID)
	if run.DurationMin != 80 || run.IntensityKind != "zone" || run.IntensityZone != "endurance" || run.IntensityValue != nil || run.StartTime != "" || run.DistanceKm != nil {
		t.Fatalf("edited %+v", run)
	}
	b.post(base+"/training/"+id+"/delete", nil).mustRedirect(t, base)
	if _, err := a.st.TrainingByID(ctx, c.ID, run.ID); err != store.ErrNotFound {
		t.Fatalf("after delete: %v", err)
	}
	if n := a.count(`SELECT count(*) FROM audit_log WHERE entity = 'training' AND (detail->>'client_id')::bigint = $1`, c.ID); n != 5 {
		t.Fatalf("training audit rows = %d, want 5 (3 creates, 1 update, 1 delete)", n)
	}
}

func TestEventAddEditDelete(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Event Client"))
	base := "/clients/" + itoa(c.ID)
	ctx := context.Background()

	b.post(base+"/events", url.Values{"name": {"Lakeside Marathon"}, "starts_at": {"2027-04-18T09:00"}, "time_zone": {"Europe/Oslo"},
		"modality": {"run"}, "distance_km": {"42.195"}, "expected_duration_min": {"200"}, "days": {"1"}, "priority": {"A"}}).mustRedirect(t, base)
	evs, err := a.st.ListEvents(ctx, c.ID)
	if err != nil || len(evs) != 1 {
		t.Fatalf("%d events, %v", len(evs), err)
	}
	e := evs[0]
	// Oslo keeps summer time (UTC+2) from the last Sunday of March: 09:00 local is 07:00 UTC.
	if !e.StartsAt.Equal(time.Date(2027, 4, 18, 7, 0, 0, 0, time.UTC)) || e.TimeZone != "Europe/Oslo" || *e.DistanceKm != 42.195 {
		t.Fatalf("stored %+v (start %s UTC)", e, e.StartsAt.UTC())
	}
	b.get(base).mustContain(t, "Lakeside Marathon", "Sun 18 Apr 2027 09:00 (Europe/Oslo)", "42.195 km", "3 h 20 min")

	id := itoa(e.ID)
	b.get(base+"/events/"+id+"/edit").mustContain(t, `value="2027-04-18T09:00"`, `value="Europe/Oslo"`)
	b.post(base+"/events/"+id, url.Values{"version": {"1"}, "name": {"Lakeside Stage Race"}, "starts_at": {"2027-04-18 10:30"}, "time_zone": {"america/denver"},
		"modality": {"cycle"}, "expected_duration_min": {"240"}, "days": {"3"}, "priority": {"B"}}).mustRedirect(t, base)
	e, _ = a.st.EventByID(ctx, c.ID, e.ID)
	// Denver in April is on daylight time, UTC−6; the zone typed in lower case is saved in its IANA spelling.
	if e.Name != "Lakeside Stage Race" || !e.StartsAt.Equal(time.Date(2027, 4, 18, 16, 30, 0, 0, time.UTC)) || e.Days != 3 || e.DistanceKm != nil || e.Priority != "B" || e.TimeZone != "America/Denver" {
		t.Fatalf("edited %+v (start %s UTC)", e, e.StartsAt.UTC())
	}
	b.post(base+"/events/"+id+"/delete", nil).mustRedirect(t, base)
	if _, err := a.st.EventByID(ctx, c.ID, e.ID); err != store.ErrNotFound {
		t.Fatalf("after delete: %v", err)
	}
	if n := a.count(`SELECT count(*) FROM audit_log WHERE entity = 'event' AND (detail->>'client_id')::bigint = $1`, c.ID); n != 3 {
		t.Fatalf("event audit rows = %d", n)
	}
}

func TestTeamManagement(t *testing.T) {
	a := newApp(t)
	admin, me := a.signedIn(store.RoleAdmin)
	ctx := context.Background()
	email := unique("newcomer") + "@example.org"

	res := admin.post("/team", url.Values{"name": {"Newcomer"}, "email": {"not an email"}, "role": {"dietitian"}, "password": {"short"}})
	res.mustContain(t, "Email must be an email address like name@example.org.", "Password must be at least 10 characters.", `value="Newcomer"`)
	// A made-up password is shown in the answer itself, once (not kept in the session for the next page).
	admin.post("/team", url.Values{"name": {"Newcomer"}, "email": {email}, "role": {"dietitian"}}).
		mustContain(t, "Newcomer can now sign in as "+email, "Their password is ")
	newcomer, err := a.st.UserByEmail(ctx, email)
	if err != nil || newcomer.Role != store.RoleDietitian {
		t.Fatalf("%+v %v", newcomer, err)
	}
	// Same email in other case is refused.
	admin.post("/team", url.Values{"name": {"Twin"}, "email": {strings.ToUpper(email)}, "role": {"dietitian"}}).
		mustContain(t, "Someone on the team already signs in with this email.")

	nid := itoa(newcomer.ID)
	// Each change is made from a page showing the account as it is.
	version := func() string {
		u, err := a.st.UserByID(ctx, newcomer.ID)
		if err != nil {
			t.Fatal(err)
		}
		return itoa(int64(u.Version))
	}
	admin.post("/team/"+nid+"/role", url.Values{"role": {"admin"}, "version": {version()}}).mustRedirect(t, "/team")
	admin.post("/team/"+nid+"/disable", url.Values{"version": {version()}}).mustRedirect(t, "/team")
	if u, _ := a.st.UserByID(ctx, newcomer.ID); u.Role != store.RoleAdmin || !u.Disabled {
		t.Fatalf("after role+disable: %+v", u)
	}
	admin.post("/team/"+nid+"/enable", url.Values{"version": {version()}}).mustRedirect(t, "/team")
	before, _ := a.st.UserByID(ctx, newcomer.ID)
	admin.post("/team/"+nid+"/password", nil).mustContain(t, "New password for Newcomer: ", "They can change it under their name at the top of the page.")
	after, _ := a.st.UserByID(ctx, newcomer.ID)
	if after.Disabled || after.PasswordHash == before.PasswordHash {
		t.Fatal("enable or password reset did not happen")
	}

	// An admin cannot lock themselves out.
	admin.post("/team/"+itoa(me.ID)+"/disable", nil).mustRedirect(t, "/team")
	admin.post("/team/"+itoa(me.ID)+"/role", url.Values{"role": {"dietitian"}}).mustRedirect(t, "/team")
	if u, _ := a.st.UserByID(ctx, me.ID); u.Disabled || u.Role != store.RoleAdmin {
		t.Fatalf("admin locked themselves out: %+v", u)
	}
	for _, action := range []string{"create", "change_role", "disable", "enable", "set_password"} {
		if n := a.count(`SELECT count(*) FROM audit_log WHERE entity = 'user' AND entity_id = $1 AND action = $2 AND user_id = $3`, newcomer.ID, action, me.ID); n != 1 {
			t.Fatalf("%s audit rows = %d", action, n)
		}
	}

	admin.post("/team/practice", url.Values{"practice_name": {""}}).mustContain(t, "Practice name is required.")
}

// After a refused form the address bar shows the form's POST address; opening
// it again from there gets a page in words, not an empty 405.
func TestFormAddressOpenedDirectly(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Address Client"))
	for _, path := range []string{"/clients/" + itoa(c.ID) + "/body-mass", "/clients/" + itoa(c.ID) + "/archive", "/signout"} {
		res := b.get(path)
		if res.status != http.StatusMethodNotAllowed {
			t.Fatalf("GET %s: status %d, want 405", path, res.status)
		}
		res.mustContain(t, "This address only receives a filled-in form", `nav aria-label="Main"`)
	}
	// Anonymous visitors get the same words, and nothing else.
	res := a.browser().get("/clients/" + itoa(c.ID) + "/archive")
	if res.status != http.StatusMethodNotAllowed || strings.Contains(res.body, `nav aria-label="Main"`) {
		t.Fatalf("anonymous GET of a form address: status %d\n%s", res.status, res.body)
	}
	res.mustContain(t, "This address only receives a filled-in form")
}

// The line under a client's name leaves out the age when no date of birth is
// recorded, rather than ending in a lone dash.
func TestClientHeaderWithoutDateOfBirth(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("No Birthday"))
	page := b.get("/clients/" + itoa(c.ID))
	i := strings.Index(page.body, `<p class="sub">`)
	if i < 0 {
		t.Fatalf("no line under the name\n%s", page.body)
	}
	sub := page.body[i : i+strings.Index(page.body[i:], "</p>")]
	if !strings.Contains(sub, "Female") || strings.Contains(sub, "—") {
		t.Errorf("line under the name = %q", sub)
	}
}

// Two tabs on one client: the save from the tab opened before the other
// tab's save is refused in words (it would undo that change), keeps what was
// typed, and a second save goes through on purpose.
func TestClientEditFromStaleTab(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Two Tabs"))
	path := "/clients/" + itoa(c.ID)
	edit := b.get(path + "/edit")
	const marker = `name="loaded" value="`
	i := strings.Index(edit.body, marker)
	if i < 0 {
		t.Fatalf("edit form carries no version\n%s", edit.body)
	}
	loaded := edit.body[i+len(marker):]
	loaded = loaded[:strings.Index(loaded, `"`)]

	// The other tab saves first.
	other := c
	other.Notes = "Prefers rice."
	if err := a.st.UpdateClient(context.Background(), store.System, &other); err != nil {
		t.Fatal(err)
	}
	stale := url.Values{"loaded": {loaded}, "name": {c.Name}, "sex": {"female"}, "sport": {"Trail running"}}
	res := b.post(path, stale)
	if res.status != http.StatusConflict {
		t.Fatalf("stale save: status %d, want 409", res.status)
	}
	res.mustContain(t, "Someone saved changes to this client at", "Nothing was saved.", `id="err-loaded"`, `value="Trail running"`)
	if got, _ := a.st.ClientByID(context.Background(), c.ID); got.Notes != "Prefers rice." || got.Sport != "Running" {
		t.Fatalf("stale save changed the client: %+v", got)
	}
	// Saving again from the refused page replaces the other change knowingly.
	j := strings.Index(res.body, marker)
	fresh := res.body[j+len(marker):]
	stale.Set("loaded", fresh[:strings.Index(fresh, `"`)])
	b.post(path, stale).mustRedirect(t, path)
	if got, _ := a.st.ClientByID(context.Background(), c.ID); got.Sport != "Trail running" || got.Notes != "" {
		t.Fatalf("second save: %+v", got)
	}
}

// The client page shows the training of three weeks back to two weeks
// ahead (the days either side included), with the count of the whole log
// and a link to all of it; ?training=all shows every session.
func TestClientPageTrainingWindow(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Window Client"))
	base := "/clients/" + itoa(c.ID)
	// testNow is Mon 1 Mar 2027: the window is Mon 8 Feb to Mon 15 Mar.
	for _, s := range []struct{ on, notes string }{
		{"2027-02-07", "day before the window"},
		{"2027-02-08", "first day of the window"},
		{"2027-03-15", "last day of the window"},
		{"2027-03-16", "day after the window"},
		{"2027-02-27", "latest session with a start time"},
	} {
		start := ""
		if s.on == "2027-02-27" {
			start = "06:30"
		}
		b.post(base+"/training", url.Values{"on_date": {s.on}, "start_time": {start}, "modality": {"run"}, "duration_min": {"40"},
			"intensity_kind": {"rpe"}, "rpe": {"5"}, "status": {"planned"}, "notes": {s.notes}}).mustRedirect(t, base)
	}
	page := b.get(base)
	// The plans box offers a repletion plan after the past week's latest
	// session with a start time, read from the same window.
	page.mustContain(t, "first day of the window", "last day of the window", "The last 21 and next 14 days.",
		`href="`+base+`?training=all#training">Show all 5 sessions</a>`, "Repletion after Sat 27 Feb 06:30")
	for _, out := range []string{"day before the window", "day after the window"} {
		if strings.Contains(page.body, out) {
			t.Errorf("the client page shows the session on the %s", out)
		}
	}
	b.get(base+"?training=all").mustContain(t, "day before the window", "first day of the window", "last day of the window",
		"day after the window", "Show only the last 21 and next 14 days")
}

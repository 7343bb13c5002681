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

// The overview after sign-in: each line links to where the work is done,
// archived clients are left out, and the practice's time zone set on the
// Team page is the one it counts days in.
func TestOverviewPage(t *testing.T) {
	a := newApp(t)
	ctx := context.Background()
	diet, _ := a.signedIn(store.RoleDietitian)
	admin, _ := a.signedIn(store.RoleAdmin)

	c := a.newClient(unique("Overview Racer"))
	e := store.Event{ClientID: c.ID, Name: unique("Spring 10K"), StartsAt: testNow.AddDate(0, 0, 3), TimeZone: "Europe/London",
		Modality: "run", ExpectedDurationMin: 45, Days: 1, Priority: "A"}
	if err := a.st.AddEvent(ctx, store.System, &e); err != nil {
		t.Fatal(err)
	}
	gone := a.newClient(unique("Overview Archived"))
	ge := store.Event{ClientID: gone.ID, Name: unique("Archived race"), StartsAt: testNow.AddDate(0, 0, 2), TimeZone: "UTC",
		Modality: "run", ExpectedDurationMin: 45, Days: 1, Priority: "B"}
	if err := a.st.AddEvent(ctx, store.System, &ge); err != nil {
		t.Fatal(err)
	}
	if err := a.st.ArchiveClient(ctx, store.System, gone.ID); err != nil {
		t.Fatal(err)
	}

	res := diet.get("/")
	if res.status != http.StatusOK {
		t.Fatalf("overview: %d\n%s", res.status, res.body)
	}
	cid := itoa(c.ID)
	res.mustContain(t, e.Name, "in 3 days", "no plan",
		`href="/clients/`+cid+`/plans/new?event=`+itoa(e.ID)+`"`, // start the event's plan
		`href="/clients/`+cid+`/body-mass/new"`,                  // never measured, event ahead
		"(UTC, the practice's time zone)")
	if strings.Contains(res.body, ge.Name) || strings.Contains(res.body, gone.Name) {
		t.Fatal("the overview lists an archived client")
	}

	// The practice's zone: refused with a message when it is not one,
	// then saved, and the overview counts in it.
	admin.post("/team/practice", url.Values{"practice_name": {"Zone Practice"}, "practice_time_zone": {"Mars/Olympus"}}).
		mustContain(t, "Time zone")
	if z, _ := a.st.Setting(ctx, store.SettingPracticeTimeZone, ""); z != "" {
		t.Fatalf("a refused zone was saved: %q", z)
	}
	t.Cleanup(func() {
		_, _ = a.st.Pool.Exec(context.Background(), `DELETE FROM settings WHERE key = $1`, store.SettingPracticeTimeZone)
	})
	admin.post("/team/practice", url.Values{"practice_name": {"Zone Practice"}, "practice_time_zone": {"Pacific/Auckland"},
		"version": {formVersionAt(t, admin.get("/team").body, "/team/practice")}}).mustRedirect(t, "/team")
	admin.get("/team").mustContain(t, `value="Pacific/Auckland"`)
	// 10:00 UTC on 1 March is 23:00 in Auckland (NZDT, UTC+13): still 1 March there.
	want := testNow.In(mustZone(t, "Pacific/Auckland")).Format("Mon 2 Jan 2006")
	diet.get("/").mustContain(t, "as of "+want+" (Pacific/Auckland")
}

func mustZone(t *testing.T, name string) *time.Location {
	t.Helper()
	loc, err := time.LoadLocation(name)
	if err != nil {
		t.Fatal(err)
	}
	return loc
}

package server

import (
	"context"
	"net/url"
	"strings"
	"testing"
	"time"

	"larder/internal/store"
)

// A client whose only event is behind them still has a home zone: the new
// plan form offers that event's zone, not UTC, so a repletion plan's
// session times are read where the athlete is. The plan's default title
// gives the session's end as dates are written everywhere else.
func TestRepletionPlanZoneAndTitle(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Rowan Denver"))
	denver, _ := time.LoadLocation("America/Denver")
	ev := store.Event{ClientID: c.ID, Name: "Past regatta", StartsAt: time.Date(2027, 2, 1, 9, 0, 0, 0, denver), TimeZone: "America/Denver",
		Modality: "row", ExpectedDurationMin: 20, Days: 1, Priority: "A"}
	if err := a.st.AddEvent(context.Background(), store.System, &ev); err != nil {
		t.Fatal(err)
	}
	cid := itoa64(c.ID)
	b.get("/clients/"+cid+"/plans/new?kind=repletion").mustContain(t, `name="time_zone" value="America/Denver"`)

	res := b.post("/clients/"+cid+"/plans", url.Values{"kind": {"repletion"}, "body_mass_kg": {"70"}, "height_cm": {"180"},
		"eating_occasions": {"5"}, "time_zone": {"America/Denver"}, "session_end": {"2027-03-01T08:00"}, "next_start": {"2027-03-01T16:00"}})
	res.mustRedirect(t, "/clients/"+cid+"/plans/")
	page := b.get(res.location)
	page.mustContain(t, "Repletion, Mon 1 Mar 2027 08:00")
	if strings.Contains(page.body, "Repletion, 2027-03-01") {
		t.Errorf("the title still gives the session end as typed in the form")
	}
}

package server

import (
	"context"
	"net/http"
	"strings"
	"testing"

	"larder/internal/store"
)

// Staff pages read in fewer round trips, but never from memory that can
// lag behind the database: a change made elsewhere (here through another
// Store, as another app server would) shows on the very next request — a
// role taken away, a renamed practice, a new client record, a newly
// published version and its food suggestions.
func TestStaffPagesShowChangesAtOnce(t *testing.T) {
	a := newApp(t)
	b, u := a.signedIn(store.RoleAdmin)
	other := store.New(a.st.Pool)
	ctx := context.Background()

	if res := b.get("/team"); res.status != http.StatusOK {
		t.Fatalf("admin GET /team: %d", res.status)
	}
	if err := other.SetUserRole(ctx, store.System, u.ID, store.RoleDietitian); err != nil {
		t.Fatal(err)
	}
	if res := b.get("/team"); res.status != http.StatusForbidden {
		t.Fatalf("GET /team after the role was taken away: %d, want 403", res.status)
	}

	name := unique("Renamed Practice")
	if err := other.SetSetting(ctx, store.System, store.SettingPracticeName, name); err != nil {
		t.Fatal(err)
	}
	c := a.newClient(unique("Fay Fresh"))
	b.get("/clients/"+itoa(c.ID)).mustContain(t, name)

	// A body mass recorded elsewhere is on the client page at once.
	if err := other.AddBodyMass(ctx, store.System, &store.BodyMass{ClientID: c.ID, MeasuredOn: testNow.AddDate(0, 0, -1), MassKg: 73.9, Method: "scale", EnteredUnit: "kg"}); err != nil {
		t.Fatal(err)
	}
	b.get("/clients/"+itoa(c.ID)).mustContain(t, "73.9")

	// A version published elsewhere: the plan page of version 1 now says it
	// is superseded, version 2 shows its own food suggestion.
	p, _ := storePlan(t, a, c.ID, "Fresh week", weekRequest("2027-03-01", 3), true, "FIRST FRESH FOOD")
	plan := "/clients/" + itoa(c.ID) + "/plans/" + itoa(p.ID)
	b.get(plan+"/versions/1").mustContain(t, "FIRST FRESH FOOD")
	v1, err := other.PublishedPlanVersion(ctx, p.ID)
	if err != nil {
		t.Fatal(err)
	}
	draft, err := other.NewVersion(ctx, store.System, p.ID, v1.ID)
	if err != nil {
		t.Fatal(err)
	}
	sugg, err := other.FeedSuggestions(ctx, v1.ID)
	if err != nil {
		t.Fatal(err)
	}
	sugg[store.FeedKey("day", v1.Result.Days[0].Date, 0)] = "SECOND FRESH FOOD"
	if _, err := other.Publish(ctx, store.System, draft.ID, draft.Revision,
		store.PlanContent{Request: v1.Request, Result: v1.Result, BodyMassKg: v1.BodyMassKg, Suggestions: sugg}); err != nil {
		t.Fatal(err)
	}
	res := b.get(plan + "/versions/1")
	res.mustContain(t, store.PlanSuperseded)
	res = b.get(plan + "/versions/2")
	res.mustContain(t, "SECOND FRESH FOOD")
	if strings.Contains(res.body, "FIRST FRESH FOOD") {
		t.Fatal("version 2's page shows version 1's food suggestion")
	}
}

// A draft's page comes from memory kept under the draft's id and revision;
// a save (here through another Store, as another app server would) and
// even a change written by hand without counting the revision up show on
// the next view, and two views of one draft are the same page.
func TestDraftPageNeverStale(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	other := store.New(a.st.Pool)
	ctx := context.Background()
	c := a.newClient(unique("Dora Draft"))
	p, _ := storePlan(t, a, c.ID, "Draft week", weekRequest("2027-03-01", 3), false, "")
	page := "/clients/" + itoa(c.ID) + "/plans/" + itoa(p.ID) + "/versions/1"
	first := b.get(page)
	if first.status != http.StatusOK {
		t.Fatalf("draft page: %d", first.status)
	}
	if again := b.get(page); again.body != first.body {
		t.Fatal("a second view of an unchanged draft differs from the first")
	}

	v, err := other.PlanVersion(ctx, p.ID, 1)
	if err != nil {
		t.Fatal(err)
	}
	v.Result.Caution = "SAVED ELSEWHERE CAUTION"
	sugg, err := other.FeedSuggestions(ctx, v.ID)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := other.SaveDraft(ctx, store.System, v.ID, v.Revision,
		store.PlanContent{Request: v.Request, Result: v.Result, BodyMassKg: v.BodyMassKg, BodyMassOn: v.BodyMassOn, Suggestions: sugg}); err != nil {
		t.Fatal(err)
	}
	b.get(page).mustContain(t, "SAVED ELSEWHERE CAUTION")

	if _, err := a.st.Pool.Exec(ctx, `UPDATE plan_versions SET result = jsonb_set(result, '{caution}', '"WRITTEN BY HAND CAUTION"') WHERE id = $1`, v.ID); err != nil {
		t.Fatal(err)
	}
	res := b.get(page)
	res.mustContain(t, "WRITTEN BY HAND CAUTION")
	if strings.Contains(res.body, "SAVED ELSEWHERE CAUTION") {
		t.Fatal("the draft page shows the content before the change by hand")
	}
}

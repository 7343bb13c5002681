package server

import (
	"context"
	"strings"
	"testing"

	"larder/internal/fuel"
	"larder/internal/menu"
	"larder/internal/store"
	"larder/web"
)

// The phone page and calendar keep decoded published versions in memory;
// publishing a new version (here through another Store, as another app
// server would) shows at once, and the link's use is still recorded.
func TestClientLinkCachedVersionNeverStale(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Cora Cache"))
	p, first := storePlan(t, a, c.ID, "Cached week", weekRequest("2027-03-01", 3), true, "FIRST FOOD")
	token := makeLink(t, b, c.ID, "")
	if n := a.count(`SELECT count(*) FROM client_links WHERE client_id = $1 AND last_used_at IS NOT NULL`, c.ID); n != 0 {
		t.Fatal("an unopened link has a last use")
	}
	for range 2 { // the second view is served from the cache
		_, body := getPublic(t, a, "/c/"+token)
		response{body: body}.mustContain(t, "FIRST FOOD", web.Num(first.Days[0].ChoG, 0)+" g")
	}
	if n := a.count(`SELECT count(*) FROM client_links WHERE client_id = $1 AND last_used_at = $2`, c.ID, testNow); n != 1 {
		t.Fatal("the link's use was not recorded")
	}
	_, ics := getPublic(t, a, "/c/"+token+"/plan.ics")
	if !strings.Contains(ics, "FIRST FOOD") {
		t.Fatal("calendar lacks the first version's food")
	}

	other := store.New(a.st.Pool)
	ctx := context.Background()
	v1, err := other.PublishedPlanVersion(ctx, p.ID)
	if err != nil {
		t.Fatal(err)
	}
	draft, err := other.NewVersion(ctx, store.System, p.ID, v1.ID)
	if err != nil {
		t.Fatal(err)
	}
	req := weekRequest("2027-03-01", 3)
	req.Athlete.BodyMassKg = 82
	second, err := fuel.Compute(req)
	if err != nil {
		t.Fatal(err)
	}
	if web.Num(second.Days[0].ChoG, 0) == web.Num(first.Days[0].ChoG, 0) {
		t.Fatal("test needs versions with different figures")
	}
	foods, err := other.ListFoods(ctx, false)
	if err != nil {
		t.Fatal(err)
	}
	sugg := menu.PlanSuggestions(second, MenuFoods(foods))
	sugg[store.FeedKey("day", second.Days[0].Date, 0)] = "SECOND FOOD"
	if _, err := other.Publish(ctx, store.System, draft.ID, draft.Revision,
		store.PlanContent{Request: req, Result: second, BodyMassKg: 82, Suggestions: sugg}); err != nil {
		t.Fatal(err)
	}

	_, body := getPublic(t, a, "/c/"+token)
	response{body: body}.mustContain(t, "SECOND FOOD", web.Num(second.Days[0].ChoG, 0)+" g")
	if strings.Contains(body, "FIRST FOOD") || strings.Contains(body, web.Num(first.Days[0].ChoG, 0)+" g") {
		t.Fatalf("the phone page still shows the superseded version\n%s", body)
	}
	_, ics = getPublic(t, a, "/c/"+token+"/plan.ics")
	if !strings.Contains(ics, "SECOND FOOD") || strings.Contains(ics, "FIRST FOOD") {
		t.Fatal("the calendar still shows the superseded version")
	}
}

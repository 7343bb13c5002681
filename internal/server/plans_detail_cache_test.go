package server

import (
	"context"
	"crypto/sha256"
	"net/http"
	"regexp"
	"strings"
	"testing"
	"time"

	"larder/internal/fuel"
	"larder/internal/menu"
	"larder/internal/store"
)

// The body of a plan page is kept rendered under a key of everything it
// reads (planDetailKey). Each test here views a page twice (so its body is
// kept, and a kept body must equal the one rendered anew), changes one of
// those inputs from outside — through another Store, as another app server
// would, or by hand in SQL — and sees the change on the very next view.

// viewTwice views page twice and fails unless both views are the same page.
func viewTwice(t *testing.T, b *browser, page string) response {
	t.Helper()
	first := b.get(page)
	if first.status != http.StatusOK {
		t.Fatalf("GET %s: %d", page, first.status)
	}
	if again := b.get(page); again.body != first.body {
		t.Fatalf("a second view of unchanged %s differs from the first", page)
	}
	return first
}

var massGainRe = regexp.MustCompile(`(?s)id="mass-gain">.*?<div class="value">([^<]*)</div>`)

func massGain(t *testing.T, res response) string {
	t.Helper()
	m := massGainRe.FindStringSubmatch(res.body)
	if m == nil {
		t.Fatal("plan page shows no expected body-mass gain")
	}
	return m[1]
}

// loadingRequest is a two-day carbohydrate-loading plan before a marathon,
// whose page shows the expected body-mass gain in the client's unit.
func loadingRequest() fuel.Request {
	dist := 42.195
	return fuel.Request{Kind: fuel.KindLoading, Protocol: fuel.ProtocolTwoDay, TimeZone: "Europe/London", EatingOccasions: 5,
		Athlete: fuel.Athlete{Sex: "female", BodyMassKg: 58},
		Event:   &fuel.Event{StartsAt: time.Date(2027, 3, 7, 9, 0, 0, 0, time.UTC), Modality: "run", DistanceKm: &dist, ExpectedDurationMin: 215}}
}

// The unit body masses are shown in: the client's own choice, and the
// practice's when the client has none.
func TestPlanBodyFollowsTheMassUnit(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	other := store.New(a.st.Pool)
	ctx := context.Background()
	c := a.newClient(unique("Una Unit"))
	p, _ := storePlan(t, a, c.ID, "Loading", loadingRequest(), true, "")
	page := "/clients/" + itoa(c.ID) + "/plans/" + itoa(p.ID) + "/versions/1"
	if err := other.SetSetting(ctx, store.System, store.SettingMassUnit, "kg"); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { other.SetSetting(ctx, store.System, store.SettingMassUnit, "kg") })

	if g := massGain(t, viewTwice(t, b, page)); !strings.HasSuffix(g, " kg") {
		t.Fatalf("expected gain %q is not in kg", g)
	}
	// The client's own unit, written by hand.
	if _, err := a.st.Pool.Exec(ctx, `UPDATE clients SET mass_unit = 'lb' WHERE id = $1`, c.ID); err != nil {
		t.Fatal(err)
	}
	if g := massGain(t, viewTwice(t, b, page)); !strings.HasSuffix(g, " lb") {
		t.Fatalf("after the client's unit became lb, the expected gain reads %q", g)
	}
	// Back to the practice's unit, then the practice's unit changes.
	if _, err := a.st.Pool.Exec(ctx, `UPDATE clients SET mass_unit = NULL WHERE id = $1`, c.ID); err != nil {
		t.Fatal(err)
	}
	if g := massGain(t, viewTwice(t, b, page)); !strings.HasSuffix(g, " kg") {
		t.Fatalf("after the client followed the practice's kg again, the expected gain reads %q", g)
	}
	if err := other.SetSetting(ctx, store.System, store.SettingMassUnit, "lb"); err != nil {
		t.Fatal(err)
	}
	if g := massGain(t, b.get(page)); !strings.HasSuffix(g, " lb") {
		t.Fatalf("after the practice's unit became lb, the expected gain reads %q", g)
	}
}

// The client's name (in the notes box of a draft), recorded cautions and
// dietary needs (the note over the food suggestions).
func TestPlanBodyFollowsTheClientRecord(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	other := store.New(a.st.Pool)
	ctx := context.Background()
	c := a.newClient(unique("Nell Name"))
	p, _ := storePlan(t, a, c.ID, "Week", weekRequest("2027-03-01", 3), false, "")
	page := "/clients/" + itoa(c.ID) + "/plans/" + itoa(p.ID) + "/versions/1"

	viewTwice(t, b, page).mustContain(t, "Plain words for "+c.Name+":")
	renamed := unique("Nora Renamed")
	if _, err := a.st.Pool.Exec(ctx, `UPDATE clients SET name = $2 WHERE id = $1`, c.ID, renamed); err != nil {
		t.Fatal(err)
	}
	viewTwice(t, b, page).mustContain(t, "Plain words for "+renamed+":")

	if res := b.get(page); strings.Contains(res.body, menu.GlutenFreeNote) {
		t.Fatal("the gluten-free note shows before any caution names gluten")
	}
	if _, err := a.st.Pool.Exec(ctx, `UPDATE clients SET cautions = 'coeliac disease' WHERE id = $1`, c.ID); err != nil {
		t.Fatal(err)
	}
	// Unconfirmed needs are read from the cautions (common practice: a
	// caution naming coeliac disease keeps gluten out).
	viewTwice(t, b, page).mustContain(t, "Suggestions keep to: Gluten-free (read from the recorded cautions)")

	needs, err := other.ClientDietaryNeeds(ctx, c.ID)
	if err != nil {
		t.Fatal(err)
	}
	if err := other.SaveDietaryNeeds(ctx, store.System, c.ID, needs.Revision, store.DietaryNeeds{Codes: []string{"gluten_free", "vegan"}}); err != nil {
		t.Fatal(err)
	}
	res := viewTwice(t, b, page)
	res.mustContain(t, "Suggestions keep to: Gluten-free, Vegan")
	if strings.Contains(res.body, "(read from the recorded cautions)") {
		t.Fatal("confirmed needs still shown as read from the cautions")
	}
}

// A draft's stored food suggestions (replaced without the revision moving,
// as when the client's dietary needs change), its notes to the athlete and
// its content, each written by hand.
func TestPlanBodyFollowsTheDraft(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	other := store.New(a.st.Pool)
	ctx := context.Background()
	c := a.newClient(unique("Dan Draft"))
	p, plan := storePlan(t, a, c.ID, "Week", weekRequest("2027-03-01", 3), false, "FIRST KEPT FOOD")
	page := "/clients/" + itoa(c.ID) + "/plans/" + itoa(p.ID) + "/versions/1"
	viewTwice(t, b, page).mustContain(t, "FIRST KEPT FOOD")

	v, err := other.PlanVersion(ctx, p.ID, 1)
	if err != nil {
		t.Fatal(err)
	}
	sugg, err := other.FeedSuggestions(ctx, v.ID)
	if err != nil {
		t.Fatal(err)
	}
	sugg[store.FeedKey("day", plan.Days[0].Date, 0)] = "SECOND KEPT FOOD"
	if err := other.SetDraftSuggestions(ctx, v.ID, sugg); err != nil {
		t.Fatal(err)
	}
	res := viewTwice(t, b, page)
	res.mustContain(t, "SECOND KEPT FOOD")
	if strings.Contains(res.body, "FIRST KEPT FOOD") {
		t.Fatal("the draft page shows the suggestion replaced meanwhile")
	}

	// athlete_notes moves no revision: only the form's values tell.
	for _, note := range []string{"FIRST NOTE BY HAND", "SECOND NOTE BY HAND"} {
		if _, err := a.st.Pool.Exec(ctx, `UPDATE plan_versions SET athlete_notes = jsonb_build_object('plan', $2::text) WHERE id = $1`, v.ID, note); err != nil {
			t.Fatal(err)
		}
		viewTwice(t, b, page).mustContain(t, note)
	}

	if _, err := a.st.Pool.Exec(ctx, `UPDATE plan_versions SET result = jsonb_set(result, '{days,0,advice}', '["ADVICE WRITTEN BY HAND"]') WHERE id = $1`, v.ID); err != nil {
		t.Fatal(err)
	}
	viewTwice(t, b, page).mustContain(t, "ADVICE WRITTEN BY HAND")
}

// A saved food choice is checked against the foods list as it is now: a
// food marked as containing gluten after it was chosen for a client who
// keeps gluten-free is flagged on the next view.
func TestPlanBodyFollowsTheFoodsList(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	other := store.New(a.st.Pool)
	ctx := context.Background()
	c := a.newClient(unique("Fay Foods"))
	if _, err := a.st.Pool.Exec(ctx, `UPDATE clients SET cautions = 'coeliac disease' WHERE id = $1`, c.ID); err != nil {
		t.Fatal(err)
	}
	p, plan := storePlan(t, a, c.ID, "Week", weekRequest("2027-03-01", 3), false, "")
	page := "/clients/" + itoa(c.ID) + "/plans/" + itoa(p.ID) + "/versions/1"
	food := store.Food{Name: unique("Plain rice cake"), CarbohydrateG: 80, ProteinG: 8, FatG: 3, FibreG: 3, EnergyKcal: 390,
		PortionName: "1 cake (10 g)", PortionG: 10, Source: "invented for this test"}
	if err := other.AddFood(ctx, store.System, &food); err != nil {
		t.Fatal(err)
	}
	v, err := other.PlanVersion(ctx, p.ID, 1)
	if err != nil {
		t.Fatal(err)
	}
	feed := plan.Days[0].Feeds[0]
	grams := feed.ChoG / 0.8
	if _, err := other.SetFeedChoice(ctx, store.System, v.ID, v.Revision, "day", plan.Days[0].Date, 0,
		[]menu.ChoiceLine{{FoodID: food.ID, Name: food.Name, Grams: grams, Unit: menu.UnitGrams, ChoG: feed.ChoG, ProteinG: grams * 0.08}}); err != nil {
		t.Fatal(err)
	}
	broken := food.Name + " breaks the client’s recorded dietary needs"
	if res := viewTwice(t, b, page); strings.Contains(res.body, broken) {
		t.Fatal("a gluten-free food is flagged as breaking the gluten-free need")
	}
	if _, err := a.st.Pool.Exec(ctx, `UPDATE foods SET contains_gluten = true WHERE id = $1`, food.ID); err != nil {
		t.Fatal(err)
	}
	viewTwice(t, b, page).mustContain(t, broken)
}

// Publishing a draft (here through another Store) turns its page from the
// builder's inputs to figures that can no longer change.
func TestPlanBodyFollowsTheStatus(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	other := store.New(a.st.Pool)
	ctx := context.Background()
	c := a.newClient(unique("Pia Publish"))
	p, _ := storePlan(t, a, c.ID, "Week", weekRequest("2027-03-01", 3), false, "")
	page := "/clients/" + itoa(c.ID) + "/plans/" + itoa(p.ID) + "/versions/1"
	viewTwice(t, b, page).mustContain(t, `form="plan-edit"`, "/food")

	v, err := other.PlanVersion(ctx, p.ID, 1)
	if err != nil {
		t.Fatal(err)
	}
	sugg, err := other.FeedSuggestions(ctx, v.ID)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := other.Publish(ctx, store.System, v.ID, v.Revision,
		store.PlanContent{Request: v.Request, Result: v.Result, BodyMassKg: v.BodyMassKg, BodyMassOn: v.BodyMassOn, Suggestions: sugg}); err != nil {
		t.Fatal(err)
	}
	res := viewTwice(t, b, page)
	if strings.Contains(res.body, `form="plan-edit"`) || strings.Contains(res.body, "Change food") {
		t.Fatal("the published version's page still shows the draft's inputs")
	}
}

// The kept bodies stay within their byte bound, dropping the least
// recently used first.
func TestPlanDetailCacheIsBounded(t *testing.T) {
	c := newPlanDetailCache(1000)
	key := func(i byte) (k [sha256.Size]byte) { k[0] = i; return k }
	body := func(n int) *planDetail { return &planDetail{html: make([]byte, n)} }
	for i := range byte(10) {
		c.add(key(i), body(300))
		if got := c.bytes.Load(); got > 1000 {
			t.Fatalf("after %d bodies of 300 bytes the cache holds %d bytes, over its 1000", i+1, got)
		}
	}
	if c.lru.Len() != 3 || c.bytes.Load() != 900 {
		t.Fatalf("cache holds %d bodies, %d bytes; want the last 3, 900 bytes", c.lru.Len(), c.bytes.Load())
	}
	if _, ok := c.get(key(9)); !ok {
		t.Fatal("the newest body was dropped")
	}
	if _, ok := c.get(key(0)); ok {
		t.Fatal("the oldest body was kept")
	}
	c.add(key(20), body(2000))
	if _, ok := c.get(key(20)); ok || c.bytes.Load() != 900 {
		t.Fatal("a body larger than the whole bound was kept")
	}
}

// The key changes with each input of the body, and a view that shows what
// was typed once is never kept.
func TestPlanDetailKeyNeedsEveryInput(t *testing.T) {
	base := detailInputs{c: store.Client{ID: 1, Name: "A", Unit: "kg", Cautions: ""}, p: store.Plan{ID: 2},
		v:      store.PlanVersion{ID: 3, Version: 1, Revision: 1, Status: store.PlanDraft},
		stored: map[string]string{"day_2027-03-01_0": "rice"}, choices: map[string][]menu.ChoiceLine{},
		byID: map[int64]menu.Food{}}
	k0, ok := planDetailKey(base, "")
	if !ok {
		t.Fatal("a plain view is not kept")
	}
	changes := map[string]func(in *detailInputs){
		"client id":   func(in *detailInputs) { in.c.ID = 9 },
		"client name": func(in *detailInputs) { in.c.Name = "B" },
		"unit":        func(in *detailInputs) { in.c.Unit = "lb" },
		"cautions":    func(in *detailInputs) { in.c.Cautions = "coeliac" },
		"plan id":     func(in *detailInputs) { in.p.ID = 9 },
		"version id":  func(in *detailInputs) { in.v.ID = 9 },
		"version":     func(in *detailInputs) { in.v.Version = 9 },
		"revision":    func(in *detailInputs) { in.v.Revision = 9 },
		"status":      func(in *detailInputs) { in.v.Status = store.PlanPublished },
		"needs":       func(in *detailInputs) { in.needs.Codes = []string{"vegan"} },
		"confirmed":   func(in *detailInputs) { now := time.Now(); in.needs.ConfirmedAt = &now },
		"suggestion":  func(in *detailInputs) { in.stored = map[string]string{"day_2027-03-01_0": "bread"} },
		"choice": func(in *detailInputs) {
			in.choices = map[string][]menu.ChoiceLine{"day_2027-03-01_0": {{Free: true, ChoG: 1}}}
		},
		"food":       func(in *detailInputs) { in.byID = map[int64]menu.Food{1: {ID: 1, ContainsGluten: true}} },
		"form value": func(in *detailInputs) { in.form.Values = map[string][]string{"note_plan": {"x"}} },
	}
	for name, change := range changes {
		in := base
		change(&in)
		if k, _ := planDetailKey(in, ""); k == k0 {
			t.Errorf("changing the %s leaves the key as it was", name)
		}
	}
	if _, ok := planDetailKey(base, "saved meanwhile"); ok {
		t.Error("a page answering a refused save is kept")
	}
	withErr := base
	withErr.form.Errors = map[string]string{"gkg_2027-03-01": "too high"}
	if _, ok := planDetailKey(withErr, ""); ok {
		t.Error("a form with errors is kept")
	}
}

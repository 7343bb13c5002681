package store_test

import (
	"context"
	"testing"
	"time"

	"larder/internal/fuel"
	"larder/internal/store"
	"larder/internal/testdb"
)

func lastUsed(t *testing.T, st *store.Store, id int64) *time.Time {
	t.Helper()
	var at *time.Time
	if err := st.Pool.QueryRow(context.Background(), `SELECT last_used_at FROM client_links WHERE id = $1`, id).Scan(&at); err != nil {
		t.Fatal(err)
	}
	return at
}

// A link's use is still recorded, but a view within LinkUseEvery of the
// recorded one writes nothing.
func TestLinkUseRecordedOncePerHour(t *testing.T) {
	ctx := context.Background()
	st := store.New(testdb.Pool(t))
	c := store.Client{Name: uniq("Use"), Sex: store.SexFemale}
	if err := st.CreateClient(ctx, store.System, &c); err != nil {
		t.Fatal(err)
	}
	now := time.Date(2027, 5, 1, 8, 0, 0, 0, time.UTC)
	l := store.ClientLink{ClientID: c.ID, TokenHash: linkHash(uniq("use")), CreatedAt: now, ExpiresAt: now.AddDate(0, 0, 30)}
	if err := st.CreateClientLink(ctx, store.System, &l); err != nil {
		t.Fatal(err)
	}
	if at := lastUsed(t, st, l.ID); at != nil {
		t.Fatalf("a new link is used at %v", at)
	}
	open := func(at time.Time) {
		t.Helper()
		if _, err := st.OpenClientLink(ctx, l.TokenHash, at); err != nil {
			t.Fatal(err)
		}
	}
	open(now)
	if at := lastUsed(t, st, l.ID); at == nil || !at.Equal(now) {
		t.Fatalf("first view not recorded: %v", at)
	}
	open(now.Add(10 * time.Minute))
	open(now.Add(59 * time.Minute))
	if at := lastUsed(t, st, l.ID); at == nil || !at.Equal(now) {
		t.Fatalf("views within the hour rewrote the last use: %v", at)
	}
	later := now.Add(time.Hour + time.Minute)
	open(later)
	if at := lastUsed(t, st, l.ID); at == nil || !at.Equal(later) {
		t.Fatalf("a view after the hour was not recorded: %v", at)
	}
	links, err := st.ClientLinks(ctx, c.ID)
	if err != nil || len(links) != 1 || links[0].LastUsedAt == nil || !links[0].LastUsedAt.Equal(later) {
		t.Fatalf("staff list shows last use %+v %v", links, err)
	}
}

// The link's lookup brings its client, the practice name and the published
// plans with their event's name; a cached published version is never
// served after a newer version of its plan is published.
func TestOpenClientLinkNeverServesSupersededVersion(t *testing.T) {
	ctx := context.Background()
	st := store.New(testdb.Pool(t))
	c := store.Client{Name: uniq("Cached Athlete"), Sex: store.SexMale, Cautions: "coeliac", SharedNote: "Keep to gluten-free foods", AthleteSeesEnergyMass: true}
	if err := st.CreateClient(ctx, store.System, &c); err != nil {
		t.Fatal(err)
	}
	now := time.Date(2027, 3, 1, 8, 0, 0, 0, time.UTC)
	l := store.ClientLink{ClientID: c.ID, TokenHash: linkHash(uniq("cache")), CreatedAt: now, ExpiresAt: now.AddDate(0, 0, 30)}
	if err := st.CreateClientLink(ctx, store.System, &l); err != nil {
		t.Fatal(err)
	}
	content := func(mass float64, sugg string) store.PlanContent {
		req := fuel.Request{Kind: fuel.KindWeek, StartDate: "2027-03-01", Days: 3, Athlete: fuel.Athlete{Sex: "male", BodyMassKg: mass}}
		plan, err := fuel.Compute(req)
		if err != nil {
			t.Fatal(err)
		}
		return store.PlanContent{Request: req, Result: plan, BodyMassKg: mass,
			Suggestions: map[string]string{store.FeedKey("day", "2027-03-01", 0): sugg}}
	}
	o, err := st.OpenClientLink(ctx, l.TokenHash, now)
	if err != nil || o.ClientName != c.Name || o.SharedNote != "Keep to gluten-free foods" || !o.ShowFigures || o.PracticeName == "" || len(o.Plans) != 0 {
		t.Fatalf("link without plans: %+v %v", o, err)
	}

	p := store.Plan{ClientID: c.ID, Kind: fuel.KindWeek, Title: "Cached week"}
	v1, err := st.CreatePlan(ctx, store.System, &p, content(60, "rice"))
	if err != nil {
		t.Fatal(err)
	}
	if _, err := st.Publish(ctx, store.System, v1.ID, v1.Revision, content(60, "rice")); err != nil {
		t.Fatal(err)
	}
	first := openPlans(t, st, l.TokenHash, now)
	if len(first) != 1 || first[0].Version.ID != v1.ID || first[0].Version.BodyMassKg != 60 ||
		first[0].Suggestions[store.FeedKey("day", "2027-03-01", 0)] != "rice" {
		t.Fatalf("first view: %+v", first)
	}
	// Twice: the second read is served by the cache.
	if again := openPlans(t, st, l.TokenHash, now); again[0].Version.ID != v1.ID {
		t.Fatalf("second view: %+v", again)
	}

	v2, err := st.NewVersion(ctx, store.System, p.ID, v1.ID)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := st.Publish(ctx, store.System, v2.ID, v2.Revision, content(80, "pasta")); err != nil {
		t.Fatal(err)
	}
	got := openPlans(t, st, l.TokenHash, now)
	if len(got) != 1 || got[0].Version.ID != v2.ID || got[0].Version.Version != 2 || got[0].Version.BodyMassKg != 80 ||
		got[0].Version.Result.Days[0].ChoG == first[0].Version.Result.Days[0].ChoG ||
		got[0].Suggestions[store.FeedKey("day", "2027-03-01", 0)] != "pasta" {
		t.Fatalf("after publishing version 2 the link shows %+v", got)
	}
	pubs, err := st.PublishedPlans(ctx, c.ID)
	if err != nil || len(pubs) != 1 || pubs[0].Version.ID != v2.ID {
		t.Fatalf("published plans after version 2: %+v %v", pubs, err)
	}
	// The superseded version is still readable, frozen, with its own figures.
	old, err := st.FrozenVersionByID(ctx, v1.ID)
	if err != nil || old.Version.BodyMassKg != 60 {
		t.Fatalf("superseded version: %+v %v", old, err)
	}
	// The staff's list of versions: the status is the row's own (v1 was
	// cached while published), the content each version's own.
	vs, err := st.PlanVersions(ctx, p.ID)
	if err != nil || len(vs) != 2 || vs[0].ID != v2.ID || vs[0].Status != store.PlanPublished || vs[0].BodyMassKg != 80 ||
		vs[1].ID != v1.ID || vs[1].Status != store.PlanSuperseded || vs[1].Request.Athlete.BodyMassKg != 60 ||
		vs[0].Result.Days[0].ChoG == vs[1].Result.Days[0].ChoG {
		t.Fatalf("versions after publishing version 2: %+v %v", vs, err)
	}
	// A draft is never cached: it may still change.
	v3, err := st.NewVersion(ctx, store.System, p.ID, v2.ID)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := st.FrozenVersionByID(ctx, v3.ID); err != store.ErrNotFound {
		t.Fatalf("draft through the frozen cache: %v", err)
	}
	if vs, err := st.PlanVersions(ctx, p.ID); err != nil || len(vs) != 3 || vs[0].Status != store.PlanDraft || vs[0].Request.Athlete.BodyMassKg != 80 {
		t.Fatalf("versions with a draft: %+v %v", vs, err)
	}
}

func openPlans(t *testing.T, st *store.Store, hash []byte, now time.Time) []store.PublishedPlan {
	t.Helper()
	ctx := context.Background()
	o, err := st.OpenClientLink(ctx, hash, now)
	if err != nil {
		t.Fatal(err)
	}
	plans, err := st.LoadPublished(ctx, o.Plans)
	if err != nil {
		t.Fatal(err)
	}
	return plans
}

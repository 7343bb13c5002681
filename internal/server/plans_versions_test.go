package server

import (
	"context"
	"errors"
	"math"
	"net/http"
	"net/url"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"larder/internal/fuel"
	"larder/internal/store"
)

// Plan versions: publishing and revising, stale and simultaneous saves of a
// draft, a draft's body mass, discarding a draft.

func TestPublishReviseAndHistory(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	cid, pid := loadingPlan(t, a, b)
	base := "/clients/" + itoa64(cid) + "/plans/" + itoa64(pid)
	v1 := latestVersion(t, a, pid)

	b.post(base+"/versions/1", url.Values{"revision": {strconv.Itoa(v1.Revision)}, "action": {"publish"}}).mustRedirect(t, base+"/versions/1")
	if v := latestVersion(t, a, pid); v.Status != store.PlanPublished || v.PublishedAt == nil {
		t.Fatalf("after publish: %s", v.Status)
	}
	b.get(base).mustContain(t, `<span class="status published">published</span>`, "Start a new version")
	// A published version cannot be edited, through the app or around it.
	res := b.post(base+"/versions/1", url.Values{"revision": {"2"}, "action": {"save"}, duringName: {"70"}})
	if res.status != http.StatusConflict {
		t.Fatalf("edit of a published version: status %d", res.status)
	}
	res.mustContain(t, "can no longer change", `value="70"`)
	if _, err := a.st.Pool.Exec(context.Background(), `UPDATE plan_versions SET result = '{}' WHERE plan_id = $1`, pid); err == nil {
		t.Fatal("the database let a published version's content change")
	}

	// Revise: a new draft version, copied from the published one.
	b.post(base+"/revise", nil).mustRedirect(t, base+"/versions/2")
	v2 := latestVersion(t, a, pid)
	if v2.Version != 2 || v2.Status != store.PlanDraft {
		t.Fatalf("revision: %+v", v2)
	}
	// Revising again opens the same draft instead of a third version.
	b.post(base+"/revise", nil).mustRedirect(t, base+"/versions/2")
	taper := firstDay(t, v2.Result, fuel.RoleTaper)
	b.post(base+"/versions/2", url.Values{"revision": {strconv.Itoa(v2.Revision)}, "action": {"publish"}, occName(taper.Date): {"4"}}).mustRedirect(t, base+"/versions/2")

	vs, err := a.st.PlanVersions(context.Background(), pid)
	if err != nil || len(vs) != 2 {
		t.Fatalf("versions: %d %v", len(vs), err)
	}
	if vs[0].Status != store.PlanPublished || vs[1].Status != store.PlanSuperseded {
		t.Fatalf("statuses: v2 %s, v1 %s", vs[0].Status, vs[1].Status)
	}
	if got := len(firstDay(t, vs[0].Result, fuel.RoleTaper).Feeds); got != 4 {
		t.Errorf("first taper day of version 2 has %d feeds, want the 4 eating occasions set", got)
	}
	if len(vs[1].Request.Overrides) != 0 {
		t.Error("version 1 changed when version 2 was edited")
	}
	// Earlier versions stay readable; the history lists both.
	old := b.get(base + "/versions/1")
	old.mustContain(t, "superseded", `id="versions"`, `data-version="2"`, `data-version="1"`)
	if strings.Contains(old.body, `id="plan-edit"`) {
		t.Error("a superseded version offers editing")
	}
}

func TestConcurrentEditConflict(t *testing.T) {
	a := newApp(t)
	alice, aliceUser := a.signedIn(store.RoleDietitian)
	bob, _ := a.signedIn(store.RoleDietitian)
	cid, pid := loadingPlan(t, a, alice)
	editURL := "/clients/" + itoa64(cid) + "/plans/" + itoa64(pid) + "/versions/1"
	v := latestVersion(t, a, pid)
	load := firstDay(t, v.Result, fuel.RoleLoad)
	opened := strconv.Itoa(v.Revision) // both opened the draft at this revision

	alice.post(editURL, url.Values{"revision": {opened}, "action": {"save"}, gkgName(load.Date): {"11"}}).mustRedirect(t, editURL)
	res := bob.post(editURL, url.Values{"revision": {opened}, "action": {"save"}, gkgName(load.Date): {"10.5"}, duringName: {"75"}})
	if res.status != http.StatusConflict {
		t.Fatalf("stale save: status %d", res.status)
	}
	res.mustContain(t, "Not saved", aliceUser.Name, `value="10.5"`, `value="75"`, `name="revision" value="`+strconv.Itoa(v.Revision+1)+`"`, "saved meanwhile: 11")
	now := latestVersion(t, a, pid)
	if *now.Request.Overrides[0].ChoGPerKg != 11 || now.Request.DuringEventChoGPerH != nil {
		t.Fatalf("the stale save changed the draft: %+v", now.Request)
	}
	// Saving again against the revision shown succeeds.
	bob.post(editURL, url.Values{"revision": {strconv.Itoa(now.Revision)}, "action": {"save"}, gkgName(load.Date): {"10.5"}, duringName: {"75"}}).mustRedirect(t, editURL)
	if v := latestVersion(t, a, pid); *v.Request.Overrides[0].ChoGPerKg != 10.5 || *v.Request.DuringEventChoGPerH != 75 {
		t.Fatalf("second save: %+v", v.Request)
	}
}

// suggestionPart reads a suggestion's food, "Name: 2 × portion (250 g)"
// (or "(500 ml)", "(230 g cooked)"; "1½ ×"; no "n ×" for one portion; no
// amount when the portion name gives its size), back into the name and the
// number of portions.
var suggestionPart = regexp.MustCompile(`^(.+?): (?:([0-9]*½?) × )?(.+?)(?: \(([0-9]+) (?:ml|g|g cooked)\))?$`)

// suggestionFlour reads a flour said as the breads it makes, "Whole-wheat
// flour (atta): 2 chapatis (made with 60 g of flour)": name and portions.
var suggestionFlour = regexp.MustCompile(`^(.+?): ([0-9]*½?) \pL+ \(made with [0-9]+ g of flour\)$`)

// suggestionPortions reads "2", "½" or "1½" (one when empty).
func suggestionPortions(s string) float64 {
	if s == "" {
		return 1
	}
	n := 0.0
	if w := strings.TrimSuffix(s, "½"); w != "" {
		n, _ = strconv.ParseFloat(w, 64)
	}
	if strings.HasSuffix(s, "½") {
		n += 0.5
	}
	return n
}

func TestDraftBodyMassRecomputes(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	cid, pid := loadingPlan(t, a, b)
	editURL := "/clients/" + itoa64(cid) + "/plans/" + itoa64(pid) + "/versions/1"
	v := latestVersion(t, a, pid)
	page := b.get(editURL)
	page.mustContain(t, `name="`+massName+`" id="f-`+massName+`" value="58"`)

	res := b.post(editURL, url.Values{"revision": {strconv.Itoa(v.Revision)}, "action": {"save"}, massName: {"500"}})
	if res.status != http.StatusUnprocessableEntity {
		t.Fatalf("bad body mass: status %d", res.status)
	}
	res.mustContain(t, "Body mass must be between 20 and 300 kg.", `value="500"`)

	b.post(editURL, url.Values{"revision": {strconv.Itoa(v.Revision)}, "action": {"save"}, massName: {"61"}, fatName: {""}}).mustRedirect(t, editURL)
	v2 := latestVersion(t, a, pid)
	if v2.BodyMassKg != 61 || v2.Request.Athlete.BodyMassKg != 61 || v2.BodyMassOn != nil || v2.Request.Athlete.BodyFatPct != nil {
		t.Fatalf("body figures not saved: %v kg on %v, fat %v", v2.BodyMassKg, v2.BodyMassOn, v2.Request.Athlete.BodyFatPct)
	}
	// grams = g/kg × body mass (common practice), now with 61 kg.
	for _, d := range v2.Result.Days {
		if math.Abs(d.ChoG-d.ChoGPerKg*61) > 1 {
			t.Errorf("%s: %v g for %v g/kg at 61 kg", d.Date, d.ChoG, d.ChoGPerKg)
		}
	}
	b.get(editURL).mustContain(t, "61 kg, typed in for this plan")
}

// Two saves racing on the same revision: the row lock and the revision
// check let exactly one through, whatever the timing.
func TestSimultaneousSavesOneWins(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	_, pid := loadingPlan(t, a, b)
	v := latestVersion(t, a, pid)
	content := store.PlanContent{Request: v.Request, Result: v.Result, BodyMassKg: v.BodyMassKg}
	const n = 6
	errs := make(chan error, n)
	for i := 0; i < n; i++ {
		go func() {
			_, err := a.st.SaveDraft(context.Background(), store.System, v.ID, v.Revision, content)
			errs <- err
		}()
	}
	ok, stale := 0, 0
	for i := 0; i < n; i++ {
		switch err := <-errs; {
		case err == nil:
			ok++
		case errors.Is(err, store.ErrStaleRevision):
			stale++
		default:
			t.Errorf("save: %v", err)
		}
	}
	if ok != 1 || stale != n-1 {
		t.Fatalf("%d saves won, %d refused; want 1 and %d", ok, stale, n-1)
	}
	if got := latestVersion(t, a, pid).Revision; got != v.Revision+1 {
		t.Fatalf("revision %d after one save from %d", got, v.Revision)
	}
}

func TestDiscardDraft(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	cid, pid := loadingPlan(t, a, b)
	base := "/clients/" + itoa64(cid) + "/plans/" + itoa64(pid)
	v1 := latestVersion(t, a, pid)

	// A stale page cannot discard.
	res := b.post(base+"/versions/1/discard", url.Values{"revision": {strconv.Itoa(v1.Revision + 5)}})
	if res.status != http.StatusConflict {
		t.Fatalf("stale discard: status %d", res.status)
	}
	b.post(base+"/versions/1", url.Values{"revision": {strconv.Itoa(v1.Revision)}, "action": {"publish"}}).mustRedirect(t, base)
	res = b.post(base+"/versions/1/discard", url.Values{"revision": {strconv.Itoa(v1.Revision + 1)}})
	if res.status != http.StatusConflict || a.count(`SELECT count(*) FROM plan_versions WHERE plan_id = $1`, pid) != 1 {
		t.Fatalf("discarding a published version: status %d", res.status)
	}
	// Discarding a revision keeps the published version.
	b.post(base+"/revise", nil).mustRedirect(t, base+"/versions/2")
	v2 := latestVersion(t, a, pid)
	b.post(base+"/versions/2/discard", url.Values{"revision": {strconv.Itoa(v2.Revision)}}).mustRedirect(t, base)
	if vs, _ := a.st.PlanVersions(context.Background(), pid); len(vs) != 1 || vs[0].Status != store.PlanPublished {
		t.Fatalf("after discarding version 2: %d versions", len(vs))
	}
	// Discarding the only version removes the plan.
	_, other := loadingPlan(t, a, b)
	ov := latestVersion(t, a, other)
	b.post("/clients/"+itoa64(cid)+"/plans/"+itoa64(other)+"/versions/1/discard", url.Values{"revision": {strconv.Itoa(ov.Revision)}}).
		mustRedirect(t, "/clients/"+itoa64(cid))
	if n := a.count(`SELECT count(*) FROM plans WHERE id = $1`, other); n != 0 {
		t.Fatal("plan with its only draft discarded still exists")
	}
}

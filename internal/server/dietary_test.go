package server

import (
	"context"
	"html"
	"net/http"
	"net/url"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"larder/internal/store"
)

// suggestionsOfDraft reads the stored food suggestions of a plan's draft.
func suggestionsOfDraft(t *testing.T, a *app, planID int64) []string {
	t.Helper()
	rows, err := a.st.Pool.Query(context.Background(), `SELECT f.suggestion FROM plan_feeds f JOIN plan_versions v ON v.id = f.plan_version_id
		WHERE v.plan_id = $1 AND v.status = 'draft' AND f.suggestion <> ''`, planID)
	if err != nil {
		t.Fatal(err)
	}
	defer rows.Close()
	var out []string
	for rows.Next() {
		var s string
		if err := rows.Scan(&s); err != nil {
			t.Fatal(err)
		}
		out = append(out, s)
	}
	if len(out) == 0 {
		t.Fatal("the draft has no stored suggestions")
	}
	return out
}

var milky = regexp.MustCompile(`(?i)milk|paneer|shake`)

// A client whose cautions say "lactose intolerance: no milk or dairy" is
// never offered milk, before and after the dietitian records the needs; the
// client page offers to record the needs the note names, the form comes
// with them ticked, and recording "vegan" re-suggests the draft at once.
func TestDietaryNeedsFromCautionsAndForm(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	cid, _ := loadingPlan(t, a, b)
	ctx := context.Background()
	c, err := a.st.ClientByID(ctx, cid)
	if err != nil {
		t.Fatal(err)
	}
	// The demo marathoner is shared with other tests: a client of our own.
	c.ID, c.Name, c.Cautions = 0, unique("Lactose Client"), "Lactose intolerance: no milk or dairy."
	if err := a.st.CreateClient(ctx, store.System, &c); err != nil {
		t.Fatal(err)
	}
	base := "/clients/" + itoa64(c.ID)
	pid := createPlan(t, b, c.ID, planForm("week", "64", "start_date", "2027-03-02"))
	for _, s := range suggestionsOfDraft(t, a, pid) {
		if milky.MatchString(s) {
			t.Errorf("unconfirmed needs from the cautions: still suggests %q", s)
		}
	}

	page := b.get(base)
	page.mustContain(t, `id="needs-offer"`, "Lactose-free (from “Lactose”)", "Milk-protein-free (from “no milk or dairy”)", "None recorded.")
	form := b.get(base + "/dietary-needs?offer=1")
	for _, code := range []string{"lactose_free", "milk_protein_free"} {
		if !regexp.MustCompile(`name="need_` + code + `" value="on" checked`).MatchString(form.body) {
			t.Errorf("offered form: %s not ticked", code)
		}
	}

	// Bad input: an unknown need and a free line over 1000 characters.
	long := strings.Repeat("x", 1001)
	res := b.post(base+"/dietary-needs", url.Values{"revision": {"0"}, "need_lactose_free": {"on"}, "need_paleo": {"on"}, "other": {long}})
	if res.status != http.StatusUnprocessableEntity {
		t.Fatalf("bad input: status %d", res.status)
	}
	res.mustContain(t, `id="err-needs"`, "“paleo” is not a dietary need", `id="err-other"`, "Keep this to 1000 characters; it has 1001.", long)
	if d, _ := a.st.ClientDietaryNeeds(ctx, c.ID); d.Confirmed() {
		t.Fatal("a refused form saved the needs")
	}

	// Good input: vegan and lactose-free, with a free line.
	b.post(base+"/dietary-needs", url.Values{"revision": {"0"}, "need_vegan": {"on"}, "need_lactose_free": {"on"}, "other": {"Dislikes dates"}}).
		mustRedirect(t, base)
	d, err := a.st.ClientDietaryNeeds(ctx, c.ID)
	if err != nil {
		t.Fatal(err)
	}
	if strings.Join(d.Codes, ",") != "lactose_free,vegan" || d.Other != "Dislikes dates" || !d.Confirmed() || d.Revision != 1 {
		t.Fatalf("saved needs: %+v", d)
	}
	b.get(base).mustContain(t, "<li>Lactose-free</li>", "<li>Vegan</li>", "Also: Dislikes dates")
	veganBreaks := regexp.MustCompile(`(?i)milk|paneer|shake|honey|egg|chicken|tuna`)
	for _, s := range suggestionsOfDraft(t, a, pid) {
		if veganBreaks.MatchString(s) {
			t.Errorf("vegan recorded: the draft still suggests %q", s)
		}
	}
	b.get("/clients/"+itoa64(c.ID)+"/plans/"+itoa64(pid)+"/versions/1").mustContain(t, html.EscapeString("Suggestions keep to: Lactose-free, Vegan"))

	// A form opened before that save is refused, its ticks kept.
	res = b.post(base+"/dietary-needs", url.Values{"revision": {"0"}, "need_no_egg": {"on"}})
	if res.status != http.StatusConflict {
		t.Fatalf("stale form: status %d", res.status)
	}
	res.mustContain(t, "Someone else saved", "now: Lactose-free, Vegan", `name="need_no_egg" value="on" checked`, `name="revision" value="`+strconv.Itoa(d.Revision)+`"`)
}

func FuzzDecodeNeeds(f *testing.F) {
	f.Add("need_vegan=on&other=x&revision=0")
	f.Add("need_paleo=on&revision=-1")
	f.Add("other=%ff&revision=abc")
	f.Fuzz(func(t *testing.T, body string) {
		v, err := url.ParseQuery(body)
		if err != nil {
			return
		}
		d, form := decodeNeeds(v)
		if form.Has() {
			return
		}
		for _, c := range d.Codes {
			if strings.TrimSpace(c) == "" {
				t.Fatalf("empty code from %q", body)
			}
		}
		if len([]rune(d.Other)) > maxNeedsOther || d.Revision < 0 {
			t.Fatalf("accepted %q: %+v", body, d)
		}
	})
}

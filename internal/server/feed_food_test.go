package server

import (
	"context"
	"html"
	"net/http"
	"net/url"
	"strconv"
	"strings"
	"testing"

	"larder/internal/menu"
	"larder/internal/sheet/sheettest"
	"larder/internal/store"
)

// foodID finds a food of the seeded list by its composition-table code.
func foodID(t *testing.T, a *app, code string) int64 {
	t.Helper()
	var id int64
	if err := a.st.Pool.QueryRow(context.Background(), `SELECT id FROM foods WHERE source = $1 AND archived_at IS NULL ORDER BY id LIMIT 1`, code).Scan(&id); err != nil {
		t.Fatalf("food %s: %v", code, err)
	}
	return id
}

// feedFoodPath is the address of the food page of a plan's first day feed.
func feedFoodPath(clientID, planID int64, version int, date string, index int) string {
	return "/clients/" + itoa64(clientID) + "/plans/" + itoa64(planID) + "/versions/" + strconv.Itoa(version) +
		"/feeds/day/" + date + "/" + strconv.Itoa(index) + "/food"
}

// A dietitian swaps a feed's food for 150 g of banana and adds a
// line in their own words; the choice is stored with the version, shown in
// the suggestion's place on the plan page and the sheet, checked against the
// feed's grams, kept through a save of the draft, through publishing and
// into the next version, and the suggestion comes back when asked.
func TestFeedFoodSwapAndFreeLineKeptAcrossVersions(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	cid, pid := loadingPlan(t, a, b)
	ctx := context.Background()
	base := "/clients/" + itoa64(cid) + "/plans/" + itoa64(pid)
	v1 := latestVersion(t, a, pid)
	day := v1.Result.Days[0]
	key := menu.FeedKey("day", day.Date, 0)
	path := feedFoodPath(cid, pid, 1, day.Date, 0)
	before, err := a.st.FeedSuggestions(ctx, v1.ID)
	if err != nil {
		t.Fatal(err)
	}

	page := b.get(base + "/versions/1")
	page.mustContain(t, `href="`+path+`"`, "Change food")
	b.get(path).mustContain(t, "Suggested from the foods list:", html.EscapeString(before[key]), `name="food_0"`, `name="free_0"`)

	banana := foodID(t, a, "E012")
	b.post(path, url.Values{"revision": {strconv.Itoa(v1.Revision)}, "action": {"save"},
		"food_0": {itoa64(banana)}, "grams_0": {"150"}, "free_0": {"toast and honey"}, "freecho_0": {"30"}}).
		mustRedirect(t, base+"/versions/1")
	// 150 g of banana gives 35.4 g carbohydrate (IFCT 2017 E012: 23.63 g
	// per 100 g), and the free line 30 g.
	want := "Dietitian’s choice: Banana: 150 g; toast and honey (30 g carbohydrate)"
	check := func(versionID int64, when string) {
		t.Helper()
		got, err := a.st.FeedSuggestions(ctx, versionID)
		if err != nil {
			t.Fatal(err)
		}
		if got[key] != want {
			t.Fatalf("%s: stored food of %s is %q, want %q", when, key, got[key], want)
		}
		choices, err := a.st.FeedChoices(ctx, versionID)
		if err != nil {
			t.Fatal(err)
		}
		lines := choices[key]
		if len(lines) != 2 || lines[0].FoodID != banana || lines[0].Grams != 150 || lines[0].ChoG != 35.4 || lines[0].Unit != menu.UnitGrams ||
			!lines[1].Free || lines[1].Name != "toast and honey" || lines[1].ChoG != 30 {
			t.Fatalf("%s: stored lines %+v", when, lines)
		}
	}
	check(v1.ID, "after the save")
	page = b.get(base + "/versions/1")
	page.mustContain(t, html.EscapeString(want))
	// 65.4 g against the feed's grams: said beside the feed when it is
	// more than ±10 % (or ±5 g) away.
	if d := 65.4 - day.Feeds[0].ChoG; d > menu.Tolerance(day.Feeds[0].ChoG) {
		page.mustContain(t, "over the feed’s")
	} else if d < -menu.Tolerance(day.Feeds[0].ChoG) {
		page.mustContain(t, "short of the feed’s")
	}
	sheetText := func(p string) string {
		t.Helper()
		res := b.get(p)
		if res.status != http.StatusOK {
			t.Fatalf("sheet %s: %d", p, res.status)
		}
		text, ok := sheettest.Text(t, []byte(res.body))
		if !ok {
			t.Skip("pdftotext (poppler-utils) not installed")
		}
		return strings.Join(strings.Fields(text), " ")
	}
	if text := sheetText(base + "/versions/1/sheet.pdf"); !strings.Contains(text, "Dietitian’s choice: Banana: 150 g") {
		t.Errorf("the draft's sheet lacks the choice:\n%s", text)
	}

	// A save of the draft rewrites its feeds: the choice stays.
	v1 = latestVersion(t, a, pid)
	b.post(base+"/versions/1", url.Values{"revision": {strconv.Itoa(v1.Revision)}, "action": {"save"}}).mustRedirect(t, base+"/versions/1")
	check(v1.ID, "after a save of the draft")

	// Published, then revised: the new version keeps the choice.
	v1 = latestVersion(t, a, pid)
	b.post(base+"/versions/1", url.Values{"revision": {strconv.Itoa(v1.Revision)}, "action": {"publish"}}).mustRedirect(t, base+"/versions/1")
	check(v1.ID, "after publishing")
	// The phone page and the calendar read a published version through
	// the frozen-version cache: the same text.
	fv, err := a.st.FrozenVersionByID(ctx, v1.ID)
	if err != nil {
		t.Fatal(err)
	}
	if fv.Suggestions[key] != want {
		t.Fatalf("published version as the phone page and calendar read it: %q, want %q", fv.Suggestions[key], want)
	}
	if _, err := a.st.Pool.Exec(ctx, `DELETE FROM plan_feed_choices WHERE plan_version_id = $1`, v1.ID); err == nil {
		t.Fatal("the database let a published version's food choice go")
	}
	if res := b.get(path); res.status != http.StatusSeeOther {
		t.Fatalf("food page of a published version: status %d, want a redirect", res.status)
	}
	if text := sheetText(base + "/sheet.pdf"); !strings.Contains(text, "toast and honey (30 g carbohydrate)") {
		t.Errorf("the published sheet lacks the free line:\n%s", text)
	}
	b.post(base+"/revise", nil).mustRedirect(t, base+"/versions/2")
	v2 := latestVersion(t, a, pid)
	check(v2.ID, "in version 2")
	b.get(base+"/versions/2").mustContain(t, html.EscapeString(want))

	// The suggestion again: the lines go, the computed suggestion is back.
	b.post(feedFoodPath(cid, pid, 2, day.Date, 0), url.Values{"revision": {strconv.Itoa(v2.Revision)}, "action": {"clear"}}).
		mustRedirect(t, base+"/versions/2")
	got, err := a.st.FeedSuggestions(ctx, v2.ID)
	if err != nil {
		t.Fatal(err)
	}
	if menu.IsChoice(got[key]) || got[key] == "" {
		t.Fatalf("after going back to the suggestion: %q", got[key])
	}
	if c, _ := a.st.FeedChoices(ctx, v1.ID); len(c[key]) != 2 {
		t.Fatal("clearing the draft's choice changed the published version's")
	}
}

// Bad input gets a message beside the field at fault, what was typed stays
// in the form, and the saved choice is not touched.
func TestFeedFoodBadInput(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	cid, pid := loadingPlan(t, a, b)
	ctx := context.Background()
	v := latestVersion(t, a, pid)
	day := v.Result.Days[0]
	key := menu.FeedKey("day", day.Date, 0)
	path := feedFoodPath(cid, pid, 1, day.Date, 0)
	rice := foodID(t, a, "A015")
	b.post(path, url.Values{"revision": {strconv.Itoa(v.Revision)}, "food_0": {itoa64(rice)}, "grams_0": {"260"}}).
		mustRedirect(t, "/clients/")
	saved := "Dietitian’s choice: White rice, boiled: 260 g cooked"
	v = latestVersion(t, a, pid)
	rev := strconv.Itoa(v.Revision)

	for _, c := range []struct {
		name   string
		form   url.Values
		field  string
		msg    string
		echoed string
	}{
		{"unknown food", url.Values{"food_0": {"999999999"}, "grams_0": {"120"}}, "food_0", "not in the foods list", `value="120"`},
		{"amount zero", url.Values{"food_0": {itoa64(rice)}, "grams_0": {"0"}}, "grams_0", "more than 0 g", `value="0"`},
		{"amount below zero", url.Values{"food_0": {itoa64(rice)}, "grams_0": {"-50"}}, "grams_0", "more than 0 g", `value="-50"`},
		{"amount absurd", url.Values{"food_0": {itoa64(rice)}, "grams_0": {"25000"}}, "grams_0", "At most 2000 g", `value="25000"`},
		{"amount not a number", url.Values{"food_0": {itoa64(rice)}, "grams_0": {"lots"}}, "grams_0", "as a number of grams", `value="lots"`},
		{"amount without a food", url.Values{"grams_1": {"80"}}, "food_1", "Choose the food for this amount", `value="80"`},
		{"empty free line", url.Values{"free_0": {"  "}, "freecho_0": {"40"}}, "free_0", "Write what to eat", `value="40"`},
		{"free line without grams", url.Values{"free_1": {"toast and honey"}}, "freecho_1", "Give the carbohydrate", `value="toast and honey"`},
		{"free line absurd grams", url.Values{"free_0": {"a feast"}, "freecho_0": {"900"}}, "freecho_0", "At most 500 g", `value="a feast"`},
		{"nothing at all", url.Values{}, "lines", "Choose at least one food or write a line", ""},
	} {
		t.Run(c.name, func(t *testing.T) {
			c.form.Set("revision", rev)
			c.form.Set("action", "save")
			res := b.post(path, c.form)
			if res.status != http.StatusUnprocessableEntity {
				t.Fatalf("status %d, want 422", res.status)
			}
			res.mustContain(t, `id="err-`+c.field+`"`, c.msg)
			if c.echoed != "" {
				res.mustContain(t, c.echoed)
			}
			got, err := a.st.FeedSuggestions(ctx, v.ID)
			if err != nil {
				t.Fatal(err)
			}
			if got[key] != saved {
				t.Fatalf("a refused form changed the saved choice to %q", got[key])
			}
		})
	}

	// A form opened before another save is refused, its lines kept.
	res := b.post(path, url.Values{"revision": {strconv.Itoa(v.Revision - 1)}, "action": {"save"}, "free_0": {"rice cakes"}, "freecho_0": {"35"}})
	if res.status != http.StatusConflict {
		t.Fatalf("stale form: status %d", res.status)
	}
	res.mustContain(t, "Not saved: someone saved this draft", `value="rice cakes"`, `value="35"`)
	if got, _ := a.st.FeedSuggestions(ctx, v.ID); got[key] != saved {
		t.Fatalf("a stale form changed the saved choice to %q", got[key])
	}
	// A feed the plan does not have.
	if res := b.get(feedFoodPath(cid, pid, 1, day.Date, 99)); res.status != http.StatusNotFound {
		t.Fatalf("unknown feed: status %d", res.status)
	}
}

// A swapped food that breaks one of the client's recorded dietary needs is
// kept (the dietitian decides) and said beside the feed.
func TestFeedFoodBreakingANeedIsSaid(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	loadDemo(t, a)
	ctx := context.Background()
	c := a.newClient(unique("Lactose Free Client"))
	if err := a.st.SaveDietaryNeeds(ctx, store.System, c.ID, 0, store.DietaryNeeds{Codes: []string{"lactose_free"}}); err != nil {
		t.Fatal(err)
	}
	pid := createPlan(t, b, c.ID, planForm("week", "64", "start_date", "2027-03-02"))
	v := latestVersion(t, a, pid)
	day := v.Result.Days[0]
	milk := foodID(t, a, "L001")
	b.post(feedFoodPath(c.ID, pid, 1, day.Date, 0), url.Values{"revision": {strconv.Itoa(v.Revision)}, "action": {"save"},
		"food_0": {itoa64(milk)}, "grams_0": {"250"}}).mustRedirect(t, "/clients/")
	b.get("/clients/"+itoa64(c.ID)+"/plans/"+itoa64(pid)+"/versions/1").
		mustContain(t, html.EscapeString("Dietitian’s choice: Buffalo milk, whole: 250 ml"),
			html.EscapeString("Buffalo milk, whole breaks the client’s recorded dietary needs: Lactose-free."))
}

// A choice is checked against the feed's protein as well as its
// carbohydrate. Banana to the feed's carbohydrate (IFCT 2017 E012: 23.63 g
// carbohydrate and 1.23 g protein per 100 g) leaves a meal's protein
// short, said beside the feed; a line in the dietitian's words counts with
// the protein given to it, and one without is said to count as 0 g; a bad
// protein figure is refused beside its box.
func TestFeedFoodProteinChecked(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	cid, pid := loadingPlan(t, a, b)
	base := "/clients/" + itoa64(cid) + "/plans/" + itoa64(pid)
	v := latestVersion(t, a, pid)
	day := v.Result.Days[0]
	feed := day.Feeds[0]
	if feed.ProteinG < menu.MinProteinAwareG || strings.Contains(feed.Label, "during") {
		t.Fatalf("the first feed (%s, %g g protein) is no meal with a protein target", feed.Label, feed.ProteinG)
	}
	path := feedFoodPath(cid, pid, 1, day.Date, 0)
	banana := foodID(t, a, "E012")
	grams := strconv.Itoa(int(feed.ChoG / 23.63 * 100))
	save := func(extra url.Values) response {
		t.Helper()
		v := latestVersion(t, a, pid)
		form := url.Values{"revision": {strconv.Itoa(v.Revision)}, "action": {"save"}, "food_0": {itoa64(banana)}, "grams_0": {grams}}
		for k, x := range extra {
			form[k] = x
		}
		return b.post(path, form)
	}
	save(nil).mustRedirect(t, base+"/versions/1")
	page := b.get(base + "/versions/1")
	page.mustContain(t, "g of protein", html.EscapeString("short of the feed’s "+strconv.FormatFloat(feed.ProteinG, 'f', -1, 64)+" g"))
	b.get(path).mustContain(t, "g of protein", `name="freeprot_0"`)

	// The rest of the protein from a line in the dietitian's words.
	save(url.Values{"free_0": {"chicken curry"}, "freecho_0": {"0"}, "freeprot_0": {strconv.FormatFloat(feed.ProteinG, 'f', -1, 64)}}).
		mustRedirect(t, base+"/versions/1")
	page = b.get(base + "/versions/1")
	page.mustContain(t, html.EscapeString("chicken curry (0 g carbohydrate, "+strconv.FormatFloat(feed.ProteinG, 'f', -1, 64)+" g protein)"))
	if strings.Contains(page.body, "g of protein") {
		t.Error("protein met with the free line's figure, yet a protein check is shown")
	}
	// Without a figure the line counts as 0 g, and the page says so.
	save(url.Values{"free_0": {"chicken curry"}, "freecho_0": {"0"}}).mustRedirect(t, base+"/versions/1")
	b.get(base+"/versions/1").mustContain(t, html.EscapeString("“chicken curry” has no protein figure, so it counts as 0 g"), "g of protein")

	for _, c := range []struct{ in, msg string }{
		{"lots", "Give the protein as a number of grams"},
		{"-3", "The protein cannot be below 0 g."},
		{"250", "At most 200 g of protein on one line"},
	} {
		res := save(url.Values{"free_0": {"chicken curry"}, "freecho_0": {"0"}, "freeprot_0": {c.in}})
		if res.status != http.StatusUnprocessableEntity {
			t.Errorf("protein %q: status %d", c.in, res.status)
		}
		res.mustContain(t, c.msg, `value="`+html.EscapeString(c.in)+`"`)
	}
}

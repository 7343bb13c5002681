package server

import (
	"context"
	"encoding/json"
	"fmt"
	"net/http/httptest"
	"os"
	"regexp"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"larder/internal/auth"
	"larder/internal/fuel"
	"larder/internal/store"
	"larder/internal/testdb"
)

// axeTags are the rule sets run on every page: WCAG 2.0, 2.1 and 2.2 at
// levels A and AA, as axe-core tags them.
var axeTags = []string{"wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22a", "wcag22aa"}

// axeReport is the part of axe.run's result the test reads.
type axeReport struct {
	Violations []struct {
		ID     string `json:"id"`
		Impact string `json:"impact"`
		Help   string `json:"help"`
		Nodes  []struct {
			Target  []any  `json:"target"`
			HTML    string `json:"html"`
			Summary string `json:"failureSummary"`
		} `json:"nodes"`
	} `json:"violations"`
	Passes int    `json:"passes"`
	URL    string `json:"url"`
}

// axeSource is axe-core's browser build (see testdata/axe/README.md for
// its version, origin and licence).
func axeSource(t *testing.T) string {
	t.Helper()
	b, err := os.ReadFile("testdata/axe/axe.min.js")
	if err != nil {
		t.Fatalf("axe-core: %v", err)
	}
	return string(b)
}

// axeCheck runs axe-core in the page the browser shows now and fails the
// test for every violation, naming the page, the rule and the elements.
func axeCheck(t *testing.T, ctx context.Context, src, page string) {
	t.Helper()
	start := time.Now()
	defer func() { t.Logf("%s: axe-core took %v", page, time.Since(start).Round(time.Millisecond)) }()
	if _, err := chromedp.Run(ctx, chromedp.Evaluate[bool](src+"\n;typeof axe === 'object'")); err != nil {
		t.Fatalf("%s: load axe-core: %v", page, err)
	}
	tags, _ := json.Marshal(axeTags)
	js := fmt.Sprintf(`axe.run(document, {runOnly: {type: 'tag', values: %s}, resultTypes: ['violations']})
		.then(r => JSON.stringify({violations: r.violations, passes: r.passes.length, url: r.url}))`, tags)
	out, err := chromedp.Run(ctx, chromedp.Evaluate[string](js, chromedp.EvalAwaitPromise))
	if err != nil {
		t.Fatalf("%s: axe.run: %v", page, err)
	}
	var rep axeReport
	if err := json.Unmarshal([]byte(out), &rep); err != nil {
		t.Fatalf("%s: axe result: %v", page, err)
	}
	// A run that checked nothing would pass anything: every page has at
	// least a language, a title and landmarks for the rules to pass on.
	if rep.Passes == 0 {
		t.Errorf("%s (%s): axe-core passed no rule at all; it did not run on the page", page, rep.URL)
	}
	for _, v := range rep.Violations {
		var where []string
		for i, n := range v.Nodes {
			if i == 5 {
				where = append(where, fmt.Sprintf("… and %d more", len(v.Nodes)-5))
				break
			}
			html := n.HTML
			if len(html) > 160 {
				html = html[:160] + "…"
			}
			where = append(where, fmt.Sprintf("%v %s\n        %s", n.Target, html, strings.ReplaceAll(n.Summary, "\n", " ")))
		}
		t.Errorf("%s (%s): %s [%s, %s]\n      %s", page, rep.URL, v.Help, v.ID, v.Impact, strings.Join(where, "\n      "))
	}
}

// axeVisit opens a page and checks it.
func axeVisit(t *testing.T, ctx context.Context, src, page, url string) {
	t.Helper()
	if err := chromedp.Do(ctx, chromedp.Navigate(url), chromedp.WaitReady(chromedp.CSS("body"))); err != nil {
		t.Fatalf("%s: open %s: %v", page, url, err)
	}
	axeCheck(t, ctx, src, page)
}

// firstHref is the address of the first link matching a CSS selector on
// the page shown now.
func firstHref(t *testing.T, ctx context.Context, sel string) string {
	t.Helper()
	href, err := chromedp.Run(ctx, chromedp.Evaluate[string](fmt.Sprintf(`(document.querySelector(%q) || {}).href || ""`, sel)))
	if err != nil || href == "" {
		t.Fatalf("no link %s on %s: %v", sel, pageURL(ctx), err)
	}
	return href
}

func pageURL(ctx context.Context) string {
	u, _ := chromedp.Run(ctx, chromedp.Evaluate[string](`location.href`))
	return u
}

// submitUnchecked submits a form as it stands with the browser's own
// checks turned off, so the server's messages beside the fields show.
func submitUnchecked(t *testing.T, ctx context.Context, page, form string) {
	t.Helper()
	js := fmt.Sprintf(`(() => { const f = document.querySelector(%q); f.noValidate = true;
		for (const e of f.querySelectorAll('input:not([type=hidden]):not([type=checkbox]):not([type=radio])')) { if (e.type !== 'submit') e.value = ''; }
		f.requestSubmit(); return true })()`, form)
	if _, err := chromedp.Run(ctx, chromedp.Evaluate[bool](js)); err != nil {
		t.Fatalf("%s: submit %s: %v", page, form, err)
	}
	if err := chromedp.Do(ctx, chromedp.WaitVisible(chromedp.CSS(".field-error"))); err != nil {
		t.Fatalf("%s: no message beside a field after submitting %s empty (%s): %v", page, form, pageURL(ctx), err)
	}
}

// TestBrowserAxeEveryPage runs axe-core's WCAG 2.x A/AA rules in Chromium on
// every page of the app: the public ones (sign-in, first-run setup, the
// client's phone page and its refusal, not found), and every staff page with
// the demo practice loaded, including forms showing their error messages.
func TestBrowserAxeEveryPage(t *testing.T) {
	ctx := browserCtxFor(t, 10*time.Minute)
	src := axeSource(t)
	a := newApp(t)
	res := loadDemo(t, a)
	bg := context.Background()
	marathoner := res.IDs.Clients["marathoner"]
	clientURL := a.srv.URL + "/clients/" + itoa64(marathoner)

	// The first-run page exists only while no one has an account: a server
	// on an empty database of its own.
	pool, _ := testdb.Empty(t)
	if _, err := store.Migrate(bg, pool); err != nil {
		t.Fatal(err)
	}
	fresh := New(Config{Store: store.New(pool), SessionCleanup: -1, Now: func() time.Time { return testNow }})
	freshSrv := httptest.NewServer(fresh)
	defer func() { freshSrv.Close(); fresh.Close() }()
	axeVisit(t, ctx, src, "first-run setup", freshSrv.URL+"/setup")
	submitUnchecked(t, ctx, "first-run setup with errors", "form")
	axeCheck(t, ctx, src, "first-run setup with errors")

	// The client's side, at phone width.
	token, hash, err := auth.NewLinkToken()
	if err != nil {
		t.Fatal(err)
	}
	link := store.ClientLink{ClientID: marathoner, TokenHash: hash, Label: unique("axe"), ExpiresAt: testNow.AddDate(0, 3, 0)}
	if err := a.st.CreateClientLink(bg, store.System, &link); err != nil {
		t.Fatal(err)
	}
	if err := chromedp.Do(ctx, chromedp.EmulateViewport(390, 844)); err != nil {
		t.Fatal(err)
	}
	axeVisit(t, ctx, src, "client's phone page", a.srv.URL+"/c/"+token)
	axeVisit(t, ctx, src, "client link no longer valid", a.srv.URL+"/c/"+strings.Repeat("A", 43))
	axeVisit(t, ctx, src, "client's phone page with the dietitian's notes", a.srv.URL+"/c/"+notedLink(t, a))
	// While the database cannot be reached: a server whose pool points at
	// a loopback port nothing listens on.
	dead := unreachableServer(t)
	axeVisit(t, ctx, src, "client link while the database is unreachable", dead+"/c/"+strings.Repeat("A", 43))
	if err := chromedp.Do(ctx, chromedp.EmulateViewport(1280, 1000)); err != nil {
		t.Fatal(err)
	}
	axeVisit(t, ctx, src, "staff page while the database is unreachable", dead+"/setup")

	axeVisit(t, ctx, src, "sign-in", a.srv.URL+"/signin")
	submitUnchecked(t, ctx, "sign-in refused", "form")
	axeCheck(t, ctx, src, "sign-in refused")
	axeVisit(t, ctx, src, "not found (signed out)", a.srv.URL+"/no-such-page")
	axeVisit(t, ctx, src, "sources (signed out)", a.srv.URL+"/sources")

	err = chromedp.Do(ctx,
		chromedp.Navigate(a.srv.URL+"/signin"),
		chromedp.WaitVisible(chromedp.ID("f-email")),
		chromedp.SendKeys(chromedp.ID("f-email"), res.Email),
		chromedp.SendKeys(chromedp.ID("f-password"), res.Password),
		chromedp.Submit(chromedp.ID("f-password")),
		chromedp.WaitVisible(chromedp.CSS(`nav[aria-label="Main"]`)),
	)
	if err != nil {
		t.Fatalf("sign in: %v", err)
	}

	for _, p := range []struct{ name, path string }{
		{"overview", "/"},
		{"clients", "/clients"},
		{"new client", "/clients/new"},
		{"foods", "/foods"},
		{"new food", "/foods/new"},
		{"sources", "/sources"},
		{"team", "/team"},
		{"account", "/account"},
		{"not found (signed in)", "/clients/999999999"},
	} {
		axeVisit(t, ctx, src, p.name, a.srv.URL+p.path)
	}
	// A colleague's role changed from a Team page opened before someone
	// else changed their account: refused, with the message in their row.
	colleague := a.user(store.RoleDietitian, false)
	axeVisit(t, ctx, src, "team", a.srv.URL+"/team")
	if err := a.st.SetUserDisabled(bg, store.System, colleague.ID, true); err != nil {
		t.Fatal(err)
	}
	submitUnchecked(t, ctx, "team, a change refused as stale", fmt.Sprintf(`form[action="/team/%d/role"]`, colleague.ID))
	axeCheck(t, ctx, src, "team, a change refused as stale")

	axeVisit(t, ctx, src, "new client", a.srv.URL+"/clients/new")
	submitUnchecked(t, ctx, "new client with errors", "main form")
	axeCheck(t, ctx, src, "new client with errors")

	axeVisit(t, ctx, src, "foods", a.srv.URL+"/foods")
	axeVisit(t, ctx, src, "edit food", firstHref(t, ctx, `a[href$="/edit"][href*="/foods/"]`))

	axeVisit(t, ctx, src, "client", clientURL)
	massEdit := firstHref(t, ctx, `a[href*="/body-mass/"][href$="/edit"]`)
	trainingEdit := firstHref(t, ctx, `a[href*="/training/"][href$="/edit"]`)
	eventEdit := firstHref(t, ctx, `a[href*="/events/"][href$="/edit"]`)
	planPage := firstHref(t, ctx, `a[href*="/plans/"]:not([href$="/new"]):not([href*="/plans/new"])`)
	for _, p := range []struct{ name, url string }{
		{"edit client", clientURL + "/edit"},
		{"new body mass", clientURL + "/body-mass/new"},
		{"edit body mass", massEdit},
		{"new training session", clientURL + "/training/new"},
		{"edit training session", trainingEdit},
		{"new event", clientURL + "/events/new"},
		{"edit event", eventEdit},
		{"new plan", clientURL + "/plans/new"},
		{"plan (published)", planPage},
		{"import", clientURL + "/import"},
		{"export and erasure", clientURL + "/data"},
		{"practice import", a.srv.URL + "/import"},
		{"dietary needs", clientURL + "/dietary-needs"},
		{"dietary needs (offered from the cautions)", clientURL + "/dietary-needs?offer=1"},
	} {
		axeVisit(t, ctx, src, p.name, p.url)
	}
	// An import preview, first with its questions open (an unknown column,
	// an ambiguous date), then answered, with a row in error.
	var demoUser int64
	if err := a.st.Pool.QueryRow(context.Background(), `SELECT id FROM users WHERE lower(email) = lower($1)`, res.Email).Scan(&demoUser); err != nil {
		t.Fatal(err)
	}
	up := store.Upload{CreatedBy: demoUser, ClientID: &marathoner, Kind: "body_mass",
		Files: []store.UploadFile{{Name: "mass.csv", Content: []byte("date,mass,remark\n01/02/2027,61,\n03/02/2027,6x,\n")}}}
	if err := a.st.SaveUpload(context.Background(), &up); err != nil {
		t.Fatal(err)
	}
	preview := a.srv.URL + "/imports/" + itoa(up.ID)
	axeVisit(t, ctx, src, "import preview with questions", preview)
	axeVisit(t, ctx, src, "import preview", preview+"?date_order=dmy&map_remark=ignore")
	axeVisit(t, ctx, src, "new body mass", clientURL+"/body-mass/new")
	submitUnchecked(t, ctx, "new body mass with errors", "main form")
	axeCheck(t, ctx, src, "new body mass with errors")

	// A draft: the page with the dietitian's override inputs.
	if err := chromedp.Do(ctx, chromedp.Navigate(planPage), chromedp.WaitReady(chromedp.CSS("body"))); err != nil {
		t.Fatal(err)
	}
	if _, err := chromedp.Run(ctx, chromedp.Evaluate[bool](`(() => { const f = document.querySelector('form[action$="/revise"]'); if (!f) return false; f.requestSubmit(); return true })()`)); err != nil {
		t.Fatalf("start a new version: %v", err)
	}
	if err := chromedp.Do(ctx, chromedp.WaitVisible(chromedp.ID("plan-edit"))); err != nil {
		t.Fatalf("the new draft shows no edit form (%s): %v", pageURL(ctx), err)
	}
	axeCheck(t, ctx, src, "plan draft")

	// A feed's food on the draft: the page, a line refused (its amount
	// left empty), then a choice saved that is over the feed's grams, whose
	// check shows beside the feed on the draft.
	draftURL := pageURL(ctx)
	foodPage := firstHref(t, ctx, `a.feed-food`)
	axeVisit(t, ctx, src, "feed food", foodPage)
	submitUnchecked(t, ctx, "feed food with errors", "#feed-food")
	axeCheck(t, ctx, src, "feed food with errors")
	if err := chromedp.Do(ctx, chromedp.Navigate(foodPage), chromedp.WaitVisible(chromedp.ID("feed-food")),
		chromedp.SendKeys(chromedp.ID("f-free_0"), "rice pudding"), chromedp.SendKeys(chromedp.ID("f-freecho_0"), "400"),
		chromedp.Click(chromedp.CSS(`button[value="save"]`)), chromedp.WaitVisible(chromedp.ID("plan-edit"))); err != nil {
		t.Fatalf("save a food choice (%s): %v", draftURL, err)
	}
	axeCheck(t, ctx, src, "plan draft with a food choice")
	axeVisit(t, ctx, src, "feed food with a saved choice", foodPage)
	// A choice whose feed the draft no longer has: listed as set aside, with
	// its Remove button.
	m := regexp.MustCompile(`/plans/(\d+)`).FindStringSubmatch(draftURL)
	if m == nil {
		t.Fatalf("draft address %q", draftURL)
	}
	if _, err := a.st.Pool.Exec(context.Background(), `INSERT INTO plan_feed_choices (plan_version_id, kind, on_date, feed_index, line, free, name, cho_g)
		SELECT plan_version_id, kind, on_date, 99, 0, true, 'banana bread', 40 FROM plan_feed_choices
		WHERE plan_version_id = (SELECT id FROM plan_versions WHERE plan_id = $1 AND status = 'draft') LIMIT 1`, m[1]); err != nil {
		t.Fatal(err)
	}
	axeVisit(t, ctx, src, "plan draft with a food choice set aside", draftURL)
	if got := text(t, ctx, "#set-aside-choices"); !strings.Contains(got, "banana bread") {
		t.Errorf("set-aside list = %q", got)
	}

	if err := chromedp.Do(ctx, chromedp.Navigate(draftURL), chromedp.WaitVisible(chromedp.ID("plan-edit"))); err != nil {
		t.Fatal(err)
	}
	// A note to the athlete too long for the phone page, refused beside its box.
	if _, err := chromedp.Run(ctx, chromedp.Evaluate[bool](`(() => { document.getElementById('f-note_plan').value = 'Eat well. '.repeat(200);
		document.querySelector('#plan-edit button[value=save]').click(); return true })()`)); err != nil {
		t.Fatalf("save a long note: %v", err)
	}
	if err := chromedp.Do(ctx, chromedp.WaitVisible(chromedp.ID("err-note_plan"))); err != nil {
		t.Fatalf("no message beside the note (%s): %v", pageURL(ctx), err)
	}
	axeCheck(t, ctx, src, "plan draft with a note to the athlete refused")
}

// TestBrowserAxePhoneRaceDays checks the phone page's race days at phone
// width: two stages of a stage race on one day, a day inside a 48 h race
// with its blocks of hours, and an Ironman's legs.
func TestBrowserAxePhoneRaceDays(t *testing.T) {
	ctx := browserCtx(t)
	src := axeSource(t)
	r := newRaceLinks(t)
	if err := chromedp.Do(ctx, chromedp.EmulateViewport(390, 844)); err != nil {
		t.Fatal(err)
	}
	oslo := time.FixedZone("+02:00", 2*3600)
	for _, v := range []struct {
		page, file, wait string
		at               time.Time
	}{
		{"phone page, two stages in a day", "stage-race-4-day.json", "#stage-4", time.Date(2027, 5, 15, 6, 0, 0, 0, oslo)},
		{"phone page, inside a 48 h race", "ultra-48h-race.json", "#blocks-list", time.Date(2027, 8, 21, 12, 0, 0, 0, oslo)},
		{"phone page, an Ironman's legs", "ironman-race.json", "#legs-list", time.Date(2027, 7, 4, 4, 0, 0, 0, oslo)},
	} {
		r.at(v.at)
		axeVisit(t, ctx, src, v.page, r.a.srv.URL+"/c/"+r.tokens[v.file])
		if err := chromedp.Do(ctx, chromedp.WaitVisible(chromedp.CSS(v.wait))); err != nil {
			t.Errorf("%s: %s not shown: %v", v.page, v.wait, err)
		}
		shot(t, ctx, "phone-"+strings.TrimSuffix(v.file, ".json"))
	}
}

// notedLink publishes a plan with notes to the athlete on the whole plan and
// on its first two days, for a client who shares a health note, and
// returns a link token to it.
func notedLink(t *testing.T, a *app) string {
	t.Helper()
	ctx := context.Background()
	c := a.newClient(unique("Axe Noted"))
	c.SharedNote = "Keep to gluten-free foods."
	if err := a.st.UpdateClient(ctx, store.System, &c); err != nil {
		t.Fatal(err)
	}
	req := weekRequest(testNow.Format(time.DateOnly), 5)
	plan, err := fuel.Compute(req)
	if err != nil {
		t.Fatal(err)
	}
	content := store.PlanContent{Request: req, Result: plan, BodyMassKg: req.Athlete.BodyMassKg, Notes: &store.PlanNotes{
		Plan: "Eat breakfast before the long runs.\nBring your own bottles.",
		Days: map[string]string{plan.Days[0].Date: "Long run today: a gel every 45 minutes.", plan.Days[1].Date: "Easy day."}}}
	p := store.Plan{ClientID: c.ID, Kind: req.Kind, Title: "Week with notes"}
	v, err := a.st.CreatePlan(ctx, store.System, &p, content)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := a.st.Publish(ctx, store.System, v.ID, v.Revision, content); err != nil {
		t.Fatal(err)
	}
	token, hash, err := auth.NewLinkToken()
	if err != nil {
		t.Fatal(err)
	}
	link := store.ClientLink{ClientID: c.ID, TokenHash: hash, Label: unique("axe notes"), ExpiresAt: testNow.AddDate(0, 3, 0)}
	if err := a.st.CreateClientLink(ctx, store.System, &link); err != nil {
		t.Fatal(err)
	}
	return token
}

// TestBrowserAxeStaffPhoneWidth opens the client page and a plan (published,
// then a draft) at 390 px, a phone's width: nothing runs past the screen's
// edge (the document is no wider than the viewport), the links are folded
// into a menu that opens, the day table is stacked rows with each figure
// named, and every state passes axe-core.
func TestBrowserAxeStaffPhoneWidth(t *testing.T) {
	ctx := browserCtxFor(t, 4*time.Minute)
	src := axeSource(t)
	a := newApp(t)
	res := loadDemo(t, a)
	clientURL := a.srv.URL + "/clients/" + itoa64(res.IDs.Clients["marathoner"])
	err := chromedp.Do(ctx, chromedp.EmulateViewport(390, 844),
		chromedp.Navigate(a.srv.URL+"/signin"),
		chromedp.WaitVisible(chromedp.ID("f-email")),
		chromedp.SendKeys(chromedp.ID("f-email"), res.Email),
		chromedp.SendKeys(chromedp.ID("f-password"), res.Password),
		chromedp.Submit(chromedp.ID("f-password")),
		chromedp.WaitVisible(chromedp.CSS("details.navmenu > summary")),
	)
	if err != nil {
		t.Fatalf("sign in at 390 px: %v", err)
	}
	// fits checks the page shown now: no sideways scrolling, and each of
	// the selectors visible on screen, inside the viewport's width.
	fits := func(page string, visible ...string) {
		t.Helper()
		widths, err := chromedp.Run(ctx, chromedp.Evaluate[[]float64](`[document.documentElement.scrollWidth, window.innerWidth]`))
		if err != nil {
			t.Fatalf("%s: %v", page, err)
		}
		if widths[1] != 390 || widths[0] > widths[1] {
			t.Errorf("%s: document %v px wide in a %v px viewport (want 390, no wider)", page, widths[0], widths[1])
		}
		for _, sel := range visible {
			js := fmt.Sprintf(`(() => { const e = document.querySelector(%q); if (!e) return "missing";
				const r = e.getBoundingClientRect(), s = getComputedStyle(e);
				if (s.display === "none" || s.visibility === "hidden" || r.width === 0 || r.height === 0) return "hidden";
				if (r.left < 0 || r.right > window.innerWidth) return "outside the screen (" + Math.round(r.left) + " to " + Math.round(r.right) + " px)";
				return "" })()`, sel)
			why, err := chromedp.Run(ctx, chromedp.Evaluate[string](js))
			if err != nil || why != "" {
				t.Errorf("%s: %s is %s %v", page, sel, why, err)
			}
		}
		// No table runs past the screen's edge or scrolls sideways inside
		// its own box: at phone width each is stacked rows. The Sources
		// table alone is a box a keyboard scrolls (long text in many columns).
		wide, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](`[...document.querySelectorAll("main table")].filter(t => !t.matches("#sources")).flatMap(t => {
				const name = t.id || (t.closest("[id]") || {}).id || t.className, r = t.getBoundingClientRect(), box = t.parentElement;
				if (r.right > window.innerWidth + 0.5 || r.left < -0.5) return [name + " spans " + Math.round(r.left) + " to " + Math.round(r.right) + " px"];
				if (t.scrollWidth > t.clientWidth + 1 || box.scrollWidth > box.clientWidth + 1) return [name + " scrolls sideways (" + Math.max(t.scrollWidth, box.scrollWidth) + " px of content in " + Math.min(t.clientWidth, box.clientWidth) + " px)"];
				return [] })`))
		if err != nil {
			t.Fatalf("%s: %v", page, err)
		}
		for _, w := range wide {
			t.Errorf("%s: table %s at 390 px", page, w)
		}
		hidden, _ := chromedp.Run(ctx, chromedp.Evaluate[string](`getComputedStyle(document.querySelector("nav.wide")).display`))
		if hidden != "none" {
			t.Errorf("%s: the row of links shows at phone width (display %q)", page, hidden)
		}
		shot(t, ctx, "phone-width-"+strings.ReplaceAll(page, " ", "-"))
	}

	axeVisit(t, ctx, src, "client at 390 px", clientURL)
	fits("client", "main h1", "#body-mass .latest", "details.navmenu > summary", "#events td", "#body-mass-history td:nth-child(2)")
	// The menu opens without script and shows the links.
	if err := chromedp.Do(ctx, chromedp.Click(chromedp.CSS("details.navmenu > summary")),
		chromedp.WaitVisible(chromedp.CSS(`nav.folded a[href="/foods"]`))); err != nil {
		t.Fatalf("open the menu: %v", err)
	}
	axeCheck(t, ctx, src, "client at 390 px, menu open")
	fits("client, menu open", `nav.folded a[href="/clients"]`, `nav.folded button.link`)

	planPage := firstHref(t, ctx, `#plans a[href*="/plans/"]:not([href*="/plans/new"])`)
	axeVisit(t, ctx, src, "plan at 390 px", planPage)
	fits("plan", "main h1", "#plan-days tr.day td:nth-child(4)", "#plan-days tr.day td:nth-child(5)")
	// Stacked: each day is a block, its figures named beside them.
	stacked, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](`(() => { const row = document.querySelector("#plan-days tr.day");
		const cell = row.querySelector("td:nth-child(5)");
		return [getComputedStyle(row).display, getComputedStyle(cell, "::before").content] })()`))
	if err != nil || len(stacked) != 2 || stacked[0] != "block" || stacked[1] != `"Carbohydrate g"` {
		t.Errorf("day table at 390 px: row display and cell name %q, %v; want block and \"Carbohydrate g\"", stacked, err)
	}

	// A draft, with its input boxes.
	if _, err := chromedp.Run(ctx, chromedp.Evaluate[bool](`(() => { const f = document.querySelector('form[action$="/revise"]'); if (!f) return false; f.requestSubmit(); return true })()`)); err != nil {
		t.Fatalf("start a new version: %v", err)
	}
	if err := chromedp.Do(ctx, chromedp.WaitVisible(chromedp.ID("plan-edit"))); err != nil {
		t.Fatalf("the new draft shows no edit form (%s): %v", pageURL(ctx), err)
	}
	axeCheck(t, ctx, src, "plan draft at 390 px")
	fits("plan draft", "main h1", "#plan-days tr.day td:nth-child(4) input", "#plan-edit button[value=save]", "table.feeds td:nth-child(3)")

	// The stage race's plan: its table of stages is stacked too.
	if err := chromedp.Do(ctx, chromedp.Navigate(a.srv.URL+"/clients/"+itoa64(res.IDs.Clients["cyclist"])), chromedp.WaitVisible(chromedp.ID("plans"))); err != nil {
		t.Fatal(err)
	}
	fits("cyclist's client page", "#plans td[data-label=Plan]")
	axeVisit(t, ctx, src, "stage race plan at 390 px", firstHref(t, ctx, `#plans a[href*="/plans/"]:not([href*="/plans/new"])`))
	fits("stage race plan", "main h1", `table.stages tr[data-stage="4"] td[data-label="Pre-stage meal"]`)

	// The other pages a dietitian works in between sessions: each form fits
	// the phone's width with its first field and its button on screen.
	for _, pg := range []struct{ name, path, field string }{
		{"overview", "/", "#overview-unopened td[data-label=Client]"},
		{"new plan form", "/clients/" + itoa64(res.IDs.Clients["marathoner"]) + "/plans/new", "main button[type=submit]"},
		{"new body mass form", "/clients/" + itoa64(res.IDs.Clients["marathoner"]) + "/body-mass/new", "main button[type=submit]"},
		{"new event form", "/clients/" + itoa64(res.IDs.Clients["marathoner"]) + "/events/new", "main button[type=submit]"},
		{"foods", "/foods", "main h1"},
		{"sources", "/sources", "main h1"},
	} {
		axeVisit(t, ctx, src, pg.name+" at 390 px", a.srv.URL+pg.path)
		fits(pg.name, "main h1", pg.field)
	}
}

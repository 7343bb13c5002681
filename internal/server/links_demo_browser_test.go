package server

import (
	"context"
	"net/http/httptest"
	"net/url"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"larder/internal/fuel"
	"larder/internal/store"
)

// TestBrowserAthletePhoneDemo opens the athlete's page of the demo's
// plans at 390 px as the athlete sees it on a carbohydrate loading day, on
// the triathlon's race day (a race-day plan made and published for it
// here) and on the first day of the stage race: the page fits the phone,
// leads with today's fuelling (its feeding times before the legs of the
// race and the days ahead),
// names each in-event total once and lists no in-event feed "(in all)".
// With LARDER_SCREENSHOTS set it saves each page and the triathlete's
// sheet there, for a person to look at.
func TestBrowserAthletePhoneDemo(t *testing.T) {
	ctx := browserCtxFor(t, 4*time.Minute)
	a := newApp(t)
	res := loadDemo(t, a)
	b, _ := a.signedIn(store.RoleDietitian)

	tri := res.IDs.Clients["triathlete"]
	pid := createPlan(t, b, tri, planForm("race", "55.2", "event_id", itoa64(res.IDs.Events["triathlon"])))
	base := "/clients/" + itoa64(tri) + "/plans/" + itoa64(pid)
	v := latestVersion(t, a, pid)
	b.post(base+"/versions/1", url.Values{"revision": {strconv.Itoa(v.Revision)}, "action": {"publish"}}).mustRedirect(t, base+"/versions/1")
	triPlan := latestVersion(t, a, pid)

	plans := map[string]store.PlanVersion{"triathlete": triPlan}
	for _, who := range []string{"marathoner", "cyclist"} {
		ps, err := a.st.ListPlans(context.Background(), res.IDs.Clients[who])
		if err != nil || len(ps) == 0 {
			t.Fatalf("%s's demo plan: %v", who, err)
		}
		plans[who] = latestVersion(t, a, ps[0].ID)
	}
	tokens := map[string]string{}
	for who := range plans {
		tokens[who] = makeLink(t, b, res.IDs.Clients[who], "phone")
	}

	// The moment each page is looked at, in the plan's own zone.
	local := func(p fuel.Plan, date string, hour int) time.Time {
		loc := planZone(p.TimeZone)
		d, err := time.ParseInLocation(time.DateOnly, date, loc)
		if err != nil {
			t.Fatal(err)
		}
		return d.Add(time.Duration(hour) * time.Hour)
	}
	mar, cyc := plans["marathoner"].Result, plans["cyclist"].Result
	var loadDay string
	for _, d := range mar.Days {
		if d.Role == "load" {
			loadDay = d.Date
			break
		}
	}
	triDay := triPlan.Request.Event.StartsAt.In(planZone(triPlan.Result.TimeZone)).Format(time.DateOnly)
	stageDay := cyc.Stages[0].StartsAt.In(planZone(cyc.TimeZone)).Format(time.DateOnly)
	views := []struct {
		name, who, wait string
		at              time.Time
	}{
		{"athlete-01-loading-day", "marathoner", "#feeds", local(mar, loadDay, 8)},
		{"athlete-02-triathlon-race-day", "triathlete", "#legs-list", local(triPlan.Result, triDay, 4)},
		{"athlete-03-stage-race-day", "cyclist", "#stage-1", local(cyc, stageDay, 6)},
	}
	if err := chromedp.Do(ctx, chromedp.EmulateViewport(390, 844)); err != nil {
		t.Fatal(err)
	}
	for _, v := range views {
		at := v.at
		s := New(Config{Store: a.st, SessionCleanup: -1, Now: func() time.Time { return at }})
		hs := httptest.NewServer(s)
		if err := chromedp.Do(ctx, chromedp.Navigate(hs.URL+"/c/"+tokens[v.who]), chromedp.WaitVisible(chromedp.CSS(v.wait))); err != nil {
			t.Errorf("%s: %s not shown: %v", v.name, v.wait, err)
			hs.Close()
			s.Close()
			continue
		}
		fitsPhone(t, ctx, v.name)
		// Today's fuelling comes first, its feeding times before the
		// days ahead; no in-event feed is listed "(in all)" a second time.
		order, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](`(() => {
			const f = document.getElementById("todays-fuelling"), feeds = document.getElementById("feeds"), next = document.getElementById("next-days");
			const out = [];
			if (!f || !feeds) return ["today's fuelling or its feeding times missing"];
			const firstH2 = document.querySelector("main h2");
			if (firstH2 !== f) out.push("first section is " + (firstH2 ? firstH2.textContent : "none"));
			if (next && !(feeds.compareDocumentPosition(next) & Node.DOCUMENT_POSITION_FOLLOWING)) out.push("the days ahead come before today's feeding times");
			const legs = document.getElementById("legs-list");
			if (legs && !(feeds.compareDocumentPosition(legs) & Node.DOCUMENT_POSITION_FOLLOWING)) out.push("the legs come before today's feeding times");
			if (document.body.innerText.includes("(in all)")) out.push("an in-event feed is listed as a feed (in all)");
			return out })()`))
		if err != nil {
			t.Fatal(err)
		}
		for _, o := range order {
			t.Errorf("%s: %s", v.name, o)
		}
		phoneShot(t, ctx, v.name)
		if dir := os.Getenv("LARDER_SCREENSHOTS"); dir != "" && v.who == "triathlete" {
			_, pdf := getPublic(t, &app{t: t, st: a.st, srv: hs}, "/c/"+tokens[v.who]+"/sheet.pdf")
			if err := os.WriteFile(filepath.Join(dir, "athlete-04-triathlon-sheet.pdf"), []byte(pdf), 0o644); err != nil {
				t.Log(err)
			}
		}
		hs.Close()
		s.Close()
	}
	if !strings.HasPrefix(loadDay, "20") {
		t.Errorf("the marathoner's demo plan has no loading day")
	}
}

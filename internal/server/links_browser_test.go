package server

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"net/http/httptest"

	"github.com/chromedp/chromedp"

	"larder/internal/fuel"
	"larder/internal/store"
	"larder/web"
)

// phoneShot saves one full-page screenshot when LARDER_SCREENSHOTS names
// a folder.
func phoneShot(t *testing.T, ctx context.Context, name string) {
	dir := os.Getenv("LARDER_SCREENSHOTS")
	if dir == "" {
		return
	}
	buf, err := chromedp.Run(ctx, chromedp.FullScreenshot(100))
	if err != nil {
		t.Logf("screenshot %s: %v", name, err)
		return
	}
	if err := os.WriteFile(filepath.Join(dir, name+".png"), buf, 0o644); err != nil {
		t.Logf("screenshot %s: %v", name, err)
	}
}

// fitsPhone fails the test when the page is wider than a 390 px phone
// screen (something would need sideways scrolling).
func fitsPhone(t *testing.T, ctx context.Context, what string) {
	t.Helper()
	w, err := chromedp.Run(ctx, chromedp.Evaluate[float64](`document.documentElement.scrollWidth`))
	if err != nil {
		t.Fatal(err)
	}
	if w > 390 {
		t.Errorf("%s is %v px wide on a 390 px phone", what, w)
	}
}

// TestBrowserClientLinkOnPhone opens a client's link at phone width on a
// load day and on race day, and the refusal of a revoked link.
func TestBrowserClientLinkOnPhone(t *testing.T) {
	ctx := browserCtx(t)
	a := newApp(t)
	b, u := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Liv Marathon"))
	c.Cautions = "Coeliac disease: strictly gluten-free"
	c.Notes = "STAFF NOTE: ferritin low in the autumn"
	c.SharedNote = "Keep to gluten-free foods."
	if err := a.st.UpdateClient(context.Background(), store.System, &c); err != nil {
		t.Fatal(err)
	}
	dist := 42.195
	ev := store.Event{ClientID: c.ID, Name: "Ferncliff Harbour Marathon", StartsAt: time.Date(2027, 3, 3, 9, 0, 0, 0, time.UTC),
		TimeZone: "Europe/London", Modality: "run", DistanceKm: &dist, ExpectedDurationMin: 215, Days: 1, Priority: "A"}
	if err := a.st.AddEvent(context.Background(), store.System, &ev); err != nil {
		t.Fatal(err)
	}
	req := fuel.Request{Kind: fuel.KindLoading, Protocol: fuel.ProtocolTwoDay, TimeZone: "Europe/London", EatingOccasions: 5,
		Athlete: fuel.Athlete{Sex: "female", BodyMassKg: 58},
		Event:   &fuel.Event{StartsAt: ev.StartsAt, Modality: "run", DistanceKm: &dist, ExpectedDurationMin: 215}}
	p, plan := storePlan(t, a, c.ID, "Marathon loading", req, true, "")
	p.EventID = &ev.ID
	if _, err := a.st.Pool.Exec(context.Background(), `UPDATE plans SET event_id = $1 WHERE id = $2`, ev.ID, p.ID); err != nil {
		t.Fatal(err)
	}

	// Staff side, at desktop width: the section on the client page, and
	// the page that shows the new link once.
	err := chromedp.Do(ctx,
		chromedp.Navigate(a.srv.URL+"/signin"),
		chromedp.WaitVisible(chromedp.ID("f-email")),
		chromedp.SendKeys(chromedp.ID("f-email"), u.Email),
		chromedp.SendKeys(chromedp.ID("f-password"), testPassword),
		chromedp.Submit(chromedp.ID("f-password")),
		chromedp.WaitVisible(chromedp.CSS(`nav[aria-label="Main"]`)),
		chromedp.Navigate(a.srv.URL+"/clients/"+itoa(c.ID)),
		chromedp.WaitVisible(chromedp.ID("client-link")),
		chromedp.SendKeys(chromedp.ID("f-label"), "phone"),
		chromedp.Click(chromedp.Search(`//button[contains(., "Create link")]`)),
		chromedp.WaitVisible(chromedp.ID("link-url")),
	)
	if err != nil {
		t.Fatalf("create a link in the browser: %v", err)
	}
	shot(t, ctx, "link-00-created")
	shown, err := chromedp.Run(ctx, chromedp.Evaluate[string](`document.getElementById("link-url").value`))
	if err != nil {
		t.Fatal(err)
	}
	m := linkRe.FindStringSubmatch(shown)
	if m == nil {
		t.Fatalf("link field holds %q", shown)
	}
	token := m[1]
	if err := chromedp.Do(ctx, chromedp.Navigate(a.srv.URL+"/clients/"+itoa(c.ID)+"#client-link"), chromedp.WaitVisible(chromedp.ID("client-links"))); err != nil {
		t.Fatal(err)
	}
	if got := text(t, ctx, "#client-links"); !strings.Contains(got, "phone") || !strings.Contains(got, "active") {
		t.Errorf("link list = %q", got)
	}
	if _, err := chromedp.Run(ctx, chromedp.Evaluate[any](`document.getElementById("client-link").scrollIntoView()`)); err == nil {
		if buf, err := chromedp.Run(ctx, chromedp.CaptureScreenshot()); err == nil && os.Getenv("LARDER_SCREENSHOTS") != "" {
			_ = os.WriteFile(filepath.Join(os.Getenv("LARDER_SCREENSHOTS"), "link-00-section.png"), buf, 0o644)
		}
	}

	err = chromedp.Do(ctx,
		chromedp.EmulateViewport(390, 844),
		chromedp.Navigate(a.srv.URL+"/c/"+token),
		chromedp.WaitVisible(chromedp.ID("targets")),
	)
	if err != nil {
		t.Fatalf("open the link: %v", err)
	}
	var today fuel.Day
	for _, d := range plan.Days {
		if d.Date == "2027-03-01" {
			today = d
		}
	}
	if got := text(t, ctx, "#targets"); !strings.Contains(got, web.Num(today.ChoG, 0)+" g") {
		t.Errorf("targets %q lack today's %v g", got, today.ChoG)
	}
	fitsPhone(t, ctx, "load-day page")
	phoneShot(t, ctx, "link-01-load-day")
	// Today's feeding times come first: the page's first heading is
	// today's fuelling, and the first feed's time, the one the plan gives,
	// is on the first screen without scrolling. The recorded caution and
	// the staff notes are nowhere on the page; the shared note is.
	firstHeading, err := chromedp.Run(ctx, chromedp.Evaluate[string](`document.querySelector("main h2").id`))
	if err != nil || firstHeading != "todays-fuelling" {
		t.Errorf("the first heading of the phone page is #%s (%v), want today's fuelling", firstHeading, err)
	}
	firstTime := today.Feeds[0].At.In(time.UTC).Format("15:04") // Europe/London is on UTC in March
	shown, err = chromedp.Run(ctx, chromedp.Evaluate[string](`(() => { const e = document.querySelector("#feeds li .time");
		const r = e.getBoundingClientRect(); return r.bottom <= window.innerHeight ? e.textContent.trim() : "below the first screen: " + r.bottom })()`))
	if err != nil || shown != firstTime {
		t.Errorf("first feeding time on the phone's first screen: %q (%v), want %s", shown, err, firstTime)
	}
	pageText := text(t, ctx, "body")
	for _, never := range []string{"Coeliac", "strictly gluten-free", "STAFF NOTE", "ferritin"} {
		if strings.Contains(pageText, never) {
			t.Errorf("the phone page shows the private %q", never)
		}
	}
	if !strings.Contains(pageText, "Keep to gluten-free foods.") {
		t.Error("the phone page lacks the shared note")
	}

	// The same link on race day (the test clock moved on).
	s2 := New(Config{Store: a.st, SessionCleanup: -1, Now: func() time.Time { return time.Date(2027, 3, 3, 6, 0, 0, 0, time.UTC) }})
	defer s2.Close()
	hs2 := httptest.NewServer(s2)
	defer hs2.Close()
	err = chromedp.Do(ctx,
		chromedp.Navigate(hs2.URL+"/c/"+token),
		chromedp.WaitVisible(chromedp.ID("event-day")),
	)
	if err != nil {
		t.Fatalf("race day: %v", err)
	}
	if got := text(t, ctx, "#event-day"); !strings.Contains(got, "Ferncliff Harbour Marathon") || !strings.Contains(got, "per hour") {
		t.Errorf("event box = %q", got)
	}
	fitsPhone(t, ctx, "race-day page")
	phoneShot(t, ctx, "link-02-race-day")

	// After the plan: nothing for today.
	s3 := New(Config{Store: a.st, SessionCleanup: -1, Now: func() time.Time { return time.Date(2027, 3, 20, 8, 0, 0, 0, time.UTC) }})
	defer s3.Close()
	hs3 := httptest.NewServer(s3)
	defer hs3.Close()
	if err := chromedp.Do(ctx, chromedp.Navigate(hs3.URL+"/c/"+token), chromedp.WaitVisible(chromedp.ID("nothing-today"))); err != nil {
		t.Fatalf("after the plan: %v", err)
	}
	fitsPhone(t, ctx, "nothing-today page")
	phoneShot(t, ctx, "link-03-nothing-today")

	links, _ := a.st.ClientLinks(context.Background(), c.ID)
	b.post("/clients/"+itoa(c.ID)+"/links/"+itoa(links[0].ID)+"/revoke", nil).mustRedirect(t, "/clients/")
	err = chromedp.Do(ctx, chromedp.Navigate(a.srv.URL+"/c/"+token), chromedp.WaitVisible(chromedp.CSS("h1")))
	if err != nil {
		t.Fatal(err)
	}
	if got := text(t, ctx, "main"); !strings.Contains(got, linkGoneText) {
		t.Errorf("revoked link page = %q", got)
	}
	fitsPhone(t, ctx, "refusal page")
	phoneShot(t, ctx, "link-04-gone")
}

package server

import (
	"context"
	"crypto/sha256"
	"net/http"
	"net/url"
	"regexp"
	"strings"
	"testing"
	"time"
	"unicode/utf8"

	"larder/internal/fuel"
	"larder/internal/mass"
	"larder/internal/menu"
	"larder/internal/sheet"
	"larder/internal/sheet/sheettest"
	"larder/internal/store"
	"larder/web"
)

var linkRe = regexp.MustCompile(`/c/([A-Za-z0-9_-]{43})`)

const linkGoneText = "This link is no longer valid; ask your dietitian for a new one."

// makeLink creates a client link through the staff page and returns the
// token read from the page that shows it once.
func makeLink(t *testing.T, b *browser, clientID int64, label string) string {
	t.Helper()
	res := b.post("/clients/"+itoa(clientID)+"/links", url.Values{"label": {label}, "expires_days": {"90"}})
	if res.status != http.StatusOK {
		t.Fatalf("create link: %d\n%s", res.status, res.body)
	}
	res.mustContain(t, "shown only this once", "/plan.ics")
	m := linkRe.FindStringSubmatch(res.body)
	if m == nil {
		t.Fatalf("no link on the page\n%s", res.body)
	}
	return m[1]
}

// weekRequest is a training-week request of `days` days from start for a
// 64 kg runner, with a long run on the first day.
func weekRequest(start string, days int) fuel.Request {
	return fuel.Request{Kind: fuel.KindWeek, StartDate: start, Days: days, EatingOccasions: 5, TimeZone: "Europe/London",
		Athlete: fuel.Athlete{Sex: "female", BodyMassKg: 64},
		Training: []fuel.TrainingSession{
			{Date: start, Start: "07:00", DurationMin: 120, Modality: "run", Intensity: "moderate"},
		}}
}

// storePlan computes req and stores it for the client as a draft, then
// publishes it when publish is set, with the menu's food suggestions from
// the practice's foods; a non-empty suggestion replaces the one of the
// first feed of the first day.
func storePlan(t *testing.T, a *app, clientID int64, title string, req fuel.Request, publish bool, suggestion string) (store.Plan, fuel.Plan) {
	t.Helper()
	ctx := context.Background()
	plan, err := fuel.Compute(req)
	if err != nil {
		t.Fatal(err)
	}
	foods, err := a.st.ListFoods(ctx, false)
	if err != nil {
		t.Fatal(err)
	}
	sugg := menu.PlanSuggestions(plan, MenuFoods(foods))
	if suggestion != "" {
		sugg[store.FeedKey("day", plan.Days[0].Date, 0)] = suggestion
	}
	content := store.PlanContent{Request: req, Result: plan, BodyMassKg: req.Athlete.BodyMassKg, Suggestions: sugg}
	p := store.Plan{ClientID: clientID, Kind: req.Kind, Protocol: req.Protocol, Title: title}
	v, err := a.st.CreatePlan(ctx, store.System, &p, content)
	if err != nil {
		t.Fatal(err)
	}
	if publish {
		if _, err := a.st.Publish(ctx, store.System, v.ID, v.Revision, content); err != nil {
			t.Fatal(err)
		}
	}
	return p, plan
}

func getPublic(t *testing.T, a *app, path string) (*http.Response, string) {
	t.Helper()
	res, err := http.Get(a.srv.URL + path)
	if err != nil {
		t.Fatal(err)
	}
	defer res.Body.Close()
	var sb strings.Builder
	buf := make([]byte, 32<<10)
	for {
		n, err := res.Body.Read(buf)
		sb.Write(buf[:n])
		if err != nil {
			break
		}
	}
	return res, sb.String()
}

func TestClientLinkTokenStoredOnlyAsHash(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Ada Hashcheck"))
	token := makeLink(t, b, c.ID, "phone")
	sum := sha256.Sum256([]byte(token))
	if n := a.count(`SELECT count(*) FROM client_links WHERE client_id = $1 AND token_hash = $2`, c.ID, sum[:]); n != 1 {
		t.Fatalf("%d links stored under the token's SHA-256, want 1", n)
	}
	// The token itself is nowhere in the database: not in the links, the
	// audit log or the sessions (the page was rendered, not flashed).
	if n := a.count(`SELECT count(*) FROM client_links WHERE position(convert_to($1, 'UTF8') in token_hash) > 0 OR label LIKE '%' || $1 || '%'`, token); n != 0 {
		t.Fatal("token text found in client_links")
	}
	if n := a.count(`SELECT count(*) FROM audit_log WHERE detail::text LIKE '%' || $1 || '%'`, token); n != 0 {
		t.Fatal("token text found in the audit log")
	}
	if n := a.count(`SELECT count(*) FROM sessions WHERE position(convert_to($1, 'UTF8') in data) > 0`, token); n != 0 {
		t.Fatal("token text found in a session")
	}
	if n := a.count(`SELECT count(*) FROM audit_log WHERE entity = 'client_link' AND action = 'create' AND (detail->>'client_id')::bigint = $1`, c.ID); n != 1 {
		t.Fatalf("%d create audit rows, want 1", n)
	}
	// The client page lists the link without the token.
	page := b.get("/clients/" + itoa(c.ID))
	page.mustContain(t, "Client link", "phone", "active", "Revoke", "created a client link")
	if strings.Contains(page.body, token) {
		t.Fatal("client page shows the token again")
	}
}

func TestClientLinkShowsOnlyOwnPublishedPlan(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	mine := a.newClient(unique("Maren Quill"))
	mine.Notes = "STAFF NOTE: discussed ferritin"
	mine.Cautions = "coeliac disease"
	mine.SharedNote = "Keep to gluten-free foods"
	mine.AthleteSeesEnergyMass = true
	if err := a.st.UpdateClient(context.Background(), store.System, &mine); err != nil {
		t.Fatal(err)
	}
	other := a.newClient(unique("Oskar Other"))
	_, plan := storePlan(t, a, mine.ID, "Build week", weekRequest("2027-03-01", 5), true, "2 slices toast with jam")
	otherReq := weekRequest("2027-03-01", 5)
	otherReq.Athlete.BodyMassKg = 91
	storePlan(t, a, other.ID, "Other's week", otherReq, true, "OTHER CLIENT FOOD")
	token := makeLink(t, b, mine.ID, "")

	res, body := getPublic(t, a, "/c/"+token)
	if res.StatusCode != http.StatusOK {
		t.Fatalf("status %d\n%s", res.StatusCode, body)
	}
	for h, want := range map[string]string{"Cache-Control": "no-store", "Referrer-Policy": "no-referrer", "X-Robots-Tag": "noindex"} {
		if got := res.Header.Get(h); !strings.Contains(got, want) {
			t.Errorf("%s: %q, want %q", h, got, want)
		}
	}
	today := plan.Days[0]
	r := response{status: res.StatusCode, body: body}
	// Today's figures exactly as the stored plan holds them.
	r.mustContain(t, "Hello Maren", "Monday 1 March 2027", "Europe/London",
		web.Num(today.ChoG, 0)+" g", web.Num(today.ChoGPerKg, 1)+" g per kg body mass",
		web.Num(today.ProteinG, 0)+" g", web.Num(today.FatG, 0)+" g", web.Num(today.EnergyKcal, 0)+" kcal",
		today.Feeds[0].At.In(time.UTC).Format("15:04"), // London is on UTC in early March
		web.Num(today.Feeds[0].ChoG, 0)+" g carbohydrate", "For example: 2 slices toast with jam",
		"The days ahead", "Keep to gluten-free foods", "The food ideas are examples only", "not medical advice")
	for _, d := range plan.Days[1:] {
		r.mustContain(t, dayWords(d.Date), web.Num(d.ChoG, 0)+" g")
	}
	// The page leads with today's feeding times and what to eat; the day's
	// totals follow, then the days ahead.
	order := []string{"Today’s fuelling", `id="feeds"`, today.Feeds[0].At.In(time.UTC).Format("15:04"),
		"For example: 2 slices toast with jam", `id="targets"`, "The days ahead"}
	for i := 1; i < len(order); i++ {
		if a, b := strings.Index(body, order[i-1]), strings.Index(body, order[i]); a < 0 || b < 0 || a > b {
			t.Errorf("phone page: %q should come before %q (at %d and %d)", order[i-1], order[i], a, b)
		}
	}
	for _, never := range []string{"Oskar", other.Name, "OTHER CLIENT FOOD", "STAFF NOTE", "ferritin", "Quill", "Other's week", "coeliac"} {
		if strings.Contains(body, never) {
			t.Errorf("client page shows %q", never)
		}
	}
	_, ics := getPublic(t, a, "/c/"+token+"/plan.ics")
	cal := strings.Join(checkICS(t, ics), "\n")
	for _, want := range []string{"2 slices toast with jam", "The food ideas are examples only", "DTSTART:" + today.Feeds[0].At.UTC().Format("20060102T150405Z")} {
		if !strings.Contains(cal, want) {
			t.Errorf("calendar lacks %q", want)
		}
	}
	for _, never := range []string{"OTHER CLIENT FOOD", "Oskar", "STAFF NOTE"} {
		if strings.Contains(cal, never) {
			t.Errorf("calendar shows %q", never)
		}
	}
	// The link records its last use.
	if n := a.count(`SELECT count(*) FROM client_links WHERE client_id = $1 AND last_used_at IS NOT NULL`, mine.ID); n != 1 {
		t.Fatalf("last use not recorded")
	}
}

func TestClientLinkDraftIsNotShown(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Dora Draft"))
	_, draft := storePlan(t, a, c.ID, "Unpublished week", weekRequest("2027-03-01", 3), false, "DRAFT FOOD")
	token := makeLink(t, b, c.ID, "")
	res, body := getPublic(t, a, "/c/"+token)
	if res.StatusCode != http.StatusOK {
		t.Fatalf("status %d", res.StatusCode)
	}
	if !strings.Contains(body, "Nothing planned for today") {
		t.Fatalf("a draft-only client sees a plan\n%s", body)
	}
	for _, never := range []string{"DRAFT FOOD", "Today’s fuelling", web.Num(draft.Days[0].EnergyKcal, 0) + " kcal"} {
		if strings.Contains(body, never) {
			t.Errorf("draft shows through: %q", never)
		}
	}
	_, ics := getPublic(t, a, "/c/"+token+"/plan.ics")
	if strings.Contains(ics, "BEGIN:VEVENT") {
		t.Error("the calendar feed lists a draft")
	}

	// Once published, the plan shows; a newer draft of it does not replace it.
	p, pub := storePlan(t, a, c.ID, "Published week", weekRequest("2027-03-01", 3), true, "PUBLISHED FOOD")
	v, err := a.st.PublishedPlanVersion(context.Background(), p.ID)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := a.st.NewVersion(context.Background(), store.System, p.ID, v.ID); err != nil {
		t.Fatal(err)
	}
	_, body = getPublic(t, a, "/c/"+token)
	response{body: body}.mustContain(t, "Today’s fuelling", "PUBLISHED FOOD", web.Num(pub.Days[0].ChoG, 0)+" g")
	if strings.Contains(body, "DRAFT FOOD") {
		t.Error("draft food shows next to the published plan")
	}
}

func TestClientLinkNothingToday(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Una Later"))
	_, plan := storePlan(t, a, c.ID, "Next week", weekRequest("2027-03-08", 3), true, "")
	token := makeLink(t, b, c.ID, "")
	_, body := getPublic(t, a, "/c/"+token)
	response{body: body}.mustContain(t, "Nothing planned for today", "Your plan starts on Monday 8 March.", web.Num(plan.Days[0].ChoG, 0)+" g")
	if strings.Contains(body, "Today’s fuelling") {
		t.Error("targets shown on a day outside the plan")
	}
}

func TestClientLinkRevokedAndExpired(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Rhea Revoke"))
	storePlan(t, a, c.ID, "Week", weekRequest("2027-03-01", 3), true, "")
	token := makeLink(t, b, c.ID, "old phone")
	if res, _ := getPublic(t, a, "/c/"+token); res.StatusCode != http.StatusOK {
		t.Fatalf("fresh link: %d", res.StatusCode)
	}
	links, err := a.st.ClientLinks(context.Background(), c.ID)
	if err != nil || len(links) != 1 {
		t.Fatal(links, err)
	}
	b.post("/clients/"+itoa(c.ID)+"/links/"+itoa(links[0].ID)+"/revoke", nil).mustRedirect(t, "/clients/"+itoa(c.ID))
	b.get("/clients/"+itoa(c.ID)).mustContain(t, "Link revoked", "revoked 1 Mar 2027", "revoked a client link")
	gone := func(path string) {
		t.Helper()
		res, body := getPublic(t, a, path)
		if res.StatusCode != http.StatusNotFound || !strings.Contains(body, linkGoneText) {
			t.Fatalf("%s: %d\n%s", path, res.StatusCode, body)
		}
		if strings.Contains(body, "Rhea") || strings.Contains(body, c.Name) {
			t.Fatalf("%s: the refusal names the client", path)
		}
		if res.Header.Get("Cache-Control") != "no-store" {
			t.Fatalf("%s: refusal may be cached", path)
		}
	}
	gone("/c/" + token)
	gone("/c/" + token + "/plan.ics")

	// An expired link: made 91 days ago for 90 days.
	expired := "expired-link-token-for-test-0000000000000000"[:43]
	sum := sha256.Sum256([]byte(expired))
	l := store.ClientLink{ClientID: c.ID, TokenHash: sum[:], CreatedAt: testNow.AddDate(0, 0, -91), ExpiresAt: testNow.AddDate(0, 0, -1)}
	if err := a.st.CreateClientLink(context.Background(), store.System, &l); err != nil {
		t.Fatal(err)
	}
	gone("/c/" + expired)
	gone("/c/" + expired + "/plan.ics")
	b.get("/clients/"+itoa(c.ID)).mustContain(t, ">expired<")
	// Unknown tokens of the right shape, and junk, get the same answer.
	gone("/c/" + strings.Repeat("A", 43))
	gone("/c/not-a-token")
}

func TestClientLinkStaffOnly(t *testing.T) {
	a := newApp(t)
	c := a.newClient(unique("Sid Staffonly"))
	anon := a.browser()
	anon.post("/clients/"+itoa(c.ID)+"/links", url.Values{"expires_days": {"90"}}).mustRedirect(t, "/signin")
	b, _ := a.signedIn(store.RoleDietitian)
	token := makeLink(t, b, c.ID, "")
	links, _ := a.st.ClientLinks(context.Background(), c.ID)
	anon.post("/clients/"+itoa(c.ID)+"/links/"+itoa(links[0].ID)+"/revoke", nil).mustRedirect(t, "/signin")
	// Cross-site POSTs are refused for signed-in staff too.
	if res := b.post("/clients/"+itoa(c.ID)+"/links", url.Values{"expires_days": {"90"}}, "Sec-Fetch-Site", "cross-site"); res.status != http.StatusForbidden {
		t.Fatalf("cross-site create: %d", res.status)
	}
	if res := b.post("/clients/"+itoa(c.ID)+"/links/"+itoa(links[0].ID)+"/revoke", nil, "Origin", "https://evil.example"); res.status != http.StatusForbidden {
		t.Fatalf("cross-origin revoke: %d", res.status)
	}
	if n := a.count(`SELECT count(*) FROM client_links WHERE client_id = $1`, c.ID); n != 1 {
		t.Fatalf("%d links, want 1", n)
	}
	if res, _ := getPublic(t, a, "/c/"+token); res.StatusCode != http.StatusOK {
		t.Fatalf("refused revoke still revoked: %d", res.StatusCode)
	}
	// A link of one client cannot be revoked through another client's address.
	c2 := a.newClient(unique("Other Staffonly"))
	if res := b.post("/clients/"+itoa(c2.ID)+"/links/"+itoa(links[0].ID)+"/revoke", nil); res.status != http.StatusNotFound {
		t.Fatalf("revoke via another client: %d", res.status)
	}
	// The public page needs no staff session, and gives a staff session
	// nothing more.
	b.get("/c/"+token).mustContain(t, "Hello Sid")
}

func TestClientLinkFormRefusesBadInput(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Fay Form"))
	res := b.post("/clients/"+itoa(c.ID)+"/links", url.Values{"label": {"my phone"}, "expires_days": {"45"}})
	if res.status != http.StatusUnprocessableEntity {
		t.Fatalf("bad expiry: %d", res.status)
	}
	res.mustContain(t, "Choose how long the link works: 30, 90 or 180 days.", `value="my phone"`)
	res = b.post("/clients/"+itoa(c.ID)+"/links", url.Values{"label": {strings.Repeat("x", 101)}, "expires_days": {"30"}})
	if res.status != http.StatusUnprocessableEntity {
		t.Fatalf("long label: %d", res.status)
	}
	res.mustContain(t, "Keep the label to 100 characters or fewer.", `<option value="30" selected`)
	if n := a.count(`SELECT count(*) FROM client_links WHERE client_id = $1`, c.ID); n != 0 {
		t.Fatalf("refused forms saved %d links", n)
	}
	// The expiry chosen is the one stored.
	makeLink(t, b, c.ID, "")
	links, _ := a.st.ClientLinks(context.Background(), c.ID)
	if len(links) != 1 || !links[0].ExpiresAt.Equal(testNow.AddDate(0, 0, 90)) {
		t.Fatalf("expiry: %+v", links)
	}
}

// FuzzDecodeLinkForm: the create form's decoder never panics, refuses
// anything but the three lifetimes, and keeps what was typed.
func FuzzDecodeLinkForm(f *testing.F) {
	f.Add("phone", "90")
	f.Add("", "30")
	f.Add(strings.Repeat("é", 101), "180")
	f.Add("a\nb", "0")
	f.Add("\xff", "-90")
	f.Fuzz(func(t *testing.T, label, days string) {
		in, form := decodeLinkForm(url.Values{"label": {label}, "expires_days": {days}})
		if form.Get("label") != strings.TrimSpace(label) && form.Get("label") != label {
			t.Fatalf("typed label lost: %q", form.Get("label"))
		}
		if !form.Has() {
			if in.Days != 30 && in.Days != 90 && in.Days != 180 {
				t.Fatalf("accepted %d days", in.Days)
			}
			if utf8.RuneCountInString(in.Label) > 100 || !utf8.ValidString(in.Label) || strings.ContainsAny(in.Label, "\r\n") {
				t.Fatalf("accepted label %q", in.Label)
			}
		}
	})
}

func TestClientLinkEventDayAndCalendar(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Elin Raceday"))
	dist := 30.0
	ev := store.Event{ClientID: c.ID, Name: "Ferncliff Trail 30", StartsAt: time.Date(2027, 3, 1, 10, 30, 0, 0, time.UTC),
		TimeZone: "Europe/London", Modality: "run", DistanceKm: &dist, ExpectedDurationMin: 165, Days: 1, Priority: "A"}
	if err := a.st.AddEvent(context.Background(), store.System, &ev); err != nil {
		t.Fatal(err)
	}
	req := fuel.Request{Kind: fuel.KindRace, TimeZone: "Europe/London", EatingOccasions: 5,
		Athlete: fuel.Athlete{Sex: "female", BodyMassKg: 58},
		Event:   &fuel.Event{StartsAt: ev.StartsAt, Modality: "run", DistanceKm: &dist, ExpectedDurationMin: 165}}
	plan, err := fuel.Compute(req)
	if err != nil {
		t.Fatal(err)
	}
	if plan.PreEventMeal == nil || plan.DuringEvent == nil || plan.DuringEvent.ChoGPerH <= 0 {
		t.Fatalf("race plan lacks a pre-event meal or in-event g/h: %+v %+v", plan.PreEventMeal, plan.DuringEvent)
	}
	content := store.PlanContent{Request: req, Result: plan, BodyMassKg: 58}
	p := store.Plan{ClientID: c.ID, EventID: &ev.ID, Kind: fuel.KindRace, Title: "Race day"}
	v, err := a.st.CreatePlan(context.Background(), store.System, &p, content)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := a.st.Publish(context.Background(), store.System, v.ID, v.Revision, content); err != nil {
		t.Fatal(err)
	}
	token := makeLink(t, b, c.ID, "")
	_, body := getPublic(t, a, "/c/"+token)
	response{body: body}.mustContain(t, "Ferncliff Trail 30: start 10:30",
		"Pre-event meal at <strong>"+plan.PreEventMeal.At.UTC().Format("15:04")+"</strong>",
		web.Num(plan.DuringEvent.ChoGPerH, 0)+" g carbohydrate per hour")

	res, ics := getPublic(t, a, "/c/"+token+"/plan.ics")
	if res.StatusCode != http.StatusOK || res.Header.Get("Content-Type") != "text/calendar; charset=utf-8" {
		t.Fatalf("feed: %d %s", res.StatusCode, res.Header.Get("Content-Type"))
	}
	lines := checkICS(t, ics)
	joined := strings.Join(lines, "\n")
	feeds := 0
	for _, d := range plan.Days {
		for _, f := range d.Feeds {
			if f.Label == "during event" {
				continue
			}
			feeds++
			if !strings.Contains(joined, "DTSTART:"+f.At.UTC().Format("20060102T150405Z")) {
				t.Errorf("feed at %s missing from the calendar", f.At)
			}
		}
	}
	if n := strings.Count(joined, "BEGIN:VEVENT"); n != feeds+1 {
		t.Errorf("%d VEVENTs, want %d feeds and the event", n, feeds)
	}
	for _, want := range []string{"DTSTART:20270301T103000Z", "SUMMARY:Ferncliff Trail 30 · carbohydrate " + web.Num(plan.DuringEvent.ChoGPerH, 0) + " g per hour", "SUMMARY:Carbohydrate " + web.Num(plan.PreEventMeal.ChoG, 0) + " g"} {
		if !strings.Contains(joined, want) {
			t.Errorf("calendar lacks %q", want)
		}
	}
	uids := uidsOf(lines)

	// Revising and publishing again keeps the entries' UIDs, so calendar
	// apps update them in place.
	nv, err := a.st.NewVersion(context.Background(), store.System, p.ID, v.ID)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := a.st.Publish(context.Background(), store.System, nv.ID, nv.Revision, content); err != nil {
		t.Fatal(err)
	}
	_, ics2 := getPublic(t, a, "/c/"+token+"/plan.ics")
	lines2 := checkICS(t, ics2)
	if got := uidsOf(lines2); strings.Join(got, ",") != strings.Join(uids, ",") {
		t.Errorf("UIDs changed on revision:\n%v\n%v", uids, got)
	}
	if !strings.Contains(strings.Join(lines2, "\n"), "SEQUENCE:2") {
		t.Error("revised entries keep SEQUENCE 1")
	}
}

func uidsOf(lines []string) []string {
	var out []string
	for _, l := range lines {
		if strings.HasPrefix(l, "UID:") {
			out = append(out, l)
		}
	}
	return out
}

// checkICS applies RFC 5545's stream rules (CRLF line ends and lines of at
// most 75 octets, 3.1; balanced BEGIN/END, 3.4 and 3.6; VERSION and PRODID
// in VCALENDAR, UID, DTSTAMP and DTSTART in each VEVENT, 3.6.1) and returns
// the unfolded content lines.
func checkICS(t *testing.T, stream string) []string {
	t.Helper()
	if !strings.HasSuffix(stream, "\r\n") || !utf8.ValidString(stream) {
		t.Fatal("stream does not end in CRLF or is not UTF-8")
	}
	for i, l := range strings.Split(strings.TrimSuffix(stream, "\r\n"), "\r\n") {
		if len(l) > 75 || strings.ContainsAny(l, "\r\n") {
			t.Fatalf("line %d breaks RFC 5545 3.1 (%d octets): %q", i+1, len(l), l)
		}
	}
	lines := sheet.ICSUnfold(stream)
	var stack []string
	props := []map[string]int{}
	for _, l := range lines {
		name, value, ok := strings.Cut(l, ":")
		if !ok {
			t.Fatalf("no colon: %q", l)
		}
		switch name {
		case "BEGIN":
			stack = append(stack, value)
			props = append(props, map[string]int{})
		case "END":
			if len(stack) == 0 || stack[len(stack)-1] != value {
				t.Fatalf("END:%s does not close %v", value, stack)
			}
			top := props[len(props)-1]
			for _, p := range map[string][]string{"VCALENDAR": {"VERSION", "PRODID"}, "VEVENT": {"UID", "DTSTAMP", "DTSTART"}}[value] {
				if top[p] != 1 {
					t.Fatalf("%s has %d %s", value, top[p], p)
				}
			}
			stack, props = stack[:len(stack)-1], props[:len(props)-1]
		default:
			if len(props) == 0 {
				t.Fatalf("%s outside a component", name)
			}
			props[len(props)-1][name]++
		}
	}
	if len(stack) != 0 || len(lines) == 0 || lines[0] != "BEGIN:VCALENDAR" {
		t.Fatalf("unbalanced calendar: %v", stack)
	}
	return lines
}

// TestClientLinkOverlappingPlansLatestWins: a dietitian publishes a second
// plan over days an earlier one covers (a redo for the same event). On each
// day the client follows the plan published last: the calendar carries one
// set of feeding times a day, not both, and the phone page shows the later
// plan when both start on the same day.
func TestClientLinkOverlappingPlansLatestWins(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Ada Overlap"))
	_, older := storePlan(t, a, c.ID, "First week plan", weekRequest("2027-03-05", 7), true, "")
	_, newer := storePlan(t, a, c.ID, "Second week plan", weekRequest("2027-03-08", 7), true, "")
	token := makeLink(t, b, c.ID, "")

	_, ics := getPublic(t, a, "/c/"+token+"/plan.ics")
	joined := strings.Join(checkICS(t, ics), "\n")
	want := 0
	for _, d := range older.Days {
		if d.Date < "2027-03-08" {
			want += len(d.Feeds)
		}
	}
	for _, d := range newer.Days {
		want += len(d.Feeds)
	}
	if n := strings.Count(joined, "BEGIN:VEVENT"); n != want {
		t.Errorf("%d calendar entries, want %d: the older plan's days from 8 Mar are covered by the newer plan", n, want)
	}
	for _, d := range older.Days {
		if d.Date >= "2027-03-08" && len(d.Feeds) > 0 &&
			strings.Contains(joined, "DTSTART:"+d.Feeds[0].At.UTC().Format("20060102T150405Z")) &&
			strings.Count(joined, "DTSTART:"+d.Feeds[0].At.UTC().Format("20060102T150405Z")) > 1 {
			t.Errorf("two entries at %s: both plans' feeds are in the calendar", d.Feeds[0].At)
		}
	}

	// Two plans from the same first day: the page shows the one published last.
	c2 := a.newClient(unique("Bea Redo"))
	heavier := weekRequest("2027-03-08", 7)
	heavier.Athlete.BodyMassKg = 80 // the redo at a new body mass
	_, first := storePlan(t, a, c2.ID, "Week plan as first drawn", weekRequest("2027-03-08", 7), true, "")
	_, redo := storePlan(t, a, c2.ID, "Week plan redone", heavier, true, "")
	token2 := makeLink(t, b, c2.ID, "")
	_, page := getPublic(t, a, "/c/"+token2)
	firstG, redoG := web.Num(first.Days[0].ChoG, 0)+" g carbohydrate", web.Num(redo.Days[0].ChoG, 0)+" g carbohydrate"
	if firstG == redoG {
		t.Fatalf("the two plans' first days both hold %s", firstG)
	}
	if !strings.Contains(page, redoG) || strings.Contains(page, firstG) {
		t.Errorf("the phone page does not show the plan published last (%s, not %s)", redoG, firstG)
	}
}

// TestClientLinkPromiseKept holds the client-link panel to its promise:
// a recorded caution and the staff notes never reach the athlete's phone
// page, calendar or sheet; only the health note the dietitian shares does;
// energy and body-mass figures (kcal, g per kg, the body mass in the
// client's lb) appear only when chosen.
func TestClientLinkPromiseKept(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Iris Note"))
	c.Cautions = "Type 1 diabetes: changes agreed with her diabetes team\nEating-disorder history (2022)"
	c.Notes = "STAFF NOTE: low ferritin last spring"
	c.MassUnit = mass.LB
	if err := a.st.UpdateClient(context.Background(), store.System, &c); err != nil {
		t.Fatal(err)
	}
	_, plan := storePlan(t, a, c.ID, "Week plan", weekRequest("2027-03-01", 7), true, "")
	token := makeLink(t, b, c.ID, "")
	b.get("/clients/"+itoa(c.ID)).mustContain(t,
		"none of your notes and none of the recorded cautions: of the health notes, only the one you share with the athlete",
		"Energy and body-mass figures appear only when you chose to show them")
	today := plan.Days[0]
	private := []string{"Type 1", "diabetes team", "Eating-disorder", "STAFF NOTE", "ferritin", "Health note", "note from your dietitian", "note about your health"}
	// 64 kg / 0.45359237 = 141.1 lb (international pound).
	bodyMass := mass.Text(plan.BodyMassKg, mass.LB)
	if bodyMass != "141.1 lb" {
		t.Fatalf("the plan's body mass reads %q, want 141.1 lb", bodyMass)
	}
	figures := []string{" kcal", "g per kg", "per kg", " lb", " kg", bodyMass, web.Num(today.EnergyKcal, 0)}
	athleteSheet := func() string {
		t.Helper()
		res, pdf := getPublic(t, a, "/c/"+token+"/sheet.pdf")
		if res.StatusCode != http.StatusOK {
			t.Fatalf("athlete's sheet: %d", res.StatusCode)
		}
		text, ok := sheettest.Text(t, []byte(pdf))
		if !ok {
			t.Skip("pdftotext not installed")
		}
		return text
	}

	_, page := getPublic(t, a, "/c/"+token)
	_, ics := getPublic(t, a, "/c/"+token+"/plan.ics")
	cal := strings.Join(checkICS(t, ics), "\n")
	sheetText := athleteSheet()
	response{body: page}.mustContain(t, web.Num(today.ChoG, 0)+" g", web.Num(today.Feeds[0].ChoG, 0)+" g carbohydrate")
	if !strings.Contains(sheetText, web.Num(today.Feeds[0].ChoG, 0)+" g") {
		t.Errorf("the athlete's sheet lacks the first feed's %v g:\n%s", today.Feeds[0].ChoG, sheetText)
	}
	for _, never := range append(private, figures...) {
		if i := strings.Index(page, never); i >= 0 {
			t.Errorf("phone page shows %q though nothing was shared: …%s…", never, page[max(0, i-200):min(len(page), i+100)])
		}
		if i := strings.Index(cal, never); i >= 0 {
			t.Errorf("calendar shows %q though nothing was shared: …%s…", never, cal[max(0, i-200):min(len(cal), i+100)])
		}
		if i := strings.Index(sheetText, never); i >= 0 {
			t.Errorf("athlete's sheet shows %q though nothing was shared: …%s…", never, sheetText[max(0, i-200):min(len(sheetText), i+100)])
		}
	}

	// The dietitian shares a note in plain words and shows the figures
	// through the client form.
	c, err := a.st.ClientByID(context.Background(), c.ID)
	if err != nil {
		t.Fatal(err)
	}
	form := clientValues(c)
	form.Set("shared_note", "Check your glucose as your diabetes team showed you.")
	form.Set("athlete_sees_energy_mass", "on")
	b.post("/clients/"+itoa(c.ID), form).mustRedirect(t, "/clients/")
	_, page = getPublic(t, a, "/c/"+token)
	response{body: page}.mustContain(t, "A note from your dietitian", "Check your glucose as your diabetes team showed you.",
		web.Num(today.EnergyKcal, 0)+" kcal", web.Num(today.ChoGPerKg, 1)+" g per kg body mass")
	sheetText = athleteSheet()
	for _, want := range []string{"A note about your health", "Check your glucose as your diabetes team showed you.",
		"about " + web.Num(today.EnergyKcal, 0) + " kcal", web.Num(today.ChoGPerKg, 1) + " g carbohydrate per kg body weight"} {
		if !strings.Contains(sheetText, want) {
			t.Errorf("shared and shown, the athlete's sheet lacks %q:\n%s", want, sheetText)
		}
	}
	// Figures shown are the athlete's figures: never the dietitian's units
	// or citations.
	for _, never := range []string{"Type 1 diabetes", "Eating-disorder", "STAFF NOTE", "ferritin",
		"mmol", "FFM", "kcal/kg", "et al", "Source", "from memory", "common practice"} {
		if strings.Contains(page, never) {
			t.Errorf("phone page shows the private %q next to the shared note", never)
		}
		if strings.Contains(sheetText, never) {
			t.Errorf("athlete's sheet shows the private %q next to the shared note", never)
		}
	}
}

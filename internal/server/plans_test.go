package server

import (
	"context"
	"encoding/json"
	"errors"
	"html"
	"math"
	"net/http"
	"net/url"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"larder/internal/fuel"
	"larder/internal/menu"
	"larder/internal/store"
)

// planForm is the start-a-plan form as a browser posts it.
func planForm(kind string, massKg string, extra ...string) url.Values {
	v := url.Values{"kind": {kind}, "body_mass_kg": {massKg}, "eating_occasions": {"5"}, "taper_days": {"7"},
		"days": {"7"}, "protocol": {"two-day"}}
	for i := 0; i+1 < len(extra); i += 2 {
		v.Set(extra[i], extra[i+1])
	}
	return v
}

var planPath = regexp.MustCompile(`^/clients/(\d+)/plans/(\d+)$`)

// createPlan posts the form and returns the new plan's id.
func createPlan(t *testing.T, b *browser, clientID int64, v url.Values) int64 {
	t.Helper()
	res := b.post("/clients/"+itoa64(clientID)+"/plans", v)
	m := planPath.FindStringSubmatch(res.location)
	if res.status != http.StatusSeeOther || m == nil {
		t.Fatalf("create plan: status %d to %q\n%s", res.status, res.location, res.body)
	}
	id, _ := strconv.ParseInt(m[2], 10, 64)
	return id
}

func latestVersion(t *testing.T, a *app, planID int64) store.PlanVersion {
	t.Helper()
	vs, err := a.st.PlanVersions(context.Background(), planID)
	if err != nil || len(vs) == 0 {
		t.Fatalf("versions of plan %d: %v", planID, err)
	}
	return vs[0]
}

func TestCreateEachKindOfPlan(t *testing.T) {
	a := newApp(t)
	demo := loadDemo(t, a)
	b, _ := a.signedIn(store.RoleDietitian)
	marathoner := demo.IDs.Clients["marathoner"]
	cases := []struct {
		name     string
		client   int64
		form     url.Values
		kind     string
		contains []string
	}{
		{"loading", marathoner, planForm("loading", "58", "event_id", itoa64(demo.IDs.Events["marathon"])), fuel.KindLoading,
			[]string{"Two-day carbohydrate loading for Fjordby Spring Marathon", "Pre-event meal", "Expected glycogen at the start", "mmol/kg wet muscle", "Expected body-mass gain", "chart-gkg", "chart-glycogen"}},
		{"race", marathoner, planForm("race", "58", "event_id", itoa64(demo.IDs.Events["marathon"])), fuel.KindRace,
			[]string{"Race-day fuelling for Fjordby Spring Marathon", "In-event carbohydrate", `name="during_gph"`}},
		{"repletion", demo.IDs.Clients["rower"], planForm("repletion", "88", "session_end", "2027-03-02T09:30",
			"next_start", "2027-03-02T15:30", "time_zone", "Europe/London"), fuel.KindRepletion,
			[]string{"Repletion window", "repletion-feeds", "Europe/London", "mmol/kg wet muscle"}},
		{"week", demo.IDs.Clients["cyclist"], planForm("week", "71", "start_date", "2027-03-01", "time_zone", "Europe/Madrid"), fuel.KindWeek,
			[]string{"Training week from Mon 1 Mar 2027", "plan-days"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			id := createPlan(t, b, c.client, c.form)
			v := latestVersion(t, a, id)
			if v.Status != store.PlanDraft || v.Version != 1 || v.Request.Kind != c.kind {
				t.Fatalf("new plan version: %+v", v)
			}
			if len(v.Result.Days) == 0 && c.kind != fuel.KindRepletion {
				t.Fatal("computed plan has no days")
			}
			if n := a.count(`SELECT count(*) FROM plan_days WHERE plan_version_id = $1`, v.ID); n != len(v.Result.Days) {
				t.Errorf("plan_days rows %d, plan days %d", n, len(v.Result.Days))
			}
			feeds := 0
			for _, d := range v.Result.Days {
				feeds += len(d.Feeds)
			}
			if n := a.count(`SELECT count(*) FROM plan_feeds WHERE plan_version_id = $1 AND kind = 'day'`, v.ID); n != feeds {
				t.Errorf("plan_feeds day rows %d, feeds %d", n, feeds)
			}
			res := b.get("/clients/" + itoa64(c.client) + "/plans/" + itoa64(id))
			if res.status != http.StatusOK {
				t.Fatalf("plan page: %d", res.status)
			}
			res.mustContain(t, append(c.contains, "not medical advice", `class="finding`, "Save draft and recheck")...)
			// The client's page lists the plan.
			b.get("/clients/"+itoa64(c.client)).mustContain(t, `href="/clients/`+itoa64(c.client)+`/plans/`+itoa64(id)+`"`)
		})
	}
}

func TestPlanFormRefusesBadInput(t *testing.T) {
	a := newApp(t)
	demo := loadDemo(t, a)
	b, _ := a.signedIn(store.RoleDietitian)
	c := demo.IDs.Clients["marathoner"]
	before := a.count(`SELECT count(*) FROM plans WHERE client_id = $1`, c)
	for _, tc := range []struct {
		form url.Values
		msgs []string
	}{
		{planForm("loading", "58"), []string{"needs the event it leads to"}},
		{planForm("loading", "400", "event_id", itoa64(demo.IDs.Events["marathon"])), []string{"Body mass must be between 20 and 300 kg."}},
		{planForm("repletion", "58", "session_end", "2027-03-02T15:30", "next_start", "2027-03-02T09:30", "time_zone", "Europe/Oslo"), []string{"The next session must start after the end of this one."}},
		{planForm("repletion", "58", "time_zone", "Mars/Olympus"), []string{"needs the end of the session", "Time zone must be a time zone name"}},
		{planForm("week", "58", "days", "0"), []string{"needs its first day"}},
		{planForm("week", "58", "start_date", "2027-03-01", "days", "99"), []string{"A training-week plan covers 1 to 28 days."}},
		{planForm("week", "58,5", "start_date", "2027-03-01", "days", "3,5"), []string{"Number of days must be a whole number."}},
	} {
		res := b.post("/clients/"+itoa64(c)+"/plans", tc.form)
		if res.status != http.StatusUnprocessableEntity {
			t.Fatalf("%v: status %d", tc.form, res.status)
		}
		res.mustContain(t, append(tc.msgs, "Nothing was saved", `value="`+tc.form.Get("body_mass_kg")+`"`)...)
	}
	if after := a.count(`SELECT count(*) FROM plans WHERE client_id = $1`, c); after != before {
		t.Fatalf("refused forms saved %d plans", after-before)
	}
}

func TestNewPlanFormPrefill(t *testing.T) {
	a := newApp(t)
	demo := loadDemo(t, a)
	b, _ := a.signedIn(store.RoleDietitian)
	c := demo.IDs.Clients["marathoner"]
	m, err := a.st.LatestBodyMass(context.Background(), c)
	if err != nil {
		t.Fatal(err)
	}
	res := b.get("/clients/" + itoa64(c) + "/plans/new?kind=loading&event=" + itoa64(demo.IDs.Events["marathon"]))
	res.mustContain(t, `name="body_mass_kg" value="`+strconv.FormatFloat(m.MassKg, 'f', -1, 64)+`"`, "Latest measurement",
		`value="`+itoa64(demo.IDs.Events["marathon"])+`" selected`, "training-used", "female", "events-known", "42.195 km", "3 h 15 min", "Europe/Oslo")

	// A body mass more than 14 days old is flagged.
	old := a.newClient(unique("Stale mass"))
	bm := store.BodyMass{ClientID: old.ID, MeasuredOn: testNow.AddDate(0, 0, -30), MassKg: 62, EnteredUnit: "kg"}
	if err := a.st.AddBodyMass(context.Background(), store.System, &bm); err != nil {
		t.Fatal(err)
	}
	b.get("/clients/"+itoa64(old.ID)+"/plans/new?kind=week").mustContain(t, "The latest body mass is 30 days old")
}

// loadingPlan makes a two-day loading plan for the demo marathoner.
func loadingPlan(t *testing.T, a *app, b *browser) (clientID, planID int64) {
	t.Helper()
	demo := loadDemo(t, a)
	clientID = demo.IDs.Clients["marathoner"]
	planID = createPlan(t, b, clientID, planForm("loading", "58", "event_id", itoa64(demo.IDs.Events["marathon"])))
	return clientID, planID
}

func firstDay(t *testing.T, p fuel.Plan, role string) fuel.Day {
	t.Helper()
	for _, d := range p.Days {
		if d.Role == role {
			return d
		}
	}
	t.Fatalf("plan has no %s day", role)
	return fuel.Day{}
}

func TestOverrideIsKeptAndRechecked(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	cid, pid := loadingPlan(t, a, b)
	v := latestVersion(t, a, pid)
	load := firstDay(t, v.Result, fuel.RoleLoad)
	editURL := "/clients/" + itoa64(cid) + "/plans/" + itoa64(pid) + "/versions/1"

	// 13 g/kg is above the 10–12 g/kg of carbohydrate loading (ACSM/AND/DC 2016).
	b.post(editURL, url.Values{"revision": {strconv.Itoa(v.Revision)}, "action": {"save"}, gkgName(load.Date): {"13"}}).mustRedirect(t, editURL)
	v2 := latestVersion(t, a, pid)
	if v2.Revision != v.Revision+1 || len(v2.Request.Overrides) != 1 || *v2.Request.Overrides[0].ChoGPerKg != 13 {
		t.Fatalf("override not stored in the request: rev %d, %+v", v2.Revision, v2.Request.Overrides)
	}
	day := firstDay(t, v2.Result, fuel.RoleLoad)
	if !day.Overridden || day.ChoGPerKg != 13 {
		t.Fatalf("recomputed day: %+v", day)
	}
	// grams = g/kg × body mass: 13 × 58 = 754 g (common practice).
	if math.Abs(day.ChoG-754) > 1 {
		t.Errorf("overridden day carbohydrate %v g, want 754 g", day.ChoG)
	}
	var outside bool
	for _, f := range v2.Result.Findings {
		if f.Subject == "day:"+load.Date && f.Level == fuel.LevelOutside && strings.Contains(f.Message, "13") {
			outside = true
		}
	}
	if !outside {
		t.Fatalf("no outside finding for the overridden day: %+v", v2.Result.Findings)
	}
	res := b.get(editURL)
	res.mustContain(t, `name="`+gkgName(load.Date)+`" id="f-`+gkgName(load.Date)+`" value="13"`, ">override<", "Outside guideline")
	if n := a.count(`SELECT count(*) FROM plan_days WHERE plan_version_id = $1 AND on_date = $2 AND overridden AND cho_g_per_kg = 13`, v2.ID, load.Date); n != 1 {
		t.Error("flattened day row does not carry the override")
	}

	// A bad value is refused beside its input, kept as typed, nothing saved.
	res = b.post(editURL, url.Values{"revision": {strconv.Itoa(v2.Revision)}, "action": {"save"}, gkgName(load.Date): {"25"}, duringName: {"lots"}})
	if res.status != http.StatusUnprocessableEntity {
		t.Fatalf("bad override: status %d", res.status)
	}
	res.mustContain(t, "must be a number from 0 to 20 g/kg", `value="25"`, "In-event carbohydrate must be a number from 0 to 150 g/h", `value="lots"`)
	if latestVersion(t, a, pid).Revision != v2.Revision {
		t.Fatal("a refused override was saved")
	}

	// A feed's grams and time are overrides too.
	taper := firstDay(t, v2.Result, fuel.RoleTaper)
	b.post(editURL, url.Values{"revision": {strconv.Itoa(v2.Revision)}, "action": {"save"}, gkgName(load.Date): {"13"},
		feedChoName(taper.Date, 1): {"55"}, feedAtName(taper.Date, 1): {"10:45"}}).mustRedirect(t, editURL)
	vf := latestVersion(t, a, pid)
	if len(vf.Request.FeedOverrides) != 1 || *vf.Request.FeedOverrides[0].ChoG != 55 || vf.Request.FeedOverrides[0].At != "10:45" {
		t.Fatalf("feed override not stored: %+v", vf.Request.FeedOverrides)
	}
	fd := firstDay(t, vf.Result, fuel.RoleTaper).Feeds[1]
	if !fd.Overridden || fd.ChoG != 55 || fd.At.In(loadZone(vf.Result.TimeZone)).Format("15:04") != "10:45" {
		t.Fatalf("overridden feed: %+v", fd)
	}
	b.get(editURL).mustContain(t, `name="`+feedAtName(taper.Date, 1)+`" id="f-`+feedAtName(taper.Date, 1)+`" value="10:45"`)
	v2 = vf

	// Clearing the box goes back to the computed figure.
	b.post(editURL, url.Values{"revision": {strconv.Itoa(v2.Revision)}, "action": {"save"}, gkgName(load.Date): {""}}).mustRedirect(t, editURL)
	v3 := latestVersion(t, a, pid)
	if len(v3.Request.Overrides) != 0 || firstDay(t, v3.Result, fuel.RoleLoad).Overridden {
		t.Fatalf("cleared override still there: %+v", v3.Request.Overrides)
	}
	if d := firstDay(t, v3.Result, fuel.RoleLoad); d.ChoGPerKg < 10 || d.ChoGPerKg > 12 {
		// Two-day loading: 10–12 g/kg per 24 h (ACSM/AND/DC 2016).
		t.Errorf("computed load day %v g/kg, outside 10–12", d.ChoGPerKg)
	}
}

func TestFoodSuggestionsAddUp(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	_, pid := loadingPlan(t, a, b)
	v := latestVersion(t, a, pid)
	foods, err := a.st.ListFoods(context.Background(), false)
	if err != nil {
		t.Fatal(err)
	}
	byName := map[string]store.Food{}
	for _, f := range foods {
		byName[f.Name] = f
	}
	rows, err := a.st.Pool.Query(context.Background(), `SELECT cho_g::float8, protein_g::float8, label, suggestion FROM plan_feeds WHERE plan_version_id = $1 AND kind = 'day'`, v.ID)
	if err != nil {
		t.Fatal(err)
	}
	defer rows.Close()
	checked, withProtein := 0, 0
	for rows.Next() {
		var cho, prot float64
		var label, text string
		if err := rows.Scan(&cho, &prot, &label, &text); err != nil {
			t.Fatal(err)
		}
		if cho <= 0 || text == menu.NoFit {
			continue
		}
		sum, protein := 0.0, 0.0
		for _, part := range strings.Split(text, "; ") {
			m := suggestionFlour.FindStringSubmatch(part)
			if m == nil {
				m = suggestionPart.FindStringSubmatch(part)
			}
			if m == nil {
				t.Fatalf("feed of %v g: suggestion %q not understood", cho, text)
			}
			f, ok := byName[m[1]]
			if !ok {
				t.Fatalf("suggested food %q is not on the list", m[1])
			}
			grams := suggestionPortions(m[2]) * f.PortionG // as weighed in the table
			sum += grams * f.CarbohydrateG / 100
			protein += grams * f.ProteinG / 100
		}
		if d := math.Abs(sum - cho); d > menu.Tolerance(cho)+1e-6 {
			t.Errorf("feed of %v g: %q gives %.1f g", cho, text, sum)
		}
		// A feed outside exercise with a protein target gets its protein
		// too, within its margin.
		if !strings.Contains(label, "during") && prot >= menu.MinProteinAwareG {
			withProtein++
			if d := math.Abs(protein - prot); d > menu.ProteinTolerance(prot)+1e-6 {
				t.Errorf("%s of %v g protein: %q gives %.1f g", label, prot, text, protein)
			}
		}
		checked++
	}
	if checked < 20 || withProtein < 10 {
		t.Fatalf("only %d feeds had suggestions, %d of them with protein checked", checked, withProtein)
	}
}

func TestClientCautionsOnPlan(t *testing.T) {
	a := newApp(t)
	demo := loadDemo(t, a)
	b, _ := a.signedIn(store.RoleDietitian)
	c := demo.IDs.Clients["triathlete"]
	pid := createPlan(t, b, c, planForm("week", "55", "start_date", "2027-03-01", "time_zone", "Australia/Perth"))
	v := latestVersion(t, a, pid)
	if len(v.Request.Cautions) == 0 || !strings.Contains(v.Request.Cautions[0], "Type 1 diabetes") {
		t.Fatalf("cautions passed to the engine: %q", v.Request.Cautions)
	}
	var found bool
	for _, f := range v.Result.Findings {
		if f.Level == fuel.LevelCaution && strings.Contains(strings.ToLower(f.Message), "diabetes") {
			found = true
		}
	}
	if !found {
		t.Errorf("no caution finding for the recorded diabetes: %+v", v.Result.Findings)
	}
	b.get("/clients/"+itoa64(c)+"/plans/"+itoa64(pid)).mustContain(t, "Recorded caution for", "Type 1 diabetes", "id=\"safety\"")
}

func TestComputeAPI(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	req := func(body string) response {
		r, _ := http.NewRequest(http.MethodPost, a.srv.URL+"/api/v1/compute", strings.NewReader(body))
		r.Header.Set("Content-Type", "application/json")
		return b.do(r)
	}
	good := `{"kind":"loading","protocol":"two-day","athlete":{"sex":"female","body_mass_kg":58},
		"event":{"starts_at":"2027-04-18T08:00:00+02:00","modality":"run","distance_km":42.195,"expected_duration_min":215}}`
	res := req(good)
	if res.status != http.StatusOK {
		t.Fatalf("status %d: %s", res.status, res.body)
	}
	var plan struct {
		Days     []map[string]any `json:"days"`
		Findings []map[string]any `json:"findings"`
		Caution  string           `json:"caution"`
	}
	if err := json.Unmarshal([]byte(res.body), &plan); err != nil || len(plan.Days) == 0 || len(plan.Findings) == 0 || plan.Caution == "" {
		t.Fatalf("answer: %v %s", err, res.body)
	}
	res = req(`{"kind":"loading","athlete":{"sex":"other","body_mass_kg":-3}}`)
	if res.status != http.StatusUnprocessableEntity {
		t.Fatalf("invalid request: status %d", res.status)
	}
	var bad struct {
		Errors []fuel.FieldError `json:"errors"`
	}
	if err := json.Unmarshal([]byte(res.body), &bad); err != nil {
		t.Fatal(err)
	}
	fields := map[string]bool{}
	for _, e := range bad.Errors {
		fields[e.Field] = e.Message != ""
	}
	if !fields["athlete.sex"] || !fields["athlete.body_mass_kg"] {
		t.Fatalf("field errors: %+v", bad.Errors)
	}
	anon := a.browser()
	r, _ := http.NewRequest(http.MethodPost, a.srv.URL+"/api/v1/compute", strings.NewReader(good))
	if res := anon.do(r); res.status != http.StatusUnauthorized || !strings.Contains(res.body, "sign in first") {
		t.Fatalf("anonymous API call: status %d %q, want 401 saying to sign in", res.status, res.body)
	}
}

// FuzzDecodeOverrides: the override inputs never panic, and what they accept
// is within the engine's limits.
func FuzzDecodeOverrides(f *testing.F) {
	f.Add("gkg_2027-04-16", "11.5", "feedat_2027-04-16_2", "07:30")
	f.Add("occ_2027-04-16", "99", "feedcho_2027-04-16_x", "1e9")
	f.Add("during_gph", "NaN", "gkg_bad", "-1")
	f.Fuzz(func(t *testing.T, k1, v1, k2, v2 string) {
		values := url.Values{}
		values.Set(k1, v1)
		values.Set(k2, v2)
		req, form := decodeOverrides(values, fuel.Request{Kind: fuel.KindWeek})
		if form.Has() {
			return
		}
		for _, o := range req.Overrides {
			if o.ChoGPerKg != nil && !(*o.ChoGPerKg >= 0 && *o.ChoGPerKg <= 20) {
				t.Fatalf("accepted %v g/kg", *o.ChoGPerKg)
			}
			if o.EatingOccasions != nil && (*o.EatingOccasions < 1 || *o.EatingOccasions > 10) {
				t.Fatalf("accepted %d occasions", *o.EatingOccasions)
			}
		}
		for _, o := range req.FeedOverrides {
			if o.ChoG != nil && !(*o.ChoG >= 0 && *o.ChoG <= 1000) {
				t.Fatalf("accepted %v g", *o.ChoG)
			}
		}
		if g := req.DuringEventChoGPerH; g != nil && !(*g >= 0 && *g <= 150) {
			t.Fatalf("accepted %v g/h", *g)
		}
	})
}

func TestDemoHasPublishedPlanOfEachKind(t *testing.T) {
	a := newApp(t)
	loadDemo(t, a)
	before := a.count(`SELECT count(*) FROM plans`)
	loadDemo(t, a) // a second load adds nothing
	if after := a.count(`SELECT count(*) FROM plans`); after != before {
		t.Fatalf("second demo load added %d plans", after-before)
	}
	b, _ := a.signedIn(store.RoleDietitian)
	for _, kind := range []string{fuel.KindLoading, fuel.KindRace, fuel.KindRepletion, fuel.KindWeek} {
		var clientID, planID int64
		err := a.st.Pool.QueryRow(context.Background(), `SELECT p.client_id, p.id FROM plans p JOIN plan_versions v ON v.plan_id = p.id
			WHERE p.kind = $1 AND v.status = 'published' AND p.created_by IS NULL ORDER BY p.id LIMIT 1`, kind).Scan(&clientID, &planID)
		if err != nil {
			t.Errorf("no published demo plan of kind %s: %v", kind, err)
			continue
		}
		b.get("/clients/"+itoa64(clientID)+"/plans/"+itoa64(planID)).mustContain(t, `<span class="status published">published</span>`, "not medical advice")
	}
}

// FuzzPlanStart: the start-a-plan form never panics, and what it accepts
// builds a request the engine either computes or refuses with field errors.
func FuzzPlanStart(f *testing.F) {
	f.Add("loading", "1", "two-day", "58", "19", "167", "5", "", "", "", "", "7")
	f.Add("repletion", "0", "", "70", "", "", "5", "2027-03-02T09:30", "2027-03-02T15:30", "Europe/London", "", "7")
	f.Add("week", "0", "", "1e9", "x", "-1", "0", "", "", "Mars/Olympus", "2027-02-30", "99")
	h := 167.0
	km := 42.195
	client := store.Client{ID: 1, Name: "Fuzz", Sex: store.SexFemale, HeightCm: &h}
	events := []store.Event{{ID: 1, ClientID: 1, Name: "Test marathon", StartsAt: testNow.AddDate(0, 1, 0), TimeZone: "Europe/Oslo",
		Modality: "run", DistanceKm: &km, ExpectedDurationMin: 215, Days: 1, Priority: "A"}}
	f.Fuzz(func(t *testing.T, kind, event, protocol, mass, fat, height, occasions, end, next, zone, start, days string) {
		v := url.Values{"kind": {kind}, "event_id": {event}, "protocol": {protocol}, "body_mass_kg": {mass}, "body_fat_pct": {fat},
			"height_cm": {height}, "eating_occasions": {occasions}, "session_end": {end}, "next_start": {next},
			"time_zone": {zone}, "start_date": {start}, "days": {days}, "taper_days": {"7"}}
		pi, form := decodePlanStart(v, client, events)
		if form.Has() {
			return
		}
		req, err := buildRequest(pi)
		if err == nil {
			_, err = fuel.Compute(req)
		}
		var ve fuel.ValidationError
		if err != nil && !errors.As(err, &ve) {
			t.Fatalf("accepted form gave a non-field error: %v", err)
		}
	})
}

// A published version shows the food suggestions stored with it — what the
// client link and the plan sheet show — even after the foods list changes;
// a new draft's are made afresh from the current list when it is started.
func TestPublishedPlanShowsStoredSuggestions(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	cid, pid := loadingPlan(t, a, b)
	base := "/clients/" + itoa64(cid) + "/plans/" + itoa64(pid)
	v1 := latestVersion(t, a, pid)
	b.post(base+"/versions/1", url.Values{"revision": {strconv.Itoa(v1.Revision)}, "action": {"publish"}}).mustRedirect(t, base+"/versions/1")

	ctx := context.Background()
	var text string
	if err := a.st.Pool.QueryRow(ctx, `SELECT suggestion FROM plan_feeds WHERE plan_version_id = $1 AND kind = 'day' AND suggestion LIKE '%:%'
		ORDER BY at LIMIT 1`, v1.ID).Scan(&text); err != nil {
		t.Fatal(err)
	}
	name := strings.SplitN(text, ":", 2)[0]
	var foodID int64
	if err := a.st.Pool.QueryRow(ctx, `SELECT id FROM foods WHERE name = $1 AND archived_at IS NULL`, name).Scan(&foodID); err != nil {
		t.Fatalf("suggested food %q: %v", name, err)
	}
	// The shared test database is used by other tests: put the food back.
	if err := a.st.ArchiveFood(ctx, store.System, foodID); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { a.st.UnarchiveFood(ctx, store.System, foodID) })

	b.get(base+"/versions/1").mustContain(t, html.EscapeString(text))

	b.post(base+"/revise", nil).mustRedirect(t, base+"/versions/2")
	if draft := b.get(base + "/versions/2"); strings.Contains(draft.body, html.EscapeString(name)+":") {
		t.Errorf("the draft still suggests archived food %q", name)
	}
}

// TestRepletionGapTooLongInFormWords: the engine names its JSON keys in its
// messages (for the API); the form must say the same in the form's words,
// next to the field at fault, keeping what was typed and saving nothing.
func TestRepletionGapTooLongInFormWords(t *testing.T) {
	a := newApp(t)
	demo := loadDemo(t, a)
	b, _ := a.signedIn(store.RoleDietitian)
	rower := demo.IDs.Clients["rower"]
	before := a.count(`SELECT count(*) FROM plans WHERE client_id = $1`, rower)
	res := b.post("/clients/"+itoa64(rower)+"/plans", planForm("repletion", "88", "session_end", "2027-03-02T09:30",
		"next_start", "2027-03-09T15:30", "time_zone", "Europe/London"))
	if res.status != http.StatusUnprocessableEntity {
		t.Fatalf("status %d, want 422", res.status)
	}
	res.mustContain(t, `id="err-next_start"`, "within 72 hours of the end of the session", `value="2027-03-09T15:30"`)
	if strings.Contains(res.body, "session_end.") || strings.Contains(res.body, "of session_end") {
		t.Errorf("the page names the engine's field key session_end")
	}
	if after := a.count(`SELECT count(*) FROM plans WHERE client_id = $1`, rower); after != before {
		t.Errorf("plans of the client went from %d to %d on a refused form", before, after)
	}
}

func TestFieldWordsForRecordsOnTheClientPage(t *testing.T) {
	got := fieldWords(fuel.FieldError{Field: "event.distance_km", Message: "must be at most 1000 km"})
	if want := "The event's distance must be at most 1000 km. Change it on the client's page."; got != want {
		t.Errorf("fieldWords = %q, want %q", got, want)
	}
	got = fieldWords(fuel.FieldError{Field: "training[2].intensity", Message: "rpe must be 1 to 10"})
	if strings.Contains(got, "training[2]") || !strings.HasPrefix(got, "A session in the training log") {
		t.Errorf("fieldWords for a training error = %q", got)
	}
}

// TestNewPlanFormSaysWhenNoTraining: a client with nothing in the training
// log gets a plain sentence, not an empty table under "Training the plan
// will use".
func TestNewPlanFormSaysWhenNoTraining(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Nova Empty"))
	res := b.get("/clients/" + itoa64(c.ID) + "/plans/new?kind=week")
	if res.status != http.StatusOK {
		t.Fatalf("status %d", res.status)
	}
	res.mustContain(t, "No sessions logged or planned from", "rest days", "No body mass on record")
}

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

	"larder/internal/mass"
	"larder/internal/sheet/sheettest"
	"larder/internal/store"
)

// A client weighed in pounds: the mass typed in lb is kept in kg without
// drift and every surface that shows a body mass shows it in lb — the
// client page and list, the plan form and page, the sheet and the phone
// page — while grams of food and g/kg stay as the trade writes them.
func TestPoundsEverywhere(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c, e := sheetClient(t, a)
	cid := itoa64(c.ID)

	// The client form offers the choice and keeps it.
	b.get("/clients/"+cid+"/edit").mustContain(t, `name="mass_unit" value="lb"`, "The practice’s unit (kg)")
	form := clientValues(c)
	form.Set("mass_unit", "lb")
	form.Set("athlete_sees_energy_mass", "on")
	b.post("/clients/"+cid, form).mustRedirect(t, "/clients/"+cid)
	c, err := a.st.ClientByID(context.Background(), c.ID)
	if err != nil || c.MassUnit != mass.LB || c.Unit != mass.LB {
		t.Fatalf("client unit not saved: own %q, in effect %q, %v", c.MassUnit, c.Unit, err)
	}

	// The body-mass form starts in lb; 150.4 lb is stored as 68.22 kg
	// (150.4 × 0.45359237 = 68.2203 kg; NIST SP 811) and shown back as typed.
	b.get("/clients/"+cid+"/body-mass/new").mustContain(t, `name="unit" value="lb" checked`)
	b.post("/clients/"+cid+"/body-mass", url.Values{"measured_on": {"2027-02-28"}, "mass": {"150.4"}, "unit": {"lb"}}).
		mustRedirect(t, "/clients/"+cid)
	m, err := a.st.LatestBodyMass(context.Background(), c.ID)
	if err != nil || m.MassKg != 68.22 || m.EnteredUnit != "lb" {
		t.Fatalf("stored %v kg entered in %q (%v), want 68.22 kg in lb", m.MassKg, m.EnteredUnit, err)
	}
	edit := "/clients/" + cid + "/body-mass/" + itoa64(m.ID)
	page := b.get(edit + "/edit")
	page.mustContain(t, `value="150.4"`)
	version := regexp.MustCompile(`name="version" value="(\d+)"`).FindStringSubmatch(page.body)
	if version == nil {
		t.Fatalf("edit form has no version\n%s", page.body)
	}
	// Saved again unchanged, it does not move.
	b.post(edit, url.Values{"measured_on": {"2027-02-28"}, "mass": {"150.4"}, "unit": {"lb"}, "version": {version[1]}}).
		mustRedirect(t, "/clients/"+cid)
	if again, _ := a.st.LatestBodyMass(context.Background(), c.ID); again.MassKg != 68.22 {
		t.Fatalf("saved again unchanged: %v kg", again.MassKg)
	}

	// A measurement typed in kg shows in lb too: 68 kg = 149.9 lb.
	b.post("/clients/"+cid+"/body-mass", url.Values{"measured_on": {"2027-02-20"}, "mass": {"68"}, "unit": {"kg"}}).
		mustRedirect(t, "/clients/"+cid)
	page = b.get("/clients/" + cid)
	page.mustContain(t, "150.4 lb", "149.9 lb", "chart-body-mass", "body mass (lb)")
	if strings.Contains(page.body, "68.2 kg") || strings.Contains(page.body, "68.0 kg") || strings.Contains(page.body, "body mass (kg)") {
		t.Error("client page shows the mass in kg")
	}
	b.get("/clients?q="+url.QueryEscape(c.Name)).mustContain(t, "150.4 lb")
	// Its edit form is in lb as well (68 kg / 0.45359237 = 149.91 lb), and
	// saved as shown it stays 68 kg.
	list, err := a.st.ListBodyMass(context.Background(), c.ID)
	if err != nil {
		t.Fatal(err)
	}
	var kgTyped store.BodyMass
	for _, m := range list {
		if m.EnteredUnit == "kg" && m.MassKg == 68 {
			kgTyped = m
		}
	}
	kgEdit := "/clients/" + cid + "/body-mass/" + itoa64(kgTyped.ID)
	page = b.get(kgEdit + "/edit")
	page.mustContain(t, `name="mass" value="149.9"`, `name="unit" value="lb" checked`)
	b.post(kgEdit, url.Values{"measured_on": {"2027-02-20"}, "mass": {"149.9"}, "unit": {"lb"},
		"version": {regexp.MustCompile(`name="version" value="(\d+)"`).FindStringSubmatch(page.body)[1]}}).mustRedirect(t, "/clients/"+cid)
	if again, _ := a.st.BodyMassByID(context.Background(), c.ID, kgTyped.ID); again.MassKg != 68 {
		t.Fatalf("a kg measurement saved unchanged from the lb form: %v kg", again.MassKg)
	}

	// The plan form: in lb, prefilled from the measurement.
	newPlan := b.get("/clients/" + cid + "/plans/new")
	newPlan.mustContain(t, "Body mass (lb)", `name="body_mass_kg" value="150.4"`, `name="body_mass_unit" value="lb"`,
		"Latest measurement: 150.4 lb")
	v := planForm("loading", "150.4", "event_id", itoa64(e.ID), "body_mass_unit", "lb", "body_mass_prefill", "68.22",
		"body_mass_on", "2027-02-28", "height_cm", "168")
	pid := createPlan(t, b, c.ID, v)
	ver := latestVersion(t, a, pid)
	if ver.Result.FatFreeMassKg <= 0 {
		t.Fatalf("no fat-free mass estimated: %q", ver.Result.FatFreeMassMethod)
	}
	if ver.BodyMassKg != 68.22 || ver.Request.Athlete.BodyMassKg != 68.22 || ver.BodyMassOn == nil {
		t.Fatalf("plan body mass %v kg (engine %v kg), measured %v; want the 68.22 kg on record", ver.BodyMassKg, ver.Request.Athlete.BodyMassKg, ver.BodyMassOn)
	}
	base := "/clients/" + cid + "/plans/" + itoa64(pid)
	editURL := base + "/versions/1"
	plan := b.get(editURL)
	gain := mass.Difference(*ver.Result.ExpectedMassGainKg, *ver.Result.ExpectedMassGainKgMax, mass.LB)
	plan.mustContain(t, "150.4 lb, measured", "Body mass (lb)", `name="`+massUnitName+`" value="lb"`,
		mass.Text(ver.Result.FatFreeMassKg, mass.LB), gain, "g/kg")
	if !strings.HasSuffix(gain, " lb") {
		t.Fatalf("expected gain %q is not in lb", gain)
	}
	// The engine's finding on the gain reads in lb too.
	if strings.Contains(plan.body, " kg above the usual diet") || !strings.Contains(plan.body, html.EscapeString(gain)+" above the usual diet") {
		t.Error("plan page's expected-gain finding is not in lb")
	}

	// Saving the draft with the mass as shown keeps it; a new lb figure is converted.
	save := func(lb string) store.PlanVersion {
		t.Helper()
		cur := latestVersion(t, a, pid)
		b.post(editURL, url.Values{"revision": {strconv.Itoa(cur.Revision)}, "action": {"save"}, massName: {lb}, massUnitName: {"lb"}}).
			mustRedirect(t, editURL)
		return latestVersion(t, a, pid)
	}
	if got := save("150.4"); got.BodyMassKg != 68.22 {
		t.Fatalf("unchanged 150.4 lb saved as %v kg", got.BodyMassKg)
	}
	// 151 lb = 68.4925 kg, stored to 0.01 kg.
	if got := save("151"); got.BodyMassKg != 68.49 {
		t.Fatalf("151 lb saved as %v kg", got.BodyMassKg)
	}
	if got := save("150.4"); got.BodyMassKg != 68.22 {
		t.Fatalf("150.4 lb saved as %v kg", got.BodyMassKg)
	}
	res := b.post(editURL, url.Values{"revision": {strconv.Itoa(latestVersion(t, a, pid).Revision)}, "action": {"save"},
		massName: {"700"}, massUnitName: {"lb"}})
	if res.status != http.StatusUnprocessableEntity {
		t.Fatalf("700 lb: status %d", res.status)
	}
	res.mustContain(t, "Body mass must be between 44.1 and 661.3 lb (20 to 300 kg).", `value="700"`)
	cur := latestVersion(t, a, pid)
	b.post(editURL, url.Values{"revision": {strconv.Itoa(cur.Revision)}, "action": {"publish"}, massName: {"150.4"}, massUnitName: {"lb"}}).
		mustRedirect(t, base)

	// The sheet prints lb.
	pdf := b.getPDF(base + "/sheet.pdf")
	pdf.mustPDF(t)
	if text, ok := sheettest.Text(t, pdf.body); ok {
		text = fold(text)
		if strings.Contains(text, " kg above the usual diet") {
			t.Errorf("sheet's expected-gain finding is in kg:\n%.3000s", text)
		}
		for _, want := range []string{"150.4 lb, measured", fold(gain) + " above the usual diet", "g/kg"} {
			if !strings.Contains(text, want) {
				t.Errorf("sheet lacks %q:\n%.3000s", want, text)
			}
		}
		if regexp.MustCompile(`\b68\.2 kg`).MatchString(text) {
			t.Error("sheet prints the body mass in kg")
		}
	}

	// The phone page, with figures shown, gives the mass and the gain in lb.
	token := makeLink(t, b, c.ID, "phone")
	_, phone := getPublic(t, a, "/c/"+token)
	for _, want := range []string{`Worked out for a body mass of <span class="fig">150.4 lb</span>.`, `Expect to weigh about <span class="fig">` + gain + `</span> more`} {
		if !strings.Contains(phone, want) {
			t.Errorf("phone page lacks %q\n%s", want, phone)
		}
	}
	// The athlete's sheet from the link, figures shown: the gain in lb.
	athlete := b.getPDF("/c/" + token + "/sheet.pdf")
	athlete.mustPDF(t)
	if text, ok := sheettest.Text(t, athlete.body); ok {
		if want := "You may weigh about " + fold(gain) + " more"; !strings.Contains(fold(text), want) {
			t.Errorf("athlete's sheet lacks %q:\n%.3000s", want, text)
		}
	}
}

// The practice default applies to every client who chose no unit, and a
// client's own choice wins over it.
func TestPracticeMassUnit(t *testing.T) {
	a := newApp(t)
	admin, _ := a.signedIn(store.RoleAdmin)
	follows := a.newClient(unique("Ola Default"))
	own := a.newClient(unique("Kari Kilos"))
	own.MassUnit = mass.KG
	if err := a.st.UpdateClient(context.Background(), store.System, &own); err != nil {
		t.Fatal(err)
	}
	for _, c := range []store.Client{follows, own} {
		if err := a.st.AddBodyMass(context.Background(), store.System, &store.BodyMass{ClientID: c.ID, MeasuredOn: testNow, MassKg: 70, EnteredUnit: "kg"}); err != nil {
			t.Fatal(err)
		}
	}
	t.Cleanup(func() {
		_, _ = a.st.Pool.Exec(context.Background(), `DELETE FROM settings WHERE key = 'mass_unit'`)
	})
	res := admin.post("/team/practice", url.Values{"practice_name": {"Units practice"}, "practice_time_zone": {"Europe/Oslo"}, "mass_unit": {"stone"}})
	if res.status != http.StatusUnprocessableEntity {
		t.Fatalf("unit stone: status %d", res.status)
	}
	res.mustContain(t, "Choose kg or lb.")
	admin.post("/team/practice", url.Values{"practice_name": {"Units practice"}, "practice_time_zone": {"Europe/Oslo"}, "mass_unit": {"lb"},
		"version": {formVersionAt(t, admin.get("/team").body, "/team/practice")}}).mustRedirect(t, "/team")
	admin.get("/team").mustContain(t, `name="mass_unit" value="lb" checked`)

	// 70 kg = 154.3 lb (70 / 0.45359237 = 154.32).
	admin.get("/clients/"+itoa64(follows.ID)).mustContain(t, "154.3 lb")
	admin.get("/clients/"+itoa64(own.ID)).mustContain(t, "70.0 kg")
	admin.get("/clients/"+itoa64(follows.ID)+"/edit").mustContain(t, "The practice’s unit (lb)")
	admin.get("/clients/"+itoa64(follows.ID)+"/body-mass/new").mustContain(t, `name="unit" value="lb" checked`,
		"20 to 300 kg, or 44.1 to 661.3 lb")
}

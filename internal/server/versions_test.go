package server

import (
	"context"
	"html"
	"net/http"
	"net/url"
	"regexp"
	"strings"
	"testing"

	"larder/internal/store"
)

// hiddenValue is the value of the hidden input name on a page.
func hiddenValue(t *testing.T, body, name string) string {
	t.Helper()
	m := regexp.MustCompile(`<input type="hidden" name="` + regexp.QuoteMeta(name) + `" value="([^"]*)"`).FindStringSubmatch(body)
	if m == nil {
		t.Fatalf("no hidden %s on the page\n%s", name, body)
	}
	return m[1]
}

// Two tabs open the same record's edit form; the first save goes through,
// the second (from the stale tab) is refused with 409, says why, keeps what
// was typed and leaves the first save in place; saving again from the
// refused form goes through on purpose. A form with no version (an old tab,
// a script) is refused alike. Before, the second save silently won.
func TestStaleEditsRefused(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleAdmin)
	c := a.newClient(unique("Stale Client"))
	base := "/clients/" + itoa(c.ID)
	b.post(base+"/body-mass", url.Values{"measured_on": {"2027-02-20"}, "mass": {"60.0"}, "unit": {"kg"}}).mustRedirect(t, base)
	b.post(base+"/training", url.Values{"on_date": {"2027-02-26"}, "modality": {"run"}, "duration_min": {"60"},
		"intensity_kind": {"rpe"}, "rpe": {"5"}, "status": {"done"}}).mustRedirect(t, base)
	b.post(base+"/events", url.Values{"name": {"Harbour 10K"}, "starts_at": {"2027-04-18T09:00"}, "time_zone": {"Europe/Oslo"},
		"modality": {"run"}, "expected_duration_min": {"45"}, "priority": {"B"}}).mustRedirect(t, base)
	id := func(table string) string {
		return itoa(int64(a.count(`SELECT max(id)::int FROM `+table+` WHERE client_id = $1`, c.ID)))
	}
	cases := []struct {
		name, path    string
		first, second url.Values
		field, table  string
	}{
		{"body mass", base + "/body-mass/" + id("body_mass"),
			url.Values{"measured_on": {"2027-02-20"}, "mass": {"61.0"}, "unit": {"kg"}},
			url.Values{"measured_on": {"2027-02-20"}, "mass": {"62.5"}, "unit": {"kg"}}, "mass", "body_mass"},
		{"training", base + "/training/" + id("training_sessions"),
			url.Values{"on_date": {"2027-02-26"}, "modality": {"run"}, "duration_min": {"70"}, "intensity_kind": {"rpe"}, "rpe": {"5"}, "status": {"done"}},
			url.Values{"on_date": {"2027-02-26"}, "modality": {"run"}, "duration_min": {"95"}, "intensity_kind": {"rpe"}, "rpe": {"5"}, "status": {"done"}}, "duration_min", "training_sessions"},
		{"event", base + "/events/" + id("events"),
			url.Values{"name": {"Harbour 10K (moved)"}, "starts_at": {"2027-04-18T09:00"}, "time_zone": {"Europe/Oslo"}, "modality": {"run"}, "expected_duration_min": {"45"}, "priority": {"B"}},
			url.Values{"name": {"Harbour Ten"}, "starts_at": {"2027-04-18T09:00"}, "time_zone": {"Europe/Oslo"}, "modality": {"run"}, "expected_duration_min": {"45"}, "priority": {"B"}}, "name", "events"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			tab1, tab2 := b.get(tc.path+"/edit"), b.get(tc.path+"/edit")
			v1, v2 := hiddenValue(t, tab1.body, "version"), hiddenValue(t, tab2.body, "version")
			tc.first.Set("version", v1)
			b.post(tc.path, tc.first).mustRedirect(t, base)

			tc.second.Set("version", v2)
			res := b.post(tc.path, tc.second)
			if res.status != http.StatusConflict {
				t.Fatalf("stale save: status %d, want 409\n%s", res.status, res.body)
			}
			res.mustContain(t, "Someone saved a change to this record after you opened this form", `value="`+tc.second.Get(tc.field)+`"`)
			if n := a.count(`SELECT count(*) FROM `+tc.table+` WHERE id = $1 AND version = $2`, tc.path[strings.LastIndex(tc.path, "/")+1:], 2); n != 1 {
				t.Fatalf("the first save was not kept as version 2")
			}
			// Saving the refused form again is deliberate and goes through.
			again := tc.second
			again.Set("version", hiddenValue(t, res.body, "version"))
			b.post(tc.path, again).mustRedirect(t, base)

			// No version at all: refused.
			again.Del("version")
			if res := b.post(tc.path, again); res.status != http.StatusConflict {
				t.Fatalf("save without a version: %d, want 409", res.status)
			}
		})
	}

	t.Run("client without its loaded field", func(t *testing.T) {
		res := b.post(base, url.Values{"name": {c.Name}, "sex": {"female"}, "sport": {"Overwritten"}})
		if res.status != http.StatusConflict {
			t.Fatalf("client save without loaded: %d, want 409", res.status)
		}
		if n := a.count(`SELECT count(*) FROM clients WHERE id = $1 AND sport = 'Overwritten'`, c.ID); n != 0 {
			t.Fatal("a client save without its loaded field overwrote the record")
		}
	})
}

// formVersionAt is the version carried by the form posting to action.
func formVersionAt(t *testing.T, body, action string) string {
	t.Helper()
	m := regexp.MustCompile(`action="` + regexp.QuoteMeta(action) + `"[^>]*>\s*<input type="hidden" name="version" value="([\d.]+)"`).FindStringSubmatch(body)
	if m == nil {
		t.Fatalf("no version in the form to %s\n%s", action, body)
	}
	return m[1]
}

// Two admins have the Team page open; the first changes a colleague's
// account, the second's change from the older page is refused (409) with a
// message in that account's row, the role they chose still selected and
// nothing saved; pressing again goes through. The practice's name alike,
// keeping the name typed. Before, the later save silently won.
func TestStaleTeamAndPracticeEditsRefused(t *testing.T) {
	a := newApp(t)
	ctx := context.Background()
	first, _ := a.signedIn(store.RoleAdmin)
	second, _ := a.signedIn(store.RoleAdmin)
	colleague := a.user(store.RoleDietitian, false)
	path := "/team/" + itoa(colleague.ID)
	current := func() store.User {
		u, err := a.st.UserByID(ctx, colleague.ID)
		if err != nil {
			t.Fatal(err)
		}
		return u
	}

	t.Run("role", func(t *testing.T) {
		old := formVersionAt(t, second.get("/team").body, path+"/role")
		first.post(path+"/disable", url.Values{"version": {formVersionAt(t, first.get("/team").body, path+"/disable")}}).mustRedirect(t, "/team")

		res := second.post(path+"/role", url.Values{"role": {"admin"}, "version": {old}})
		if res.status != http.StatusConflict {
			t.Fatalf("stale role change: %d, want 409\n%s", res.status, res.body)
		}
		res.mustContain(t, html.EscapeString("Someone changed "+colleague.Name+"'s account after you opened this page, so nothing was saved."),
			"with the role you chose still selected")
		row := res.body[strings.Index(res.body, `action="`+path+`/role"`):]
		row = row[:strings.Index(row, "</tr>")]
		if !strings.Contains(row, `<option value="admin" selected>`) || !strings.Contains(row, "disabled") {
			t.Errorf("the row does not keep the chosen role and show the account as it is now:\n%s", row)
		}
		if u := current(); u.Role != store.RoleDietitian || !u.Disabled {
			t.Fatalf("after the refused change: %+v", u)
		}
		// Pressing Change again on the refused page is deliberate.
		second.post(path+"/role", url.Values{"role": {"admin"}, "version": {formVersionAt(t, res.body, path+"/role")}}).mustRedirect(t, "/team")
		if u := current(); u.Role != store.RoleAdmin {
			t.Fatalf("the deliberate change was not saved: %+v", u)
		}
		if res := second.post(path+"/role", url.Values{"role": {"dietitian"}}); res.status != http.StatusConflict {
			t.Fatalf("role change without a version: %d, want 409", res.status)
		}
	})

	t.Run("enable and disable", func(t *testing.T) {
		old := formVersionAt(t, second.get("/team").body, path+"/enable")
		first.post(path+"/role", url.Values{"role": {"dietitian"}, "version": {formVersionAt(t, first.get("/team").body, path+"/role")}}).mustRedirect(t, "/team")
		res := second.post(path+"/enable", url.Values{"version": {old}})
		if res.status != http.StatusConflict {
			t.Fatalf("stale enable: %d, want 409\n%s", res.status, res.body)
		}
		res.mustContain(t, "press the button again if you still mean it")
		if !current().Disabled {
			t.Fatal("a stale enable went through")
		}
		second.post(path+"/enable", url.Values{"version": {formVersionAt(t, res.body, path+"/enable")}}).mustRedirect(t, "/team")
		if current().Disabled {
			t.Fatal("the deliberate enable was not saved")
		}
	})

	t.Run("practice name and zone", func(t *testing.T) {
		wasName, err := a.st.Setting(ctx, store.SettingPracticeName, store.DefaultPracticeName)
		if err != nil {
			t.Fatal(err)
		}
		wasZone, err := a.st.Setting(ctx, store.SettingPracticeTimeZone, store.DefaultPracticeTimeZone)
		if err != nil {
			t.Fatal(err)
		}
		t.Cleanup(func() {
			_ = a.st.SetSetting(ctx, store.System, store.SettingPracticeName, wasName)
			_ = a.st.SetSetting(ctx, store.System, store.SettingPracticeTimeZone, wasZone)
		})
		setting := func(key string) string {
			v, err := a.st.Setting(ctx, key, "")
			if err != nil {
				t.Fatal(err)
			}
			return v
		}
		old := formVersionAt(t, second.get("/team").body, "/team/practice")
		first.post("/team/practice", url.Values{"practice_name": {"Harbour Sports Nutrition"}, "practice_time_zone": {"Europe/Oslo"},
			"version": {formVersionAt(t, first.get("/team").body, "/team/practice")}}).mustRedirect(t, "/team")

		typed := url.Values{"practice_name": {"Quayside Fuelling Clinic"}, "practice_time_zone": {"Europe/Lisbon"}, "version": {old}}
		res := second.post("/team/practice", typed)
		if res.status != http.StatusConflict {
			t.Fatalf("stale practice details: %d, want 409\n%s", res.status, res.body)
		}
		res.mustContain(t, "Someone saved a change to this record after you opened this form", `value="Quayside Fuelling Clinic"`, `value="Europe/Lisbon"`)
		if name, zone := setting(store.SettingPracticeName), setting(store.SettingPracticeTimeZone); name != "Harbour Sports Nutrition" || zone != "Europe/Oslo" {
			t.Fatalf("the first save was not kept whole: %q, %q", name, zone)
		}
		typed.Set("version", formVersionAt(t, res.body, "/team/practice"))
		second.post("/team/practice", typed).mustRedirect(t, "/team")
		if name, zone := setting(store.SettingPracticeName), setting(store.SettingPracticeTimeZone); name != "Quayside Fuelling Clinic" || zone != "Europe/Lisbon" {
			t.Fatalf("the deliberate save was not kept: %q, %q", name, zone)
		}
		typed.Del("version")
		if res := second.post("/team/practice", typed); res.status != http.StatusConflict {
			t.Fatalf("practice details without a version: %d, want 409", res.status)
		}

		// The body-mass unit is saved with the name and zone: a form opened
		// before another admin chose lb cannot put kg back unseen.
		wasUnit := setting(store.SettingMassUnit)
		t.Cleanup(func() {
			_, _ = a.st.Pool.Exec(context.Background(), `UPDATE settings SET value = $1 WHERE key = 'mass_unit'`, wasUnit)
		})
		old = formVersionAt(t, second.get("/team").body, "/team/practice")
		// Only the unit changes meanwhile (as an older page's unit-only save did).
		if err := a.st.SetSetting(ctx, store.System, store.SettingMassUnit, "lb"); err != nil {
			t.Fatal(err)
		}
		unitTyped := url.Values{"practice_name": {"Quayside Fuelling Clinic"}, "practice_time_zone": {"Europe/Lisbon"},
			"mass_unit": {"kg"}, "version": {old}}
		if res := second.post("/team/practice", unitTyped); res.status != http.StatusConflict {
			t.Fatalf("stale practice unit: %d, want 409", res.status)
		}
		if u := setting(store.SettingMassUnit); u != "lb" {
			t.Fatalf("a stale form changed the unit to %q", u)
		}
	})
}

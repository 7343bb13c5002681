package server

import (
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

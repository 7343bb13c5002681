package server

import (
	"encoding/json"
	"fmt"
	"net/http"
	"net/url"
	"strings"
	"testing"
	"unicode/utf8"

	"larder/internal/forms"
	"larder/internal/store"
)

// A NUL or bytes that are not UTF-8 in a text field are refused beside the
// field with 422, never a 500 from the database, and nothing is saved.
func TestBadTextRefusedBesideField(t *testing.T) {
	a := newApp(t)
	admin, _ := a.signedIn(store.RoleAdmin)
	c := a.newClient(unique("Ada Badtext"))
	base := "/clients/" + itoa(c.ID)
	msg := strings.ReplaceAll(forms.BadTextMessage, "'", "&#39;")
	for _, bad := range []string{"Ada\x00Smith", "Ad\xffa", "caf\xc3"} {
		name := unique("Bad") + bad
		cases := []struct {
			path   string
			values url.Values
		}{
			{"/clients", url.Values{"name": {name}, "sex": {"female"}}},
			{"/foods", foodValuesFor(name)},
			{base + "/body-mass", url.Values{"measured_on": {"2027-02-20"}, "mass": {"61.4"}, "unit": {"kg"}, "method": {"DXA" + bad}}},
			{base + "/links", url.Values{"label": {"phone" + bad}, "expires_days": {"90"}}},
		}
		for _, tc := range cases {
			res := admin.post(tc.path, tc.values)
			if res.status != http.StatusUnprocessableEntity {
				t.Errorf("POST %s with %q: status %d, want 422\n%.400s", tc.path, bad, res.status, res.body)
				continue
			}
			if !strings.Contains(res.body, msg) && !strings.Contains(res.body, "characters that are not text") {
				t.Errorf("POST %s with %q: no message beside the field\n%s", tc.path, bad, res.body)
			}
		}
	}
	if n := a.count(`SELECT count(*) FROM clients WHERE name LIKE 'Bad-%'`); n != 0 {
		t.Errorf("%d clients saved from refused forms", n)
	}
	// A search term is not a form field; the database's refusal becomes a
	// page in words with 422, not a 500.
	for _, q := range []string{"%00", "%ff"} {
		res := admin.get("/clients?q=" + q)
		if res.status == http.StatusInternalServerError {
			t.Errorf("search q=%s: 500", q)
		}
	}
	res := a.browser().post("/signin", url.Values{"email": {"a\x00@example.org"}, "password": {"x\x00"}})
	if res.status == http.StatusInternalServerError || !strings.Contains(res.body, msg) {
		t.Errorf("sign-in with NUL: %d\n%.400s", res.status, res.body)
	}
}

// The JSON API names the field holding a NUL, and refuses a body that is
// not UTF-8 instead of quietly replacing its bytes.
func TestAPIRefusesBadText(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	cases := map[string]string{
		`{"kind":"loading","protocol":"two-day","athlete":{"sex":"female\u0000","body_mass_kg":58}}`: "athlete.sex",
		`{"kind":"loading","time_zone":"Europe/Paris` + "\xff" + `"}`:                                "request",
		`{"kind":"loading","training":[{"modality":"run"},{"modality":"ru\u0000n"}]}`:                "training.1.modality",
	}
	for body, field := range cases {
		r, _ := http.NewRequest(http.MethodPost, a.srv.URL+"/api/v1/compute", strings.NewReader(body))
		r.Header.Set("Content-Type", "application/json")
		res := b.do(r)
		if res.status != http.StatusUnprocessableEntity || !strings.Contains(res.body, `"field": "`+field+`"`) {
			t.Errorf("%q: %d %s, want 422 naming %s", body, res.status, res.body, field)
		}
	}
}

// FuzzUntextField: whatever the body, a NUL or non-UTF-8 body is always
// named, and clean JSON never is.
func FuzzUntextField(f *testing.F) {
	f.Add([]byte(`{"a":"b\u0000"}`))
	f.Add([]byte(`{"a":["x",{"b\u0000":1}]}`))
	f.Add([]byte("{\"a\":\"\xff\"}"))
	f.Add([]byte(`{"a":"ok"}`))
	f.Fuzz(func(t *testing.T, body []byte) {
		field := untextField(body)
		var v any
		valid := json.Unmarshal(body, &v) == nil
		hasNul := strings.Contains(fmt.Sprint(v), "\x00")
		switch {
		case !utf8.Valid(body) && field != "request":
			t.Fatalf("body not UTF-8, field %q", field)
		case utf8.Valid(body) && valid && hasNul && field == "":
			t.Fatalf("NUL not found in %q", body)
		case utf8.Valid(body) && valid && !hasNul && field != "":
			t.Fatalf("clean body %q named %q", body, field)
		}
	})
}

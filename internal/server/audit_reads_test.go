package server

import (
	"html"
	"net/http"
	"net/url"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"larder/internal/store"
)

// Opening a client's record, a plan version and its sheet each leave one
// read row naming who, what and when; a missing client leaves none; the
// reads stay out of the client's list of changes; an admin sees them on
// their page, a dietitian cannot.
func TestReadsAreRecordedAndListed(t *testing.T) {
	a := newApp(t)
	b, u := a.signedIn(store.RoleDietitian)
	cid, pid := loadingPlan(t, a, b)
	reads := func(kind string) int {
		return a.count(`SELECT count(*) FROM audit_log WHERE action = 'view' AND entity = $1 AND user_id = $2 AND (detail->>'client_id')::bigint = $3`, kind, u.ID, cid)
	}
	base := "/clients/" + itoa(cid)
	before := reads(store.ReadClient)
	if res := b.get(base); res.status != http.StatusOK {
		t.Fatalf("client page: %d", res.status)
	}
	if got := reads(store.ReadClient); got != before+1 {
		t.Errorf("client reads %d → %d, want one more", before, got)
	}
	plan := base + "/plans/" + itoa(pid)
	b.get(plan+"/versions/1").mustContain(t, "version")
	if n := a.count(`SELECT count(*) FROM audit_log WHERE action = 'view' AND entity = 'plan' AND entity_id = $1 AND (detail->>'version')::int = 1 AND user_id = $2`, pid, u.ID); n != 1 {
		t.Errorf("plan version reads: %d, want 1", n)
	}
	if res := b.get(plan + "/versions/1/sheet.pdf"); res.status != http.StatusOK {
		t.Fatalf("sheet: %d", res.status)
	}
	if got := reads(store.ReadSheet); got != 1 {
		t.Errorf("sheet reads: %d, want 1", got)
	}
	// Not found is not a read.
	n0 := a.count(`SELECT count(*) FROM audit_log WHERE action = 'view'`)
	if res := b.get("/clients/999999999"); res.status != http.StatusNotFound {
		t.Fatalf("missing client: %d", res.status)
	}
	if n := a.count(`SELECT count(*) FROM audit_log WHERE action = 'view'`); n != n0 {
		t.Errorf("a missing client's 404 was recorded as a read")
	}
	// Reads do not crowd the client's recent changes.
	hist, err := a.st.AuditForClient(t.Context(), cid, 50)
	if err != nil {
		t.Fatal(err)
	}
	for _, h := range hist {
		if h.Action == "view" {
			t.Fatalf("a read is listed among the client's changes: %+v", h)
		}
	}

	// Only admins see the list.
	if res := b.get("/team/reads"); res.status != http.StatusForbidden {
		t.Fatalf("dietitian on the reads page: %d", res.status)
	}
	admin, _ := a.signedIn(store.RoleAdmin)
	res := admin.get("/team/reads?client=" + strconv.FormatInt(cid, 10))
	if res.status != http.StatusOK {
		t.Fatalf("reads page: %d", res.status)
	}
	res.mustContain(t, "Who opened what", u.Name, "client record", "plan sheet (PDF), version 1", "plan, version 1")
	admin.get("/team/reads?user="+url.QueryEscape("x")).mustContain(t, "not a number")
	if res := admin.get("/team/reads?user=" + itoa(u.ID)); res.status != http.StatusOK {
		t.Fatalf("reads by user: %d", res.status)
	}
}

// An export carries a copy of a client's health data out of the practice:
// each one (a table's CSV or the whole record's zip) is listed on the
// admins' reads page with who took it, of which client, which file and
// when. Before, exports were recorded but not listed.
func TestExportsListedAmongReads(t *testing.T) {
	a := newApp(t)
	b, u := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Exported Client"))
	base := "/clients/" + itoa(c.ID) + "/export/"
	for _, file := range []string{"body-mass.csv", "record.zip"} {
		if res := b.get(base + file); res.status != http.StatusOK {
			t.Fatalf("export %s: %d\n%s", file, res.status, res.body)
		}
	}
	admin, _ := a.signedIn(store.RoleAdmin)
	for _, path := range []string{"/team/reads?client=" + itoa(c.ID), "/team/reads?user=" + itoa(u.ID), "/team/reads"} {
		res := admin.get(path)
		if res.status != http.StatusOK {
			t.Fatalf("%s: %d", path, res.status)
		}
		for _, file := range []string{"body-mass.csv", "record.zip"} {
			row := regexp.MustCompile(`<tr><td>[^<]+</td><td><a href="[^"]*">` + regexp.QuoteMeta(html.EscapeString(u.Name)) +
				`</a></td><td><a href="[^"]*">` + regexp.QuoteMeta(html.EscapeString(c.Name)) + `</a></td><td>export of the records \(` + regexp.QuoteMeta(file) + `\)</td></tr>`)
			if !row.MatchString(res.body) {
				t.Errorf("%s: no row for %s's export of %s (%s)\n%s", path, u.Name, c.Name, file, res.body)
			}
		}
	}
	// Another client's list leaves them out.
	other := a.newClient(unique("Other Client"))
	if res := admin.get("/team/reads?client=" + itoa(other.ID)); strings.Contains(res.body, "export of the records (") {
		t.Errorf("another client's list shows the exports:\n%s", res.body)
	}
}

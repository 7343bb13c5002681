package server

import (
	"net/http"
	"net/url"
	"strconv"
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

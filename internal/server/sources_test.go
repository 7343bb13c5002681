package server

import (
	"html"
	"net/http"
	"strconv"
	"strings"
	"testing"

	"larder/internal/fuel"
	"larder/internal/sources"
	"larder/internal/store"
)

// The Sources page lists every value of the guideline table with its full
// source and status; the plan page's findings show the short citation and
// no status word.
func TestSourcesPage(t *testing.T) {
	a := newApp(t)
	// Open to anyone (it holds no client data), with the staff
	// navigation for those signed in.
	public := a.browser().get("/sources")
	if public.status != http.StatusOK || strings.Contains(public.body, `aria-label="Main"`) {
		t.Fatalf("signed out: %d", public.status)
	}
	public.mustContain(t, `id="g-band.light"`)
	b, _ := a.signedIn(store.RoleDietitian)
	res := b.get("/sources")
	if res.status != http.StatusOK {
		t.Fatalf("sources page: %d", res.status)
	}
	res.mustContain(t, `aria-label="Main"`)
	rows := sources.Rows()
	for _, st := range sources.Statuses {
		res.mustContain(t, "<dt>"+string(st)+" ("+strconv.Itoa(sources.Count(rows, st))+" values)</dt>")
	}
	for _, g := range fuel.Guidelines {
		res.mustContain(t, `id="g-`+g.Key+`"`, html.EscapeString(g.Source), html.EscapeString(g.Description))
	}
	if n := strings.Count(res.body, `data-status="from memory"`); n != sources.Count(rows, sources.FromMemory) || n == 0 {
		t.Errorf("%d rows marked from memory", n)
	}

	// A plan whose findings cite sources from memory and common practice.
	c := a.newClient(unique("Cited Runner"))
	p, plan := storePlan(t, a, c.ID, "Cited week", weekRequest("2027-03-01", 7), false, "")
	page := b.get("/clients/" + itoa(c.ID) + "/plans/" + itoa(p.ID))
	cited := 0
	for _, f := range plan.Findings {
		if f.Source == "" {
			continue
		}
		cited++
		page.mustContain(t, "Source: "+html.EscapeString(sources.Short(f.Source)))
	}
	if cited == 0 {
		t.Fatal("the plan has no cited finding to check")
	}
	for _, w := range []string{"(from memory", "Source: common practice", "Source: model assumption"} {
		if strings.Contains(page.body, w) {
			t.Errorf("the plan page says %q", w)
		}
	}
}

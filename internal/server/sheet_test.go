package server

import (
	"bytes"
	"context"
	"encoding/json"
	"io"
	"net/http"
	"net/url"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"larder/internal/fuel"
	"larder/internal/sheet"
	"larder/internal/sheet/sheettest"
	"larder/internal/store"
)

type pdfResponse struct {
	status      int
	contentType string
	location    string
	disposition string
	body        []byte
}

func (b *browser) getPDF(path string) pdfResponse {
	b.a.t.Helper()
	resp, err := b.c.Get(b.a.srv.URL + path)
	if err != nil {
		b.a.t.Fatal(err)
	}
	defer resp.Body.Close()
	body, _ := io.ReadAll(resp.Body)
	return pdfResponse{status: resp.StatusCode, contentType: resp.Header.Get("Content-Type"), location: resp.Header.Get("Location"),
		disposition: resp.Header.Get("Content-Disposition"), body: body}
}

// mustPDF checks an answer is a PDF of one to three pages.
func (r pdfResponse) mustPDF(t *testing.T) {
	t.Helper()
	// DESIGN.md: a sheet is one to three pages a clinician can hand over.
	r.mustPDFUpTo(t, 3)
}

// mustPDFUpTo is mustPDF with another page limit: US Letter is 18 mm
// shorter than A4, so a long loading plan that fills three A4 pages runs
// onto a fourth Letter page.
func (r pdfResponse) mustPDFUpTo(t *testing.T, most int) {
	t.Helper()
	if r.status != http.StatusOK || r.contentType != "application/pdf" {
		t.Fatalf("want 200 application/pdf, got %d %q\n%.600s", r.status, r.contentType, r.body)
	}
	if !bytes.HasPrefix(r.body, []byte("%PDF-")) {
		t.Fatalf("body is not a PDF: %.40q", r.body)
	}
	if n := sheettest.Pages(r.body); n < 1 || n > most {
		t.Errorf("sheet has %d pages, want 1–%d", n, most)
	}
}

// sheetClient is a client with an accented name and a recorded caution, and
// a marathon three weeks after the tests' clock.
func sheetClient(t *testing.T, a *app) (store.Client, store.Event) {
	t.Helper()
	h := 168.0
	c := store.Client{Name: "Inés Tomás-Ríos " + unique("x"), Sex: store.SexFemale, HeightCm: &h, Sport: "Marathon",
		Cautions: "Coeliac disease – gluten-free foods only\nFainted once after a long run"}
	if err := a.st.CreateClient(context.Background(), store.System, &c); err != nil {
		t.Fatal(err)
	}
	km := 42.195
	e := store.Event{ClientID: c.ID, Name: "Lakeside Marathon", StartsAt: time.Date(2027, 3, 21, 8, 0, 0, 0, time.UTC),
		TimeZone: "Europe/Oslo", Modality: "run", DistanceKm: &km, ExpectedDurationMin: 210, Priority: "A"}
	if err := a.st.AddEvent(context.Background(), store.System, &e); err != nil {
		t.Fatal(err)
	}
	return c, e
}

func TestPlanSheet(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c, e := sheetClient(t, a)
	pid := createPlan(t, b, c.ID, planForm("loading", "58.5", "event_id", itoa64(e.ID)))
	base := "/clients/" + itoa64(c.ID) + "/plans/" + itoa64(pid)

	// Nothing published yet: no sheet to hand over, said in words.
	res := b.getPDF(base + "/sheet.pdf")
	if res.status != http.StatusNotFound || !strings.Contains(string(res.body), "is published yet") {
		t.Fatalf("unpublished plan's sheet: %d %q\n%.800s", res.status, res.contentType, res.body)
	}

	// The plan page links to its version's sheet, on A4 and on Letter.
	page := b.get(base)
	page.mustContain(t, `href="`+base+`/versions/1/sheet.pdf"`, `href="`+base+`/versions/1/sheet.pdf?paper=letter"`, "Plan sheet (PDF)")

	// The draft prints by its version, marked on every page.
	res = b.getPDF(base + "/versions/1/sheet.pdf")
	res.mustPDF(t)
	// An ASCII file name (accents folded) that says it is a draft.
	if !regexp.MustCompile(`^inline; filename="plan-sheet-ines-tomas-rios-x-[0-9-]+-v1-DRAFT\.pdf"$`).MatchString(res.disposition) {
		t.Errorf("draft sheet Content-Disposition = %q", res.disposition)
	}
	if text, ok := sheettest.Text(t, res.body); ok {
		pages := sheettest.Pages(res.body)
		if n := strings.Count(text, sheet.DraftMark+":"); n != pages {
			t.Errorf("draft banner on %d of %d pages", n, pages)
		}
		if n := strings.Count(strings.ReplaceAll(text, " ", ""), strings.ReplaceAll(sheet.DraftMark, " ", "")); n != 2*pages {
			t.Errorf("draft marked %d times on %d pages (banner and across the page)", n, pages)
		}
	}

	v1 := latestVersion(t, a, pid)
	b.post(base+"/versions/1", url.Values{"revision": {strconv.Itoa(v1.Revision)}, "action": {"publish"}}).mustRedirect(t, base+"/versions/1")
	v1 = latestVersion(t, a, pid)

	res = b.getPDF(base + "/sheet.pdf")
	res.mustPDF(t)
	if !bytes.Contains(res.body, []byte("/MediaBox [0 0 595.28 841.89]")) { // A4, 210 × 297 mm (common practice)
		t.Error("default sheet is not A4")
	}
	if text, ok := sheettest.Text(t, res.body); ok {
		pages := sheettest.Pages(res.body)
		want := []string{c.Name, "Lakeside Marathon", "Coeliac disease – gluten-free foods only", "Fainted once after a long run",
			"Recorded caution for " + c.Name, strings.Join(strings.Fields(fuel.Caution), " "), "version 1", "published",
			"page " + strconv.Itoa(pages) + " of " + strconv.Itoa(pages), "Day by day", "Findings"}
		load := firstDay(t, v1.Result, fuel.RoleLoad)
		want = append(want, strconv.FormatFloat(load.ChoGPerKg, 'f', 1, 64), strconv.FormatFloat(load.ChoG, 'f', 0, 64))
		for _, w := range want {
			if !strings.Contains(text, w) {
				t.Errorf("published sheet lacks %q\n%s", w, text)
			}
		}
		if n := strings.Count(text, "not medical advice"); n != pages {
			t.Errorf("safety caution on %d of %d pages", n, pages)
		}
		if strings.Contains(text, "DRAFT") {
			t.Error("published sheet is marked as a draft")
		}
	}

	// Letter on request; anything else refused in words.
	res = b.getPDF(base + "/sheet.pdf?paper=letter")
	res.mustPDFUpTo(t, 4)
	if !bytes.Contains(res.body, []byte("/MediaBox [0 0 612.00 792.00]")) { // US Letter, 8.5 × 11 in (common practice)
		t.Error("?paper=letter is not Letter")
	}
	res = b.getPDF(base + "/sheet.pdf?paper=a5")
	if res.status != http.StatusBadRequest || !strings.Contains(string(res.body), "A4 or Letter") {
		t.Errorf("?paper=a5: %d\n%.600s", res.status, res.body)
	}

	// Versions that do not exist, and plans of another client, are not found.
	for _, path := range []string{base + "/versions/9/sheet.pdf", base + "/versions/0/sheet.pdf", base + "/versions/x/sheet.pdf",
		"/clients/" + itoa64(c.ID) + "/plans/999999/sheet.pdf"} {
		if res := b.getPDF(path); res.status != http.StatusNotFound {
			t.Errorf("%s: status %d", path, res.status)
		}
	}
	other := a.newClient(unique("Other"))
	if res := b.getPDF("/clients/" + itoa64(other.ID) + "/plans/" + itoa64(pid) + "/sheet.pdf"); res.status != http.StatusNotFound {
		t.Errorf("plan under another client: status %d", res.status)
	}

	// Revise: the published sheet stays version 1 until version 2 is
	// published; the superseded version, printed by number, says so.
	b.post(base+"/revise", nil).mustRedirect(t, base+"/versions/2")
	if text, ok := sheettest.Text(t, b.getPDF(base+"/sheet.pdf").body); ok && !strings.Contains(text, "version 1") {
		t.Error("published sheet changed when a new draft was started")
	}
	v2 := latestVersion(t, a, pid)
	b.post(base+"/versions/2", url.Values{"revision": {strconv.Itoa(v2.Revision)}, "action": {"publish"}}).mustRedirect(t, base+"/versions/2")
	res = b.getPDF(base + "/versions/1/sheet.pdf")
	res.mustPDF(t)
	if text, ok := sheettest.Text(t, res.body); ok && !strings.Contains(text, sheet.SupersededMark) {
		t.Error("superseded version's sheet is not marked")
	}
}

func TestPlanSheetNeedsSignIn(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c, e := sheetClient(t, a)
	pid := createPlan(t, b, c.ID, planForm("loading", "58.5", "event_id", itoa64(e.ID)))
	for _, path := range []string{"/clients/" + itoa64(c.ID) + "/plans/" + itoa64(pid) + "/sheet.pdf",
		"/clients/" + itoa64(c.ID) + "/plans/" + itoa64(pid) + "/versions/1/sheet.pdf"} {
		res := a.browser().getPDF(path)
		if res.status != http.StatusSeeOther || !strings.HasPrefix(res.location, "/signin") {
			t.Errorf("anonymous %s: %d to %q", path, res.status, res.location)
		}
		if bytes.HasPrefix(res.body, []byte("%PDF")) {
			t.Errorf("anonymous %s got the sheet", path)
		}
	}
}

// The demo's published plans, one of each kind, print on one to three
// pages of A4 and of Letter. With LARDER_SHEET_OUT set, the PDFs are
// written there to be looked at.
func TestDemoPlanSheets(t *testing.T) {
	a := newApp(t)
	res := loadDemo(t, a)
	b, _ := a.signedIn(store.RoleDietitian)
	var clients []int64
	for _, id := range res.IDs.Clients {
		clients = append(clients, id)
	}
	rows, err := a.st.Pool.Query(context.Background(), `SELECT p.client_id, p.id, p.kind, v.result FROM plans p
		JOIN plan_versions v ON v.plan_id = p.id AND v.status = 'published'
		WHERE p.created_by IS NULL AND p.client_id = ANY($1) ORDER BY p.id`, clients)
	if err != nil {
		t.Fatal(err)
	}
	type demoPlan struct {
		client, plan int64
		kind         string
		result       []byte
	}
	var plans []demoPlan
	for rows.Next() {
		var p demoPlan
		if err := rows.Scan(&p.client, &p.plan, &p.kind, &p.result); err != nil {
			t.Fatal(err)
		}
		plans = append(plans, p)
	}
	if err := rows.Err(); err != nil {
		t.Fatal(err)
	}
	if len(plans) != 4 {
		t.Fatalf("demo has %d published plans, want one of each kind", len(plans))
	}
	for _, p := range plans {
		for _, paper := range []string{"a4", "letter"} {
			got := b.getPDF("/clients/" + itoa64(p.client) + "/plans/" + itoa64(p.plan) + "/sheet.pdf?paper=" + paper)
			got.mustPDF(t)
			if dir := os.Getenv("LARDER_SHEET_OUT"); dir != "" {
				_ = os.WriteFile(filepath.Join(dir, "demo-"+p.kind+"-"+paper+".pdf"), got.body, 0o644)
			}
			text, ok := sheettest.Text(t, got.body)
			if !ok {
				continue
			}
			var plan fuel.Plan
			if err := json.Unmarshal(p.result, &plan); err != nil {
				t.Fatal(err)
			}
			for _, d := range plan.Days {
				if w := dayWordsShort(d.Date) + " " + d.Role; !strings.Contains(text, w) || !strings.Contains(text, strconv.FormatFloat(d.ChoGPerKg, 'f', 1, 64)) {
					t.Errorf("demo %s sheet lacks day %s or its %.1f g/kg", p.kind, w, d.ChoGPerKg)
				}
			}
			if p.client == res.IDs.Clients["triathlete"] && !strings.Contains(text, "Recorded caution for") { // her diabetes
				t.Errorf("demo week plan's sheet lacks the client's recorded caution\n%s", text)
			}
		}
	}
}

// dayWordsShort is a plan date as the sheet's day table prints it: "Sat 10 Apr".
func dayWordsShort(date string) string {
	t, err := time.Parse(time.DateOnly, date)
	if err != nil {
		return date
	}
	return t.Format("Mon 2 Jan")
}

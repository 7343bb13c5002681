package server

import (
	"context"
	"io"
	"net/http"
	"net/url"
	"strings"
	"testing"

	"larder/internal/sheet/sheettest"
	"larder/internal/store"
)

// The dietitian writes notes to the athlete in the plan builder; they are
// kept with the version and reach the athlete's phone page and the
// athlete's sheet, which carry neither a recorded caution nor the
// dietitian's words and units. Staff can download both forms.
func TestNotesToTheAthleteAndTheAthletesSheet(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Maja Nowak-Trần"))
	c.Cautions = "Type 1 diabetes: changes agreed with her diabetes team"
	c.SharedNote = "Keep to gluten-free foods."
	if err := a.st.UpdateClient(context.Background(), store.System, &c); err != nil {
		t.Fatal(err)
	}
	p, plan := storePlan(t, a, c.ID, "Spring week", weekRequest("2027-03-01", 7), false, "")
	base := "/clients/" + itoa(c.ID) + "/plans/" + itoa(p.ID)
	edit := base + "/versions/1"
	today, tomorrow := plan.Days[0].Date, plan.Days[1].Date

	page := b.get(edit)
	page.mustContain(t, "Notes to the athlete", `name="note_plan"`, `name="note_day_`+today+`"`, `form="plan-edit"`)

	// Too long: refused beside its box, nothing saved, the words kept.
	long := strings.Repeat("Eat well. ", 160)
	res := b.post(edit, url.Values{"revision": {"1"}, "action": {"save"}, "note_plan": {long}, "note_day_" + today: {"Kept while refused."}})
	if res.status != http.StatusUnprocessableEntity {
		t.Fatalf("a note too long: status %d", res.status)
	}
	res.mustContain(t, `id="err-note_plan"`, "Keep the note to 1500 characters or fewer (it has 1599)", "Kept while refused.", "Eat well. Eat well.")

	b.post(edit, url.Values{"revision": {"1"}, "action": {"publish"},
		"note_plan":            {"Eat breakfast before your long runs.\nBring your own bottles."},
		"note_day_" + today:    {"Long run today: take a gel at 45 minutes."},
		"note_day_" + tomorrow: {"Easy day: keep the snacks small."},
	}).mustRedirect(t, edit)
	v, err := a.st.PublishedPlanVersion(context.Background(), p.ID)
	if err != nil || v.Notes.Plan != "Eat breakfast before your long runs.\nBring your own bottles." || v.Notes.Day(today) != "Long run today: take a gel at 45 minutes." {
		t.Fatalf("stored notes: %+v %v", v.Notes, err)
	}
	// Published: the notes are read only.
	page = b.get(edit)
	page.mustContain(t, "Notes to the athlete", "Long run today: take a gel at 45 minutes.", "athlete-sheet-link")
	if strings.Contains(page.body, `name="note_plan"`) {
		t.Error("a published version's notes can still be edited")
	}

	token := makeLink(t, b, c.ID, "phone")
	_, phone := getPublic(t, a, "/c/"+token)
	response{body: phone}.mustContain(t, "About this plan, from your dietitian", "Eat breakfast before your long runs.", "Bring your own bottles.",
		"Your dietitian about today", "Long run today: take a gel at 45 minutes.", "Your dietitian: Easy day: keep the snacks small.",
		"Keep to gluten-free foods.", "/c/"+token+"/sheet.pdf")
	if i := strings.Index(phone, "Today’s fuelling"); i < 0 || i > strings.Index(phone, "About this plan, from your dietitian") {
		t.Error("the phone page does not lead with today's fuelling")
	}

	resp, body := getPublic(t, a, "/c/"+token+"/sheet.pdf")
	if resp.StatusCode != http.StatusOK || resp.Header.Get("Content-Type") != "application/pdf" || resp.Header.Get("Cache-Control") != "no-store" {
		t.Fatalf("athlete's sheet from the link: %d %s %q", resp.StatusCode, resp.Header.Get("Content-Type"), resp.Header.Get("Cache-Control"))
	}
	text, ok := sheettest.Text(t, []byte(body))
	if !ok {
		t.Skip("pdftotext not installed")
	}
	first := strings.Fields(c.Name)[0]
	for _, w := range []string{"Your fuelling plan", "For " + first, "Keep to gluten-free foods.", "Eat breakfast before your long runs.",
		"Long run today: take a gel at 45 minutes.", "Easy day: keep the snacks small."} {
		if !strings.Contains(text, w) {
			t.Errorf("the athlete's sheet from the link lacks %q:\n%s", w, text)
		}
	}
	for _, w := range []string{"Type 1", "diabetes team", "kcal", "g/kg", "per kg", "mmol", "FFM", "Findings", "Checked against", "from memory", c.Name} {
		if strings.Contains(text, w) {
			t.Errorf("the athlete's sheet from the link says %q:\n%s", w, text)
		}
	}

	// Staff download both forms; the athlete's carries the full name here.
	athlete := staffPDF(t, b, base+"/sheet.pdf?form=athlete")
	if !strings.Contains(athlete, c.Name) || !strings.Contains(athlete, "Long run today") || strings.Contains(athlete, "Type 1") || strings.Contains(athlete, "Findings") {
		t.Errorf("the athlete's form downloaded by staff:\n%s", athlete)
	}
	staff := staffPDF(t, b, base+"/sheet.pdf")
	for _, w := range []string{"Plan sheet", "Type 1 diabetes", "Findings", "Notes to the athlete", "Long run today: take a gel at 45 minutes."} {
		if !strings.Contains(staff, w) {
			t.Errorf("the dietitian's form lacks %q:\n%s", w, staff)
		}
	}
	if res := b.get(base + "/sheet.pdf?form=client"); res.status != http.StatusBadRequest || !strings.Contains(res.body, "?form=athlete") {
		t.Errorf("an unknown form: %d", res.status)
	}
}

func staffPDF(t *testing.T, b *browser, path string) string {
	t.Helper()
	req, _ := http.NewRequest(http.MethodGet, b.a.srv.URL+path, nil)
	resp, err := b.c.Do(req)
	if err != nil {
		t.Fatal(err)
	}
	defer resp.Body.Close()
	pdf, _ := io.ReadAll(resp.Body)
	if resp.StatusCode != http.StatusOK || resp.Header.Get("Content-Type") != "application/pdf" {
		t.Fatalf("%s: %d %s", path, resp.StatusCode, resp.Header.Get("Content-Type"))
	}
	text, ok := sheettest.Text(t, pdf)
	if !ok {
		t.Skip("pdftotext not installed")
	}
	return text
}

package server

import (
	"context"
	"net/http"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"

	"larder/internal/demo"
	"larder/internal/fuel"
	"larder/internal/sheet/sheettest"
	"larder/internal/store"
)

func TestPrintStylesheetLinked(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	b.get("/clients").mustContain(t, `<link rel="stylesheet" href="/static/print.css" media="print">`)
	css := b.get("/static/print.css")
	if css.status != http.StatusOK {
		t.Fatalf("print.css: %d", css.status)
	}
	css.mustContain(t, "@media print", "header.site nav", "button")
}

// TestBrowserPrintsPlanPage prints the demo loading plan's page, published
// and as a draft, from headless Chromium with the print stylesheet, and
// checks the printout keeps the plan and leaves out navigation and buttons.
func TestBrowserPrintsPlanPage(t *testing.T) {
	ctx := browserCtx(t)
	a := newApp(t)
	res := loadDemo(t, a)
	var clientID, planID int64
	if err := a.st.Pool.QueryRow(context.Background(), `SELECT client_id, id FROM plans WHERE kind = 'loading' AND created_by IS NULL ORDER BY id LIMIT 1`).
		Scan(&clientID, &planID); err != nil {
		t.Fatal(err)
	}
	base := a.srv.URL + "/clients/" + itoa64(clientID) + "/plans/" + itoa64(planID)
	published, err := a.st.PublishedPlanVersion(context.Background(), planID)
	if err != nil {
		t.Fatal(err)
	}
	load := firstDay(t, published.Result, fuel.RoleLoad)

	err = chromedp.Do(ctx,
		chromedp.Navigate(a.srv.URL+"/signin"),
		chromedp.WaitVisible(chromedp.ID("f-email")),
		chromedp.SendKeys(chromedp.ID("f-email"), demo.Email),
		chromedp.SendKeys(chromedp.ID("f-password"), res.Password),
		chromedp.Submit(chromedp.ID("f-password")),
		chromedp.WaitVisible(chromedp.CSS(`nav[aria-label="Main"]`)),
		chromedp.Navigate(base),
		chromedp.WaitVisible(chromedp.ID("plan-days")),
	)
	if err != nil {
		t.Fatalf("sign in and open the plan: %v", err)
	}
	printed := func(name string) string {
		t.Helper()
		pdf, err := chromedp.Run(ctx, chromedp.PrintToPDF(chromedp.PDFPaper(chromedp.PaperA4)))
		if err != nil {
			t.Fatalf("print %s: %v", name, err)
		}
		if dir := os.Getenv("LARDER_SHEET_OUT"); dir != "" {
			_ = os.WriteFile(filepath.Join(dir, "print-"+name+".pdf"), pdf, 0o644)
		}
		text, ok := sheettest.Text(t, pdf)
		if !ok {
			t.Skip("pdftotext (poppler-utils) not installed")
		}
		return text
	}
	gkg := strconv.FormatFloat(load.ChoGPerKg, 'f', -1, 64)

	text := printed("published")
	for _, want := range []string{"Two-day carbohydrate loading", "Day by day", "not medical advice", gkg} {
		if !strings.Contains(text, want) {
			t.Errorf("printed plan page lacks %q\n%s", want, text)
		}
	}
	for _, gone := range []string{"Sign out", "Start a new version", "Clients"} {
		if strings.Contains(text, gone) {
			t.Errorf("printed plan page shows %q (navigation or a button)\n%s", gone, text)
		}
	}

	// A draft: its override inputs print their values, without buttons.
	err = chromedp.Do(ctx,
		chromedp.Click(chromedp.Search(`//button[contains(., "Start a new version")]`)),
		chromedp.WaitVisible(chromedp.ID("plan-edit")),
	)
	if err != nil {
		t.Fatalf("start a draft: %v", err)
	}
	text = printed("draft")
	for _, want := range []string{"Day by day", "not medical advice", "draft"} {
		if !strings.Contains(text, want) {
			t.Errorf("printed draft lacks %q\n%s", want, text)
		}
	}
	for _, gone := range []string{"Save draft and recheck", "Publish this version", "Discard this draft", "Sign out"} {
		if strings.Contains(text, gone) {
			t.Errorf("printed draft shows the button %q\n%s", gone, text)
		}
	}
}

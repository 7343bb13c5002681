package server

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"
)

// TestBrowserImportCSV uploads a CSV with one bad line, reads the preview
// (the bad line named by number), confirms, and finds exactly the good
// rows saved.
func TestBrowserImportCSV(t *testing.T) {
	ctx := browserCtx(t)
	a := newApp(t)
	u := a.user("dietitian", false)
	c := a.newClient(unique("Browser Import"))
	file := filepath.Join(t.TempDir(), "body-mass.csv")
	csv := "date;body mass;method\n2026-02-01;61,2;scale\n2026-02-08;6x,0;scale\n2026-02-15;60,8;scale\n"
	if err := os.WriteFile(file, []byte(csv), 0o644); err != nil {
		t.Fatal(err)
	}
	err := chromedp.Do(ctx,
		chromedp.Navigate(a.srv.URL+"/signin"),
		chromedp.WaitVisible(chromedp.ID("f-email")),
		chromedp.SendKeys(chromedp.ID("f-email"), u.Email),
		chromedp.SendKeys(chromedp.ID("f-password"), testPassword),
		chromedp.Submit(chromedp.ID("f-password")),
		chromedp.WaitVisible(chromedp.CSS(`nav[aria-label="Main"]`)),
		chromedp.Navigate(a.srv.URL+"/clients/"+itoa(c.ID)),
		chromedp.Click(chromedp.Search(`//a[contains(., "Import from files")]`)),
		chromedp.WaitVisible(chromedp.ID("f-csv")),
		chromedp.SetValue(chromedp.ID("f-kind"), "body_mass"),
		chromedp.SetUploadFiles(chromedp.ID("f-csv"), []string{file}),
		chromedp.Click(chromedp.Search(`//button[contains(., "Preview the import")]`)),
		chromedp.WaitVisible(chromedp.ID("preview-errors")),
	)
	if err != nil {
		t.Fatalf("upload: %v", err)
	}
	shot(t, ctx, "import-preview")
	errs := text(t, ctx, "#preview-errors tbody")
	if !strings.Contains(errs, "3") || !strings.Contains(errs, "body mass") || !strings.Contains(errs, `"6x,0"`) {
		t.Errorf("error table = %q; want line 3, column body mass and the value", errs)
	}
	if add := text(t, ctx, "#count-add"); !strings.HasPrefix(add, "2") {
		t.Errorf("to add = %q", add)
	}
	if n := a.count(`SELECT count(*) FROM body_mass WHERE client_id = $1`, c.ID); n != 0 {
		t.Fatalf("preview saved %d rows", n)
	}
	err = chromedp.Do(ctx,
		chromedp.Click(chromedp.CSS(`#confirm button`)),
		chromedp.WaitVisible(chromedp.CSS(`p.flash`)),
	)
	if err != nil {
		t.Fatalf("confirm: %v", err)
	}
	if flash := text(t, ctx, "p.flash"); !strings.Contains(flash, "Imported 2 body-mass measurements") || !strings.Contains(flash, "1 rows with errors") {
		t.Errorf("flash = %q", flash)
	}
	if n := a.count(`SELECT count(*) FROM body_mass WHERE client_id = $1 AND measured_on IN ('2026-02-01', '2026-02-15') AND mass_kg IN (61.2, 60.8)`, c.ID); n != 2 {
		t.Errorf("good rows saved: %d, want 2", n)
	}
	if n := a.count(`SELECT count(*) FROM body_mass WHERE client_id = $1`, c.ID); n != 2 {
		t.Errorf("rows saved: %d, want exactly 2", n)
	}
}

// TestBrowserImportPreviewPounds reads the preview of a body-mass file for a
// client weighed in pounds: the rows, and the refused one's range, in lb.
func TestBrowserImportPreviewPounds(t *testing.T) {
	ctx := browserCtx(t)
	a := newApp(t)
	u := a.user("dietitian", false)
	c := a.newClient(unique("Browser Pounds"))
	if _, err := a.st.Pool.Exec(context.Background(), `UPDATE clients SET mass_unit = 'lb' WHERE id = $1`, c.ID); err != nil {
		t.Fatal(err)
	}
	file := filepath.Join(t.TempDir(), "body-mass.csv")
	csv := "date,body mass,method\n2026-02-01,134.9,scale\n2026-02-08,61.2 kg,scale\n2026-02-15,12,scale\n"
	if err := os.WriteFile(file, []byte(csv), 0o644); err != nil {
		t.Fatal(err)
	}
	err := chromedp.Do(ctx,
		chromedp.Navigate(a.srv.URL+"/signin"),
		chromedp.WaitVisible(chromedp.ID("f-email")),
		chromedp.SendKeys(chromedp.ID("f-email"), u.Email),
		chromedp.SendKeys(chromedp.ID("f-password"), testPassword),
		chromedp.Submit(chromedp.ID("f-password")),
		chromedp.WaitVisible(chromedp.CSS(`nav[aria-label="Main"]`)),
		chromedp.Navigate(a.srv.URL+"/clients/"+itoa(c.ID)+"/import"),
		chromedp.WaitVisible(chromedp.ID("f-csv")),
		chromedp.SetValue(chromedp.ID("f-kind"), "body_mass"),
		chromedp.SetUploadFiles(chromedp.ID("f-csv"), []string{file}),
		chromedp.Click(chromedp.Search(`//button[contains(., "Preview the import")]`)),
		chromedp.WaitVisible(chromedp.ID("preview-add")),
	)
	if err != nil {
		t.Fatalf("upload: %v", err)
	}
	shot(t, ctx, "import-preview-lb")
	// 61.2 kg = 134.9 lb (61.2 / 0.45359237 = 134.92).
	add := text(t, ctx, "#preview-add tbody")
	for _, want := range []string{"2026-02-01 · 134.9 lb · scale", "2026-02-08 · 134.9 lb (written as 61.2 kg) · scale"} {
		if !strings.Contains(add, want) {
			t.Errorf("rows to add = %q; want %q", add, want)
		}
	}
	if strings.Contains(add, "61.19 kg") {
		t.Errorf("rows to add in kg: %q", add)
	}
	if errs := text(t, ctx, "#preview-errors tbody"); !strings.Contains(errs, "44.1 to 661.3 lb") {
		t.Errorf("error table = %q; want the range in lb", errs)
	}
}

package server

import (
	"testing"

	"github.com/chromedp/chromedp"

	"larder/internal/demo"
)

// On a phone-wide screen the Clients list scrolls inside its table instead of
// widening the whole page past the screen.
func TestBrowserClientsListFitsAPhone(t *testing.T) {
	ctx := browserCtx(t)
	a := newApp(t)
	res := loadDemo(t, a)
	err := chromedp.Do(ctx,
		chromedp.EmulateViewport(390, 900),
		chromedp.Navigate(a.srv.URL+"/signin"),
		chromedp.WaitVisible(chromedp.ID("f-email")),
		chromedp.SendKeys(chromedp.ID("f-email"), demo.Email),
		chromedp.SendKeys(chromedp.ID("f-password"), res.Password),
		chromedp.Submit(chromedp.ID("f-password")),
		chromedp.WaitVisible(chromedp.CSS("details.navmenu > summary")),
		chromedp.Navigate(a.srv.URL+"/clients"),
		chromedp.WaitVisible(chromedp.CSS(`table.data`)),
	)
	if err != nil {
		t.Fatalf("sign in and open Clients: %v", err)
	}
	shot(t, ctx, "clients-phone")
	page, err := chromedp.Run(ctx, chromedp.Evaluate[float64](`document.documentElement.scrollWidth`))
	if err != nil {
		t.Fatal(err)
	}
	table, err := chromedp.Run(ctx, chromedp.Evaluate[float64](`document.querySelector("table.data").scrollWidth`))
	if err != nil {
		t.Fatal(err)
	}
	// The table's own content is wider than the screen (eight columns), so
	// the check below is about where that width goes.
	if table <= 390 {
		t.Fatalf("table content only %v px wide; the check would prove nothing", table)
	}
	if page > 400 {
		t.Errorf("page is %v px wide on a 390 px screen", page)
	}
}

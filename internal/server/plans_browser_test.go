package server

import (
	"testing"

	"github.com/chromedp/chromedp"

	"larder/internal/demo"
	"larder/internal/fuel"
	"larder/internal/store"
)

// TestBrowserRefusedValueKeepsDayTableOnPage types letters into a load
// day's g/kg box and saves: the message stands under the box, and the day
// table still fits the page, so the figures to its right stay in view.
func TestBrowserRefusedValueKeepsDayTableOnPage(t *testing.T) {
	ctx := browserCtx(t)
	a := newApp(t)
	res := loadDemo(t, a)
	b, _ := a.signedIn(store.RoleDietitian)
	marathoner := res.IDs.Clients["marathoner"]
	id := createPlan(t, b, marathoner, planForm("loading", "58", "event_id", itoa64(res.IDs.Events["marathon"])))
	v := latestVersion(t, a, id)
	load := firstDay(t, v.Result, fuel.RoleLoad)
	planURL := a.srv.URL + "/clients/" + itoa64(marathoner) + "/plans/" + itoa64(id)

	err := chromedp.Do(ctx,
		chromedp.EmulateViewport(1280, 900),
		chromedp.Navigate(a.srv.URL+"/signin"),
		chromedp.WaitVisible(chromedp.ID("f-email")),
		chromedp.SendKeys(chromedp.ID("f-email"), demo.Email),
		chromedp.SendKeys(chromedp.ID("f-password"), res.Password),
		chromedp.Submit(chromedp.ID("f-password")),
		chromedp.WaitVisible(chromedp.CSS(`nav[aria-label="Main"]`)),
		chromedp.Navigate(planURL),
		chromedp.WaitVisible(chromedp.ID("f-gkg_"+load.Date)),
		chromedp.SendKeys(chromedp.ID("f-gkg_"+load.Date), "abc"),
		chromedp.Click(chromedp.CSS(`button[value="save"]`)),
		chromedp.WaitVisible(chromedp.ID("err-gkg_"+load.Date)),
	)
	if err != nil {
		t.Fatalf("save a refused g/kg: %v", err)
	}
	overflow, err := chromedp.Run(ctx, chromedp.Evaluate[float64](
		`document.getElementById("plan-days").getBoundingClientRect().right - document.querySelector("main").getBoundingClientRect().right`))
	if err != nil {
		t.Fatal(err)
	}
	if overflow > 1 {
		t.Errorf("the day table sticks out %.0f px past the page's edge after a refused value", overflow)
	}
	if got := text(t, ctx, chromedp.CSS("#err-gkg_"+load.Date)); got == "" {
		t.Errorf("no message beside the refused g/kg")
	}
	if vs, _ := a.st.PlanVersions(t.Context(), id); len(vs) != 1 || vs[0].Revision != v.Revision {
		t.Errorf("a refused save changed the draft")
	}
	// On a 1024 px screen the column heads wrap and the table still fits.
	err = chromedp.Do(ctx, chromedp.EmulateViewport(1024, 800), chromedp.Navigate(planURL), chromedp.WaitVisible(chromedp.ID("plan-days")))
	if err != nil {
		t.Fatal(err)
	}
	narrow, err := chromedp.Run(ctx, chromedp.Evaluate[float64](
		`document.getElementById("plan-days").getBoundingClientRect().right - document.querySelector("main").getBoundingClientRect().right`))
	if err != nil {
		t.Fatal(err)
	}
	if narrow > 1 {
		t.Errorf("on a 1024 px screen the day table sticks out %.0f px past the page's edge", narrow)
	}
}

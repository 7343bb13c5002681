package server

import (
	"context"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"larder/internal/demo"
)

const chromiumPath = "/usr/bin/chromium"

// browserCtx starts headless Chromium, or skips the test when it is not
// installed — unless LARDER_TEST_REQUIRE_BROWSER=1 (CI), where that fails.
func browserCtx(t *testing.T) context.Context {
	t.Helper()
	return browserCtxFor(t, 90*time.Second)
}

// browserCtxFor is browserCtx with a time limit of the test's choosing, for
// tests that visit many pages.
func browserCtxFor(t *testing.T, limit time.Duration) context.Context {
	t.Helper()
	if _, err := exec.LookPath(chromiumPath); err != nil {
		if os.Getenv("LARDER_TEST_REQUIRE_BROWSER") == "1" {
			t.Fatalf("Chromium is required (LARDER_TEST_REQUIRE_BROWSER=1) but %s is missing: %v", chromiumPath, err)
		}
		t.Skipf("Chromium not installed at %s; set LARDER_TEST_REQUIRE_BROWSER=1 to make this a failure", chromiumPath)
	}
	opts := append(chromedp.DefaultExecAllocatorOptions[:],
		chromedp.ExecPath(chromiumPath),
		chromedp.Flag("headless", true),
		chromedp.NoSandbox,
		chromedp.DisableGPU,
		chromedp.Flag("disable-background-networking", true),
		chromedp.WindowSize(1280, 1000),
	)
	actx, cancelAlloc := chromedp.NewExecAllocator(context.Background(), opts...)
	ctx, cancelCtx := chromedp.NewContext(actx)
	ctx, cancelTimeout := context.WithTimeout(ctx, limit)
	t.Cleanup(func() { cancelTimeout(); cancelCtx(); cancelAlloc() })
	return ctx
}

// shot saves screenshots of the page, one per screenful from the top, when
// LARDER_SCREENSHOTS names a folder, so a person can look at the pages as a
// user sees them.
func shot(t *testing.T, ctx context.Context, name string) {
	dir := os.Getenv("LARDER_SCREENSHOTS")
	if dir == "" {
		return
	}
	height, err := chromedp.Run(ctx, chromedp.Evaluate[float64](`document.documentElement.scrollHeight`))
	if err != nil {
		t.Logf("screenshot %s: %v", name, err)
		return
	}
	for i, y := 0, 0.0; y < height && i < 6; i, y = i+1, y+950 {
		if _, err := chromedp.Run(ctx, chromedp.Evaluate[any](fmt.Sprintf("window.scrollTo(0, %f)", y))); err != nil {
			t.Logf("screenshot %s: %v", name, err)
			return
		}
		buf, err := chromedp.Run(ctx, chromedp.CaptureScreenshot())
		if err != nil {
			t.Logf("screenshot %s: %v", name, err)
			return
		}
		if err := os.WriteFile(filepath.Join(dir, fmt.Sprintf("%s-%d.png", name, i)), buf, 0o644); err != nil {
			t.Logf("screenshot %s: %v", name, err)
		}
	}
	_, _ = chromedp.Run(ctx, chromedp.Evaluate[any]("window.scrollTo(0, 0)"))
}

func text(t *testing.T, ctx context.Context, sel chromedp.CSS) string {
	t.Helper()
	s, err := chromedp.Run(ctx, chromedp.Text(sel))
	if err != nil {
		t.Fatalf("text of %s: %v", sel, err)
	}
	return s
}

// TestBrowserLoadingPlan signs in to the demo practice, opens the demo
// marathoner, builds a two-day loading plan for her marathon, overrides one
// load day, publishes, and checks the table and a finding on the page.
func TestBrowserLoadingPlan(t *testing.T) {
	ctx := browserCtx(t)
	a := newApp(t)
	res := loadDemo(t, a)
	clientURL := a.srv.URL + "/clients/" + itoa64(res.IDs.Clients["marathoner"])

	err := chromedp.Do(ctx,
		chromedp.Navigate(a.srv.URL+"/signin"),
		chromedp.WaitVisible(chromedp.ID("f-email")),
		chromedp.SendKeys(chromedp.ID("f-email"), demo.Email),
		chromedp.SendKeys(chromedp.ID("f-password"), res.Password),
		chromedp.Submit(chromedp.ID("f-password")),
		chromedp.WaitVisible(chromedp.CSS(`nav[aria-label="Main"]`)),
		chromedp.Navigate(clientURL),
		chromedp.WaitVisible(chromedp.ID("plans")),
	)
	if err != nil {
		t.Fatalf("sign in and open the client: %v", err)
	}
	shot(t, ctx, "01-client")
	err = chromedp.Do(ctx,
		chromedp.Click(chromedp.Search(`//a[contains(., "Loading plan for Fjordby Spring Marathon")]`)),
		chromedp.WaitVisible(chromedp.ID("plan-start")),
	)
	if err != nil {
		t.Fatalf("open the new-plan form: %v", err)
	}
	shot(t, ctx, "02-new-plan")
	err = chromedp.Do(ctx,
		chromedp.SetValue(chromedp.ID("f-protocol"), "two-day"),
		chromedp.Click(chromedp.Search(`//button[contains(., "Compute the plan")]`)),
		chromedp.WaitVisible(chromedp.ID("plan-days")),
	)
	if err != nil {
		t.Fatalf("compute the plan: %v", err)
	}
	if h := text(t, ctx, "h1"); !strings.Contains(h, "Two-day carbohydrate loading for Fjordby Spring Marathon") {
		t.Fatalf("plan heading = %q", h)
	}
	shot(t, ctx, "03-plan-draft")

	// Override the first load day: 12.5 g/kg is above the 10–12 g/kg band
	// for carbohydrate loading (ACSM/AND/DC 2016), so the check must flag it.
	attr, err := chromedp.Run(ctx, chromedp.AttributeValue(chromedp.CSS(`tr.day[data-role="load"]`), "data-date"))
	if err != nil || attr.Value == "" {
		t.Fatalf("no load day in the table: %v", err)
	}
	loadDate := attr.Value
	err = chromedp.Do(ctx,
		chromedp.SendKeys(chromedp.ID("f-gkg_"+loadDate), "12.5"),
		chromedp.Click(chromedp.CSS(`button[value="save"]`)),
		// The saved page marks the day as overridden.
		chromedp.WaitVisible(chromedp.CSS(`tr.day[data-date="`+loadDate+`"] .override`)),
	)
	if err != nil {
		t.Fatalf("override the load day: %v", err)
	}
	row := text(t, ctx, chromedp.CSS(`tr.day[data-date="`+loadDate+`"]`))
	finding := text(t, ctx, chromedp.CSS(`tr.day-findings[data-date="`+loadDate+`"] li.level-outside`))
	if !strings.Contains(strings.ToLower(row), "override") {
		t.Errorf("overridden day's row does not say override: %q", row)
	}
	if !strings.Contains(finding, "12.5") || !strings.Contains(finding, "Outside guideline") {
		t.Errorf("overridden day's finding = %q; want an outside-guideline finding naming 12.5", finding)
	}
	shot(t, ctx, "04-plan-override")

	err = chromedp.Do(ctx,
		chromedp.Click(chromedp.CSS(`button[value="publish"]`)),
		chromedp.WaitVisible(chromedp.CSS(`h1 .status.published`)),
	)
	if err != nil {
		t.Fatalf("publish: %v", err)
	}
	if status := text(t, ctx, "h1 .status"); status != "published" {
		t.Errorf("status after publishing = %q", status)
	}
	table := text(t, ctx, "#plan-days")
	for _, want := range []string{"CARBOHYDRATE G/KG", "load", "event", "12.5", "override"} {
		if !strings.Contains(strings.ToUpper(table), strings.ToUpper(want)) {
			t.Errorf("published table lacks %q", want)
		}
	}
	if safety := text(t, ctx, "#safety"); !strings.Contains(safety, "not medical advice") {
		t.Errorf("safety caution missing on the published plan: %q", safety)
	}
	shot(t, ctx, "05-plan-published")
}

package server

import (
	"encoding/base64"
	"strconv"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"

	"larder/internal/demo"
	"larder/internal/menu"
	"larder/internal/sheet/sheettest"
)

// TestBrowserSwapFoodSeenOnSheet: in Chromium, a dietitian opens a draft
// loading plan, follows a feed's "Change food" link, swaps the suggested
// food for 80 g of boiled white rice and adds a free line,
// saves, sees the choice in the feed's row, and then finds it in the plan
// sheet's text (the PDF fetched in the same signed-in session).
func TestBrowserSwapFoodSeenOnSheet(t *testing.T) {
	ctx := browserCtx(t)
	a := newApp(t)
	res := loadDemo(t, a)
	b := a.browser()
	b.post("/signin", map[string][]string{"email": {demo.Email}, "password": {res.Password}}).mustRedirect(t, "/")
	cid, pid := loadingPlan(t, a, b)
	v := latestVersion(t, a, pid)
	day := v.Result.Days[1]
	key := menu.FeedKey("day", day.Date, 1)
	rice := foodID(t, a, "A015")
	planURL := a.srv.URL + "/clients/" + itoa64(cid) + "/plans/" + itoa64(pid) + "/versions/1"
	row := `tr[data-feed="` + key + `"]`

	err := chromedp.Do(ctx,
		chromedp.Navigate(a.srv.URL+"/signin"),
		chromedp.WaitVisible(chromedp.ID("f-email")),
		chromedp.SendKeys(chromedp.ID("f-email"), demo.Email),
		chromedp.SendKeys(chromedp.ID("f-password"), res.Password),
		chromedp.Submit(chromedp.ID("f-password")),
		chromedp.WaitVisible(chromedp.CSS(`nav[aria-label="Main"]`)),
		chromedp.Navigate(planURL),
		chromedp.WaitVisible(chromedp.CSS(row)),
		chromedp.Click(chromedp.CSS(row+` a.feed-food`)),
		chromedp.WaitVisible(chromedp.ID("feed-food")),
	)
	if err != nil {
		t.Fatalf("open the feed's food page: %v", err)
	}
	shot(t, ctx, "feed-food")
	// The suggestion's foods fill the first lines: keep one line, rice.
	set := `(() => { const v = {food_0: ` + strconv.Quote(strconv.FormatInt(rice, 10)) + `, grams_0: '', food_1: '', grams_1: '', food_2: '', grams_2: '', food_3: '', grams_3: ''};
		for (const [k, x] of Object.entries(v)) document.getElementById('f-' + k).value = x; return true })()`
	if _, err := chromedp.Run(ctx, chromedp.Evaluate[bool](set)); err != nil {
		t.Fatalf("set the lines: %v", err)
	}
	err = chromedp.Do(ctx,
		chromedp.SendKeys(chromedp.ID("f-grams_0"), "80"),
		chromedp.SendKeys(chromedp.ID("f-free_0"), "banana and a rice cake"),
		chromedp.SendKeys(chromedp.ID("f-freecho_0"), "35"),
		chromedp.Click(chromedp.CSS(`button[value="save"]`)),
		chromedp.WaitVisible(chromedp.ID("plan-edit")),
	)
	if err != nil {
		t.Fatalf("swap the food and save: %v", err)
	}
	shot(t, ctx, "feed-food-saved")
	want := "Dietitian’s choice: White rice, boiled: 80 g cooked; banana and a rice cake (35 g carbohydrate)"
	if got := text(t, ctx, chromedp.CSS(row)); !strings.Contains(got, want) {
		t.Fatalf("the feed's row shows %q, want %q", got, want)
	}

	js := `fetch(` + strconv.Quote(planURL+"/sheet.pdf") + `).then(r => r.arrayBuffer()).then(buf => {
		let s = ''; const b = new Uint8Array(buf); for (let i = 0; i < b.length; i++) s += String.fromCharCode(b[i]); return btoa(s) })`
	b64, err := chromedp.Run(ctx, chromedp.Evaluate[string](js, chromedp.EvalAwaitPromise))
	if err != nil {
		t.Fatalf("fetch the sheet: %v", err)
	}
	pdf, err := base64.StdEncoding.DecodeString(b64)
	if err != nil || !strings.HasPrefix(string(pdf), "%PDF") {
		t.Fatalf("the sheet is not a PDF (%v): %.40q", err, pdf)
	}
	sheet, ok := sheettest.Text(t, pdf)
	if !ok {
		t.Skip("pdftotext (poppler-utils) not installed")
	}
	flat := strings.Join(strings.Fields(sheet), " ")
	for _, part := range []string{"Dietitian’s choice: White rice, boiled: 80 g cooked", "banana and a rice cake (35 g carbohydrate)"} {
		if !strings.Contains(flat, part) {
			t.Errorf("the sheet lacks %q:\n%s", part, sheet)
		}
	}
}

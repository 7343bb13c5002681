package server

import (
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"

	"larder/internal/demo"
	"larder/internal/fuel"
)

// TestBrowserStageRacePlan builds a race-day plan for the demo cyclist's
// stage race in the browser and reads each stage's in-stage g/h on the
// page against the plan the engine stored.
func TestBrowserStageRacePlan(t *testing.T) {
	ctx := browserCtx(t)
	a := newApp(t)
	res := loadDemo(t, a)
	cyclist := res.IDs.Clients["cyclist"]

	err := chromedp.Do(ctx,
		chromedp.EmulateViewport(1280, 900),
		chromedp.Navigate(a.srv.URL+"/signin"),
		chromedp.WaitVisible(chromedp.ID("f-email")),
		chromedp.SendKeys(chromedp.ID("f-email"), demo.Email),
		chromedp.SendKeys(chromedp.ID("f-password"), res.Password),
		chromedp.Submit(chromedp.ID("f-password")),
		chromedp.WaitVisible(chromedp.CSS(`nav[aria-label="Main"]`)),
		chromedp.Navigate(a.srv.URL+"/clients/"+itoa64(cyclist)+"/plans/new?kind=race&event="+itoa64(res.IDs.Events["stage-race"])),
		chromedp.WaitVisible(chromedp.ID("plan-start")),
		chromedp.Click(chromedp.Search(`//button[contains(., "Compute the plan")]`)),
		chromedp.WaitVisible(chromedp.ID("stages")),
	)
	if err != nil {
		t.Fatalf("compute the stage-race plan: %v", err)
	}
	shot(t, ctx, "stage-race-plan")
	var planID int64
	if err := a.st.Pool.QueryRow(t.Context(), `SELECT max(id) FROM plans WHERE client_id = $1 AND kind = 'race'`, cyclist).Scan(&planID); err != nil {
		t.Fatal(err)
	}
	v := latestVersion(t, a, planID)
	stages := v.Result.Stages
	if len(stages) != 4 {
		t.Fatalf("stored plan has %d stages, want the demo race's 4", len(stages))
	}
	for i, st := range stages {
		// The page shows the computed in-stage g/h as the input's placeholder.
		sel := `#f-stagegph_` + itoa64(int64(i))
		attr, err := chromedp.Run(ctx, chromedp.AttributeValue(chromedp.CSS(sel), "placeholder"))
		if err != nil {
			t.Fatalf("stage %d input: %v", i+1, err)
		}
		want := trimNum(st.DuringEvent.ChoGPerH)
		if attr.Value != want {
			t.Errorf("stage %d shows %q g/h, the plan has %s", i+1, attr.Value, want)
		}
		// ACSM/AND/DC 2016; Jeukendrup 2014: none under 45 min, 30–60 g/h to
		// 2.5 h, up to 90 g/h beyond.
		lo, hi := 0.0, 90.0
		switch {
		case st.DurationMin <= 45:
			hi = 0
		case st.DurationMin <= 150:
			lo, hi = 30, 60
		}
		if g := st.DuringEvent.ChoGPerH; g < lo || g > hi {
			t.Errorf("stage %d (%g min): %g g/h outside %g–%g", i+1, st.DurationMin, g, lo, hi)
		}
	}
	row := text(t, ctx, chromedp.CSS(`tr[data-stage="3"]`))
	if !strings.Contains(row, "speedy refuelling") {
		t.Errorf("the morning time trial's row does not name the speedy refuelling before the afternoon stage: %q", row)
	}
	// A dietitian's in-stage override is kept, marked and stored.
	err = chromedp.Do(ctx,
		chromedp.SendKeys(chromedp.ID("f-stagegph_1"), "75"),
		chromedp.Click(chromedp.CSS(`button[value="save"]`)),
		chromedp.WaitVisible(chromedp.CSS(`tr[data-stage="2"] .override`)),
	)
	if err != nil {
		t.Fatalf("override stage 2: %v", err)
	}
	v = latestVersion(t, a, planID)
	if de := v.Result.Stages[1].DuringEvent; !de.Overridden || de.ChoGPerH != 75 {
		t.Errorf("stage 2 after the override: %+v", de)
	}
	if v.Result.Kind != fuel.KindRace {
		t.Errorf("kind %q", v.Result.Kind)
	}
	shot(t, ctx, "stage-race-override")
}

// trimNum writes a g/h as the page does (whole grams).
func trimNum(x float64) string { return strconv.FormatFloat(math.Round(x), 'f', -1, 64) }

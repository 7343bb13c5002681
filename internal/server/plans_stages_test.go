package server

import (
	"context"
	"math"
	"net/http"
	"net/url"
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"larder/internal/fuel"
	"larder/internal/store"
)

// stageFindings are the findings of stage i (0-based) with the code.
func stageFindings(p fuel.Plan, i int, code string) []fuel.Finding {
	var out []fuel.Finding
	for _, f := range p.Findings {
		if f.Subject == "stage:"+strconv.Itoa(i) && f.Code == code {
			out = append(out, f)
		}
	}
	return out
}

// A dietitian's in-stage g/h is set for one stage, checked like any other
// in-event figure (over 60 g/h: multiple transportable carbohydrates;
// over 90 g/h: outside), and kept into the next version.
func TestStageOverridesPerStage(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	f, err := os.Open(filepath.Join("..", "..", "testdata", "fuel", "stage-race-4-day.json"))
	if err != nil {
		t.Fatal(err)
	}
	req, err := fuel.DecodeRequest(f)
	f.Close()
	if err != nil {
		t.Fatal(err)
	}
	req.StageOverrides = nil
	plan, err := fuel.Compute(req)
	if err != nil {
		t.Fatal(err)
	}
	c := a.newClient(unique("Stage Rider"))
	content := store.PlanContent{Request: req, Result: plan, BodyMassKg: req.Athlete.BodyMassKg}
	p := store.Plan{ClientID: c.ID, Kind: fuel.KindRace, Title: "Stage race"}
	v, err := a.st.CreatePlan(context.Background(), store.System, &p, content)
	if err != nil {
		t.Fatal(err)
	}
	base := "/clients/" + itoa64(c.ID) + "/plans/" + itoa64(p.ID)
	editURL := base + "/versions/1"

	// 95 g/h in stage 2 (290 min): above the up-to-90 g/h of events over
	// 2.5 h (ACSM/AND/DC 2016; Jeukendrup 2014), so outside, with the note
	// on multiple transportable carbohydrates (over 60 g/h, same sources).
	b.post(editURL, url.Values{"revision": {strconv.Itoa(v.Revision)}, "action": {"save"}, stageGPHName(1): {"95"}}).mustRedirect(t, editURL)
	v2 := latestVersion(t, a, p.ID)
	if len(v2.Request.StageOverrides) != 1 || v2.Request.StageOverrides[0] != (fuel.StageOverride{Stage: 1, ChoGPerH: 95}) {
		t.Fatalf("stored overrides: %+v", v2.Request.StageOverrides)
	}
	for i, st := range v2.Result.Stages {
		if (i == 1) != st.DuringEvent.Overridden {
			t.Errorf("stage %d overridden: %t", i+1, st.DuringEvent.Overridden)
		}
	}
	// grams = g/h × hours: 95 × 290/60 ≈ 459 g.
	if de := v2.Result.Stages[1].DuringEvent; de.ChoGPerH != 95 || math.Abs(de.TotalChoG-95*290/60.0) > 1 {
		t.Errorf("stage 2: %+v", de)
	}
	if fs := stageFindings(v2.Result, 1, "stage-during"); len(fs) != 1 || fs[0].Level != fuel.LevelOutside {
		t.Errorf("stage 2 at 95 g/h: %+v", fs)
	}
	if fs := stageFindings(v2.Result, 1, "multiple-transportable"); len(fs) != 1 {
		t.Errorf("stage 2 at 95 g/h lacks the multiple-transportable note: %+v", v2.Result.Findings)
	}
	if fs := stageFindings(v2.Result, 0, "stage-during"); len(fs) != 1 || fs[0].Level != fuel.LevelOK {
		t.Errorf("stage 1, not overridden: %+v", fs)
	}
	b.get(editURL).mustContain(t, `name="`+stageGPHName(1)+`" id="f-`+stageGPHName(1)+`" value="95"`)

	// A bad value is refused beside its input, kept as typed.
	res := b.post(editURL, url.Values{"revision": {strconv.Itoa(v2.Revision)}, "action": {"save"}, stageGPHName(1): {"95"}, stageGPHName(3): {"lots"}})
	if res.status != http.StatusUnprocessableEntity {
		t.Fatalf("bad stage override: status %d", res.status)
	}
	res.mustContain(t, "In-stage carbohydrate of stage 4 must be a number from 0 to 150 g/h.", `value="lots"`)

	// 75 g/h: inside, the note stays; published, then revised: the new
	// version keeps the stage's override.
	b.post(editURL, url.Values{"revision": {strconv.Itoa(v2.Revision)}, "action": {"publish"}, stageGPHName(1): {"75"}}).mustRedirect(t, editURL)
	b.post(base+"/revise", nil).mustRedirect(t, base+"/versions/2")
	nv := latestVersion(t, a, p.ID)
	if nv.Version != 2 || len(nv.Request.StageOverrides) != 1 || nv.Request.StageOverrides[0].ChoGPerH != 75 {
		t.Fatalf("version 2 overrides: %+v", nv.Request.StageOverrides)
	}
	if de := nv.Result.Stages[1].DuringEvent; !de.Overridden || de.ChoGPerH != 75 {
		t.Errorf("version 2, stage 2: %+v", de)
	}
	if fs := stageFindings(nv.Result, 1, "stage-during"); len(fs) != 1 || fs[0].Level != fuel.LevelOK {
		t.Errorf("stage 2 at 75 g/h: %+v", fs)
	}
	if fs := stageFindings(nv.Result, 1, "multiple-transportable"); len(fs) != 1 {
		t.Error("stage 2 at 75 g/h lacks the multiple-transportable note")
	}
	page := b.get(base + "/versions/2")
	page.mustContain(t, `value="75"`)
	// Saving version 2 with the form as shown (the override in its box)
	// and another change keeps the stage's override.
	b.post(base+"/versions/2", url.Values{"revision": {strconv.Itoa(nv.Revision)}, "action": {"save"}, stageGPHName(1): {"75"}, stageGPHName(3): {"50"}}).mustRedirect(t, base+"/versions/2")
	v3 := latestVersion(t, a, p.ID)
	if got := v3.Result.Stages; got[1].DuringEvent.ChoGPerH != 75 || !got[1].DuringEvent.Overridden || got[3].DuringEvent.ChoGPerH != 50 || !got[3].DuringEvent.Overridden {
		t.Errorf("after a second override: stage 2 %+v, stage 4 %+v", got[1].DuringEvent, got[3].DuringEvent)
	}
}

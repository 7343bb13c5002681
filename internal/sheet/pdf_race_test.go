package sheet

import (
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"larder/internal/sheet/sheettest"
)

// raceSheetText renders an example's sheet on A4 and returns its text as
// pdftotext reads it (the test is skipped without pdftotext).
func raceSheetText(t *testing.T, name string) (string, []byte) {
	t.Helper()
	req, plan := example(t, name)
	s := sheetFor(req, plan, StatusPublished)
	s.KindLabel = "Race day"
	pdf, err := Render(s, A4)
	if err != nil {
		t.Fatal(err)
	}
	if dir := os.Getenv("LARDER_SHEET_OUT"); dir != "" { // to look at them
		_ = os.WriteFile(filepath.Join(dir, strings.TrimSuffix(name, ".json")+".pdf"), pdf, 0o644)
	}
	text, ok := sheettest.Text(t, pdf)
	if !ok {
		t.Skip("pdftotext not installed")
	}
	return text, pdf
}

func contains(t *testing.T, text string, want ...string) {
	t.Helper()
	for _, w := range want {
		if !strings.Contains(text, w) {
			t.Errorf("sheet text lacks %q", w)
		}
	}
}

// The sheet of a stage race prints every stage's pre-stage meal, in-stage
// g/h and the refuelling after its finish, not stage 1's alone.
func TestSheetStageRace(t *testing.T) {
	text, pdf := raceSheetText(t, "stage-race-4-day.json")
	_, plan := example(t, "stage-race-4-day.json")
	d := &doc{s: Sheet{Plan: plan}}
	d.loc, _ = planZone(d.s)
	contains(t, text, "Stages", "Pre-stage meal", "After the finish")
	for i, st := range plan.Stages {
		row := strconv.Itoa(i+1) + " " + st.StartsAt.In(d.loc).Format("Mon 2 Jan 15:04")
		contains(t, text, row)
		// The text of the stage's row up to the next stage's.
		at := strings.Index(text, row)
		if at < 0 {
			continue
		}
		rest := text[at:]
		if i+1 < len(plan.Stages) {
			next := strconv.Itoa(i+2) + " " + plan.Stages[i+1].StartsAt.In(d.loc).Format("Mon 2 Jan 15:04")
			if j := strings.Index(rest, next); j > 0 {
				rest = rest[:j]
			}
		}
		if m := st.PreEventMeal; m != nil {
			contains(t, rest, num(m.ChoG, 0)+" g carbohydrate at "+m.At.In(d.loc).Format("15:04"))
		}
		if g := st.DuringEvent.ChoGPerH; g > 0 {
			contains(t, rest, num(g, 0)+" g/h")
		} else {
			contains(t, rest, "none needed")
		}
		if r := st.Repletion; r != nil && len(r.Feeds) > 0 {
			contains(t, rest, r.Feeds[0].At.In(d.loc).Format("15:04"))
			if r.Speedy {
				contains(t, rest, "speedy refuelling")
			}
		}
	}
	// The feeds name the stage their in-stage carbohydrate belongs to.
	for i, st := range plan.Stages {
		if st.DuringEvent.ChoGPerH > 0 {
			contains(t, text, st.StartsAt.In(d.loc).Format("15:04")+" during stage "+strconv.Itoa(i+1)+" "+num(st.DuringEvent.TotalChoG, 0))
		}
	}
	// A finding's subject is not printed twice ("Stage 2: Stage 2 …").
	for i := range plan.Stages {
		if w := "Stage " + strconv.Itoa(i+1) + ": Stage " + strconv.Itoa(i+1); strings.Contains(text, w) {
			t.Errorf("sheet prints %q", w)
		}
	}
	// The race-day block no longer prints stage 1's meal as the race's.
	if strings.Contains(text, "Pre-event meal "+num(plan.PreEventMeal.ChoG, 0)) {
		t.Error("the stage race's sheet prints stage 1's pre-event meal as the race's")
	}
	if n := sheettest.Pages(pdf); n > 4 {
		t.Errorf("%d pages", n)
	}
}

// The sheet of a multi-sport race prints each leg's g/h, and none in the
// swim.
func TestSheetLegs(t *testing.T) {
	text, _ := raceSheetText(t, "ironman-race.json")
	_, plan := example(t, "ironman-race.json")
	contains(t, text, "Legs of the race", "none: cannot eat while swimming")
	for i, s := range plan.DuringEvent.Segments {
		row := strconv.Itoa(i+1) + " " + s.Modality
		contains(t, text, row)
		if s.ChoGPerH > 0 {
			contains(t, text, num(s.ChoGPerH, 0)+" g/h ("+num(s.ChoG, 0)+" g)")
		}
	}
	if plan.DuringEvent.Segments[0].Modality != "swim" || plan.DuringEvent.Segments[0].ChoGPerH != 0 {
		t.Fatalf("the Ironman's first leg: %+v", plan.DuringEvent.Segments[0])
	}
}

// The sheet of a 48 h race prints the in-event plan block by block, nights
// marked.
func TestSheetHourBlocks(t *testing.T) {
	text, _ := raceSheetText(t, "ultra-48h-race.json")
	_, plan := example(t, "ultra-48h-race.json")
	d := &doc{s: Sheet{Plan: plan}}
	d.loc, _ = planZone(d.s)
	contains(t, text, "In-event feeding by block of hours", "no ordinary meals inside it")
	nights := 0
	for _, b := range plan.DuringEvent.Blocks {
		contains(t, text, b.From.In(d.loc).Format("Mon 15:04")+" "+b.To.In(d.loc).Format("Mon 15:04")+" "+num(b.ChoGPerH, 0)+" "+num(b.ChoG, 0))
		if b.Night {
			nights++
		}
	}
	contains(t, text, plan.DuringEvent.Blocks[1].From.In(d.loc).Format("15:04")+" race, next 4 h "+num(plan.DuringEvent.Blocks[1].ChoG, 0))
	if got := strings.Count(text, "night: warm"); got != nights || nights == 0 {
		t.Errorf("%d night blocks printed, the plan has %d", got, nights)
	}
}

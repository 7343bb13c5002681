package sheet

import (
	"bytes"
	"strconv"
	"strings"
	"testing"
	"time"
)

// icsEntries writes an example plan's calendar, checks it against RFC 5545
// and returns its VEVENTs as property maps (TEXT values unescaped), keyed
// by UID.
func icsEntries(t *testing.T, name string) (map[string]map[string]string, ICSPlan) {
	t.Helper()
	req, plan := example(t, name)
	start := req.Event.StartsAt
	ip := ICSPlan{PlanID: 7, Version: 2, Published: time.Date(2027, 4, 1, 9, 0, 0, 0, time.UTC), Plan: plan,
		EventName: "Fjord Classic", EventStart: &start, EventDurationMin: req.Event.ExpectedDurationMin}
	var buf bytes.Buffer
	if err := ICSWrite(&buf, ICSCalendar{ProdID: "-//Larder//test//EN", Events: ICSPlanEvents(ip)}); err != nil {
		t.Fatal(err)
	}
	out := map[string]map[string]string{}
	var cur map[string]string
	for _, l := range icsCheck(t, buf.String()) {
		k, v, _ := strings.Cut(l, ":")
		switch {
		case l == "BEGIN:VEVENT":
			cur = map[string]string{}
		case l == "END:VEVENT":
			if _, dup := out[cur["UID"]]; dup {
				t.Fatalf("UID repeated: %s", cur["UID"])
			}
			out[cur["UID"]] = cur
			cur = nil
		case cur != nil:
			cur[k] = ICSUnescapeText(v)
		}
	}
	return out, ip
}

// Every stage of a stage race is an entry of its own with its in-stage
// g/h, the meal before it and the refuelling after its finish.
func TestICSStageRace(t *testing.T) {
	entries, ip := icsEntries(t, "stage-race-4-day.json")
	if _, ok := entries["plan-7-event@larder"]; ok {
		t.Error("a stage race has a single event entry besides its stages")
	}
	for i, st := range ip.Plan.Stages {
		e, ok := entries["plan-7-stage-"+strconv.Itoa(i)+"@larder"]
		if !ok {
			t.Errorf("stage %d has no entry", i+1)
			continue
		}
		if e["DTSTART"] != icsUTC(st.StartsAt) || e["DURATION"] != icsDuration(time.Duration(st.DurationMin*float64(time.Minute))) {
			t.Errorf("stage %d at %s for %s, want %s for %g min", i+1, e["DTSTART"], e["DURATION"], icsUTC(st.StartsAt), st.DurationMin)
		}
		want := "Fjord Classic · stage " + strconv.Itoa(i+1) + " · carbohydrate " + icsGrams(st.DuringEvent.ChoGPerH) + " g per hour"
		if st.DuringEvent.ChoGPerH == 0 {
			want = "Fjord Classic · stage " + strconv.Itoa(i+1) + " · no carbohydrate needed during it"
		}
		if e["SUMMARY"] != want {
			t.Errorf("stage %d: summary %q, want %q", i+1, e["SUMMARY"], want)
		}
		if m := st.PreEventMeal; m != nil && !strings.Contains(e["DESCRIPTION"], "Pre-stage meal at "+m.At.Format("15:04")+": carbohydrate "+icsGrams(m.ChoG)+" g") {
			t.Errorf("stage %d: description lacks the pre-stage meal: %q", i+1, e["DESCRIPTION"])
		}
		if r := st.Repletion; r != nil && len(r.Feeds) > 0 {
			w := "a recovery feed at " + r.Feeds[0].At.Format("15:04")
			if r.Speedy {
				w = "speedy refuelling from " + r.Feeds[0].At.Format("15:04")
			}
			if !strings.Contains(e["DESCRIPTION"], w) {
				t.Errorf("stage %d: description lacks %q: %q", i+1, w, e["DESCRIPTION"])
			}
		}
	}
	// The speedy refuelling feeds between the two stages of one day are
	// entries too.
	speedy := false
	for _, st := range ip.Plan.Stages {
		if r := st.Repletion; r != nil && r.Speedy {
			speedy = true
			for _, f := range r.Feeds {
				found := false
				for _, e := range entries {
					found = found || e["DTSTART"] == icsUTC(f.At) && strings.Contains(e["SUMMARY"], "(refuel)")
				}
				if !found {
					t.Errorf("refuel feed at %s has no entry", f.At)
				}
			}
		}
	}
	if !speedy {
		t.Fatal("the example's morning time trial has no speedy refuelling before the afternoon stage")
	}
}

// An event over a day has an entry per block of hours, nights marked.
func TestICSHourBlocks(t *testing.T) {
	entries, ip := icsEntries(t, "ultra-48h-race.json")
	blocks := ip.Plan.DuringEvent.Blocks
	if len(blocks) < 12 {
		t.Fatalf("a 48 h race in 4-h blocks has %d blocks", len(blocks))
	}
	for i, b := range blocks {
		e, ok := entries["plan-7-block-"+strconv.Itoa(i)+"@larder"]
		if !ok {
			t.Errorf("block %d has no entry", i)
			continue
		}
		want := "In-race feeding · carbohydrate " + icsGrams(b.ChoGPerH) + " g per hour"
		if b.Night {
			want += " (night)"
		}
		if e["SUMMARY"] != want || e["DTSTART"] != icsUTC(b.From) || e["DURATION"] != "PT4H" {
			t.Errorf("block %d: %q at %s for %s", i, e["SUMMARY"], e["DTSTART"], e["DURATION"])
		}
		if !strings.Contains(e["DESCRIPTION"], icsGrams(b.ChoG)+" g over the block") {
			t.Errorf("block %d: %q", i, e["DESCRIPTION"])
		}
	}
	if _, ok := entries["plan-7-event@larder"]; !ok {
		t.Error("the race itself has no entry")
	}
}

// A multi-sport event's entry names each leg's carbohydrate, none in the
// swim.
func TestICSLegs(t *testing.T) {
	entries, ip := icsEntries(t, "ironman-race.json")
	e := entries["plan-7-event@larder"]
	for i, s := range ip.Plan.DuringEvent.Segments {
		w := "Leg " + strconv.Itoa(i+1) + ", " + s.Modality + " ("
		switch {
		case s.ChoGPerH > 0:
			w = "about " + icsGrams(s.ChoGPerH) + " g of carbohydrate per hour (" + icsGrams(s.ChoG) + " g)"
		case s.Modality == "swim":
			w += clock(s.StartMin) + " to " + clock(s.StartMin+s.DurationMin) + " race time): nothing to eat while swimming"
		}
		if !strings.Contains(e["DESCRIPTION"], w) {
			t.Errorf("event description lacks %q: %q", w, e["DESCRIPTION"])
		}
	}
}

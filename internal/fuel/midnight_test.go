package fuel

import (
	"testing"
	"time"
)

// preMealFeed finds the pre-event meal among the days' feeds.
func preMealFeed(t *testing.T, p Plan) (Day, Feed) {
	t.Helper()
	for _, d := range p.Days {
		for _, f := range d.Feeds {
			if f.Label == labelPreEvent {
				return d, f
			}
		}
	}
	t.Fatal("no pre-event meal among the feeds")
	return Day{}, Feed{}
}

func TestEventJustAfterMidnightPutsThePreEventMealOnTheEveningBefore(t *testing.T) {
	for _, name := range []string{"marathon-loading.json", "cyclist-5h-race.json"} {
		t.Run(name, func(t *testing.T) {
			req := loadRequest(t, name)
			st := req.Event.StartsAt
			req.Event.StartsAt = time.Date(st.Year(), st.Month(), st.Day(), 0, 30, 0, 0, st.Location())
			p := mustCompute(t, req) // checks every feed is listed on its own day
			pm := p.PreEventMeal
			if pm == nil {
				t.Fatal("no pre-event meal")
			}
			// ACSM/AND/DC 2016: pre-event meal 1–4 g/kg, 1–4 h before
			h := req.Event.StartsAt.Sub(pm.At).Hours()
			if h < 1 || h > 4 || pm.HoursBefore != h {
				t.Errorf("pre-event meal at %s is %.1f h before the start (says %g h)", pm.At.Format(time.RFC3339), h, pm.HoursBefore)
			}
			if pm.ChoGPerKg < 1 || pm.ChoGPerKg > 4 {
				t.Errorf("pre-event meal %g g/kg", pm.ChoGPerKg)
			}
			d, f := preMealFeed(t, p)
			eve := req.Event.StartsAt.AddDate(0, 0, -1).Format("2006-01-02")
			if d.Date != eve || !f.At.Equal(pm.At) || f.ChoG != pm.ChoG {
				t.Errorf("pre-event meal feed %+v on %s; pre_event_meal %+v; want the evening of %s", f, d.Date, pm, eve)
			}
			for _, d := range p.Days {
				if d.Date == req.Event.StartsAt.Format("2006-01-02") && labelCount(d, labelPreEvent) != 0 {
					t.Errorf("the event day still lists a pre-event meal")
				}
			}
			oneFinding(t, p, "pre-event-meal-day", "pre_event_meal")
			if f := oneFinding(t, p, "pre-event-meal", "pre_event_meal"); f.Level != LevelOK {
				t.Errorf("pre-event meal finding %+v", f)
			}
		})
	}
}

func TestEarlyStartsKeepThePreEventMealInsideTheWindow(t *testing.T) {
	// ACSM/AND/DC 2016: 1–4 h before. The meal avoids the night hours
	// (before 05:00, common practice) when the window allows.
	cases := []struct {
		start      string
		wantH      float64
		wantNight  bool
		eveningPre bool
	}{
		{"08:00", 3, false, false},
		{"06:30", 1.5, false, false},
		{"03:00", 4, false, true},
		{"04:30", 1, true, false},
	}
	for _, c := range cases {
		req := loadRequest(t, "cyclist-5h-race.json")
		st := req.Event.StartsAt
		clock, _ := time.Parse("15:04", c.start)
		req.Event.StartsAt = time.Date(st.Year(), st.Month(), st.Day(), clock.Hour(), clock.Minute(), 0, 0, st.Location())
		p := mustCompute(t, req)
		pm := p.PreEventMeal
		if pm.HoursBefore != c.wantH {
			t.Errorf("start %s: meal %g h before, want %g", c.start, pm.HoursBefore, c.wantH)
		}
		if got := len(findingsOf(p, "pre-event-meal-night")) == 1; got != c.wantNight {
			t.Errorf("start %s: night finding %v, want %v", c.start, got, c.wantNight)
		}
		if got := pm.At.Day() != req.Event.StartsAt.Day(); got != c.eveningPre {
			t.Errorf("start %s: meal at %s", c.start, pm.At.Format(time.RFC3339))
		}
	}
}

func TestLateEventRecoveryFeedOnTheNextDay(t *testing.T) {
	// A 5 h race starting at 21:00 ends at 02:00: the recovery feed (about
	// 0.3 g/kg protein after key sessions, ACSM/AND/DC 2016) falls on the
	// next day and is listed there.
	req := loadRequest(t, "cyclist-5h-race.json")
	st := req.Event.StartsAt
	req.Event.StartsAt = time.Date(st.Year(), st.Month(), st.Day(), 21, 0, 0, 0, st.Location())
	p := mustCompute(t, req)
	next := req.Event.StartsAt.AddDate(0, 0, 1).Format("2006-01-02")
	if d := dayOf(t, p, next); labelCount(d, labelRecovery) != 1 {
		t.Errorf("no recovery feed on %s: %+v", next, d.Feeds)
	}
}

func TestPreEventMealOverrideOnTheEveningBefore(t *testing.T) {
	// A dietitian moves the evening-before pre-event meal of a 00:30 start
	// to 22:00 with 150 g: pre_event_meal says the same as the feed, and it
	// is checked against ACSM/AND/DC 2016 (1–4 g/kg, 1–4 h before). A race
	// plan on usual stores, so the in-event rate is settled above the band's
	// floor and the event day is built twice.
	req := loadRequest(t, "marathon-loading.json")
	req.Kind, req.Protocol, req.Overrides = KindRace, "", nil
	req.Event.IntensityPctVO2max = ptr(85.0)
	st := req.Event.StartsAt
	req.Event.StartsAt = time.Date(st.Year(), st.Month(), st.Day(), 0, 30, 0, 0, st.Location())
	p := mustCompute(t, req)
	eve, _ := preMealFeed(t, p)
	idx := -1
	for i, f := range eve.Feeds {
		if f.Label == labelPreEvent {
			idx = i
		}
	}
	req.FeedOverrides = []FeedOverride{{Date: eve.Date, Index: idx, At: "22:00", ChoG: ptr(150.0)}}
	p = mustCompute(t, req)
	if p.DuringEvent.ChoGPerH <= 60 {
		t.Fatalf("in-event %g g/h: the event day was not rebuilt", p.DuringEvent.ChoGPerH)
	}
	_, f := preMealFeed(t, p)
	pm := p.PreEventMeal
	if f.ChoG != 150 || f.At.Format("15:04") != "22:00" || !pm.At.Equal(f.At) || pm.ChoG != 150 || pm.HoursBefore != 2.5 {
		t.Errorf("feed %+v, pre_event_meal %+v", f, pm)
	}
	if fd := oneFinding(t, p, "pre-event-meal", "pre_event_meal"); fd.Level != LevelOK {
		t.Errorf("150 g (2.6 g/kg) 2.5 h before: %+v", fd)
	}
}

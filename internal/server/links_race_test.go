package server

import (
	"context"
	"html"
	"net/http/httptest"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync/atomic"
	"testing"
	"time"

	"larder/internal/fuel"
	"larder/internal/menu"
	"larder/internal/store"
	"larder/internal/testdb"
	"larder/web"
)

// raceLinks is an app whose clock the test moves, with one client per
// example race (a stage race, a 48 h race, an Ironman), each with the
// race-day plan published and a personal link.
type raceLinks struct {
	a      *app
	clock  *atomic.Int64 // Unix seconds
	tokens map[string]string
	plans  map[string]fuel.Plan
}

func (r raceLinks) at(t time.Time) { r.clock.Store(t.Unix()) }

func newRaceLinks(t *testing.T) raceLinks {
	t.Helper()
	clock := &atomic.Int64{}
	clock.Store(testNow.Unix())
	st := store.New(testdb.Pool(t))
	s := New(Config{Store: st, SessionCleanup: -1, Now: func() time.Time { return time.Unix(clock.Load(), 0).UTC() }})
	hs := httptest.NewServer(s)
	t.Cleanup(func() { hs.Close(); s.Close() })
	a := &app{t: t, st: st, srv: hs}
	b, _ := a.signedIn(store.RoleDietitian)
	r := raceLinks{a: a, clock: clock, tokens: map[string]string{}, plans: map[string]fuel.Plan{}}
	for _, x := range []struct{ file, name string }{
		{"stage-race-4-day.json", "Fjord Tour"}, {"ultra-48h-race.json", "Two Nights Ultra"}, {"ironman-race.json", "Harbour Ironman"},
	} {
		f, err := os.Open(filepath.Join("..", "..", "testdata", "fuel", x.file))
		if err != nil {
			t.Fatal(err)
		}
		req, err := fuel.DecodeRequest(f)
		f.Close()
		if err != nil {
			t.Fatal(err)
		}
		plan, err := fuel.Compute(req)
		if err != nil {
			t.Fatal(err)
		}
		c := a.newClient(unique("Racer " + x.name))
		ev := store.Event{ClientID: c.ID, Name: x.name, StartsAt: req.Event.StartsAt, TimeZone: "Europe/Oslo",
			Modality: req.Event.Modality, ExpectedDurationMin: int(req.Event.ExpectedDurationMin), Days: 1, Priority: "A"}
		if err := a.st.AddEvent(context.Background(), store.System, &ev); err != nil {
			t.Fatal(err)
		}
		foods, err := a.st.ListFoods(context.Background(), false)
		if err != nil {
			t.Fatal(err)
		}
		content := store.PlanContent{Request: req, Result: plan, BodyMassKg: req.Athlete.BodyMassKg,
			Suggestions: menu.PlanSuggestions(plan, MenuFoods(foods))}
		p := store.Plan{ClientID: c.ID, EventID: &ev.ID, Kind: fuel.KindRace, Title: "Race plan"}
		v, err := a.st.CreatePlan(context.Background(), store.System, &p, content)
		if err != nil {
			t.Fatal(err)
		}
		if _, err := a.st.Publish(context.Background(), store.System, v.ID, v.Revision, content); err != nil {
			t.Fatal(err)
		}
		// A link lasts 90 days from when it is made: made a week before.
		r.at(req.Event.StartsAt.AddDate(0, 0, -7))
		r.tokens[x.file] = makeLink(t, b, c.ID, "")
		r.plans[x.file] = plan
	}
	return r
}

// phonePage is the phone page's HTML at the clock's time, entities decoded.
func (r raceLinks) phonePage(t *testing.T, file string) string {
	t.Helper()
	_, body := getPublic(t, r.a, "/c/"+r.tokens[file])
	return html.UnescapeString(body)
}

// section is the part of page from the element with the attribute
// attr up to the next element with one (or the end).
func section(page, attr string) string {
	i := strings.Index(page, attr)
	if i < 0 {
		return ""
	}
	rest := page[i+len(attr):]
	if j := strings.Index(rest, attr[:strings.Index(attr, "=")+1]); j >= 0 {
		rest = rest[:j]
	}
	return rest
}

// On each day of a stage race the phone page shows the stages starting
// that day: the pre-stage meal, in-stage g/h and the refuelling after the
// finish; never stage 1's figures on another day.
func TestClientLinkStageRaceDays(t *testing.T) {
	r := newRaceLinks(t)
	const file = "stage-race-4-day.json"
	plan := r.plans[file]
	loc := planZone(plan.TimeZone)
	for i, st := range plan.Stages {
		day := st.StartsAt.In(loc)
		r.at(time.Date(day.Year(), day.Month(), day.Day(), 5, 0, 0, 0, loc))
		page := r.phonePage(t, file)
		n := strconv.Itoa(i + 1)
		box := section(page, `data-stage="`+n+`"`)
		if box == "" {
			t.Errorf("%s: stage %s not on the page", day.Format(time.DateOnly), n)
			continue
		}
		if !strings.Contains(box, "Fjord Tour, stage "+n+": start "+day.Format("15:04")) {
			t.Errorf("stage %s: box heading wrong:\n%s", n, box)
		}
		feeds := section(page, `id="feeds"`)
		if m := st.PreEventMeal; m != nil {
			// The box says when; the list of feeds gives the grams, once.
			at := m.At.In(loc).Format("15:04")
			if !strings.Contains(box, "your pre-stage meal at "+at) {
				t.Errorf("stage %s: pre-stage meal time missing:\n%s", n, box)
			}
			if strings.Contains(box, web.Num(m.ChoG, 0)+" g carbohydrate at") {
				t.Errorf("stage %s: the pre-stage meal's grams are in the box as well as in the list:\n%s", n, box)
			}
			if !strings.Contains(feeds, `<span class="time">`+at+`</span>`) {
				t.Errorf("stage %s: the pre-stage meal at %s is not among the feeding times", n, at)
			}
		}
		if g := st.DuringEvent.ChoGPerH; g > 0 {
			if !strings.Contains(box, web.Num(g, 0)+" g carbohydrate per hour") {
				t.Errorf("stage %s: in-stage %g g/h missing:\n%s", n, g, box)
			}
		} else if !strings.Contains(box, "no carbohydrate needed") {
			t.Errorf("stage %s: the short stage does not say none is needed:\n%s", n, box)
		}
		if rep := st.Repletion; rep != nil && len(rep.Feeds) > 0 {
			w := "a recovery feed at " + rep.Feeds[0].At.In(loc).Format("15:04")
			if rep.Speedy {
				w = "refuel fast: "
			}
			if !strings.Contains(box, w) {
				t.Errorf("stage %s: refuelling %q missing:\n%s", n, w, box)
			}
		}
		// Stages of other days are not shown.
		for j, other := range plan.Stages {
			if other.StartsAt.In(loc).Format(time.DateOnly) != day.Format(time.DateOnly) && strings.Contains(page, `data-stage="`+strconv.Itoa(j+1)+`"`) {
				t.Errorf("%s: stage %d of another day shown", day.Format(time.DateOnly), j+1)
			}
		}
		// The in-stage feed is shown once: in the stage's box, with its
		// rate, total and food idea, and not again as a feed in the list
		// (an athlete reading the same total twice may eat it twice).
		if st.DuringEvent.ChoGPerH > 0 {
			key := stageFeedKey(t, plan, st)
			if !strings.Contains(box, `data-feed="`+key+`"`) || !strings.Contains(box, "For example, during the stage: ") {
				t.Errorf("stage %s: the box lacks its feed's food idea:\n%s", n, box)
			}
			if c := strings.Count(page, `data-feed="`+key+`"`); c != 1 {
				t.Errorf("stage %s: its in-stage feed shown %d times, want once", n, c)
			}
			if total := web.Num(st.DuringEvent.TotalChoG, 0) + " g"; strings.Count(page, "("+total+" over ") != 1 {
				t.Errorf("stage %s: the in-stage total %s is not shown exactly once", n, total)
			}
			if strings.Contains(page, "(in all)") {
				t.Errorf("stage %s: an in-event feed is still listed as a feed \"(in all)\"", n)
			}
		}
	}
	// The calendar has an entry per stage.
	_, ics := getPublic(t, r.a, "/c/"+r.tokens[file]+"/plan.ics")
	lines := checkICS(t, ics)
	stages := 0
	for _, l := range lines {
		if strings.HasPrefix(l, "UID:") && strings.Contains(l, "-stage-") {
			stages++
		}
	}
	if stages != len(plan.Stages) {
		t.Errorf("calendar has %d stage entries, the race %d stages", stages, len(plan.Stages))
	}
}

// stageFeedKey is the stored food plan key of stage st's in-stage feed.
func stageFeedKey(t *testing.T, plan fuel.Plan, st fuel.StagePlan) string {
	t.Helper()
	for _, d := range plan.Days {
		for i, f := range d.Feeds {
			if f.Label == "during event" && f.At.Equal(st.StartsAt) {
				return menu.FeedKey("day", d.Date, i)
			}
		}
	}
	t.Fatalf("no in-stage feed at %s", st.StartsAt)
	return ""
}

// A day inside a 48 h race shows the race's blocks of hours of that day,
// nights marked; the start day shows its own.
func TestClientLinkInRaceDay(t *testing.T) {
	r := newRaceLinks(t)
	const file = "ultra-48h-race.json"
	plan := r.plans[file]
	loc := planZone(plan.TimeZone)
	r.at(time.Date(2027, 8, 21, 12, 0, 0, 0, loc))
	page := r.phonePage(t, file)
	if !strings.Contains(page, "Two Nights Ultra: still racing") || !strings.Contains(page, "no ordinary meals inside it") {
		t.Errorf("the day inside the race is not shown as racing:\n%s", page)
	}
	shown, nights := 0, 0
	for _, b := range plan.DuringEvent.Blocks {
		from := b.From.In(loc)
		line := from.Format("Mon 15:04") + " to " + b.To.In(loc).Format("Mon 15:04")
		want := from.Format(time.DateOnly) == "2027-08-21"
		if strings.Contains(page, line) != want {
			t.Errorf("block %s shown: %t, want %t", line, !want, want)
		}
		if want {
			shown++
			if b.Night {
				nights++
			}
			if !strings.Contains(page, web.Num(b.ChoGPerH, 0)+" g carbohydrate per hour ("+web.Num(b.ChoG, 0)+" g in the block)") {
				t.Errorf("block %s: grams missing", line)
			}
		}
	}
	if shown != 6 || nights == 0 {
		t.Errorf("%d blocks of 4 h on a whole day inside the race (%d at night), want 6 with a night", shown, nights)
	}
	if got := strings.Count(page, `class="night"`); got != nights {
		t.Errorf("%d night blocks marked, want %d", got, nights)
	}
	checkBlocksOnce(t, r, file, "2027-08-21", page)
	r.at(time.Date(2027, 8, 20, 7, 0, 0, 0, loc))
	checkBlocksOnce(t, r, file, "2027-08-20", r.phonePage(t, file))
}

// checkBlocksOnce checks that each block of hours starting on day shows
// once, in the block list with its stored food idea, and not again as a
// feed in the list of feeds.
func checkBlocksOnce(t *testing.T, r raceLinks, file, day, page string) {
	t.Helper()
	plan := r.plans[file]
	loc := planZone(plan.TimeZone)
	feeds := section(page, `id="feeds"`)
	for _, d := range plan.Days {
		if d.Date != day {
			continue
		}
		for i, f := range d.Feeds {
			if f.Label != "during event" {
				continue
			}
			key := menu.FeedKey("day", d.Date, i)
			if strings.Contains(feeds, `data-feed="`+key+`"`) {
				t.Errorf("block at %s listed again among the feeds", f.At.In(loc).Format("15:04"))
			}
			if strings.Count(page, `data-feed="`+key+`"`) != 1 {
				t.Errorf("block at %s: its feed shown %d times, want once", f.At.In(loc).Format("15:04"), strings.Count(page, `data-feed="`+key+`"`))
			}
		}
	}
	if strings.Contains(feeds, "During the race, ") {
		t.Errorf("a block is still named as a feed (\"During the race, … (in all)\")")
	}
	blocks := section(page, `id="blocks-list"`)
	for _, b := range plan.DuringEvent.Blocks {
		if b.From.In(loc).Format(time.DateOnly) != day {
			continue
		}
		line := b.From.In(loc).Format("Mon 15:04") + " to " + b.To.In(loc).Format("Mon 15:04")
		if n := strings.Count(page, line); n != 1 {
			t.Errorf("block %s shown %d times, want once", line, n)
		}
		li := blocks[strings.Index(blocks, line):]
		if j := strings.Index(li, "</li>"); j >= 0 {
			li = li[:j]
		}
		if !strings.Contains(li, "For example: ") {
			t.Errorf("block %s has no food idea:\n%s", line, li)
		}
	}
}

// An Ironman's day lists each leg's carbohydrate, none in the swim.
func TestClientLinkLegs(t *testing.T) {
	r := newRaceLinks(t)
	const file = "ironman-race.json"
	plan := r.plans[file]
	loc := planZone(plan.TimeZone)
	r.at(time.Date(2027, 7, 4, 4, 0, 0, 0, loc))
	page := r.phonePage(t, file)
	for i, s := range plan.DuringEvent.Segments {
		leg := section(page, `data-leg="`+strconv.Itoa(i+1)+`"`)
		switch {
		case s.ChoGPerH > 0:
			if !strings.Contains(leg, web.Num(s.ChoGPerH, 0)+" g carbohydrate per hour ("+web.Num(s.ChoG, 0)+" g)") {
				t.Errorf("leg %d (%s): %g g/h missing:\n%s", i+1, s.Modality, s.ChoGPerH, leg)
			}
		case s.Modality == "swim":
			if !strings.Contains(leg, "Nothing to eat while swimming") {
				t.Errorf("leg %d: the swim does not say there is nothing to eat:\n%s", i+1, leg)
			}
		}
	}
	// The event box gives the race's total for the legs where one eats, not
	// an hourly rate over the whole race that the total does not add up to
	// (nothing is eaten in the swim).
	box := section(page, `id="event-day"`)
	want := web.Num(plan.DuringEvent.TotalChoG, 0) + " g carbohydrate</strong> on the legs where you can eat"
	if !strings.Contains(box, want) || strings.Contains(box, "per hour") {
		t.Errorf("event box does not give the legs' total %q without a whole-race rate:\n%s", want, box)
	}
	// The race's in-event feed is the box's, with its food idea, and is not
	// listed again among the feeding times.
	if !strings.Contains(box, "For example, during the event: ") {
		t.Errorf("event box lacks the in-event food idea:\n%s", box)
	}
	if feeds := section(page, `id="feeds"`); strings.Contains(feeds, "(in all)") || strings.Contains(feeds, web.Num(plan.DuringEvent.TotalChoG, 0)+" g carbohydrate") {
		t.Errorf("the in-event total is listed again among the feeds:\n%s", feeds)
	}
}

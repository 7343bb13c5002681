package menu

import (
	"fmt"
	"strings"
	"time"

	"larder/internal/fuel"
)

// FeedKey names one feed of a plan: kind is "day", "pre_event" or
// "repletion"; index is 0-based within the day (or the repletion window).
func FeedKey(kind, date string, index int) string { return fmt.Sprintf("%s:%s:%d", kind, date, index) }

// NoFit is the text shown when no combination of foods fits a feed.
const NoFit = "No combination of 1–3 foods on the list fits."

// PlanSuggestions makes the food suggestions of every feed of a plan, by
// FeedKey: day feeds in order (low-fibre on the days the plan marks so, on the
// move for the in-event share of the event day), the pre-event meal
// (low-fibre), and the repletion feeds (drinks and portable foods first:
// they come every 15–60 min, soon after a session).
func PlanSuggestions(plan fuel.Plan, foods []Food) map[string]string {
	out := map[string]string{}
	loc, err := time.LoadLocation(plan.TimeZone)
	if err != nil || plan.TimeZone == "" {
		loc = time.UTC
	}
	for _, d := range plan.Days {
		needs := make([]Need, len(d.Feeds))
		for i, f := range d.Feeds {
			needs[i] = Need{ChoG: f.ChoG, LowFibre: d.LowFibre, OnTheMove: strings.Contains(f.Label, "during"),
				PreferOnTheMove: strings.Contains(f.Label, "refuel")}
		}
		sugg, ok := SuggestDay(foods, needs)
		for i := range needs {
			switch {
			case ok[i]:
				out[FeedKey("day", d.Date, i)] = sugg[i].Text()
			case needs[i].ChoG > 0:
				out[FeedKey("day", d.Date, i)] = NoFit
			}
		}
	}
	if m := plan.PreEventMeal; m != nil {
		if sg, ok := Suggest(foods, Need{ChoG: m.ChoG, LowFibre: true}); ok {
			out[FeedKey("pre_event", m.At.In(loc).Format(time.DateOnly), 0)] = sg.Text()
		}
	}
	if rp := plan.Repletion; rp != nil {
		needs := make([]Need, len(rp.Feeds))
		for i, f := range rp.Feeds {
			needs[i] = Need{ChoG: f.ChoG, PreferOnTheMove: true}
		}
		sugg, ok := SuggestDay(foods, needs)
		for i, f := range rp.Feeds {
			if ok[i] {
				out[FeedKey("repletion", f.At.In(loc).Format(time.DateOnly), i)] = sugg[i].Text()
			}
		}
	}
	return out
}

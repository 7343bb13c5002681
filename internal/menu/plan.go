package menu

import (
	"fmt"
	"strings"
	"time"

	"larder/internal/fuel"
)

// FeedDate is the date of a feed's time in the plan's zone: the date part
// of the pre-event and repletion feeds' keys, the same wherever a key is
// made (store, plan page, sheet).
func FeedDate(plan fuel.Plan, at time.Time) string {
	loc, err := time.LoadLocation(plan.TimeZone)
	if err != nil || plan.TimeZone == "" {
		loc = time.UTC
	}
	return at.In(loc).Format(time.DateOnly)
}

// FeedKey names one feed of a plan: kind is "day", "pre_event" or
// "repletion"; index is 0-based within the day (or the repletion window).
func FeedKey(kind, date string, index int) string { return fmt.Sprintf("%s:%s:%d", kind, date, index) }

// NoFit is the text shown when no combination of foods fits a feed within
// the tolerance and the caps: said plainly rather than forcing a bad one.
const NoFit = "No good match in the foods list — add a product."

// preEventDrinksG caps the drinks of the pre-event meal, g (≈ ml).
const preEventDrinksG = 500

// Options are what a client's record asks of all of a plan's suggestions.
type Options struct {
	GlutenFree bool // see GlutenFreeFor
}

// GlutenFreeNote is shown next to the suggestions when GlutenFree applies.
const GlutenFreeNote = "Gluten-free suggestions (recorded caution)"

// GlutenFreeFor is the rule: suggestions are gluten-free when the client's
// recorded cautions mention coeliac (celiac) disease or gluten, in any case.
// It errs towards leaving gluten out: "no gluten issues" also turns it on,
// which costs only a narrower choice of foods.
func GlutenFreeFor(cautions string) bool {
	c := strings.ToLower(cautions)
	for _, w := range []string{"coeliac", "celiac", "cœliac", "gluten"} {
		if strings.Contains(c, w) {
			return true
		}
	}
	return false
}

// OptionsFor reads the options from a client's recorded cautions.
func OptionsFor(cautions string) Options { return Options{GlutenFree: GlutenFreeFor(cautions)} }

// Note is the line shown next to suggestions made with these options.
func (o Options) Note() string {
	if o.GlutenFree {
		return GlutenFreeNote
	}
	return ""
}

func (o Options) apply(n Need) Need {
	n.GlutenFree = n.GlutenFree || o.GlutenFree
	return n
}

// isMeal tells the day's main meals by the engine's feed labels.
func isMeal(label string) bool {
	switch label {
	case "breakfast", "lunch", "dinner", "supper":
		return true
	}
	return false
}

// PlanSuggestions makes the food suggestions of every feed of a plan, by
// FeedKey: day feeds in order (low-fibre on the days the plan marks so, on the
// move for the in-event share of the event day, drinks and portable foods
// first for the recovery and refuel feeds after a session, ready-to-eat foods
// for snacks), the pre-event meal
// (low-fibre, little to drink), and the repletion feeds (drinks and portable foods first:
// they come every 15–60 min, soon after a session). Where nothing fits a
// day or repletion feed, its text is NoFit. opts, at most one, are the
// client's (see OptionsFor).
func PlanSuggestions(plan fuel.Plan, foods []Food, opts ...Options) map[string]string {
	var o Options
	if len(opts) > 0 {
		o = opts[0]
	}
	out := map[string]string{}
	byTime := map[int64]string{} // a day feed's text by its time
	for _, d := range plan.Days {
		needs := make([]Need, len(d.Feeds))
		for i, f := range d.Feeds {
			needs[i] = o.apply(Need{ChoG: f.ChoG, LowFibre: d.LowFibre, OnTheMove: strings.Contains(f.Label, "during"),
				PreferOnTheMove: strings.Contains(f.Label, "refuel") || strings.Contains(f.Label, "recovery"),
				Ready:           strings.Contains(f.Label, "snack"), Meal: isMeal(f.Label)})
			if strings.Contains(f.Label, "pre-event") {
				needs[i].LowFibre, needs[i].DrinksG = true, preEventDrinksG
			}
			if strings.Contains(f.Label, "recovery") {
				needs[i].ProteinG = f.ProteinG
			}
			if needs[i].OnTheMove && plan.DuringEvent != nil {
				needs[i].Hours = plan.DuringEvent.DurationMin / 60 // the in-event total
			}
		}
		sugg, ok := SuggestDay(foods, needs)
		for i := range needs {
			key := FeedKey("day", d.Date, i)
			switch {
			case ok[i]:
				out[key] = sugg[i].Text()
			case needs[i].ChoG > 0:
				out[key] = NoFit
			}
			if text, done := out[key]; done {
				byTime[d.Feeds[i].At.UnixNano()] = text
			}
		}
	}
	// The pre-event meal and the repletion feeds are, on most plans, also
	// feeds of a day's table (at the same time): such a feed has one food
	// plan, the day feed's, so that the plan page's cards, its tables, the
	// sheet, the calendar and the phone page all say the same thing. Only a
	// feed that no day lists gets a suggestion of its own.
	if m := plan.PreEventMeal; m != nil {
		key := FeedKey("pre_event", FeedDate(plan, m.At), 0)
		if text, ok := byTime[m.At.UnixNano()]; ok {
			out[key] = text
		} else if sg, ok := Suggest(foods, o.apply(Need{ChoG: m.ChoG, LowFibre: true, DrinksG: preEventDrinksG})); ok {
			// A meal 1–4 h before the start is mostly eaten, not drunk:
			// drinks in it are kept to about 0.5 L so the stomach has
			// emptied by the start (this project's own margin).
			out[key] = sg.Text()
		}
	}
	if rp := plan.Repletion; rp != nil {
		needs := make([]Need, len(rp.Feeds))
		for i, f := range rp.Feeds {
			needs[i] = o.apply(Need{ChoG: f.ChoG, PreferOnTheMove: true, ProteinG: f.ProteinG})
		}
		sugg, ok := SuggestDay(foods, needs)
		for i, f := range rp.Feeds {
			key := FeedKey("repletion", FeedDate(plan, f.At), i)
			text, shared := byTime[f.At.UnixNano()]
			switch {
			case shared:
				out[key] = text
			case ok[i]:
				out[key] = sugg[i].Text()
			case needs[i].ChoG > 0:
				out[key] = NoFit
			}
		}
	}
	return out
}

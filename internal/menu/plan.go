package menu

import (
	"fmt"
	"slices"
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
	// Needs are the dietary need codes (see Needs) every suggestion keeps to.
	Needs []string
	// fromCautions: some of Needs were read from the recorded cautions.
	fromCautions bool
}

// OptionsForClient reads the options from a client's record: the recorded
// dietary needs; and, until the dietitian has confirmed the client's needs
// once, also every need the recorded cautions seem to name (NeedsIn) — a
// note such as "lactose intolerance: no milk or dairy" keeps milk out of
// the suggestions before anyone has ticked a box.
func OptionsForClient(cautions string, needs []string, confirmed bool) Options {
	o := Options{Needs: slices.Clone(needs)}
	if !confirmed {
		o.GlutenFree = GlutenFreeFor(cautions)
		for _, m := range NeedsIn(cautions) {
			if !slices.Contains(o.Needs, m.Need.Code) {
				o.Needs = append(o.Needs, m.Need.Code)
				o.fromCautions = true
			}
		}
	}
	return o
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
	if note := needsNote(o.Needs); note != "" {
		if o.fromCautions {
			note += " (read from the recorded cautions)"
		}
		return note
	}
	if o.GlutenFree {
		return GlutenFreeNote
	}
	return ""
}

func (o Options) apply(n Need) Need {
	n.GlutenFree = n.GlutenFree || o.GlutenFree
	n.Exclude = append(slices.Clone(n.Exclude), excluded(o.Needs)...)
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
	detail := PlanSuggestionsDetail(plan, foods, opts...)
	out := make(map[string]string, len(detail))
	for k, s := range detail {
		if len(s.Items) == 0 {
			out[k] = NoFit
		} else {
			out[k] = s.Text()
		}
	}
	return out
}

// PlanSuggestionsDetail is PlanSuggestions with each feed's foods: a feed
// where nothing fits has a Suggestion with no Items.
func PlanSuggestionsDetail(plan fuel.Plan, foods []Food, opts ...Options) map[string]Suggestion {
	var o Options
	if len(opts) > 0 {
		o = opts[0]
	}
	out := map[string]Suggestion{}
	byTime := map[int64]Suggestion{} // a day feed's food plan by its time
	for _, d := range plan.Days {
		needs := make([]Need, len(d.Feeds))
		for i, f := range d.Feeds {
			needs[i] = o.apply(Need{ChoG: f.ChoG, LowFibre: d.LowFibre, OnTheMove: strings.Contains(f.Label, "during"),
				PreferOnTheMove: strings.Contains(f.Label, "refuel") || strings.Contains(f.Label, "recovery"),
				Ready:           strings.Contains(f.Label, "snack"), Meal: isMeal(f.Label)})
			if strings.Contains(f.Label, "pre-event") {
				needs[i].LowFibre, needs[i].DrinksG = true, preEventDrinksG
			}
			if !needs[i].OnTheMove {
				// Every feed but the in-event one brings its protein too
				// (see Need.ProteinG): the in-event feed is carbohydrate
				// only.
				needs[i].ProteinG = f.ProteinG
			}
			if needs[i].OnTheMove && plan.DuringEvent != nil {
				needs[i].Hours = plan.DuringEvent.DurationMin / 60 // the in-event total
			}
		}
		sugg, ok := SuggestDay(foods, needs)
		for i := range needs {
			key := FeedKey("day", d.Date, i)
			if ok[i] || needs[i].ChoG > 0 {
				out[key] = sugg[i]
				byTime[d.Feeds[i].At.UnixNano()] = sugg[i]
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
			out[key] = sg
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
			case ok[i] || needs[i].ChoG > 0:
				out[key] = sugg[i]
			}
		}
	}
	return out
}

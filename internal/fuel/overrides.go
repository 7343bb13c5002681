package fuel

import (
	"fmt"
	"math"
	"time"
)

// applyFeedOverrides sets the dietitian's feed times and grams, then
// shares what is left of the day's grams over the feeds not overridden
// (protocol feeds keep their grams). When the overrides alone exceed the
// day's grams, the day grows to their sum and is marked overridden.
func (p *planner) applyFeedOverrides(d *Day, dp *dayPlan, fixed []bool) {
	any := false
	for i, o := range p.req.FeedOverrides {
		if o.Date != d.Date {
			continue
		}
		if p.feedOvState == nil {
			p.feedOvState = make([]string, len(p.req.FeedOverrides))
		}
		if o.Index >= len(d.Feeds) || o.Index >= len(fixed) {
			p.feedOvState[i] = fmt.Sprintf("Feed override %d for %s names feed %d, but the day has %d feeds; it was not applied.",
				i, d.Date, o.Index, len(d.Feeds))
			continue
		}
		f := &d.Feeds[o.Index]
		if f.Label == labelDuring {
			p.feedOvState[i] = fmt.Sprintf("Feed %d on %s is the in-event fuelling; change it with during_event_cho_g_per_h instead.", o.Index, d.Date)
			continue
		}
		p.feedOvState[i] = feedOvApplied
		if o.At != "" {
			if c, err := time.Parse("15:04", o.At); err == nil {
				f.At = clockOn(dp.date, c.Hour()*60+c.Minute())
			}
		}
		if o.ChoG != nil {
			f.ChoG = math.Round(*o.ChoG)
		}
		f.Overridden = true
		fixed[o.Index] = true
		any = true
	}
	if !any {
		return
	}
	var fixedSum, freeSum float64
	var weights [32]float64
	nFree := 0
	for i, f := range d.Feeds {
		if fixed[i] {
			fixedSum += f.ChoG
		} else {
			freeSum += f.ChoG
			nFree++
		}
	}
	left := d.ChoG - fixedSum
	if left < 0 || nFree == 0 {
		for i := range d.Feeds {
			if !fixed[i] {
				d.Feeds[i].ChoG = 0
			}
		}
		if d.ChoG != fixedSum {
			// The day grows to carry the overridden feeds; its g/kg is
			// rounded up and the few grams of rounding go to a feed that
			// is not overridden, when there is one.
			d.ChoGPerKg = ceil1(fixedSum / p.body.MassKg)
			d.ChoG = math.Round(d.ChoGPerKg * p.body.MassKg)
			extra := d.ChoG - fixedSum
			placed := false
			for i := range d.Feeds {
				if !d.Feeds[i].Overridden && d.Feeds[i].Label != labelDuring {
					d.Feeds[i].ChoG += extra
					placed = true
					break
				}
			}
			if !placed {
				// Every feed is fixed: the day is exactly their sum.
				d.ChoG = fixedSum
				d.ChoGPerKg = round1(fixedSum / p.body.MassKg)
			}
			d.Overridden = true
			if p.feedOnly[d.Date] {
				// A day inside the race is what its feeds carry, protein
				// and energy too: the daily protein target would put
				// grams on the day that no feed holds.
				p.dayIsItsFeeds(d, d.Feeds)
			} else {
				macros(d, p.body.MassKg, p.body.FFMKg, *d.ExerciseEnergyKcal, dp.loadDay)
			}
		}
	} else {
		w := weights[:0]
		for i, f := range d.Feeds {
			if !fixed[i] && len(w) < cap(weights) {
				if freeSum > 0 {
					w = append(w, f.ChoG)
				} else {
					w = append(w, 1)
				}
			}
		}
		var out [32]float64
		split(left, w, out[:len(w)])
		j := 0
		for i := range d.Feeds {
			if !fixed[i] && j < len(w) {
				d.Feeds[i].ChoG = out[j]
				j++
			}
		}
	}
	sortFeeds(d.Feeds, fixed)
	if p.plan.PreEventMeal != nil {
		for _, f := range d.Feeds {
			if f.Label == labelPreEvent && f.Overridden {
				p.plan.PreEventMeal.At = f.At
				p.plan.PreEventMeal.ChoG = f.ChoG
				p.plan.PreEventMeal.ChoGPerKg = round1(f.ChoG / p.body.MassKg)
				// A meal moved to or past the start is 0 h before it (and
				// outside the guideline, which its finding says).
				p.plan.PreEventMeal.HoursBefore = round1(max(0, p.evStart.Sub(f.At).Hours()))
			}
		}
	}
}

package fuel

import (
	"math"
	"time"
)

// eventDay plans the day of the event: the pre-event meal, the in-event
// fuelling, a recovery feed and ordinary meals away from the race.
func (p *planner) eventDay(date time.Time, rate float64) dayPlan {
	dp := p.trainingDay(date, RoleEvent)
	dp.fixed = dp.fixed[:0]
	dp.blocked = dp.blocked[:0]
	d := &dp.day
	eff, tm := dayLoad(p.sessionsOn(d.Date))
	eff += p.ev.ExpectedDurationMin * intensityFactor(p.evPct)
	tm += p.ev.ExpectedDurationMin
	b := bandFor(eff, tm)
	d.TrainingMin, d.LoadBand = tm, b.name
	d.BandMinGPerKg, d.BandMaxGPerKg = b.g.Min, b.g.Max
	d.ChoGPerKg = bandTarget(b, eff)
	mass := p.body.MassKg

	fixed := make([]Feed, 0, 3)
	clear := time.Duration(gMealClear.Min * float64(time.Minute))
	blockFrom := p.evStart.Add(-clear)
	if pm := p.preEventMeal(); pm != nil {
		if p.plan.PreEventMeal == nil || pm.At.Format("2006-01-02") == d.Date {
			// A meal on the day before keeps what its day made of it (a
			// feed override) when this day is rebuilt; one on this day is
			// overridden again as the day is built.
			p.plan.PreEventMeal = pm
		}
		fixed = append(fixed, Feed{At: pm.At, Label: labelPreEvent, ChoG: pm.ChoG, ProteinG: math.Round(gPreProtein.Min * gProteinMeal.Min * mass)})
		blockFrom = pm.At.Add(-clear)
	}
	de := p.duringEventPlan(rate)
	p.plan.DuringEvent = de
	if de.TotalChoG > 0 {
		fixed = append(fixed, Feed{At: p.feedStart(), Label: labelDuring, ChoG: de.TotalChoG})
	}
	blockTo := p.evEnd.Add(time.Duration(gDemandingMin.Max * float64(time.Hour)))
	if p.ev.ExpectedDurationMin >= gDuringSmall.Min {
		rec := p.evEnd.Add(time.Duration(gDemanding.Max * float64(time.Minute)))
		fixed = append(fixed, Feed{At: rec, Label: labelRecovery,
			ChoG: math.Round(gRecoveryFeed.Min * mass), ProteinG: math.Round(gProteinMeal.Min * mass)})
		blockTo = rec.Add(clear)
	}
	dp.fixed = fixed
	dp.blocked = append(dp.blocked, window{blockFrom, blockTo})
	// Raise the day target (inside the band) to carry the protocol feeds
	// that fall on this day.
	var sum float64
	for _, f := range fixed {
		if f.At.Format("2006-01-02") == d.Date {
			sum += f.ChoG
		}
	}
	need := math.Ceil(sum/mass*2) / 2
	if need > d.ChoGPerKg {
		d.ChoGPerKg = math.Min(need, b.g.Max)
	}
	d.Advice = []string{"Keep to foods and drinks already tried in training."}
	return dp
}

// keepOwn moves to the front the fixed feeds of a day plan that fall on
// its own date and returns how many there are.
func keepOwn(dp *dayPlan) int {
	next := dp.date.AddDate(0, 0, 1)
	n := 0
	for _, f := range dp.fixed {
		if !f.At.Before(dp.date) && f.At.Before(next) {
			dp.fixed[n] = f
			n++
		}
	}
	return n
}

// rehome moves each protocol feed to the plan day it falls on (a pre-event
// meal the evening before an event just after midnight, a recovery feed
// after midnight), with the windows that keep ordinary meals away from it;
// a feed beyond the plan's days is dropped. dps are consecutive days.
func rehome(dps []dayPlan) {
	for i := range dps {
		dp := &dps[i]
		var moved [4]Feed
		nm := 0
		next := dp.date.AddDate(0, 0, 1)
		for _, f := range dp.fixed {
			if (f.At.Before(dp.date) || !f.At.Before(next)) && nm < len(moved) {
				moved[nm] = f
				nm++
			}
		}
		if nm == 0 {
			continue
		}
		blocked := dp.blocked
		dp.fixed = dp.fixed[:keepOwn(dp)]
		for _, f := range moved[:nm] {
			// A feed after the plan's last day (a recovery feed after
			// midnight) is beyond the plan and goes.
			for j := range dps {
				o := &dps[j]
				if !f.At.Before(o.date) && f.At.Before(o.date.AddDate(0, 0, 1)) {
					o.fixed = append(o.fixed, f)
					o.blocked = append(o.blocked, blocked...)
					break
				}
			}
		}
	}
}

// gDuringFloor is the in-event g/h recommended before the stores are
// known: the floor of the duration's band.
func gDuringFloor(min float64) float64 {
	switch {
	case min <= gDuringSmall.Max:
		return 0
	case min <= gDuring3060Time.Max:
		return gDuring3060.Min
	}
	return gLongFloor.Min
}

// preEventMeal is 1 g/kg per hour before the start, 3 h before by
// default; only for events over 60 min. It is not put in the night hours
// (before 05:00) when the guideline's 1–4 h window allows: it moves later,
// to 05:00 when that is still an hour before the start, or else earlier,
// to the evening before (4 h before a start in the small hours). Only when
// the whole window lies in the night does it stay there, 1 h before, and a
// finding says so.
func (p *planner) preEventMeal() *PreEventMeal {
	if p.ev.ExpectedDurationMin <= gPreEventMin.Min {
		return nil
	}
	earliestMin := int(gPreEarliest.Min * 60)
	night := func(t time.Time) bool { return t.Hour()*60+t.Minute() < earliestMin }
	before := func(h float64) time.Time { return p.evStart.Add(-time.Duration(h * float64(time.Hour))) }
	h := gPreDefaultH.Min
	p.preMealNight = false
	if at := before(h); night(at) {
		switch later := clockOn(at, earliestMin); {
		case p.evStart.Sub(later).Hours() >= gPreEventHours.Min:
			h = math.Floor(p.evStart.Sub(later).Hours()*2) / 2
		case !night(before(gPreEventHours.Max)):
			h = gPreEventHours.Max
		default:
			h = gPreEventHours.Min
			p.preMealNight = true
		}
	}
	h = math.Max(gPreEventHours.Min, math.Min(gPreEventHours.Max, h))
	gkg := math.Max(gPreEventCho.Min, math.Min(gPreEventCho.Max, h))
	return &PreEventMeal{
		At:          before(h),
		HoursBefore: h,
		ChoGPerKg:   gkg,
		ChoG:        math.Round(gkg * p.body.MassKg),
	}
}

// duringEventPlan is the in-event plan at a g/h rate (or the override).
func (p *planner) duringEventPlan(rate float64) *DuringEvent {
	de := &DuringEvent{
		DurationMin: p.ev.ExpectedDurationMin,
		Band:        duringBand(p.ev.ExpectedDurationMin),
		EnergyKcal:  math.Round(p.evKcal),
		ChoShare:    math.Round(p.evShare*100) / 100,
		ChoUsedG:    math.Round(p.evUseGPH * p.evDurH),
	}
	if p.req.DuringEventChoGPerH != nil {
		rate = *p.req.DuringEventChoGPerH
		de.Overridden = true
	}
	de.ChoGPerH = rate
	de.TotalChoG = math.Round(rate * p.evDurH)
	p.fillSegments(de)
	return de
}

func duringBand(min float64) string {
	switch {
	case min <= gDuringNone.Max:
		return "none"
	case min < gDuringSmall.Max:
		return "small"
	case min <= gDuring3060Time.Max:
		return "30-60"
	}
	return "up-to-90"
}

// duringBandRange is the g/h range of a band.
func duringBandRange(band string) (lo, hi float64, src string) {
	switch band {
	case "none":
		return 0, 0, SrcACSM
	case "small":
		return gDuringSmallG.Min, gDuringSmallG.Max, SrcACSM
	case "30-60":
		return gDuring3060.Min, gDuring3060.Max, SrcACSMJeuk
	}
	return gDuringUpTo90.Min, gDuringUpTo90.Max, SrcACSMJeuk
}

// recoveryDay is the day after the event: daily needs by training load,
// at least the moderate band after an event over 90 min.
func (p *planner) recoveryDay(date time.Time) dayPlan {
	dp := p.trainingDay(date, RoleRecovery)
	d := &dp.day
	if p.ev.ExpectedDurationMin > gLoadingEvent.Min && d.BandMaxGPerKg < gBandModerate.Max {
		b := bands[2]
		d.LoadBand = b.name
		d.BandMinGPerKg, d.BandMaxGPerKg = b.g.Min, b.g.Max
		d.ChoGPerKg = b.g.Min
	}
	d.Advice = []string{"Refuel and rehydrate after the event; include protein at each meal."}
	return dp
}

// race plans the event day alone.
func (p *planner) race() {
	evDay := midnight(p.evStart, p.loc)
	dp := p.eventDay(evDay, gDuringFloor(p.ev.ExpectedDurationMin))
	// A pre-event meal the evening before, or a recovery feed after
	// midnight, belongs to the day it falls on: the plan then covers that
	// day too.
	dps := make([]dayPlan, 0, 3)
	if pm := p.plan.PreEventMeal; pm != nil && pm.At.Before(evDay) {
		// The day before carries the meal on top of its own training-load
		// target, as far as its band allows.
		prev := p.trainingDay(evDay.AddDate(0, 0, -1), RoleTraining)
		prev.day.ChoGPerKg = math.Min(prev.day.BandMaxGPerKg, prev.day.ChoGPerKg+pm.ChoGPerKg)
		dps = append(dps, prev)
	}
	dps = append(dps, dp)
	for _, f := range dp.fixed {
		if !f.At.Before(evDay.AddDate(0, 0, 1)) {
			dps = append(dps, p.recoveryDay(evDay.AddDate(0, 0, 1)))
			break
		}
	}
	dps = p.ultraExpand(dps)
	rehome(dps)
	p.plan.Days = make([]Day, len(dps))
	for i := range dps {
		p.plan.Days[i] = p.buildDay(&dps[i])
	}
	p.eventSimulation(evDay.AddDate(0, 0, -1), time.Time{}, evDay, false)
}

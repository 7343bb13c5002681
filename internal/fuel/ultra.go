package fuel

import (
	"math"
	"time"
)

// An event of over a day has no ordinary meal day inside it: the in-event
// plan carries the race through the night, in blocks of hours whose feeds
// fall on the day they are eaten; a recovery feed follows the finish, then
// the recovery day.

// RoleInRace is a plan day that lies (mostly) inside an event: its
// carbohydrate is the in-event feeds, checked per hour, not against a
// daily band.
const RoleInRace = "in-race"

// eventExtras holds what multi-sport legs, stage races, long events and
// long training sessions add to a computation.
type eventExtras struct {
	segs        []segFig
	pctFromPace bool
	paceVO2     float64

	stages     []Stage
	stageEvts  []Event
	stagePlans []StagePlan
	stageNotes []stageNote

	feedOnly map[string]bool // days whose figures are their in-event feeds
	lowSess  []sessionLow
}

// ultra reports whether the event lasts over a day.
func (p *planner) ultra() bool {
	return p.ev != nil && len(p.stages) == 0 && p.ev.ExpectedDurationMin > gUltraMin.Min
}

// ultraBlocks splits the event into blocks of hours at an in-event rate;
// a block whose middle falls in the night hours is marked.
func (p *planner) ultraBlocks(rate float64) []HourBlock {
	step := time.Duration(gUltraBlock.Min * float64(time.Hour))
	n := int(math.Ceil(p.evEnd.Sub(p.evStart).Hours() / gUltraBlock.Min))
	out := make([]HourBlock, 0, n)
	for t := p.evStart; t.Before(p.evEnd); t = t.Add(step) {
		to := t.Add(step)
		if to.After(p.evEnd) {
			to = p.evEnd
		}
		mid := t.Add(to.Sub(t) / 2).In(p.loc).Hour()
		out = append(out, HourBlock{
			From: t, To: to,
			Night:    mid >= int(gUltraNight.Min) || mid < int(gUltraNight.Max),
			ChoGPerH: rate,
			ChoG:     math.Round(rate * to.Sub(t).Hours()),
		})
	}
	return out
}

// ultraDay plans one day of an event over 24 h: the start day (pre-event
// meal, then the blocks), days inside the race (the blocks only) and the
// finish day (blocks, the recovery feed, then meals).
func (p *planner) ultraDay(date, evDay time.Time, rate float64) dayPlan {
	next := date.AddDate(0, 0, 1)
	var dp dayPlan
	if date.Equal(evDay) {
		dp = p.eventDay(date, rate)
		keep := dp.fixed[:0]
		for _, f := range dp.fixed {
			if f.Label == labelPreEvent {
				keep = append(keep, f)
			}
		}
		dp.fixed = keep
	} else {
		dp = dayPlan{date: date, day: Day{Date: date.Format("2006-01-02"), Role: RoleInRace}}
		_ = p.duringEventPlanFor(rate)
	}
	de := p.plan.DuringEvent
	de.Blocks = p.ultraBlocks(de.ChoGPerH)
	from, to := maxTime(p.evStart, date), minTime(p.evEnd, next)
	raceMin := math.Max(0, to.Sub(from).Minutes())
	for _, b := range de.Blocks {
		if !b.From.Before(date) && b.From.Before(next) && b.ChoG > 0 {
			dp.fixed = append(dp.fixed, Feed{At: b.From, Label: labelDuring, ChoG: b.ChoG})
		}
	}
	mass := p.body.MassKg
	d := &dp.day
	if !date.Equal(evDay) {
		eff, tm := dayLoad(p.sessionsOn(d.Date))
		eff += raceMin * intensityFactor(p.evPct)
		tm += raceMin
		b := bandFor(eff, tm)
		d.TrainingMin, d.LoadBand = tm, b.name
		d.BandMinGPerKg, d.BandMaxGPerKg = b.g.Min, b.g.Max
		d.ChoGPerKg = 0 // the day is its feeds, and the meals after the finish
		d.Advice = []string{"Inside the race: the in-event plan carries the day, night hours included; no ordinary meals while racing."}
	}
	if p.evEnd.Before(next) && !p.evEnd.Before(date) {
		// The finish: a recovery feed, then the rest of the day at the
		// lower end of the moderate band, pro rata.
		rec := p.evEnd.Add(30 * time.Minute)
		dp.fixed = append(dp.fixed, Feed{At: rec, Label: labelRecovery,
			ChoG: math.Round(gRecoveryFeed.Min * mass), ProteinG: math.Round(gProteinMeal.Min * mass)})
		dp.blocked = append(dp.blocked, window{date, rec.Add(90 * time.Minute)})
		if !date.Equal(evDay) {
			var sum float64
			for _, f := range dp.fixed {
				sum += f.ChoG
			}
			left := math.Max(0, next.Sub(rec).Hours()) / 24
			d.ChoGPerKg = round1(sum/mass + gBandModerate.Min*left)
			d.Advice = append(d.Advice, "After the finish: the recovery feed, then meals with protein; rehydrate.")
		}
	} else {
		dp.blocked = append(dp.blocked, window{maxTime(date, p.evStart.Add(-90*time.Minute)), next})
	}
	return dp
}

// duringEventPlanFor sets the plan's in-event figures at a rate without
// building the event day.
func (p *planner) duringEventPlanFor(rate float64) *DuringEvent {
	p.plan.DuringEvent = p.duringEventPlan(rate)
	return p.plan.DuringEvent
}

// ultraExpand replaces the event day and the days after it of an event
// over 24 h by its start day, the days inside the race and the finish day,
// then the recovery day.
func (p *planner) ultraExpand(dps []dayPlan) []dayPlan {
	if !p.ultra() {
		return dps
	}
	idx := -1
	for i := range dps {
		if dps[i].day.Role == RoleEvent {
			idx = i
			break
		}
	}
	if idx < 0 {
		return dps
	}
	evDay := dps[idx].date
	rate := p.plan.DuringEvent.ChoGPerH // an override is applied again inside
	endDay := midnight(p.evEnd, p.loc)
	out := append([]dayPlan{}, dps[:idx]...)
	for d := evDay; !d.After(endDay); d = d.AddDate(0, 0, 1) {
		out = append(out, p.ultraDay(d, evDay, rate))
	}
	out = append(out, p.recoveryDay(endDay.AddDate(0, 0, 1)))
	return out
}

// eventDayAt rebuilds the event's day plan for a date at a settled rate.
func (p *planner) eventDayAt(date string, evDay time.Time, rate float64) dayPlan {
	if p.ultra() {
		d, _ := time.ParseInLocation("2006-01-02", date, p.loc)
		return p.ultraDay(d, evDay, rate)
	}
	return p.eventDay(evDay, rate)
}

// eventKcalOn is the energy of the event (or its stages, or its part) on
// a plan day.
func (p *planner) eventKcalOn(d *Day) float64 {
	if p.ev == nil {
		return 0
	}
	if len(p.stageEvts) > 0 {
		var kcal float64
		for i := range p.stageEvts {
			e := &p.stageEvts[i]
			if e.StartsAt.In(p.loc).Format("2006-01-02") == d.Date {
				k, _ := EventEnergy(p.body, *e, stagePct(p.body, e))
				kcal += k
			}
		}
		return kcal
	}
	if p.ultra() && (d.Role == RoleEvent || d.Role == RoleInRace) {
		date, err := time.ParseInLocation("2006-01-02", d.Date, p.loc)
		if err != nil {
			return 0
		}
		from, to := maxTime(p.evStart, date), minTime(p.evEnd, date.AddDate(0, 0, 1))
		if !to.After(from) || p.evDurH <= 0 {
			return 0
		}
		return p.evKcal * to.Sub(from).Hours() / p.evDurH
	}
	if d.Role == RoleEvent {
		return p.evKcal
	}
	return 0
}

// inRaceOnly reports whether a day's feeds are only the race's: in-event
// fuelling and at most the pre-event meal.
func (p *planner) inRaceOnly(feeds []Feed) bool {
	during := false
	for _, f := range feeds {
		switch f.Label {
		case labelDuring:
			during = true
		case labelPreEvent:
		default:
			return false
		}
	}
	return during
}

// dayIsItsFeeds makes a day inside the race exactly what its feeds carry:
// no ordinary meal is invented in the middle of the race.
func (p *planner) dayIsItsFeeds(d *Day, feeds []Feed) {
	var cho, prot float64
	for _, f := range feeds {
		cho += f.ChoG
		prot += f.ProteinG
	}
	d.ChoG = cho
	// The g/kg follows the grams here, to as many decimals as keep
	// grams = g/kg × body mass to the gram.
	scale := math.Pow(10, math.Ceil(math.Log10(p.body.MassKg)))
	d.ChoGPerKg = math.Round(cho/p.body.MassKg*scale) / scale
	d.ProteinG = prot
	d.FatG = 0
	d.EnergyKcal = math.Round(AtwaterKcal(d.ChoG, d.ProteinG, d.FatG))
	if p.feedOnly == nil {
		p.feedOnly = map[string]bool{}
	}
	p.feedOnly[d.Date] = true
}

// restMealAt is where a day's remaining food goes when no ordinary
// occasion fits: after the event's finish that day when there is room,
// else at lunch time.
func (p *planner) restMealAt(dp *dayPlan) (time.Time, string) {
	next := dp.date.AddDate(0, 0, 1)
	for _, end := range p.eventEnds() {
		at := end.Add(time.Duration(gRestMeal.Min * float64(time.Minute)))
		if !end.Before(dp.date) && at.Before(next) {
			if float64(at.In(p.loc).Hour()) >= gRestMeal.Max {
				return at, "dinner"
			}
			return at, "lunch"
		}
	}
	return clockOn(dp.date, int(math.Round(gRestMealLunch.Min*60))), "lunch"
}

// eventEnds lists the finishes of the event (each stage's for a stage race).
func (p *planner) eventEnds() []time.Time {
	if p.ev == nil {
		return nil
	}
	if len(p.stageEvts) == 0 {
		return []time.Time{p.evEnd}
	}
	out := make([]time.Time, len(p.stageEvts))
	for i, e := range p.stageEvts {
		out[i] = e.StartsAt.In(p.loc).Add(time.Duration(e.ExpectedDurationMin * float64(time.Minute)))
	}
	return out
}

// mealsAfterEventMin is the least carbohydrate the ordinary occasions after
// an event's finish on a day must carry (a main meal 0.5 g/kg, a snack
// half), so that the event's feeds never leave them empty.
func (p *planner) mealsAfterEventMin(dp *dayPlan, slots []placedSlot) float64 {
	if dp.day.Role != RoleEvent && dp.day.Role != RoleInRace {
		return 0
	}
	var last time.Time
	next := dp.date.AddDate(0, 0, 1)
	for _, end := range p.eventEnds() {
		if !end.Before(dp.date) && end.Before(next) && end.After(last) {
			last = end
		}
	}
	if last.IsZero() {
		return 0
	}
	var w float64
	for _, s := range slots {
		if s.at.After(last) {
			w += s.weight
		}
	}
	return math.Round(w * gMealAfter.Min * p.body.MassKg)
}

// checkInRaceDay explains a day whose figures are the race's feeds.
func (p *planner) checkInRaceDay(d *Day) {
	p.find("in-race-day", LevelNote, "day:"+d.Date, SrcACSMJeuk,
		"%s lies inside the race: its %g g of carbohydrate are the in-event feeds (and any meal after the finish), checked per hour against the during-exercise guideline, not against a daily band; no ordinary meals are planned while racing.",
		d.Date, d.ChoG)
}

// checkBlocks explains the night hours of an event over 24 h.
func (p *planner) checkBlocks() {
	de := p.plan.DuringEvent
	if de == nil || len(de.Blocks) == 0 {
		return
	}
	nights := 0
	for _, b := range de.Blocks {
		if b.Night {
			nights++
		}
	}
	p.find("in-event-blocks", LevelNote, "during_event", SrcCommon,
		"The in-event plan runs in %d blocks of up to %g h at %g g/h; %d of them fall in the night hours (%g:00–0%g:00): keep feeding then, warm and easily digested, as appetite falls and sleepiness rises.",
		len(de.Blocks), gUltraBlock.Min, de.ChoGPerH, nights, gUltraNight.Min, gUltraNight.Max)
}

func maxTime(a, b time.Time) time.Time {
	if a.After(b) {
		return a
	}
	return b
}

func minTime(a, b time.Time) time.Time {
	if a.Before(b) {
		return a
	}
	return b
}

// duringEnd is when the in-event fuelling of a feed ends: its stage's
// finish, its block's end for an event over a day, else the finish.
func (p *planner) duringEnd(f Feed) time.Time {
	for i := range p.stageEvts {
		if p.stageEvts[i].StartsAt.Equal(f.At) {
			return p.stageEnd(i)
		}
	}
	if de := p.plan.DuringEvent; de != nil {
		for _, b := range de.Blocks {
			if b.From.Equal(f.At) {
				return b.To
			}
		}
	}
	return p.evEnd
}

package server

import (
	"fmt"
	"strconv"
	"time"

	"larder/internal/fuel"
	"larder/web"
)

// The phone page on a day of a race as it is raced: the stages that start
// today, the legs of today's multi-sport event and the blocks of hours of
// an event over a day. Every figure is the stored plan's, only formatted.

// raceToday is the race part of day d, or nil when the day has none;
// blockFood is the day's in-event feed of each block by its start (Unix
// seconds), whose food idea the block's line shows.
func raceToday(p linkPlan, d fuel.Day, blockFood map[int64]web.ClientFeed) *web.ClientRace {
	plan := p.Version.Result
	on := func(t time.Time) bool { return t.In(p.loc).Format(time.DateOnly) == d.Date }
	r := &web.ClientRace{Name: "Your race"}
	if p.eventName != "" {
		r.Name = p.eventName
	}
	for i, st := range plan.Stages {
		if on(st.StartsAt) {
			r.Stages = append(r.Stages, clientStage(p, i, st, i+1 < len(plan.Stages)))
		}
	}
	de := plan.DuringEvent
	ev := p.Version.Request.Event
	if de != nil && len(plan.Stages) == 0 {
		if ev != nil && on(ev.StartsAt) {
			for i, s := range de.Segments {
				l := web.ClientLeg{Number: strconv.Itoa(i + 1), Activity: s.Modality, From: raceClock(s.StartMin),
					To: raceClock(s.StartMin + s.DurationMin), Swim: s.Modality == "swim"}
				if s.ChoGPerH > 0 {
					l.GPerH, l.TotalG = web.Num(s.ChoGPerH, 0), web.Num(s.ChoG, 0)
				}
				r.Legs = append(r.Legs, l)
			}
		}
		for _, b := range de.Blocks {
			if on(b.From) {
				cb := web.ClientBlock{From: b.From.In(p.loc).Format("Mon 15:04"), To: b.To.In(p.loc).Format("Mon 15:04"),
					GPerH: web.Num(b.ChoGPerH, 0), ChoG: web.Num(b.ChoG, 0), Night: b.Night}
				if f, ok := blockFood[b.From.Unix()]; ok {
					cb.Suggestion, cb.Key = f.Suggestion, f.Key
				}
				r.Blocks = append(r.Blocks, cb)
			}
		}
		r.InRace = len(r.Blocks) > 0 && ev != nil && !on(ev.StartsAt)
	}
	if len(r.Stages) == 0 && len(r.Legs) == 0 && len(r.Blocks) == 0 {
		return nil
	}
	return r
}

// clientStage is stage i in the athlete's words.
func clientStage(p linkPlan, i int, st fuel.StagePlan, more bool) web.ClientStage {
	s := web.ClientStage{Number: strconv.Itoa(i + 1), Start: st.StartsAt.In(p.loc).Format("15:04"), Duration: hoursWords(st.DurationMin)}
	if m := st.PreEventMeal; m != nil {
		s.PreMeal = web.Num(m.ChoG, 0) + " g carbohydrate at " + m.At.In(p.loc).Format("15:04")
	} else if st.DurationMin > 60 && i > 0 {
		// The engine lets the refuelling after a close stage before stand
		// for the pre-stage meal.
		s.PreMeal = "the refuelling feeds after stage " + strconv.Itoa(i)
	}
	if de := st.DuringEvent; de != nil && de.ChoGPerH > 0 {
		s.GPerH, s.TotalG = web.Num(de.ChoGPerH, 0), web.Num(de.TotalChoG, 0)
	}
	if r := st.Repletion; r != nil && len(r.Feeds) > 0 {
		var total float64
		for _, f := range r.Feeds {
			total += f.ChoG
		}
		first := r.Feeds[0].At.In(p.loc).Format("15:04")
		switch {
		case r.Speedy:
			s.Refuel = fmt.Sprintf("refuel fast: %s g carbohydrate in %d feeds from %s, before the next stage (each is listed below).", web.Num(total, 0), len(r.Feeds), first)
		case more:
			s.Refuel = "a recovery feed at " + first + " (" + web.Num(total, 0) + " g carbohydrate), then the day's meals."
		default:
			s.Refuel = "a recovery feed at " + first + " (" + web.Num(total, 0) + " g carbohydrate), then the recovery day."
		}
	}
	return s
}

// blockStarts reports whether an hour block of the plan's event starts at t.
func blockStarts(p linkPlan, t time.Time) bool {
	de := p.Version.Result.DuringEvent
	if de == nil || len(p.Version.Result.Stages) > 0 {
		return false
	}
	for _, b := range de.Blocks {
		if b.From.Equal(t) {
			return true
		}
	}
	return false
}

// raceClock writes minutes of race time as h:mm.
func raceClock(min float64) string {
	m := int(min + 0.5)
	return fmt.Sprintf("%d:%02d", m/60, m%60)
}

// raceFeedLabel names an in-event feed of a stage or an hour block; ok is
// false for the single event's in-event total.
func raceFeedLabel(p linkPlan, f fuel.Feed) (string, bool) {
	plan := p.Version.Result
	for i, st := range plan.Stages {
		if st.StartsAt.Equal(f.At) {
			return "During stage " + strconv.Itoa(i+1) + " (in all)", true
		}
	}
	if de := plan.DuringEvent; de != nil {
		for _, b := range de.Blocks {
			if b.From.Equal(f.At) {
				return "During the race, " + b.From.In(p.loc).Format("15:04") + " to " + b.To.In(p.loc).Format("15:04") + " (in all)", true
			}
		}
	}
	return "", false
}

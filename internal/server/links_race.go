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
// inEvent is the day's in-event feeds by their start (Unix seconds): a
// stage's box and a block's line show their feed's food idea, and mark
// the feed in shown so that it is not listed again.
func raceToday(p linkPlan, d fuel.Day, inEvent map[int64]web.ClientFeed, shown map[string]bool) *web.ClientRace {
	plan := p.Version.Result
	on := func(t time.Time) bool { return t.In(p.loc).Format(time.DateOnly) == d.Date }
	r := &web.ClientRace{Name: "Your race"}
	if p.eventName != "" {
		r.Name = p.eventName
	}
	for i, st := range plan.Stages {
		if on(st.StartsAt) {
			cs := clientStage(p, i, st, i+1 < len(plan.Stages))
			if f, ok := inEvent[st.StartsAt.Unix()]; ok && cs.GPerH != "" {
				cs.Suggestion, cs.Key = f.Suggestion, f.Key
				shown[f.Key] = true
			}
			r.Stages = append(r.Stages, cs)
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
				if f, ok := inEvent[b.From.Unix()]; ok {
					cb.Suggestion, cb.Key = f.Suggestion, f.Key
					shown[f.Key] = true
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
		s.PreMeal = "your pre-stage meal at " + m.At.In(p.loc).Format("15:04") + " (in the feeding times below)"
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
			s.Refuel = "a recovery feed at " + first + " (in the feeding times below), then the day's meals."
		default:
			s.Refuel = "a recovery feed at " + first + " (in the feeding times below), then the recovery day."
		}
	}
	return s
}

// raceClock writes minutes of race time as h:mm.
func raceClock(min float64) string {
	m := int(min + 0.5)
	return fmt.Sprintf("%d:%02d", m/60, m%60)
}

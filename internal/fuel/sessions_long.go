package fuel

import (
	"math"
	"time"
)

// Long training sessions in week and loading plans: a session of 90 min
// or more gets a pre-session meal and in-session carbohydrate at the floor
// of its during-exercise band (30 g/h up to 2.5 h, 60 g/h beyond), shown
// as feeds in the session's window, unless the dietitian marked it train
// low; the simulation eats that carbohydrate through the session and a
// finding says when the liver or working muscle runs low in one.

const (
	labelPreSession    = "pre-session meal"
	labelDuringSession = "during session"
)

// sessionLow is a long session at whose end the model's stores are low.
type sessionLow struct {
	start            time.Time
	durMin           float64
	liverG, liverCap float64
	dw               float64
	trainLow         bool
}

// longSession reports whether a session gets the long-session fuelling.
func (p *planner) longSession(s sessionInfo) bool {
	return s.durMin >= gLongSession.Min && (p.req.Kind == KindWeek || p.req.Kind == KindLoading)
}

// sessionRate is the in-session g/h (0 when not long or train low).
func (p *planner) sessionRate(s sessionInfo) float64 {
	if !p.longSession(s) || s.trainLow {
		return 0
	}
	return gDuringFloor(s.durMin)
}

// sessionFuel adds the feeds of a day's long sessions.
func (p *planner) sessionFuel(dp *dayPlan) {
	mass := p.body.MassKg
	var sum float64
	var busyUntil time.Time // end of the last fuelled session
	for _, s := range p.sessionsOn(dp.day.Date) {
		if !p.longSession(s) {
			continue
		}
		if s.start.Before(busyUntil) {
			// Overlaps a session already fuelled (a log of sessions done
			// together): its feeds cover this one too.
			continue
		}
		sf := SessionFuel{Start: s.start, DurationMin: s.durMin, Modality: s.modality, TrainLow: s.trainLow}
		if s.trainLow {
			dp.day.Advice = append(dp.day.Advice, "The "+itoa(int(s.durMin))+"-min session at "+s.start.Format("15:04")+
				" is marked train low: deliberately unfuelled, with no pre-session meal and no carbohydrate during it.")
			dp.day.Sessions = append(dp.day.Sessions, sf)
			continue
		}
		// The meal about 2 h before; before an early start (meal before
		// 05:00) a smaller one 1 h before.
		h := gSessionPre.Max
		pre := s.start.Add(-time.Duration(h * float64(time.Hour)))
		if pre.Hour()*60+pre.Minute() < int(gPreEarliest.Min*60) || pre.Before(dp.date) {
			h = gPreEventHours.Min
			pre = s.start.Add(-time.Hour)
		}
		end := s.start.Add(time.Duration(s.durMin * float64(time.Minute)))
		busyUntil = end
		if !pre.Before(dp.date) {
			sf.PreSessionChoG = math.Round(gSessionPre.Min * mass)
			dp.fixed = append(dp.fixed, Feed{At: pre, Label: labelPreSession, ChoG: sf.PreSessionChoG,
				ProteinG: math.Round(gPreProtein.Min * gProteinMeal.Min * mass)})
			dp.blocked = append(dp.blocked, window{pre.Add(-time.Duration(gMealClear.Min * float64(time.Minute))), end})
			sum += sf.PreSessionChoG
		}
		sf.ChoGPerH = gDuringFloor(s.durMin)
		sf.ChoG = math.Round(sf.ChoGPerH * s.durMin / 60)
		if sf.ChoG > 0 {
			dp.fixed = append(dp.fixed, Feed{At: s.start, Label: labelDuringSession, ChoG: sf.ChoG})
			sum += sf.ChoG
		}
		dp.day.Sessions = append(dp.day.Sessions, sf)
	}
	if sum == 0 {
		return
	}
	for _, f := range dp.fixed {
		if f.Label == labelRecovery {
			sum += f.ChoG
		}
	}
	if limit := dp.day.BandMaxGPerKg * mass; sum > limit {
		// The sessions' feeds would take the day over its band: the day's
		// ordinary meals before a session stand in for its pre-session
		// meal, and the in-session grams shrink to what the band leaves.
		keep := dp.fixed[:0]
		for _, f := range dp.fixed {
			if f.Label == labelPreSession {
				sum -= f.ChoG
				continue
			}
			keep = append(keep, f)
		}
		dp.fixed = keep
		var during float64
		for i := range dp.day.Sessions {
			dp.day.Sessions[i].PreSessionChoG = 0
			during += dp.day.Sessions[i].ChoG
		}
		if sum > limit && during > 0 {
			f := math.Max(0, 1-(sum-limit)/during)
			for i := range dp.fixed {
				if dp.fixed[i].Label == labelDuringSession {
					dp.fixed[i].ChoG = math.Floor(dp.fixed[i].ChoG * f)
				}
			}
			for i := range dp.day.Sessions {
				s := &dp.day.Sessions[i]
				s.ChoG = math.Floor(s.ChoG * f)
				s.ChoGPerH = round1(s.ChoG / (s.DurationMin / 60))
			}
			sum = limit
		}
	}
	if need := math.Ceil(sum/mass*2) / 2; need > dp.day.ChoGPerKg && !dp.loadDay {
		dp.day.ChoGPerKg = math.Min(need, dp.day.BandMaxGPerKg)
	}
}

// simulateSessions runs the simulation as simulate does, stopping at the
// end of each long session (on the 5-minute grid) to note low stores.
func (p *planner) simulateSessions(s simState, from, to int64, ex []exercise, in []intake, curve *[]GlycogenPoint) simState {
	const grid = int64(simStep / time.Second)
	t := from
	for _, ses := range p.sessions {
		if !p.longSession(ses) {
			continue
		}
		end := ses.start.Unix() + int64(ses.durMin*60)
		e := from + (end-from+grid-1)/grid*grid
		if e <= t || e > to {
			continue
		}
		s = p.sb.simulate(s, t, e, ex, in, curve, 3600, p.loc)
		t = e
		if s.LiverG < gSessionLow.Min*p.sb.liverCapG || s.Dw < gDepleted.Max {
			p.lowSess = append(p.lowSess, sessionLow{ses.start, ses.durMin, s.LiverG, p.sb.liverCapG, s.Dw, ses.trainLow})
		}
	}
	return p.sb.simulate(s, t, to, ex, in, curve, 3600, p.loc)
}

// checkSessions reports the long sessions' fuelling and low stores.
func (p *planner) checkSessions() {
	for _, d := range p.plan.Days {
		for _, sf := range d.Sessions {
			subj := "day:" + d.Date
			if sf.TrainLow {
				p.find("session-train-low", LevelNote, subj, SrcCommon,
					"The %g-min session at %s is marked train low by the dietitian: deliberately unfuelled.",
					sf.DurationMin, sf.Start.Format("15:04"))
				continue
			}
			band := duringBand(sf.DurationMin)
			lo, hi, src := duringBandRange(band)
			lvl, word := LevelOK, "inside"
			if !inRange(sf.ChoGPerH, lo, hi) {
				lvl, word = LevelOutside, "outside"
			}
			p.find("session-fuel", lvl, subj, src,
				"The %g-min session at %s: pre-session meal of %g g and %g g/h during it (%g g), %s %g–%g g/h for its duration.",
				sf.DurationMin, sf.Start.Format("15:04"), sf.PreSessionChoG, sf.ChoGPerH, sf.ChoG, word, lo, hi)
		}
	}
	for _, l := range p.lowSess {
		lvl, tail := LevelCaution, "add carbohydrate before or during it, or shorten it"
		if l.trainLow {
			lvl, tail = LevelNote, "as a train-low session intends; keep it supervised and occasional"
		}
		p.find("session-stores-low", lvl, "day:"+l.start.Format("2006-01-02"), SrcModel,
			"By the end of the %g-min session at %s the model's liver glycogen is about %.0f g of %.0f g and working-muscle glycogen about %.0f mmol/kg (depleted is %g–%g): %s.",
			l.durMin, l.start.Format("15:04"), l.liverG, l.liverCap, l.dw, gDepleted.Min, gDepleted.Max, tail)
	}
}

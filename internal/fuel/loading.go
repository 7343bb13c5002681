package fuel

import (
	"time"
)

func loadDaysOf(protocol string) int {
	switch protocol {
	case ProtocolOneDay:
		return 1
	case ProtocolThreeDay:
		return 3
	}
	return 2
}

func (p *planner) taperDays() int {
	n := p.req.TaperDays
	if n == 0 {
		n = int(gTaperDays.Min)
	}
	return n
}

// loading plans the taper, the load days, the event day and the day after.
func (p *planner) loading() {
	proto := p.req.Protocol
	if proto == "" {
		proto = ProtocolTwoDay
		p.find("protocol-default", LevelNote, "plan", SrcACSM,
			"No protocol was given; the two-day protocol (36–48 h at 10–12 g/kg) is used.")
	}
	p.plan.Protocol = proto
	nLoad := loadDaysOf(proto)
	taper := max(p.taperDays(), nLoad)
	evDay := midnight(p.evStart, p.loc)
	first := evDay.AddDate(0, 0, -taper)
	dates := dateSeq(first, taper+2)
	dps := make([]dayPlan, len(dates))
	for i, dt := range dates {
		before := taper - i // days before the event
		switch {
		case before > nLoad:
			dps[i] = p.trainingDay(dt, RoleTaper)
		case before > 0:
			dps[i] = p.loadDay(dt, proto, before == nLoad)
		case before == 0:
			dps[i] = p.eventDay(dt, gDuringFloor(p.ev.ExpectedDurationMin))
		default:
			dps[i] = p.recoveryDay(dt)
		}
	}
	if p.ev.ExpectedDurationMin <= gLoadingEvent.Min { // loading suits events *over* 90 min
		p.find("loading-not-needed", LevelNote, "plan", SrcACSM,
			"Carbohydrate loading is for events over %.0f min; this event is expected to last %.0f min. "+
				"Fuelling up with %.0f–%.0f g/kg in the 24 h before is enough.",
			gLoadingEvent.Min, p.ev.ExpectedDurationMin, gFuellingUp.Min, gFuellingUp.Max)
	} else {
		p.find("loading-event-long", LevelOK, "plan", SrcACSM,
			"The event is expected to last %.0f min, over %.0f min, so carbohydrate loading suits it.",
			p.ev.ExpectedDurationMin, gLoadingEvent.Min)
	}
	dps = p.ultraExpand(dps)
	rehome(dps)
	p.plan.Days = make([]Day, len(dps))
	for i := range dps {
		p.plan.Days[i] = p.buildDay(&dps[i])
	}
	p.eventSimulation(first, dates[taper-nLoad], evDay, true)
	if proto == ProtocolOneDay {
		// Say what the model reaches, not what the studies did: the
		// loaded band only when the start-line density is inside it.
		reach := "stays below the loaded band"
		if p.startDensity >= gLoaded.Min {
			reach = "is in the loaded band"
		}
		p.find("one-day-loading", LevelNote, "plan", SrcBussau,
			"One-day loading: about %.0f g/kg in 24 h with rest, after a short intense bout. Here the working muscle reaches about %.0f mmol/kg at the start, which %s (%.0f–%.0f+ mmol/kg).",
			gLoadingOneDay.Min, p.startDensity, reach, gLoaded.Min, gLoaded.Max)
		// The protocol starts with the bout: look for a short, hard
		// session on the load day.
		loadDate := dates[taper-nLoad].Format("2006-01-02")
		bout := false
		for _, s := range p.sessionsOn(loadDate) {
			bout = bout || (s.durMin <= gShortBout.Max && s.pct >= gShortBout.Min)
		}
		if !bout {
			p.find("one-day-bout", LevelNote, "day:"+loadDate, SrcBussau,
				"No short intense bout (at most %g min at %g%% of VO2max or more) is logged on the load day %s; one-day loading was studied after one.",
				gShortBout.Max, gShortBout.Min, loadDate)
		}
	}
}

// loadDay plans one day of a loading protocol.
func (p *planner) loadDay(date time.Time, proto string, firstLoadDay bool) dayPlan {
	dp := p.trainingDay(date, RoleLoad)
	dp.loadDay = true
	d := &dp.day
	d.BandMinGPerKg, d.BandMaxGPerKg = gLoadingTwoDay.Min, gLoadingTwoDay.Max
	d.ChoGPerKg = gLoadOther.Min
	if proto == ProtocolTwoDay {
		d.ChoGPerKg = gLoadTwoDay.Min
	}
	d.LowFibre = true
	d.Advice = make([]string, 0, 3)
	d.Advice = append(d.Advice,
		"Choose low-fibre, low-fat carbohydrate foods (white bread, rice, pasta, juice, sports drinks) to reach the target without gut upset.",
		"Spread the carbohydrate over every eating occasion; drink enough fluid.")
	if proto == ProtocolOneDay && firstLoadDay {
		d.Advice = append(d.Advice, "Start the load day with the short, intense bout planned with the coach, then rest.")
	}
	return dp
}

package fuel

import (
	"math"
	"time"
)

// startState is the assumed state at midnight before the first day of a
// simulation: typical muscle glycogen density, the working muscle last
// exercised a day before (model.start-since-exercise), and the liver and gut as a
// usual day of a trained athlete leaves them (the moderate band's lower
// end, 5 g/kg, over the default eating occasions): the fed liver of the
// evening (100–120 g at 70 kg, common practice) a few hours into the
// night's fast, the last of the evening meal still being absorbed, and
// that day's intake as the recent intake resting synthesis answers to.
// Computed once per plan.
func (p *planner) startState() simState {
	if p.haveStart {
		return p.start
	}
	s := simState{Dw: gModelTypical.Min, Do: gModelTypical.Min, LiverG: p.sb.liverCapG,
		IntakeGPerH: gBandModerate.Min * p.body.MassKg / 24}.since(gStartSince.Min)
	sched := scheduleFor(p.occasions)
	var w, g [16]float64
	var in [16]intake
	ns := min(len(sched), len(w))
	for i := 0; i < ns; i++ {
		w[i] = sched[i].weight
	}
	split(gBandModerate.Min*p.body.MassKg, w[:ns], g[:ns])
	for i := 0; i < ns; i++ {
		in[i] = intake{at: int64(sched[i].hhmm) * 60, g: g[i]}
	}
	s = p.sb.simulate(s, 0, 24*3600, nil, in[:ns], nil, 3600, time.UTC)
	s.Dw, s.Do = gModelTypical.Min, gModelTypical.Min
	p.start, p.haveStart = s.since(gStartSince.Min), true
	return p.start
}

// exercises lists the training sessions in [from, to) as simulation bouts.
func (p *planner) exercises(from, to int64) []exercise {
	out := make([]exercise, 0, len(p.sessions)+1)
	for _, s := range p.sessions {
		st := s.start.Unix()
		en := st + int64(s.durMin*60)
		if en <= from || st >= to || s.durMin <= 0 {
			continue
		}
		use := s.kcalPerH(p.body) * ChoShare(s.pct) / gAtwaterCho.Min
		out = append(out, exercise{start: st, end: en, choUseGPerH: use, cover: coverShare(s.pct), intakeGPerH: p.sessionRate(s),
			recruit: recruitShare(s.pct)})
	}
	return out
}

// intakes lists the feeds of days before `to` (in-event fuelling excluded:
// the race model eats it continuously).
func (p *planner) intakes(days []Day, to int64) []intake {
	n := 0
	for _, d := range days {
		n += len(d.Feeds)
	}
	out := make([]intake, 0, n)
	for _, d := range days {
		for _, f := range d.Feeds {
			if f.Label == labelDuring || f.Label == labelDuringSession || f.At.Unix() >= to {
				continue
			}
			out = append(out, intake{at: f.At.Unix(), g: f.ChoG})
		}
	}
	// feeds are sorted within a day; days are in order
	for i := 1; i < len(out); i++ {
		for j := i; j > 0 && out[j].at < out[j-1].at; j-- {
			out[j], out[j-1] = out[j-1], out[j]
		}
	}
	return out
}

// usualIntakes spreads each day's training-load target (the athlete's usual
// intake) over the default schedule, for the comparison with the plan.
func (p *planner) usualIntakes(days []Day, until int64) []intake {
	sched := scheduleFor(p.occasions)
	out := make([]intake, 0, len(days)*len(sched))
	var w [16]float64
	var g [16]float64
	ns := min(len(sched), len(w))
	for i := 0; i < ns; i++ {
		w[i] = sched[i].weight
	}
	for _, d := range days {
		date, err := time.ParseInLocation("2006-01-02", d.Date, p.loc)
		if err != nil {
			continue
		}
		// The day as this engine plans a training day: its band's target,
		// raised for adequate energy availability.
		sess := p.sessionsOn(d.Date)
		eff, tm := dayLoad(sess)
		b := bandFor(eff, tm)
		ud := Day{BandMaxGPerKg: b.g.Max, ChoGPerKg: bandTarget(b, eff)}
		ud.ChoG = math.Round(ud.ChoGPerKg * p.body.MassKg)
		var exKcal float64
		for _, s := range sess {
			exKcal += s.kcalPerH(p.body) * s.durMin / 60
		}
		macros(&ud, p.body.MassKg, p.body.FFMKg, exKcal, false)
		p.raiseForEnergy(&ud, exKcal, false)
		split(ud.ChoG, w[:ns], g[:ns])
		for i := 0; i < ns; i++ {
			at := clockOn(date, sched[i].hhmm).Unix()
			if at < until {
				out = append(out, intake{at: at, g: g[i]})
			}
		}
	}
	return out
}

// eventSimulation runs the stores from `first` to the start line, settles
// the in-event g/h from them, and fills the glycogen figures. loadStart is
// the first load day (zero for a race plan); evDay is the event day.
func (p *planner) eventSimulation(first, loadStart, evDay time.Time, loading bool) {
	from := first.Unix()
	start := p.evStart.Unix()
	dayStart := evDay.Unix()
	ex := p.exercises(from, start)
	in := p.intakes(p.plan.Days, start)
	usualBefore := !loading && (len(p.plan.Days) == 0 || p.plan.Days[0].Date != first.Format("2006-01-02"))
	if usualBefore {
		// A race plan: the day before follows the usual intake.
		in = append(p.usualIntakes([]Day{{Date: first.Format("2006-01-02")}}, dayStart), in...)
	}
	curve := make([]GlycogenPoint, 0, (start-from)/3600+2)
	s0 := p.startState()
	var sLoad simState
	if loading {
		sLoad = p.simulateSessions(s0, from, loadStart.Unix(), ex, in, &curve)
		s0 = p.sb.simulate(sLoad, loadStart.Unix(), dayStart, ex, in, &curve, 3600, p.loc)
	} else {
		s0 = p.sb.simulate(s0, from, dayStart, ex, in, &curve, 3600, p.loc)
	}
	mark := len(curve)
	sStart := p.sb.simulate(s0, dayStart, start, ex, in, &curve, 3600, p.loc)

	// Settle the in-event rate from the stores at the start line, then
	// rebuild the event day's feeds for it and re-run the event day.
	if !p.plan.DuringEvent.Overridden {
		if rate := p.neededRate(sStart); rate != p.plan.DuringEvent.ChoGPerH {
			for i := range p.plan.Days {
				if r := p.plan.Days[i].Role; r == RoleEvent || r == RoleInRace {
					dp := p.eventDayAt(p.plan.Days[i].Date, evDay, rate)
					dp.fixed = dp.fixed[:keepOwn(&dp)] // feeds on other days stay there
					p.plan.Days[i] = p.buildDay(&dp)
				}
			}
			in = p.intakes(p.plan.Days, start)
			if usualBefore {
				in = append(p.usualIntakes([]Day{{Date: first.Format("2006-01-02")}}, dayStart), in...)
			}
			curve = curve[:mark]
			sStart = p.sb.simulate(s0, dayStart, start, ex, in, &curve, 3600, p.loc)
		}
	}
	de := p.plan.DuringEvent
	curve = append(curve, p.sb.point(sStart, start, p.loc))

	g := &Glycogen{
		MuscleGStart:                math.Round(p.sb.muscleG(sStart)),
		WorkingMuscleGStart:         math.Round(p.sb.workingG(sStart)),
		WorkingMuscleMmolPerKgStart: round1(sStart.Dw),
		LiverGStart:                 math.Round(sStart.LiverG),
		MuscleGCapacity:             math.Round(GlycogenG(gModelCapacity.Min, p.body.SkeletalKg)),
		Curve:                       curve,
	}
	outH, _ := p.raceOut(sStart, 0)
	g.RunsOutAtMin, g.RunsOutAtKm = p.runsOut(outH)
	outH2, _ := p.raceOut(sStart, de.ChoGPerH)
	g.RunsOutWithIntakeAtMin, g.RunsOutWithIntakeAtKm = p.runsOut(outH2)
	p.plan.Glycogen = g
	p.startDensity = sStart.Dw
	p.segmentRunsOut(sStart)

	if loading {
		// The usual intake instead of the load, for comparison.
		usual := p.usualIntakes(p.plan.Days, start)
		us := p.sb.simulate(p.startState(), from, start, ex, usual, nil, 3600, p.loc)
		u := math.Round(p.sb.muscleG(us))
		g.UsualIntakeMuscleGStart = &u
		// The gain a dietitian explains is the glycogen the load adds to
		// the athlete's usual state at the start line, with 3–4 g of water
		// per g (Olsson & Saltin; Shiose 2023).
		p.massGainG = math.Max(0, (p.sb.muscleG(sStart)+sStart.LiverG)-(p.sb.muscleG(us)+us.LiverG))
		lo := math.Round(p.massGainG*(1+gWater.Min)/100) / 10
		hi := math.Round(p.massGainG*(1+gWater.Max)/100) / 10
		p.plan.ExpectedMassGainKg, p.plan.ExpectedMassGainKgMax = &lo, &hi
	}
}

// neededRate is the in-event g/h: the least (in steps of during.rate-step) that keeps
// the stores from running out before the finish, held inside the band for
// the event's duration (never above 90 g/h).
func (p *planner) neededRate(s simState) float64 {
	band := duringBand(p.ev.ExpectedDurationMin)
	lo, hi, _ := duringBandRange(band)
	floor := gDuringFloor(p.ev.ExpectedDurationMin)
	if band == "none" {
		return 0
	}
	if band == "small" {
		lo = 0
	}
	lasts := func(rate float64) bool {
		out, _ := p.raceOut(s, rate)
		return out < 0
	}
	if lasts(0) {
		return math.Max(floor, lo)
	}
	// binary search over multiples of the step in [lo, hi]
	step := gRateStep.Min
	a, b := int(lo/step), int(hi/step)
	if !lasts(float64(b) * step) {
		return hi
	}
	for a < b {
		m := (a + b) / 2
		if lasts(float64(m) * step) {
			b = m
		} else {
			a = m + 1
		}
	}
	return math.Max(floor, float64(a)*step)
}

// runsOut turns hours into the event into minutes and km (null if never).
func (p *planner) runsOut(h float64) (min, km *float64) {
	if h < 0 {
		return nil, nil
	}
	m := math.Round(h * 60)
	min = &m
	// A multi-sport event gives the distance per leg instead.
	if p.ev.DistanceKm != nil && p.evDurH > 0 && len(p.segs) == 0 {
		k := round1(h / p.evDurH * *p.ev.DistanceKm)
		km = &k
	}
	return min, km
}

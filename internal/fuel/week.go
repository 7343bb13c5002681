package fuel

import (
	"math"
	"time"
)

// week plans days by training load.
func (p *planner) week() {
	var first time.Time
	if p.req.StartDate != "" {
		first, _ = time.ParseInLocation("2006-01-02", p.req.StartDate, p.loc)
	} else {
		first = midnight(p.sessions[0].start, p.loc)
	}
	n := p.req.Days
	if n == 0 {
		n = 7
	}
	p.plan.Days = make([]Day, n)
	dps := make([]dayPlan, n)
	for i, dt := range dateSeq(first, n) {
		dps[i] = p.trainingDay(dt, RoleTraining)
	}
	rehome(dps)
	for i := range dps {
		p.plan.Days[i] = p.buildDay(&dps[i])
	}
	from := first.Unix()
	to := first.AddDate(0, 0, n).Unix()
	curve := make([]GlycogenPoint, 0, (to-from)/3600+2)
	ex := p.exercises(from, to)
	in := p.intakes(p.plan.Days, to)
	s := p.simulateSessions(p.startState(), from, to, ex, in, &curve)
	curve = append(curve, p.sb.point(s, to, p.loc))
	p.plan.Glycogen = &Glycogen{
		MuscleGStart:                math.Round(p.sb.muscleG(s)),
		WorkingMuscleGStart:         math.Round(p.sb.workingG(s)),
		WorkingMuscleMmolPerKgStart: round1(s.Dw),
		LiverGStart:                 math.Round(s.LiverG),
		MuscleGCapacity:             math.Round(GlycogenG(gModelCapacity.Min, p.body.SkeletalKg)),
		Curve:                       curve,
	}
	p.find("week-glycogen", LevelNote, "glycogen", SrcModel,
		"For a week plan the glycogen figures are the expected state at the end of the last day: muscle about %.0f g, liver about %.0f g.",
		p.plan.Glycogen.MuscleGStart, p.plan.Glycogen.LiverGStart)
}

// trainingDay plans a day by its training load.
func (p *planner) trainingDay(date time.Time, role string) dayPlan {
	ds := date.Format("2006-01-02")
	eff, tm := dayLoad(p.sessionsOn(ds))
	b := bandFor(eff, tm)
	dp := dayPlan{date: date, day: Day{
		Date: ds, Role: role, TrainingMin: tm, LoadBand: b.name,
		BandMinGPerKg: b.g.Min, BandMaxGPerKg: b.g.Max, ChoGPerKg: bandTarget(b, eff),
	}}
	for _, s := range p.sessionsOn(ds) {
		if s.pct >= gDemanding.Min || s.durMin >= gDemandingMin.Min {
			// a demanding session: a recovery feed soon after it
			end := s.start.Add(time.Duration(s.durMin * float64(time.Minute)))
			dp.fixed = append(dp.fixed, Feed{At: end.Add(time.Duration(gDemanding.Max * float64(time.Minute))), Label: labelRecovery,
				ChoG: math.Round(gRecoveryFeed.Min * p.body.MassKg), ProteinG: math.Round(gProteinMeal.Min * p.body.MassKg)})
			dp.blocked = append(dp.blocked, window{end, end.Add(time.Duration(gDemandingMin.Max * float64(time.Hour)))})
		}
	}
	p.sessionFuel(&dp)
	return dp
}

// days lists dates from first for n days.
func dateSeq(first time.Time, n int) []time.Time {
	out := make([]time.Time, n)
	for i := range out {
		out[i] = first.AddDate(0, 0, i)
	}
	return out
}

func midnight(t time.Time, loc *time.Location) time.Time {
	t = t.In(loc)
	y, m, d := t.Date()
	return time.Date(y, m, d, 0, 0, 0, 0, loc)
}

package fuel

import (
	"math"
	"time"
)

// repletion plans the refuelling between session_end and next_start.
func (p *planner) repletion() {
	end := p.req.SessionEnd.In(p.loc)
	next := p.req.NextStart.In(p.loc)
	gapH := next.Sub(end).Hours()
	mass := p.body.MassKg
	r := &Repletion{GapH: round1(gapH), Feeds: []Feed{}}
	r.Speedy = gapH < gSpeedyGap.Min
	var windowEnd time.Time
	if r.Speedy {
		r.ChoGPerKgPerH = math.Round((gRepletionRate.Min+gRepletionRate.Max)/2*10) / 10
		winH := math.Min(gRepletionWin.Min, gapH)
		p.repWinH = winH
		windowEnd = end.Add(time.Duration(winH * float64(time.Hour)))
		every := time.Duration(gRefuelEvery.Min * float64(time.Minute))
		n := int(math.Ceil(winH / every.Hours()))
		if n < 1 {
			n = 1
		}
		total := math.Round(r.ChoGPerKgPerH * mass * winH)
		var w, g [16]float64
		n = min(n, len(w))
		for i := 0; i < n; i++ {
			w[i] = 1
		}
		split(total, w[:n], g[:n])
		r.Feeds = make([]Feed, n)
		for i := 0; i < n; i++ {
			r.Feeds[i] = Feed{At: end.Add(time.Duration(i) * every), Label: labelRefuel, ChoG: g[i]}
		}
		r.Feeds[0].ProteinG = math.Round(gRepletionProt.Min * mass)
	}
	// Days from the session's end to the next start.
	first := midnight(end, p.loc)
	last := midnight(next, p.loc)
	nDays := int(math.Round(last.Sub(first).Hours()/24)) + 1
	p.plan.Days = make([]Day, nDays)
	blocked := []window{{end, windowEnd}, {next.Add(-time.Duration(gNextClear.Min * float64(time.Hour))), next.Add(time.Duration(gNextClear.Max * float64(time.Hour)))}}
	dps := make([]dayPlan, nDays)
	for i, dt := range dateSeq(first, nDays) {
		dp := p.trainingDay(dt, RoleRepletion)
		// Recovery feeds of later sessions stay; the refuelling replaces
		// the one of the session that just ended.
		keep := dp.fixed[:0]
		for _, f := range dp.fixed {
			if !f.At.Before(windowEnd) && !f.At.Before(next) {
				keep = append(keep, f)
			}
		}
		dp.fixed = keep
		dp.blocked = append(dp.blocked[:0], blocked...)
		ds := dp.day.Date
		for _, f := range r.Feeds {
			if f.At.Format("2006-01-02") == ds {
				dp.fixed = append(dp.fixed, f)
			}
		}
		var sum float64
		for _, f := range dp.fixed {
			sum += f.ChoG
		}
		if need := math.Ceil(sum/mass*2) / 2; need > dp.day.ChoGPerKg {
			dp.day.ChoGPerKg = math.Min(need, dp.day.BandMaxGPerKg)
		}
		dps[i] = dp
	}
	rehome(dps)
	for i := range dps {
		p.plan.Days[i] = p.buildDay(&dps[i])
	}
	// Feeds may have moved or been overridden; the repletion feeds shown are
	// those of the days.
	if r.Speedy {
		r.Feeds = r.Feeds[:0]
		for _, d := range p.plan.Days {
			for _, f := range d.Feeds {
				if f.Label == labelRefuel {
					r.Feeds = append(r.Feeds, f)
				}
			}
		}
	}
	// Stores at the session's end: when the training log holds the session
	// (ending within model.session-match of session_end), the simulation runs that day
	// from midnight through it on the day's feeds; otherwise the working
	// muscle is taken as near the top of the depleted band, as after a
	// demanding session.
	from, to := end.Unix(), next.Unix()
	in := p.intakes(p.plan.Days, to)
	s := p.startState()
	s.Dw = gDepleted.Max
	s = s.since(0)
	for _, ses := range p.sessions {
		sEndAt := ses.start.Add(time.Duration(ses.durMin * float64(time.Minute)))
		tol := time.Duration(gSessionMatch.Min * float64(time.Minute))
		if d := sEndAt.Sub(end); d < -tol || d > tol || ses.durMin <= 0 {
			continue
		}
		dayStart := midnight(ses.start, p.loc).Unix()
		ex := p.exercises(dayStart, from)
		s = p.sb.simulate(p.startState(), dayStart, from, ex, in, nil, 3600, p.loc)
		r.SessionSimulated = true
		break
	}
	curve := make([]GlycogenPoint, 0, (to-from)/900+2)
	sEnd := p.sb.simulate(s, from, to, nil, in, &curve, 900, p.loc)
	curve = append(curve, p.sb.point(sEnd, to, p.loc))
	r.MuscleGAtNextStart = math.Round(p.sb.muscleG(sEnd))
	r.WorkingMuscleGAtNextStart = math.Round(p.sb.workingG(sEnd))
	r.WorkingMuscleGAtEnd = math.Round(p.sb.workingG(s))
	r.WorkingMuscleMmolPerKgAtEnd = round1(s.Dw)
	r.WorkingMuscleMmolPerKgAtNextStart = round1(sEnd.Dw)
	r.MuscleGCapacity = math.Round(GlycogenG(gModelCapacity.Min, p.body.SkeletalKg))
	r.Curve = curve
	p.plan.Repletion = r
}

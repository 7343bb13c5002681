package fuel

import (
	"math"
	"time"
)

// A stage race is one plan: the days before stage 1 (a taper and load
// when loading is chosen), then for every stage a pre-stage meal, the
// in-stage g/h settled from the stores at that stage's start, and the
// refuelling after its finish — speedy (1.0–1.2 g/kg/h for up to 4 h)
// when the next stage starts under 8 h later, a recovery feed and the
// day's targets otherwise; rest days between stages are recovery days.
// One simulation runs the stores through the whole race.

// stageNote records a pre-stage meal dropped because speedy refuelling
// after the stage before already feeds that time.
type stageNote struct{ stage int }

// setupStages takes the stages of the request, if any, and points the
// event figures at stage 1.
func (p *planner) setupStages() {
	e := p.req.Event
	if e == nil || len(e.Stages) == 0 {
		return
	}
	p.stages = e.Stages
	p.stageEvts = make([]Event, len(e.Stages))
	for i, s := range e.Stages {
		p.stageEvts[i] = Event{StartsAt: s.StartsAt, Modality: s.Modality, DistanceKm: s.DistanceKm,
			ExpectedDurationMin: s.ExpectedDurationMin, IntensityPctVO2max: s.IntensityPctVO2max, AveragePowerW: s.AveragePowerW}
	}
	p.useStage(0)
}

// useStage points the event figures at stage i.
func (p *planner) useStage(i int) { p.eventFiguresOf(&p.stageEvts[i]) }

// stagePct is a stage's intensity: given, from its pace and the VO2max,
// or by its duration.
func stagePct(b Body, e *Event) float64 {
	if e.IntensityPctVO2max != nil {
		return *e.IntensityPctVO2max
	}
	if b.VO2max > 0 {
		if r, _, ok := paceKcalPerH(b, e.Modality, e.DistanceKm, e.AveragePowerW, e.ExpectedDurationMin); ok {
			pct, _ := pacePct(b, r)
			return pct
		}
	}
	return defaultRaceIntensity(e.ExpectedDurationMin)
}

// paceIntensity sets the event's %VO2max from its pace when the VO2max is
// known and the pace fixes the energy rate.
func (p *planner) paceIntensity(e Event) {
	if p.body.VO2max <= 0 {
		return
	}
	r, _, ok := paceKcalPerH(p.body, e.Modality, e.DistanceKm, e.AveragePowerW, e.ExpectedDurationMin)
	if !ok {
		return
	}
	p.evPct, p.paceVO2 = pacePct(p.body, r)
	p.pctFromPace = true
}

func (p *planner) stageEnd(i int) time.Time {
	e := p.stageEvts[i]
	return e.StartsAt.In(p.loc).Add(time.Duration(e.ExpectedDurationMin * float64(time.Minute)))
}

func (p *planner) stageOverride(i int) *float64 {
	for _, o := range p.req.StageOverrides {
		if o.Stage == i {
			v := o.ChoGPerH
			return &v
		}
	}
	return nil
}

// stageRace plans a stage race, with loading before stage 1 when asked.
func (p *planner) stageRace(loading bool) {
	n := len(p.stageEvts)
	firstDay := midnight(p.stageEvts[0].StartsAt, p.loc)
	lastDay := midnight(p.stageEnd(n-1), p.loc)
	proto := ""
	taper, nLoad := 0, 0
	if loading {
		proto = p.req.Protocol
		if proto == "" {
			proto = ProtocolTwoDay
			p.find("protocol-default", LevelNote, "plan", SrcACSM,
				"No protocol was given; the two-day protocol (36–48 h at 10–12 g/kg) is used.")
		}
		p.plan.Protocol = proto
		nLoad = loadDaysOf(proto)
		taper = max(p.taperDays(), nLoad)
	}
	first := firstDay.AddDate(0, 0, -taper)
	rates := make([]float64, n)
	for i := range rates {
		rates[i] = gDuringFloor(p.stageEvts[i].ExpectedDurationMin)
		if o := p.stageOverride(i); o != nil {
			rates[i] = *o
		}
	}
	build := func() {
		p.stagePlans = make([]StagePlan, n)
		p.stageNotes = p.stageNotes[:0]
		dps := make([]dayPlan, 0, taper+int(lastDay.Sub(firstDay).Hours()/24)+3)
		for i := 0; i < taper; i++ {
			dt := first.AddDate(0, 0, i)
			if before := taper - i; before > nLoad {
				dps = append(dps, p.trainingDay(dt, RoleTaper))
			} else {
				dps = append(dps, p.loadDay(dt, proto, before == nLoad))
			}
		}
		mark := len(dps)
		for d := firstDay; !d.After(lastDay); d = d.AddDate(0, 0, 1) {
			dps = append(dps, p.stageDay(d, rates))
		}
		if !loading {
			// A pre-stage meal the evening before stage 1 brings that day in.
			for _, f := range dps[mark].fixed {
				if f.At.Before(firstDay) {
					prev := p.trainingDay(firstDay.AddDate(0, 0, -1), RoleTraining)
					dps = append([]dayPlan{prev}, dps...)
					first = firstDay.AddDate(0, 0, -1)
					break
				}
			}
		}
		p.useStage(n - 1)
		dps = append(dps, p.recoveryDay(lastDay.AddDate(0, 0, 1)))
		rehome(dps)
		p.plan.Days = make([]Day, len(dps))
		for i := range dps {
			p.plan.Days[i] = p.buildDay(&dps[i])
		}
	}
	build()
	p.stageSimulation(first, firstDay.AddDate(0, 0, -nLoad), rates, true, loading)
	build()
	p.stageSimulation(first, firstDay.AddDate(0, 0, -nLoad), rates, false, loading)

	// The plan's own pre-event meal, in-event plan and event figures are
	// those of stage 1; every stage's are in Stages.
	p.useStage(0)
	p.plan.PreEventMeal = p.stagePlans[0].PreEventMeal
	p.plan.DuringEvent = p.stagePlans[0].DuringEvent
	p.plan.Stages = p.stagePlans
}

// stageDay plans one calendar day of a stage race: the stages that start
// on it, or a recovery day between stages.
func (p *planner) stageDay(date time.Time, rates []float64) dayPlan {
	ds := date.Format("2006-01-02")
	var idx []int
	for i := range p.stageEvts {
		if p.stageEvts[i].StartsAt.In(p.loc).Format("2006-01-02") == ds {
			idx = append(idx, i)
		}
	}
	if len(idx) == 0 {
		p.useStage(0)
		dp := p.recoveryDay(date)
		dp.day.Advice = []string{"Rest day of the stage race: refuel to the day's target and include protein at each meal."}
		return dp
	}
	var dp dayPlan
	mass := p.body.MassKg
	for k, i := range idx {
		p.useStage(i)
		p.plan.PreEventMeal = nil
		sdp := p.eventDay(date, rates[i])
		de := p.plan.DuringEvent
		if o := p.stageOverride(i); o != nil {
			de.ChoGPerH, de.TotalChoG, de.Overridden = *o, math.Round(*o*p.evDurH), true
			for j := range sdp.fixed {
				if sdp.fixed[j].Label == labelDuring {
					sdp.fixed[j].ChoG = de.TotalChoG
				}
			}
		}
		sp := &p.stagePlans[i]
		sp.Index, sp.StartsAt, sp.Modality, sp.DurationMin = i, p.evStart, p.ev.Modality, p.ev.ExpectedDurationMin
		sp.PreEventMeal, sp.DuringEvent = p.plan.PreEventMeal, de
		// A pre-stage meal inside the speedy refuelling after the stage
		// before is dropped: those feeds already fuel that time.
		if i > 0 && sp.PreEventMeal != nil {
			if r := p.stagePlans[i-1].Repletion; r != nil && r.Speedy && len(r.Feeds) > 0 &&
				!sp.PreEventMeal.At.After(r.Feeds[len(r.Feeds)-1].At.Add(30*time.Minute)) {
				keep := sdp.fixed[:0]
				for _, f := range sdp.fixed {
					if f.Label != labelPreEvent {
						keep = append(keep, f)
					}
				}
				sdp.fixed = keep
				sp.PreEventMeal = nil
				p.stageNotes = append(p.stageNotes, stageNote{i})
			}
		}
		// Refuelling after the finish.
		end := p.evEnd
		rep := &StageRepletion{Feeds: []Feed{}}
		if i+1 < len(p.stageEvts) {
			gap := p.stageEvts[i+1].StartsAt.Sub(end).Hours()
			rep.GapH = round1(gap)
			rep.Speedy = gap < gSpeedyGap.Min
		}
		if rep.Speedy {
			rep.ChoGPerKgPerH = round1((gRepletionRate.Min + gRepletionRate.Max) / 2)
			winH := math.Min(gRepletionWin.Min, rep.GapH-gPreEventHours.Min)
			winH = math.Max(0.5, winH)
			nf := int(math.Ceil(winH / 0.5))
			total := math.Round(rep.ChoGPerKgPerH * mass * winH)
			var w, g [16]float64
			nf = min(nf, len(w))
			for j := 0; j < nf; j++ {
				w[j] = 1
			}
			split(total, w[:nf], g[:nf])
			keep := sdp.fixed[:0]
			for _, f := range sdp.fixed {
				if f.Label != labelRecovery {
					keep = append(keep, f)
				}
			}
			sdp.fixed = keep
			for j := 0; j < nf; j++ {
				f := Feed{At: end.Add(time.Duration(j) * 30 * time.Minute), Label: labelRefuel, ChoG: g[j]}
				if j == 0 {
					f.ProteinG = math.Round(gRepletionProt.Min * mass)
				}
				sdp.fixed = append(sdp.fixed, f)
				rep.Feeds = append(rep.Feeds, f)
			}
			sdp.blocked = append(sdp.blocked, window{end, end.Add(time.Duration(winH * float64(time.Hour)))})
		} else {
			for _, f := range sdp.fixed {
				if f.Label == labelRecovery {
					rep.Feeds = append(rep.Feeds, f)
				}
			}
		}
		sp.Repletion = rep
		if k == 0 {
			dp = sdp
			continue
		}
		dp.fixed = append(dp.fixed, sdp.fixed...)
		dp.blocked = append(dp.blocked, sdp.blocked...)
		// The day's band from its training and all its stages.
		eff, tm := dayLoad(p.sessionsOn(ds))
		for _, j := range idx[:k+1] {
			e := &p.stageEvts[j]
			eff += e.ExpectedDurationMin * intensityFactor(stagePct(p.body, e))
			tm += e.ExpectedDurationMin
		}
		b := bandFor(eff, tm)
		dp.day.TrainingMin, dp.day.LoadBand = tm, b.name
		dp.day.BandMinGPerKg, dp.day.BandMaxGPerKg = b.g.Min, b.g.Max
		dp.day.ChoGPerKg = math.Max(bandTarget(b, eff), math.Max(dp.day.ChoGPerKg, sdp.day.ChoGPerKg))
	}
	var sum float64
	for _, f := range dp.fixed {
		if f.At.Format("2006-01-02") == ds {
			sum += f.ChoG
		}
	}
	if need := math.Ceil(sum/mass*2) / 2; need > dp.day.ChoGPerKg {
		dp.day.ChoGPerKg = math.Min(need, dp.day.BandMaxGPerKg)
	}
	sortByTime(dp.fixed)
	return dp
}

func sortByTime(f []Feed) {
	for i := 1; i < len(f); i++ {
		for j := i; j > 0 && f[j].At.Before(f[j-1].At); j-- {
			f[j], f[j-1] = f[j-1], f[j]
		}
	}
}

// stageSimulation runs the stores from the first plan day through every
// stage (each at its in-stage rate) to the end of the plan. With settle it
// first sets each stage's rate (not overridden ones) from the stores at
// that stage's start.
func (p *planner) stageSimulation(first, loadStart time.Time, rates []float64, settle, loading bool) {
	n := len(p.stageEvts)
	from := first.Unix()
	lastDay := midnight(p.stageEnd(n-1), p.loc)
	to := lastDay.AddDate(0, 0, 2).Unix()
	ex := p.exercises(from, to)
	in := p.intakes(p.plan.Days, to)
	s := p.startState()
	var curve []GlycogenPoint
	if !settle {
		curve = make([]GlycogenPoint, 0, (to-from)/3600+int64(2*n+2))
	}
	cp := &curve
	if settle {
		cp = nil
	}
	if !loading {
		// The day before the plan follows the usual intake.
		prev := first.AddDate(0, 0, -1)
		usual := p.usualIntakes([]Day{{Date: prev.Format("2006-01-02")}}, from)
		s = p.sb.simulate(s, prev.Unix(), from, p.exercises(prev.Unix(), from), usual, nil, 3600, p.loc)
	}
	t := from
	var sLoad, s0 simState
	if loading && loadStart.Unix() > from {
		sLoad = p.sb.simulate(s, t, loadStart.Unix(), ex, in, cp, 3600, p.loc)
		s, t = sLoad, loadStart.Unix()
	} else {
		sLoad = s
	}
	for i := 0; i < n; i++ {
		st := p.stageEvts[i].StartsAt.Unix()
		s = p.sb.simulate(s, t, st, ex, in, cp, 3600, p.loc)
		p.useStage(i)
		if settle && p.stageOverride(i) == nil {
			rates[i] = p.neededRate(s)
		}
		if i == 0 {
			s0 = s
		}
		if cp != nil {
			*cp = append(*cp, p.sb.point(s, st, p.loc))
		}
		sp := &p.stagePlans[i]
		sp.WorkingMuscleMmolPerKgStart = math.Round(s.Dw)
		sp.LiverGStart = math.Round(s.LiverG)
		outH, end := p.raceOut(s, rates[i])
		sp.RunsOutAtMin, _ = p.runsOut(outH)
		s = end
		t = p.stageEnd(i).Unix()
		if cp != nil {
			*cp = append(*cp, p.sb.point(s, t, p.loc))
		}
	}
	if settle {
		return
	}
	s = p.sb.simulate(s, t, to, ex, in, cp, 3600, p.loc)
	curve = append(curve, p.sb.point(s, to, p.loc))
	p.useStage(0)
	g := &Glycogen{
		MuscleGStart:        math.Round(p.sb.muscleG(s0)),
		WorkingMuscleGStart: math.Round(p.sb.workingG(s0)),
		LiverGStart:         math.Round(s0.LiverG),
		MuscleGCapacity:     math.Round(GlycogenG(gModelCapacity.Min, p.body.SkeletalKg)),
		Curve:               curve,
	}
	outH, _ := p.raceOut(s0, 0)
	g.RunsOutAtMin, g.RunsOutAtKm = p.runsOut(outH)
	outH2, _ := p.raceOut(s0, rates[0])
	g.RunsOutWithIntakeAtMin, g.RunsOutWithIntakeAtKm = p.runsOut(outH2)
	p.plan.Glycogen = g
	p.startDensity = s0.Dw
	if loading {
		// The gain as a range, like a one-day event's (simulate.go): the
		// glycogen the load adds with 3–4 g of water per g.
		p.massGainG = math.Max(0, (p.sb.muscleG(s0)+s0.LiverG)-(p.sb.muscleG(sLoad)+sLoad.LiverG))
		lo := math.Round(p.massGainG*(1+gWater.Min)/100) / 10
		hi := math.Round(p.massGainG*(1+gWater.Max)/100) / 10
		p.plan.ExpectedMassGainKg, p.plan.ExpectedMassGainKgMax = &lo, &hi
	}
}

// checkStages checks each stage's figures.
func (p *planner) checkStages() {
	for i, sp := range p.plan.Stages {
		subj := "stage:" + itoa(i)
		de := sp.DuringEvent
		lo, hi, src := duringBandRange(de.Band)
		lvl, word := LevelOK, "inside"
		if de.Band == "small" {
			lo = 0
		}
		if !inRange(de.ChoGPerH, lo, hi) {
			lvl, word = LevelOutside, "outside"
		}
		p.find("stage-during", lvl, subj, src,
			"Stage %d (%s, %g min, starting %s): %g g/h in the stage%s, %s %g–%g g/h for its duration; working-muscle glycogen at its start about %g mmol/kg.",
			i+1, sp.Modality, sp.DurationMin, sp.StartsAt.Format("2006-01-02 15:04"), de.ChoGPerH, overrideWord(de.Overridden), word, lo, hi, sp.WorkingMuscleMmolPerKgStart)
		if de.ChoGPerH > gDuring3060.Max {
			p.find("multiple-transportable", LevelNote, subj, SrcACSMJeuk,
				"Stage %d: over %g g/h needs multiple transportable carbohydrates (glucose with fructose), practised in training.", i+1, gDuring3060.Max)
		}
		if sp.RunsOutAtMin != nil {
			p.find("stage-runs-out", LevelCaution, subj, SrcRapoport,
				"Even with %g g/h the stores may run low about %g min into stage %d: refuel harder after the stage before, or ease the pace.",
				de.ChoGPerH, *sp.RunsOutAtMin, i+1)
		}
		if r := sp.Repletion; r != nil && i+1 < len(p.plan.Stages) {
			if r.Speedy {
				p.find("stage-repletion", LevelOK, subj, SrcACSM,
					"Stage %d starts %g h after this finish (under %g h): speedy refuelling at %g g/kg/h in %d feeds every 30 min, protein with the first.",
					i+2, r.GapH, gSpeedyGap.Min, r.ChoGPerKgPerH, len(r.Feeds))
			} else {
				p.find("stage-repletion", LevelNote, subj, SrcACSM,
					"Stage %d starts %g h after this finish (%g h or more): a recovery feed, then the day's targets.",
					i+2, r.GapH, gSpeedyGap.Min)
			}
		}
	}
	for _, n := range p.stageNotes {
		p.find("stage-pre-meal-in-refuel", LevelNote, "stage:"+itoa(n.stage), SrcACSM,
			"Stage %d starts soon after the stage before: its speedy refuelling feeds stand in for a separate pre-stage meal.", n.stage+1)
	}
}

package fuel

import (
	"math"
	"time"
)

// A multi-sport event is raced leg by leg: each leg has its own energy
// model (swimming from the oxygen-uptake equation of Kimber 2002, cycling
// from mechanical work or METs, running from its cost per km, transitions
// as easy effort), its own carbohydrate share, and draws its muscle
// glycogen from the muscle it uses: the legs for cycling and running, the
// arms and trunk for the swim. Carbohydrate is eaten only where one can
// eat: on the bike and the run, not in the water nor in a transition.

// segFig is one leg's figures.
type segFig struct {
	seg      Segment
	startH   float64
	durH     float64
	pct      float64
	kcal     float64
	share    float64
	useGPH   float64
	cover    float64
	method   string
	fromPace bool
}

// eats reports whether carbohydrate is planned in a leg.
func (f segFig) eats() bool { return f.seg.Modality == "cycle" || f.seg.Modality == "run" }

// swimVO2L is the oxygen uptake of swimming in L/min at speed v (m/s) for
// body mass w (kg), per Kimber 2002; never below resting.
func swimVO2L(vMS, massKg float64) float64 {
	vo2 := gSwimV.Min*vMS + gSwimW.Min*massKg - gSwimC.Min
	rest := gMET.Max * massKg / 1000 // 1 MET ≈ 3.5 ml/kg/min
	return math.Max(rest, vo2)
}

// paceKcalPerH is the energy rate a modality's pace sets, when the pace is
// known: running from its cost per km, cycling from mean power, swimming
// from Kimber's equation. ok is false when the pace does not fix it.
func paceKcalPerH(b Body, modality string, distKm, powerW *float64, durMin float64) (kcalPerH float64, method string, ok bool) {
	h := durMin / 60
	if h <= 0 {
		return 0, "", false
	}
	switch {
	case modality == "run" && distKm != nil:
		return gRunCost.Min * b.MassKg * *distKm / h, "running cost 1 kcal/kg/km", true
	case modality == "cycle" && powerW != nil:
		return *powerW * 3600 / 1000 / gCycleEff.Min / gKJPerKcal.Min, "mechanical work at 24% efficiency", true
	case modality == "swim" && distKm != nil:
		v := *distKm * 1000 / (durMin * 60)
		// Weir energy of that oxygen at the RER of a moderate effort; the
		// share is refined once the intensity is known.
		return swimVO2L(v, b.MassKg) * 60 * kcalPerLitreO2(ChoShare(gModerate.Min)), "swimming oxygen uptake (Kimber 2002)", true
	}
	return 0, "", false
}

// pacePct turns a pace's energy rate into %VO2max for an athlete whose
// VO2max is known: the oxygen the pace needs (Weir, at the RER its
// carbohydrate share implies) over the VO2max. It returns the %VO2max and
// the oxygen in ml/kg/min.
func pacePct(b Body, kcalPerH float64) (pct, vo2 float64) {
	pct = gModerate.Min
	for i := 0; i < 4; i++ {
		lPerMin := kcalPerH / 60 / kcalPerLitreO2(ChoShare(pct))
		vo2 = lPerMin * 1000 / b.MassKg
		pct = math.Max(gShareFloorPct, math.Min(100, vo2/b.VO2max*100))
	}
	return pct, vo2
}

// gShareFloorPct is the lowest %VO2max a pace is given (a walk).
const gShareFloorPct = 25

// segmentFigures computes each leg's energy, share and carbohydrate use.
// defPct is the intensity of a leg with neither its own nor a pace.
func (p *planner) segmentFigures(defPct float64) {
	b := p.body
	p.segs = p.segs[:0]
	var at float64
	for _, s := range p.ev.Segments {
		f := segFig{seg: s, startH: at, durH: s.ExpectedDurationMin / 60, pct: defPct}
		rate, method, paced := paceKcalPerH(b, s.Modality, s.DistanceKm, s.AveragePowerW, s.ExpectedDurationMin)
		switch {
		case s.IntensityPctVO2max != nil:
			f.pct = *s.IntensityPctVO2max
		case s.Modality == "transition":
			f.pct = gTransPct.Min
		case paced && b.VO2max > 0:
			f.pct, _ = pacePct(b, rate)
			f.fromPace = true
		}
		switch {
		case s.Modality == "transition":
			rate, method = metAt("other", f.pct)*gMET.Min*b.MassKg, "easy effort in METs"
		case paced && s.Modality == "swim":
			v := *s.DistanceKm * 1000 / (s.ExpectedDurationMin * 60)
			rate = swimVO2L(v, b.MassKg) * 60 * kcalPerLitreO2(ChoShare(f.pct))
		case !paced:
			rate = sessionKcalPerH(b, s.Modality, f.pct)
			method = "METs at the leg's intensity"
			if b.VO2max > 0 {
				method = "VO2max at the leg's intensity (Weir)"
			}
		}
		f.kcal = rate * f.durH
		f.method = method
		f.share = ChoShare(f.pct)
		f.useGPH = rate * f.share / gAtwaterCho.Min
		f.cover = coverShare(f.pct)
		p.segs = append(p.segs, f)
		at += f.durH
	}
	// The event's totals: energy summed, the share and cover weighted.
	var kcal, use, cover float64
	for _, f := range p.segs {
		kcal += f.kcal
		use += f.useGPH * f.durH
		cover += f.cover * f.useGPH * f.durH
	}
	p.evKcal = kcal
	p.evMethod = "per leg: swimming by Kimber 2002, cycling, running and transitions by their own models"
	if kcal > 0 {
		p.evShare = use * gAtwaterCho.Min / kcal
	}
	if at > 0 {
		p.evUseGPH = use / at
		p.evDurH = at
	}
	if use > 0 {
		p.evCover = cover / use
	}
}

// swimBody is the simulation body with the arms and trunk as the working
// muscle and the legs resting, for a swim leg; swap turns a state into
// and out of it.
func (b simBody) swimBody() simBody {
	b.workingKg, b.otherKg = b.otherKg, b.workingKg
	return b
}

func swap(s simState) simState {
	s.Dw, s.Do = s.Do, s.Dw
	return s
}

// raceSegments runs the stores through the legs at an in-event rate
// eaten on the bike and the run. It returns when the stores ran out
// (hours from the start, −1 if they lasted), the state at the finish and,
// per leg, hours into the leg they ran out (−1 if not in that leg).
func (p *planner) raceSegments(s simState, rate float64, perLeg []float64) (outH float64, end simState) {
	outH = -1
	for i, f := range p.segs {
		eat := 0.0
		if f.eats() {
			eat = rate
		}
		var o float64
		if f.seg.Modality == "swim" {
			sb := p.sb.swimBody()
			var e simState
			o, e = sb.race(swap(s), f.durH, f.useGPH, f.cover, eat)
			s = swap(e)
		} else {
			o, s = p.sb.race(s, f.durH, f.useGPH, f.cover, eat)
		}
		if i < len(perLeg) {
			perLeg[i] = o
		}
		if o >= 0 && outH < 0 {
			outH = f.startH + o
		}
	}
	return outH, s
}

// raceOut runs the stores through the event at an in-event rate: leg by
// leg for a multi-sport event, else at the event's constant use.
func (p *planner) raceOut(s simState, rate float64) (outH float64, end simState) {
	if len(p.segs) > 0 {
		return p.raceSegments(s, rate, nil)
	}
	return p.sb.race(s, p.evDurH, p.evUseGPH, p.evCover, rate)
}

// fillSegments writes the per-leg plan into the in-event plan: the rate
// on the bike and the run, none in the water or the transitions; the
// total is what is eaten.
func (p *planner) fillSegments(de *DuringEvent) {
	if len(p.segs) == 0 {
		return
	}
	de.Segments = make([]SegmentPlan, len(p.segs))
	var total float64
	for i, f := range p.segs {
		sp := SegmentPlan{
			Modality:     f.seg.Modality,
			StartMin:     math.Round(f.startH * 60),
			DurationMin:  f.seg.ExpectedDurationMin,
			DistanceKm:   f.seg.DistanceKm,
			PctVO2max:    math.Round(f.pct),
			EnergyKcal:   math.Round(f.kcal),
			EnergyMethod: f.method,
			ChoShare:     math.Round(f.share*100) / 100,
			ChoUsedG:     math.Round(f.useGPH * f.durH),
			Muscle:       "legs",
		}
		if f.seg.Modality == "swim" {
			sp.Muscle = "arms and trunk"
		}
		if f.eats() {
			sp.ChoGPerH = de.ChoGPerH
			sp.ChoG = math.Round(de.ChoGPerH * f.durH)
		}
		total += sp.ChoG
		de.Segments[i] = sp
	}
	de.TotalChoG = total
}

// feedStart is when the in-event feed begins: the start gun, or for an
// event with legs the start of the first leg where one eats (the bike
// after the swim and its transition), since its grams are only those legs'.
func (p *planner) feedStart() time.Time {
	for _, f := range p.segs {
		if f.eats() {
			return p.evStart.Add(time.Duration(math.Round(f.startH*3600)) * time.Second)
		}
	}
	return p.evStart
}

// segmentRunsOut fills where in each leg the stores would run out with the
// planned intake, from the state at the start line.
func (p *planner) segmentRunsOut(s simState) {
	de := p.plan.DuringEvent
	if de == nil || len(de.Segments) != len(p.segs) {
		return
	}
	perLeg := make([]float64, len(p.segs))
	p.raceSegments(s, de.ChoGPerH, perLeg)
	for i, o := range perLeg {
		if o < 0 {
			continue
		}
		m := math.Round(o * 60)
		de.Segments[i].RunsOutAtMin = &m
		if d := p.segs[i].seg.DistanceKm; d != nil && p.segs[i].durH > 0 {
			k := round1(o / p.segs[i].durH * *d)
			de.Segments[i].RunsOutAtKm = &k
		}
	}
}

// checkSegments explains the legs: energy, where one eats, and where the
// stores would run out.
func (p *planner) checkSegments() {
	de := p.plan.DuringEvent
	if de == nil || len(de.Segments) == 0 {
		return
	}
	for i, sp := range de.Segments {
		subj := "during_event:segment:" + itoa(i)
		src := SrcAinsworth
		switch {
		case sp.Modality == "swim" && sp.EnergyMethod != "METs at the leg's intensity":
			src = SrcKimber
		case sp.Modality == "run" && sp.DistanceKm != nil:
			src = SrcRapoportCP
		}
		eat := "no carbohydrate is planned (one cannot eat here)"
		if sp.ChoGPerH > 0 {
			eat = string(appendf(nil, "%g g/h is planned (%g g)", sp.ChoGPerH, sp.ChoG))
		}
		p.find("segment-energy", LevelNote, subj, src,
			"Leg %d, %s of %g min: about %g kcal (%s), %.0f%% from carbohydrate (%g g, from the %s and the liver); %s.",
			i+1, sp.Modality, sp.DurationMin, sp.EnergyKcal, sp.EnergyMethod, sp.ChoShare*100, sp.ChoUsedG, sp.Muscle, eat)
		if sp.RunsOutAtMin != nil {
			where := string(appendf(nil, "%g min into the %s", *sp.RunsOutAtMin, sp.Modality))
			if sp.RunsOutAtKm != nil {
				where = string(appendf(nil, "about %g km (%g min) into the %s", *sp.RunsOutAtKm, *sp.RunsOutAtMin, sp.Modality))
			}
			p.find("segment-runs-out", LevelCaution, subj, SrcRapoport,
				"With the planned intake the stores may run low %s (leg %d).", where, i+1)
		}
	}
}

package fuel

import (
	"math"
	"strings"
	"time"
)

// finishEvents fills the caffeine figures and adds the findings of
// caffeine, diabetes, the pre-event meal's protein, fitness, segments,
// stages and long sessions. finish calls it before the client cautions.
func (p *planner) finishEvents() {
	p.preEventCaffeine()
	p.checkPreMealProtein()
	p.checkFitness()
	p.checkSegments()
	p.checkStages()
	p.checkBlocks()
	p.checkSessions()
	p.repletionCaffeine()
	p.diabetesCautions()
}

// cautionMentions reports whether a recorded caution mentions any word.
func (p *planner) cautionMentions(words ...string) string {
	for _, c := range p.req.Cautions {
		lc := strings.ToLower(c)
		for _, w := range words {
			if strings.Contains(lc, w) {
				return strings.TrimRight(strings.TrimSpace(c), ".;, ")
			}
		}
	}
	return ""
}

// caffeineConflict names a recorded caution that rules caffeine out.
func (p *planner) caffeineConflict() string {
	return p.cautionMentions("pregnan", "heart", "cardiac", "arrhythm", "palpitation", "anxiety", "anxious", "panic")
}

const caffeineCautions = "Caffeine can disturb sleep and raise anxiety and the heart rate, and can upset heart rhythm; " +
	"it is not for pregnancy; habitual intake changes the response, and responses vary. Try the dose in training first."

// preEventCaffeine places the optional caffeine about 60 min before the
// start and checks the dose against 3–6 mg/kg (IOC 2018).
func (p *planner) preEventCaffeine() {
	dose := p.req.CaffeineMgPerKg
	if dose == nil || p.ev == nil {
		return
	}
	mass := p.body.MassKg
	c := &Caffeine{
		At:      p.evStart.Add(-time.Duration(gCafPreMin.Min) * time.Minute),
		Mg:      math.Round(*dose * mass),
		MgPerKg: *dose,
	}
	p.plan.PreEventCaffeine = c
	subj := "pre_event_caffeine"
	switch {
	case *dose >= gCafNoGain.Min:
		p.find("caffeine-dose", LevelOutside, subj, SrcMaughan,
			"Caffeine of %g mg/kg (%g mg) is %g mg/kg or more: no further benefit and more side effects (nausea, anxiety, insomnia, restlessness); the published range is %g–%g mg/kg.",
			*dose, c.Mg, gCafNoGain.Min, gCafPre.Min, gCafPre.Max)
	case *dose > gCafPre.Max:
		p.find("caffeine-dose", LevelCaution, subj, SrcMaughan,
			"Caffeine of %g mg/kg (%g mg) is above the published %g–%g mg/kg and adds side effects rather than benefit.",
			*dose, c.Mg, gCafPre.Min, gCafPre.Max)
	case *dose < gCafPre.Min:
		p.find("caffeine-dose", LevelNote, subj, SrcMaughan,
			"Caffeine of %g mg/kg (%g mg) is below the %g–%g mg/kg range; lower doses (about 200 mg) with carbohydrate also help, before and during long events.",
			*dose, c.Mg, gCafPre.Min, gCafPre.Max)
	default:
		p.find("caffeine-dose", LevelOK, subj, SrcMaughan,
			"Caffeine of %g mg/kg (%g mg) at %s, about %g min before the start: inside %g–%g mg/kg.",
			*dose, c.Mg, c.At.Format("15:04"), gCafPreMin.Min, gCafPre.Min, gCafPre.Max)
	}
	if conflict := p.caffeineConflict(); conflict != "" {
		p.find("caffeine-conflict", LevelOutside, subj, SrcMaughan,
			"Caffeine is planned, but the recorded caution \"%s\" rules it out until the client's doctor agrees.", conflict)
	}
	p.find("caffeine-cautions", LevelCaution, subj, SrcMaughan, "%s", caffeineCautions)
	if p.evDurH > gCafLong.Min {
		p.find("caffeine-long-event", LevelNote, subj, SrcMaughan,
			"In a long event, lower doses (under 3 mg/kg, about 200 mg) later in the race, with carbohydrate, can keep the effect; count them in the day's total.")
	}
}

// repletionCaffeine shows caffeine with speedy refuelling as an option,
// and checks it when the dietitian chose it (Pedersen 2008).
func (p *planner) repletionCaffeine() {
	speedy := p.plan.Repletion != nil && p.plan.Repletion.Speedy
	for _, st := range p.plan.Stages {
		speedy = speedy || (st.Repletion != nil && st.Repletion.Speedy)
	}
	if !speedy {
		return
	}
	dose := p.req.RepletionCaffeineMgPerKg
	if dose == nil {
		p.find("repletion-caffeine-option", LevelNote, "repletion", SrcPedersen,
			"Option, off unless chosen: caffeine with the refuelling carbohydrate (%g mg/kg with about 1 g/kg/h raised the 4-h resynthesis rate by %.0f%% in one study; no minimum effective dose is known). %s",
			gCafRep.Min, (gCafRep.Max-1)*100, caffeineCautions)
		return
	}
	mg := math.Round(*dose * p.body.MassKg)
	if r := p.plan.Repletion; r != nil && len(r.Feeds) > 0 {
		r.Caffeine = &Caffeine{At: r.Feeds[0].At, Mg: mg, MgPerKg: *dose}
	}
	lvl := LevelCaution
	if *dose >= gCafNoGain.Min {
		lvl = LevelOutside
	}
	p.find("repletion-caffeine", lvl, "repletion", SrcPedersen,
		"Caffeine of %g mg/kg (%g mg) with the first refuelling feed, the dietitian's choice (%g mg/kg was studied; the glycogen model does not count its effect). %s",
		*dose, mg, gCafRep.Min, caffeineCautions)
	if conflict := p.caffeineConflict(); conflict != "" {
		p.find("repletion-caffeine-conflict", LevelOutside, "repletion", SrcPedersen,
			"Caffeine with the refuelling is chosen, but the recorded caution \"%s\" rules it out until the client's doctor agrees.", conflict)
	}
}

// diabetesCautions attaches a caution to each carbohydrate figure around
// exercise when a recorded caution mentions diabetes. The app never
// computes insulin.
func (p *planner) diabetesCautions() {
	c := p.cautionMentions("diabet")
	if c == "" {
		return
	}
	const msg = "Recorded caution: %s. %s: glucose monitoring and any change to insulin or other glucose-lowering medicine around exercise and on high-carbohydrate days are set with the athlete's diabetes team. This app never computes insulin doses."
	for _, d := range p.plan.Days {
		if d.Role == RoleLoad {
			p.find("diabetes-load-day", LevelCaution, "day:"+d.Date, SrcDiabetes, msg, c,
				string(appendf(nil, "A load day of %g g/kg", d.ChoGPerKg)))
		}
	}
	if pm := p.plan.PreEventMeal; pm != nil {
		p.find("diabetes-pre-event-meal", LevelCaution, "pre_event_meal", SrcDiabetes, msg, c,
			string(appendf(nil, "The pre-event meal of %g g", pm.ChoG)))
	}
	if de := p.plan.DuringEvent; de != nil && de.ChoGPerH > 0 {
		p.find("diabetes-during-event", LevelCaution, "during_event", SrcDiabetes, msg, c,
			string(appendf(nil, "In-event carbohydrate of %g g/h", de.ChoGPerH)))
	}
	for i, st := range p.plan.Stages {
		if i == 0 {
			continue // stage 1's figures are the plan's pre-event meal and in-event plan
		}
		p.find("diabetes-stage", LevelCaution, "stage:"+itoa(i), SrcDiabetes, msg, c,
			string(appendf(nil, "Stage %d's pre-stage meal and %g g/h in the stage", i+1, st.DuringEvent.ChoGPerH)))
	}
	if r := p.plan.Repletion; r != nil && r.Speedy {
		p.find("diabetes-repletion", LevelCaution, "repletion", SrcDiabetes, msg, c,
			string(appendf(nil, "Speedy refuelling of %g g/kg/h", r.ChoGPerKgPerH)))
	}
}

func itoa(i int) string { return string(appendf(nil, "%d", i)) }

// checkPreMealProtein checks the pre-event meal's protein (about 0.3 g/kg
// at most) and says to keep fat and fibre low.
func (p *planner) checkPreMealProtein() {
	if p.plan.PreEventMeal == nil {
		return
	}
	var prot float64
	for _, d := range p.plan.Days {
		for _, f := range d.Feeds {
			if f.Label == labelPreEvent {
				prot = f.ProteinG
			}
		}
	}
	max := math.Round(gPreProtMax.Min * p.body.MassKg)
	lvl, word := LevelOK, "within"
	if prot > max {
		lvl, word = LevelOutside, "above"
	}
	p.find("pre-event-meal-protein", lvl, "pre_event_meal", SrcACSM,
		"The pre-event meal carries %g g protein, %s about %g g/kg (%g g); keep its fat and fibre low so it leaves the stomach before the start.",
		prot, word, gPreProtMax.Min, max)
}

// checkFitness explains the share of carbohydrate when the event's pace
// was turned into a %VO2max from the athlete's VO2max.
func (p *planner) checkFitness() {
	if !p.pctFromPace {
		return
	}
	p.find("fitness-share", LevelNote, "during_event", SrcRomijn,
		"At the expected pace the event needs about %.0f ml O2/kg/min, %.0f%% of this athlete's VO2max of %g: about %.0f%% of the energy comes from carbohydrate. At the same pace a fitter athlete works at a lower share of VO2max and uses relatively more fat.",
		p.paceVO2, p.evPct, p.body.VO2max, p.evShare*100)
}

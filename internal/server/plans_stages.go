package server

import (
	"fmt"
	"math"
	"net/url"
	"strconv"
	"strings"
	"time"

	"larder/internal/forms"
	"larder/internal/fuel"
	"larder/web"
)

// stageGPHName is the input of a stage's in-stage g/h override.
func stageGPHName(i int) string { return "stagegph_" + strconv.Itoa(i) }

const stageGPHPrefix = "stagegph_"

// raceParts turns a plan's legs, stages, hour blocks and caffeine into
// rows for the plan page; take hands over the findings of a subject.
func raceParts(plan fuel.Plan, loc *time.Location, take func(string) []web.FindingView) web.RaceParts {
	var rp web.RaceParts
	if c := plan.PreEventCaffeine; c != nil {
		rp.Caffeine = &web.Fact{Label: "Caffeine before the start",
			Value:    fmt.Sprintf("%s mg (%s mg/kg) at %s", web.Num(c.Mg, 0), web.Num(c.MgPerKg, 1), c.At.In(loc).Format("15:04")),
			Hint:     "Optional, set by the dietitian; tried in training first.",
			Findings: take("pre_event_caffeine")}
	}
	if de := plan.DuringEvent; de != nil {
		for i, s := range de.Segments {
			row := web.SegmentRow{Leg: strconv.Itoa(i + 1), Activity: s.Modality, Distance: "—",
				Duration: hoursWords(s.DurationMin), Energy: web.Num(s.EnergyKcal, 0) + " kcal",
				Share: web.Num(s.ChoShare*100, 0) + "%", Muscle: s.Muscle, GPerH: web.Num(s.ChoGPerH, 0), RunsOut: "—",
				Findings: take(fmt.Sprintf("during_event:segment:%d", i))}
			if s.DistanceKm != nil {
				row.Distance = web.Num(*s.DistanceKm, 1) + " km"
			}
			if s.ChoGPerH == 0 && (s.Modality == "swim" || s.Modality == "transition") {
				row.GPerH = "none"
			}
			if s.RunsOutAtMin != nil {
				row.RunsOut = runsOut(s.RunsOutAtKm, s.RunsOutAtMin) + " into the leg"
			}
			rp.Segments = append(rp.Segments, row)
		}
		for _, b := range de.Blocks {
			rp.Blocks = append(rp.Blocks, web.BlockRow{From: b.From.In(loc).Format("Mon 15:04"), To: b.To.In(loc).Format("Mon 15:04"),
				GPerH: web.Num(b.ChoGPerH, 0), ChoG: web.Num(b.ChoG, 0) + " g", Night: b.Night})
		}
	}
	for i, st := range plan.Stages {
		row := web.StageRow{Number: strconv.Itoa(i + 1), Start: st.StartsAt.In(loc).Format("Mon 2 Jan 15:04"),
			Activity: st.Modality, Duration: hoursWords(st.DurationMin), PreMeal: "none needed (60 min or less)",
			GPerHName: stageGPHName(i), StartDensity: web.Num(st.WorkingMuscleMmolPerKgStart, 0) + " mmol/kg",
			RunsOut: "they last"}
		if pm := st.PreEventMeal; pm != nil {
			row.PreMeal = fmt.Sprintf("%s g at %s", web.Num(pm.ChoG, 0), pm.At.In(loc).Format("15:04"))
		} else if st.DurationMin > 60 && i > 0 {
			row.PreMeal = "the refuelling feeds after the stage before"
		}
		if de := st.DuringEvent; de != nil {
			row.GPerH, row.Overridden = web.Num(de.ChoGPerH, 0), de.Overridden
		}
		if st.RunsOutAtMin != nil {
			row.RunsOut = "after about " + hoursWords(*st.RunsOutAtMin)
		}
		if r := st.Repletion; r != nil {
			switch {
			case r.Speedy:
				row.Refuel = fmt.Sprintf("speedy refuelling, %s g/kg/h in %d feeds (next stage in %s h)", web.Num(r.ChoGPerKgPerH, 1), len(r.Feeds), web.Num(r.GapH, 1))
			case i+1 < len(plan.Stages):
				row.Refuel = fmt.Sprintf("a recovery feed, then the day's targets (next stage in %s h)", web.Num(r.GapH, 1))
			default:
				row.Refuel = "a recovery feed, then the recovery day"
			}
		}
		row.Findings = take("stage:" + strconv.Itoa(i))
		rp.StageFindings = append(rp.StageFindings, row.Findings...)
		rp.Stages = append(rp.Stages, row)
	}
	return rp
}

// stageOverrideValues fills the stage inputs from a request's overrides.
func stageOverrideValues(v url.Values, req fuel.Request) {
	for _, o := range req.StageOverrides {
		v.Set(stageGPHName(o.Stage), web.Num(o.ChoGPerH, 1))
	}
}

// decodeStageOverride reads one stage input; ok is false when the name is
// not a stage input.
func decodeStageOverride(f forms.Form, req *fuel.Request, name, raw string) bool {
	if !strings.HasPrefix(name, stageGPHPrefix) {
		return false
	}
	i, err := strconv.Atoi(strings.TrimPrefix(name, stageGPHPrefix))
	if err != nil || req.Event == nil || i < 0 || i >= len(req.Event.Stages) {
		return true // not a stage of this plan: ignored
	}
	x, err := forms.ParseNumber(raw)
	if err != nil || x < 0 || x > 150 || math.IsNaN(x) {
		f.Errors.Add(name, fmt.Sprintf("In-stage carbohydrate of stage %d must be a number from 0 to 150 g/h.", i+1))
		return true
	}
	req.StageOverrides = append(req.StageOverrides, fuel.StageOverride{Stage: i, ChoGPerH: x})
	return true
}

package fuel

import (
	"fmt"
	"math"
	"time"
)

// eventChecks are the cross-field rules of segments, stages, caffeine and
// stage overrides.
func (r Request) eventChecks() ValidationError {
	var out ValidationError
	add := func(field, msg string) { out = append(out, FieldError{Field: field, Message: msg}) }
	e := r.Event
	if e != nil && len(e.Segments) > 0 && len(e.Stages) > 0 {
		add("event.stages", "cannot be given with segments; an event is either multi-sport or a stage race")
	}
	if e != nil && len(e.Segments) > 0 {
		var sum float64
		eats := false
		for i, s := range e.Segments {
			sum += s.ExpectedDurationMin
			if i == 0 && s.Modality == "transition" {
				add("event.segments[0].modality", "cannot be a transition; the event starts with a leg")
			}
			eats = eats || s.Modality != "transition"
			if s.AveragePowerW != nil && s.Modality != "cycle" {
				add(fmt.Sprintf("event.segments[%d].average_power_w", i), "applies only to a cycle leg")
			}
		}
		if e.ExpectedDurationMin > 0 && math.Abs(sum-e.ExpectedDurationMin) > 0.1*e.ExpectedDurationMin {
			add("event.expected_duration_min", fmt.Sprintf("is %g min, but the segments add up to %g min; make them agree (within 10%%)", e.ExpectedDurationMin, sum))
		}
		if !eats {
			add("event.segments", "must hold at least one leg that is not a transition")
		}
	}
	if e != nil && len(e.Stages) > 0 {
		if n := len(e.Stages); n < int(gStageCount.Min) {
			add("event.stages", fmt.Sprintf("must hold %g to %g stages (it holds %d)", gStageCount.Min, gStageCount.Max, n))
		}
		if !e.StartsAt.IsZero() && !e.Stages[0].StartsAt.IsZero() && !e.StartsAt.Equal(e.Stages[0].StartsAt) {
			add("event.starts_at", "must be the first stage's start")
		}
		var prevEnd time.Time
		for i, s := range e.Stages {
			f := fmt.Sprintf("event.stages[%d].starts_at", i)
			if s.StartsAt.IsZero() {
				continue
			}
			if y := s.StartsAt.Year(); y < 2000 || y > 2100 {
				add(f, "must be a date between the years 2000 and 2100")
			}
			if i > 0 && !prevEnd.IsZero() && s.StartsAt.Before(prevEnd) {
				add(f, fmt.Sprintf("must be after stage %d finishes (%s)", i, prevEnd.Format("2006-01-02 15:04")))
			}
			prevEnd = s.StartsAt.Add(time.Duration(s.ExpectedDurationMin * float64(time.Minute)))
			if i > 0 && s.StartsAt.Sub(e.Stages[0].StartsAt) > 60*24*time.Hour {
				add(f, "must be within 60 days of the first stage")
			}
			if s.AveragePowerW != nil && s.Modality != "cycle" {
				add(fmt.Sprintf("event.stages[%d].average_power_w", i), "applies only to a cycling stage")
			}
		}
	}
	if r.CaffeineMgPerKg != nil && r.Kind != KindRace && r.Kind != KindLoading {
		add("caffeine_mg_per_kg", "applies only to race and loading plans (caffeine before a start)")
	}
	if r.RepletionCaffeineMgPerKg != nil {
		stages := e != nil && len(e.Stages) > 0
		if r.Kind != KindRepletion && !stages {
			add("repletion_caffeine_mg_per_kg", "applies only to repletion plans and stage races (caffeine with speedy refuelling)")
		}
	}
	seen := map[int]bool{}
	for i, o := range r.StageOverrides {
		f := fmt.Sprintf("stage_overrides[%d].stage", i)
		switch {
		case e == nil || len(e.Stages) == 0:
			add(f, "applies only to a stage race")
		case o.Stage >= len(e.Stages):
			add(f, fmt.Sprintf("names stage %d, but the race has %d stages (numbered from 0)", o.Stage, len(e.Stages)))
		case seen[o.Stage]:
			add(f, "changes the same stage twice")
		}
		seen[o.Stage] = true
	}
	return out
}

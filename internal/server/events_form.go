package server

import (
	"fmt"
	"math"
	"time"

	"larder/internal/forms"
)

// checkLegs reads the event form's legs and stages; a fault names its line
// beside the box, and what was typed stays in it.
func (in *eventForm) checkLegs(f forms.Form) {
	if in.Segments != "" && f.Err("segments") == "" {
		segs, err := forms.ParseSegments(in.Segments)
		switch {
		case err != nil:
			f.Errors.Add("segments", err.Error())
		case len(segs) > 0 && in.ExpectedDurationMin != nil:
			var sum float64
			for _, s := range segs {
				sum += s.ExpectedDurationMin
			}
			if want := float64(*in.ExpectedDurationMin); math.Abs(sum-want) > 0.1*want {
				f.Errors.Add("segments", fmt.Sprintf("The legs add up to %g min, but the expected duration is %g min; make them agree (within 10%%).", sum, want))
			}
		}
		in.segments = segs
	}
	if in.Stages != "" && f.Err("stages") == "" {
		loc, err := time.LoadLocation(in.TimeZone)
		if err != nil {
			return // the time zone's own message says what is wrong
		}
		stages, err := forms.ParseStages(in.Stages, loc)
		if err != nil {
			f.Errors.Add("stages", err.Error())
		}
		in.stages = stages
	}
	if len(in.segments) > 0 && len(in.stages) > 0 {
		f.Errors.Add("stages", "An event has legs (multi-sport) or stages (a stage race), not both; empty one of the boxes.")
	}
}

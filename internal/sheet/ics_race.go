package sheet

import (
	"fmt"
	"strconv"
	"strings"
	"time"

	"larder/internal/fuel"
)

// Calendar entries of events as they are raced: one per stage of a stage
// race and one per block of hours of an event over a day. Each is listed
// when its start falls on one of the plan's days (the feed is given only
// the days the client follows this plan on).

// icsRaceEntries are the entries of the plan's stages and hour blocks.
func icsRaceEntries(p ICSPlan, uid func(string) string) []ICSEvent {
	days := make(map[string]bool, len(p.Plan.Days))
	for _, d := range p.Plan.Days {
		days[d.Date] = true
	}
	// Plan times carry the plan's own offset, so their date is the plan
	// day's.
	on := func(t time.Time) bool { return days[t.Format(time.DateOnly)] }
	var out []ICSEvent
	for i, st := range p.Plan.Stages {
		if on(st.StartsAt) {
			out = append(out, icsStage(p, i, uid))
		}
	}
	if de := p.Plan.DuringEvent; de != nil {
		for i, b := range de.Blocks {
			if on(b.From) {
				out = append(out, icsBlock(p, i, b, uid))
			}
		}
	}
	return out
}

// icsStage is one stage of a stage race: its in-stage g/h in the summary;
// the meal before it and the refuelling after it in the description.
func icsStage(p ICSPlan, i int, uid func(string) string) ICSEvent {
	st := p.Plan.Stages[i]
	name := "Stage " + strconv.Itoa(i+1)
	if p.EventName != "" && p.EventName != "Event start" {
		name = p.EventName + " · stage " + strconv.Itoa(i+1)
	}
	e := ICSEvent{UID: uid(fmt.Sprintf("stage-%d", i)), Sequence: p.Version, Stamp: p.Published, Start: st.StartsAt,
		Duration: time.Duration(st.DurationMin * float64(time.Minute)), Summary: name + " · no carbohydrate needed during it"}
	var desc []string
	if m := st.PreEventMeal; m != nil {
		desc = append(desc, "Pre-stage meal at "+m.At.Format("15:04")+": carbohydrate "+icsGrams(m.ChoG)+" g.")
	}
	if de := st.DuringEvent; de != nil && de.ChoGPerH > 0 {
		e.Summary = name + " · carbohydrate " + icsGrams(de.ChoGPerH) + " g per hour"
		desc = append(desc, "During the stage aim for about "+icsGrams(de.ChoGPerH)+" g of carbohydrate per hour ("+
			icsGrams(de.TotalChoG)+" g in all), as you practised in training.")
	}
	if r := st.Repletion; r != nil && len(r.Feeds) > 0 {
		var total float64
		for _, f := range r.Feeds {
			total += f.ChoG
		}
		first := r.Feeds[0].At.Format("15:04")
		if r.Speedy {
			desc = append(desc, fmt.Sprintf("After the finish: speedy refuelling from %s, %s g of carbohydrate in %d feeds before the next stage (each is in your calendar).",
				first, icsGrams(total), len(r.Feeds)))
		} else {
			desc = append(desc, "After the finish: a recovery feed at "+first+" ("+icsGrams(total)+" g of carbohydrate).")
		}
	}
	desc = append(desc, fuel.Caution)
	e.Description = strings.Join(desc, "\n")
	return e
}

// icsBlock is one block of hours of an event over a day.
func icsBlock(p ICSPlan, i int, b fuel.HourBlock, uid func(string) string) ICSEvent {
	e := ICSEvent{UID: uid(fmt.Sprintf("block-%d", i)), Sequence: p.Version, Stamp: p.Published, Start: b.From,
		Duration: b.To.Sub(b.From), Summary: "In-race feeding · carbohydrate " + icsGrams(b.ChoGPerH) + " g per hour"}
	desc := []string{"From " + b.From.Format("Mon 15:04") + " to " + b.To.Format("Mon 15:04") + ": about " + icsGrams(b.ChoGPerH) +
		" g of carbohydrate per hour, " + icsGrams(b.ChoG) + " g over the block. The race carries your fuelling: no ordinary meals inside it."}
	if b.Night {
		e.Summary += " (night)"
		desc = append(desc, "Night hours: you may feel sleepy and less hungry; keep eating to the plan, warm and easily digested food where you can.")
	}
	desc = append(desc, fuel.Caution)
	e.Description = strings.Join(desc, "\n")
	return e
}

// icsLegs describes each leg of a multi-sport event, for the event's entry.
func icsLegs(de *fuel.DuringEvent) []string {
	if de == nil || len(de.Segments) == 0 {
		return nil
	}
	var out []string
	for i, s := range de.Segments {
		l := fmt.Sprintf("Leg %d, %s (%s to %s race time): ", i+1, s.Modality, clock(s.StartMin), clock(s.StartMin+s.DurationMin))
		switch {
		case s.ChoGPerH > 0:
			l += "about " + icsGrams(s.ChoGPerH) + " g of carbohydrate per hour (" + icsGrams(s.ChoG) + " g)."
		case s.Modality == "swim":
			l += "nothing to eat while swimming."
		default:
			l += "nothing planned."
		}
		out = append(out, l)
	}
	return out
}

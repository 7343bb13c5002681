package sheet

import (
	"fmt"
	"strconv"
	"strings"

	"larder/internal/fuel"
)

// The sheet's part for events as they are raced: the legs of a multi-sport
// event, the stages of a stage race and the blocks of hours of an event
// over a day. Each is a table of figures the engine computed.

// raceParts prints the legs, stages and hour blocks the plan has.
func (d *doc) raceParts() {
	p := d.s.Plan
	if de := p.DuringEvent; de != nil && len(p.Stages) == 0 {
		if len(de.Segments) > 0 {
			d.legsTable(de.Segments)
		}
		if len(de.Blocks) > 0 {
			d.blocksTable(de.Blocks)
		}
	}
	if len(p.Stages) > 0 {
		d.stagesTable(p.Stages)
	}
}

// legsTable prints each leg: when it runs, its energy and its carbohydrate
// per hour, none where one cannot eat.
func (d *doc) legsTable(segs []fuel.SegmentPlan) {
	cols := []column{
		{"Leg", "", 9, "L"}, {"Activity", "", 24, "L"}, {"Distance", "", 18, "R"}, {"From – to (race time)", "", 38, "L"},
		{"Energy", "", 20, "R"}, {"Carbohydrate in the leg", "", 0, "L"}, {"Stores run low", "", 34, "L"},
	}
	if d.athlete() {
		// The athlete's form: when and how much to eat, no energy or store figures.
		cols = []column{cols[0], cols[1], cols[2], cols[3], cols[5]}
	}
	var rows [][]string
	for i, s := range segs {
		dist := "–"
		if s.DistanceKm != nil {
			dist = num(*s.DistanceKm, 1) + " km"
		}
		runs := "they last"
		if s.RunsOutAtMin != nil {
			runs = runsOut(s.RunsOutAtKm, s.RunsOutAtMin) + " into the leg"
		}
		span := clock(s.StartMin) + " – " + clock(s.StartMin+s.DurationMin)
		if d.athlete() {
			rows = append(rows, []string{strconv.Itoa(i + 1), s.Modality, dist, span, legGrams(s)})
			continue
		}
		rows = append(rows, []string{strconv.Itoa(i + 1), s.Modality, dist, span,
			num(s.EnergyKcal, 0) + " kcal", legGrams(s), runs})
	}
	d.heading("Legs of the race", 8+2*4)
	d.note("In-event carbohydrate leg by leg. Nothing is planned in the swim or the transitions, where one cannot eat; race time counts from the start.")
	d.table(cols, rows)
}

// legGrams is a leg's carbohydrate in words.
func legGrams(s fuel.SegmentPlan) string {
	switch {
	case s.ChoGPerH > 0:
		return num(s.ChoGPerH, 0) + " g/h (" + num(s.ChoG, 0) + " g)"
	case s.Modality == "swim":
		return "none: cannot eat while swimming"
	case s.Modality == "transition":
		return "none"
	}
	return "none needed"
}

// clock writes minutes of race time as h:mm.
func clock(min float64) string {
	m := int(min + 0.5)
	return fmt.Sprintf("%d:%02d", m/60, m%60)
}

// blocksTable prints the in-event plan of an event over a day by blocks of
// hours, nights marked.
func (d *doc) blocksTable(blocks []fuel.HourBlock) {
	cols := []column{
		{"From", "", 32, "L"}, {"To", "", 32, "L"}, {"g/h", "", 16, "R"}, {"Carbohydrate g", "", 28, "R"}, {"", "", 0, "L"},
	}
	var rows [][]string
	for _, b := range blocks {
		night := ""
		if b.Night {
			night = "night: warm, easily digested food where possible"
		}
		rows = append(rows, []string{b.From.In(d.loc).Format("Mon 15:04"), b.To.In(d.loc).Format("Mon 15:04"),
			num(b.ChoGPerH, 0), num(b.ChoG, 0), night})
	}
	d.heading("In-event feeding by block of hours", 8+2*4)
	d.note("The race carries the plan through the day and the night: no ordinary meals inside it. Spread each block's grams over its hours.")
	d.table(cols, rows)
}

// stagesTable prints each stage: the pre-stage meal, in-stage g/h and the
// refuelling after its finish.
func (d *doc) stagesTable(stages []fuel.StagePlan) {
	cols := []column{
		{"Stage", "", 10, "L"}, {"Start", "", 23, "L"}, {"Activity", "", 30, "L"}, {"Pre-stage meal", "", 36, "L"},
		{"In-stage", "", 26, "L"}, {"After the finish", "", 0, "L"},
	}
	overrides := false
	var rows [][]string
	for i, st := range stages {
		pre := "none needed (60 min or less)"
		if m := st.PreEventMeal; m != nil {
			pre = num(m.ChoG, 0) + " g carbohydrate at " + m.At.In(d.loc).Format("15:04")
		} else if st.DurationMin > 60 && i > 0 {
			pre = "the refuelling feeds after the stage before"
		}
		in := "none needed"
		if de := st.DuringEvent; de != nil && de.ChoGPerH > 0 {
			in = num(de.ChoGPerH, 0) + " g/h (" + num(de.TotalChoG, 0) + " g)"
		}
		if de := st.DuringEvent; de != nil && de.Overridden {
			in += " *"
			overrides = true
		}
		rows = append(rows, []string{strconv.Itoa(i + 1), st.StartsAt.In(d.loc).Format("Mon 2 Jan 15:04"),
			st.Modality + ", " + hoursWords(st.DurationMin), pre, in, d.stageRefuel(st, i+1 < len(stages))})
	}
	d.heading("Stages", 8+2*4)
	msg := "Each stage: the meal before it, carbohydrate during it and the refuelling after its finish; the times are in the feeds below."
	switch {
	case overrides && d.athlete():
		msg += " * set by your dietitian for you."
	case overrides:
		msg += " * set by the dietitian (override)."
	}
	d.note(msg)
	d.table(cols, rows)
}

// stageRefuel is the refuelling after a stage's finish, in words.
func (d *doc) stageRefuel(st fuel.StagePlan, more bool) string {
	r := st.Repletion
	if r == nil || len(r.Feeds) == 0 {
		if more {
			return "the day's targets until the next stage"
		}
		return "the recovery day"
	}
	first := r.Feeds[0].At.In(d.loc).Format("15:04")
	var total float64
	for _, f := range r.Feeds {
		total += f.ChoG
	}
	switch {
	case r.Speedy && d.athlete():
		return fmt.Sprintf("refuel quickly from %s: %d feeds, %s g carbohydrate in all (next stage in %s h)",
			first, len(r.Feeds), num(total, 0), num(r.GapH, 1))
	case r.Speedy:
		return fmt.Sprintf("speedy refuelling from %s: %s g/kg/h, %d feeds, %s g in all (next stage in %s h)",
			first, strconv.FormatFloat(r.ChoGPerKgPerH, 'f', 1, 64), len(r.Feeds), num(total, 0), num(r.GapH, 1))
	case more:
		return fmt.Sprintf("recovery feed at %s (%s g), then the day's targets (next stage in %s h)", first, num(total, 0), num(r.GapH, 1))
	}
	return fmt.Sprintf("recovery feed at %s (%s g), then the recovery day", first, num(total, 0))
}

// note prints a small muted line under a heading.
func (d *doc) note(text string) {
	d.font("", 7.5)
	d.color(colMuted)
	d.para(text, 3.4)
	d.color(colInk)
	d.f.Ln(0.6)
}

// table prints a table of wrapped cells; a column of width 0 takes what
// the others leave. The head is printed again after a page break.
func (d *doc) table(cols []column, rows [][]string) {
	f := d.f
	used := 0.0
	for _, c := range cols {
		used += c.w
	}
	for i := range cols {
		if cols[i].w == 0 {
			cols[i].w = d.w - used
		}
	}
	head := func() {
		d.font("B", 7.5)
		d.color(colMuted)
		y := f.GetY()
		x := marginX
		for _, c := range cols {
			f.SetXY(x, y)
			d.cell(c.w, 3.8, d.tr(c.title), "", 0, c.align, false)
			x += c.w
		}
		d.draw(colInk)
		f.SetLineWidth(0.3)
		f.Line(marginX, y+4.2, marginX+d.w, y+4.2)
		f.SetY(y + 4.6)
		d.color(colInk)
	}
	head()
	for _, row := range rows {
		d.font("", 8.3)
		cells := make([][]string, len(cols))
		n := 1
		for i, c := range cols {
			cells[i] = d.lines(strings.TrimSpace(row[i]), c.w-1.2)
			n = max(n, len(cells[i]))
		}
		h := float64(n)*3.7 + 1.4
		if d.need(h) {
			head()
		}
		y := f.GetY()
		x := marginX
		for i, c := range cols {
			d.font("", 8.3)
			if i == 0 {
				d.font("B", 8.3)
			}
			for j, l := range cells[i] {
				f.SetXY(x, y+0.7+float64(j)*3.7)
				d.cell(c.w-1.2, 3.7, l, "", 0, c.align, false)
			}
			x += c.w
		}
		d.draw(colRule)
		f.SetLineWidth(0.2)
		f.Line(marginX, y+h, marginX+d.w, y+h)
		f.SetY(y + h)
	}
}

// raceSubject names a finding's subject of the race parts, in words; ok is
// false for the other subjects.
func (d *doc) raceSubject(parts []string) (string, bool) {
	switch {
	case parts[0] == "pre_event_caffeine":
		return "Caffeine", true
	case parts[0] == "stage" && len(parts) == 2:
		i, err := strconv.Atoi(parts[1])
		if err == nil {
			return "Stage " + strconv.Itoa(i+1), true
		}
	case parts[0] == "during_event" && len(parts) == 3 && parts[1] == "segment":
		i, err := strconv.Atoi(parts[2])
		if de := d.s.Plan.DuringEvent; err == nil && de != nil && i >= 0 && i < len(de.Segments) {
			return "Leg " + strconv.Itoa(i+1) + " (" + de.Segments[i].Modality + ")", true
		}
	}
	return "", false
}

// feedLabel names a day's feed as the sheet prints it.
func (d *doc) feedLabel(fd fuel.Feed) string { return FeedLabel(d.s.Plan, fd) }

// FeedLabel names a day's feed as the sheet prints it: an in-event feed of a
// stage or of a block of hours says which, so an athlete in a stage race
// reads "during stage 2" rather than a bare "during event".
func FeedLabel(p fuel.Plan, fd fuel.Feed) string {
	if fd.Label != "during event" {
		return fd.Label
	}
	for i, st := range p.Stages {
		if st.StartsAt.Equal(fd.At) {
			return "during stage " + strconv.Itoa(i+1)
		}
	}
	if de := p.DuringEvent; de != nil {
		for _, b := range de.Blocks {
			if b.From.Equal(fd.At) {
				return "race, next " + num(b.To.Sub(b.From).Hours(), 1) + " h"
			}
		}
	}
	return fd.Label
}

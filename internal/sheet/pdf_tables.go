package sheet

import (
	"fmt"
	"slices"
	"strconv"
	"time"

	"larder/internal/mass"

	"larder/internal/fuel"
	"larder/internal/menu"
)

// The sheet's tables: day by day, the event's figures, repletion and feeds.

type column struct {
	title, group string
	w            float64
	align        string
}

// dayTable is the day-by-day table.
func (d *doc) dayTable() {
	p := d.s.Plan
	if len(p.Days) == 0 {
		return
	}
	d.heading("Day by day", 8+9)
	// Two header lines: what (Carbohydrate spans its two columns), then the unit.
	cols := []column{
		{"Date", "", 24, "L"}, {"Training", "", 0, "L"}, {"Load band", "", 21, "L"}, {"g/kg", "Carbohydrate", 16, "R"},
		{"g", "", 15, "R"}, {"g", "Protein", 15, "R"}, {"g", "Fat", 13, "R"}, {"kcal", "Energy", 15, "R"},
	}
	used := 0.0
	for _, c := range cols {
		used += c.w
	}
	cols[1].w = d.w - used
	header := func() {
		d.font("B", 7.5)
		d.color(colMuted)
		y := d.f.GetY()
		x := marginX
		for i, c := range cols {
			if c.group != "" {
				w, align := c.w, c.align
				if c.group == "Carbohydrate" { // over g/kg and g
					w, align = c.w+cols[i+1].w, "C"
				}
				d.f.SetXY(x, y)
				d.cell(w, 3.4, d.tr(c.group), "", 0, align, false)
			}
			d.f.SetXY(x, y+3.4)
			d.cell(c.w, 3.4, d.tr(c.title), "", 0, c.align, false)
			x += c.w
		}
		d.draw(colInk)
		d.f.SetLineWidth(0.3)
		d.f.Line(marginX, y+7.4, marginX+d.w, y+7.4)
		d.f.SetY(y + 8)
		d.color(colInk)
	}
	d.need(8 + 9)
	header()
	overrides := false
	for _, day := range p.Days {
		training := d.s.Training[day.Date]
		if training == "" {
			training = "rest"
			if day.TrainingMin > 0 {
				training = num(day.TrainingMin, 0) + " min"
			}
		}
		role := day.Role
		if day.LowFibre {
			role += " · low fibre"
		}
		band := bandWords(day.LoadBand)
		check := ""
		if day.BandMaxGPerKg > 0 {
			check = "range " + num(day.BandMinGPerKg, 0) + "–" + num(day.BandMaxGPerKg, 0)
			if day.Role == fuel.RoleLoad {
				check = "loading " + num(day.BandMinGPerKg, 0) + "–" + num(day.BandMaxGPerKg, 0)
			}
		}
		gkg := strconv.FormatFloat(day.ChoGPerKg, 'f', 1, 64)
		if day.Overridden {
			gkg += " *"
			overrides = true
		}
		cells := [][]string{
			{dayWords(day.Date), role},
			nil,
			{band, check},
			{gkg}, {num(day.ChoG, 0)}, {num(day.ProteinG, 0)}, {num(day.FatG, 0)}, {num(day.EnergyKcal, 0)},
		}
		d.font("", 8.5)
		tl := d.lines(training, cols[1].w)
		rows := max(2, len(tl))
		h := float64(rows)*3.8 + 1.6
		if d.need(h) {
			header()
		}
		y := d.f.GetY()
		x := marginX
		for i, c := range cols {
			var ls []string
			if i == 1 {
				ls = tl
			} else {
				ls = cells[i]
			}
			for j, l := range ls {
				d.font("", 8.5)
				d.color(colInk)
				if j > 0 {
					d.font("", 7)
					d.color(colMuted)
				}
				if i == 0 && j == 0 {
					d.font("B", 8.5)
				}
				if i == 1 { // training lines all in the body font
					d.font("", 8.5)
					d.color(colInk)
				}
				d.f.SetXY(x, y+0.8+float64(j)*3.8)
				text := l
				if i != 1 {
					text = d.tr(l)
				}
				d.cell(c.w, 3.8, text, "", 0, c.align, false)
			}
			x += c.w
		}
		d.draw(colRule)
		d.f.SetLineWidth(0.2)
		d.f.Line(marginX, y+h, marginX+d.w, y+h)
		d.f.SetY(y + h)
	}
	d.color(colMuted)
	d.font("", 7.5)
	d.f.Ln(0.8)
	note := "Range: the guideline range each day's carbohydrate is checked against (g/kg body mass per day)."
	if overrides {
		note += " * set by the dietitian (override); checked against the guidelines like any other value."
	}
	d.para(note, 3.4)
	d.color(colInk)
}

// eventFigures prints the pre-event meal, in-event fuelling, the stores
// expected at the start and the body-mass gain.
func (d *doc) eventFigures() {
	p := d.s.Plan
	var rows []pair
	// A stage race's meals and in-stage figures are in its stages table.
	stages := len(p.Stages) > 0
	if m := p.PreEventMeal; m != nil && !stages {
		v := fmt.Sprintf("%s g carbohydrate (%s g/kg) at %s, %s h before the start.",
			num(m.ChoG, 0), strconv.FormatFloat(m.ChoGPerKg, 'f', 1, 64), m.At.In(d.loc).Format("Mon 2 Jan 15:04"), num(m.HoursBefore, 1))
		// Stored suggestions are keyed by the date in the time's own offset;
		// near midnight that can differ from the date in the plan's zone.
		if sg := d.s.Suggestions[menu.FeedKey("pre_event", m.At.In(d.loc).Format(time.DateOnly), 0)]; sg != "" {
			v += " For example: " + sg
		} else if sg := d.s.Suggestions[menu.FeedKey("pre_event", m.At.Format(time.DateOnly), 0)]; sg != "" {
			v += " For example: " + sg
		}
		rows = append(rows, pair{"Pre-event meal", v})
	}
	if e := p.DuringEvent; e != nil && !stages {
		v := fmt.Sprintf("%s g/h over %s, %s g in all.", num(e.ChoGPerH, 0), hoursWords(e.DurationMin), num(e.TotalChoG, 0))
		if e.ChoGPerH == 0 {
			v = "No carbohydrate needed during an event of " + hoursWords(e.DurationMin) + "."
		}
		if e.Overridden {
			v += " Set by the dietitian (override)."
		}
		if len(e.Segments) > 0 {
			v += " Leg by leg below: none in the swim."
		}
		rows = append(rows, pair{"In-event carbohydrate", v})
	}
	if g := p.Glycogen; g != nil {
		v := fmt.Sprintf("Muscle %s g of %s g possible; liver %s g.", num(g.MuscleGStart, 0), num(g.MuscleGCapacity, 0), num(g.LiverGStart, 0))
		if g.UsualIntakeMuscleGStart != nil {
			v += " With the usual intake instead of this plan: muscle " + num(*g.UsualIntakeMuscleGStart, 0) + " g."
		}
		label := "Expected glycogen at the start"
		if p.DuringEvent == nil { // no event: the stores at the end of the plan's last day
			label = "Expected glycogen at the end"
		}
		rows = append(rows, pair{label, v})
		switch {
		case p.DuringEvent == nil:
		case g.RunsOutAtMin == nil && g.RunsOutWithIntakeAtMin == nil:
			rows = append(rows, pair{"Where stores would run out", "They last the whole event."})
		default:
			rows = append(rows, pair{"Where stores would run out", "Without intake: " + runsOut(g.RunsOutAtKm, g.RunsOutAtMin) +
				". With the planned intake: " + runsOut(g.RunsOutWithIntakeAtKm, g.RunsOutWithIntakeAtMin) + "."})
		}
	}
	if p.ExpectedMassGainKg != nil {
		hi := *p.ExpectedMassGainKg
		if p.ExpectedMassGainKgMax != nil {
			hi = *p.ExpectedMassGainKgMax
		}
		rows = append(rows, pair{"Expected body-mass gain", mass.Difference(*p.ExpectedMassGainKg, hi, d.s.unit()) +
			" above the usual diet, from glycogen stored with its water; expected, not a sign of fat gain."})
	}
	if len(rows) == 0 {
		return
	}
	title := "Glycogen stores"
	switch p.Kind {
	case fuel.KindLoading:
		title = "Event day and stores"
	case fuel.KindRace:
		title = "Race day"
	}
	d.heading(title, 9)
	d.pairRows(rows, 46)
}

// pairRows prints labelled rows, labels in a column of width keyW.
func (d *doc) pairRows(rows []pair, keyW float64) {
	f := d.f
	for _, r := range rows {
		d.font("", 9)
		vl := d.lines(r.v, d.w-keyW)
		h := float64(len(vl)) * 4.1
		d.need(h + 1)
		y := f.GetY()
		d.font("B", 8.5)
		d.color(colInk)
		f.SetXY(marginX, y)
		d.cell(keyW, 4.1, d.tr(r.k), "", 0, "L", false)
		d.font("", 9)
		for i, l := range vl {
			f.SetXY(marginX+keyW, y+float64(i)*4.1)
			d.cell(d.w-keyW, 4.1, l, "", 0, "L", false)
		}
		f.SetY(y + h + 1)
	}
}

func (d *doc) repletion() {
	r := d.s.Plan.Repletion
	if r == nil {
		return
	}
	d.heading("Repletion", 9)
	v := num(r.GapH, 1) + " h between the sessions. "
	if r.Speedy {
		v += "Speedy refuelling: " + strconv.FormatFloat(r.ChoGPerKgPerH, 'f', 1, 64) + " g/kg/h for the first hours, then back to the day's needs."
	} else {
		v += "Long enough for the day's normal targets; no speedy protocol."
	}
	d.pairRows([]pair{
		{"Repletion window", v},
		{"Expected muscle glycogen", num(r.MuscleGAtNextStart, 0) + " g of " + num(r.MuscleGCapacity, 0) + " g possible at the next start."},
	}, 46)
	var feeds []feedRow
	for i, fd := range r.Feeds {
		date := fd.At.In(d.loc).Format(time.DateOnly)
		sg := d.s.Suggestions[menu.FeedKey("repletion", date, i)]
		if sg == "" {
			sg = d.s.Suggestions[menu.FeedKey("repletion", fd.At.Format(time.DateOnly), i)]
		}
		feeds = append(feeds, feedRow{at: fd.At.In(d.loc).Format("Mon 15:04"), label: fd.Label, cho: fd.ChoG, prot: fd.ProteinG,
			overridden: fd.Overridden, suggestion: sg})
	}
	switch {
	case len(feeds) == 0:
	case d.inDayFeeds(r.Feeds):
		d.font("", 8)
		d.color(colMuted)
		d.para("The repletion feeds are listed with the day's feeds below.", 3.6)
		d.color(colInk)
	default:
		d.f.Ln(0.5)
		d.headPage = 0
		d.feedTable(feeds, 20)
		d.headPage = 0
	}
}

// inDayFeeds reports whether every one of feeds is also among the days'
// feeds, which the sheet prints anyway.
func (d *doc) inDayFeeds(feeds []fuel.Feed) bool {
	for _, x := range feeds {
		found := false
		for _, day := range d.s.Plan.Days {
			for _, y := range day.Feeds {
				if y.At.Equal(x.At) && y.ChoG == x.ChoG && y.Label == x.Label {
					found = true
				}
			}
		}
		if !found {
			return false
		}
	}
	return true
}

type feedRow struct {
	at, label  string
	cho, prot  float64
	overridden bool
	suggestion string
}

// feedTable prints feeds: time, occasion, carbohydrate, protein, suggestion.
func (d *doc) feedTable(rows []feedRow, timeW float64) {
	f := d.f
	labelW, choW, protW := 25.0, 17.0, 14.0
	sugX := marginX + timeW + labelW + choW + protW + 3
	sugW := marginX + d.w - sugX
	// The column heads print once a page: every feed table has the same columns.
	head := func() {
		if d.headPage == f.PageNo() {
			return
		}
		d.headPage = f.PageNo()
		d.font("B", 7)
		d.color(colMuted)
		y := f.GetY()
		f.SetXY(marginX, y)
		d.cell(timeW, 3.6, "Time", "", 0, "L", false)
		d.cell(labelW, 3.6, "Occasion", "", 0, "L", false)
		d.cell(choW, 3.6, "Carbohydrate g", "", 0, "R", false)
		d.cell(protW, 3.6, "Protein g", "", 0, "R", false)
		f.SetX(sugX)
		d.cell(sugW, 3.6, "Food suggestion", "", 1, "L", false)
		d.color(colInk)
	}
	head()
	for _, r := range rows {
		// The foods in a type a little smaller than the figures', so that
		// a meal of three foods mostly takes one line and a plan of many
		// days stays within the sheet's pages.
		const size = 7.2
		d.font("", size)
		sl := d.lines(r.suggestion, sugW)
		if r.suggestion == "" {
			sl = []string{""}
		}
		h := float64(len(sl))*3.4 + 0.6
		if d.need(h) {
			head()
		}
		y := f.GetY()
		d.font("", 8.5)
		f.SetXY(marginX, y)
		d.cell(timeW, 3.6, d.tr(r.at), "", 0, "L", false)
		d.cell(labelW, 3.6, d.tr(r.label), "", 0, "L", false)
		cho := num(r.cho, 0)
		if r.overridden {
			cho += " *"
		}
		d.cell(choW, 3.6, cho, "", 0, "R", false)
		prot := "–"
		if r.prot > 0 {
			prot = num(r.prot, 0)
		}
		d.cell(protW, 3.6, d.tr(prot), "", 0, "R", false)
		d.font("", size)
		d.color(colMuted)
		for i, l := range sl {
			f.SetXY(sugX, y+float64(i)*3.4+0.2)
			d.cell(sugW, 3.4, l, "", 0, "L", false)
		}
		d.color(colInk)
		f.SetY(y + h)
	}
}

// feeds prints each day's eating occasions with their food suggestions.
func (d *doc) feeds() {
	p := d.s.Plan
	hasFeeds := false
	for _, day := range p.Days {
		if len(day.Feeds) > 0 {
			hasFeeds = true
		}
	}
	if !hasFeeds {
		return
	}
	d.heading("Feeds day by day", 8+5+3.6+2*3.8)
	d.font("", 7.5)
	d.color(colMuted)
	d.para("Times in "+d.zone+". Suggestions are examples from the practice's food list that add up to the feed's carbohydrate and, at meals and snacks, its protein; swap for foods you know you tolerate. * set by the dietitian (override).", 3.4)
	d.color(colInk)
	var prevAdvice []string
	for _, day := range p.Days {
		if len(day.Feeds) == 0 {
			continue
		}
		var rows []feedRow
		for i, fd := range day.Feeds {
			rows = append(rows, feedRow{at: fd.At.In(d.loc).Format("15:04"), label: d.feedLabel(fd), cho: fd.ChoG, prot: fd.ProteinG,
				overridden: fd.Overridden, suggestion: d.s.Suggestions[menu.FeedKey("day", day.Date, i)]})
		}
		title := dayWords(day.Date) + " · " + day.Role + " · " + num(day.ChoG, 0) + " g carbohydrate (" +
			strconv.FormatFloat(day.ChoGPerKg, 'f', 1, 64) + " g/kg)"
		if day.LowFibre {
			title += " · low fibre"
		}
		d.need(5 + 3.6 + 2*3.8)
		d.f.Ln(1)
		d.font("B", 8.8)
		d.f.SetX(marginX)
		d.cell(d.w, 4.6, d.tr(title), "", 1, "L", false)
		d.feedTable(rows, 12)
		// Advice the day before already gave (the second of two load days)
		// is not printed again: the days sit one under the other.
		if len(day.Advice) > 0 && !slices.Equal(day.Advice, prevAdvice) {
			d.font("", 7.6)
			d.color(colMuted)
			for _, a := range day.Advice {
				d.need(3.4)
				d.para(a, 3.4)
			}
			d.color(colInk)
		}
		prevAdvice = day.Advice
		d.draw(colRule)
		d.f.SetLineWidth(0.15)
		y := d.f.GetY() + 0.6
		d.f.Line(marginX, y, marginX+d.w, y)
		d.f.SetY(y)
	}
}

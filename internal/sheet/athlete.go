package sheet

import (
	"slices"
	"strings"
	"time"

	"larder/internal/mass"

	"larder/internal/fuel"
	"larder/internal/menu"
)

// The athlete's form of the sheet: what to eat and when, in plain words,
// with the dietitian's notes. It carries no guideline checks, sources,
// fat-free mass, glycogen model or overrides (the dietitian's form has
// those), never the recorded cautions (only the health note the dietitian
// shared), and energy and body-mass figures only when the dietitian chose
// to show them to this athlete.

// Form is which of the sheet's two forms prints.
type Form string

// The two forms. The zero value prints the dietitian's.
const (
	FormStaff   Form = "staff"
	FormAthlete Form = "athlete"
)

// ParseForm reads a ?form= value: empty means the dietitian's form.
func ParseForm(s string) (Form, bool) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "", "staff":
		return FormStaff, true
	case "athlete":
		return FormAthlete, true
	}
	return "", false
}

func (d *doc) athlete() bool { return d.s.Form == FormAthlete }

// formName heads every page.
func (d *doc) formName() string {
	if d.athlete() {
		return "Your fuelling plan"
	}
	return "Plan sheet"
}

// athleteBody prints the athlete's form.
func (d *doc) athleteBody() {
	f := d.f
	s := d.s
	d.font("B", 15)
	d.color(colInk)
	f.SetX(marginX)
	d.multi(d.w, 6.5, s.Title, "L")
	sub := "For " + s.ClientName
	if s.KindLabel != "" {
		sub += " · " + s.KindLabel
	}
	sub += " · version " + num(float64(s.Version), 0)
	if s.Status == StatusPublished && s.PublishedAt != nil {
		sub += ", " + s.PublishedAt.In(d.loc).Format("2 Jan 2006")
	}
	d.font("", 9.5)
	d.color(colMuted)
	d.para(sub, 4.4)
	d.para("All times are in "+d.zone+".", 4.4)
	d.color(colInk)
	f.Ln(1)
	d.sharedNote()
	d.noteBox("From your dietitian", strings.TrimSpace(s.PlanNote))
	d.athleteEvent()
	d.raceParts()
	d.athleteRepletion()
	d.athleteDays()
}

// sharedNote prints the health note the dietitian chose to share.
func (d *doc) sharedNote() {
	var lines []string
	for _, l := range d.s.SharedNote {
		if l = strings.TrimSpace(l); l != "" {
			lines = append(lines, l)
		}
	}
	if len(lines) == 0 {
		return
	}
	lines = append(lines, "If anything on this sheet seems to go against this note, ask your dietitian before you follow it.")
	d.box("A note about your health", lines, colCaution, colAmber)
}

// noteBox prints one of the dietitian's notes in a box; nothing when empty.
func (d *doc) noteBox(title, text string) {
	if text == "" {
		return
	}
	d.box(title, strings.Split(text, "\n"), colNote, rgb{238, 242, 248})
}

// box prints a titled, ruled box of paragraphs.
func (d *doc) box(title string, paras []string, edge, bg rgb) {
	f := d.f
	d.font("", 9.5)
	var body []string
	for _, p := range paras {
		body = append(body, d.lines(p, d.w-8)...)
	}
	h := 5.5 + float64(len(body))*4.4 + 2.5
	d.need(h + 2)
	x, y := marginX, f.GetY()+1
	d.fill(bg)
	d.draw(edge)
	f.SetLineWidth(0.4)
	f.Rect(x, y, d.w, h, "FD")
	f.SetLineWidth(1.8)
	f.Line(x+0.9, y+0.4, x+0.9, y+h-0.4)
	f.SetXY(x+4, y+1)
	d.font("B", 10)
	d.color(edge)
	d.cell(d.w-6, 5, d.tr(title), "", 1, "L", false)
	d.font("", 9.5)
	d.color(colInk)
	for _, l := range body {
		f.SetX(x + 4)
		d.cell(d.w-8, 4.4, l, "", 1, "L", false)
	}
	f.SetY(y + h + 2)
}

// athleteEvent prints the event, the meal before it and the fuelling in it.
func (d *doc) athleteEvent() {
	s, p := d.s, d.s.Plan
	var rows []pair
	if s.EventName != "" && s.EventStart != nil {
		rows = append(rows, pair{"Your event", s.EventName + ", start " + s.EventStart.In(d.loc).Format("Mon 2 Jan 15:04")})
	}
	// A stage race's meals and in-stage figures are in its stages table.
	stages := len(p.Stages) > 0
	if m := p.PreEventMeal; m != nil && !stages {
		v := "At " + m.At.In(d.loc).Format("Mon 2 Jan 15:04") + ", about " + plainHours(m.HoursBefore*60) +
			" before the start: " + num(m.ChoG, 0) + " g carbohydrate."
		if sg := d.suggestion("pre_event", m.At, 0); sg != "" {
			v += " For example: " + sg + "."
		}
		rows = append(rows, pair{"Meal before the start", v})
	}
	if e := p.DuringEvent; e != nil && !stages {
		v := num(e.ChoGPerH, 0) + " g carbohydrate each hour, " + num(e.TotalChoG, 0) + " g in all over " + plainHours(e.DurationMin) +
			". Use only foods and drinks you have practised with in training."
		if len(e.Segments) > 0 {
			v = num(e.TotalChoG, 0) + " g carbohydrate in all, in the legs where you can eat (see the legs below)." +
				" Use only foods and drinks you have practised with in training."
		}
		if e.ChoGPerH == 0 {
			v = "You do not need to eat during an event of " + plainHours(e.DurationMin) + "."
		}
		rows = append(rows, pair{"During the event", v})
	}
	if p.ExpectedMassGainKg != nil {
		v := "You may weigh a little more by the start: the carbohydrate you store holds water. This is expected and is not fat."
		if s.ShowFigures {
			hi := *p.ExpectedMassGainKg
			if p.ExpectedMassGainKgMax != nil {
				hi = *p.ExpectedMassGainKgMax
			}
			v = "You may weigh about " + mass.Difference(*p.ExpectedMassGainKg, hi, s.unit()) +
				" more by the start: the carbohydrate you store holds water. This is expected and is not fat."
		}
		rows = append(rows, pair{"Body weight", v})
	}
	if len(rows) == 0 {
		return
	}
	d.heading("Race day", 9)
	d.pairRows(rows, 42)
}

// athleteRepletion prints refuelling between two sessions when its feeds
// are not among the days' feeds below.
func (d *doc) athleteRepletion() {
	r := d.s.Plan.Repletion
	if r == nil || len(r.Feeds) == 0 || d.inDayFeeds(r.Feeds) {
		return
	}
	d.heading("Refuelling between your sessions", 8+2*4)
	var rows [][]string
	for i, fd := range r.Feeds {
		rows = append(rows, d.feedCells(fd, fd.At.In(d.loc).Format("Mon 15:04"), d.suggestion("repletion", fd.At, i)))
	}
	d.table(feedColumns(20), rows)
}

// suggestion is a stored food suggestion of a pre-event or repletion
// feed: keyed by the date in the plan's zone, or near midnight in the
// time's own offset.
func (d *doc) suggestion(kind string, at time.Time, i int) string {
	sg := d.s.Suggestions[menu.FeedKey(kind, at.In(d.loc).Format(time.DateOnly), i)]
	if sg == "" {
		sg = d.s.Suggestions[menu.FeedKey(kind, at.Format(time.DateOnly), i)]
	}
	if sg == menu.NoFit {
		return ""
	}
	return sg
}

func feedColumns(timeW float64) []column {
	return []column{{"Time", "", timeW, "L"}, {"Meal", "", 34, "L"}, {"Carbohydrate", "", 22, "R"}, {"Protein", "", 16, "R"},
		{"  What to eat, for example", "", 0, "L"}}
}

func (d *doc) feedCells(fd fuel.Feed, at, sugg string) []string {
	prot := ""
	if fd.ProteinG > 0 {
		prot = num(fd.ProteinG, 0) + " g"
	}
	return []string{at, mealWords(fd.Label), num(fd.ChoG, 0) + " g", prot, "  " + sugg}
}

// athleteDays prints each day: what kind of day, the training, the day's
// grams, then every feeding time with what to eat, the day's advice and
// the dietitian's note on the day.
func (d *doc) athleteDays() {
	p := d.s.Plan
	if len(p.Days) == 0 {
		return
	}
	d.heading("Day by day: when and what to eat", 8+5+4.6+2*4.4)
	var prevAdvice []string
	for _, day := range p.Days {
		d.need(5 + 4.4*2 + 4.6 + 4.4)
		d.f.Ln(1.5)
		d.font("B", 10)
		d.color(colInk)
		d.f.SetX(marginX)
		d.cell(d.w, 5, d.tr(dayWords(day.Date)+" · "+roleWords(day)), "", 1, "L", false)
		training := d.s.Training[day.Date]
		switch {
		case training != "":
		case day.Role == fuel.RoleEvent: // the event is the day's exercise
			training = "your event"
		case day.TrainingMin > 0:
			training = num(day.TrainingMin, 0) + " min"
		default:
			training = "rest"
		}
		total := num(day.ChoG, 0) + " g carbohydrate, " + num(day.ProteinG, 0) + " g protein, " + num(day.FatG, 0) + " g fat"
		if d.s.ShowFigures {
			total += "; about " + num(day.EnergyKcal, 0) + " kcal (" + num(day.ChoGPerKg, 1) + " g carbohydrate per kg body weight)"
		}
		d.pairRows([]pair{{"Training", training}, {"In all", total}}, 20)
		var rows [][]string
		for i, fd := range day.Feeds {
			sg := d.s.Suggestions[menu.FeedKey("day", day.Date, i)]
			if sg == menu.NoFit {
				sg = ""
			}
			rows = append(rows, d.feedCells(fd, fd.At.In(d.loc).Format("15:04"), sg))
		}
		if len(rows) > 0 {
			d.table(feedColumns(12), rows)
		}
		var advice []string
		fibreSaid := false
		for _, a := range day.Advice {
			fibreSaid = fibreSaid || strings.Contains(strings.ToLower(a), "fibre")
		}
		if day.LowFibre && !fibreSaid {
			advice = append(advice, "Choose low-fibre foods today (white bread, white rice, juice, sports drinks) so the extra carbohydrate sits easily.")
		}
		// Advice the day before already gave (the second of two load days)
		// is not printed again: the days sit one under the other.
		if !slices.Equal(day.Advice, prevAdvice) {
			advice = append(advice, day.Advice...)
		}
		prevAdvice = day.Advice
		d.font("", 8.6)
		d.color(colInk)
		for _, a := range advice {
			d.need(4)
			d.para(a, 3.9)
		}
		if n := strings.TrimSpace(d.s.DayNotes[day.Date]); n != "" {
			d.font("", 9)
			lines := d.lines(n, d.w-30)
			d.need(float64(len(lines))*4.1 + 1)
			y := d.f.GetY() + 0.6
			d.font("B", 8.6)
			d.color(colNote)
			d.f.SetXY(marginX, y)
			d.cell(30, 4.1, d.tr("Your dietitian:"), "", 0, "L", false)
			d.font("", 9)
			d.color(colInk)
			for i, l := range lines {
				d.f.SetXY(marginX+30, y+float64(i)*4.1)
				d.cell(d.w-30, 4.1, l, "", 0, "L", false)
			}
			d.f.SetY(y + float64(len(lines))*4.1 + 0.6)
		}
		d.draw(colRule)
		d.f.SetLineWidth(0.15)
		y := d.f.GetY() + 0.8
		d.f.Line(marginX, y, marginX+d.w, y)
		d.f.SetY(y)
	}
}

// roleWords names a plan day the way the athlete's phone page does.
func roleWords(d fuel.Day) string {
	if d.Role == fuel.RoleTraining && d.LoadBand == "rest" {
		return "Rest day"
	}
	switch d.Role {
	case fuel.RoleLoad:
		return "Carbohydrate loading day"
	case fuel.RoleTaper:
		return "Taper day"
	case fuel.RoleEvent:
		return "Event day"
	case fuel.RoleRecovery:
		return "Recovery day"
	case fuel.RoleRepletion:
		return "Refuelling day"
	case fuel.RoleTraining:
		return "Training day"
	case "":
		return "Plan day"
	}
	return strings.ToUpper(d.Role[:1]) + d.Role[1:] + " day"
}

// mealWords names a feed for the athlete.
func mealWords(label string) string {
	switch label {
	case "during event":
		return "During the event (in all)"
	case "":
		return "Snack"
	}
	return strings.ToUpper(label[:1]) + label[1:]
}

// staffNotes prints, on the dietitian's form, the notes the athlete's form
// carries, so that the record handed over and the one kept agree.
func (d *doc) staffNotes() {
	var rows []pair
	if n := strings.TrimSpace(d.s.PlanNote); n != "" {
		rows = append(rows, pair{"Whole plan", n})
	}
	for _, day := range d.s.Plan.Days {
		if n := strings.TrimSpace(d.s.DayNotes[day.Date]); n != "" {
			rows = append(rows, pair{dayWords(day.Date), n})
		}
	}
	if len(rows) == 0 {
		return
	}
	d.heading("Notes to the athlete", 9)
	d.pairRows(rows, 30)
}

// plainHours says a duration as one would: "3 hours", "2 h 30 min".
func plainHours(min float64) string {
	m := int(min + 0.5)
	switch {
	case m == 60:
		return "1 hour"
	case m > 60 && m%60 == 0:
		return num(float64(m/60), 0) + " hours"
	}
	return hoursWords(min)
}

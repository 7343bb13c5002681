// Package sheet owns what Larder prints or exports for a plan outside the
// web pages: the plan sheet as a PDF a clinician can hand over (pdf.go) and
// the client's calendar feed (ics.go). It formats figures the engine has
// already computed; it computes none of its own.
package sheet

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"time"

	"github.com/go-pdf/fpdf"

	"larder/internal/fuel"
	"larder/internal/menu"
)

// Paper is the sheet's page size.
type Paper string

// Paper sizes.
const (
	A4     Paper = "a4"
	Letter Paper = "letter"
)

// ParsePaper reads a ?paper= value: empty means A4.
func ParsePaper(s string) (Paper, bool) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "", "a4":
		return A4, true
	case "letter":
		return Letter, true
	}
	return "", false
}

// Version statuses as the store names them.
const (
	StatusDraft      = "draft"
	StatusPublished  = "published"
	StatusSuperseded = "superseded"
)

// DraftMark is printed across every page of a draft's sheet.
const DraftMark = "DRAFT – not for the client"

// SupersededMark is printed across every page of a superseded version.
const SupersededMark = "SUPERSEDED – not the current plan"

// Sheet is everything a plan sheet prints. Figures come from the engine's
// Plan; the rest is the record around it.
type Sheet struct {
	PracticeName   string
	ClientName     string
	ClientCautions []string // the client's recorded cautions, printed prominently
	Title          string
	KindLabel      string // "Carbohydrate loading"
	Protocol       string // "two-day", or empty
	EventName      string // empty when the plan has no event
	EventStart     *time.Time
	EventZone      string // IANA zone of the event
	Version        int
	Status         string // draft | published | superseded
	PublishedAt    *time.Time
	BodyMassKg     float64
	BodyMassOn     *time.Time // nil: typed in for the plan
	// Training is the day's training in words, by date YYYY-MM-DD.
	Training map[string]string
	Plan     fuel.Plan
	// Suggestions are the stored food suggestions of the feeds, by
	// menu.FeedKey.
	Suggestions map[string]string
	Printed     time.Time
}

// Write renders the sheet as PDF to w.
func Write(w io.Writer, s Sheet, paper Paper) error {
	d, err := newDoc(s, paper)
	if err != nil {
		return err
	}
	d.body()
	if err := d.f.Error(); err != nil {
		return fmt.Errorf("sheet: %w", err)
	}
	return d.f.Output(w)
}

// Render returns the sheet as PDF bytes.
func Render(s Sheet, paper Paper) ([]byte, error) {
	var b bytes.Buffer
	if err := Write(&b, s, paper); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}

// Page geometry in mm.
const (
	marginX      = 14.0
	marginTop    = 11.0
	footerHeight = 19.0 // caution text and page number
	lineH        = 4.3
)

// Colours of finding levels and accents: this project's own palette.
type rgb struct{ r, g, b int }

var (
	colInk     = rgb{29, 35, 39}
	colMuted   = rgb{91, 102, 112}
	colRule    = rgb{200, 204, 198}
	colHead    = rgb{239, 241, 236}
	colOK      = rgb{45, 106, 62}
	colNote    = rgb{51, 80, 122}
	colCaution = rgb{138, 90, 0}
	colOutside = rgb{164, 48, 28}
	colAmber   = rgb{255, 244, 220}
	colDraft   = rgb{164, 48, 28}
)

type doc struct {
	f     *fpdf.Fpdf
	tr    func(string) string
	s     Sheet
	loc   *time.Location
	zone  string
	w     float64 // content width
	limit float64 // lowest y content may reach
	// headPage is the page whose feed table heads are printed.
	headPage int
}

func newDoc(s Sheet, paper Paper) (*doc, error) {
	size := "A4"
	if paper == Letter {
		size = "Letter"
	}
	f := fpdf.New("P", "mm", size, "")
	pw, ph := f.GetPageSize()
	f.SetMargins(marginX, marginTop, marginX)
	f.SetAutoPageBreak(true, footerHeight+3)
	f.AliasNbPages("{nb}")
	f.SetTitle(clean(s.Title), true)
	f.SetAuthor(clean(s.PracticeName), true)
	f.SetCreator("Larder", true)
	f.SetSubject(clean("Plan sheet for "+s.ClientName), true)
	cp := f.UnicodeTranslatorFromDescriptor("cp1252")
	if err := f.Error(); err != nil {
		return nil, fmt.Errorf("sheet: code page: %w", err)
	}
	d := &doc{f: f, s: s, w: pw - 2*marginX, limit: ph - footerHeight - 3}
	d.tr = func(x string) string { return cp(toCP1252.Replace(clean(x))) }
	d.loc, d.zone = planZone(s)
	f.SetHeaderFunc(d.header)
	f.SetFooterFunc(d.footer)
	f.AddPage()
	return d, nil
}

// toCP1252 replaces characters the core fonts' code page lacks with plain
// equivalents, so that none turns into a stray dot.
var toCP1252 = strings.NewReplacer(
	"≈", "~", "≤", "<=", "≥", ">=", "→", "->", "←", "<-", "−", "-", "‑", "-",
	"✓", "", "◆", "", "▲", "", "✖", "", "✎", "", "⚠", "", "τ", "tau", "\u00a0", " ", "\u202f", " ",
)

// clean makes typed text safe to print: valid UTF-8 (fpdf's metadata
// writer panics on anything else), tabs as spaces, no other control
// characters but line breaks.
func clean(x string) string {
	x = strings.ToValidUTF8(x, "?")
	return strings.Map(func(r rune) rune {
		switch {
		case r == '\n':
			return r
		case r == '\t':
			return ' '
		case r < 0x20 || r == 0x7f || r >= 0x80 && r < 0xa0 || r == '\ufeff':
			return -1
		}
		return r
	}, x)
}

// planZone is where feed times are shown: the plan's zone (an IANA name, or
// an offset such as +02:00), else the event's, else UTC.
func planZone(s Sheet) (*time.Location, string) {
	name := s.Plan.TimeZone
	if name != "" {
		if loc, err := time.LoadLocation(name); err == nil {
			return loc, name
		}
		if t, err := time.Parse("-07:00", name); err == nil {
			_, off := t.Zone()
			return time.FixedZone("UTC"+name, off), "UTC" + name
		}
	}
	if s.EventZone != "" {
		if loc, err := time.LoadLocation(s.EventZone); err == nil {
			return loc, s.EventZone
		}
	}
	return time.UTC, "UTC"
}

// ----- drawing helpers -----

func (d *doc) color(c rgb) { d.f.SetTextColor(c.r, c.g, c.b) }
func (d *doc) fill(c rgb)  { d.f.SetFillColor(c.r, c.g, c.b) }
func (d *doc) draw(c rgb)  { d.f.SetDrawColor(c.r, c.g, c.b) }
func (d *doc) font(style string, size float64) {
	d.f.SetFont("Helvetica", style, size)
}

// lines splits text (in the current font) to fit width w.
func (d *doc) lines(text string, w float64) []string {
	var out []string
	for _, l := range d.f.SplitLines([]byte(d.tr(text)), w) {
		out = append(out, string(l))
	}
	if len(out) == 0 {
		out = []string{""}
	}
	return out
}

// para prints wrapped text across the content width.
func (d *doc) para(text string, h float64) {
	d.f.SetX(marginX)
	d.f.MultiCell(d.w, h, d.tr(text), "", "L", false)
}

// need starts a new page unless h mm fit below the current position.
func (d *doc) need(h float64) bool {
	if d.f.GetY()+h > d.limit {
		d.f.AddPage()
		return true
	}
	return false
}

// heading starts a section; keep is how much of what follows (mm) must
// fit on the same page, so that no heading is left alone at a page's foot.
func (d *doc) heading(text string, keep float64) {
	d.need(11 + keep)
	d.f.Ln(2.5)
	d.font("B", 11)
	d.color(colInk)
	d.f.SetX(marginX)
	d.f.CellFormat(d.w, 6, d.tr(text), "", 1, "L", false, 0, "")
	d.draw(colRule)
	d.f.SetLineWidth(0.3)
	y := d.f.GetY()
	d.f.Line(marginX, y, marginX+d.w, y)
	d.f.Ln(1.2)
}

// ----- page furniture -----

func (d *doc) header() {
	f := d.f
	pw, ph := f.GetPageSize()
	if mark := d.watermark(); mark != "" {
		f.SetFont("Helvetica", "B", 46)
		f.SetTextColor(243, 205, 198)
		text := d.tr(mark)
		tw := f.GetStringWidth(text)
		cx, cy := pw/2, ph/2
		f.TransformBegin()
		f.TransformRotate(55, cx, cy)
		f.Text(cx-tw/2, cy+6, text)
		f.TransformEnd()
	}
	f.SetY(marginTop - 4)
	d.font("B", 9.5)
	d.color(colInk)
	f.SetX(marginX)
	f.CellFormat(d.w/2, 5, d.tr(d.s.PracticeName), "", 0, "L", false, 0, "")
	d.font("", 8.5)
	d.color(colMuted)
	right := "Plan sheet · printed " + d.s.Printed.In(d.loc).Format("2 Jan 2006")
	if f.PageNo() > 1 {
		right = d.s.ClientName + " · " + d.s.Title + " (continued)"
	}
	f.CellFormat(d.w/2, 5, d.tr(right), "", 1, "R", false, 0, "")
	d.draw(colInk)
	f.SetLineWidth(0.4)
	f.Line(marginX, f.GetY()+0.5, pw-marginX, f.GetY()+0.5)
	f.Ln(1.5)
	if d.s.Status == StatusDraft || d.s.Status == StatusSuperseded {
		d.fill(colDraft)
		f.SetTextColor(255, 255, 255)
		d.font("B", 9)
		msg := DraftMark + ": this version is not published and its figures may still change."
		if d.s.Status == StatusSuperseded {
			msg = SupersededMark + ": a later version of this plan has replaced it."
		}
		f.SetX(marginX)
		f.CellFormat(d.w, 5.5, d.tr(msg), "", 1, "C", true, 0, "")
		f.Ln(1.5)
	}
	d.color(colInk)
}

func (d *doc) watermark() string {
	switch d.s.Status {
	case StatusDraft:
		return DraftMark
	case StatusSuperseded:
		return SupersededMark
	}
	return ""
}

func (d *doc) footer() {
	f := d.f
	_, ph := f.GetPageSize()
	y := ph - footerHeight
	d.draw(colRule)
	f.SetLineWidth(0.3)
	f.Line(marginX, y, marginX+d.w, y)
	f.SetXY(marginX, y+1)
	caution := d.s.Plan.Caution
	if caution == "" {
		caution = fuel.Caution
	}
	d.font("B", 7.2)
	d.color(colInk)
	f.CellFormat(12, 3.2, "Safety:", "", 0, "L", false, 0, "")
	d.font("", 7.2)
	f.MultiCell(d.w-12, 3.2, d.tr(caution), "", "L", false)
	d.font("", 7.5)
	d.color(colMuted)
	f.SetXY(marginX, ph-7)
	left := d.s.ClientName + " · " + d.s.Title + " · version " + strconv.Itoa(d.s.Version)
	f.CellFormat(d.w*0.75, 4, d.tr(left), "", 0, "L", false, 0, "")
	f.CellFormat(d.w*0.25, 4, fmt.Sprintf("page %d of {nb}", f.PageNo()), "", 0, "R", false, 0, "")
	d.color(colInk)
}

// ----- body -----

func (d *doc) body() {
	f := d.f
	d.font("B", 15)
	d.color(colInk)
	f.SetX(marginX)
	f.MultiCell(d.w, 6.5, d.tr(d.s.Title), "", "L", false)
	f.Ln(0.5)
	d.cautions()
	d.facts()
	d.dayTable()
	d.eventFigures()
	d.repletion()
	d.findings()
	d.feeds()
}

// cautions prints the client's recorded cautions in a box at the top.
func (d *doc) cautions() {
	if len(d.s.ClientCautions) == 0 {
		return
	}
	f := d.f
	d.font("", 9.5)
	var body []string
	for _, c := range d.s.ClientCautions {
		body = append(body, d.lines("•  "+c, d.w-6)...)
	}
	h := 5.5 + float64(len(body))*4.4 + 2.5
	d.need(h)
	x, y := marginX, f.GetY()+1
	d.fill(colAmber)
	d.draw(colCaution)
	f.SetLineWidth(0.5)
	f.Rect(x, y, d.w, h, "FD")
	f.SetLineWidth(1.8)
	f.Line(x+0.9, y+0.4, x+0.9, y+h-0.4)
	d.symbol(fuel.LevelCaution, x+4.5, y+3.4, 3.2)
	f.SetXY(x+7.5, y+1)
	d.font("B", 10)
	d.color(colCaution)
	f.CellFormat(d.w-9, 5, d.tr("Recorded caution for "+d.s.ClientName+" – read before using this plan"), "", 1, "L", false, 0, "")
	d.font("", 9.5)
	d.color(colInk)
	for _, l := range body {
		f.SetX(x + 4)
		f.CellFormat(d.w-6, 4.4, l, "", 1, "L", false, 0, "")
	}
	f.SetY(y + h + 1.5)
}

type pair struct{ k, v string }

// facts prints the record the plan was made from, in two columns.
func (d *doc) facts() {
	s := d.s
	event := "no event"
	if s.EventName != "" {
		event = s.EventName
		if s.EventStart != nil {
			loc := d.loc
			zone := d.zone
			if s.EventZone != "" {
				if l, err := time.LoadLocation(s.EventZone); err == nil {
					loc, zone = l, s.EventZone
				}
			}
			event += ", start " + s.EventStart.In(loc).Format("Mon 2 Jan 2006 15:04") + " (" + zone + ")"
		}
	}
	kind := s.KindLabel
	if s.Protocol != "" {
		kind += ", " + s.Protocol + " protocol"
	}
	version := strconv.Itoa(s.Version)
	switch s.Status {
	case StatusPublished:
		if s.PublishedAt != nil {
			version += ", published " + s.PublishedAt.In(d.loc).Format("Mon 2 Jan 2006")
		} else {
			version += ", published"
		}
	case StatusDraft:
		version += " – draft, not published"
	case StatusSuperseded:
		version += " – superseded"
		if s.PublishedAt != nil {
			version += " (published " + s.PublishedAt.In(d.loc).Format("2 Jan 2006") + ")"
		}
	}
	mass := num(s.BodyMassKg, 1) + " kg"
	if s.BodyMassOn != nil {
		mass += ", measured " + s.BodyMassOn.Format("Mon 2 Jan 2006")
	} else {
		mass += ", typed in for this plan"
	}
	ffm := "not known"
	if s.Plan.FatFreeMassMethod != fuel.FFMNone && s.Plan.FatFreeMassMethod != "" {
		ffm = num(s.Plan.FatFreeMassKg, 1) + " kg (" + s.Plan.FatFreeMassMethod + ")"
	}
	left := []pair{{"Client", s.ClientName}, {"Event", event}, {"Plan", kind}}
	right := []pair{{"Version", version}, {"Body mass used", mass}, {"Fat-free mass", ffm}, {"Times", "all times in " + d.zone}}
	d.pairColumns(left, right)
}

func (d *doc) pairColumns(left, right []pair) {
	f := d.f
	colW := (d.w - 6) / 2
	keyW := 27.0
	top := f.GetY() + 1
	bottom := top
	for i, col := range [][]pair{left, right} {
		x := marginX + float64(i)*(colW+6)
		y := top
		for _, p := range col {
			d.font("", 9.5)
			vl := d.lines(p.v, colW-keyW)
			f.SetXY(x, y)
			d.font("", 8.5)
			d.color(colMuted)
			f.CellFormat(keyW, 4.4, d.tr(p.k), "", 0, "L", false, 0, "")
			d.font("", 9.5)
			d.color(colInk)
			for j, l := range vl {
				f.SetXY(x+keyW, y+float64(j)*4.4)
				f.CellFormat(colW-keyW, 4.4, l, "", 0, "L", false, 0, "")
			}
			y += float64(len(vl)) * 4.4
		}
		bottom = math.Max(bottom, y)
	}
	f.SetY(bottom + 1)
}

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
				d.f.CellFormat(w, 3.4, d.tr(c.group), "", 0, align, false, 0, "")
			}
			d.f.SetXY(x, y+3.4)
			d.f.CellFormat(c.w, 3.4, d.tr(c.title), "", 0, c.align, false, 0, "")
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
				d.f.CellFormat(c.w, 3.8, text, "", 0, c.align, false, 0, "")
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
	if m := p.PreEventMeal; m != nil {
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
	if e := p.DuringEvent; e != nil {
		v := fmt.Sprintf("%s g/h over %s, %s g in all.", num(e.ChoGPerH, 0), hoursWords(e.DurationMin), num(e.TotalChoG, 0))
		if e.ChoGPerH == 0 {
			v = "No carbohydrate needed during an event of " + hoursWords(e.DurationMin) + "."
		}
		if e.Overridden {
			v += " Set by the dietitian (override)."
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
		rows = append(rows, pair{"Expected body-mass gain", num(*p.ExpectedMassGainKg, 1) + " kg, from glycogen stored with its water; expected, not a sign of fat gain."})
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
		f.CellFormat(keyW, 4.1, d.tr(r.k), "", 0, "L", false, 0, "")
		d.font("", 9)
		for i, l := range vl {
			f.SetXY(marginX+keyW, y+float64(i)*4.1)
			f.CellFormat(d.w-keyW, 4.1, l, "", 0, "L", false, 0, "")
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
	labelW, choW, protW := 28.0, 17.0, 14.0
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
		f.CellFormat(timeW, 3.6, "Time", "", 0, "L", false, 0, "")
		f.CellFormat(labelW, 3.6, "Occasion", "", 0, "L", false, 0, "")
		f.CellFormat(choW, 3.6, "Carbohydrate g", "", 0, "R", false, 0, "")
		f.CellFormat(protW, 3.6, "Protein g", "", 0, "R", false, 0, "")
		f.SetX(sugX)
		f.CellFormat(sugW, 3.6, "Food suggestion", "", 1, "L", false, 0, "")
		d.color(colInk)
	}
	head()
	for _, r := range rows {
		d.font("", 7.6)
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
		f.CellFormat(timeW, 3.6, d.tr(r.at), "", 0, "L", false, 0, "")
		f.CellFormat(labelW, 3.6, d.tr(r.label), "", 0, "L", false, 0, "")
		cho := num(r.cho, 0)
		if r.overridden {
			cho += " *"
		}
		f.CellFormat(choW, 3.6, cho, "", 0, "R", false, 0, "")
		prot := "–"
		if r.prot > 0 {
			prot = num(r.prot, 0)
		}
		f.CellFormat(protW, 3.6, d.tr(prot), "", 0, "R", false, 0, "")
		d.font("", 7.6)
		d.color(colMuted)
		for i, l := range sl {
			f.SetXY(sugX, y+float64(i)*3.4+0.2)
			f.CellFormat(sugW, 3.4, l, "", 0, "L", false, 0, "")
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
	d.para("Times in "+d.zone+". Suggestions are examples from the practice's food list that add up to the feed's carbohydrate; swap for foods you know you tolerate. * set by the dietitian (override).", 3.4)
	d.color(colInk)
	for _, day := range p.Days {
		if len(day.Feeds) == 0 {
			continue
		}
		var rows []feedRow
		for i, fd := range day.Feeds {
			rows = append(rows, feedRow{at: fd.At.In(d.loc).Format("15:04"), label: fd.Label, cho: fd.ChoG, prot: fd.ProteinG,
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
		d.f.CellFormat(d.w, 4.6, d.tr(title), "", 1, "L", false, 0, "")
		d.feedTable(rows, 12)
		if len(day.Advice) > 0 {
			d.font("I", 7.6)
			d.color(colMuted)
			for _, a := range day.Advice {
				d.need(3.4)
				d.para(a, 3.4)
			}
			d.color(colInk)
		}
		d.draw(colRule)
		d.f.SetLineWidth(0.15)
		y := d.f.GetY() + 0.6
		d.f.Line(marginX, y, marginX+d.w, y)
		d.f.SetY(y)
	}
}

// findings prints every finding that is not ok, and counts the rest.
func (d *doc) findings() {
	p := d.s.Plan
	var shown []fuel.Finding
	ok := 0
	for _, fd := range p.Findings {
		if fd.Level == fuel.LevelOK {
			ok++
			continue
		}
		shown = append(shown, fd)
	}
	d.heading("Findings", 8)
	f := d.f
	textX := marginX + 33
	textW := d.w - 33
	for _, fd := range shown {
		d.font("", 8.6)
		ml := d.lines(d.subject(fd.Subject)+": "+fd.Message, textW)
		d.font("", 7.2)
		sl := d.lines("Checked against: "+fd.Source, textW)
		h := float64(len(ml))*3.8 + float64(len(sl))*3.2 + 1.4
		d.need(h)
		y := f.GetY()
		c := levelColor(fd.Level)
		d.symbol(fd.Level, marginX+2, y+1.9, 3)
		d.font("B", 8.6)
		d.color(c)
		f.SetXY(marginX+4.5, y)
		f.CellFormat(28, 3.8, d.tr(levelWord(fd.Level)), "", 0, "L", false, 0, "")
		d.font("", 8.6)
		d.color(colInk)
		for i, l := range ml {
			f.SetXY(textX, y+float64(i)*3.8)
			f.CellFormat(textW, 3.8, l, "", 0, "L", false, 0, "")
		}
		d.font("", 7.2)
		d.color(colMuted)
		for i, l := range sl {
			f.SetXY(textX, y+float64(len(ml))*3.8+float64(i)*3.2)
			f.CellFormat(textW, 3.2, l, "", 0, "L", false, 0, "")
		}
		d.color(colInk)
		f.SetY(y + h)
	}
	d.need(5)
	y := f.GetY() + 0.5
	d.symbol(fuel.LevelOK, marginX+2, y+2, 3)
	d.font("", 8.6)
	d.color(colOK)
	f.SetXY(marginX+4.5, y)
	msg := fmt.Sprintf("%d checks within guideline.", ok)
	if ok == 1 {
		msg = "1 check within guideline."
	}
	if len(shown) == 0 {
		msg += " No finding needs attention."
	}
	f.CellFormat(d.w-4.5, 4, d.tr(msg), "", 1, "L", false, 0, "")
	d.color(colInk)
}

// subject names what a finding concerns, in words.
func (d *doc) subject(subj string) string {
	parts := strings.Split(subj, ":")
	switch parts[0] {
	case "day":
		if len(parts) == 2 {
			return dayWords(parts[1])
		}
	case "feed":
		if len(parts) == 3 {
			i, _ := strconv.Atoi(parts[2])
			for _, day := range d.s.Plan.Days {
				if day.Date == parts[1] && i < len(day.Feeds) {
					return dayWords(parts[1]) + ", " + day.Feeds[i].At.In(d.loc).Format("15:04") + " " + day.Feeds[i].Label
				}
			}
			return dayWords(parts[1]) + ", feed " + strconv.Itoa(i+1)
		}
	case "repletion_feed":
		if len(parts) == 2 {
			i, _ := strconv.Atoi(parts[1])
			if r := d.s.Plan.Repletion; r != nil && i < len(r.Feeds) {
				return "Repletion, " + r.Feeds[i].At.In(d.loc).Format("Mon 15:04")
			}
			return "Repletion feed " + strconv.Itoa(i+1)
		}
	case "pre_event_meal":
		return "Pre-event meal"
	case "during_event":
		return "In-event"
	case "repletion":
		return "Repletion"
	case "glycogen":
		return "Glycogen"
	case "plan", "":
		return "Plan"
	}
	return subj
}

// symbol draws a level's shape centred at (x, y): a circle for ok, a
// diamond for note, a triangle for caution, a cross for outside.
func (d *doc) symbol(level string, x, y, size float64) {
	f := d.f
	c := levelColor(level)
	d.fill(c)
	d.draw(c)
	r := size / 2
	switch level {
	case fuel.LevelOK:
		f.SetLineWidth(0.45)
		f.Circle(x, y, r, "D")
		f.Line(x-r*0.5, y, x-r*0.1, y+r*0.45)
		f.Line(x-r*0.1, y+r*0.45, x+r*0.55, y-r*0.45)
	case fuel.LevelNote:
		f.Polygon([]fpdf.PointType{{X: x, Y: y - r}, {X: x + r, Y: y}, {X: x, Y: y + r}, {X: x - r, Y: y}}, "F")
	case fuel.LevelCaution:
		f.Polygon([]fpdf.PointType{{X: x, Y: y - r}, {X: x + r, Y: y + r*0.8}, {X: x - r, Y: y + r*0.8}}, "F")
	case fuel.LevelOutside:
		f.SetLineWidth(0.8)
		f.Line(x-r*0.8, y-r*0.8, x+r*0.8, y+r*0.8)
		f.Line(x-r*0.8, y+r*0.8, x+r*0.8, y-r*0.8)
	default:
		f.Circle(x, y, r*0.5, "F")
	}
	f.SetLineWidth(0.2)
}

func levelColor(level string) rgb {
	switch level {
	case fuel.LevelOK:
		return colOK
	case fuel.LevelNote:
		return colNote
	case fuel.LevelCaution:
		return colCaution
	case fuel.LevelOutside:
		return colOutside
	}
	return colInk
}

// levelWord names a finding level; the words match the plan page's.
func levelWord(level string) string {
	switch level {
	case fuel.LevelOK:
		return "Within guideline"
	case fuel.LevelNote:
		return "Note"
	case fuel.LevelCaution:
		return "Caution"
	case fuel.LevelOutside:
		return "Outside guideline"
	}
	return level
}

// ----- words and numbers -----

// num formats a figure with at most the given decimals, trailing zeros dropped.
func num(x float64, decimals int) string {
	s := strconv.FormatFloat(x, 'f', decimals, 64)
	if strings.Contains(s, ".") {
		s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	}
	if s == "-0" {
		s = "0"
	}
	return s
}

func dayWords(date string) string {
	t, err := time.Parse(time.DateOnly, date)
	if err != nil {
		return date
	}
	return t.Format("Mon 2 Jan")
}

func bandWords(band string) string {
	switch band {
	case "very-high":
		return "very high"
	case "":
		return "–"
	}
	return band
}

func hoursWords(min float64) string {
	total := int(math.Round(min))
	h, m := total/60, total%60
	if h == 0 {
		return fmt.Sprintf("%d min", m)
	}
	return fmt.Sprintf("%d h %02d min", h, m)
}

func runsOut(km, min *float64) string {
	switch {
	case min == nil:
		return "they last"
	case km != nil:
		return "at about " + num(*km, 1) + " km (" + hoursWords(*min) + ")"
	default:
		return "after about " + hoursWords(*min)
	}
}

// Package sheet owns what Larder prints or exports for a plan outside the
// web pages: the plan sheet as a PDF a clinician can hand over (pdf.go) and
// the client's calendar feed (ics.go). It formats figures the engine has
// already computed; it computes none of its own.
package sheet

import (
	"bytes"
	"fmt"
	"io"
	"strings"
	"time"

	"larder/internal/mass"

	"github.com/go-pdf/fpdf"

	"larder/internal/fuel"
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
	// MassUnit is the unit the client's body masses are printed in.
	MassUnit mass.Unit
	// Training is the day's training in words, by date YYYY-MM-DD.
	Training map[string]string
	Plan     fuel.Plan
	// Suggestions are the stored food suggestions of the feeds, by
	// menu.FeedKey.
	Suggestions map[string]string
	Printed     time.Time

	// Form is which form prints: the dietitian's (the zero value) or the
	// athlete's.
	Form Form
	// PlanNote and DayNotes (by date YYYY-MM-DD) are the dietitian's notes
	// to the athlete.
	PlanNote string
	DayNotes map[string]string
	// SharedNote is the health note the dietitian shared with the athlete,
	// line by line; the athlete's form prints it and never ClientCautions.
	SharedNote []string
	// ShowFigures puts energy and body-mass figures on the athlete's form.
	ShowFigures bool
}

// unit is the body-mass unit printed: the client's, kg when none is set.
func (s Sheet) unit() mass.Unit { return mass.Or(s.MassUnit, mass.KG) }

// Write renders the sheet as PDF to w.
func Write(w io.Writer, s Sheet, paper Paper) error {
	d, err := newDoc(s, paper)
	if err != nil {
		return err
	}
	if s.Form == FormAthlete {
		d.athleteBody()
	} else {
		d.body()
	}
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
	colCaution = rgb{138, 90, 0} // the recorded cautions' box
	// Finding levels, quiet to loud in one family from slate to plum, so
	// that they do not read as traffic lights; the word and the shape say
	// the level too (the same colours as the plan page).
	colOK      = rgb{74, 88, 102}
	colNote    = rgb{31, 95, 122}
	colLvCaut  = rgb{75, 63, 153}
	colOutside = rgb{123, 36, 100}
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
	// style and size are the current font's (fpdf does not tell them);
	// added holds the fallback faces registered with this sheet.
	style string
	size  float64
	added map[int]bool
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
	if s.Form == FormAthlete {
		f.SetSubject(clean("Fuelling plan for "+s.ClientName), true)
	} else {
		f.SetSubject(clean("Plan sheet for "+s.ClientName), true)
	}
	addFonts(f)
	if err := f.Error(); err != nil {
		return nil, fmt.Errorf("sheet: fonts: %w", err)
	}
	d := &doc{f: f, s: s, w: pw - 2*marginX, limit: ph - footerHeight - 3}
	d.tr = printable
	d.loc, d.zone = planZone(s)
	f.SetHeaderFunc(d.header)
	f.SetFooterFunc(d.footer)
	f.AddPage()
	return d, nil
}

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
	d.style, d.size = style, size
	d.f.SetFont(fontFamily, style, size)
}

// lines splits text (in the current font) to fit width w.
func (d *doc) lines(text string, w float64) []string {
	var out []string
	if t := d.tr(text); plain(t) {
		out = d.f.SplitText(t, w)
	} else {
		out = d.wrap(t, w)
	}
	if len(out) == 0 {
		out = []string{""}
	}
	return out
}

// para prints wrapped text across the content width.
func (d *doc) para(text string, h float64) {
	d.f.SetX(marginX)
	d.multi(d.w, h, text, "L")
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
	d.cell(d.w, 6, d.tr(text), "", 1, "L", false)
	d.draw(colRule)
	d.f.SetLineWidth(0.3)
	y := d.f.GetY()
	d.f.Line(marginX, y, marginX+d.w, y)
	d.f.Ln(1.2)
}

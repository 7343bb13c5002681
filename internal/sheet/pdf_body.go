package sheet

import (
	"fmt"
	"math"
	"strconv"
	"time"

	"larder/internal/mass"

	"larder/internal/fuel"
)

// The sheet's page furniture (header, watermark, footer) and its first
// sections: cautions and the facts of the plan.

// ----- page furniture -----

func (d *doc) header() {
	f := d.f
	pw, ph := f.GetPageSize()
	if mark := d.watermark(); mark != "" {
		f.SetFont(fontFamily, "B", 46)
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
	d.cell(d.w/2, 5, d.tr(d.s.PracticeName), "", 0, "L", false)
	d.font("", 8.5)
	d.color(colMuted)
	right := d.formName() + " · printed " + d.s.Printed.In(d.loc).Format("2 Jan 2006")
	if f.PageNo() > 1 {
		right = d.s.ClientName + " · " + d.s.Title + " (continued)"
	}
	d.cell(d.w/2, 5, d.tr(right), "", 1, "R", false)
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
		d.cell(d.w, 5.5, d.tr(msg), "", 1, "C", true)
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
	d.cell(12, 3.2, "Safety:", "", 0, "L", false)
	d.font("", 7.2)
	d.multi(d.w-12, 3.2, caution, "L")
	d.font("", 7.5)
	d.color(colMuted)
	f.SetXY(marginX, ph-7)
	left := d.s.ClientName + " · " + d.s.Title + " · version " + strconv.Itoa(d.s.Version)
	d.cell(d.w*0.75, 4, d.tr(left), "", 0, "L", false)
	d.cell(d.w*0.25, 4, fmt.Sprintf("page %d of {nb}", f.PageNo()), "", 0, "R", false)
	d.color(colInk)
}

// ----- body -----

func (d *doc) body() {
	f := d.f
	d.font("B", 15)
	d.color(colInk)
	f.SetX(marginX)
	d.multi(d.w, 6.5, d.s.Title, "L")
	f.Ln(0.5)
	d.cautions()
	d.facts()
	d.dayTable()
	d.eventFigures()
	d.raceParts()
	d.repletion()
	d.staffNotes()
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
	d.cell(d.w-9, 5, d.tr("Recorded caution for "+d.s.ClientName+" – read before using this plan"), "", 1, "L", false)
	d.font("", 9.5)
	d.color(colInk)
	for _, l := range body {
		f.SetX(x + 4)
		d.cell(d.w-6, 4.4, l, "", 1, "L", false)
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
	used := mass.Text(s.BodyMassKg, s.unit())
	if s.BodyMassOn != nil {
		used += ", measured " + s.BodyMassOn.Format("Mon 2 Jan 2006")
	} else {
		used += ", typed in for this plan"
	}
	ffm := "not known"
	if s.Plan.FatFreeMassMethod != fuel.FFMNone && s.Plan.FatFreeMassMethod != "" {
		ffm = mass.Text(s.Plan.FatFreeMassKg, s.unit()) + " (" + s.Plan.FatFreeMassMethod + ")"
	}
	left := []pair{{"Client", s.ClientName}, {"Event", event}, {"Plan", kind}}
	right := []pair{{"Version", version}, {"Body mass used", used}, {"Fat-free mass", ffm}, {"Times", "all times in " + d.zone}}
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
			d.cell(keyW, 4.4, d.tr(p.k), "", 0, "L", false)
			d.font("", 9.5)
			d.color(colInk)
			for j, l := range vl {
				f.SetXY(x+keyW, y+float64(j)*4.4)
				d.cell(colW-keyW, 4.4, l, "", 0, "L", false)
			}
			y += float64(len(vl)) * 4.4
		}
		bottom = math.Max(bottom, y)
	}
	f.SetY(bottom + 1)
}

package sheet

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"

	"github.com/go-pdf/fpdf"

	"larder/internal/fuel"
	"larder/internal/sources"
)

// The sheet's findings with their level marks, and the words and numbers
// every section formats with.

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
		ml := d.lines(d.findingText(fd.Subject, FindingMessage(fd, d.s.unit())), textW)
		d.font("", 7.2)
		sl := d.lines("Checked against: "+sources.Short(fd.Source), textW)
		h := float64(len(ml))*3.8 + float64(len(sl))*3.2 + 1.4
		d.need(h)
		y := f.GetY()
		c := levelColor(fd.Level)
		d.symbol(fd.Level, marginX+2, y+1.9, 3)
		d.font("B", 8.6)
		d.color(c)
		f.SetXY(marginX+4.5, y)
		d.cell(28, 3.8, d.tr(levelWord(fd.Level)), "", 0, "L", false)
		d.font("", 8.6)
		d.color(colInk)
		for i, l := range ml {
			f.SetXY(textX, y+float64(i)*3.8)
			d.cell(textW, 3.8, l, "", 0, "L", false)
		}
		d.font("", 7.2)
		d.color(colMuted)
		for i, l := range sl {
			f.SetXY(textX, y+float64(len(ml))*3.8+float64(i)*3.2)
			d.cell(textW, 3.2, l, "", 0, "L", false)
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
	d.cell(d.w-4.5, 4, d.tr(msg), "", 1, "L", false)
	d.color(colInk)
}

// findingText is a finding's subject and message; a message that starts
// with its subject ("Stage 2 starts …") is not prefixed with it again.
func (d *doc) findingText(subj, msg string) string {
	s := d.subject(subj)
	if strings.HasPrefix(msg, s+" ") || strings.HasPrefix(msg, s+":") {
		return msg
	}
	return s + ": " + msg
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
	if w, ok := d.raceSubject(parts); ok {
		return w
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
		return colLvCaut
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

package sheet

import (
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"time"
	"unicode/utf8"

	"larder/internal/fuel"
	"larder/internal/menu"
)

// The iCalendar feed (RFC 5545) is written by the few lines below rather
// than a library: it needs only VCALENDAR and VEVENT with a handful of
// properties, and the rules that matter (CRLF, folding at 75 octets, TEXT
// escaping, UTC date-times) are short and tested.

// ICSCalendar is one feed.
type ICSCalendar struct {
	// ProdID identifies the product that made the feed (PRODID).
	ProdID string
	// Name is shown by calendar apps as the calendar's name (X-WR-CALNAME).
	Name   string
	Events []ICSEvent
}

// ICSEvent is one VEVENT.
type ICSEvent struct {
	// UID must stay the same for the same occasion across revisions of a
	// plan, so calendar apps update an entry instead of adding a second one.
	UID string
	// Sequence rises with each revision (the plan's version number).
	Sequence int
	// Stamp is DTSTAMP: when this information was last revised.
	Stamp       time.Time
	Start       time.Time
	Duration    time.Duration
	Summary     string
	Description string
}

// ICSWrite writes the calendar in iCalendar form.
func ICSWrite(w io.Writer, c ICSCalendar) error {
	var b strings.Builder
	line := func(name, value string) { b.WriteString(ICSFold(name + ":" + value)) }
	line("BEGIN", "VCALENDAR")
	line("VERSION", "2.0")
	line("PRODID", ICSEscapeText(c.ProdID))
	line("CALSCALE", "GREGORIAN")
	// No METHOD: the feed is a plain published calendar, so DTSTAMP means
	// when each entry was last revised (RFC 5545 3.8.7.2), here the
	// plan version's publication.
	if c.Name != "" {
		line("X-WR-CALNAME", ICSEscapeText(c.Name))
	}
	for _, e := range c.Events {
		line("BEGIN", "VEVENT")
		line("UID", ICSEscapeText(e.UID))
		line("SEQUENCE", strconv.Itoa(e.Sequence))
		line("DTSTAMP", icsUTC(e.Stamp))
		line("DTSTART", icsUTC(e.Start))
		if e.Duration > 0 {
			line("DURATION", icsDuration(e.Duration))
		}
		line("SUMMARY", ICSEscapeText(e.Summary))
		if e.Description != "" {
			line("DESCRIPTION", ICSEscapeText(e.Description))
		}
		line("TRANSP", "TRANSPARENT")
		line("END", "VEVENT")
	}
	line("END", "VCALENDAR")
	_, err := io.WriteString(w, b.String())
	return err
}

// icsUTC is a DATE-TIME in UTC form (RFC 5545 3.3.5, form #2).
func icsUTC(t time.Time) string { return t.UTC().Format("20060102T150405Z") }

// icsDuration is a DURATION value (RFC 5545 3.3.6) in hours and minutes.
func icsDuration(d time.Duration) string {
	m := int(d.Round(time.Minute) / time.Minute)
	h, m := m/60, m%60
	switch {
	case h == 0:
		return fmt.Sprintf("PT%dM", m)
	case m == 0:
		return fmt.Sprintf("PT%dH", h)
	}
	return fmt.Sprintf("PT%dH%dM", h, m)
}

// ICSEscapeText escapes a TEXT value (RFC 5545 3.3.11): backslash,
// semicolon and comma get a backslash; a line break becomes \n. A carriage
// return is dropped (CRLF and lone CR count as line breaks), and other
// control characters, which TEXT may not hold, are dropped too.
func ICSEscapeText(s string) string {
	s = strings.ReplaceAll(s, "\r\n", "\n")
	s = strings.ReplaceAll(s, "\r", "\n")
	var b strings.Builder
	for _, r := range s {
		switch {
		case r == '\\':
			b.WriteString(`\\`)
		case r == ';':
			b.WriteString(`\;`)
		case r == ',':
			b.WriteString(`\,`)
		case r == '\n':
			b.WriteString(`\n`)
		case r < 0x20 && r != '\t', r == 0x7f:
			// CONTROL characters are not allowed in TEXT
		default:
			b.WriteRune(r)
		}
	}
	return b.String()
}

// ICSUnescapeText reverses ICSEscapeText.
func ICSUnescapeText(s string) string {
	var b strings.Builder
	for i := 0; i < len(s); i++ {
		if s[i] == '\\' && i+1 < len(s) {
			i++
			switch s[i] {
			case 'n', 'N':
				b.WriteByte('\n')
			default:
				b.WriteByte(s[i])
			}
			continue
		}
		b.WriteByte(s[i])
	}
	return b.String()
}

// icsLineOctets is the longest content line allowed, CRLF not counted.
const icsLineOctets = 75

// ICSFold folds one content line (RFC 5545 3.1) into lines of at most 75
// octets, each ended by CRLF; a continuation line starts with one space,
// which counts toward its 75. A UTF-8 sequence is never split.
func ICSFold(line string) string {
	var b strings.Builder
	limit := icsLineOctets
	for len(line) > limit {
		cut := limit
		for cut > 0 && !utf8.RuneStart(line[cut]) {
			cut--
		}
		b.WriteString(line[:cut])
		b.WriteString("\r\n ")
		line = line[cut:]
		limit = icsLineOctets - 1
	}
	b.WriteString(line)
	b.WriteString("\r\n")
	return b.String()
}

// ICSUnfold joins folded lines back (RFC 5545 3.1): a CRLF followed by one
// space or tab is removed. It returns the content lines without their CRLF.
func ICSUnfold(text string) []string {
	text = strings.TrimSuffix(text, "\r\n")
	if text == "" {
		return nil
	}
	text = strings.ReplaceAll(text, "\r\n ", "")
	text = strings.ReplaceAll(text, "\r\n\t", "")
	return strings.Split(text, "\r\n")
}

// ICSPlan is a published plan version as the feed needs it.
type ICSPlan struct {
	PlanID    int64
	Version   int
	Published time.Time
	Plan      fuel.Plan
	// Suggestions are the stored food suggestions by menu.FeedKey.
	Suggestions map[string]string
	// FoodNote, when set, follows each food suggestion (for a client with
	// a recorded caution: the ideas are examples only).
	FoodNote string
	// The event the plan leads to, if any: its name, start and duration.
	EventName        string
	EventStart       *time.Time
	EventDurationMin float64
}

// Feed labels the engine gives the pre-event meal and the in-event total.
const (
	icsLabelPreEvent = "pre-event meal"
	icsLabelDuring   = "during event"
)

// ICSPlanEvents turns a plan into VEVENTs: one per feed of every day, and
// the event itself carrying the in-event g/h (the engine's "during event"
// feed is that, so it is not listed twice) and its legs; a stage race has
// an entry per stage and an event over a day one per block of hours. UIDs hold the plan's id, the
// date and the feed's place in the day, and the host part names the app,
// so a revised plan updates the same entries.
func ICSPlanEvents(p ICSPlan) []ICSEvent {
	var out []ICSEvent
	uid := func(what string) string { return fmt.Sprintf("plan-%d-%s@larder", p.PlanID, what) }
	var perHour float64
	if d := p.Plan.DuringEvent; d != nil {
		perHour = d.ChoGPerH
	}
	for _, d := range p.Plan.Days {
		for i, f := range d.Feeds {
			if f.Label == icsLabelDuring {
				continue
			}
			e := ICSEvent{UID: uid(fmt.Sprintf("%s-feed-%d", d.Date, i)), Sequence: p.Version, Stamp: p.Published,
				Start: f.At, Duration: 15 * time.Minute, Summary: icsFeedSummary(f)}
			if f.Label == icsLabelPreEvent {
				e.Duration = 30 * time.Minute
			}
			var desc []string
			if sg := p.Suggestions[menu.FeedKey("day", d.Date, i)]; sg != "" {
				desc = append(desc, "For example: "+sg)
				if p.FoodNote != "" {
					desc = append(desc, p.FoodNote)
				}
			}
			if d.LowFibre {
				desc = append(desc, "Choose low-fibre foods today.")
			}
			desc = append(desc, fuel.Caution)
			e.Description = strings.Join(desc, "\n")
			out = append(out, e)
		}
	}
	out = append(out, icsRaceEntries(p, uid)...)
	// A stage race's entries are its stages'.
	if p.EventStart != nil && len(p.Plan.Stages) == 0 {
		name := p.EventName
		if name == "" {
			name = "Event"
		}
		e := ICSEvent{UID: uid("event"), Sequence: p.Version, Stamp: p.Published, Start: *p.EventStart,
			Duration: time.Duration(p.EventDurationMin * float64(time.Minute)), Summary: name}
		var desc []string
		if perHour > 0 {
			e.Summary = name + " · carbohydrate " + icsGrams(perHour) + " g per hour"
			desc = append(desc, "During the event aim for about "+icsGrams(perHour)+" g of carbohydrate per hour, as you practised in training.")
		}
		if m := p.Plan.PreEventMeal; m != nil {
			desc = append(desc, "Pre-event meal at "+m.At.Format("15:04")+": carbohydrate "+icsGrams(m.ChoG)+" g.")
		}
		desc = append(desc, icsLegs(p.Plan.DuringEvent)...)
		desc = append(desc, fuel.Caution)
		e.Description = strings.Join(desc, "\n")
		out = append(out, e)
	}
	return out
}

func icsFeedSummary(f fuel.Feed) string {
	s := "Carbohydrate " + icsGrams(f.ChoG) + " g"
	if f.ProteinG > 0 {
		s += " · protein " + icsGrams(f.ProteinG) + " g"
	}
	if f.Label != "" {
		s += " (" + f.Label + ")"
	}
	return s
}

// icsGrams prints grams as whole numbers, the way the plan page does.
func icsGrams(g float64) string { return strconv.FormatFloat(math.Round(g), 'f', -1, 64) }

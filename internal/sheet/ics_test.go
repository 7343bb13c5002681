package sheet

import (
	"bytes"
	"strings"
	"testing"
	"time"
	"unicode/utf8"

	"larder/internal/fuel"
	"larder/internal/menu"
)

// icsCheck applies RFC 5545's rules for a calendar stream and returns its
// unfolded content lines: every line ends in CRLF (3.1), no line is longer
// than 75 octets (3.1), the text is UTF-8 (6), BEGIN and END nest and
// balance (3.4, 3.6), VCALENDAR carries VERSION and PRODID (3.6, 3.7.3,
// 3.7.4) and each VEVENT carries UID, DTSTAMP and DTSTART (3.6.1).
func icsCheck(t *testing.T, stream string) []string {
	t.Helper()
	if !utf8.ValidString(stream) {
		t.Fatal("stream is not UTF-8")
	}
	if !strings.HasSuffix(stream, "\r\n") {
		t.Fatal("stream does not end in CRLF")
	}
	for i, l := range strings.Split(strings.TrimSuffix(stream, "\r\n"), "\r\n") {
		if strings.ContainsAny(l, "\r\n") {
			t.Fatalf("line %d holds a bare CR or LF: %q", i+1, l)
		}
		if len(l) > 75 {
			t.Fatalf("line %d is %d octets (> 75): %q", i+1, len(l), l)
		}
	}
	lines := ICSUnfold(stream)
	var stack []string
	var props map[string]int
	var stackProps []map[string]int
	for i, l := range lines {
		name, value, ok := strings.Cut(l, ":")
		if !ok || name == "" {
			t.Fatalf("content line %d has no name:value: %q", i+1, l)
		}
		if k, _, _ := strings.Cut(name, ";"); k != strings.ToUpper(k) {
			t.Fatalf("property name %q is not upper case", k)
		}
		switch name {
		case "BEGIN":
			stack = append(stack, value)
			stackProps = append(stackProps, props)
			props = map[string]int{}
		case "END":
			if len(stack) == 0 || stack[len(stack)-1] != value {
				t.Fatalf("END:%s at line %d does not close %v", value, i+1, stack)
			}
			need := map[string][]string{"VCALENDAR": {"VERSION", "PRODID"}, "VEVENT": {"UID", "DTSTAMP", "DTSTART"}}[value]
			for _, p := range need {
				if props[p] != 1 {
					t.Fatalf("%s has %d %s properties, want 1", value, props[p], p)
				}
			}
			stack = stack[:len(stack)-1]
			props = stackProps[len(stackProps)-1]
			stackProps = stackProps[:len(stackProps)-1]
		default:
			if props == nil {
				t.Fatalf("property %s outside any component", name)
			}
			props[name]++
		}
	}
	if len(stack) != 0 {
		t.Fatalf("unclosed components %v", stack)
	}
	if len(lines) == 0 || lines[0] != "BEGIN:VCALENDAR" {
		t.Fatalf("stream does not start with BEGIN:VCALENDAR")
	}
	return lines
}

func TestICSFoldAt75Octets(t *testing.T) {
	// RFC 5545 3.1: lines longer than 75 octets are split with CRLF and one
	// space; the space is part of the continuation line's octets.
	exact := strings.Repeat("a", 75)
	if got := ICSFold(exact); got != exact+"\r\n" {
		t.Fatalf("a 75-octet line was folded: %q", got)
	}
	long := strings.Repeat("b", 76)
	if got := ICSFold(long); got != strings.Repeat("b", 75)+"\r\n b\r\n" {
		t.Fatalf("76 octets: %q", got)
	}
	// 75 + 74 + 1: the second line holds 74 octets after its space.
	long = strings.Repeat("c", 150)
	want := strings.Repeat("c", 75) + "\r\n " + strings.Repeat("c", 74) + "\r\n c\r\n"
	if got := ICSFold(long); got != want {
		t.Fatalf("150 octets: %q", got)
	}
	// A multi-octet character is never split across lines (RFC 5545 3.1:
	// split between octets of a UTF-8 sequence is not allowed).
	s := strings.Repeat("x", 74) + "é" + "y" // é is two octets: 74+2 = 76 > 75
	got := ICSFold(s)
	if got != strings.Repeat("x", 74)+"\r\n éy\r\n" {
		t.Fatalf("UTF-8 fold: %q", got)
	}
}

func TestICSEscapeText(t *testing.T) {
	// RFC 5545 3.3.11: backslash, semicolon and comma are escaped with a
	// backslash and a line break is written \n; a colon is not escaped.
	cases := map[string]string{
		`a,b`:                             `a\,b`,
		`a;b`:                             `a\;b`,
		`a\b`:                             `a\\b`,
		"a\nb":                            `a\nb`,
		"a\r\nb":                          `a\nb`,
		"time: 7:00":                      "time: 7:00",
		"Oats, 1 cup; milk\\soy\n—enough": `Oats\, 1 cup\; milk\\soy\n—enough`,
	}
	for in, want := range cases {
		if got := ICSEscapeText(in); got != want {
			t.Errorf("escape %q = %q, want %q", in, got, want)
		}
		if back := ICSUnescapeText(ICSEscapeText(in)); back != strings.ReplaceAll(in, "\r\n", "\n") {
			t.Errorf("unescape(escape(%q)) = %q", in, back)
		}
	}
}

func TestICSDuration(t *testing.T) {
	// RFC 5545 3.3.6 dur-time forms.
	for d, want := range map[time.Duration]string{15 * time.Minute: "PT15M", 2 * time.Hour: "PT2H", 150 * time.Minute: "PT2H30M"} {
		if got := icsDuration(d); got != want {
			t.Errorf("%v: %s, want %s", d, got, want)
		}
	}
}

func testPlan() ICSPlan {
	zone := time.FixedZone("+01:00", 3600)
	start := time.Date(2027, 3, 7, 9, 0, 0, 0, zone)
	return ICSPlan{
		PlanID: 42, Version: 3, Published: time.Date(2027, 3, 1, 8, 0, 0, 0, time.UTC),
		Plan: fuel.Plan{
			Days: []fuel.Day{
				{Date: "2027-03-06", Feeds: []fuel.Feed{
					{At: time.Date(2027, 3, 6, 7, 0, 0, 0, zone), Label: "breakfast", ChoG: 120, ProteinG: 25},
					{At: time.Date(2027, 3, 6, 19, 0, 0, 0, zone), Label: "dinner", ChoG: 140.4, ProteinG: 30},
				}, LowFibre: true},
				{Date: "2027-03-07", Feeds: []fuel.Feed{
					{At: time.Date(2027, 3, 7, 6, 0, 0, 0, zone), Label: "pre-event meal", ChoG: 180},
					{At: start, Label: "during event", ChoG: 150},
				}},
			},
			PreEventMeal: &fuel.PreEventMeal{At: time.Date(2027, 3, 7, 6, 0, 0, 0, zone), HoursBefore: 3, ChoGPerKg: 3, ChoG: 180},
			DuringEvent:  &fuel.DuringEvent{DurationMin: 150, ChoGPerH: 60, TotalChoG: 150},
		},
		Suggestions: map[string]string{
			menu.FeedKey("day", "2027-03-06", 0): "2 slices white bread, honey; a glass of juice",
		},
		EventName: "Harbour half, Ferncliff", EventStart: &start, EventDurationMin: 150,
	}
}

func TestICSPlanFeed(t *testing.T) {
	cal := ICSCalendar{ProdID: "-//Larder//Client link//EN", Name: "Fuelling plan", Events: ICSPlanEvents(testPlan())}
	var buf bytes.Buffer
	if err := ICSWrite(&buf, cal); err != nil {
		t.Fatal(err)
	}
	lines := icsCheck(t, buf.String())
	text := strings.Join(lines, "\n")
	for _, want := range []string{
		"DTSTART:20270306T060000Z", // 07:00 at +01:00
		"DTSTART:20270306T180000Z",
		"DTSTART:20270307T050000Z", // pre-event meal
		"DTSTART:20270307T080000Z", // the event
		"SUMMARY:Carbohydrate 120 g · protein 25 g (breakfast)",
		"SUMMARY:Carbohydrate 140 g · protein 30 g (dinner)",
		"SUMMARY:Carbohydrate 180 g (pre-event meal)",
		`SUMMARY:Harbour half\, Ferncliff · carbohydrate 60 g per hour`,
		`DESCRIPTION:For example: 2 slices white bread\, honey\; a glass of juice\nChoose low-fibre`,
		"DURATION:PT2H30M",
		"UID:plan-42-2027-03-06-feed-0@larder",
		"UID:plan-42-event@larder",
		"SEQUENCE:3",
		"DTSTAMP:20270301T080000Z",
	} {
		if !strings.Contains(text, want) {
			t.Errorf("feed lacks %q", want)
		}
	}
	// The in-event total is the event entry, not a second feed at the start.
	if n := strings.Count(text, "BEGIN:VEVENT"); n != 4 {
		t.Errorf("%d VEVENTs, want 4 (three feeds and the event)", n)
	}
	uids := map[string]bool{}
	for _, l := range lines {
		if strings.HasPrefix(l, "UID:") {
			if uids[l] {
				t.Errorf("UID repeated: %s", l)
			}
			uids[l] = true
		}
	}
	// Stable UIDs: a later version of the same plan names the same entries.
	p := testPlan()
	p.Version = 4
	p.Plan.Days[0].Feeds[0].ChoG = 130
	for i, e := range ICSPlanEvents(p) {
		if e.UID != cal.Events[i].UID {
			t.Errorf("UID changed with the version: %s → %s", cal.Events[i].UID, e.UID)
		}
	}
}

func TestICSLongDescriptionFolds(t *testing.T) {
	p := testPlan()
	p.Suggestions[menu.FeedKey("day", "2027-03-06", 1)] = strings.Repeat("rice, lentils; flatbread — ", 20)
	var buf bytes.Buffer
	if err := ICSWrite(&buf, ICSCalendar{ProdID: "x", Events: ICSPlanEvents(p)}); err != nil {
		t.Fatal(err)
	}
	lines := icsCheck(t, buf.String())
	found := false
	for _, l := range lines {
		if strings.HasPrefix(l, "DESCRIPTION:For example: rice") {
			found = true
			v := ICSUnescapeText(strings.TrimPrefix(l, "DESCRIPTION:"))
			if !strings.HasPrefix(v, "For example: "+strings.Repeat("rice, lentils; flatbread — ", 20)) {
				t.Fatalf("description did not survive folding: %q", v)
			}
		}
	}
	if !found {
		t.Fatal("long description missing")
	}
}

// FuzzICSText checks, for any text, that escaping and folding keep every
// line within 75 octets, never split a UTF-8 sequence, and come back to the
// same text: unfold(fold(x)) == x and unescape(escape(x)) == x (with line
// breaks normalised to LF and control characters, which TEXT cannot hold,
// dropped).
func FuzzICSText(f *testing.F) {
	for _, s := range []string{"", "a", strings.Repeat("é", 80), "a,b;c\\d\ne", "x\r\ny\rz", strings.Repeat("ab,", 60), "\x00\x1f\x7f"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		if !utf8.ValidString(s) {
			t.Skip()
		}
		line := "DESCRIPTION:" + ICSEscapeText(s)
		folded := ICSFold(line)
		for _, l := range strings.Split(strings.TrimSuffix(folded, "\r\n"), "\r\n") {
			if len(l) > 75 {
				t.Fatalf("line of %d octets", len(l))
			}
			if !utf8.ValidString(l) {
				t.Fatalf("line splits a UTF-8 sequence: %q", l)
			}
		}
		un := ICSUnfold(folded)
		if len(un) != 1 || un[0] != line {
			t.Fatalf("unfold(fold(x)) = %q, want %q", un, line)
		}
		want := strings.ReplaceAll(strings.ReplaceAll(s, "\r\n", "\n"), "\r", "\n")
		want = strings.Map(func(r rune) rune {
			if (r < 0x20 && r != '\t' && r != '\n') || r == 0x7f {
				return -1
			}
			return r
		}, want)
		if got := ICSUnescapeText(strings.TrimPrefix(un[0], "DESCRIPTION:")); got != want {
			t.Fatalf("unescape(escape(%q)) = %q, want %q", s, got, want)
		}
	})
}

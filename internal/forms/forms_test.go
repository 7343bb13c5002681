package forms

import (
	"math"
	"net/url"
	"strings"
	"testing"
	"time"
)

type sample struct {
	Name   string     `form:"name" label:"Name" validate:"required,max=20"`
	Mass   *float64   `form:"mass" label:"Body mass" unit:"kg" validate:"required,gte=20,lte=300"`
	Reps   *int       `form:"reps" label:"Repetitions" validate:"omitempty,gt=0,lte=50"`
	Count  int        `form:"count" label:"Count" validate:"gte=0,lt=10"`
	Day    time.Time  `form:"day" label:"Day" validate:"required"`
	Born   *time.Time `form:"born" label:"Born"`
	Clock  string     `form:"clock" label:"Start time" validate:"omitempty,clock"`
	Zone   string     `form:"zone" label:"Time zone" validate:"omitempty,iana_zone"`
	Kind   string     `form:"kind" label:"Kind" validate:"omitempty,oneof=a b"`
	Agree  bool       `form:"agree" label:"Agree"`
	Email  string     `form:"email" label:"Email" validate:"omitempty,email"`
	Custom *float64   `form:"custom" label:"Custom" validate:"omitempty,gte=1,lte=2" msg:"Custom must be 1 or 2-ish."`
}

func TestDecodeGood(t *testing.T) {
	var s sample
	f := Decode(url.Values{"name": {"  Ada  "}, "mass": {"72,5"}, "reps": {"8"}, "count": {"3"}, "day": {"2027-04-18"},
		"clock": {"07:30"}, "zone": {"Europe/Berlin"}, "kind": {"b"}, "agree": {"on"}, "email": {"ada@example.org"}}, &s)
	if f.Has() {
		t.Fatalf("unexpected errors %v", f.Errors)
	}
	if s.Name != "Ada" || *s.Mass != 72.5 || *s.Reps != 8 || s.Count != 3 || s.Day.Format(DateLayout) != "2027-04-18" ||
		s.Born != nil || !s.Agree || s.Custom != nil {
		t.Fatalf("decoded %+v", s)
	}
	if f.Get("mass") != "72,5" {
		t.Fatal("the form does not keep what was typed")
	}
}

func TestDecodeMessages(t *testing.T) {
	cases := []struct {
		values url.Values
		field  string
		want   string
	}{
		{url.Values{}, "name", "Name is required."},
		{url.Values{}, "mass", "Body mass is required."},
		{url.Values{}, "day", "Day is required."},
		{url.Values{"name": {strings.Repeat("x", 21)}}, "name", "Name must be at most 20 characters."},
		{url.Values{"mass": {"19.99"}}, "mass", "Body mass must be between 20 and 300 kg."},
		{url.Values{"mass": {"300.01"}}, "mass", "Body mass must be between 20 and 300 kg."},
		{url.Values{"mass": {"abc"}}, "mass", "Body mass must be a number."},
		{url.Values{"mass": {"1e2"}}, "mass", "Body mass must be a number."},
		{url.Values{"mass": {"NaN"}}, "mass", "Body mass must be a number."},
		{url.Values{"mass": {"Inf"}}, "mass", "Body mass must be a number."},
		{url.Values{"reps": {"0"}}, "reps", "Repetitions must be more than 0 and at most 50."},
		{url.Values{"reps": {"2.5"}}, "reps", "Repetitions must be a whole number."},
		// Whole but beyond int32: the limits are the helpful answer.
		{url.Values{"reps": {"99999999999"}}, "reps", "Repetitions must be more than 0 and at most 50."},
		{url.Values{"mass": {strings.Repeat("9", 400)}}, "mass", "Body mass must be between 20 and 300 kg."},
		{url.Values{"zone": {"europe/berlin"}}, "zone", ""},
		{url.Values{"count": {"10"}}, "count", "Count must be at least 0 and less than 10."},
		{url.Values{"day": {"18/04/2027"}}, "day", "Day must be a date (year-month-day)."},
		{url.Values{"born": {"2027-02-30"}}, "born", "Born must be a date (year-month-day)."},
		{url.Values{"clock": {"7.30"}}, "clock", "Start time must be a time of day like 07:30."},
		{url.Values{"zone": {"Berlin"}}, "zone", "Time zone must be a time zone name such as Europe/Berlin, America/New_York or UTC."},
		{url.Values{"zone": {"Local"}}, "zone", "Time zone must be a time zone name such as Europe/Berlin, America/New_York or UTC."},
		{url.Values{"kind": {"c"}}, "kind", "Kind must be one of: a, b."},
		{url.Values{"email": {"ada at example"}}, "email", "Email must be an email address like name@example.org."},
		{url.Values{"custom": {"3"}}, "custom", "Custom must be 1 or 2-ish."},
	}
	for _, tc := range cases {
		var s sample
		f := Decode(tc.values, &s)
		if got := f.Err(tc.field); got != tc.want {
			t.Errorf("%v: %s error = %q, want %q", tc.values, tc.field, got, tc.want)
		}
	}
}

func TestParseNumber(t *testing.T) {
	for in, want := range map[string]float64{"1": 1, " 2.5 ": 2.5, "3,25": 3.25, "-4": -4, "0.0": 0} {
		got, err := ParseNumber(in)
		if err != nil || got != want {
			t.Errorf("ParseNumber(%q) = %v, %v; want %v", in, got, err, want)
		}
	}
	for _, in := range []string{"", "1,000.5", "1.2.3", "0x10", "1e3", "inf", "NaN", "1_000", "½"} {
		if got, err := ParseNumber(in); err == nil {
			t.Errorf("ParseNumber(%q) = %v, want an error", in, got)
		}
	}
}

func TestParseLocalDateTime(t *testing.T) {
	oslo, _ := time.LoadLocation("Europe/Oslo")
	got, err := ParseLocalDateTime("2027-04-18T09:00", oslo)
	// Norway is on summer time (UTC+2) in April: 09:00 there is 07:00 UTC.
	if err != nil || !got.Equal(time.Date(2027, 4, 18, 7, 0, 0, 0, time.UTC)) {
		t.Fatalf("got %v, %v", got, err)
	}
	if _, err := ParseLocalDateTime("2027-04-18 09:00:30", oslo); err != nil {
		t.Fatal(err)
	}
	if _, err := ParseLocalDateTime("18.04.2027 09:00", oslo); err == nil {
		t.Fatal("a day-first date was accepted")
	}
}

// FuzzDecode feeds arbitrary query strings to Decode: it must never panic,
// must key every error by a field of the form, and anything it accepts must
// respect the limits in the tags.
func FuzzDecode(f *testing.F) {
	f.Add("name=Ada&mass=72.5&day=2027-04-18")
	f.Add("mass=1e309&reps=99999999999&day=0000-00-00")
	f.Add("zone=../../etc/passwd&clock=24:00&born=2027-13-01")
	f.Add("mass=%00&name=%ff%fe")
	f.Add("name=Ada%00&mass=60&email=a%c3%28@example.org")
	fields := map[string]bool{"name": true, "mass": true, "reps": true, "count": true, "day": true, "born": true,
		"clock": true, "zone": true, "kind": true, "agree": true, "email": true, "custom": true}
	f.Fuzz(func(t *testing.T, query string) {
		values, err := url.ParseQuery(query)
		if err != nil {
			return
		}
		var s sample
		form := Decode(values, &s)
		for k := range form.Errors {
			if !fields[k] {
				t.Fatalf("error keyed by unknown field %q", k)
			}
		}
		for k, vs := range form.Values {
			for _, v := range vs {
				if fields[k] && BadText(v) {
					t.Fatalf("field %s shown back with text that cannot be stored: %q", k, v)
				}
			}
		}
		if BadText(s.Name) || BadText(s.Email) || BadText(s.Kind) || BadText(s.Zone) {
			t.Fatalf("decoded text that cannot be stored: %+v", s)
		}
		if !form.Has() {
			if s.Mass == nil || *s.Mass < 20 || *s.Mass > 300 || math.IsNaN(*s.Mass) {
				t.Fatalf("accepted mass %v", s.Mass)
			}
			if s.Reps != nil && (*s.Reps <= 0 || *s.Reps > 50) {
				t.Fatalf("accepted reps %d", *s.Reps)
			}
			if s.Zone != "" && !ValidZone(s.Zone) {
				t.Fatalf("accepted zone %q", s.Zone)
			}
		}
	})
}

// FuzzParseNumber: never panics; whatever parses is finite and reads back.
func FuzzParseNumber(f *testing.F) {
	for _, s := range []string{"1", "2,5", "-0", "1e5", "NaN", "99999999999999999999999"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		x, err := ParseNumber(s)
		if err == nil && (math.IsNaN(x) || math.IsInf(x, 0)) {
			t.Fatalf("ParseNumber(%q) = %v", s, x)
		}
	})
}

// FuzzParseLocalDateTime: never panics; a parsed time formats back to its input's date.
func FuzzParseLocalDateTime(f *testing.F) {
	f.Add("2027-04-18T09:00", "Europe/Oslo")
	f.Add("2027-03-28 02:30", "Europe/Berlin") // a time skipped by the change to summer time
	f.Fuzz(func(t *testing.T, s, zone string) {
		if !ValidZone(zone) {
			return
		}
		loc, _ := time.LoadLocation(zone)
		if got, err := ParseLocalDateTime(s, loc); err == nil && got.IsZero() {
			t.Fatalf("ParseLocalDateTime(%q) gave the zero time", s)
		}
	})
}

// People type zone names in lower case or with spaces; the IANA spelling is
// what time.LoadLocation needs.
func TestCanonicalZone(t *testing.T) {
	for in, want := range map[string]string{
		"Europe/Oslo":          "Europe/Oslo",
		"europe/oslo":          "Europe/Oslo",
		" EUROPE/BERLIN ":      "Europe/Berlin",
		"america/new york":     "America/New_York",
		"America/new_york":     "America/New_York",
		"utc":                  "UTC",
		"Mars/Olympus_Mons":    "Mars/Olympus_Mons",
		"Local":                "Local",
		"europe/../etc/passwd": "europe/../etc/passwd",
	} {
		if got := CanonicalZone(in); got != want {
			t.Errorf("CanonicalZone(%q) = %q, want %q", in, got, want)
		}
	}
	if ValidZone(CanonicalZone("Local")) {
		t.Error("Local (the server's zone) became valid")
	}
}

// FuzzCanonicalZone: never panics, and whatever it changes is a valid zone.
func FuzzCanonicalZone(f *testing.F) {
	for _, s := range []string{"europe/oslo", "utc", "america/new york", "ß/ÿ", "/"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		if got := CanonicalZone(s); got != strings.TrimSpace(s) && !ValidZone(got) {
			t.Fatalf("CanonicalZone(%q) = %q, not a zone", s, got)
		}
	})
}

// Text PostgreSQL cannot store (NUL, bytes that are not UTF-8) is refused
// beside its field, and the value shown back is printable.
func TestDecodeRefusesBadText(t *testing.T) {
	for _, raw := range []string{"Ada\x00", "\x00", "Ad\xffa", "caf\xc3", "a\xed\xa0\x80b"} {
		var s sample
		f := Decode(url.Values{"name": {raw}, "mass": {"60"}, "day": {"2027-04-18"}}, &s)
		if f.Err("name") != BadTextMessage {
			t.Errorf("name %q: message %q, want %q", raw, f.Err("name"), BadTextMessage)
		}
		if len(f.Errors) != 1 {
			t.Errorf("name %q: errors %v, want only the name's", raw, f.Errors)
		}
		if BadText(f.Get("name")) || s.Name != "" {
			t.Errorf("name %q: shown back %q, decoded %q", raw, f.Get("name"), s.Name)
		}
	}
	var s sample
	if f := Decode(url.Values{"name": {"Zoë Ødegård"}, "mass": {"60"}, "day": {"2027-04-18"}}, &s); f.Has() || s.Name != "Zoë Ødegård" {
		t.Errorf("good accented name refused: %v", f.Errors)
	}
}

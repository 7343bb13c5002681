package fuel

import (
	"errors"
	"strings"
	"testing"
	"time"
)

func validRace() Request {
	return Request{
		Kind:    KindRace,
		Athlete: Athlete{Sex: "male", BodyMassKg: 70},
		Event: &Event{StartsAt: time.Date(2027, 5, 2, 9, 0, 0, 0, time.UTC), Modality: "run",
			DistanceKm: ptr(21.1), ExpectedDurationMin: 95},
	}
}

func TestValidateNamesFieldsInPlainWords(t *testing.T) {
	cases := []struct {
		name   string
		change func(*Request)
		field  string
		words  string
	}{
		{"kind", func(r *Request) { r.Kind = "sprint" }, "kind", "must be one of: loading, race, repletion, week"},
		{"sex", func(r *Request) { r.Athlete.Sex = "" }, "athlete.sex", "is required"},
		{"mass low", func(r *Request) { r.Athlete.BodyMassKg = 12 }, "athlete.body_mass_kg", "must be from 20 to 300 kg"},
		{"body fat", func(r *Request) { r.Athlete.BodyFatPct = ptr(80.0) }, "athlete.body_fat_pct", "must be at most 60 %"},
		{"modality", func(r *Request) { r.Event.Modality = "chess" }, "event.modality", "must be one of:"},
		{"duration", func(r *Request) { r.Event.ExpectedDurationMin = 0 }, "event.expected_duration_min", "is required"},
		{"event missing", func(r *Request) { r.Event = nil }, "event", "is required for a race plan"},
		{"year", func(r *Request) { r.Event.StartsAt = time.Date(1990, 1, 1, 0, 0, 0, 0, time.UTC) }, "event.starts_at", "between the years 2000 and 2100"},
		{"training date", func(r *Request) { r.Training = []TrainingSession{{Date: "16/04/2027", DurationMin: 30}} }, "training[0].date", "must be a date like 2027-04-16"},
		{"training start", func(r *Request) { r.Training = []TrainingSession{{Date: "2027-04-16", Start: "7am", DurationMin: 30}} }, "training[0].start", "must be a clock time like 07:00"},
		{"intensity", func(r *Request) {
			r.Training = []TrainingSession{{Date: "2027-04-16", DurationMin: 30, Intensity: "rpe:12"}}
		}, "training[0].intensity", "rpe must be a number from 1 to 10"},
		{"protocol", func(r *Request) { r.Kind, r.Protocol = KindLoading, "four-day" }, "protocol", "must be one of: two-day, one-day, three-day"},
		{"taper too short", func(r *Request) { r.Kind, r.Protocol, r.TaperDays = KindLoading, ProtocolThreeDay, 2 }, "taper_days", "must be at least 3"},
		{"zone", func(r *Request) { r.TimeZone = "Mars/Olympus" }, "time_zone", "not a known time zone"},
		{"override twice", func(r *Request) {
			r.Overrides = []DayOverride{{Date: "2027-05-02", ChoGPerKg: ptr(8.0)}, {Date: "2027-05-02", ChoGPerKg: ptr(9.0)}}
		}, "overrides[1].date", "appears twice"},
		{"empty override", func(r *Request) { r.Overrides = []DayOverride{{Date: "2027-05-02"}} }, "overrides[0]", "must set cho_g_per_kg or eating_occasions"},
		{"in-event override", func(r *Request) { r.DuringEventChoGPerH = ptr(200.0) }, "during_event_cho_g_per_h", "must be at most 150 g/h"},
		{"repletion order", func(r *Request) {
			end := time.Date(2027, 5, 2, 12, 0, 0, 0, time.UTC)
			next := end.Add(-time.Hour)
			r.Kind, r.SessionEnd, r.NextStart = KindRepletion, &end, &next
		}, "next_start", "must be after session_end"},
		{"week without dates", func(r *Request) { r.Kind, r.Event = KindWeek, nil }, "start_date", "is required for a week plan without training"},
	}
	for _, c := range cases {
		r := validRace()
		c.change(&r)
		err := r.Validate()
		var verr ValidationError
		if !errors.As(err, &verr) {
			t.Errorf("%s: %v, want a ValidationError", c.name, err)
			continue
		}
		found := false
		for _, fe := range verr {
			if fe.Field == c.field && strings.Contains(fe.Message, c.words) {
				found = true
			}
		}
		if !found {
			t.Errorf("%s: want %s: %q…, got %v", c.name, c.field, c.words, verr)
		}
	}
	if err := validRace().Validate(); err != nil {
		t.Errorf("valid request rejected: %v", err)
	}
}

func TestDecodeRequestIsStrict(t *testing.T) {
	for in, field := range map[string]string{
		`{"kind":"race","athlete":{"sex":"male","body_mass_kg":70,"shoe":42}}`:    "shoe",
		`{"kind":"race","athlete":{"sex":"male","body_mass_kg":70}} {"kind":"x"}`: "request",
		``:                               "request",
		`[]`:                             "request",
		`{"days":"seven","kind":"week"}`: "days",
		`{"kind":"repletion","athlete":{"sex":"male","body_mass_kg":70},"session_end":"noon"}`: "session_end",
	} {
		_, err := DecodeRequest(strings.NewReader(in))
		var verr ValidationError
		if !errors.As(err, &verr) || verr[0].Field != field {
			t.Errorf("%q: %v, want the field %q named", in, err, field)
		}
	}
	big := strings.NewReader(`{"kind":"` + strings.Repeat("x", MaxRequestBytes) + `"}`)
	if _, err := DecodeRequest(big); err == nil || !strings.Contains(err.Error(), "larger than 1 MB") {
		t.Errorf("oversized request: %v", err)
	}
}

package server

import (
	"context"
	"net/http"
	"net/url"
	"strings"
	"testing"
	"time"

	"larder/internal/store"
)

// merge returns base with the given fields replaced (an empty value clears one).
func merge(base url.Values, kv ...string) url.Values {
	v := url.Values{}
	for k, vals := range base {
		v[k] = append([]string(nil), vals...)
	}
	for i := 0; i+1 < len(kv); i += 2 {
		v.Set(kv[i], kv[i+1])
	}
	return v
}

// Each rule's plain message shows beside its field, the form keeps what was
// typed, and nothing is saved. The test clock is 1 March 2027.
func TestValidationMessages(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Validation Client"))
	base := "/clients/" + itoa(c.ID)

	clientOK := url.Values{"name": {unique("Valid Name")}, "sex": {"male"}, "date_of_birth": {"1990-05-05"}, "height_cm": {"180"}}
	massOK := url.Values{"measured_on": {"2027-02-28"}, "mass": {"70"}, "unit": {"kg"}, "body_fat_pct": {"15"}}
	trainingOK := url.Values{"on_date": {"2027-02-28"}, "modality": {"run"}, "duration_min": {"60"}, "intensity_kind": {"rpe"}, "rpe": {"6"}, "status": {"done"}}
	eventOK := url.Values{"name": {"Valid Race"}, "starts_at": {"2027-05-01T08:00"}, "time_zone": {"Europe/Berlin"}, "modality": {"run"},
		"expected_duration_min": {"90"}, "priority": {"A"}}

	cases := []struct {
		name, path, table string
		form              url.Values
		field, msg, kept  string
	}{
		{"client name required", "/clients", "clients", merge(clientOK, "name", ""), "name", "Name is required.", ""},
		{"client sex", "/clients", "clients", merge(clientOK, "sex", "other"), "sex", "Choose female or male: the physiology equations need one of the two.", ""},
		{"height low", "/clients", "clients", merge(clientOK, "height_cm", "99"), "height_cm", "Height must be between 100 and 250 cm.", `value="99"`},
		{"height high", "/clients", "clients", merge(clientOK, "height_cm", "251"), "height_cm", "Height must be between 100 and 250 cm.", `value="251"`},
		{"height in metres", "/clients", "clients", merge(clientOK, "height_cm", "1,72"), "height_cm", "Height is in centimetres: 1.72 m is 172 cm.", `value="1,72"`},
		{"height not a number", "/clients", "clients", merge(clientOK, "height_cm", "tall"), "height_cm", "Height must be a number.", `value="tall"`},
		{"date of birth future", "/clients", "clients", merge(clientOK, "date_of_birth", "2030-01-01"), "date_of_birth",
			"Date of birth must be between Tue 1 Mar 1927 and Tue 1 Mar 2022 (an age of 5 to 100 years).", `value="2030-01-01"`},
		{"date of birth too old", "/clients", "clients", merge(clientOK, "date_of_birth", "1900-01-01"), "date_of_birth",
			"Date of birth must be between", ""},
		{"date of birth not a date", "/clients", "clients", merge(clientOK, "date_of_birth", "5 May 1990"), "date_of_birth",
			"Date of birth must be a date (year-month-day).", ""},

		{"mass required", base + "/body-mass", "body_mass", merge(massOK, "mass", ""), "mass", "Body mass is required.", ""},
		{"mass low kg", base + "/body-mass", "body_mass", merge(massOK, "mass", "19.9"), "mass", "Body mass must be between 20 and 300 kg.", `value="19.9"`},
		{"mass high kg", base + "/body-mass", "body_mass", merge(massOK, "mass", "300.5"), "mass", "Body mass must be between 20 and 300 kg.", ""},
		// 20 kg = 44.09 lb and 300 kg = 661.39 lb (1 lb = 0.45359237 kg exactly,
		// NIST SP 811): stated inwards to 0.1 lb, 44.1 to 661.3.
		{"mass high lb", base + "/body-mass", "body_mass", merge(massOK, "mass", "700", "unit", "lb"), "mass",
			"Body mass must be between 44.1 and 661.3 lb (20 to 300 kg).", `value="700"`},
		{"mass low lb", base + "/body-mass", "body_mass", merge(massOK, "mass", "40", "unit", "lb"), "mass",
			"Body mass must be between 44.1 and 661.3 lb (20 to 300 kg).", ""},
		{"mass not a number", base + "/body-mass", "body_mass", merge(massOK, "mass", "seventy"), "mass", "Body mass must be a number.", `value="seventy"`},
		{"unit", base + "/body-mass", "body_mass", merge(massOK, "unit", "stone"), "unit", "Choose kg or lb.", ""},
		{"measurement date two days ahead", base + "/body-mass", "body_mass", merge(massOK, "measured_on", "2027-03-03"), "measured_on",
			"Measurement date cannot be more than one day after today (Mon 1 Mar 2027).", `value="2027-03-03"`},
		{"measurement date before 1900", base + "/body-mass", "body_mass", merge(massOK, "measured_on", "1899-12-31"), "measured_on",
			"Measurement date must be after 1900.", ""},
		{"measurement date required", base + "/body-mass", "body_mass", merge(massOK, "measured_on", ""), "measured_on", "Measurement date is required.", ""},
		{"body fat low", base + "/body-mass", "body_mass", merge(massOK, "body_fat_pct", "1.5"), "body_fat_pct", "Body fat must be between 2 and 60 %.", ""},
		{"body fat high", base + "/body-mass", "body_mass", merge(massOK, "body_fat_pct", "61"), "body_fat_pct", "Body fat must be between 2 and 60 %.", ""},

		{"duration zero", base + "/training", "training_sessions", merge(trainingOK, "duration_min", "0"), "duration_min",
			"Duration must be more than 0 and at most 1440 minutes (24 hours).", `value="0"`},
		{"duration negative", base + "/training", "training_sessions", merge(trainingOK, "duration_min", "-5"), "duration_min",
			"Duration must be more than 0 and at most 1440 minutes (24 hours).", ""},
		{"duration over a day", base + "/training", "training_sessions", merge(trainingOK, "duration_min", "1441"), "duration_min",
			"Duration must be more than 0 and at most 1440 minutes (24 hours).", ""},
		{"duration fractional", base + "/training", "training_sessions", merge(trainingOK, "duration_min", "45.5"), "duration_min",
			"Duration must be a whole number.", ""},
		{"rpe high", base + "/training", "training_sessions", merge(trainingOK, "rpe", "11"), "rpe", "RPE must be between 1 and 10.", `value="11"`},
		{"rpe low", base + "/training", "training_sessions", merge(trainingOK, "rpe", "0"), "rpe", "RPE must be between 1 and 10.", ""},
		{"rpe missing", base + "/training", "training_sessions", merge(trainingOK, "rpe", ""), "rpe", "Give the RPE (1 to 10) for this session.", ""},
		{"vo2max high", base + "/training", "training_sessions", merge(trainingOK, "intensity_kind", "pct_vo2max", "pct_vo2max", "121"), "pct_vo2max",
			"%VO2max must be between 20 and 120 %.", ""},
		{"vo2max low", base + "/training", "training_sessions", merge(trainingOK, "intensity_kind", "pct_vo2max", "pct_vo2max", "19"), "pct_vo2max",
			"%VO2max must be between 20 and 120 %.", ""},
		{"zone missing", base + "/training", "training_sessions", merge(trainingOK, "intensity_kind", "zone"), "zone", "Choose the zone of this session.", ""},
		{"zone unknown", base + "/training", "training_sessions", merge(trainingOK, "intensity_kind", "zone", "zone", "red"), "zone", "Choose a zone from the list.", ""},
		{"start time", base + "/training", "training_sessions", merge(trainingOK, "start_time", "25:00"), "start_time", "Start time must be a time of day like 07:30.", ""},
		{"modality", base + "/training", "training_sessions", merge(trainingOK, "modality", "jousting"), "modality", "Choose an activity from the list.", ""},
		{"done in the future", base + "/training", "training_sessions", merge(trainingOK, "on_date", "2027-03-10"), "status",
			"A session more than a day ahead cannot be done yet; mark it planned.", ""},
		{"training date far", base + "/training", "training_sessions", merge(trainingOK, "on_date", "2029-01-01", "status", "planned"), "on_date",
			"Date must be within five years before and one year after today.", ""},
		{"training distance", base + "/training", "training_sessions", merge(trainingOK, "distance_km", "0"), "distance_km",
			"Distance must be more than 0 and at most 1000 km.", ""},

		{"time zone unknown", base + "/events", "events", merge(eventOK, "time_zone", "Mars/Olympus_Mons"), "time_zone",
			"Time zone must be a time zone name such as Europe/Berlin, America/New_York or UTC.", `value="Mars/Olympus_Mons"`},
		{"time zone Local", base + "/events", "events", merge(eventOK, "time_zone", "Local"), "time_zone",
			"Time zone must be a time zone name such as Europe/Berlin, America/New_York or UTC.", ""},
		{"event start", base + "/events", "events", merge(eventOK, "starts_at", "next Sunday"), "starts_at",
			"Start must be a date and time like 2027-04-18 08:30.", `value="next Sunday"`},
		{"event start far", base + "/events", "events", merge(eventOK, "starts_at", "2040-05-01T08:00"), "starts_at",
			"Start must be within five years of today.", ""},
		{"event duration", base + "/events", "events", merge(eventOK, "expected_duration_min", "0"), "expected_duration_min",
			"Expected duration must be more than 0 and at most 2880 minutes (48 hours).", ""},
		// Germany's clocks go from 02:00 to 03:00 on the last Sunday of March (28 Mar 2027; common practice).
		{"event start skipped by summer time", base + "/events", "events", merge(eventOK, "starts_at", "2027-03-28T02:30"), "starts_at",
			"02:30 does not exist in Europe/Berlin on Sun 28 Mar 2027: the clocks go forward then. Give the start as the clocks there will show it, such as 03:30.", `value="2027-03-28T02:30"`},
		{"event days", base + "/events", "events", merge(eventOK, "days", "31"), "days", "Days must be a whole number from 1 to 30.", ""},
		{"event priority", base + "/events", "events", merge(eventOK, "priority", "D"), "priority", "Choose goal race, important race or training race.", ""},
		{"event name", base + "/events", "events", merge(eventOK, "name", strings.Repeat("x", 201)), "name", "Name must be at most 200 characters.", ""},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			before := a.count(`SELECT count(*) FROM ` + tc.table)
			res := b.post(tc.path, tc.form)
			if res.status != http.StatusUnprocessableEntity {
				t.Fatalf("status %d, want 422\n%s", res.status, res.body)
			}
			res.mustContain(t, tc.msg, "Nothing was saved.", `id="err-`+tc.field+`"`)
			if tc.kept != "" {
				res.mustContain(t, tc.kept)
			}
			// Another field's typed value is kept too.
			for k, v := range tc.form {
				if k != tc.field && v[0] != "" && (k == "name" || k == "method" || k == "distance_km") {
					res.mustContain(t, `value="`+v[0]+`"`)
				}
			}
			if after := a.count(`SELECT count(*) FROM ` + tc.table); after != before {
				t.Fatalf("%s rows went from %d to %d", tc.table, before, after)
			}
		})
	}

	// The valid forms are accepted, so each case above failed for its own field.
	for path, form := range map[string]url.Values{"/clients": clientOK, base + "/body-mass": massOK, base + "/training": trainingOK, base + "/events": eventOK} {
		if res := b.post(path, form); res.status != http.StatusSeeOther {
			t.Fatalf("valid form to %s refused: %d\n%s", path, res.status, res.body)
		}
	}
	// Boundaries are inside: 20 kg, 1 day ahead, RPE 10, 1440 min.
	for path, form := range map[string]url.Values{
		base + "/body-mass": merge(massOK, "mass", "20", "measured_on", "2027-03-02", "body_fat_pct", "60"),
		base + "/training":  merge(trainingOK, "duration_min", "1440", "rpe", "10"),
	} {
		if res := b.post(path, form); res.status != http.StatusSeeOther {
			t.Fatalf("boundary form to %s refused: %d\n%s", path, res.status, res.body)
		}
	}
}

// A measurement dated before the client was born is a typo in the year; it is
// refused beside the date. A whole-kilogram mass reads "58.0 kg" like its
// neighbours in the table.
func TestBodyMassBeforeBirthAndOneDecimal(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	born := time.Date(1992, 7, 1, 0, 0, 0, 0, time.UTC)
	h := 167.0
	c := store.Client{Name: unique("Born Client"), Sex: store.SexFemale, HeightCm: &h, DateOfBirth: &born}
	if err := a.st.CreateClient(context.Background(), store.System, &c); err != nil {
		t.Fatal(err)
	}
	base := "/clients/" + itoa(c.ID)
	res := b.post(base+"/body-mass", url.Values{"measured_on": {"1926-11-30"}, "mass": {"58"}, "unit": {"kg"}, "method": {"scale"}})
	if res.status != http.StatusUnprocessableEntity {
		t.Fatalf("status %d, want 422", res.status)
	}
	res.mustContain(t, "Measurement date cannot be before the client&#39;s date of birth (Wed 1 Jul 1992).", `id="err-measured_on"`, `value="1926-11-30"`, `value="scale"`)
	if n := a.count(`SELECT count(*) FROM body_mass WHERE client_id = $1`, c.ID); n != 0 {
		t.Fatalf("%d measurements saved", n)
	}
	b.post(base+"/body-mass", url.Values{"measured_on": {"2027-02-28"}, "mass": {"58"}, "unit": {"kg"}}).mustRedirect(t, base)
	b.get(base).mustContain(t, "58.0 kg")
}

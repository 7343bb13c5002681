package forms

import (
	"strings"
	"testing"
	"time"
)

func TestParseSegmentsIronman(t *testing.T) {
	segs, err := ParseSegments("swim 3.8 km 65 min\nT1 5min\nbike 180 km 5h20min 215 W\n\ntransition 3 min\nrun 42,2 km 247 min 70%\n")
	if err == nil {
		t.Fatalf("5h20min is two figures in one token and should be refused, got %+v", segs)
	}
	segs, err = ParseSegments("swim 3.8 km 65 min\nT1 5min\nbike 180 km 320 min 215 W\n\ntransition 3 min\nrun 42,2 km 247 min 70%\n")
	if err != nil {
		t.Fatal(err)
	}
	if len(segs) != 5 || segs[0].Modality != "swim" || *segs[0].DistanceKm != 3.8 || segs[1].Modality != "transition" ||
		segs[2].Modality != "cycle" || *segs[2].AveragePowerW != 215 || *segs[4].DistanceKm != 42.2 || *segs[4].IntensityPctVO2max != 70 {
		t.Errorf("%+v", segs)
	}
	back, err := ParseSegments(SegmentsText(segs))
	if err != nil || len(back) != 5 || back[2].ExpectedDurationMin != 320 {
		t.Errorf("round trip: %v %+v", err, back)
	}
}

func TestParseSegmentsMessagesNameTheLine(t *testing.T) {
	cases := map[string]string{
		"swim 3.8 km 65 min\nrow 10 km 40 min": "Line 2: start with swim",
		"swim 3.8 km":                          "Line 1: needs its expected duration",
		"run 10 km 50 min 300 W":               "Line 1: power in W is for a cycle leg only",
		"transition 5 min\nrun 10 km 50 min":   "Line 1: the event starts with a leg",
		"run 10 km 50 min 10 km":               "gives the distance twice",
		"run ten km 50 min":                    `"ten" is not a figure`,
		"run 10 50 min":                        "10 needs its unit",
		"cycle 90 km 0 min":                    "duration must be more than 0",
	}
	for in, want := range cases {
		_, err := ParseSegments(in)
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("%q: %v, want %q", in, err, want)
		}
	}
}

func TestParseStages(t *testing.T) {
	loc, _ := time.LoadLocation("Europe/Madrid")
	st, err := ParseStages("2027-05-13 12:00 cycle 165 km 240 min 230 W\n2027-05-14 11:30 bike 190km 290min", loc)
	if err != nil {
		t.Fatal(err)
	}
	if len(st) != 2 || st[0].StartsAt.Location() != loc || st[0].StartsAt.Hour() != 12 || st[1].Modality != "cycle" {
		t.Errorf("%+v", st)
	}
	back, err := ParseStages(StagesText(st, loc), loc)
	if err != nil || len(back) != 2 || !back[1].StartsAt.Equal(st[1].StartsAt) {
		t.Errorf("round trip %v %+v", err, back)
	}
	cases := map[string]string{
		"2027-05-13 12:00 cycle 240 min":                                "at least 2 stages",
		"2027-05-13 12:00 cycle 240 min\n2027-05-13 14:00 cycle 60 min": "Line 2: starts before the stage above finishes",
		"13/05/2027 12:00 cycle 240 min\n2027-05-14 12:00 cycle 60 min": "Line 1: start with the date",
		"2027-03-28 02:30 cycle 60 min\n2027-03-29 12:00 cycle 60 min":  "does not exist",
		"2027-05-13 12:00 kayak 60 min\n2027-05-14 12:00 cycle 60 min":  "the activity must be",
	}
	for in, want := range cases {
		_, err := ParseStages(in, loc)
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("%q: %v, want %q", in, err, want)
		}
	}
}

func FuzzParseSegments(f *testing.F) {
	f.Add("swim 3.8 km 65 min\nT1 5 min\ncycle 180 km 320 min 215 W\nrun 42.2 km 247 min")
	f.Add("run 10,5km 50min 80%")
	f.Fuzz(func(t *testing.T, s string) {
		segs, err := ParseSegments(s)
		if err != nil {
			return
		}
		if len(segs) > MaxSegments {
			t.Fatalf("%d legs", len(segs))
		}
		for _, g := range segs {
			if g.ExpectedDurationMin <= 0 || g.ExpectedDurationMin > 1440 {
				t.Fatalf("duration %g accepted", g.ExpectedDurationMin)
			}
		}
		if _, err := ParseSegments(SegmentsText(segs)); err != nil {
			t.Fatalf("written back %q: %v", SegmentsText(segs), err)
		}
	})
}

func FuzzParseStages(f *testing.F) {
	f.Add("2027-05-13 12:00 cycle 165 km 240 min 230 W\n2027-05-14 11:30 cycle 290 min")
	f.Fuzz(func(t *testing.T, s string) {
		st, err := ParseStages(s, time.UTC)
		if err != nil {
			return
		}
		if len(st) == 1 || len(st) > MaxStages {
			t.Fatalf("%d stages", len(st))
		}
		if _, err := ParseStages(StagesText(st, time.UTC), time.UTC); err != nil {
			t.Fatalf("written back: %v", err)
		}
	})
}

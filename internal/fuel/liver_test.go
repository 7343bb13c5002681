package fuel

import (
	"testing"
	"time"
)

// steadyWeek is two weeks of 1 h moderate running a day at 17:00 on the
// training-load targets, for a 70 kg man, so the stores have settled.
func steadyWeek(t *testing.T) Plan {
	t.Helper()
	req := Request{Kind: KindWeek, Athlete: Athlete{Sex: "male", BodyMassKg: 70}, StartDate: "2027-03-01", Days: 14}
	for d := 1; d <= 14; d++ {
		req.Training = append(req.Training, TrainingSession{Date: time.Date(2027, 3, d, 0, 0, 0, 0, time.UTC).Format("2006-01-02"),
			Start: "17:00", DurationMin: 60, Modality: "run", Intensity: "moderate"})
	}
	return mustCompute(t, req)
}

func TestOvernightFastLowersLiverByAThirdToAHalf(t *testing.T) {
	// common practice: a 10–12 h overnight fast typically lowers liver
	// glycogen by roughly a third to a half. The last meal of the day is
	// dinner at 19:00, breakfast at 07:00: a 12 h fast. The fall is measured
	// from the evening's highest (fed) value to just before breakfast.
	p := steadyWeek(t)
	from := time.Date(2027, 3, 13, 19, 0, 0, 0, time.UTC)
	breakfast := time.Date(2027, 3, 14, 7, 0, 0, 0, time.UTC)
	var peak, morning float64
	for _, c := range p.Glycogen.Curve {
		if !c.At.Before(from) && c.At.Before(breakfast) && c.LiverG > peak {
			peak = c.LiverG
		}
		if c.At.Equal(breakfast) {
			morning = c.LiverG
		}
	}
	// common practice: about 100–120 g liver glycogen in a fed 70 kg adult
	if peak < 100 || peak > 120 {
		t.Errorf("fed evening liver glycogen %g g, want 100–120 g", peak)
	}
	fall := 1 - morning/peak
	t.Logf("liver %g g in the evening, %g g at 07:00: a fall of %.0f%%", peak, morning, fall*100)
	if fall < 1.0/3 || fall > 0.5 {
		t.Errorf("overnight fall %.0f%%, want a third to a half", fall*100)
	}
}

func TestSimulationStartsFromAFedState(t *testing.T) {
	// common practice: a fed 70 kg adult holds about 100–120 g liver
	// glycogen, the main source of blood glucose for 8–12 h after a meal.
	// At midnight, five hours after dinner, less than the lower end of the
	// overnight fall (a third, common practice) may have gone.
	req := Request{Kind: KindWeek, Athlete: Athlete{Sex: "male", BodyMassKg: 70}, StartDate: "2027-03-01", Days: 1}
	p := mustCompute(t, req)
	first := p.Glycogen.Curve[0]
	if !first.At.Equal(time.Date(2027, 3, 1, 0, 0, 0, 0, time.UTC)) {
		t.Fatalf("curve starts at %v, not midnight of day 1", first.At)
	}
	if first.LiverG < (1-1.0/3)*100 || first.LiverG > 120 {
		t.Errorf("liver glycogen at midnight of day 1 is %g g, want a fed 100–120 g less under a third", first.LiverG)
	}
	// common practice: a 70 kg adult stores about 400 g muscle glycogen;
	// the start is the typical state (Bergström J et al. Acta Physiol Scand
	// 1967;71:140–150; Sherman WM et al. Int J Sports Med 1981;2:114–118
	// (from memory): typical trained 80–120 mmol/kg).
	if first.MuscleG < 300 || first.MuscleG > 500 {
		t.Errorf("muscle glycogen at the start %g g, want about 400 g", first.MuscleG)
	}
	// The start follows the same night as any later one: the 07:00 value of
	// day 1 is close to that after a settled week.
	week := steadyWeek(t)
	var d1, d14 float64
	for _, c := range p.Glycogen.Curve {
		if c.At.Hour() == 7 {
			d1 = c.LiverG
		}
	}
	for _, c := range week.Glycogen.Curve {
		if c.At.Equal(time.Date(2027, 3, 14, 7, 0, 0, 0, time.UTC)) {
			d14 = c.LiverG
		}
	}
	if d1 < 0.8*d14 || d1 > 1.2*d14 {
		t.Errorf("07:00 liver on day 1 %g g, after a settled week %g g", d1, d14)
	}
}

func TestFastedMorningRunLeavesLiverGlycogen(t *testing.T) {
	// The marathon example's first day: 2 h of running at 07:00 before
	// breakfast, after the night's fast. Liver glycogen falls but does not
	// run dry: gluconeogenesis supplies part of blood glucose (common
	// practice).
	p := mustCompute(t, loadRequest(t, "marathon-loading.json"))
	var before, after, low float64
	low = 1e9
	for _, c := range p.Glycogen.Curve {
		switch c.At.Format("2006-01-02 15:04") {
		case "2027-04-11 07:00":
			before = c.LiverG
		case "2027-04-11 09:00":
			after = c.LiverG
		}
		low = min(low, c.LiverG)
	}
	t.Logf("liver %g g before the run, %g g after; lowest %g g", before, after, low)
	if after >= before {
		t.Errorf("liver glycogen did not fall in the run: %g → %g g", before, after)
	}
	if after <= 0 || low <= 0 {
		t.Errorf("liver glycogen ran dry: %g g after the run, lowest %g g", after, low)
	}
	// common practice: about 100–120 g fed at 70 kg, so 58 kg holds about
	// 83–99 g; the start at midnight is fed (less under a third).
	fed := 58.0 / 70
	if c := p.Glycogen.Curve[0]; c.LiverG < (1-1.0/3)*100*fed || c.LiverG > 120*fed {
		t.Errorf("liver at midnight of day 1 %g g, want fed", c.LiverG)
	}
}

package fuel

import (
	"strings"
	"testing"
)

func dayOf(t *testing.T, p Plan, date string) Day {
	t.Helper()
	for _, d := range p.Days {
		if d.Date == date {
			return d
		}
	}
	t.Fatalf("no day %s", date)
	return Day{}
}

func labelCount(d Day, label string) int {
	n := 0
	for _, f := range d.Feeds {
		if f.Label == label {
			n++
		}
	}
	return n
}

func TestEatingOccasionsOverrideOnEveryDayKind(t *testing.T) {
	// The marathon example: 2027-04-14 taper, 2027-04-16 load, 2027-04-18
	// event, 2027-04-19 recovery. Four eating occasions asked for on each.
	req := loadRequest(t, "marathon-loading.json")
	four := 4
	for _, date := range []string{"2027-04-14", "2027-04-16", "2027-04-18", "2027-04-19"} {
		req.Overrides = append(req.Overrides, DayOverride{Date: date, EatingOccasions: &four})
	}
	p := mustCompute(t, req)
	for _, date := range []string{"2027-04-14", "2027-04-16", "2027-04-18", "2027-04-19"} {
		d := dayOf(t, p, date)
		if len(d.Feeds) != 4 {
			t.Errorf("%s (%s): %d feeds for 4 eating occasions asked", date, d.Role, len(d.Feeds))
		}
		if !d.Overridden {
			t.Errorf("%s: not marked overridden", date)
		}
	}
	ev := dayOf(t, p, "2027-04-18")
	// ACSM/AND/DC 2016: the pre-event meal (1–4 g/kg, 1–4 h before) and the
	// in-event fuelling stay among the four.
	if labelCount(ev, labelPreEvent) != 1 || labelCount(ev, labelDuring) != 1 || labelCount(ev, labelRecovery) != 1 {
		t.Errorf("event day feeds lost a protocol feed: %+v", ev.Feeds)
	}
	if pm := p.PreEventMeal; pm == nil || pm.HoursBefore < 1 || pm.HoursBefore > 4 {
		t.Errorf("pre-event meal %+v not 1–4 h before", pm)
	}
	for _, f := range p.Findings {
		if f.Code == "eating-occasions" {
			t.Errorf("unexpected finding: %s", f.Message)
		}
	}
}

func TestEatingOccasionsBelowTheEventDayMinimum(t *testing.T) {
	// Two asked for on the event day: it needs the pre-event meal, the
	// in-event fuelling (ACSM/AND/DC 2016: 30–60 g/h to 2.5 h, up to 90
	// beyond) and the recovery feed, so it keeps three and says why.
	req := loadRequest(t, "marathon-loading.json")
	two := 2
	req.Overrides = append(req.Overrides, DayOverride{Date: "2027-04-18", EatingOccasions: &two})
	p := mustCompute(t, req)
	ev := dayOf(t, p, "2027-04-18")
	if len(ev.Feeds) != 3 {
		t.Errorf("event day has %d feeds, want the 3 protocol feeds", len(ev.Feeds))
	}
	f := oneFinding(t, p, "eating-occasions", "day:2027-04-18")
	if f.Level != LevelNote || !strings.Contains(f.Message, "2 eating occasions") || !strings.Contains(f.Message, "pre-event meal") ||
		!strings.Contains(f.Message, "in-event fuelling") || !strings.Contains(f.Message, "has 3") {
		t.Errorf("finding %+v", f)
	}
}

func TestRequestEatingOccasionsCountEveryFeed(t *testing.T) {
	// A hard 90-min session gets a recovery feed (ACSM/AND/DC 2016: about
	// 0.3 g/kg protein after key sessions); with 4 eating occasions a day
	// the recovery feed is one of the four.
	req := Request{Kind: KindWeek, Athlete: Athlete{Sex: "male", BodyMassKg: 70, HeightCm: ptr(178.0)},
		StartDate: "2027-03-01", Days: 2, EatingOccasions: 4,
		Training: []TrainingSession{{Date: "2027-03-01", Start: "17:00", DurationMin: 90, Modality: "run", Intensity: "hard"}}}
	p := mustCompute(t, req)
	for _, d := range p.Days {
		if len(d.Feeds) != 4 {
			t.Errorf("%s: %d feeds for 4 eating occasions", d.Date, len(d.Feeds))
		}
	}
	if labelCount(p.Days[0], labelRecovery) != 1 {
		t.Errorf("training day lost its recovery feed: %+v", p.Days[0].Feeds)
	}
}

func TestWomenLoadingChecksTotalEnergy(t *testing.T) {
	// Sedlock DA. The latest on carbohydrate loading. Curr Sports Med Rep
	// 2008;7(4):209–213: women loading need over 8 g/kg body mass (or 10 g/kg
	// lean mass) with enough total energy. Energy is judged against the
	// adequate energy availability of about 45 kcal/kg FFM/day (IOC consensus
	// statement on REDs (Mountjoy M et al. Br J Sports Med 2018;52:687–697;
	// 2023 update)). A 3 h hard session on the first load day, kept at
	// 10.5 g/kg by the dietitian, leaves energy availability under 45.
	req := loadRequest(t, "marathon-loading.json")
	req.Training = append(req.Training, TrainingSession{Date: "2027-04-16", Start: "09:00", DurationMin: 180, Modality: "run", Intensity: "hard"})
	req.Overrides = append(req.Overrides, DayOverride{Date: "2027-04-16", ChoGPerKg: ptr(10.5)})
	p := mustCompute(t, req)
	d := dayOf(t, p, "2027-04-16")
	if d.EnergyAvailability == nil || *d.EnergyAvailability >= 45 {
		t.Fatalf("energy availability %v, the check needs it under 45", d.EnergyAvailability)
	}
	f := oneFinding(t, p, "women-loading", "day:2027-04-16")
	if f.Level != LevelCaution || !strings.Contains(f.Message, "energy availability") {
		t.Errorf("women-loading with low energy: %+v", f)
	}
	// The second load day, without that session, has enough energy.
	if f := oneFinding(t, p, "women-loading", "day:2027-04-17"); f.Level != LevelOK {
		t.Errorf("women-loading 2027-04-17: %+v", f)
	}
}

func TestRestDayFindingNamesTheBand(t *testing.T) {
	// ACSM/AND/DC 2016 joint position statement; Burke et al. 2011: light
	// 3–5 g/kg/day; a day without training sits in the light band.
	p := mustCompute(t, loadRequest(t, "training-week.json"))
	f := oneFinding(t, p, "training-day-range", "day:2027-02-03")
	if !strings.Contains(f.Message, "light (rest day) training-load band of 3–5 g/kg/day") {
		t.Errorf("rest day finding: %s", f.Message)
	}
	// Slots of a dense schedule fall on the quarter hour.
	for _, sl := range scheduleFor(8) {
		if sl.hhmm%15 != 0 {
			t.Errorf("8 occasions: slot at %02d:%02d", sl.hhmm/60, sl.hhmm%60)
		}
	}
}

func TestDaysReachAdequateEnergyAvailabilityInsideTheirBand(t *testing.T) {
	// IOC consensus statement on REDs (Mountjoy M et al. Br J Sports Med
	// 2018;52:687–697; 2023 update): adequate energy availability is about
	// 45 kcal/kg FFM/day. With fat at most 35% of energy (common practice),
	// a day whose band allows it carries enough carbohydrate to reach it,
	// and stays inside its band (ACSM/AND/DC 2016 joint position statement;
	// Burke et al. 2011); only at the band's top may it stay under.
	p := mustCompute(t, loadRequest(t, "marathon-loading.json"))
	for _, d := range p.Days {
		if d.Overridden || d.EnergyAvailability == nil {
			continue
		}
		if d.ChoGPerKg < d.BandMinGPerKg || d.ChoGPerKg > d.BandMaxGPerKg {
			t.Errorf("%s: %g g/kg outside %g–%g", d.Date, d.ChoGPerKg, d.BandMinGPerKg, d.BandMaxGPerKg)
		}
		if *d.EnergyAvailability < 45 && d.ChoGPerKg+0.5 <= d.BandMaxGPerKg {
			t.Errorf("%s (%s): energy availability %g with room in the band (%g of %g–%g g/kg)",
				d.Date, d.Role, *d.EnergyAvailability, d.ChoGPerKg, d.BandMinGPerKg, d.BandMaxGPerKg)
		}
	}
	// The rest day (2027-04-12) is one of them.
	if d := dayOf(t, p, "2027-04-12"); *d.EnergyAvailability < 45 {
		t.Errorf("rest day energy availability %g", *d.EnergyAvailability)
	}
}

func TestLowEnergyAvailabilityOnTheEventDayIsANote(t *testing.T) {
	// IOC consensus statement on REDs (Mountjoy M et al. Br J Sports Med
	// 2018;52:687–697; 2023 update): low is under 30 kcal/kg FFM/day. A 10 h
	// ride costs more than a day's eating can give back: on the event day it
	// is a note; on a training day kept low by an override it is a caution.
	req := loadRequest(t, "cyclist-5h-race.json")
	req.Event.ExpectedDurationMin = 600
	p := mustCompute(t, req)
	ev := dayOf(t, p, req.Event.StartsAt.Format("2006-01-02"))
	if ev.EnergyAvailability == nil || *ev.EnergyAvailability >= 30 {
		t.Fatalf("event day energy availability %v, the check needs it under 30", ev.EnergyAvailability)
	}
	if f := oneFinding(t, p, "energy-availability", "day:"+ev.Date); f.Level != LevelNote || !strings.Contains(f.Message, "event day") {
		t.Errorf("event day: %+v", f)
	}
	week := Request{Kind: KindWeek, Athlete: Athlete{Sex: "male", BodyMassKg: 70, HeightCm: ptr(178.0)}, StartDate: "2027-03-01", Days: 1,
		Training:  []TrainingSession{{Date: "2027-03-01", Start: "08:00", DurationMin: 240, Modality: "run", Intensity: "hard"}},
		Overrides: []DayOverride{{Date: "2027-03-01", ChoGPerKg: ptr(3.0)}}}
	pw := mustCompute(t, week)
	if f := oneFinding(t, pw, "energy-availability", "day:2027-03-01"); f.Level != LevelCaution {
		t.Errorf("training day: %+v", f)
	}
}

func TestOneDayLoadingLooksForTheShortIntenseBout(t *testing.T) {
	// Bussau VA et al. Eur J Appl Physiol 2002;87:290–295 (from memory):
	// about 10 g/kg in 24 h with rest, after a short intense bout.
	req := loadRequest(t, "marathon-loading.json")
	req.Protocol, req.Overrides, req.TaperDays = ProtocolOneDay, nil, 3
	req.Training[len(req.Training)-1] = TrainingSession{Date: "2027-04-17", Start: "07:00", DurationMin: 3, Modality: "run", Intensity: "pct:100"}
	p := mustCompute(t, req)
	if fs := findingsOf(p, "one-day-bout"); len(fs) != 0 {
		t.Errorf("bout logged, yet: %+v", fs)
	}
	if d := dayOf(t, p, "2027-04-17"); d.Role != RoleLoad || d.ChoGPerKg < 10 {
		t.Errorf("one-day load day %+v", d)
	}
	req.Training[len(req.Training)-1].Intensity = "easy"
	p = mustCompute(t, req)
	if f := oneFinding(t, p, "one-day-bout", "day:2027-04-17"); f.Level != LevelNote || f.Source != SrcBussau {
		t.Errorf("no bout: %+v", f)
	}
}

package fuel

import "testing"

// sessionDayEnergy computes a one-day week plan around one training session
// and returns the day's exercise energy in kcal.
func sessionDayEnergy(t *testing.T, a Athlete, s TrainingSession) float64 {
	t.Helper()
	s.Date = "2027-05-03"
	p, err := Compute(Request{Kind: KindWeek, StartDate: s.Date, Days: 1, TimeZone: "UTC", Athlete: a, Training: []TrainingSession{s}})
	if err != nil {
		t.Fatal(err)
	}
	if len(p.Days) != 1 || p.Days[0].ExerciseEnergyKcal == nil {
		t.Fatalf("plan days: %+v", p.Days)
	}
	return *p.Days[0].ExerciseEnergyKcal
}

// A cycling session's recorded mean power sets its energy from the work
// done, as it does for a cycling event.
func TestSessionPowerSetsCyclingEnergy(t *testing.T) {
	rider := Athlete{Sex: "male", BodyMassKg: 70}
	ride := TrainingSession{Start: "09:00", DurationMin: 120, Modality: "cycle", Intensity: "moderate", AveragePowerW: ptr(200.0)}
	kcal := sessionDayEnergy(t, rider, ride)
	// common practice: 1 kJ of mechanical work ≈ 1 kcal expended (gross
	// efficiency ≈ 24%). 200 W for 2 h is 1440 kJ of work → about 1440 kcal.
	near(t, "2 h at 200 W", kcal, 1440, 1440*0.02)
	// Gross efficiency of trained cyclists is about 20–25% (common practice,
	// from memory): 1440 kJ of work costs 1440/0.25 to 1440/0.20 kJ.
	if lo, hi := 1440/0.25/4.184, 1440/0.20/4.184; kcal < lo || kcal > hi {
		t.Errorf("2 h at 200 W: %.0f kcal, outside %.0f–%.0f kcal (gross efficiency 20–25%%)", kcal, lo, hi)
	}
	// The work, and so the energy, scales with the power.
	ride.AveragePowerW = ptr(300.0)
	near(t, "2 h at 300 W", sessionDayEnergy(t, rider, ride), 1.5*kcal, 2)

	// ACSM's Guidelines for Exercise Testing and Prescription, metabolic
	// equation for leg cycling (from memory): VO2 = 1.8·WR/BM + 7 ml/kg/min,
	// WR in kg·m/min (1 W = 6.12 kg·m/min). 250 W for a 70 kg rider:
	// 46.3 ml/kg/min, 3.24 L/min; at about 4.9 kcal per litre of oxygen
	// (Weir JB. J Physiol 1949;109:1–9, at a mixed fuel) 2 h cost ≈ 1905 kcal.
	// The equation counts the resting oxygen too, so ours may sit a little
	// below it; within 10%.
	ride.AveragePowerW = ptr(250.0)
	vo2 := 1.8*250*6.12/70 + 7
	acsm := vo2 * 70 / 1000 * 4.9 * 120
	near(t, "2 h at 250 W against the ACSM cycling equation", sessionDayEnergy(t, rider, ride), acsm, acsm*0.10)
}

// With the VO2max known, the power sets the session's %VO2max and so the
// carbohydrate it burns: the same felt intensity at a higher power empties
// more glycogen, and the day's energy follows the work either way.
func TestSessionPowerSetsIntensityWithVO2max(t *testing.T) {
	rider := Athlete{Sex: "female", BodyMassKg: 60, VO2maxMlKgMin: ptr(55.0)}
	easy := TrainingSession{Start: "09:00", DurationMin: 90, Modality: "cycle", Intensity: "easy", AveragePowerW: ptr(120.0)}
	hard := easy
	hard.AveragePowerW = ptr(220.0)
	// common practice: 1 kJ of work ≈ 1 kcal; 120 W × 1.5 h = 648 kJ, 220 W × 1.5 h = 1188 kJ.
	near(t, "90 min at 120 W", sessionDayEnergy(t, rider, easy), 648, 648*0.02)
	near(t, "90 min at 220 W", sessionDayEnergy(t, rider, hard), 1188, 1188*0.02)
	end := func(s TrainingSession) float64 {
		s.Date = "2027-05-03"
		p, err := Compute(Request{Kind: KindWeek, StartDate: s.Date, Days: 1, TimeZone: "UTC", Athlete: rider, Training: []TrainingSession{s}})
		if err != nil {
			t.Fatal(err)
		}
		if p.Glycogen == nil || len(p.Glycogen.Curve) == 0 {
			t.Fatal("no glycogen curve")
		}
		low := p.Glycogen.Curve[0].MuscleG
		for _, pt := range p.Glycogen.Curve {
			low = min(low, pt.MuscleG)
		}
		return low
	}
	// Romijn JA et al. Am J Physiol 1993;265:E380–E391 (from memory, shape
	// only): the carbohydrate share rises with %VO2max, so the harder ride,
	// with more energy at a higher share, leaves the muscle lower.
	if e, h := end(easy), end(hard); h >= e {
		t.Errorf("lowest muscle glycogen %.0f g after 220 W, %.0f g after 120 W: power did not reach the stores", h, e)
	}
}

// A recorded power on another modality leaves that modality's own model.
func TestSessionPowerOnlyForCycling(t *testing.T) {
	runner := Athlete{Sex: "female", BodyMassKg: 58}
	run := TrainingSession{Start: "07:00", DurationMin: 60, Modality: "run", Intensity: "moderate"}
	without := sessionDayEnergy(t, runner, run)
	run.AveragePowerW = ptr(240.0)
	if with := sessionDayEnergy(t, runner, run); with != without {
		t.Errorf("a running power changed the energy: %.0f kcal with it, %.0f without", with, without)
	}
}

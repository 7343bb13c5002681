package fuel

import (
	"math"
	"strings"
	"testing"
	"time"
)

func near(t *testing.T, name string, got, want, tol float64) {
	t.Helper()
	if math.IsNaN(got) || math.Abs(got-want) > tol {
		t.Errorf("%s = %.4f, want %.4f ± %g", name, got, want, tol)
	}
}

func ptr[T any](v T) *T { return &v }

func TestBoerExamples(t *testing.T) {
	// Boer P. Estimated lean body mass as an index for normalization of body fluid volumes in humans. Am J Physiol 1984;247:F632–F636:
	// man 80 kg, 180 cm → 61.4 kg; woman 60 kg, 160 cm → 42.5 kg
	near(t, "Boer man 80 kg 180 cm", BoerLBM("male", 80, 180), 61.4, 0.05)
	near(t, "Boer woman 60 kg 160 cm", BoerLBM("female", 60, 160), 42.5, 0.05)
	// NewBody uses it when body fat is not measured.
	b := NewBody(Athlete{Sex: "male", BodyMassKg: 80, HeightCm: ptr(180.0)}, "run")
	if b.FFMMethod != FFMBoer {
		t.Fatalf("method %q, want %q", b.FFMMethod, FFMBoer)
	}
	near(t, "NewBody FFM (Boer)", b.FFMKg, 61.4, 0.05)
	// Measured body fat wins: 58 kg at 18% fat → 47.56 kg fat-free (arithmetic of the definition).
	b = NewBody(Athlete{Sex: "female", BodyMassKg: 58, HeightCm: ptr(168.0), BodyFatPct: ptr(18.0)}, "run")
	if b.FFMMethod != FFMMeasured {
		t.Fatalf("method %q, want %q", b.FFMMethod, FFMMeasured)
	}
	near(t, "FFM from body fat", b.FFMKg, 58*0.82, 1e-9)
	b = NewBody(Athlete{Sex: "female", BodyMassKg: 58}, "run")
	if b.FFMMethod != FFMNone || b.FFMKg != 0 {
		t.Errorf("without height or body fat: %q %g, want none", b.FFMMethod, b.FFMKg)
	}
}

func TestWeirAgainstPublishedForm(t *testing.T) {
	// Weir JB. J Physiol 1949;109:1–9: kcal = 3.941·VO2 + 1.106·VCO2 (litres).
	// Hand-worked: VO2 2.0 L, VCO2 1.8 L → 7.882 + 1.9908 = 9.8728 kcal.
	near(t, "Weir 2.0/1.8 L", WeirKcal(2.0, 1.8), 9.8728, 1e-9)
	// Hand-worked: VO2 3.0 L, VCO2 3.0 L (RER 1.0) → 11.823 + 3.318 = 15.141 kcal, i.e. 5.047 kcal per litre O2.
	near(t, "Weir 3.0/3.0 L", WeirKcal(3.0, 3.0), 15.141, 1e-9)
	// Ainsworth BE et al. 2011 Compendium of Physical Activities, Med Sci Sports Exerc 2011;43:1575–1581:
	// 1 MET ≈ 3.5 ml O2/kg/min ≈ 1 kcal/kg/h. 3.5 ml × 60 min = 0.21 L O2 per kg per hour; at a
	// resting RER of about 0.85, Weir gives ≈ 1.0 kcal.
	near(t, "1 MET via Weir", WeirKcal(0.21, 0.21*0.85), 1.0, 0.05)
}

func TestFraynAgainstPublishedForm(t *testing.T) {
	// Frayn KN. J Appl Physiol 1983;55:628–634: carbohydrate g/min = 4.55·VCO2 − 3.21·VO2;
	// fat g/min = 1.67·VO2 − 1.67·VCO2. Hand-worked for VO2 2.0, VCO2 1.8 L/min:
	// carbohydrate 8.19 − 6.42 = 1.77 g/min; fat 1.67 × 0.2 = 0.334 g/min.
	near(t, "Frayn carbohydrate", FraynCHO(2.0, 1.8), 1.77, 1e-9)
	near(t, "Frayn fat", FraynFat(2.0, 1.8), 0.334, 1e-9)
	// At RER 1.0 no fat is oxidised; at RER 0.7 (almost) no carbohydrate.
	near(t, "Frayn fat at RER 1.0", FraynFat(2.0, 2.0), 0, 1e-12)
	near(t, "Frayn carbohydrate at RER 0.7", FraynCHO(1.0, 0.7), 0, 0.03)
}

func TestAtwaterFactors(t *testing.T) {
	// Atwater general factors (FAO 2003 food energy report): 4, 4, 9 kcal/g; 1 kcal = 4.184 kJ.
	// Hand-worked: 100 g carbohydrate, 20 g protein, 10 g fat → 400 + 80 + 90 = 570 kcal.
	near(t, "Atwater 100/20/10 g", AtwaterKcal(100, 20, 10), 570, 1e-9)
	near(t, "1 kcal in kJ", gKJPerKcal.Min, 4.184, 0)
}

func TestGlucosylMassFromAtomicWeights(t *testing.T) {
	// IUPAC standard atomic weights: C 12.011, H 1.008, O 15.999.
	// Glucosyl unit C6H10O5: 6·12.011 + 10·1.008 + 5·15.999 = 162.141 g/mol → 0.162 g/mmol.
	molar := 6*12.011 + 10*1.008 + 5*15.999
	near(t, "C6H10O5 g/mol", molar, 162.14, 0.005)
	near(t, "engine g/mmol", gGlucosyl.Min, molar/1000, 0.0002)
	// 100 mmol/kg in 1 kg of muscle is then 16.2 g.
	near(t, "GlycogenG(100 mmol/kg, 1 kg)", GlycogenG(100, 1), molar/1000*100, 0.02)
}

func TestSeventyKgAdultStores(t *testing.T) {
	for _, sex := range []string{"male", "female"} {
		b := NewBody(Athlete{Sex: sex, BodyMassKg: 70}, "other")
		muscle := GlycogenG(gModelTypical.Min, b.SkeletalKg)
		// common practice: a 70 kg adult stores about 400 g of muscle glycogen (1–2% of muscle mass)
		if muscle < 300 || muscle > 500 {
			t.Errorf("%s 70 kg: muscle glycogen %.0f g, want about 400 g (300–500)", sex, muscle)
		}
		share := muscle / (b.SkeletalKg * 1000)
		if share < 0.01 || share > 0.02 {
			t.Errorf("%s: muscle glycogen %.2f%% of muscle mass, want 1–2%%", sex, share*100)
		}
		// common practice: liver glycogen about 100–120 g in a fed 70 kg adult
		if b.LiverCapG < 100 || b.LiverCapG > 120 {
			t.Errorf("%s 70 kg: liver glycogen %.0f g, want 100–120 g", sex, b.LiverCapG)
		}
	}
}

func TestJanssenMuscleShares(t *testing.T) {
	// Janssen I et al. J Appl Physiol 2000;89:81–88: men 38.4%, women 30.6% of body mass
	// (33.0 vs 21.0 kg absolute), so the study's mean body masses were about 85.9 and 68.6 kg.
	m := NewBody(Athlete{Sex: "male", BodyMassKg: 33.0 / 0.384}, "other")
	near(t, "men skeletal muscle", m.SkeletalKg, 33.0, 0.05)
	f := NewBody(Athlete{Sex: "female", BodyMassKg: 21.0 / 0.306}, "other")
	near(t, "women skeletal muscle", f.SkeletalKg, 21.0, 0.05)
	// Rapoport BI. PLoS Comput Biol 2010;6(10):e1000960: leg muscle ≈ 21% (men), 20% (women), range 14–27%.
	leg := NewBody(Athlete{Sex: "male", BodyMassKg: 70}, "run")
	near(t, "male leg muscle at 70 kg", leg.WorkingKg, 14.7, 0.01)
	// Rowing works more muscle than running (DESIGN.md: more for rowing, cross-country skiing, swimming).
	row := NewBody(Athlete{Sex: "male", BodyMassKg: 70}, "row")
	if row.WorkingKg <= leg.WorkingKg || row.WorkingKg > row.SkeletalKg {
		t.Errorf("rowing working muscle %.1f kg, want more than legs %.1f and at most all muscle %.1f", row.WorkingKg, leg.WorkingKg, row.SkeletalKg)
	}
}

func TestLoadedLegGlycogenNearRapoport(t *testing.T) {
	// Rapoport 2010: supercompensated leg glycogen ≈ 144 kcal per kg leg muscle.
	// The model's asymptote density × 0.162 g/mmol × 4 kcal/g should land within 5% of it.
	kcalPerKg := GlycogenG(gModelCapacity.Min, 1) * gAtwaterCho.Min
	near(t, "loaded leg glycogen kcal/kg", kcalPerKg, 144, 144*0.05)
}

func TestChoShareShape(t *testing.T) {
	// Romijn JA et al. Am J Physiol 1993;265:E380–E391 (from memory, shape only):
	// ≈ 25% VO2max: small; ≈ 65%: about half; ≈ 85%: about three quarters.
	if s := ChoShare(25); s > 0.2 {
		t.Errorf("share at 25%% = %.2f, want small (≤ 0.2)", s)
	}
	near(t, "share at 65%", ChoShare(65), 0.5, 0.05)
	near(t, "share at 85%", ChoShare(85), 0.75, 0.05)
	prev := 0.0
	for pct := 20.0; pct <= 100; pct += 5 {
		s := ChoShare(pct)
		if s < prev || s <= 0 || s >= 1 {
			t.Errorf("share at %g%% = %.3f: must rise and stay inside (0, 1)", pct, s)
		}
		prev = s
	}
}

func TestEventEnergy(t *testing.T) {
	b := NewBody(Athlete{Sex: "male", BodyMassKg: 70}, "run")
	// Rapoport 2010; common practice: running costs about 1 kcal per kg per km.
	kcal, _ := EventEnergy(b, Event{Modality: "run", DistanceKm: ptr(42.195), ExpectedDurationMin: 210}, 75)
	near(t, "marathon energy, 70 kg", kcal, 70*42.195, 0.5)
	// common practice: 1 kJ of mechanical work ≈ 1 kcal expended (gross efficiency ≈ 24%).
	// 200 W for 60 min = 720 kJ of work → about 720 kcal.
	cb := NewBody(Athlete{Sex: "male", BodyMassKg: 75}, "cycle")
	kcal, _ = EventEnergy(cb, Event{Modality: "cycle", AveragePowerW: ptr(200.0), ExpectedDurationMin: 60}, 70)
	near(t, "cycling 200 W for 1 h", kcal, 720, 720*0.02)
	// Ainsworth BE et al. 2011 Compendium of Physical Activities, Med Sci Sports Exerc 2011;43:1575–1581:
	// 1 MET ≈ 1 kcal/kg/h, so without VO2max the energy is MET × kg × h; a hard
	// hour of swimming (10 MET, activity value from memory) for 60 kg is about 600 kcal.
	sb := NewBody(Athlete{Sex: "female", BodyMassKg: 60}, "swim")
	kcal, _ = EventEnergy(sb, Event{Modality: "swim", ExpectedDurationMin: 60}, 85)
	near(t, "hard swim hour, 60 kg", kcal, 600, 1)
}

func TestMarathonWall(t *testing.T) {
	// Rapoport 2010; common practice: a typical runner at marathon pace with usual
	// stores runs low at roughly 30–35 km. On the real race path: a 70 kg man
	// on his usual intake the day before, the plan's pre-event meal, 42.195 km
	// in 3 h 30 min at 75% VO2max; the figure without in-event intake.
	start := time.Date(2027, 4, 18, 9, 0, 0, 0, time.UTC)
	p := mustCompute(t, Request{Kind: KindRace, Athlete: Athlete{Sex: "male", BodyMassKg: 70, HeightCm: ptr(178.0)},
		Event: &Event{StartsAt: start, Modality: "run", DistanceKm: ptr(42.195), ExpectedDurationMin: 210, IntensityPctVO2max: ptr(75.0)}})
	g := p.Glycogen
	if g.RunsOutAtKm == nil {
		t.Fatal("stores never ran out; the wall should come at 30–35 km")
	}
	km := *g.RunsOutAtKm
	t.Logf("fed, not loaded: stores run out at %.1f km (%.0f min), working muscle %.0f mmol/kg at the start", km, *g.RunsOutAtMin, g.WorkingMuscleMmolPerKgStart)
	if km < gMarathonWall.Min || km > gMarathonWall.Max {
		t.Errorf("stores run out at %.1f km, want %g–%g km", km, gMarathonWall.Min, gMarathonWall.Max)
	}
	// With the plan's in-event intake (inside ACSM/AND/DC 2016; Jeukendrup AE.
	// Sports Med 2014;44 Suppl 1:S25–S33) the stores last longer.
	if g.RunsOutWithIntakeAtKm != nil && *g.RunsOutWithIntakeAtKm <= km {
		t.Errorf("with intake the stores run out at %.1f km, not later than %.1f km without", *g.RunsOutWithIntakeAtKm, km)
	}
}

// Muscle and liver glycogen live in lean tissue (REFERENCES.md, common
// practice: muscle glycogen 1–2% of muscle mass; liver 5–6% of liver mass),
// so with body fat measured, two women of the same fat-free mass hold the
// same stores whatever their fat; the g/kg of total mass differs.
func TestStoresFollowFatFreeMass(t *testing.T) {
	lean := NewBody(Athlete{Sex: "female", BodyMassKg: 60, BodyFatPct: ptr(20.0)}, "run")  // FFM 48 kg
	heavy := NewBody(Athlete{Sex: "female", BodyMassKg: 80, BodyFatPct: ptr(40.0)}, "run") // FFM 48 kg
	near(t, "skeletal muscle", heavy.SkeletalKg, lean.SkeletalKg, 1e-9)
	near(t, "working muscle", heavy.WorkingKg, lean.WorkingKg, 1e-9)
	near(t, "liver capacity", heavy.LiverCapG, lean.LiverCapG, 1e-9)
	unmeasured := NewBody(Athlete{Sex: "female", BodyMassKg: 80}, "run")
	if unmeasured.SkeletalKg <= heavy.SkeletalKg {
		t.Errorf("without body fat, 80 kg gives %.1f kg muscle, not more than %.1f kg at 40%% fat", unmeasured.SkeletalKg, heavy.SkeletalKg)
	}
}

// Sedlock DA 2008: 10 g/kg lean mass; for very high body fat a finding
// gives that basis: 10 × 48 kg = 480 g.
func TestVeryHighBodyFatGivesTheFatFreeBasis(t *testing.T) {
	req := Request{Kind: KindLoading, Protocol: ProtocolTwoDay,
		Athlete: Athlete{Sex: "female", BodyMassKg: 80, BodyFatPct: ptr(40.0)},
		Event:   &Event{StartsAt: time.Date(2027, 5, 2, 9, 0, 0, 0, time.UTC), Modality: "run", ExpectedDurationMin: 200}}
	f := oneFinding(t, mustCompute(t, req), "body-fat-extreme", "plan")
	if !strings.Contains(f.Message, "480 g") || !strings.Contains(f.Message, "very high") {
		t.Errorf("finding %q", f.Message)
	}
	req.Athlete.BodyFatPct = ptr(25.0)
	if fs := findingsOf(mustCompute(t, req), "body-fat-extreme"); len(fs) != 0 {
		t.Errorf("25%% body fat for a woman flagged: %v", fs)
	}
}

// Boer 1984: a man of 25 kg at 230 cm gives 0.407·25 + 0.267·230 − 19.2
// = 52.4 kg of lean mass, more than his body mass, so the estimate is
// unusable; the message names the height and the estimate, not an absent
// height.
func TestUnusableBoerEstimateSaysWhy(t *testing.T) {
	req := Request{Kind: KindRace, Athlete: Athlete{Sex: "male", BodyMassKg: 25, HeightCm: ptr(230.0)},
		Event: &Event{StartsAt: time.Date(2027, 5, 2, 9, 0, 0, 0, time.UTC), Modality: "run", ExpectedDurationMin: 60}}
	f := oneFinding(t, mustCompute(t, req), "fat-free-mass-unknown", "plan")
	if !strings.Contains(f.Message, "Height was given") || !strings.Contains(f.Message, "52.4 kg") {
		t.Errorf("finding %q", f.Message)
	}
}

// IOC consensus on REDs: under 30 kcal/kg FFM/day is low. A 70 kg man
// (no height, no body fat) eating 3 g/kg on a day of 3.5 h hard running:
// hard running is about 12.5 MET (Ainsworth 2011, activity value from
// memory), 12.5 × 70 kg × 3.5 h ≈ 3,060 kcal of exercise, and a day of
// 3 g/kg carbohydrate (840 kcal) with protein and fat cannot leave 30
// kcal/kg FFM (about 1,700 kcal at 57 kg FFM) after it. The day is screened on an
// estimated fat-free mass and gets a caution, not only a band note.
func TestEnergyAvailabilityScreenedWithoutFatFreeMass(t *testing.T) {
	req := Request{Kind: KindWeek, Athlete: Athlete{Sex: "male", BodyMassKg: 70}, StartDate: "2027-03-01", Days: 1,
		Training:  []TrainingSession{{Date: "2027-03-01", Start: "08:00", DurationMin: 210, Modality: "run", Intensity: "hard"}},
		Overrides: []DayOverride{{Date: "2027-03-01", ChoGPerKg: ptr(3.0)}}}
	f := oneFinding(t, mustCompute(t, req), "energy-availability-estimated", "day:2027-03-01")
	if f.Level != LevelCaution || !strings.Contains(f.Message, "estimated") {
		t.Errorf("%s: %s", f.Level, f.Message)
	}
}

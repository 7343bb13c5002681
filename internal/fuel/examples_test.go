package fuel

import (
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// exampleChecks runs each example request of testdata/fuel of the events
// shapes and checks one published value or band, named beside it. (The
// worked-example tests look at each in more depth.)
var exampleChecks = []struct {
	file  string
	check func(t *testing.T, req Request, p Plan)
}{
	{"ironman-race.json", func(t *testing.T, req Request, p Plan) {
		// Kimber NE et al. 2002: Ironman energy, men 10,036 ± 931 kcal;
		// within 2.5 SD of the mean.
		mean, sd := (gIronMen.Min+gIronMen.Max)/2, (gIronMen.Max-gIronMen.Min)/2
		if e := p.DuringEvent.EnergyKcal; math.Abs(e-mean) > 2.5*sd {
			t.Errorf("energy %g kcal, Kimber 2002 men %g ± %g", e, mean, sd)
		}
		// One cannot eat while swimming: no carbohydrate in the swim.
		if s := p.DuringEvent.Segments[0]; s.Modality != "swim" || s.ChoGPerH != 0 {
			t.Errorf("swim leg %+v", s)
		}
	}},
	{"stage-race-4-day.json", func(t *testing.T, req Request, p Plan) {
		// ACSM/AND/DC 2016: under 8 h between two sessions, 1.0–1.2 g/kg/h
		// for the first hours; the morning time trial is 5.9 h before the
		// afternoon stage.
		r := p.Stages[2].Repletion
		if !r.Speedy || r.ChoGPerKgPerH < 1.0 || r.ChoGPerKgPerH > 1.2 {
			t.Errorf("between the two stages of one day: %+v", r)
		}
		// ACSM/AND/DC 2016; Jeukendrup 2014: over 2.5 h up to 90 g/h.
		for i, st := range p.Stages {
			if st.DurationMin > 150 && (st.DuringEvent.ChoGPerH < 30 || st.DuringEvent.ChoGPerH > 90) {
				t.Errorf("stage %d (%g min): %g g/h", i+1, st.DurationMin, st.DuringEvent.ChoGPerH)
			}
		}
	}},
	{"ultra-48h-race.json", func(t *testing.T, req Request, p Plan) {
		// ACSM/AND/DC 2016; Jeukendrup 2014: up to 90 g/h in long events,
		// carried by the in-event plan over all 48 h.
		var hours float64
		for _, b := range p.DuringEvent.Blocks {
			hours += b.To.Sub(b.From).Hours()
			if b.ChoGPerH < 30 || b.ChoGPerH > 90 {
				t.Errorf("block %s: %g g/h", b.From, b.ChoGPerH)
			}
		}
		if math.Abs(hours-48) > 1e-9 {
			t.Errorf("blocks cover %g h", hours)
		}
	}},
	{"hundred-mile-race.json", func(t *testing.T, req Request, p Plan) {
		// ACSM/AND/DC 2016: the pre-event meal keeps protein low, about
		// 0.3 g/kg at most.
		for _, d := range p.Days {
			for _, f := range d.Feeds {
				if f.Label == labelPreEvent && f.ProteinG > math.Round(0.3*req.Athlete.BodyMassKg) {
					t.Errorf("pre-event meal %g g protein", f.ProteinG)
				}
			}
		}
		if g := p.DuringEvent.ChoGPerH; g < 30 || g > 90 {
			t.Errorf("in-event %g g/h, outside 30–90 (ACSM/AND/DC 2016; Jeukendrup 2014)", g)
		}
	}},
	{"week-long-ride.json", func(t *testing.T, req Request, p Plan) {
		// ACSM/AND/DC 2016; Jeukendrup 2014: a 4 h ride, 30–90 g/h; a meal
		// of 1–4 g/kg 1–4 h before.
		for _, d := range p.Days {
			for _, s := range d.Sessions {
				if s.DurationMin < 240 || s.TrainLow {
					continue
				}
				if s.ChoGPerH < 30 || s.ChoGPerH > 90 || s.PreSessionChoG < req.Athlete.BodyMassKg-1 || s.PreSessionChoG > 4*req.Athlete.BodyMassKg {
					t.Errorf("4 h ride %+v", s)
				}
				return
			}
		}
		t.Error("no 4 h ride planned")
	}},
	{"half-marathon-caffeine-3.json", func(t *testing.T, req Request, p Plan) {
		// Maughan RJ et al. IOC 2018: 3–6 mg/kg about 60 min before.
		c := p.PreEventCaffeine
		if c == nil || c.Mg != math.Round(3*req.Athlete.BodyMassKg) || req.Event.StartsAt.Sub(c.At) != time.Hour {
			t.Fatalf("caffeine %+v", c)
		}
		if f := oneFinding(t, p, "caffeine-dose", "pre_event_caffeine"); f.Level != LevelOK {
			t.Errorf("3 mg/kg: %s", f.Level)
		}
	}},
	{"half-marathon-caffeine-9.json", func(t *testing.T, req Request, p Plan) {
		// Maughan RJ et al. IOC 2018: 9 mg/kg or more adds no benefit and
		// raises side effects: outside.
		if f := oneFinding(t, p, "caffeine-dose", "pre_event_caffeine"); f.Level != LevelOutside {
			t.Errorf("9 mg/kg: %s", f.Level)
		}
	}},
	{"diabetes-marathon-loading.json", func(t *testing.T, req Request, p Plan) {
		// Riddell MC et al. Lancet Diabetes Endocrinol 2017 (from memory):
		// insulin around exercise is set with the diabetes team; a caution
		// on each load day, the pre-event meal and the in-event figures,
		// and no dose.
		for _, d := range p.Days {
			if d.Role == RoleLoad {
				oneFinding(t, p, "diabetes-load-day", "day:"+d.Date)
			}
		}
		oneFinding(t, p, "diabetes-pre-event-meal", "pre_event_meal")
		oneFinding(t, p, "diabetes-during-event", "during_event")
		for _, f := range p.Findings {
			if strings.HasPrefix(f.Code, "diabetes") && strings.Contains(f.Message, "units") {
				t.Errorf("a diabetes finding gives a dose: %s", f.Message)
			}
		}
	}},
	// Romijn JA et al. 1993 (from memory, shape only): the carbohydrate
	// share rises with %VO2max, about half at 65% and three quarters at
	// 85%. The same pace (42.195 km in 210 min, ≈ 40 ml/kg/min) is ≈ 62%
	// of a VO2max of 65 and ≈ 89% of 45.
	{"marathon-vo2max-65.json", func(t *testing.T, req Request, p Plan) {
		if s := p.DuringEvent.ChoShare; s < 0.4 || s > 0.55 {
			t.Errorf("share %g, want about half", s)
		}
	}},
	{"marathon-vo2max-45.json", func(t *testing.T, req Request, p Plan) {
		if s := p.DuringEvent.ChoShare; s < 0.7 || s > 0.85 {
			t.Errorf("share %g, want about three quarters", s)
		}
	}},
}

func TestExampleRequestsAgainstPublishedValues(t *testing.T) {
	for _, x := range exampleChecks {
		t.Run(x.file, func(t *testing.T) {
			req := loadRequest(t, x.file)
			x.check(t, req, mustCompute(t, req))
		})
	}
}

// Every example request is listed in the README, and every file the
// README lists exists.
func TestExampleRequestsListed(t *testing.T) {
	dir := filepath.Join("..", "..", "testdata", "fuel")
	readme, err := os.ReadFile(filepath.Join(dir, "README.md"))
	if err != nil {
		t.Fatal(err)
	}
	files, _ := filepath.Glob(filepath.Join(dir, "*.json"))
	if len(files) == 0 {
		t.Fatal("no example requests")
	}
	for _, f := range files {
		if !strings.Contains(string(readme), "`"+filepath.Base(f)+"`") {
			t.Errorf("%s is not listed in the README", filepath.Base(f))
		}
	}
	for _, line := range strings.Split(string(readme), "\n") {
		if name, ok := strings.CutPrefix(line, "| `"); ok {
			name, _, _ = strings.Cut(name, "`")
			if _, err := os.Stat(filepath.Join(dir, name)); err != nil {
				t.Errorf("the README lists %s: %v", name, err)
			}
		}
	}
}

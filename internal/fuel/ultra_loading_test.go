package fuel

import (
	"math"
	"testing"
	"time"
)

// Carbohydrate loading before a race of over a day: the load days end the
// day before the start, and the race is carried by its in-event plan.
func TestLoadingBeforeA48HourRace(t *testing.T) {
	req := loadRequest(t, "ultra-48h-loading.json")
	p := mustCompute(t, req)
	start := req.Event.StartsAt
	end := start.Add(48 * time.Hour)
	mass := req.Athlete.BodyMassKg
	if p.Kind != KindLoading || p.Protocol != ProtocolTwoDay {
		t.Fatalf("kind %s, protocol %s", p.Kind, p.Protocol)
	}
	// ACSM/AND/DC 2016: carbohydrate loading, 10–12 g/kg per 24 h for the
	// 36–48 h before the event: two load days, the last the day before.
	var loads []Day
	for _, d := range p.Days {
		if d.Role == RoleLoad {
			loads = append(loads, d)
			if d.ChoGPerKg < 10 || d.ChoGPerKg > 12 {
				t.Errorf("load day %s: %g g/kg", d.Date, d.ChoGPerKg)
			}
		}
	}
	dayBefore := start.AddDate(0, 0, -1).Format(time.DateOnly)
	if len(loads) != 2 || loads[1].Date != dayBefore {
		t.Fatalf("load days %v, want two ending %s", loads, dayBefore)
	}
	// ACSM/AND/DC 2016: the pre-event meal 1–4 g/kg 1–4 h before.
	pm := p.PreEventMeal
	if h := start.Sub(pm.At).Hours(); pm.ChoGPerKg < 1 || pm.ChoGPerKg > 4 || h < 1 || h > 4 {
		t.Errorf("pre-event meal %+v", pm)
	}
	// The race is carried by the in-event plan: blocks over all 48 h at
	// 30–90 g/h (ACSM/AND/DC 2016; Jeukendrup 2014), no ordinary meal
	// inside it, a recovery feed within an hour of the finish and a
	// recovery day after.
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
	rec := false
	for _, d := range p.Days {
		for _, f := range d.Feeds {
			if ordinaryMeal(f.Label) && !f.At.Before(start) && f.At.Before(end) {
				t.Errorf("%s at %s inside the race", f.Label, f.At)
			}
			rec = rec || f.Label == labelRecovery && !f.At.Before(end) && f.At.Sub(end) <= time.Hour
		}
	}
	if !rec || p.Days[len(p.Days)-1].Role != RoleRecovery {
		t.Error("no recovery feed within 1 h of the finish, or no recovery day after")
	}
	// Loading fills the muscle above what the usual intake would:
	// Sherman WM et al. 1981; Bergström 1967 (supercompensation).
	g := p.Glycogen
	if g.UsualIntakeMuscleGStart == nil || g.MuscleGStart <= *g.UsualIntakeMuscleGStart || g.MuscleGStart > g.MuscleGCapacity {
		t.Errorf("muscle at the start %g g (usual intake %v, capacity %g)", g.MuscleGStart, g.UsualIntakeMuscleGStart, g.MuscleGCapacity)
	}
	// Loading days' grams follow the body mass: g = g/kg × kg (common
	// practice).
	for _, d := range loads {
		if math.Abs(d.ChoG-d.ChoGPerKg*mass) > 1 {
			t.Errorf("%s: %g g for %g g/kg", d.Date, d.ChoG, d.ChoGPerKg)
		}
	}
}

package fuel

import (
	"testing"
	"time"
)

// TestLegsFeedStartsWhereOneCanEat checks that the in-event feed of a
// multi-sport event is placed at the start of the first leg where one can
// eat, not at the start gun during the swim, and that its grams are the
// legs' grams. Source: no carbohydrate is taken during a swim or in a
// transition (common practice); the clock times follow from the requests'
// own leg durations.
func TestLegsFeedStartsWhereOneCanEat(t *testing.T) {
	iron := loadRequest(t, "ironman-race.json")
	olympic := loadRequest(t, "ironman-race.json")
	olympic.Event.ExpectedDurationMin = 135
	olympic.Event.Segments = []Segment{
		{Modality: "swim", DistanceKm: ptr(1.5), ExpectedDurationMin: 27},
		{Modality: "transition", ExpectedDurationMin: 2},
		{Modality: "cycle", DistanceKm: ptr(40.0), ExpectedDurationMin: 64, AveragePowerW: ptr(230.0)},
		{Modality: "transition", ExpectedDurationMin: 1},
		{Modality: "run", DistanceKm: ptr(10.0), ExpectedDurationMin: 41},
	}
	for _, tc := range []struct {
		name string
		req  Request
		// swim + first transition: the bike starts this long after the gun.
		bikeAfter time.Duration
	}{
		{"ironman", iron, 70 * time.Minute},
		{"olympic", olympic, 29 * time.Minute},
	} {
		t.Run(tc.name, func(t *testing.T) {
			p := mustCompute(t, tc.req)
			de := p.DuringEvent
			if de == nil || len(de.Segments) != 5 {
				t.Fatalf("during_event %+v", de)
			}
			var legsG float64
			for _, s := range de.Segments {
				if s.Modality == "swim" && s.ChoG != 0 {
					t.Errorf("swim leg carries %g g", s.ChoG)
				}
				legsG += s.ChoG
			}
			bike := tc.req.Event.StartsAt.Add(tc.bikeAfter)
			var n int
			for _, d := range p.Days {
				for _, f := range d.Feeds {
					if f.Label != labelDuring {
						continue
					}
					n++
					if !f.At.Equal(bike) {
						t.Errorf("in-event feed at %s, want the bike start %s", f.At.Format("15:04"), bike.In(f.At.Location()).Format("15:04"))
					}
					if f.ChoG != legsG || f.ChoG != de.TotalChoG {
						t.Errorf("in-event feed %g g, legs %g g, in-event total %g g", f.ChoG, legsG, de.TotalChoG)
					}
				}
			}
			if n != 1 || legsG <= 0 {
				t.Errorf("%d in-event feeds, legs carry %g g", n, legsG)
			}
		})
	}
}

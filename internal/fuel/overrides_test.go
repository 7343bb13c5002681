package fuel

import (
	"math"
	"testing"
	"time"
)

// A feed override on a day of a two-day event: each day's protein (and
// carbohydrate and energy) is what its feeds carry. A day inside the race
// holds only its in-event fuelling (and perhaps the pre-event meal), so an
// override there must not bring back the daily protein target that no feed
// holds (it once gave a day 165 g of protein over feeds of 15 g).
func TestFeedOverrideOnTwoDayEventKeepsDayEqualToFeeds(t *testing.T) {
	start := time.Date(2027, 6, 5, 6, 45, 0, 0, time.FixedZone("", 10*3600))
	for _, c := range []struct {
		name string
		ov   FeedOverride
	}{
		{"pre-event meal moved and lowered", FeedOverride{Date: "2027-06-05", Index: 0, At: "01:22", ChoG: ptr(41.0)}},
		{"pre-event meal raised", FeedOverride{Date: "2027-06-05", Index: 0, ChoG: ptr(300.0)}},
		// The second day: five in-event feeds, then the recovery feed.
		{"recovery feed after the finish raised", FeedOverride{Date: "2027-06-06", Index: 5, ChoG: ptr(500.0)}},
		{"recovery feed after the finish lowered", FeedOverride{Date: "2027-06-06", Index: 5, ChoG: ptr(10.0)}},
	} {
		t.Run(c.name, func(t *testing.T) {
			req := Request{
				Kind:    KindRace,
				Athlete: Athlete{Sex: "male", BodyMassKg: 70, HeightCm: ptr(178.0)},
				Event: &Event{StartsAt: start, Modality: "run", ExpectedDurationMin: 40 * 60,
					IntensityPctVO2max: ptr(45.0)},
				FeedOverrides: []FeedOverride{c.ov},
			}
			p := mustCompute(t, req)
			applied := false
			for _, d := range p.Days {
				var cho, prot float64
				for _, f := range d.Feeds {
					cho += f.ChoG
					prot += f.ProteinG
					applied = applied || f.Overridden
				}
				if math.Abs(prot-d.ProteinG) > 0.5 || math.Abs(cho-d.ChoG) > 0.5 {
					t.Errorf("%s (%s): day %g g carbohydrate, %g g protein; its feeds %g and %g", d.Date, d.Role, d.ChoG, d.ProteinG, cho, prot)
				}
				// Atwater general factors (FAO 2003 food energy report): 4, 4, 9 kcal/g.
				if math.Abs(d.EnergyKcal-(4*d.ChoG+4*d.ProteinG+9*d.FatG)) > 0.5 {
					t.Errorf("%s: %g kcal, Atwater gives %g", d.Date, d.EnergyKcal, 4*d.ChoG+4*d.ProteinG+9*d.FatG)
				}
			}
			if !applied {
				t.Fatalf("the override %+v was not applied", c.ov)
			}
		})
	}
}

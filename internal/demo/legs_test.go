package demo

import (
	"context"
	"testing"

	"larder/internal/fuel"
	"larder/internal/store"
	"larder/internal/testdb"
)

// The demo triathlon is raced leg by leg: its event carries the swim, bike
// and run its notes describe, so a race plan for it plans no carbohydrate
// in the swim (common practice: nothing is eaten while swimming) and the
// legs fill the expected duration.
func TestDemoTriathlonHasLegs(t *testing.T) {
	ctx := context.Background()
	st := store.New(testdb.Pool(t))
	res, err := Run(ctx, st, "a demo password for legs")
	if err != nil {
		t.Fatal(err)
	}
	e, err := st.EventByID(ctx, res.IDs.Clients["triathlete"], res.IDs.Events["triathlon"])
	if err != nil {
		t.Fatal(err)
	}
	if len(e.Segments) == 0 || e.Segments[0].Modality != "swim" {
		t.Fatalf("triathlon legs %+v, want a swim first", e.Segments)
	}
	var total float64
	for _, s := range e.Segments {
		total += s.ExpectedDurationMin
	}
	if total != float64(e.ExpectedDurationMin) {
		t.Errorf("legs last %g min, the event %d min", total, e.ExpectedDurationMin)
	}
	height := 162.0
	req := fuel.Request{Kind: fuel.KindRace, TimeZone: e.TimeZone,
		Athlete: fuel.Athlete{Sex: "female", BodyMassKg: 55.5, HeightCm: &height},
		Event:   &fuel.Event{StartsAt: e.LocalStart(), Modality: e.Modality, DistanceKm: e.DistanceKm, ExpectedDurationMin: float64(e.ExpectedDurationMin), Segments: e.Segments}}
	plan, err := fuel.Compute(req)
	if err != nil {
		t.Fatal(err)
	}
	de := plan.DuringEvent
	if de == nil || len(de.Segments) != len(e.Segments) {
		t.Fatalf("race plan legs %+v, want %d", de, len(e.Segments))
	}
	if de.Segments[0].ChoGPerH != 0 || de.Segments[0].ChoG != 0 {
		t.Errorf("%g g/h (%g g) planned in the swim", de.Segments[0].ChoGPerH, de.Segments[0].ChoG)
	}
	// Loading the demo again leaves the legs as they are.
	if _, err := Run(ctx, st, "a demo password for legs"); err != nil {
		t.Fatal(err)
	}
	again, _ := st.EventByID(ctx, e.ClientID, e.ID)
	if len(again.Segments) != len(e.Segments) {
		t.Errorf("a second load changed the legs: %d, then %d", len(e.Segments), len(again.Segments))
	}
}

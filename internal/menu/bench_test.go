package menu

import (
	"testing"
	"time"

	"larder/internal/fuel"
)

// BenchmarkPlanSuggestions: every feed of a nine-day two-day loading plan
// (seven days of taper, two of loading, the marathon and the day after)
// from the starter list, with a dietary need, as a save of a draft makes
// them. The plan page reads them stored; this is the cost of a save.
func BenchmarkPlanSuggestions(b *testing.B) {
	rows := loadSeed(b)
	foods := make([]Food, len(rows))
	for i, r := range rows {
		foods[i] = r.Food
	}
	start := time.Date(2027, 4, 18, 8, 0, 0, 0, time.UTC)
	km, h := 42.195, 168.0
	plan, err := fuel.Compute(fuel.Request{Kind: fuel.KindLoading, Protocol: fuel.ProtocolTwoDay, TaperDays: 7, EatingOccasions: 5, TimeZone: "UTC",
		Athlete: fuel.Athlete{Sex: "female", BodyMassKg: 58, HeightCm: &h},
		Event:   &fuel.Event{StartsAt: start, Modality: "run", DistanceKm: &km, ExpectedDurationMin: 215}})
	if err != nil {
		b.Fatal(err)
	}
	opts := Options{Needs: []string{"lactose_free"}}
	if n := len(PlanSuggestionsDetail(plan, foods, opts)); n < 30 {
		b.Fatalf("only %d feeds", n)
	}
	for b.Loop() {
		PlanSuggestionsDetail(plan, foods, opts)
	}
}

package fuel

import (
	"testing"
	"time"
)

// benchRequest is a two-day loading plan whose taper covers 13 days before
// the event, so the glycogen simulation runs 14 days in 5-minute steps.
func benchRequest() Request {
	zone := time.FixedZone("", 2*3600)
	start := time.Date(2027, 4, 18, 8, 0, 0, 0, zone)
	req := Request{
		Kind:     KindLoading,
		Protocol: ProtocolTwoDay,
		Athlete:  Athlete{Sex: "female", BodyMassKg: 58, HeightCm: ptr(168.0), BodyFatPct: ptr(18.0), VO2maxMlKgMin: ptr(52.0)},
		Event: &Event{StartsAt: start, Modality: "run", DistanceKm: ptr(42.195),
			ExpectedDurationMin: 215, IntensityPctVO2max: ptr(75.0)},
		TaperDays: 13,
	}
	for i := 13; i >= 1; i-- {
		d := start.AddDate(0, 0, -i).Format("2006-01-02")
		req.Training = append(req.Training, TrainingSession{Date: d, Start: "07:00", DurationMin: float64(20 + 10*(i%5)), Modality: "run", Intensity: "moderate"})
	}
	return req
}

func BenchmarkLoadingTwoDay14DaySimulation(b *testing.B) {
	req := benchRequest()
	if _, err := Compute(req); err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Compute(req); err != nil {
			b.Fatal(err)
		}
	}
}

func TestBenchRequestCoversFourteenDays(t *testing.T) {
	p, err := Compute(benchRequest())
	if err != nil {
		t.Fatal(err)
	}
	// 13 taper/load days + event day + day after; the curve spans 13 days and 8 h (hourly points).
	if len(p.Days) != 15 || len(p.Glycogen.Curve) < 13*24 {
		t.Errorf("%d days, %d curve points", len(p.Days), len(p.Glycogen.Curve))
	}
}

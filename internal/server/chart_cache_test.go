package server

import (
	"bytes"
	"testing"
	"time"

	"larder/internal/mass"

	"larder/internal/chart"
)

// A kept chart is served only for equal points: one changed measurement
// draws anew, and what is drawn is what chart.BodyMassTrend draws.
func TestBodyMassChartCacheFollowsThePoints(t *testing.T) {
	s := &Server{charts: newChartCache()}
	d := time.Date(2027, 2, 1, 0, 0, 0, 0, time.UTC)
	pts := []chart.MassPoint{{On: d, Kg: 64.2}, {On: d.AddDate(0, 0, 7), Kg: 64.0}, {On: d.AddDate(0, 0, 14), Kg: 63.8}}
	first, err := s.bodyMassSVG(pts, mass.KG)
	if err != nil {
		t.Fatal(err)
	}
	again, err := s.bodyMassSVG(pts, mass.KG)
	if err != nil || !bytes.Equal(first, again) || s.charts.Len() != 1 {
		t.Fatalf("equal points drew anew or differently (kept %d)", s.charts.Len())
	}
	edited := append([]chart.MassPoint(nil), pts...)
	edited[2].Kg = 66.5
	got, err := s.bodyMassSVG(edited, mass.KG)
	if err != nil {
		t.Fatal(err)
	}
	want, err := chart.BodyMassTrend(edited, mass.KG)
	if err != nil {
		t.Fatal(err)
	}
	if bytes.Equal(got, first) || !bytes.Equal(got, want) {
		t.Fatal("an edited measurement was answered with the old chart")
	}
}

// The plan page's charts are kept the same way: equal input is served from
// the cache, and a changed day target, band, start line or curve point
// draws anew, exactly as the chart package draws it.
func TestPlanChartCacheFollowsItsInput(t *testing.T) {
	s := &Server{charts: newChartCache()}
	days := []chart.DayTarget{{Label: "Fri 16", GPerKg: 10, BandMin: 10, BandMax: 12}, {Label: "Sat 17", GPerKg: 10, BandMin: 10, BandMax: 12}}
	first, err := s.gPerKgSVG(days)
	if err != nil {
		t.Fatal(err)
	}
	if again, _ := s.gPerKgSVG(days); !bytes.Equal(first, again) || s.charts.Len() != 1 {
		t.Fatalf("equal days drew anew or differently (kept %d)", s.charts.Len())
	}
	changed := append([]chart.DayTarget(nil), days...)
	changed[1].Overridden = true
	got, _ := s.gPerKgSVG(changed)
	want, err := chart.GramsPerKgByDay(changed)
	if err != nil {
		t.Fatal(err)
	}
	if bytes.Equal(got, first) || !bytes.Equal(got, want) {
		t.Fatal("an overridden day was answered with the old bars")
	}

	oslo, err := time.LoadLocation("Europe/Oslo")
	if err != nil {
		t.Fatal(err)
	}
	start := time.Date(2027, 3, 21, 9, 0, 0, 0, oslo)
	pts := []chart.GlycogenPoint{{At: start.Add(-2 * time.Hour), MuscleG: 450, LiverG: 90}, {At: start, MuscleG: 440, LiverG: 80}, {At: start.Add(2 * time.Hour), MuscleG: 300, LiverG: 50}}
	curve, err := s.glycogenSVG(pts, start, "start")
	if err != nil {
		t.Fatal(err)
	}
	for name, redraw := range map[string]func() ([]byte, error){
		"a later start line": func() ([]byte, error) { return s.glycogenSVG(pts, start.Add(time.Hour), "start") },
		"another label":      func() ([]byte, error) { return s.glycogenSVG(pts, start, "next session") },
		"a lower point": func() ([]byte, error) {
			p := append([]chart.GlycogenPoint(nil), pts...)
			p[2].MuscleG = 200
			return s.glycogenSVG(p, start, "start")
		},
	} {
		if got, err := redraw(); err != nil || bytes.Equal(got, curve) {
			t.Errorf("%s was answered with the old curve (err %v)", name, err)
		}
	}
	if again, _ := s.glycogenSVG(pts, start, "start"); !bytes.Equal(again, curve) {
		t.Error("an equal curve drew differently")
	}
}

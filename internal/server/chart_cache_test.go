package server

import (
	"bytes"
	"testing"
	"time"

	"larder/internal/chart"
)

// A kept chart is served only for equal points: one changed measurement
// draws anew, and what is drawn is what chart.BodyMassTrend draws.
func TestBodyMassChartCacheFollowsThePoints(t *testing.T) {
	s := &Server{charts: newChartCache()}
	d := time.Date(2027, 2, 1, 0, 0, 0, 0, time.UTC)
	pts := []chart.MassPoint{{On: d, Kg: 64.2}, {On: d.AddDate(0, 0, 7), Kg: 64.0}, {On: d.AddDate(0, 0, 14), Kg: 63.8}}
	first, err := s.bodyMassSVG(pts)
	if err != nil {
		t.Fatal(err)
	}
	again, err := s.bodyMassSVG(pts)
	if err != nil || !bytes.Equal(first, again) || s.charts.Len() != 1 {
		t.Fatalf("equal points drew anew or differently (kept %d)", s.charts.Len())
	}
	edited := append([]chart.MassPoint(nil), pts...)
	edited[2].Kg = 66.5
	got, err := s.bodyMassSVG(edited)
	if err != nil {
		t.Fatal(err)
	}
	want, err := chart.BodyMassTrend(edited)
	if err != nil {
		t.Fatal(err)
	}
	if bytes.Equal(got, first) || !bytes.Equal(got, want) {
		t.Fatal("an edited measurement was answered with the old chart")
	}
}

package chart

import (
	"bytes"
	"encoding/xml"
	"errors"
	"io"
	"math"
	"strings"
	"testing"
	"time"

	"gonum.org/v1/plot"

	"larder/internal/mass"
)

// parseSVG checks that b is well-formed XML with an <svg> root and returns
// all text content and the number of <path> elements.
func parseSVG(t *testing.T, b []byte) (text string, paths int) {
	t.Helper()
	dec := xml.NewDecoder(bytes.NewReader(b))
	var sb strings.Builder
	root := ""
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("not well-formed SVG: %v", err)
		}
		switch el := tok.(type) {
		case xml.StartElement:
			if root == "" {
				root = el.Name.Local
			}
			if el.Name.Local == "path" {
				paths++
			}
		case xml.CharData:
			sb.Write(el)
			sb.WriteByte('\n')
		}
	}
	if root != "svg" {
		t.Fatalf("root element %q, want svg", root)
	}
	return sb.String(), paths
}

func massSeries(n int, zone *time.Location) []MassPoint {
	var pts []MassPoint
	start := time.Date(2027, 3, 1, 0, 0, 0, 0, zone)
	for i := 0; i < n; i++ {
		pts = append(pts, MassPoint{On: start.AddDate(0, 0, 3*i), Kg: 58 + 0.1*float64(i%4)})
	}
	return pts
}

func TestBodyMassTrend(t *testing.T) {
	zone := time.FixedZone("X", 2*3600)
	b, err := BodyMassTrend(massSeries(10, zone), mass.KG)
	if err != nil {
		t.Fatal(err)
	}
	text, paths := parseSVG(t, b)
	for _, want := range []string{"Body mass", "body mass (kg)", "kg", "Mar"} {
		if !strings.Contains(text, want) {
			t.Errorf("SVG text lacks %q", want)
		}
	}
	if paths < 10 {
		t.Errorf("%d paths, want at least one per measurement", paths)
	}
	again, _ := BodyMassTrend(massSeries(10, zone), mass.KG)
	if !bytes.Equal(b, again) {
		t.Error("same input drew different bytes")
	}
	other := massSeries(10, zone)
	other[5].Kg = 61
	if b2, _ := BodyMassTrend(other, mass.KG); bytes.Equal(b, b2) {
		t.Error("changing a measurement did not change the drawing")
	}
	if _, err := BodyMassTrend(massSeries(1, zone), mass.KG); err != nil {
		t.Errorf("one measurement: %v", err)
	}
	if _, err := BodyMassTrend(nil, mass.KG); !errors.Is(err, ErrNoData) {
		t.Errorf("no data: err = %v", err)
	}
	bad := massSeries(3, zone)
	bad[1].Kg = math.NaN()
	if _, err := BodyMassTrend(bad, mass.KG); err == nil {
		t.Error("NaN body mass drawn without error")
	}
}

func TestGramsPerKgByDay(t *testing.T) {
	days := []DayTarget{
		{Label: "Thu 15", GPerKg: 6, BandMin: 5, BandMax: 7},
		{Label: "Fri 16", GPerKg: 10, BandMin: 10, BandMax: 12},
		{Label: "Sat 17", GPerKg: 13, BandMin: 10, BandMax: 12, Overridden: true},
	}
	b, err := GramsPerKgByDay(days)
	if err != nil {
		t.Fatal(err)
	}
	text, _ := parseSVG(t, b)
	for _, want := range []string{"Thu 15", "Fri 16", "Sat 17", "guideline band", "target (g/kg)", "override", "g/kg body mass"} {
		if !strings.Contains(text, want) {
			t.Errorf("SVG text lacks %q", want)
		}
	}
	days[2].Overridden = false
	b2, _ := GramsPerKgByDay(days)
	text2, _ := parseSVG(t, b2)
	if strings.Contains(text2, "override") {
		t.Error("legend says override with no overridden day")
	}
	if _, err := GramsPerKgByDay(nil); !errors.Is(err, ErrNoData) {
		t.Errorf("no days: err = %v", err)
	}
}

func TestGlycogenCurve(t *testing.T) {
	zone := time.FixedZone("X", 2*3600)
	t0 := time.Date(2027, 4, 15, 0, 0, 0, 0, zone)
	var pts []GlycogenPoint
	for h := 0; h <= 72; h++ {
		pts = append(pts, GlycogenPoint{At: t0.Add(time.Duration(h) * time.Hour), MuscleG: 350 + 2*float64(h), LiverG: 80 + 0.3*float64(h)})
	}
	start := t0.Add(72 * time.Hour)
	b, err := GlycogenCurve(pts, start, "race start")
	if err != nil {
		t.Fatal(err)
	}
	text, _ := parseSVG(t, b)
	for _, want := range []string{"Estimated glycogen (model)", "muscle glycogen", "liver glycogen", "race start", "Apr"} {
		if !strings.Contains(text, want) {
			t.Errorf("SVG text lacks %q", want)
		}
	}
	b2, _ := GlycogenCurve(pts, time.Time{}, "race start")
	if text2, _ := parseSVG(t, b2); strings.Contains(text2, "race start") {
		t.Error("start line drawn with no start")
	}
	again, _ := GlycogenCurve(pts, start, "race start")
	if !bytes.Equal(b, again) {
		t.Error("same input drew different bytes")
	}
}

// TestGlycogenCurveRoundTimes: the time axis of the glycogen curve is
// labelled at whole hours (or local midnights), never at odd minutes, and a
// span past midnight names the day.
func TestGlycogenCurveRoundTimes(t *testing.T) {
	zone := time.FixedZone("X", 1*3600)
	// A race-day curve: from 05:56 one morning to 09:43 the next.
	t0 := time.Date(2027, 1, 5, 5, 56, 0, 0, zone)
	end := time.Date(2027, 1, 6, 9, 43, 0, 0, zone)
	var ticks []plot.Tick
	for _, tk := range (clockTicks{loc: zone}).Ticks(float64(t0.Unix()), float64(end.Unix())) {
		if tk.Label != "" {
			ticks = append(ticks, tk)
		}
	}
	if len(ticks) < 3 || len(ticks) > 12 {
		t.Fatalf("%d labelled ticks over 28 h: %v", len(ticks), ticks)
	}
	for _, tk := range ticks {
		at := time.Unix(int64(tk.Value), 0).In(zone)
		if at.Minute() != 0 || at.Second() != 0 {
			t.Errorf("tick at %s is not on a whole hour", at.Format("15:04"))
		}
		if at.Before(t0) || at.After(end) {
			t.Errorf("tick at %s lies outside the curve", at)
		}
	}
	if !strings.HasPrefix(ticks[0].Label, "Tue ") {
		t.Errorf("first tick of a span past midnight = %q, want the day named", ticks[0].Label)
	}
	// A three-day curve: one tick a local midnight, labelled with the date.
	long := (clockTicks{loc: zone}).Ticks(float64(t0.Unix()), float64(t0.Add(72*time.Hour).Unix()))
	for _, tk := range long {
		at := time.Unix(int64(tk.Value), 0).In(zone)
		if at.Hour() != 0 || at.Minute() != 0 || !strings.Contains(tk.Label, "Jan") {
			t.Errorf("three-day tick %q at %s", tk.Label, at)
		}
	}
	if len(long) != 3 {
		t.Errorf("three days from 05:56 hold %d midnights, want 3", len(long))
	}
}

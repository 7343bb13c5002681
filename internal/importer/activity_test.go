package importer

import (
	"bytes"
	"math"
	"strings"
	"testing"
	"time"

	"github.com/muktihari/fit/encoder"
	"github.com/muktihari/fit/profile/filedef"
	"github.com/muktihari/fit/profile/mesgdef"
	"github.com/muktihari/fit/profile/typedef"
)

// A GPX 1.1 track made for this test: three points due north along a
// meridian, 0.01° of latitude apart, with heart rate in the common
// TrackPointExtension and power in a plain <power> element.
const testGPX = `<?xml version="1.0" encoding="UTF-8"?>
<gpx version="1.1" creator="larder test" xmlns="http://www.topografix.com/GPX/1/1"
     xmlns:gpxtpx="http://www.garmin.com/xmlschemas/TrackPointExtension/v1">
  <trk><name>Morning ride</name><type>cycling</type><trkseg>
    <trkpt lat="60.00" lon="10.0"><time>2026-03-01T06:00:00Z</time>
      <extensions><power>200</power><gpxtpx:TrackPointExtension><gpxtpx:hr>140</gpxtpx:hr></gpxtpx:TrackPointExtension></extensions></trkpt>
    <trkpt lat="60.01" lon="10.0"><time>2026-03-01T06:30:00Z</time>
      <extensions><power>220</power><gpxtpx:TrackPointExtension><gpxtpx:hr>150</gpxtpx:hr></gpxtpx:TrackPointExtension></extensions></trkpt>
    <trkpt lat="60.02" lon="10.0"><time>2026-03-01T07:15:30Z</time>
      <extensions><power>240</power><gpxtpx:TrackPointExtension><gpxtpx:hr>160</gpxtpx:hr></gpxtpx:TrackPointExtension></extensions></trkpt>
  </trkseg></trk>
</gpx>`

func TestGPX(t *testing.T) {
	oslo, _ := time.LoadLocation("Europe/Oslo")
	rows, err := ReadActivity("ride.gpx", []byte(testGPX), ActivityOptions{Location: oslo, DefaultZone: "endurance"})
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 1 {
		t.Fatalf("rows %+v", rows)
	}
	r := rows[0]
	// 06:00 UTC is 07:00 in Oslo in March (CET, UTC+1).
	if !r.On.Equal(day(2026, 3, 1)) || r.Start != "07:00" || r.Modality != "cycle" || r.Source != "ride.gpx" {
		t.Errorf("row %+v", r)
	}
	// 75.5 min elapsed rounds to 76.
	if r.DurationMin != 76 {
		t.Errorf("duration %d, want 76", r.DurationMin)
	}
	// 0.02° of a meridian on a sphere of the mean Earth radius 6371.0088 km
	// (IUGG): 6371.0088 × 0.02 × π/180 = 2.224 km.
	if r.DistanceKm == nil || math.Abs(*r.DistanceKm-2.224) > 0.001 {
		t.Errorf("distance %v, want 2.224 km", r.DistanceKm)
	}
	if r.AvgHeartRate == nil || *r.AvgHeartRate != 150 || r.AvgPowerW == nil || *r.AvgPowerW != 220 {
		t.Errorf("hr %v power %v", r.AvgHeartRate, r.AvgPowerW)
	}
	if !r.IntensityAssumed || r.IntensityZone != "endurance" {
		t.Errorf("intensity %+v", r)
	}
}

func TestGPXRefused(t *testing.T) {
	for name, data := range map[string]string{
		"route.gpx":     `<gpx version="1.1"><rte><rtept lat="1" lon="1"/></rte></gpx>`,
		"notgpx.gpx":    `<html><body>hi</body></html>`,
		"cut.gpx":       testGPX[:len(testGPX)/2],
		"binary.gpx":    "\x00\x01\x02",
		"one-point.gpx": `<gpx><trk><trkseg><trkpt lat="1" lon="1"><time>2026-03-01T06:00:00Z</time></trkpt></trkseg></trk></gpx>`,
		"badtime.gpx":   `<gpx><trk><trkseg><trkpt lat="1" lon="1"><time>yesterday</time></trkpt><trkpt lat="1" lon="2"><time>2026-03-01T06:00:00Z</time></trkpt></trkseg></trk></gpx>`,
		"nosport.gpx":   strings.Replace(testGPX, "<type>cycling</type>", "", 1),
		"notes.txt":     "just some notes",
	} {
		_, err := ReadActivity(name, []byte(data), ActivityOptions{})
		if _, ok := err.(*FileError); !ok {
			t.Errorf("%s: got %v, want a FileError", name, err)
		}
	}
	// A file without a sport is read when the person chose one for such files.
	rows, err := ReadActivity("nosport.gpx", []byte(strings.Replace(testGPX, "<type>cycling</type>", "", 1)), ActivityOptions{DefaultModality: "run"})
	if err != nil || rows[0].Modality != "run" {
		t.Errorf("default modality: %v %+v", err, rows)
	}
}

// makeFIT encodes an activity the way a bike computer writes one: file id,
// records, one session, the activity message.
func makeFIT(t testing.TB, start time.Time, sport typedef.Sport, timerS, distM float64, hr uint8, power uint16) []byte {
	t.Helper()
	act := filedef.NewActivity()
	act.FileId.SetType(typedef.FileActivity).SetTimeCreated(start).SetManufacturer(typedef.ManufacturerDevelopment).SetProduct(1)
	for i := 0; i < 3; i++ {
		act.Records = append(act.Records, mesgdef.NewRecord(nil).SetTimestamp(start.Add(time.Duration(i)*time.Minute)).SetHeartRate(hr).SetPower(power))
	}
	act.Sessions = append(act.Sessions, mesgdef.NewSession(nil).
		SetTimestamp(start.Add(time.Duration(timerS)*time.Second)).
		SetStartTime(start).
		SetSport(sport).
		SetTotalTimerTime(uint32(timerS*1000)).
		SetTotalElapsedTime(uint32(timerS*1000)).
		SetTotalDistance(uint32(distM*100)).
		SetAvgHeartRate(hr).
		SetAvgPower(power))
	act.Activity = mesgdef.NewActivity(nil).SetType(typedef.ActivityManual).SetTimestamp(start.Add(time.Duration(timerS) * time.Second)).SetNumSessions(1)
	fit := act.ToFIT(nil)
	var buf bytes.Buffer
	if err := encoder.New(&buf).Encode(&fit); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

func TestFIT(t *testing.T) {
	start := time.Date(2026, 3, 2, 17, 15, 0, 0, time.UTC)
	data := makeFIT(t, start, typedef.SportCycling, 5400, 42195, 145, 231)
	rows, err := ReadActivity("ride.fit", data, ActivityOptions{DefaultZone: "tempo"})
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 1 {
		t.Fatalf("rows %+v", rows)
	}
	r := rows[0]
	if !r.On.Equal(day(2026, 3, 2)) || r.Start != "17:15" || r.Modality != "cycle" || r.DurationMin != 90 ||
		r.DistanceKm == nil || *r.DistanceKm != 42.195 || *r.AvgHeartRate != 145 || *r.AvgPowerW != 231 || r.IntensityZone != "tempo" {
		t.Errorf("row %+v", r)
	}
	// A running file without power keeps power empty.
	rows, err = ReadActivity("run.FIT", makeFIT(t, start, typedef.SportRunning, 1800, 6000, 160, 0xFFFF), ActivityOptions{})
	if err != nil || rows[0].Modality != "run" || rows[0].AvgPowerW != nil || rows[0].DurationMin != 30 {
		t.Errorf("run: %v %+v", err, rows)
	}
}

func TestFITRefused(t *testing.T) {
	data := makeFIT(t, time.Date(2026, 3, 2, 17, 15, 0, 0, time.UTC), typedef.SportRunning, 1800, 6000, 150, 0xFFFF)
	flipped := bytes.Clone(data)
	flipped[len(flipped)/2] ^= 0xFF
	for name, d := range map[string][]byte{
		"truncated.fit": data[:len(data)*2/3],
		"header.fit":    data[:14],
		"flipped.fit":   flipped,
		"text.fit":      []byte("date,mass\n2026-03-01,70\n"),
		"fit-as.gpx":    data,
	} {
		if name == "fit-as.gpx" {
			name = "activity.gpx"
		}
		_, err := ReadActivity(name, d, ActivityOptions{})
		if _, ok := err.(*FileError); !ok {
			t.Errorf("%s: got %v, want a FileError", name, err)
		}
	}
}

package importer

import (
	"testing"
	"time"

	"github.com/muktihari/fit/profile/typedef"
)

// The readers take files from anywhere; whatever the bytes, they must
// return rows or problems or a FileError, never panic, and every row they
// give must be within the training log's and body-mass table's limits.

func FuzzReadCSV(f *testing.F) {
	f.Add([]byte("date,mass\n2026-03-01,72.4\n"), false, "")
	f.Add([]byte("date;mass\n01/03/2026;72,4\n"), false, "dmy")
	f.Add([]byte("date\tstart\tactivity\tduration\n2026-03-01\t07:30\trun\t1:00:00\n"), true, "mdy")
	f.Add([]byte("\"date,mass\n\"2026"), false, "")
	f.Fuzz(func(t *testing.T, data []byte, training bool, order string) {
		kind := KindBodyMass
		if training {
			kind = KindTraining
		}
		sh, err := ReadCSV(data, Options{Kind: kind, DateOrder: order, DefaultZone: "endurance"})
		if err != nil {
			if _, ok := err.(*FileError); !ok {
				t.Fatalf("error %T is not a FileError: %v", err, err)
			}
			return
		}
		for _, m := range sh.Mass {
			if m.MassKg < 20 || m.MassKg > 300 || m.Line < 2 {
				t.Fatalf("row out of limits: %+v", m)
			}
		}
		for _, s := range sh.Sessions {
			if s.DurationMin < 1 || s.DurationMin > 1440 || s.Modality == "" || s.IntensityKind == "" {
				t.Fatalf("session out of limits: %+v", s)
			}
		}
	})
}

func FuzzReadGPX(f *testing.F) {
	f.Add([]byte(testGPX))
	f.Add([]byte(`<gpx><trk><type>running</type><trkseg><trkpt lat="1" lon="1"><time>2026-03-01T06:00:00Z</time></trkpt><trkpt lat="1.1" lon="1"><time>2026-03-01T07:00:00Z</time></trkpt></trkseg></trk></gpx>`))
	f.Fuzz(func(t *testing.T, data []byte) {
		checkActivity(t, "f.gpx", data)
	})
}

func FuzzReadFIT(f *testing.F) {
	start := time.Date(2026, 3, 2, 17, 15, 0, 0, time.UTC)
	f.Add(makeFIT(f, start, typedef.SportCycling, 5400, 42195, 145, 231))
	f.Add(makeFIT(f, start, typedef.SportRunning, 1800, 6000, 160, 0xFFFF))
	f.Fuzz(func(t *testing.T, data []byte) {
		checkActivity(t, "f.fit", data)
	})
}

func checkActivity(t *testing.T, name string, data []byte) {
	rows, err := ReadActivity(name, data, ActivityOptions{DefaultModality: "other", DefaultZone: "endurance"})
	if err != nil {
		if _, ok := err.(*FileError); !ok {
			t.Fatalf("error %T is not a FileError: %v", err, err)
		}
		return
	}
	for _, r := range rows {
		if r.DurationMin < 1 || r.DurationMin > 1440 || r.Modality == "" || r.Start == "" {
			t.Fatalf("session out of limits: %+v", r)
		}
		if r.DistanceKm != nil && (*r.DistanceKm <= 0 || *r.DistanceKm > 1000) {
			t.Fatalf("distance out of limits: %+v", r)
		}
	}
}

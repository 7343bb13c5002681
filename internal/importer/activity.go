package importer

import (
	"bytes"
	"math"
	"path/filepath"
	"strings"
	"time"
)

// ActivityOptions steer the reading of activity files.
type ActivityOptions struct {
	// Location is where the sessions were recorded; files keep UTC and the
	// training log keeps the local date and clock time. nil means UTC.
	Location *time.Location
	// DefaultZone is the intensity given to every session (the files
	// record none the training log can use).
	DefaultZone string
	// DefaultModality is used when a file does not name its sport; ""
	// refuses such files.
	DefaultModality string
}

// MaxActivityBytes bounds one activity file; a day-long ride recorded every
// second is a few MB as GPX and far less as FIT.
const MaxActivityBytes = 32 << 20

// ReadActivity reads one activity file, GPX or FIT, told apart by its
// content, not its name; a name that claims the other kind, or content that
// is neither, is refused with a *FileError. A file may hold several
// sessions (a multisport FIT file holds one per sport).
func ReadActivity(name string, data []byte, opt ActivityOptions) ([]SessionRow, error) {
	if len(data) > MaxActivityBytes {
		return nil, refuse(name + " is larger than 32 MB; it is not an activity file this import reads.")
	}
	ext := strings.ToLower(filepath.Ext(name))
	isFIT := len(data) >= 12 && string(data[8:12]) == ".FIT"
	switch {
	case isFIT && ext != ".gpx":
		return readFIT(name, data, opt)
	case !isFIT && ext != ".fit" && looksLikeXML(data):
		return readGPX(name, data, opt)
	case ext == ".fit":
		return nil, refuse(name + " is named .fit but is not a FIT file (its header does not say FIT).")
	case ext == ".gpx":
		return nil, refuse(name + " is named .gpx but is not GPX (it is not XML text).")
	}
	return nil, refuse(name + " is neither a GPX nor a FIT activity file.")
}

func looksLikeXML(data []byte) bool {
	d := bytes.TrimSpace(bytes.TrimPrefix(data, []byte("\ufeff")))
	return bytes.HasPrefix(d, []byte("<"))
}

// finish turns what a file recorded into a session row, checking it as the
// training log would.
func finish(name string, start time.Time, seconds, meters float64, sport string, hr, power *int, opt ActivityOptions) (SessionRow, error) {
	loc := opt.Location
	if loc == nil {
		loc = time.UTC
	}
	if start.IsZero() || start.Year() < 1990 {
		return SessionRow{}, refuse(name + " records no start time.")
	}
	local := start.In(loc)
	t := SessionRow{
		Source: name, Status: "done",
		On:    time.Date(local.Year(), local.Month(), local.Day(), 0, 0, 0, 0, time.UTC),
		Start: local.Format("15:04"),
	}
	minutes := int(seconds/60 + 0.5)
	if seconds > 0 && minutes == 0 {
		minutes = 1
	}
	if minutes < 1 || minutes > 1440 {
		return SessionRow{}, refuse(name + " records a duration outside 1 minute to 24 hours; the training log keeps one day's session at most.")
	}
	t.DurationMin = minutes
	if km := meters / 1000; km > 0 {
		km = float64(int(km*1000+0.5)) / 1000
		if km > 1000 {
			return SessionRow{}, refuse(name + " records more than 1000 km.")
		}
		if km > 0 {
			t.DistanceKm = &km
		}
	}
	t.Modality = Modality(sport)
	if t.Modality == "" {
		t.Modality = opt.DefaultModality
	}
	if t.Modality == "" {
		return SessionRow{}, refuse(name + " does not say which sport it records; choose the activity for such files and read it again.")
	}
	if hr != nil && *hr >= 30 && *hr <= 250 {
		t.AvgHeartRate = hr
	}
	if power != nil && *power >= 1 && *power <= 2000 {
		t.AvgPowerW = power
	}
	t.IntensityKind, t.IntensityZone, t.IntensityAssumed = "zone", opt.DefaultZone, true
	if opt.DefaultZone == "" {
		t.IntensityKind, t.IntensityZone = "zone", "endurance"
	}
	return t, nil
}

// roundedMean is the whole-number mean of n recorded samples summing to sum,
// or nil when the file recorded none (a missing heart rate or power is not 0).
func roundedMean(sum, n float64) *int {
	if n == 0 {
		return nil
	}
	v := int(math.Round(sum / n))
	return &v
}

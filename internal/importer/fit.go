package importer

import (
	"bytes"
	"errors"
	"math"
	"strings"
	"time"

	"github.com/muktihari/fit/decoder"
	"github.com/muktihari/fit/profile/basetype"
	"github.com/muktihari/fit/profile/filedef"
	"github.com/muktihari/fit/profile/mesgdef"
	"github.com/muktihari/fit/profile/typedef"
)

// readFIT reads a FIT activity file (the binary format of most watches and
// bike computers) through github.com/muktihari/fit, which checks the file's
// header and CRC, so a truncated or altered file is refused. Each session
// message becomes a training session; a file without one (some devices
// write only records) gives one session from its first and last record.
func readFIT(name string, data []byte, opt ActivityOptions) ([]SessionRow, error) {
	dec := decoder.New(bytes.NewReader(data))
	f, err := dec.Decode()
	if err != nil {
		switch {
		case errors.Is(err, decoder.ErrNotFITFile):
			return nil, refuse(name + " is not a FIT file.")
		case errors.Is(err, decoder.ErrCRCChecksumMismatch):
			return nil, refuse(name + " is damaged: its checksum does not match its content.")
		}
		return nil, refuse(name + " is incomplete or damaged and cannot be read as FIT (" + err.Error() + ").")
	}
	act := filedef.NewActivity(f.Messages...)
	if act.FileId.Type != typedef.FileActivity && act.FileId.Type != typedef.FileInvalid {
		return nil, refuse(name + " is a FIT file but not a recorded activity (it is a " + act.FileId.Type.String() + " file).")
	}
	var rows []SessionRow
	for _, s := range act.Sessions {
		row, err := fitSession(name, s, opt)
		if err != nil {
			return nil, err
		}
		rows = append(rows, row)
	}
	if len(rows) == 0 {
		row, err := fitFromRecords(name, act, opt)
		if err != nil {
			return nil, err
		}
		rows = append(rows, row)
	}
	return rows, nil
}

func fitSport(s typedef.Sport) string {
	if s == typedef.SportInvalid {
		return ""
	}
	word := strings.ReplaceAll(s.String(), "_", " ")
	switch s {
	case typedef.SportEBiking:
		return "cycling"
	case typedef.SportTraining, typedef.SportFitnessEquipment:
		return "other"
	}
	return word
}

func fitSession(name string, s *mesgdef.Session, opt ActivityOptions) (SessionRow, error) {
	start := s.StartTime
	seconds := s.TotalTimerTimeScaled()
	if math.IsNaN(seconds) || seconds <= 0 {
		seconds = s.TotalElapsedTimeScaled()
	}
	if math.IsNaN(seconds) {
		seconds = 0
	}
	meters := s.TotalDistanceScaled()
	if math.IsNaN(meters) {
		meters = 0
	}
	var hr, power *int
	if s.AvgHeartRate != basetype.Uint8Invalid && s.AvgHeartRate > 0 {
		v := int(s.AvgHeartRate)
		hr = &v
	}
	if s.AvgPower != basetype.Uint16Invalid && s.AvgPower > 0 {
		v := int(s.AvgPower)
		power = &v
	}
	return finish(name, start, seconds, meters, fitSport(s.Sport), hr, power, opt)
}

func fitFromRecords(name string, act *filedef.Activity, opt ActivityOptions) (SessionRow, error) {
	var first, last time.Time
	meters := 0.0
	var hrSum, hrN, pSum, pN float64
	for _, r := range act.Records {
		if r.Timestamp.IsZero() {
			continue
		}
		if first.IsZero() || r.Timestamp.Before(first) {
			first = r.Timestamp
		}
		if r.Timestamp.After(last) {
			last = r.Timestamp
		}
		if d := r.DistanceScaled(); !math.IsNaN(d) && d > meters {
			meters = d
		}
		if r.HeartRate != basetype.Uint8Invalid && r.HeartRate > 0 {
			hrSum, hrN = hrSum+float64(r.HeartRate), hrN+1
		}
		if r.Power != basetype.Uint16Invalid {
			pSum, pN = pSum+float64(r.Power), pN+1
		}
	}
	if first.IsZero() || !last.After(first) {
		return SessionRow{}, refuse(name + " holds no session and too few timed records to give one.")
	}
	hr, power := roundedMean(hrSum, hrN), roundedMean(pSum, pN)
	sport := ""
	if len(act.Sports) > 0 {
		sport = fitSport(act.Sports[0].Sport)
	}
	return finish(name, first, last.Sub(first).Seconds(), meters, sport, hr, power, opt)
}

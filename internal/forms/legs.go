package forms

import (
	"fmt"
	"regexp"
	"strconv"
	"strings"
	"time"

	"larder/internal/fuel"
)

// A multi-sport event's legs and a stage race's stages are typed one per
// line in a text box, in words a dietitian writes anyway:
//
//	swim 3.8 km 65 min
//	transition 5 min
//	cycle 180 km 320 min 215 W
//	run 42.2 km 247 min 70%
//
//	2027-05-13 12:00 cycle 165 km 240 min 230 W
//
// A figure is a number with its unit (km, min, h, W, %); a decimal comma
// reads as a point. Blank lines are skipped.

var (
	figureRE = regexp.MustCompile(`^(?i)(\d+(?:[.,]\d+)?)(km|min|h|w|%)?$`)
	unitRE   = regexp.MustCompile(`^(?i)(km|min|h|w|%)$`)
)

// legFigures are the figures of one line.
type legFigures struct {
	km, min, watts, pct *float64
}

// readFigures reads the figures after the modality: numbers each with a
// unit, written together ("65min") or apart ("65 min").
func readFigures(s string) (legFigures, error) {
	var f legFigures
	tok := strings.Fields(s)
	for i := 0; i < len(tok); i++ {
		m := figureRE.FindStringSubmatch(tok[i])
		if m == nil {
			return f, fmt.Errorf("%q is not a figure with a unit (km, min, h, W or %%)", clip(tok[i]))
		}
		unit := m[2]
		if unit == "" {
			if i+1 == len(tok) || !unitRE.MatchString(tok[i+1]) {
				return f, fmt.Errorf("%s needs its unit (km, min, h, W or %%)", clip(tok[i]))
			}
			i++
			unit = tok[i]
		}
		v, err := strconv.ParseFloat(strings.ReplaceAll(m[1], ",", "."), 64)
		if err != nil {
			return f, fmt.Errorf("%q is not a number", clip(m[1]))
		}
		set := func(p **float64, what string) error {
			if *p != nil {
				return fmt.Errorf("gives the %s twice", what)
			}
			*p = &v
			return nil
		}
		switch strings.ToLower(unit) {
		case "km":
			err = set(&f.km, "distance")
		case "min":
			err = set(&f.min, "duration")
		case "h":
			v *= 60
			err = set(&f.min, "duration")
		case "w":
			err = set(&f.watts, "power")
		case "%":
			err = set(&f.pct, "intensity")
		}
		if err != nil {
			return f, err
		}
	}
	return f, nil
}

// checkFigures applies the engine's ranges with plain messages.
func checkFigures(f legFigures, maxMin float64) error {
	switch {
	case f.min == nil:
		return fmt.Errorf("needs its expected duration, like 65 min")
	case *f.min <= 0 || *f.min > maxMin:
		return fmt.Errorf("duration must be more than 0 and at most %g min", maxMin)
	case f.km != nil && (*f.km <= 0 || *f.km > 1000):
		return fmt.Errorf("distance must be more than 0 and at most 1000 km")
	case f.watts != nil && (*f.watts <= 0 || *f.watts > 2000):
		return fmt.Errorf("power must be more than 0 and at most 2000 W")
	case f.pct != nil && (*f.pct < 20 || *f.pct > 100):
		return fmt.Errorf("intensity must be 20 to 100%% of VO2max")
	}
	return nil
}

// LineError is a fault on one line of a text box.
type LineError struct {
	Line int // 1-based
	Msg  string
}

func (e LineError) Error() string { return fmt.Sprintf("Line %d: %s.", e.Line, e.Msg) }

var segmentWords = map[string]string{
	"swim": "swim", "cycle": "cycle", "bike": "cycle", "ride": "cycle", "run": "run",
	"transition": "transition", "t1": "transition", "t2": "transition",
}

// MaxSegments and MaxStages bound the text boxes (the engine's limits).
const (
	MaxSegments = 12
	MaxStages   = 21
)

// ParseSegments reads a multi-sport event's legs, one per line.
func ParseSegments(text string) ([]fuel.Segment, error) {
	var out []fuel.Segment
	for i, line := range strings.Split(text, "\n") {
		line = strings.TrimSpace(line)
		if line == "" {
			continue
		}
		word, rest, _ := strings.Cut(line, " ")
		mod, ok := segmentWords[strings.ToLower(word)]
		if !ok {
			return nil, LineError{i + 1, fmt.Sprintf("start with swim, cycle, run or transition, not %q", clip(word))}
		}
		f, err := readFigures(rest)
		if err == nil {
			err = checkFigures(f, 1440)
		}
		if err == nil && f.watts != nil && mod != "cycle" {
			err = fmt.Errorf("power in W is for a cycle leg only")
		}
		if err != nil {
			return nil, LineError{i + 1, err.Error()}
		}
		if len(out) == MaxSegments {
			return nil, LineError{i + 1, fmt.Sprintf("an event has at most %d legs", MaxSegments)}
		}
		out = append(out, fuel.Segment{Modality: mod, DistanceKm: f.km, ExpectedDurationMin: *f.min,
			IntensityPctVO2max: f.pct, AveragePowerW: f.watts})
	}
	if len(out) > 0 && out[0].Modality == "transition" {
		return nil, LineError{1, "the event starts with a leg, not a transition"}
	}
	return out, nil
}

var stageModalities = map[string]bool{"run": true, "cycle": true, "swim": true, "row": true, "ski": true, "triathlon": true, "team": true, "other": true}

// ParseStages reads a stage race's stages, one per line, each starting
// with its date and clock time in the event's zone.
func ParseStages(text string, loc *time.Location) ([]fuel.Stage, error) {
	var out []fuel.Stage
	for i, line := range strings.Split(text, "\n") {
		line = strings.TrimSpace(line)
		if line == "" {
			continue
		}
		fields := strings.Fields(line)
		if len(fields) < 3 {
			return nil, LineError{i + 1, "give the date, start time, activity and duration, like 2027-05-13 12:00 cycle 165 km 240 min"}
		}
		at, err := time.ParseInLocation("2006-01-02 15:04", fields[0]+" "+fields[1], loc)
		if err != nil {
			return nil, LineError{i + 1, "start with the date and clock time, like 2027-05-13 12:00"}
		}
		if at.Format("2006-01-02 15:04") != fields[0]+" "+fields[1] {
			return nil, LineError{i + 1, fmt.Sprintf("%s %s does not exist in %s (the clocks go forward then)", fields[0], fields[1], loc)}
		}
		mod := strings.ToLower(fields[2])
		if mod == "bike" {
			mod = "cycle"
		}
		if !stageModalities[mod] {
			return nil, LineError{i + 1, fmt.Sprintf("the activity must be run, cycle, swim, row, ski, triathlon, team or other, not %q", clip(fields[2]))}
		}
		f, err := readFigures(strings.Join(fields[3:], " "))
		if err == nil {
			err = checkFigures(f, 1440)
		}
		if err == nil && f.watts != nil && mod != "cycle" {
			err = fmt.Errorf("power in W is for a cycling stage only")
		}
		if err != nil {
			return nil, LineError{i + 1, err.Error()}
		}
		if n := len(out); n > 0 {
			prev := out[n-1]
			if end := prev.StartsAt.Add(time.Duration(prev.ExpectedDurationMin * float64(time.Minute))); at.Before(end) {
				return nil, LineError{i + 1, fmt.Sprintf("starts before the stage above finishes (%s)", end.Format("2006-01-02 15:04"))}
			}
		}
		if len(out) == MaxStages {
			return nil, LineError{i + 1, fmt.Sprintf("a stage race has at most %d stages", MaxStages)}
		}
		out = append(out, fuel.Stage{StartsAt: at, Modality: mod, DistanceKm: f.km, ExpectedDurationMin: *f.min,
			IntensityPctVO2max: f.pct, AveragePowerW: f.watts})
	}
	if len(out) == 1 {
		return nil, LineError{1, "a stage race has at least 2 stages; for one day of racing leave this box empty"}
	}
	return out, nil
}

// SegmentsText and StagesText write legs and stages back as their lines.
func SegmentsText(segs []fuel.Segment) string {
	var b strings.Builder
	for _, s := range segs {
		b.WriteString(s.Modality)
		writeFigures(&b, s.DistanceKm, s.ExpectedDurationMin, s.AveragePowerW, s.IntensityPctVO2max)
		b.WriteByte('\n')
	}
	return b.String()
}

func StagesText(stages []fuel.Stage, loc *time.Location) string {
	var b strings.Builder
	for _, s := range stages {
		b.WriteString(s.StartsAt.In(loc).Format("2006-01-02 15:04"))
		b.WriteByte(' ')
		b.WriteString(s.Modality)
		writeFigures(&b, s.DistanceKm, s.ExpectedDurationMin, s.AveragePowerW, s.IntensityPctVO2max)
		b.WriteByte('\n')
	}
	return b.String()
}

func writeFigures(b *strings.Builder, km *float64, min float64, w, pct *float64) {
	num := func(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) }
	if km != nil {
		b.WriteString(" " + num(*km) + " km")
	}
	b.WriteString(" " + num(min) + " min")
	if w != nil {
		b.WriteString(" " + num(*w) + " W")
	}
	if pct != nil {
		b.WriteString(" " + num(*pct) + "%")
	}
}

// clip shortens a piece of input quoted in a message.
func clip(s string) string {
	if r := []rune(s); len(r) > 30 {
		return string(r[:30]) + "…"
	}
	return s
}

package importer

import (
	"errors"
	"math"
	"strconv"
	"strings"
	"time"
	"unicode/utf8"
)

// rowReader reads one line's cells by field, collecting problems.
type rowReader struct {
	sh   *Sheet
	line int
	rec  []string
	bad  bool
}

func (rr *rowReader) cell(field string) (string, *Column) {
	c := rr.sh.col(field)
	if c == nil || c.Index >= len(rr.rec) {
		return "", c
	}
	return strings.TrimSpace(rr.rec[c.Index]), c
}

func (rr *rowReader) fail(c *Column, reason string) {
	name := ""
	if c != nil {
		name = c.Header
	}
	rr.sh.Problems = append(rr.sh.Problems, Problem{Line: rr.line, Column: name, Reason: reason})
	rr.bad = true
}

// failValue reports a cell whose value is wrong, quoting it.
func (rr *rowReader) failValue(c *Column, value string, err error) {
	rr.fail(c, quoteCell(value)+" "+err.Error())
}

func quoteCell(v string) string {
	if utf8.RuneCountInString(v) > 40 {
		v = string([]rune(v)[:40]) + "…"
	}
	return strconv.Quote(v)
}

func (rr *rowReader) required(field, what string) (string, *Column, bool) {
	v, c := rr.cell(field)
	if v == "" {
		rr.fail(c, what+" is missing.")
		return "", c, false
	}
	return v, c, true
}

func (rr *rowReader) date(field, what string) (time.Time, string, bool) {
	v, c, ok := rr.required(field, what)
	if !ok {
		return time.Time{}, "", false
	}
	d, rest, err := parseDate(v, rr.sh.DateOrder)
	if err != nil {
		rr.failValue(c, v, err)
		return time.Time{}, "", false
	}
	if d.Year() < 1900 || d.Year() > 2200 {
		rr.failValue(c, v, errors.New("is not a plausible date"))
		return time.Time{}, "", false
	}
	return d, rest, true
}

func (rr *rowReader) text(field string, max int) string {
	v, c := rr.cell(field)
	if utf8.RuneCountInString(v) > max {
		rr.fail(c, "is longer than "+strconv.Itoa(max)+" characters.")
	}
	return v
}

// optNumber reads an optional number within [lo, hi].
func (rr *rowReader) optNumber(field string, lo, hi float64, what string) *float64 {
	v, c := rr.cell(field)
	if v == "" {
		return nil
	}
	num, _ := splitUnit(v)
	if strings.HasSuffix(num, "%") {
		num = strings.TrimSpace(strings.TrimSuffix(num, "%"))
	}
	x, err := parseNumber(num)
	if err != nil {
		rr.failValue(c, v, err)
		return nil
	}
	if x < lo || x > hi {
		rr.failValue(c, v, errors.New("is outside "+trimFloat(lo)+"–"+trimFloat(hi)+" "+what))
		return nil
	}
	return &x
}

func trimFloat(x float64) string { return strconv.FormatFloat(x, 'f', -1, 64) }

func (rr *rowReader) client() ClientRef {
	if !rr.sh.practice() {
		return ClientRef{}
	}
	name, _, _ := rr.required(FieldClient, "The client's name")
	dob, _, _ := rr.date(FieldBirth, "The client's date of birth")
	return ClientRef{Name: name, DOB: dob}
}

func (sh *Sheet) practice() bool { return sh.col(FieldClient) != nil }

func (sh *Sheet) readRow(line int, rec []string, opt Options) {
	rr := &rowReader{sh: sh, line: line, rec: rec}
	switch sh.Kind {
	case KindBodyMass:
		if m, ok := rr.massRow(opt); ok {
			sh.Mass = append(sh.Mass, m)
		}
	case KindTraining:
		if t, ok := rr.sessionRow(opt); ok {
			sh.Sessions = append(sh.Sessions, t)
		}
	}
}

func (rr *rowReader) massRow(opt Options) (MassRow, bool) {
	m := MassRow{Line: rr.line, Client: rr.client()}
	m.On, _, _ = rr.date(FieldDate, "The date")
	unit := opt.MassUnit
	if unit != "lb" {
		unit = "kg"
	}
	if c := rr.sh.col(FieldMass); c != nil && (c.Unit == "kg" || c.Unit == "lb") {
		unit = c.Unit
	}
	if v, c := rr.cell(FieldUnit); v != "" {
		if u := massUnit(v); u != "" {
			unit = u
		} else {
			rr.failValue(c, v, errors.New("is not a unit of mass (use kg or lb)"))
		}
	}
	if v, c, ok := rr.required(FieldMass, "The body mass"); ok {
		kg, u, err := parseMass(v, unit)
		if err != nil {
			rr.failValue(c, v, err)
		}
		m.MassKg, m.Unit = kg, u
	}
	if bf := rr.optNumber(FieldBodyFat, 2, 60, "%"); bf != nil {
		x := math.Round(*bf*10) / 10
		m.BodyFatPct = &x
	}
	m.Method = rr.text(FieldMethod, 100)
	return m, !rr.bad
}

func (rr *rowReader) sessionRow(opt Options) (SessionRow, bool) {
	t := SessionRow{Line: rr.line, Client: rr.client(), Status: "done"}
	var rest string
	t.On, rest, _ = rr.date(FieldDate, "The date")
	startText, sc := rr.cell(FieldStart)
	if startText == "" {
		startText = rest // "2026-03-01 07:30" in the date column
	}
	if startText != "" {
		s, err := parseClock(startText)
		if err != nil {
			rr.failValue(sc, startText, err)
		}
		t.Start = s
	}
	if v, c, ok := rr.required(FieldModality, "The activity"); ok {
		if t.Modality = Modality(v); t.Modality == "" {
			rr.failValue(c, v, errors.New("is not an activity the training log knows (running, cycling, swimming, rowing, skiing, triathlon, team sport, strength or other)"))
		}
	}
	if v, c, ok := rr.required(FieldDuration, "The duration"); ok {
		d, err := parseDuration(v, c.Unit)
		if err != nil {
			rr.failValue(c, v, err)
		}
		t.DurationMin = d
	}
	if v, c := rr.cell(FieldDistance); v != "" {
		unit := c.Unit
		if unit == "" {
			unit = "km"
		}
		d, err := parseDistance(v, unit)
		if err != nil {
			rr.failValue(c, v, err)
		}
		t.DistanceKm = d
	}
	rr.intensity(&t, opt)
	if hr := rr.optNumber(FieldHeartRate, 30, 250, "beats per minute"); hr != nil {
		n := int(math.Round(*hr))
		t.AvgHeartRate = &n
	}
	if p := rr.optNumber(FieldPower, 1, 2000, "W"); p != nil {
		n := int(math.Round(*p))
		t.AvgPowerW = &n
	}
	if v, c := rr.cell(FieldStatus); v != "" {
		switch strings.ToLower(v) {
		case "done", "completed", "yes", "y", "true", "1", "x":
			t.Status = "done"
		case "planned", "plan", "no", "n", "false", "0":
			t.Status = "planned"
		default:
			rr.failValue(c, v, errors.New("is neither planned nor done"))
		}
	}
	t.Notes = rr.text(FieldNotes, 2000)
	return t, !rr.bad
}

// intensity takes the first intensity the row gives: RPE, then zone, then
// %VO2max; a row with none gets the default zone, marked assumed.
func (rr *rowReader) intensity(t *SessionRow, opt Options) {
	if v := rr.optNumber(FieldRPE, 1, 10, "on the RPE scale"); v != nil {
		x := math.Round(*v*10) / 10
		t.IntensityKind, t.IntensityValue = "rpe", &x
		return
	}
	if v, c := rr.cell(FieldZone); v != "" {
		z := zones[NormHeader(v)]
		if z == "" {
			rr.failValue(c, v, errors.New("is not a zone (recovery, endurance, tempo, threshold, maximal, or 1–5)"))
			return
		}
		t.IntensityKind, t.IntensityZone = "zone", z
		return
	}
	if v := rr.optNumber(FieldPctVO2max, 20, 120, "% VO2max"); v != nil {
		x := math.Round(*v*10) / 10
		t.IntensityKind, t.IntensityValue = "pct_vo2max", &x
		return
	}
	if rr.bad {
		return
	}
	if opt.DefaultZone == "" {
		rr.fail(nil, "The row gives no intensity (RPE, zone or % VO2max).")
		return
	}
	t.IntensityKind, t.IntensityZone, t.IntensityAssumed = "zone", opt.DefaultZone, true
}

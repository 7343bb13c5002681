package server

import (
	"fmt"
	"net/url"
	"strconv"
	"time"

	"larder/internal/forms"
	"larder/internal/fuel"
	"larder/internal/mass"
	"larder/internal/store"
	"larder/web"
)

// The forms of the staff pages. Tags give the field limits (the database's
// CHECK constraints repeat them); check* functions add the rules that need
// today's date or another field.

type clientForm struct {
	Name        string     `form:"name" label:"Name" validate:"required,max=200"`
	DateOfBirth *time.Time `form:"date_of_birth" label:"Date of birth"`
	Sex         string     `form:"sex" label:"Sex" validate:"required,oneof=female male" msg:"Choose female or male: the physiology equations need one of the two."`
	HeightCm    *float64   `form:"height_cm" label:"Height" unit:"cm" validate:"omitempty,gte=100,lte=250"`
	Sport       string     `form:"sport" label:"Sport" validate:"max=100"`
	Notes       string     `form:"notes" label:"Notes" validate:"max=5000"`
	Cautions    string     `form:"cautions" label:"Recorded cautions" validate:"max=2000"`
	SharedNote  string     `form:"shared_note" label:"Health note shared with the athlete" validate:"max=2000"`
	ShowFigures bool       `form:"athlete_sees_energy_mass"`
	MassUnit    string     `form:"mass_unit" label:"Body-mass unit" validate:"omitempty,oneof=kg lb" msg:"Choose the practice's unit, kg or lb."`
}

// Youngest and oldest plausible clients, in years.
const (
	minClientAge = 5
	maxClientAge = 100
)

func (in *clientForm) check(f forms.Form, today time.Time) {
	if h := in.HeightCm; h != nil && *h >= 1 && *h <= 2.5 {
		// 1.72 is a height in metres; say so rather than only "100 to 250 cm".
		f.Errors["height_cm"] = fmt.Sprintf("Height is in centimetres: %s m is %s cm.", web.Num(*h, 2), web.Num(*h*100, 1))
	}
	if in.DateOfBirth != nil {
		earliest := today.AddDate(-maxClientAge, 0, 0)
		latest := today.AddDate(-minClientAge, 0, 0)
		if in.DateOfBirth.Before(earliest) || in.DateOfBirth.After(latest) {
			f.Errors.Add("date_of_birth", fmt.Sprintf("Date of birth must be between %s and %s (an age of %d to %d years).",
				web.Date(earliest), web.Date(latest), minClientAge, maxClientAge))
		}
	}
}

func (in *clientForm) apply(c *store.Client) {
	c.Name = in.Name
	c.DateOfBirth = in.DateOfBirth
	c.Sex = in.Sex
	c.HeightCm = in.HeightCm
	if c.HeightCm != nil {
		v := forms.Round(*c.HeightCm, 1)
		c.HeightCm = &v
	}
	c.Sport = in.Sport
	c.Notes = in.Notes
	c.Cautions = in.Cautions
	c.SharedNote = in.SharedNote
	c.AthleteSeesEnergyMass = in.ShowFigures
	c.MassUnit = mass.Unit(in.MassUnit)
}

// clientStamp names the saved version of a client a form was opened on, so a
// save from a stale tab can be told apart from one made on fresh details.
func clientStamp(c store.Client) string { return strconv.FormatInt(c.UpdatedAt.UnixMicro(), 10) }

func clientValues(c store.Client) url.Values {
	v := url.Values{}
	v.Set("loaded", clientStamp(c))
	v.Set("name", c.Name)
	if c.DateOfBirth != nil {
		v.Set("date_of_birth", web.ISODate(*c.DateOfBirth))
	}
	v.Set("sex", c.Sex)
	if c.HeightCm != nil {
		v.Set("height_cm", web.Num(*c.HeightCm, 1))
	}
	v.Set("sport", c.Sport)
	v.Set("notes", c.Notes)
	v.Set("cautions", c.Cautions)
	v.Set("shared_note", c.SharedNote)
	if c.AthleteSeesEnergyMass {
		v.Set("athlete_sees_energy_mass", "on")
	}
	v.Set("mass_unit", string(c.MassUnit))
	return v
}

type bodyMassForm struct {
	MeasuredOn time.Time `form:"measured_on" label:"Measurement date" validate:"required"`
	Mass       *float64  `form:"mass" label:"Body mass" validate:"required"`
	Unit       string    `form:"unit" label:"Unit" validate:"required,oneof=kg lb" msg:"Choose kg or lb."`
	BodyFatPct *float64  `form:"body_fat_pct" label:"Body fat" unit:"%" validate:"omitempty,gte=2,lte=60"`
	Method     string    `form:"method" label:"Method" validate:"max=100"`
}

// check adds the rules one field cannot say alone; born is the client's date
// of birth, nil when not recorded.
func (in *bodyMassForm) check(f forms.Form, today time.Time, born *time.Time) {
	if !in.MeasuredOn.IsZero() {
		switch {
		case in.MeasuredOn.After(today.AddDate(0, 0, 1)):
			f.Errors.Add("measured_on", "Measurement date cannot be more than one day after today ("+web.Date(today)+").")
		case born != nil && in.MeasuredOn.Before(*born):
			// A typo in the year (1926 for 2026) would otherwise stretch the trend chart over a century.
			f.Errors.Add("measured_on", "Measurement date cannot be before the client's date of birth ("+web.Date(*born)+").")
		case in.MeasuredOn.Year() < 1900:
			f.Errors.Add("measured_on", "Measurement date must be after 1900.")
		}
	}
	if in.Mass != nil && f.Err("unit") == "" {
		if _, ok := mass.Check(*in.Mass, mass.Unit(in.Unit)); !ok {
			f.Errors.Add("mass", mass.RangeMessage(mass.Unit(in.Unit)))
		}
	}
}

// apply writes the form into m. The edit form shows a measurement in the
// client's unit, which need not be the unit it was typed in: a number sent
// back as shown keeps the stored kg (and the unit it was typed in), so that
// saving a form unchanged never moves a mass by a conversion's rounding.
func (in *bodyMassForm) apply(m *store.BodyMass) {
	m.MeasuredOn = in.MeasuredOn
	if kg := mass.Reread(*in.Mass, mass.Unit(in.Unit), m.MassKg); kg != m.MassKg || m.EnteredUnit == "" {
		m.MassKg, m.EnteredUnit = kg, in.Unit
	}
	m.BodyFatPct = in.BodyFatPct
	if m.BodyFatPct != nil {
		v := forms.Round(*m.BodyFatPct, 1)
		m.BodyFatPct = &v
	}
	m.Method = in.Method
}

// bodyMassValues fills the edit form with a measurement in the client's
// unit u, whatever unit it was typed in.
func bodyMassValues(m store.BodyMass, u mass.Unit) url.Values {
	v := url.Values{}
	v.Set("measured_on", web.ISODate(m.MeasuredOn))
	v.Set("unit", string(u))
	v.Set("mass", mass.Input(m.MassKg, u))
	if m.BodyFatPct != nil {
		v.Set("body_fat_pct", web.Num(*m.BodyFatPct, 1))
	}
	v.Set("method", m.Method)
	return v
}

type trainingForm struct {
	OnDate        time.Time `form:"on_date" label:"Date" validate:"required"`
	StartTime     string    `form:"start_time" label:"Start time" validate:"omitempty,clock"`
	Modality      string    `form:"modality" label:"Activity" validate:"required,oneof=run cycle swim row ski triathlon team strength other" msg:"Choose an activity from the list."`
	DurationMin   *int      `form:"duration_min" label:"Duration" unit:"minutes" validate:"required,gt=0,lte=1440" msg:"Duration must be more than 0 and at most 1440 minutes (24 hours)."`
	IntensityKind string    `form:"intensity_kind" label:"Intensity" validate:"required,oneof=rpe zone pct_vo2max" msg:"Choose how intensity is given: RPE, a zone or %VO2max."`
	RPE           *float64  `form:"rpe" label:"RPE" validate:"omitempty,gte=1,lte=10" msg:"RPE must be between 1 and 10."`
	Zone          string    `form:"zone" label:"Zone" validate:"omitempty,oneof=recovery endurance tempo threshold maximal" msg:"Choose a zone from the list."`
	PctVO2max     *float64  `form:"pct_vo2max" label:"%VO2max" validate:"omitempty,gte=20,lte=120" msg:"%VO2max must be between 20 and 120 %."`
	DistanceKm    *float64  `form:"distance_km" label:"Distance" unit:"km" validate:"omitempty,gt=0,lte=1000"`
	Status        string    `form:"status" label:"Status" validate:"required,oneof=planned done" msg:"Choose planned or done."`
	Notes         string    `form:"notes" label:"Notes" validate:"max=2000"`
	TrainLow      bool      `form:"train_low" label:"Train low"`
	AvgHeartRate  *int      `form:"avg_heart_rate" label:"Average heart rate" unit:"beats/min" validate:"omitempty,gte=30,lte=250"`
	AvgPowerW     *int      `form:"avg_power_w" label:"Average power" unit:"W" validate:"omitempty,gte=1,lte=2000"`
}

func (in *trainingForm) check(f forms.Form, today time.Time) {
	if !in.OnDate.IsZero() {
		if in.OnDate.Before(today.AddDate(-5, 0, 0)) || in.OnDate.After(today.AddDate(1, 0, 0)) {
			f.Errors.Add("on_date", "Date must be within five years before and one year after today.")
		}
	}
	// The value that goes with the chosen kind of intensity must be there.
	switch {
	case in.IntensityKind == store.IntensityRPE && in.RPE == nil:
		f.Errors.Add("rpe", "Give the RPE (1 to 10) for this session.")
	case in.IntensityKind == store.IntensityZone && in.Zone == "":
		f.Errors.Add("zone", "Choose the zone of this session.")
	case in.IntensityKind == store.IntensityPctVO2max && in.PctVO2max == nil:
		f.Errors.Add("pct_vo2max", "Give the %VO2max (20 to 120) for this session.")
	}
	// A session is "done" only once its day has come.
	if in.Status == store.StatusDone && in.OnDate.After(today.AddDate(0, 0, 1)) && f.Err("on_date") == "" {
		f.Errors.Add("status", "A session more than a day ahead cannot be done yet; mark it planned.")
	}
}

func (in *trainingForm) apply(t *store.TrainingSession) {
	t.OnDate = in.OnDate
	t.StartTime = in.StartTime
	t.Modality = in.Modality
	t.DurationMin = *in.DurationMin
	t.IntensityKind = in.IntensityKind
	t.IntensityValue, t.IntensityZone = nil, ""
	switch in.IntensityKind {
	case store.IntensityRPE:
		v := forms.Round(*in.RPE, 1)
		t.IntensityValue = &v
	case store.IntensityPctVO2max:
		v := forms.Round(*in.PctVO2max, 1)
		t.IntensityValue = &v
	case store.IntensityZone:
		t.IntensityZone = in.Zone
	}
	t.DistanceKm = roundPtr(in.DistanceKm, 3)
	t.Status = in.Status
	t.Notes = in.Notes
	t.TrainLow = in.TrainLow
	t.AvgHeartRate, t.AvgPowerW = in.AvgHeartRate, in.AvgPowerW
}

func trainingValues(t store.TrainingSession) url.Values {
	v := url.Values{}
	v.Set("on_date", web.ISODate(t.OnDate))
	v.Set("start_time", t.StartTime)
	v.Set("modality", t.Modality)
	v.Set("duration_min", strconv.Itoa(t.DurationMin))
	v.Set("intensity_kind", t.IntensityKind)
	switch t.IntensityKind {
	case store.IntensityRPE:
		v.Set("rpe", web.NumPtr(t.IntensityValue, 1))
	case store.IntensityPctVO2max:
		v.Set("pct_vo2max", web.NumPtr(t.IntensityValue, 1))
	case store.IntensityZone:
		v.Set("zone", t.IntensityZone)
	}
	if t.DistanceKm != nil {
		v.Set("distance_km", web.Num(*t.DistanceKm, 3))
	}
	v.Set("status", t.Status)
	v.Set("notes", t.Notes)
	if t.TrainLow {
		v.Set("train_low", "on")
	}
	if t.AvgHeartRate != nil {
		v.Set("avg_heart_rate", strconv.Itoa(*t.AvgHeartRate))
	}
	if t.AvgPowerW != nil {
		v.Set("avg_power_w", strconv.Itoa(*t.AvgPowerW))
	}
	return v
}

type eventForm struct {
	Name                string   `form:"name" label:"Name" validate:"required,max=200"`
	StartsAt            string   `form:"starts_at" label:"Start" validate:"required,localdatetime"`
	TimeZone            string   `form:"time_zone" label:"Time zone" validate:"required,iana_zone"`
	Modality            string   `form:"modality" label:"Activity" validate:"required,oneof=run cycle swim row ski triathlon team strength other" msg:"Choose an activity from the list."`
	DistanceKm          *float64 `form:"distance_km" label:"Distance" unit:"km" validate:"omitempty,gt=0,lte=1000"`
	ExpectedDurationMin *int     `form:"expected_duration_min" label:"Expected duration" validate:"required,gt=0,lte=2880" msg:"Expected duration must be more than 0 and at most 2880 minutes (48 hours)."`
	Days                *int     `form:"days" label:"Days" validate:"omitempty,gte=1,lte=30" msg:"Days must be a whole number from 1 to 30."`
	Priority            string   `form:"priority" label:"Priority" validate:"required,oneof=A B C" msg:"Choose goal race, important race or training race."`
	Notes               string   `form:"notes" label:"Notes" validate:"max=2000"`
	Segments            string   `form:"segments" label:"Legs" validate:"max=2000"`
	Stages              string   `form:"stages" label:"Stages" validate:"max=3000"`

	segments []fuel.Segment // parsed by check
	stages   []fuel.Stage
}

// startsAt is the event's start as an instant, read in its own zone.
func (in *eventForm) startsAt() (time.Time, error) {
	loc, err := time.LoadLocation(in.TimeZone)
	if err != nil {
		return time.Time{}, err
	}
	return forms.ParseLocalDateTime(in.StartsAt, loc)
}

func (in *eventForm) check(f forms.Form, today time.Time) {
	in.checkLegs(f)
	if f.Err("starts_at") != "" || f.Err("time_zone") != "" {
		return
	}
	t, err := in.startsAt()
	if err != nil {
		f.Errors.Add("starts_at", "Start must be a date and time like 2027-04-18 08:30.")
		return
	}
	if t.Before(today.AddDate(-5, 0, 0)) || t.After(today.AddDate(5, 0, 0)) {
		f.Errors.Add("starts_at", "Start must be within five years of today.")
		return
	}
	// A clock time skipped when the clocks go forward would silently move an hour.
	typed, _ := forms.ParseLocalDateTime(in.StartsAt, time.UTC)
	if shown := t.In(t.Location()); shown.Format("2006-01-02 15:04") != typed.Format("2006-01-02 15:04") {
		f.Errors.Add("starts_at", fmt.Sprintf("%s does not exist in %s on %s: the clocks go forward then. Give the start as the clocks there will show it, such as %s.",
			typed.Format("15:04"), in.TimeZone, web.Date(typed), shown.Format("15:04")))
	}
}

func (in *eventForm) apply(e *store.Event) {
	e.Name = in.Name
	e.StartsAt, _ = in.startsAt() // checked by check
	e.TimeZone = in.TimeZone
	e.Modality = in.Modality
	e.DistanceKm = roundPtr(in.DistanceKm, 3)
	e.ExpectedDurationMin = *in.ExpectedDurationMin
	e.Days = 1
	if in.Days != nil {
		e.Days = *in.Days
	}
	e.Priority = in.Priority
	e.Notes = in.Notes
	e.Segments, e.Stages = in.segments, in.stages
	if len(in.stages) > 0 {
		// The stages fix the start and the number of racing days.
		e.StartsAt = in.stages[0].StartsAt
		e.Days = len(in.stages)
	}
}

func eventValues(e store.Event) url.Values {
	v := url.Values{}
	v.Set("name", e.Name)
	v.Set("starts_at", e.LocalStart().Format("2006-01-02T15:04"))
	v.Set("time_zone", e.TimeZone)
	v.Set("modality", e.Modality)
	if e.DistanceKm != nil {
		v.Set("distance_km", web.Num(*e.DistanceKm, 3))
	}
	v.Set("expected_duration_min", strconv.Itoa(e.ExpectedDurationMin))
	v.Set("days", strconv.Itoa(e.Days))
	v.Set("priority", e.Priority)
	v.Set("notes", e.Notes)
	v.Set("segments", forms.SegmentsText(e.Segments))
	v.Set("stages", forms.StagesText(e.Stages, e.Location()))
	return v
}

func roundPtr(x *float64, decimals int) *float64 {
	if x == nil {
		return nil
	}
	v := forms.Round(*x, decimals)
	return &v
}

type newUserForm struct {
	Name     string `form:"name" label:"Name" validate:"required,max=200"`
	Email    string `form:"email" label:"Email" validate:"required,email,max=254"`
	Role     string `form:"role" label:"Role" validate:"required,oneof=admin dietitian" msg:"Choose administrator or dietitian."`
	Password string `form:"password" label:"Password" validate:"omitempty,min=10,max=200"`
}

type roleForm struct {
	Role string `form:"role" label:"Role" validate:"required,oneof=admin dietitian" msg:"Choose administrator or dietitian."`
}

type practiceForm struct {
	PracticeName string `form:"practice_name" label:"Practice name" validate:"required,max=120"`
	TimeZone     string `form:"practice_time_zone" label:"Time zone" validate:"required,iana_zone"`
	MassUnit     string `form:"mass_unit" label:"Body-mass unit" validate:"omitempty,oneof=kg lb" msg:"Choose kg or lb."` // empty: unchanged
}

package fuel

import "time"

// Segment is one leg of a multi-sport event. A transition is the time
// between legs; it costs a little energy and no carbohydrate is planned in
// it.
type Segment struct {
	Modality            string   `json:"modality" validate:"required,oneof=swim cycle run transition"`
	DistanceKm          *float64 `json:"distance_km,omitempty" validate:"omitempty,gt=0,lte=1000"`
	ExpectedDurationMin float64  `json:"expected_duration_min" validate:"required,gt=0,lte=2880"`
	IntensityPctVO2max  *float64 `json:"intensity_pct_vo2max,omitempty" validate:"omitempty,gte=20,lte=100"`
	AveragePowerW       *float64 `json:"average_power_w,omitempty" validate:"omitempty,gt=0,lte=2000"`
}

// Stage is one stage of a stage race.
type Stage struct {
	StartsAt            time.Time `json:"starts_at" validate:"required"`
	Modality            string    `json:"modality" validate:"required,oneof=run cycle swim row ski triathlon team other"`
	DistanceKm          *float64  `json:"distance_km,omitempty" validate:"omitempty,gt=0,lte=1000"`
	ExpectedDurationMin float64   `json:"expected_duration_min" validate:"required,gt=0,lte=1440"`
	IntensityPctVO2max  *float64  `json:"intensity_pct_vo2max,omitempty" validate:"omitempty,gte=20,lte=100"`
	AveragePowerW       *float64  `json:"average_power_w,omitempty" validate:"omitempty,gt=0,lte=2000"`
}

// StageOverride is a dietitian's in-stage g/h for one stage (0-based).
type StageOverride struct {
	Stage    int     `json:"stage" validate:"gte=0,lte=20"`
	ChoGPerH float64 `json:"cho_g_per_h" validate:"gte=0,lte=150"`
}

// Caffeine is a caffeine dose at a time.
type Caffeine struct {
	At      time.Time `json:"at"`
	Mg      float64   `json:"mg"`
	MgPerKg float64   `json:"mg_per_kg"`
}

// SegmentPlan is the energy, fuel use and fuelling of one leg.
type SegmentPlan struct {
	Modality    string   `json:"modality"`
	StartMin    float64  `json:"start_min"` // minutes from the start of the event
	DurationMin float64  `json:"duration_min"`
	DistanceKm  *float64 `json:"distance_km"`
	PctVO2max   float64  `json:"pct_vo2max"`
	EnergyKcal  float64  `json:"energy_kcal"`
	// EnergyMethod names the model the leg's energy comes from.
	EnergyMethod string  `json:"energy_method"`
	ChoShare     float64 `json:"cho_share"`
	ChoUsedG     float64 `json:"cho_used_g"`
	ChoGPerH     float64 `json:"cho_g_per_h"`
	ChoG         float64 `json:"cho_g"`
	// Muscle names the muscle whose glycogen the leg draws on.
	Muscle string `json:"muscle"`
	// Where in this leg the stores would run out, with the planned intake
	// (null when they last it).
	RunsOutAtMin *float64 `json:"runs_out_at_min"`
	RunsOutAtKm  *float64 `json:"runs_out_at_km"`
}

// HourBlock is a span of an event of over a day with its in-event grams.
type HourBlock struct {
	From     time.Time `json:"from"`
	To       time.Time `json:"to"`
	Night    bool      `json:"night"`
	ChoGPerH float64   `json:"cho_g_per_h"`
	ChoG     float64   `json:"cho_g"`
}

// StagePlan is the plan of one stage of a stage race.
type StagePlan struct {
	Index        int           `json:"index"`
	StartsAt     time.Time     `json:"starts_at"`
	Modality     string        `json:"modality"`
	DurationMin  float64       `json:"duration_min"`
	PreEventMeal *PreEventMeal `json:"pre_event_meal"`
	DuringEvent  *DuringEvent  `json:"during_event"`
	// WorkingMuscleMmolPerKgStart is the working muscle's glycogen density
	// at the stage's start.
	WorkingMuscleMmolPerKgStart float64 `json:"working_muscle_mmol_per_kg_start"`
	LiverGStart                 float64 `json:"liver_g_start"`
	// RunsOutAtMin is when in the stage the stores would run out with the
	// planned intake (null when they last).
	RunsOutAtMin *float64 `json:"runs_out_at_min"`
	// Repletion is the refuelling after the stage's finish: speedy when
	// the next stage starts under 8 h later.
	Repletion *StageRepletion `json:"repletion"`
}

// StageRepletion is the refuelling between a stage's finish and the next.
type StageRepletion struct {
	GapH          float64 `json:"gap_h"` // null-free: hours to the next start (0 after the last stage)
	Speedy        bool    `json:"speedy"`
	ChoGPerKgPerH float64 `json:"cho_g_per_kg_per_h"`
	Feeds         []Feed  `json:"feeds"`
}

// SessionFuel is the fuelling of one long training session.
type SessionFuel struct {
	Start       time.Time `json:"start"`
	DurationMin float64   `json:"duration_min"`
	Modality    string    `json:"modality"`
	TrainLow    bool      `json:"train_low"`
	// PreSessionChoG is the pre-session meal (0 when train low).
	PreSessionChoG float64 `json:"pre_session_cho_g"`
	ChoGPerH       float64 `json:"cho_g_per_h"`
	ChoG           float64 `json:"cho_g"`
}

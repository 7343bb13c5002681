package fuel

import (
	"encoding/json"
	"time"
)

// Request is a plan's JSON request: the athlete, the event and the plan's
// kind, plus the extras the web app needs.
// Fields a kind does not need may be absent.
type Request struct {
	Kind          string            `json:"kind" validate:"required,oneof=loading race repletion week"`
	Athlete       Athlete           `json:"athlete" validate:"required"`
	Event         *Event            `json:"event,omitempty" validate:"omitempty"`
	Protocol      string            `json:"protocol,omitempty" validate:"omitempty,oneof=two-day one-day three-day"`
	Training      []TrainingSession `json:"training,omitempty" validate:"max=400,dive"`
	SessionEnd    *time.Time        `json:"session_end,omitempty"`
	NextStart     *time.Time        `json:"next_start,omitempty"`
	Overrides     []DayOverride     `json:"overrides,omitempty" validate:"max=60,dive"`
	FeedOverrides []FeedOverride    `json:"feed_overrides,omitempty" validate:"max=400,dive"`
	// DuringEventChoGPerH overrides the in-event g/h. Only through this
	// explicit override may it exceed 90 g/h, and the plan labels it.
	DuringEventChoGPerH *float64 `json:"during_event_cho_g_per_h,omitempty" validate:"omitempty,gte=0,lte=150"`
	// TaperDays is, for loading, how many days before the event the plan
	// covers (default 7).
	TaperDays int `json:"taper_days,omitempty" validate:"gte=0,lte=14"`
	// StartDate is, for week, the first day YYYY-MM-DD (default: the first
	// training date).
	StartDate string `json:"start_date,omitempty" validate:"omitempty,datetime=2006-01-02"`
	// Days is, for week, the number of days (default 7).
	Days int `json:"days,omitempty" validate:"gte=0,lte=28"`
	// EatingOccasions is the default number of eating occasions a day
	// (default 5, at least 6 on load days). They count every feed of the
	// day: the pre-event meal, the in-event fuelling, recovery feeds and a
	// run of speedy refuelling feeds each count as one; a day that needs
	// more than asked keeps its protocol feeds and a finding says so.
	EatingOccasions int `json:"eating_occasions,omitempty" validate:"gte=0,lte=10"`
	// TimeZone is the IANA zone for feed times; by default the offset of
	// event.starts_at or session_end.
	TimeZone string `json:"time_zone,omitempty"`
	// Cautions are the client's recorded cautions as free text ("type 1
	// diabetes", "coeliac disease"); each yields a caution finding.
	Cautions []string `json:"cautions,omitempty" validate:"max=20,dive,max=200"`
	// CaffeineMgPerKg asks for caffeine before the start of a race, loading
	// or stage-race plan (off when absent).
	CaffeineMgPerKg *float64 `json:"caffeine_mg_per_kg,omitempty" validate:"omitempty,gt=0,lte=15"`
	// RepletionCaffeineMgPerKg adds caffeine to speedy refuelling (off when
	// absent): an option the dietitian chooses, never a default.
	RepletionCaffeineMgPerKg *float64 `json:"repletion_caffeine_mg_per_kg,omitempty" validate:"omitempty,gt=0,lte=15"`
	// StageOverrides set the in-stage g/h of single stages.
	StageOverrides []StageOverride `json:"stage_overrides,omitempty" validate:"max=21,dive"`
}

// Athlete holds the body figures the equations need.
type Athlete struct {
	Sex           string   `json:"sex" validate:"required,oneof=female male"`
	BodyMassKg    float64  `json:"body_mass_kg" validate:"required"` // range: mass.MinKg–MaxKg, checked by hand
	HeightCm      *float64 `json:"height_cm,omitempty" validate:"omitempty,gte=120,lte=230"`
	BodyFatPct    *float64 `json:"body_fat_pct,omitempty" validate:"omitempty,gte=3,lte=60"`
	VO2maxMlKgMin *float64 `json:"vo2max_ml_kg_min,omitempty" validate:"omitempty,gte=20,lte=95"`
}

// Event is the competition a loading or race plan leads to.
type Event struct {
	StartsAt            time.Time `json:"starts_at" validate:"required"`
	Modality            string    `json:"modality" validate:"required,oneof=run cycle swim row ski triathlon team other"`
	DistanceKm          *float64  `json:"distance_km,omitempty" validate:"omitempty,gt=0,lte=1000"`
	ExpectedDurationMin float64   `json:"expected_duration_min" validate:"required,gt=0,lte=2880"`
	IntensityPctVO2max  *float64  `json:"intensity_pct_vo2max,omitempty" validate:"omitempty,gte=20,lte=100"`
	// AveragePowerW is the expected mean power (cycling): the event's energy
	// then comes from mechanical work and efficiency.
	AveragePowerW *float64 `json:"average_power_w,omitempty" validate:"omitempty,gt=0,lte=2000"`
	// Segments are the legs of a multi-sport event in race order (swim,
	// cycle, run and the transitions); Stages are the days of a stage race.
	// An event has one or the other, or neither.
	Segments []Segment `json:"segments,omitempty" validate:"omitempty,max=12,dive"`
	Stages   []Stage   `json:"stages,omitempty" validate:"omitempty,max=21,dive"`
}

// TrainingSession is one logged or planned session. Intensity is one of
// easy, moderate, hard, rpe:N (1–10) or pct:N (%VO2max, 20–100).
type TrainingSession struct {
	Date        string  `json:"date" validate:"required,datetime=2006-01-02"`
	Start       string  `json:"start,omitempty" validate:"omitempty,datetime=15:04"`
	DurationMin float64 `json:"duration_min" validate:"gte=0,lte=1440"`
	Modality    string  `json:"modality,omitempty" validate:"omitempty,oneof=run cycle swim row ski triathlon team strength other"`
	Intensity   string  `json:"intensity,omitempty"`
	// TrainLow marks a session the dietitian keeps deliberately unfuelled.
	TrainLow bool `json:"train_low,omitempty"`
	// AveragePowerW is the session's recorded mean power. For a cycling
	// session it sets the energy from mechanical work and efficiency, as
	// for a cycling event; other modalities keep their own model.
	AveragePowerW *float64 `json:"average_power_w,omitempty" validate:"omitempty,gt=0,lte=2000"`
}

// DayOverride is a dietitian's change to one day's targets.
// EatingOccasions counts the day's feeds as Request.EatingOccasions does.
type DayOverride struct {
	Date            string   `json:"date" validate:"required,datetime=2006-01-02"`
	ChoGPerKg       *float64 `json:"cho_g_per_kg,omitempty" validate:"omitempty,gte=0,lte=20"`
	EatingOccasions *int     `json:"eating_occasions,omitempty" validate:"omitempty,gte=1,lte=10"`
}

// FeedOverride is a dietitian's change to one feed: the Index-th (0-based)
// feed of the day Date.
type FeedOverride struct {
	Date  string   `json:"date" validate:"required,datetime=2006-01-02"`
	Index int      `json:"index" validate:"gte=0,lte=30"`
	At    string   `json:"at,omitempty" validate:"omitempty,datetime=15:04"`
	ChoG  *float64 `json:"cho_g,omitempty" validate:"omitempty,gte=0,lte=1000"`
}

// Plan is the computed answer. Figures that do not apply are null in JSON,
// never a silent zero.
type Plan struct {
	Kind              string  `json:"kind"`
	Protocol          string  `json:"protocol,omitempty"`
	TimeZone          string  `json:"time_zone"`
	BodyMassKg        float64 `json:"body_mass_kg"`
	FatFreeMassKg     float64 `json:"fat_free_mass_kg"`     // null in JSON when FatFreeMassMethod is "none"
	FatFreeMassMethod string  `json:"fat_free_mass_method"` // "measured body fat" | "Boer 1984 estimate" | "none"

	Days               []Day         `json:"days"`
	PreEventMeal       *PreEventMeal `json:"pre_event_meal"`
	PreEventCaffeine   *Caffeine     `json:"pre_event_caffeine"`
	Stages             []StagePlan   `json:"stages,omitempty"`
	DuringEvent        *DuringEvent  `json:"during_event"`
	Repletion          *Repletion    `json:"repletion"`
	Glycogen           *Glycogen     `json:"glycogen"`
	ExpectedMassGainKg *float64      `json:"expected_mass_gain_kg"`
	// ExpectedMassGainKgMax is the top of the range: ExpectedMassGainKg
	// counts 3 g of water per g of glycogen gained, this one 4.
	ExpectedMassGainKgMax *float64  `json:"expected_mass_gain_kg_max"`
	Findings              []Finding `json:"findings"`
	Caution               string    `json:"caution"`
}

// MarshalJSON writes fat_free_mass_kg as null when it is unknown.
func (p Plan) MarshalJSON() ([]byte, error) {
	type plain Plan
	out := struct {
		plain
		FatFreeMassKg *float64 `json:"fat_free_mass_kg"`
	}{plain: plain(p)}
	if p.FatFreeMassMethod != FFMNone {
		v := p.FatFreeMassKg
		out.FatFreeMassKg = &v
	}
	return json.Marshal(out)
}

// Day is one plan day.
type Day struct {
	Date        string  `json:"date"`
	Role        string  `json:"role"` // taper|load|event|recovery|training|repletion
	TrainingMin float64 `json:"training_min"`
	LoadBand    string  `json:"load_band"` // light|moderate|high|very-high|rest, from the day's training
	// BandMin/MaxGPerKg is the range the day's carbohydrate is checked
	// against: the load band's, or on load days the loading range 10–12.
	BandMinGPerKg float64 `json:"band_min_g_per_kg"`
	BandMaxGPerKg float64 `json:"band_max_g_per_kg"`
	ChoGPerKg     float64 `json:"cho_g_per_kg"`
	ChoG          float64 `json:"cho_g"`
	ProteinG      float64 `json:"protein_g"`
	FatG          float64 `json:"fat_g"`
	EnergyKcal    float64 `json:"energy_kcal"`
	// ExerciseEnergyKcal is the estimated energy cost of the day's training
	// (null when it cannot be estimated).
	ExerciseEnergyKcal *float64 `json:"exercise_energy_kcal"`
	// EnergyAvailability is (intake − exercise energy) / fat-free mass in
	// kcal/kg FFM/day, null when fat-free mass or exercise energy is unknown.
	EnergyAvailability *float64 `json:"energy_availability_kcal_per_kg_ffm"`
	LowFibre           bool     `json:"low_fibre"`
	Advice             []string `json:"advice"`
	Feeds              []Feed   `json:"feeds"`
	Overridden         bool     `json:"overridden"`
	// Sessions are the day's long sessions (90 min or more) with their
	// fuelling, or their train-low mark.
	Sessions []SessionFuel `json:"sessions,omitempty"`
}

// Feed is one eating occasion.
type Feed struct {
	At time.Time `json:"at"`
	// Label: breakfast, snack, lunch, dinner, supper, pre-event meal,
	// during event (the in-event total, at the start, or for an event with
	// legs at the first leg where one eats), recovery, refuel.
	Label      string  `json:"label"`
	ChoG       float64 `json:"cho_g"`
	ProteinG   float64 `json:"protein_g"`
	Overridden bool    `json:"overridden"`
}

// PreEventMeal is the meal 1–4 h before the start. Before a start just
// after midnight it falls on the evening before, and is listed among that
// day's feeds.
type PreEventMeal struct {
	At          time.Time `json:"at"`
	HoursBefore float64   `json:"hours_before"`
	ChoGPerKg   float64   `json:"cho_g_per_kg"`
	ChoG        float64   `json:"cho_g"`
}

// DuringEvent is the in-event fuelling plan.
type DuringEvent struct {
	DurationMin float64 `json:"duration_min"`
	ChoGPerH    float64 `json:"cho_g_per_h"`
	TotalChoG   float64 `json:"total_cho_g"`
	Band        string  `json:"band"` // none|small|30-60|up-to-90
	Overridden  bool    `json:"overridden"`
	EnergyKcal  float64 `json:"energy_kcal"`
	ChoShare    float64 `json:"cho_share"`  // share of energy from carbohydrate, 0–1
	ChoUsedG    float64 `json:"cho_used_g"` // carbohydrate oxidised over the event
	// Segments is the plan per leg of a multi-sport event.
	Segments []SegmentPlan `json:"segments,omitempty"`
	// Blocks splits an event of over a day into blocks of hours, nights
	// marked, each with its grams.
	Blocks []HourBlock `json:"blocks,omitempty"`
}

// Repletion is the plan from the end of one session to the next start.
type Repletion struct {
	GapH               float64 `json:"gap_h"`
	Speedy             bool    `json:"speedy"`
	ChoGPerKgPerH      float64 `json:"cho_g_per_kg_per_h"` // null in JSON unless Speedy
	Feeds              []Feed  `json:"feeds"`
	MuscleGAtNextStart float64 `json:"muscle_g_at_next_start"`
	// The working muscle's share: at the session's end and at the next start.
	WorkingMuscleGAtEnd       float64 `json:"working_muscle_g_at_end"`
	WorkingMuscleGAtNextStart float64 `json:"working_muscle_g_at_next_start"`
	// The same as densities, mmol glucosyl per kg wet working muscle: the
	// unit studies report, to compare with the depleted, typical and
	// loaded bands.
	WorkingMuscleMmolPerKgAtEnd       float64 `json:"working_muscle_mmol_per_kg_at_end"`
	WorkingMuscleMmolPerKgAtNextStart float64 `json:"working_muscle_mmol_per_kg_at_next_start"`
	// SessionSimulated tells whether the session that ended was found in
	// the training log and simulated (otherwise its end state is assumed).
	SessionSimulated bool `json:"session_simulated"`
	// Caffeine is the dietitian's optional caffeine with the refuelling.
	Caffeine        *Caffeine       `json:"caffeine,omitempty"`
	MuscleGCapacity float64         `json:"muscle_g_capacity"`
	Curve           []GlycogenPoint `json:"curve"`
}

// MarshalJSON writes cho_g_per_kg_per_h as null when the speedy protocol
// does not apply.
func (r Repletion) MarshalJSON() ([]byte, error) {
	type plain Repletion
	out := struct {
		plain
		ChoGPerKgPerH *float64 `json:"cho_g_per_kg_per_h"`
	}{plain: plain(r)}
	if r.Speedy {
		v := r.ChoGPerKgPerH
		out.ChoGPerKgPerH = &v
	}
	return json.Marshal(out)
}

// Glycogen is the store picture at the start line.
type Glycogen struct {
	MuscleGStart    float64 `json:"muscle_g_start"`
	LiverGStart     float64 `json:"liver_g_start"`
	MuscleGCapacity float64 `json:"muscle_g_capacity"`
	// WorkingMuscleGStart is the part of MuscleGStart in the working muscle:
	// with the liver, what the event can draw on.
	WorkingMuscleGStart float64 `json:"working_muscle_g_start"`
	// WorkingMuscleMmolPerKgStart is the working muscle's glycogen density
	// at the start, mmol glucosyl per kg wet muscle.
	WorkingMuscleMmolPerKgStart float64 `json:"working_muscle_mmol_per_kg_start"`
	// Where the stores would run out in the event (null when they last).
	RunsOutAtKm            *float64 `json:"runs_out_at_km"`
	RunsOutAtMin           *float64 `json:"runs_out_at_min"`
	RunsOutWithIntakeAtKm  *float64 `json:"runs_out_with_intake_at_km"`
	RunsOutWithIntakeAtMin *float64 `json:"runs_out_with_intake_at_min"`
	// UsualIntakeMuscleGStart is the muscle glycogen at the start had the
	// athlete eaten their usual training-load intake instead of this plan.
	UsualIntakeMuscleGStart *float64        `json:"usual_intake_muscle_g_start"`
	Curve                   []GlycogenPoint `json:"curve"`
}

// GlycogenPoint is one sample of the simulated stores.
type GlycogenPoint struct {
	At      time.Time `json:"at"`
	MuscleG float64   `json:"muscle_g"`
	LiverG  float64   `json:"liver_g"`
}

// Finding is one check of a plan figure against a guideline.
type Finding struct {
	Code    string `json:"code"`
	Level   string `json:"level"` // ok|note|caution|outside
	Message string `json:"message"`
	Source  string `json:"source"`
	// Subject names the value the finding concerns: "day:2027-04-16",
	// "feed:2027-04-16:2", "pre_event_meal", "during_event", "repletion",
	// "glycogen", "plan".
	Subject string `json:"subject"`
	// Masses are the body masses, or changes of one, that Message names, in
	// kg and in the order they appear; MassText is Message's text around
	// them, one piece more than Masses. The engine works in kg only, so a
	// view writes each figure in the unit the client is weighed in by
	// joining the pieces itself. Message keeps the kg figures: the API's
	// reading, and the one left for a version stored before these fields.
	Masses   []MassFigure `json:"masses,omitempty"`
	MassText []string     `json:"mass_text,omitempty"`
}

// MassFigure is a body mass, or a range of one (the expected gain from
// loading), named by a finding. MaxKg is the top of a range, 0 for a single
// figure.
type MassFigure struct {
	Kg    float64 `json:"kg"`
	MaxKg float64 `json:"max_kg,omitempty"`
}

// Finding levels.
const (
	LevelOK      = "ok"
	LevelNote    = "note"
	LevelCaution = "caution"
	LevelOutside = "outside"
)

// Fat-free mass methods.
const (
	FFMMeasured = "measured body fat"
	FFMBoer     = "Boer 1984 estimate"
	FFMNone     = "none"
)

// Plan kinds.
const (
	KindLoading   = "loading"
	KindRace      = "race"
	KindRepletion = "repletion"
	KindWeek      = "week"
)

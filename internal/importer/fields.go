package importer

import (
	"strings"
	"unicode"
)

// Kind is what a CSV file holds.
type Kind string

// Kinds of CSV import.
const (
	KindBodyMass Kind = "body_mass"
	KindTraining Kind = "training"
)

// Field keys: the things a column can hold. Ignore marks a column the
// person chose to leave out.
const (
	FieldClient    = "client"
	FieldBirth     = "date_of_birth"
	FieldDate      = "date"
	FieldMass      = "mass"
	FieldUnit      = "unit"
	FieldBodyFat   = "body_fat"
	FieldMethod    = "method"
	FieldStart     = "start"
	FieldModality  = "modality"
	FieldDuration  = "duration"
	FieldDistance  = "distance"
	FieldRPE       = "rpe"
	FieldZone      = "zone"
	FieldPctVO2max = "pct_vo2max"
	FieldHeartRate = "avg_hr"
	FieldPower     = "avg_power"
	FieldStatus    = "status"
	FieldNotes     = "notes"
	Ignore         = "ignore"
)

// FieldInfo describes one field for the mapping step.
type FieldInfo struct {
	Key      string
	Label    string
	Required bool
}

// Fields lists what a file of the kind may hold, in template order. With
// practice set, the client's name and date of birth come first.
func Fields(kind Kind, practice bool) []FieldInfo {
	var fs []FieldInfo
	if practice {
		fs = append(fs, FieldInfo{FieldClient, "Client name", true}, FieldInfo{FieldBirth, "Client date of birth", true})
	}
	switch kind {
	case KindBodyMass:
		fs = append(fs,
			FieldInfo{FieldDate, "Date", true},
			FieldInfo{FieldMass, "Body mass", true},
			FieldInfo{FieldUnit, "Unit (kg or lb)", false},
			FieldInfo{FieldBodyFat, "Body fat %", false},
			FieldInfo{FieldMethod, "Method", false},
		)
	case KindTraining:
		fs = append(fs,
			FieldInfo{FieldDate, "Date", true},
			FieldInfo{FieldStart, "Start time", false},
			FieldInfo{FieldModality, "Activity", true},
			FieldInfo{FieldDuration, "Duration", true},
			FieldInfo{FieldDistance, "Distance", false},
			FieldInfo{FieldRPE, "RPE (1–10)", false},
			FieldInfo{FieldZone, "Zone", false},
			FieldInfo{FieldPctVO2max, "% VO2max", false},
			FieldInfo{FieldHeartRate, "Average heart rate", false},
			FieldInfo{FieldPower, "Average power", false},
			FieldInfo{FieldStatus, "Planned or done", false},
			FieldInfo{FieldNotes, "Notes", false},
		)
	}
	return fs
}

// TemplateHeader is the header row of the downloadable template.
func TemplateHeader(kind Kind, practice bool) []string {
	var h []string
	for _, f := range Fields(kind, practice) {
		switch f.Key {
		case FieldMass:
			h = append(h, "body mass")
		case FieldDuration:
			h = append(h, "duration (min)")
		case FieldDistance:
			h = append(h, "distance (km)")
		case FieldHeartRate:
			h = append(h, "avg heart rate")
		case FieldPower:
			h = append(h, "avg power")
		case FieldPctVO2max:
			h = append(h, "% vo2max")
		case FieldBodyFat:
			h = append(h, "body fat %")
		case FieldStart:
			h = append(h, "start time")
		case FieldBirth:
			h = append(h, "date of birth")
		case FieldModality:
			h = append(h, "activity")
		default:
			h = append(h, f.Key)
		}
	}
	return h
}

// synonyms maps a normalised header (see normHeader) to a field. Units in
// a header ("mass (lb)", "distance_mi") are split off before the lookup.
var synonyms = map[string]string{
	"client": FieldClient, "client name": FieldClient, "name": FieldClient, "athlete": FieldClient, "athlete name": FieldClient,
	"date of birth": FieldBirth, "dob": FieldBirth, "birth date": FieldBirth, "birthdate": FieldBirth, "born": FieldBirth,

	"date": FieldDate, "day": FieldDate, "measured on": FieldDate, "measurement date": FieldDate, "on": FieldDate,
	"session date": FieldDate, "training date": FieldDate, "start date": FieldDate,

	"mass": FieldMass, "body mass": FieldMass, "weight": FieldMass, "body weight": FieldMass, "bodyweight": FieldMass, "bm": FieldMass,
	// Larder's own export: masses are in kg; the unit once typed is information only.
	"entered unit": Ignore,
	// and for a client weighed in pounds the same mass in lb beside the kg.
	"body mass (lb, from kg)": Ignore,
	"source":                  Ignore,
	"unit":                    FieldUnit, "units": FieldUnit, "mass unit": FieldUnit, "weight unit": FieldUnit,
	"body fat": FieldBodyFat, "body fat %": FieldBodyFat, "body fat percent": FieldBodyFat, "fat %": FieldBodyFat, "bf %": FieldBodyFat, "bf": FieldBodyFat, "fat": FieldBodyFat,
	"method": FieldMethod, "how measured": FieldMethod, "scale": FieldMethod,

	"start": FieldStart, "start time": FieldStart, "time": FieldStart, "time of day": FieldStart, "started": FieldStart,
	"modality": FieldModality, "activity": FieldModality, "sport": FieldModality, "type": FieldModality, "activity type": FieldModality, "discipline": FieldModality,
	"duration": FieldDuration, "time taken": FieldDuration, "moving time": FieldDuration, "elapsed time": FieldDuration, "length": FieldDuration, "minutes": FieldDuration,
	"distance": FieldDistance, "dist": FieldDistance,
	"rpe": FieldRPE, "effort": FieldRPE, "perceived exertion": FieldRPE, "session rpe": FieldRPE,
	"zone": FieldZone, "intensity zone": FieldZone, "training zone": FieldZone,
	"% vo2max": FieldPctVO2max, "vo2max %": FieldPctVO2max, "pct vo2max": FieldPctVO2max, "percent vo2max": FieldPctVO2max,
	"avg hr": FieldHeartRate, "average hr": FieldHeartRate, "avg heart rate": FieldHeartRate, "average heart rate": FieldHeartRate, "heart rate": FieldHeartRate, "hr": FieldHeartRate, "mean hr": FieldHeartRate,
	"avg power": FieldPower, "average power": FieldPower, "power": FieldPower, "mean power": FieldPower,
	"status": FieldStatus, "planned or done": FieldStatus, "done": FieldStatus,
	"notes": FieldNotes, "note": FieldNotes, "comment": FieldNotes, "comments": FieldNotes, "description": FieldNotes,
}

// unitWords are units that may follow a header name; each is kept as the
// column's unit.
var unitWords = map[string]string{
	"kg": "kg", "kgs": "kg", "lb": "lb", "lbs": "lb", "pounds": "lb", "kilograms": "kg",
	"km": "km", "mi": "mi", "miles": "mi", "m": "m", "metres": "m", "meters": "m",
	"min": durMinutes, "mins": durMinutes, "minutes": durMinutes, "s": durSeconds, "sec": durSeconds, "secs": durSeconds, "seconds": durSeconds,
	"h": durHours, "hr": durHours, "hrs": durHours, "hours": durHours,
	"bpm": "bpm", "w": "w", "watts": "w", "%": "%",
}

// NormHeader lowercases a header, folds separators to single spaces and
// drops a byte-order mark, so "Body_Mass" and " body  mass" match.
func NormHeader(h string) string {
	h = strings.TrimPrefix(h, "\ufeff")
	h = strings.ToLower(h)
	var b strings.Builder
	space := false
	for _, r := range h {
		if r == '_' || r == '-' || r == '.' || unicode.IsSpace(r) {
			space = true
			continue
		}
		if space && b.Len() > 0 {
			b.WriteByte(' ')
		}
		space = false
		b.WriteRune(r)
	}
	return b.String()
}

// recognise names the field a header stands for and the unit it carries
// ("Mass (lb)" → mass, lb). field is "" for a header not recognised.
func recognise(header string) (field, unit string) {
	h := NormHeader(header)
	// A unit in brackets: "mass (kg)", "distance [mi]".
	if i := strings.IndexAny(h, "(["); i >= 0 {
		inner := strings.Trim(h[i:], "()[] ")
		if u, ok := unitWords[inner]; ok {
			unit = u
			h = strings.TrimSpace(h[:i])
		}
	}
	if f, ok := synonyms[h]; ok {
		if f == FieldDuration && h == "minutes" {
			unit = durMinutes
		}
		return f, unit
	}
	// A unit as the last word: "mass kg", "distance mi", "duration min".
	if i := strings.LastIndexByte(h, ' '); i > 0 {
		if u, ok := unitWords[h[i+1:]]; ok && unit == "" {
			if f, ok := synonyms[h[:i]]; ok {
				return f, u
			}
		}
	}
	return "", unit
}

// modalities maps the words people use for an activity to the modality
// names of the training log.
var modalities = map[string]string{
	"run": "run", "running": "run", "jog": "run", "jogging": "run", "trail run": "run", "trail running": "run", "treadmill": "run", "track": "run",
	"cycle": "cycle", "cycling": "cycle", "bike": "cycle", "biking": "cycle", "ride": "cycle", "road cycling": "cycle", "mountain biking": "cycle",
	"mtb": "cycle", "indoor cycling": "cycle", "virtual ride": "cycle", "gravel": "cycle", "e bike": "cycle",
	"swim": "swim", "swimming": "swim", "open water": "swim", "open water swimming": "swim", "pool swim": "swim", "lap swimming": "swim",
	"row": "row", "rowing": "row", "erg": "row", "indoor rowing": "row", "kayak": "row", "kayaking": "row", "paddling": "row",
	"ski": "ski", "skiing": "ski", "cross country skiing": "ski", "xc ski": "ski", "xc skiing": "ski", "nordic skiing": "ski", "cross country ski": "ski",
	"triathlon": "triathlon", "multisport": "triathlon", "duathlon": "triathlon",
	"team": "team", "team sport": "team", "football": "team", "soccer": "team", "rugby": "team", "hockey": "team", "basketball": "team",
	"netball": "team", "handball": "team", "volleyball": "team",
	"strength": "strength", "gym": "strength", "weights": "strength", "strength training": "strength", "resistance": "strength", "lifting": "strength",
	"other": "other", "walk": "other", "walking": "other", "hike": "other", "hiking": "other", "yoga": "other",
}

// Modality names the training-log modality for an activity word, or "".
func Modality(word string) string { return modalities[NormHeader(word)] }

// zones are the named training zones of the training log.
var zones = map[string]string{
	"recovery": "recovery", "easy": "recovery", "z1": "recovery", "1": "recovery",
	"endurance": "endurance", "z2": "endurance", "2": "endurance", "aerobic": "endurance",
	"tempo": "tempo", "z3": "tempo", "3": "tempo",
	"threshold": "threshold", "z4": "threshold", "4": "threshold",
	"maximal": "maximal", "max": "maximal", "z5": "maximal", "5": "maximal", "vo2max": "maximal",
}

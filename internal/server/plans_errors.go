package server

import (
	"errors"
	"strings"

	"larder/internal/forms"
	"larder/internal/fuel"
)

// The engine's field errors, put beside the form input they concern in the
// form's own words.

// mapRequestError puts the engine's field errors beside the form's inputs.
func mapRequestError(f forms.Form, err error) {
	var ve fuel.ValidationError
	if !errors.As(err, &ve) {
		f.Errors.Add("general", "The plan could not be computed: "+err.Error())
		return
	}
	names := map[string]string{
		"athlete.body_mass_kg": "body_mass_kg", "athlete.height_cm": "height_cm", "athlete.body_fat_pct": "body_fat_pct",
		"athlete.vo2max_ml_kg_min": "vo2max", "event.intensity_pct_vo2max": "intensity_pct", "protocol": "protocol",
		"session_end": "session_end", "next_start": "next_start", "time_zone": "time_zone", "start_date": "start_date",
		"days": "days", "taper_days": "taper_days", "eating_occasions": "eating_occasions",
		"caffeine_mg_per_kg": "caffeine_mg_per_kg",
	}
	for _, fe := range ve {
		name, ok := names[fe.Field]
		if !ok && strings.HasPrefix(fe.Field, "event") {
			name, ok = "event_id", true
		}
		if !ok {
			name = "general"
		}
		f.Errors.Add(name, fieldWords(fe))
	}
}

// engineWords replaces the engine's field keys, which it names for the
// JSON API, with the words the form uses.
var engineWords = strings.NewReplacer(
	"session_end", "the end of the session",
	"cho_g_per_kg", "carbohydrate g/kg",
	"eating_occasions", "eating occasions",
)

// recordWords names, in the form's words, the record a field error of the
// engine is about when that record is edited on the client's page.
func recordWords(field string) (string, bool) {
	switch {
	case strings.HasPrefix(field, "training"):
		return "A session in the training log", true
	case field == "event.distance_km":
		return "The event's distance", true
	case field == "event.expected_duration_min":
		return "The event's expected duration", true
	case field == "event.starts_at":
		return "The event's start", true
	case strings.HasPrefix(field, "event"):
		return "The event", true
	}
	return "", false
}

// fieldWords phrases an engine field error as a sentence.
func fieldWords(fe fuel.FieldError) string {
	msg := engineWords.Replace(fe.Message)
	if !strings.HasSuffix(msg, ".") {
		msg += "."
	}
	if who, ok := recordWords(fe.Field); ok {
		return who + " " + msg + " Change it on the client's page."
	}
	if msg != "" {
		msg = strings.ToUpper(msg[:1]) + msg[1:]
	}
	return msg
}

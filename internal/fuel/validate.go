package fuel

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"reflect"
	"strconv"
	"strings"
	"sync"
	"time"
	_ "time/tzdata" // time_zone must resolve the same on every host

	"larder/internal/mass"

	"github.com/go-playground/validator/v10"
)

// FieldError names one field at fault and why, in plain words.
type FieldError struct {
	Field   string `json:"field"`   // like "athlete.body_mass_kg", "training[2].intensity"
	Message string `json:"message"` // plain words
}

// ValidationError lists every field at fault in a request.
type ValidationError []FieldError

func (v ValidationError) Error() string {
	parts := make([]string, len(v))
	for i, f := range v {
		parts[i] = f.Field + ": " + f.Message
	}
	return "invalid request: " + strings.Join(parts, "; ")
}

// maxSessionsPerDay bounds the training sessions of one day.
const maxSessionsPerDay = 6

func protocolName(p string) string {
	if p == "" {
		return ProtocolTwoDay
	}
	return p
}

// MaxRequestBytes bounds what DecodeRequest reads.
const MaxRequestBytes = 1 << 20

var (
	validateOnce sync.Once
	validate     *validator.Validate
)

func validatorInstance() *validator.Validate {
	validateOnce.Do(func() {
		validate = validator.New(validator.WithRequiredStructEnabled())
		validate.RegisterTagNameFunc(func(f reflect.StructField) string {
			name, _, _ := strings.Cut(f.Tag.Get("json"), ",")
			if name == "-" {
				return ""
			}
			return name
		})
	})
	return validate
}

// DecodeRequest decodes one JSON request strictly (unknown fields and
// trailing data are rejected) and validates it. Every error is a
// ValidationError.
func DecodeRequest(r io.Reader) (Request, error) {
	var req Request
	data, err := io.ReadAll(io.LimitReader(r, MaxRequestBytes+1))
	if err != nil {
		return req, ValidationError{{Field: "request", Message: "could not be read: " + err.Error()}}
	}
	if len(data) > MaxRequestBytes {
		return req, ValidationError{{Field: "request", Message: "is larger than 1 MB"}}
	}
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&req); err != nil {
		return Request{}, decodeError(data, err)
	}
	if dec.More() {
		return Request{}, ValidationError{{Field: "request", Message: "must hold exactly one JSON object"}}
	}
	if err := req.Validate(); err != nil {
		return req, err
	}
	return req, nil
}

// decodeError turns a json error into a ValidationError naming the field.
func decodeError(data []byte, err error) error {
	var typeErr *json.UnmarshalTypeError
	var syntaxErr *json.SyntaxError
	switch {
	case errors.As(err, &typeErr):
		field := typeErr.Field
		if field == "" {
			field = "request"
		}
		return ValidationError{{Field: field, Message: "must be " + jsonKindWord(typeErr.Type) + ", not a JSON " + typeErr.Value}}
	case errors.As(err, &syntaxErr):
		return ValidationError{{Field: "request", Message: fmt.Sprintf("is not valid JSON (near byte %d)", syntaxErr.Offset)}}
	case errors.Is(err, io.EOF):
		return ValidationError{{Field: "request", Message: "is empty; send one JSON object"}}
	case errors.Is(err, io.ErrUnexpectedEOF):
		return ValidationError{{Field: "request", Message: "ends too early; the JSON is incomplete"}}
	}
	msg := err.Error()
	if name, ok := strings.CutPrefix(msg, "json: unknown field "); ok {
		return ValidationError{{Field: strings.Trim(name, `"`), Message: "is not a known field"}}
	}
	// A time that does not parse: find which one.
	if fe := findBadTimes(data); len(fe) > 0 {
		return fe
	}
	return ValidationError{{Field: "request", Message: "could not be read: " + strings.TrimPrefix(msg, "json: ")}}
}

func jsonKindWord(t reflect.Type) string {
	if t == nil {
		return "another type"
	}
	if t == reflect.TypeFor[time.Time]() {
		return "a date and time like 2027-04-18T08:00:00+02:00"
	}
	switch t.Kind() {
	case reflect.Float32, reflect.Float64:
		return "a number"
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64,
		reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64:
		return "a whole number"
	case reflect.String:
		return "text"
	case reflect.Bool:
		return "true or false"
	case reflect.Slice, reflect.Array:
		return "a list"
	case reflect.Struct, reflect.Map:
		return "an object"
	case reflect.Pointer:
		return jsonKindWord(t.Elem())
	}
	return "another type"
}

// findBadTimes names the RFC 3339 fields of a request that do not parse.
func findBadTimes(data []byte) ValidationError {
	var raw struct {
		Event *struct {
			StartsAt json.RawMessage `json:"starts_at"`
		} `json:"event"`
		SessionEnd json.RawMessage `json:"session_end"`
		NextStart  json.RawMessage `json:"next_start"`
	}
	if json.Unmarshal(data, &raw) != nil {
		return nil
	}
	var out ValidationError
	check := func(field string, v json.RawMessage) {
		if len(v) == 0 || string(v) == "null" {
			return
		}
		var t time.Time
		if t.UnmarshalJSON(v) != nil {
			out = append(out, FieldError{Field: field, Message: "must be a date and time with its offset, like 2027-04-18T08:00:00+02:00"})
		}
	}
	if raw.Event != nil {
		check("event.starts_at", raw.Event.StartsAt)
	}
	check("session_end", raw.SessionEnd)
	check("next_start", raw.NextStart)
	return out
}

// Validate checks a request: struct rules first (validator tags), then the
// checks that need more than one field. It returns a ValidationError or nil.
func (r Request) Validate() error {
	var out ValidationError
	if err := validatorInstance().Struct(r); err != nil {
		var verrs validator.ValidationErrors
		if !errors.As(err, &verrs) {
			return ValidationError{{Field: "request", Message: err.Error()}}
		}
		for _, fe := range verrs {
			out = append(out, FieldError{Field: fieldName(fe), Message: plainMessage(fe)})
		}
	}
	out = append(out, r.handChecks()...)
	out = append(out, r.eventChecks()...)
	if len(out) == 0 {
		return nil
	}
	return out
}

func fieldName(fe validator.FieldError) string {
	ns := fe.Namespace()
	if _, rest, ok := strings.Cut(ns, "."); ok {
		return rest
	}
	return ns
}

// units gives the unit words for numeric fields in messages.
var units = map[string]string{
	"body_mass_kg": "kg", "height_cm": "cm", "body_fat_pct": "%", "vo2max_ml_kg_min": "ml/kg/min",
	"distance_km": "km", "expected_duration_min": "min", "intensity_pct_vo2max": "% of VO2max",
	"duration_min": "min", "cho_g_per_kg": "g/kg", "cho_g": "g", "during_event_cho_g_per_h": "g/h",
	"taper_days": "days", "days": "days", "average_power_w": "W",
	"caffeine_mg_per_kg": "mg/kg", "repletion_caffeine_mg_per_kg": "mg/kg", "cho_g_per_h": "g/h",
}

func plainMessage(fe validator.FieldError) string {
	unit := ""
	if u, ok := units[fe.Field()]; ok {
		unit = " " + u
	}
	isList := fe.Kind() == reflect.Slice
	isText := fe.Kind() == reflect.String
	switch fe.Tag() {
	case "required":
		return "is required"
	case "oneof":
		return "must be one of: " + strings.ReplaceAll(fe.Param(), " ", ", ")
	case "gte":
		return "must be at least " + fe.Param() + unit
	case "lte":
		return "must be at most " + fe.Param() + unit
	case "gt":
		return "must be more than " + fe.Param() + unit
	case "lt":
		return "must be less than " + fe.Param() + unit
	case "max":
		if isList {
			return "may hold at most " + fe.Param() + " entries"
		}
		if isText {
			return "must be at most " + fe.Param() + " characters"
		}
		return "must be at most " + fe.Param() + unit
	case "datetime":
		if fe.Param() == "15:04" {
			return "must be a clock time like 07:00"
		}
		return "must be a date like 2027-04-16"
	}
	return "is not valid (" + fe.Tag() + ")"
}

// handChecks are the rules that span fields or need parsing.
func (r Request) handChecks() ValidationError {
	var out ValidationError
	add := func(field, msg string) { out = append(out, FieldError{Field: field, Message: msg}) }

	// The body-mass range is the one every form and the database use.
	if m := r.Athlete.BodyMassKg; m != 0 && !mass.InRange(m) {
		add("athlete.body_mass_kg", "must be from "+mass.Span(mass.KG))
	}
	if r.Event != nil && r.Event.StartsAt.IsZero() {
		add("event.starts_at", "is required")
	}
	switch r.Kind {
	case KindLoading, KindRace:
		if r.Event == nil {
			add("event", "is required for a "+r.Kind+" plan")
		}
	case KindRepletion:
		if r.SessionEnd == nil {
			add("session_end", "is required for a repletion plan")
		}
		if r.NextStart == nil {
			add("next_start", "is required for a repletion plan")
		}
		if r.SessionEnd != nil && r.NextStart != nil {
			gap := r.NextStart.Sub(*r.SessionEnd)
			switch {
			case gap <= 0:
				add("next_start", "must be after session_end")
			case gap > 72*time.Hour:
				add("next_start", "must be within 72 hours of session_end")
			}
		}
	case KindWeek:
		if r.StartDate == "" && len(r.Training) == 0 {
			add("start_date", "is required for a week plan without training")
		}
	}
	yearOK := func(field string, t time.Time) {
		if y := t.Year(); y < 2000 || y > 2100 {
			add(field, "must be a date between the years 2000 and 2100")
		}
	}
	if r.Event != nil && !r.Event.StartsAt.IsZero() {
		yearOK("event.starts_at", r.Event.StartsAt)
	}
	if r.SessionEnd != nil {
		yearOK("session_end", *r.SessionEnd)
	}
	if r.NextStart != nil {
		yearOK("next_start", *r.NextStart)
	}
	perDay := map[string]int{}
	for i, s := range r.Training {
		if d, err := time.Parse("2006-01-02", s.Date); err == nil {
			yearOK(fmt.Sprintf("training[%d].date", i), d)
		}
		perDay[s.Date]++
		if perDay[s.Date] == maxSessionsPerDay+1 {
			add(fmt.Sprintf("training[%d].date", i), fmt.Sprintf("has more than %d sessions on one day", maxSessionsPerDay))
		}
	}
	if r.StartDate != "" {
		if d, err := time.Parse("2006-01-02", r.StartDate); err == nil {
			yearOK("start_date", d)
		}
	}
	if r.Kind == KindLoading && r.TaperDays > 0 && r.TaperDays < loadDaysOf(r.Protocol) {
		add("taper_days", fmt.Sprintf("must be at least %d, the load days of the %s protocol", loadDaysOf(r.Protocol), protocolName(r.Protocol)))
	}
	if r.TimeZone != "" {
		if _, err := loadLocation(r.TimeZone); err != nil {
			add("time_zone", "is not a known time zone name (use one like Europe/Berlin)")
		}
	}
	for i, s := range r.Training {
		if s.Intensity != "" {
			if _, err := parseIntensity(s.Intensity); err != nil {
				add(fmt.Sprintf("training[%d].intensity", i), err.Error())
			}
		}
	}
	seen := map[string]bool{}
	for i, o := range r.Overrides {
		if seen[o.Date] {
			add(fmt.Sprintf("overrides[%d].date", i), "appears twice; give one override per day")
		}
		seen[o.Date] = true
		if o.ChoGPerKg == nil && o.EatingOccasions == nil {
			add(fmt.Sprintf("overrides[%d]", i), "must set cho_g_per_kg or eating_occasions")
		}
	}
	seenFeed := map[string]bool{}
	for i, o := range r.FeedOverrides {
		key := o.Date + "/" + strconv.Itoa(o.Index)
		if seenFeed[key] {
			add(fmt.Sprintf("feed_overrides[%d]", i), "changes the same feed twice")
		}
		seenFeed[key] = true
		if o.At == "" && o.ChoG == nil {
			add(fmt.Sprintf("feed_overrides[%d]", i), "must set at or cho_g")
		}
	}
	return out
}

// Intensity is a parsed training intensity.
type Intensity struct {
	Word string  // easy | moderate | hard | rpe | pct
	N    float64 // the number for rpe and pct
}

func parseIntensity(s string) (Intensity, error) {
	switch s {
	case "easy", "moderate", "hard":
		return Intensity{Word: s}, nil
	}
	word, num, ok := strings.Cut(s, ":")
	if ok && (word == "rpe" || word == "pct") {
		n, err := strconv.ParseFloat(num, 64)
		if err == nil {
			if word == "rpe" && n >= 1 && n <= 10 {
				return Intensity{Word: word, N: n}, nil
			}
			if word == "pct" && n >= 20 && n <= 100 {
				return Intensity{Word: word, N: n}, nil
			}
		}
		if word == "rpe" {
			return Intensity{}, errors.New("rpe must be a number from 1 to 10, like rpe:7")
		}
		return Intensity{}, errors.New("pct must be a percentage of VO2max from 20 to 100, like pct:70")
	}
	return Intensity{}, errors.New("must be easy, moderate, hard, rpe:N (1–10) or pct:N (% of VO2max)")
}

var locations sync.Map // name → *time.Location

// loadLocation caches time zones: loading one reads the zone database.
func loadLocation(name string) (*time.Location, error) {
	if v, ok := locations.Load(name); ok {
		return v.(*time.Location), nil
	}
	loc, err := time.LoadLocation(name)
	if err != nil {
		return nil, err
	}
	locations.Store(name, loc)
	return loc, nil
}

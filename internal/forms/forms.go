// Package forms owns HTML form handling: decoding url.Values into typed
// structs, validating them with go-playground/validator tags, and turning
// each failure into one plain sentence for the field at fault. A Form keeps
// exactly what the person typed so a refused form comes back as they left it.
//
// Struct fields carry three tags:
//
//	form:"mass"        the input's name
//	label:"Body mass"  how the message names the field
//	unit:"kg"          optional; appended to range messages
//	msg:"..."          optional; replaces every message but "required"
//
// Supported field types: string (trimmed), bool (checkbox), int, *int,
// float64, *float64 (empty gives nil; a comma is read as a decimal point),
// time.Time and *time.Time (a date, YYYY-MM-DD).
//
// The decoding is written here rather than left to go-playground/form (the
// validator's sibling): each field type is read Larder's own way (text
// trimmed, a decimal comma, no exponent, a date as YYYY-MM-DD, empty as nil,
// a 32-bit range), so the library would need a custom function per type,
// and the loop over the fields would stay for what it cannot do (text the
// database cannot hold refused beside its field, zone names corrected, a
// message per field naming its limits). That is no less code than setField,
// plus a dependency.
package forms

import (
	"errors"
	"fmt"
	"net/url"
	"reflect"
	"strconv"
	"strings"
	"time"
	_ "time/tzdata"
	"unicode/utf8" // time zones work on hosts without a zoneinfo database

	"github.com/go-playground/validator/v10"
)

// Errors maps an input's name to the one message shown beside it.
type Errors map[string]string

// Add records msg for field unless the field already has a message: the
// first problem found is the one a person fixes first.
func (e Errors) Add(field, msg string) {
	if _, ok := e[field]; !ok {
		e[field] = msg
	}
}

// Any reports whether there is at least one error.
func (e Errors) Any() bool { return len(e) > 0 }

// Form is what a page needs to render a form: the values to show in the
// inputs and the messages to show beside them.
type Form struct {
	Values url.Values
	Errors Errors
}

// New returns an empty form.
func New() Form { return Form{Values: url.Values{}, Errors: Errors{}} }

// FromValues returns a form showing v, with no errors.
func FromValues(v url.Values) Form { return Form{Values: v, Errors: Errors{}} }

// Get returns the value to show in input name.
func (f Form) Get(name string) string {
	if f.Values == nil {
		return ""
	}
	return f.Values.Get(name)
}

// Err returns the message for input name, or "".
func (f Form) Err(name string) string {
	if f.Errors == nil {
		return ""
	}
	return f.Errors[name]
}

// Has reports whether there are errors.
func (f Form) Has() bool { return f.Errors.Any() }

// Checked reports whether a checkbox or radio input name holds value.
func (f Form) Checked(name, value string) bool {
	if f.Values == nil {
		return false
	}
	for _, v := range f.Values[name] {
		if v == value {
			return true
		}
	}
	return false
}

// DateLayout is the layout of <input type=date> values.
const DateLayout = "2006-01-02"

var validate = newValidator()

func newValidator() *validator.Validate {
	v := validator.New(validator.WithRequiredStructEnabled())
	v.RegisterTagNameFunc(func(f reflect.StructField) string { return f.Tag.Get("form") })
	_ = v.RegisterValidation("clock", func(fl validator.FieldLevel) bool {
		_, err := time.Parse("15:04", fl.Field().String())
		return err == nil
	})
	_ = v.RegisterValidation("iana_zone", func(fl validator.FieldLevel) bool {
		return ValidZone(fl.Field().String())
	})
	_ = v.RegisterValidation("localdatetime", func(fl validator.FieldLevel) bool {
		_, err := ParseLocalDateTime(fl.Field().String(), time.UTC)
		return err == nil
	})
	return v
}

// ValidZone reports whether name is an IANA time zone such as
// "Europe/Berlin" or "UTC" (time.LoadLocation; "Local" and "" are refused
// because they mean the server's zone, not the event's).
func ValidZone(name string) bool {
	if name == "" || name == "Local" || strings.ContainsAny(name, " \\") {
		return false
	}
	_, err := time.LoadLocation(name)
	return err == nil
}

// CanonicalZone corrects the capitals and spaces of a typed zone name
// ("europe/oslo", "America/New York", "utc") to the IANA spelling when that
// names a zone; anything else is returned as typed, for ValidZone to refuse.
func CanonicalZone(name string) string {
	name = strings.TrimSpace(name)
	if ValidZone(name) {
		return name
	}
	if up := strings.ToUpper(name); ValidZone(up) { // UTC, GMT, EST5EDT
		return up
	}
	parts := strings.Split(strings.ReplaceAll(name, " ", "_"), "/")
	for i, part := range parts {
		words := strings.Split(part, "_")
		for j, w := range words {
			if w != "" {
				words[j] = strings.ToUpper(w[:1]) + strings.ToLower(w[1:])
			}
		}
		parts[i] = strings.Join(words, "_")
	}
	if fixed := strings.Join(parts, "/"); ValidZone(fixed) {
		return fixed
	}
	return name
}

// ParseLocalDateTime reads a date and clock time as <input
// type=datetime-local> sends them ("2027-04-18T08:30", seconds optional; a
// space instead of T is accepted) in loc.
func ParseLocalDateTime(s string, loc *time.Location) (time.Time, error) {
	s = strings.Replace(strings.TrimSpace(s), " ", "T", 1)
	for _, layout := range []string{"2006-01-02T15:04", "2006-01-02T15:04:05"} {
		if t, err := time.ParseInLocation(layout, s, loc); err == nil {
			return t, nil
		}
	}
	return time.Time{}, fmt.Errorf("not a date and time: %q", s)
}

// ParseNumber reads a decimal number as people type it: spaces trimmed, a
// decimal comma accepted, no exponent, nothing infinite or NaN.
func ParseNumber(s string) (float64, error) {
	s = strings.TrimSpace(s)
	if strings.Count(s, ",") == 1 && !strings.Contains(s, ".") {
		s = strings.Replace(s, ",", ".", 1)
	}
	if s == "" || strings.ContainsAny(s, "eExXpPnNiI_") {
		return 0, fmt.Errorf("not a number: %q", s)
	}
	f, err := strconv.ParseFloat(s, 64)
	if err != nil {
		return 0, err
	}
	return f, nil
}

var (
	timeType   = reflect.TypeFor[time.Time]()
	errorsType = reflect.TypeFor[Errors]()
)

// Decode fills the struct dst points to from values, then validates it. It
// returns the form to show again (values as typed) with one message per
// field at fault; when Has() is false the struct is ready to use.
func Decode(values url.Values, dst any) Form {
	f := Form{Values: values, Errors: Errors{}}
	if f.Values == nil {
		f.Values = url.Values{}
	}
	rv := reflect.ValueOf(dst).Elem()
	rt := rv.Type()
	for i := 0; i < rt.NumField(); i++ {
		sf := rt.Field(i)
		name := sf.Tag.Get("form")
		if name == "" || name == "-" || sf.Type == errorsType {
			continue
		}
		raw := strings.TrimSpace(f.Values.Get(name))
		if BadText(raw) {
			// PostgreSQL refuses such text outright; say so beside the field
			// and show back what can be shown of it.
			f.Values.Set(name, ShowableText(f.Values.Get(name)))
			f.Errors.Add(name, BadTextMessage)
			continue
		}
		if strings.Contains(sf.Tag.Get("validate"), "iana_zone") && raw != "" {
			// Shown back as corrected, so the person sees the name that was saved.
			raw = CanonicalZone(raw)
			f.Values.Set(name, raw)
		}
		if err := setField(rv.Field(i), raw); err != nil {
			if _, hi, _, _ := rangeOf(sf); hi != "" && errors.Is(err, strconv.ErrRange) {
				// 99999999999 is a whole number, only far too big: say the limits.
				f.Errors.Add(name, Message(sf, "lte", hi))
			} else {
				f.Errors.Add(name, parseMessage(sf, raw))
			}
		}
	}
	if err := validate.Struct(dst); err != nil {
		if verrs, ok := err.(validator.ValidationErrors); ok {
			for _, fe := range verrs {
				sf, _ := rt.FieldByName(fe.StructField())
				f.Errors.Add(fe.Field(), Message(sf, fe.Tag(), fe.Param()))
			}
		} else {
			panic(err) // a programming error: dst is not a pointer to a struct
		}
	}
	return f
}

// BadTextMessage is shown beside a field whose text cannot be stored.
const BadTextMessage = "This holds characters that cannot be saved (a NUL character or damaged text); please type it again."

// BadText reports text that no database column can hold: bytes that are
// not UTF-8, or the NUL character (PostgreSQL rejects both, SQLSTATE 22021).
func BadText(s string) bool {
	return !utf8.ValidString(s) || strings.IndexByte(s, 0) >= 0
}

// ShowableText is s with damaged bytes replaced and NULs removed, for
// showing a refused value back in its input.
func ShowableText(s string) string {
	return strings.ReplaceAll(strings.ToValidUTF8(s, "\uFFFD"), "\x00", "")
}

func setField(v reflect.Value, raw string) error {
	switch {
	case v.Type() == timeType:
		if raw == "" {
			v.Set(reflect.Zero(timeType))
			return nil
		}
		t, err := time.Parse(DateLayout, raw)
		if err != nil {
			return err
		}
		v.Set(reflect.ValueOf(t))
		return nil
	case v.Kind() == reflect.Pointer:
		if raw == "" {
			v.Set(reflect.Zero(v.Type()))
			return nil
		}
		p := reflect.New(v.Type().Elem())
		if err := setField(p.Elem(), raw); err != nil {
			return err
		}
		v.Set(p)
		return nil
	}
	switch v.Kind() {
	case reflect.String:
		v.SetString(raw)
	case reflect.Bool:
		v.SetBool(raw == "on" || raw == "true" || raw == "1" || raw == "yes")
	case reflect.Int, reflect.Int64, reflect.Int32:
		if raw == "" {
			v.SetInt(0)
			return nil
		}
		n, err := strconv.ParseInt(raw, 10, 32)
		if err != nil {
			return err
		}
		v.SetInt(n)
	case reflect.Float64:
		if raw == "" {
			v.SetFloat(0)
			return nil
		}
		x, err := ParseNumber(raw)
		if err != nil {
			return err
		}
		v.SetFloat(x)
	default:
		panic("forms: unsupported field type " + v.Type().String())
	}
	return nil
}

func label(sf reflect.StructField) string {
	if l := sf.Tag.Get("label"); l != "" {
		return l
	}
	return sf.Name
}

func parseMessage(sf reflect.StructField, raw string) string {
	t := sf.Type
	if t.Kind() == reflect.Pointer {
		t = t.Elem()
	}
	switch {
	case t == timeType:
		return label(sf) + " must be a date (year-month-day)."
	case t.Kind() == reflect.Int || t.Kind() == reflect.Int64 || t.Kind() == reflect.Int32:
		return label(sf) + " must be a whole number."
	default:
		return label(sf) + " must be a number."
	}
}

// rangeOf reads the lower and upper limits from a field's validate tag.
func rangeOf(sf reflect.StructField) (lo, hi string, loStrict, hiStrict bool) {
	for _, part := range strings.Split(sf.Tag.Get("validate"), ",") {
		k, v, _ := strings.Cut(part, "=")
		switch k {
		case "gte", "min":
			lo = v
		case "gt":
			lo, loStrict = v, true
		case "lte", "max":
			hi = v
		case "lt":
			hi, hiStrict = v, true
		}
	}
	return
}

// Message turns one failed validator tag on a field into a sentence.
func Message(sf reflect.StructField, tag, param string) string {
	l := label(sf)
	unit := sf.Tag.Get("unit")
	withUnit := func(s string) string {
		if unit == "" {
			return s
		}
		return s + " " + unit
	}
	isString := sf.Type.Kind() == reflect.String
	if m := sf.Tag.Get("msg"); m != "" && !strings.HasPrefix(tag, "required") {
		return m
	}
	switch tag {
	case "required", "required_if", "required_unless", "required_with":
		if tag == "required_if" || tag == "required_with" {
			return l + " is needed here."
		}
		return l + " is required."
	case "email":
		return l + " must be an email address like name@example.org."
	case "oneof":
		return l + " must be one of: " + strings.Join(strings.Fields(param), ", ") + "."
	case "clock":
		return l + " must be a time of day like 07:30."
	case "iana_zone":
		return l + " must be a time zone name such as Europe/Berlin, America/New_York or UTC."
	case "localdatetime":
		return l + " must be a date and time like 2027-04-18 08:30."
	case "eqfield":
		return l + " does not match."
	}
	if isString {
		switch tag {
		case "max", "lte":
			return fmt.Sprintf("%s must be at most %s characters.", l, param)
		case "min", "gte":
			return fmt.Sprintf("%s must be at least %s characters.", l, param)
		}
	}
	switch tag {
	case "gt", "gte", "lt", "lte", "min", "max":
		lo, hi, loStrict, hiStrict := rangeOf(sf)
		switch {
		case lo != "" && hi != "" && !loStrict && !hiStrict:
			return fmt.Sprintf("%s must be between %s and %s.", l, lo, withUnit(hi))
		case lo != "" && hi != "":
			loW, hiW := "at least "+lo, "at most "+withUnit(hi)
			if loStrict {
				loW = "more than " + lo
			}
			if hiStrict {
				hiW = "less than " + withUnit(hi)
			}
			return fmt.Sprintf("%s must be %s and %s.", l, loW, hiW)
		case lo != "" && loStrict:
			return fmt.Sprintf("%s must be more than %s.", l, withUnit(lo))
		case lo != "":
			return fmt.Sprintf("%s must be at least %s.", l, withUnit(lo))
		case hiStrict:
			return fmt.Sprintf("%s must be less than %s.", l, withUnit(hi))
		default:
			return fmt.Sprintf("%s must be at most %s.", l, withUnit(hi))
		}
	}
	return l + " is not valid."
}

// FieldMessage is Message for a field named by Go name in struct type of
// v — for handler-level checks that reuse a field's label and limits.
func FieldMessage(v any, goField, tag string) string {
	sf, ok := reflect.TypeOf(v).Elem().FieldByName(goField)
	if !ok {
		panic("forms: no field " + goField)
	}
	return Message(sf, tag, "")
}

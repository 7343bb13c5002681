package importer

import (
	"errors"
	"math"
	"strconv"
	"strings"
	"time"

	"larder/internal/mass"
)

// KmPerMile is the international mile, 1609.344 m exactly.
const KmPerMile = 1.609344

// Date orders for dates written with day, month and year as numbers.
const (
	OrderDMY = "dmy" // 31/12/2026
	OrderMDY = "mdy" // 12/31/2026
)

// parseNumber reads a decimal number written with a point or a comma as
// the decimal mark ("72.4", "72,4"). Thousands separators are refused:
// "1,234" would be read wrongly either way, and body masses and minutes
// never need them.
func parseNumber(s string) (float64, error) {
	s = strings.TrimSpace(s)
	if s == "" {
		return 0, errors.New("is empty")
	}
	if strings.Count(s, ",")+strings.Count(s, ".") > 1 {
		return 0, errors.New("is not a number (write it without thousands separators, e.g. 1234.5)")
	}
	s = strings.Replace(s, ",", ".", 1)
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, errors.New("is not a number")
	}
	return v, nil
}

// splitUnit separates a trailing unit word from a value ("72.4 kg",
// "160lb") and returns the number text and the unit in lower case.
func splitUnit(s string) (num, unit string) {
	s = strings.TrimSpace(s)
	i := len(s)
	for i > 0 {
		c := s[i-1]
		if (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') {
			i--
			continue
		}
		break
	}
	return strings.TrimSpace(s[:i]), strings.ToLower(s[i:])
}

// massUnit names the unit a word stands for: "kg" or "lb", or "" when the
// word is not a mass unit.
func massUnit(word string) string {
	switch strings.ToLower(strings.TrimSpace(word)) {
	case "kg", "kgs", "kilo", "kilos", "kilogram", "kilograms":
		return "kg"
	case "lb", "lbs", "pound", "pounds":
		return "lb"
	}
	return ""
}

// parseMass reads a body mass in the given default unit, or in the unit
// written after the number, and gives kg and the unit used.
func parseMass(s, defUnit string) (kg float64, unit string, err error) {
	num, word := splitUnit(s)
	v, err := parseNumber(num)
	if err != nil {
		return 0, "", err
	}
	unit = defUnit
	if word != "" {
		if unit = massUnit(word); unit == "" {
			return 0, "", errors.New("is not a number of kg or lb")
		}
	}
	kg, ok := mass.Check(v, mass.Unit(unit))
	if !ok {
		return 0, "", errors.New("is outside " + mass.RangeText(mass.Unit(unit)) + "; check the number and the unit")
	}
	return kg, unit, nil
}

// isoDate matches 2026-03-01, optionally followed by a time.
func parseISODate(s string) (time.Time, string, bool) {
	if len(s) < 10 || s[4] != '-' || s[7] != '-' {
		return time.Time{}, "", false
	}
	d, err := time.Parse(time.DateOnly, s[:10])
	if err != nil {
		return time.Time{}, "", false
	}
	rest := strings.TrimSpace(strings.TrimLeft(s[10:], "Tt "))
	return d, rest, true
}

// numericDate splits "01/03/2026", "1.3.2026" or "01-03-2026" into its
// three numbers and whatever follows (a time). ok is false when s is not
// written that way.
func numericDate(s string) (a, b, y int, rest string, ok bool) {
	s = strings.TrimSpace(s)
	date, rest, _ := strings.Cut(s, " ")
	var sep byte
	for _, c := range []byte{'/', '.', '-'} {
		if strings.Count(date, string(c)) == 2 {
			sep = c
			break
		}
	}
	if sep == 0 {
		return 0, 0, 0, "", false
	}
	parts := strings.Split(date, string(sep))
	var n [3]int
	for i, p := range parts {
		v, err := strconv.Atoi(p)
		if err != nil || v < 0 {
			return 0, 0, 0, "", false
		}
		n[i] = v
	}
	if len(parts[2]) != 4 {
		return 0, 0, 0, "", false
	}
	return n[0], n[1], n[2], strings.TrimSpace(rest), true
}

// dateHint tells what one written date says about the order of day and
// month: OrderDMY when the first number cannot be a month, OrderMDY when the
// second cannot, "" when either reading works (or the date is ISO).
func dateHint(s string) string {
	a, b, _, _, ok := numericDate(s)
	if !ok {
		return ""
	}
	switch {
	case a > 12 && b <= 12:
		return OrderDMY
	case b > 12 && a <= 12:
		return OrderMDY
	}
	return ""
}

// isAmbiguousDate reports whether s is a numeric date whose day and month
// could be swapped (both 12 or less and different).
func isAmbiguousDate(s string) bool {
	a, b, _, _, ok := numericDate(s)
	return ok && a <= 12 && b <= 12 && a != b
}

// parseDate reads a date as ISO 8601 (2026-03-01) or as numbers in the given
// order; it gives the date and any time of day written after it.
func parseDate(s, order string) (time.Time, string, error) {
	s = strings.TrimSpace(s)
	if s == "" {
		return time.Time{}, "", errors.New("is empty")
	}
	if d, rest, ok := parseISODate(s); ok {
		return d, rest, nil
	}
	if len(s) >= 10 && s[4] == '-' && s[7] == '-' {
		return time.Time{}, "", errors.New("is not a day of the calendar")
	}
	a, b, y, rest, ok := numericDate(s)
	if !ok {
		return time.Time{}, "", errors.New("is not a date (write it as 2026-03-01, 01/03/2026 or 03/01/2026 with a four-digit year)")
	}
	day, month := a, b
	if order == OrderMDY {
		day, month = b, a
	}
	if month < 1 || month > 12 {
		return time.Time{}, "", errors.New("has no month " + strconv.Itoa(month))
	}
	d := time.Date(y, time.Month(month), day, 0, 0, 0, 0, time.UTC)
	if d.Day() != day || day < 1 {
		return time.Time{}, "", errors.New("is not a day of the calendar")
	}
	return d, rest, nil
}

// parseClock reads a time of day, "7:30", "07:30:15" or "7.30", as "HH:MM".
func parseClock(s string) (string, error) {
	s = strings.TrimSpace(s)
	if s == "" {
		return "", nil
	}
	s = strings.Replace(s, ".", ":", 1)
	parts := strings.Split(s, ":")
	if len(parts) < 2 || len(parts) > 3 {
		return "", errors.New("is not a time of day (write it as 07:30)")
	}
	h, err1 := strconv.Atoi(parts[0])
	m, err2 := strconv.Atoi(parts[1])
	if err1 != nil || err2 != nil || h < 0 || h > 23 || m < 0 || m > 59 || len(parts[1]) != 2 {
		return "", errors.New("is not a time of day (write it as 07:30)")
	}
	if len(parts) == 3 {
		if sec, err := strconv.Atoi(parts[2]); err != nil || sec < 0 || sec > 59 {
			return "", errors.New("is not a time of day (write it as 07:30)")
		}
	}
	return strconv.Itoa(h/10) + strconv.Itoa(h%10) + ":" + parts[1], nil
}

// Duration units a header can name.
const (
	durMinutes = "min"
	durSeconds = "s"
	durHours   = "h"
)

// parseDuration reads a duration as a number in the column's unit (minutes
// unless the header says otherwise) or as h:mm:ss or h:mm, and gives whole
// minutes (rounded, at least 1).
func parseDuration(s, unit string) (int, error) {
	s = strings.TrimSpace(s)
	if s == "" {
		return 0, errors.New("is empty")
	}
	var minutes float64
	if strings.Contains(s, ":") {
		parts := strings.Split(s, ":")
		if len(parts) > 3 {
			return 0, errors.New("is not a duration (write minutes, e.g. 75, or h:mm:ss, e.g. 1:15:00)")
		}
		var n [3]int
		for i, p := range parts {
			v, err := strconv.Atoi(p)
			if err != nil || v < 0 || (i > 0 && (len(p) != 2 || v > 59)) {
				return 0, errors.New("is not a duration (write minutes, e.g. 75, or h:mm:ss, e.g. 1:15:00)")
			}
			n[i] = v
		}
		minutes = float64(n[0]*60+n[1]) + float64(n[2])/60
	} else {
		v, err := parseNumber(s)
		if err != nil {
			return 0, err
		}
		switch unit {
		case durSeconds:
			v /= 60
		case durHours:
			v *= 60
		}
		minutes = v
	}
	m := int(math.Round(minutes))
	if minutes > 0 && m == 0 {
		m = 1
	}
	if m < 1 || m > 1440 {
		return 0, errors.New("is outside 1 minute to 24 hours")
	}
	return m, nil
}

// parseDistance reads a distance in the column's unit (km, mi or m) and
// gives km.
func parseDistance(s, unit string) (*float64, error) {
	num, word := splitUnit(s)
	if num == "" && word == "" {
		return nil, nil
	}
	if word != "" {
		unit = distanceUnit(word)
		if unit == "" {
			return nil, errors.New("has an unknown unit " + strconv.Quote(word) + " (use km, mi or m)")
		}
	}
	v, err := parseNumber(num)
	if err != nil {
		return nil, err
	}
	switch unit {
	case "mi":
		v *= KmPerMile
	case "m":
		v /= 1000
	}
	v = math.Round(v*1000) / 1000
	if v <= 0 || v > 1000 {
		return nil, errors.New("is outside 0–1000 km")
	}
	return &v, nil
}

func distanceUnit(word string) string {
	switch strings.ToLower(word) {
	case "km", "kms", "kilometre", "kilometres", "kilometer", "kilometers":
		return "km"
	case "mi", "mile", "miles":
		return "mi"
	case "m", "metre", "metres", "meter", "meters":
		return "m"
	}
	return ""
}

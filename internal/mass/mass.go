// Package mass holds body mass's two units: kilograms, in which every mass is
// stored and computed, and pounds, in which some practices and athletes weigh
// and read. The conversion, the rounding a unit is shown with and the one
// accepted range live here, so that forms, charts, tables, sheets and the
// athlete's phone page agree. Grams of food and g/kg targets are not body
// masses: they stay in the trade's units whatever the unit chosen here.
package mass

import (
	"math"
	"strconv"
)

// Unit is the unit a body mass is typed and shown in.
type Unit string

// The two units.
const (
	KG Unit = "kg"
	LB Unit = "lb"
)

// Default is the unit of a practice that has chosen none.
const Default = KG

// KgPerLb is the international avoirdupois pound, exactly 0.45359237 kg
// (International Yard and Pound Agreement, 1959).
const KgPerLb = 0.45359237

// The accepted range of a body mass in kg, whichever unit it was typed in:
// wide enough for a child athlete and a heavyweight thrower, narrow enough to
// catch a slipped digit. The database's CHECK constraints say the same.
const (
	MinKg = 20
	MaxKg = 300
)

// StoredDecimals is the precision of a stored mass in kg (numeric(6,2)).
const StoredDecimals = 2

// Parse reads "kg" or "lb"; ok is false for anything else.
func Parse(s string) (Unit, bool) {
	switch Unit(s) {
	case KG, LB:
		return Unit(s), true
	}
	return "", false
}

// Or is u when it is a unit, else def: a client's own choice falls back to
// the practice's.
func Or(u, def Unit) Unit {
	if _, ok := Parse(string(u)); ok {
		return u
	}
	if _, ok := Parse(string(def)); ok {
		return def
	}
	return Default
}

// decimals is how finely a unit is typed and shown: 0.1 lb is a scale's
// step; kg keep the stored 0.01 on input so a typed kg value survives as is.
func (u Unit) decimals() int {
	if u == LB {
		return 1
	}
	return StoredDecimals
}

// ToKg converts v in unit u to kg, unrounded.
func ToKg(v float64, u Unit) float64 {
	if u == LB {
		return v * KgPerLb
	}
	return v
}

// FromKg converts kg to unit u, unrounded.
func FromKg(kg float64, u Unit) float64 {
	if u == LB {
		return kg / KgPerLb
	}
	return kg
}

// StoredKg is v in unit u as it is stored: kg rounded to 0.01. A value typed
// to 0.1 lb comes back as the same 0.1 lb (0.01 kg is 0.022 lb, under half a
// step), so repeated saves do not drift.
func StoredKg(v float64, u Unit) float64 { return round(ToKg(v, u), StoredDecimals) }

// InRange says whether a mass in kg lies within the accepted range.
func InRange(kg float64) bool { return kg >= MinKg && kg <= MaxKg }

// Range is the accepted range in unit u, rounded inwards to the unit's step
// so that both ends, typed as shown, are accepted.
func Range(u Unit) (lo, hi float64) {
	p := math.Pow(10, float64(u.decimals()))
	return math.Ceil(FromKg(MinKg, u)*p-1e-9) / p, math.Floor(FromKg(MaxKg, u)*p+1e-9) / p
}

// RangeText states the range in unit u, with kg beside lb: "20 to 300 kg",
// "44.1 to 661.3 lb (20 to 300 kg)".
func RangeText(u Unit) string { return rangeText(u, " to ") }

// RangeMessage is the message beside a body-mass field whose value is out of
// range, in the unit typed: "Body mass must be between 44.1 and 661.3 lb
// (20 to 300 kg)."
func RangeMessage(u Unit) string { return "Body mass must be between " + rangeText(u, " and ") + "." }

// Span states the range in unit u alone: "44.1 to 661.3 lb".
func Span(u Unit) string { return span(u, " to ") }

func span(u Unit, and string) string {
	lo, hi := Range(u)
	return num(lo, u.decimals()) + and + num(hi, u.decimals()) + " " + string(u)
}

func rangeText(u Unit, and string) string {
	if u == LB {
		return span(LB, and) + " (" + span(KG, " to ") + ")"
	}
	return span(KG, and)
}

// Check converts a typed value to the stored kg and says whether it is in
// range; the range is checked on the stored value so that the ends given by
// RangeText are accepted exactly.
func Check(v float64, u Unit) (kg float64, ok bool) {
	kg = StoredKg(v, u)
	return kg, InRange(kg)
}

// Input is kg written for a form field in unit u: "68.22", "150.4".
func Input(kg float64, u Unit) string { return num(round(FromKg(kg, u), u.decimals()), u.decimals()) }

// Reread is the kg a re-sent form field means. When the number typed is the
// one Input showed for currentKg, the current value stands (re-saving a form
// must not move a mass by a conversion's rounding); otherwise the typed
// number is converted.
func Reread(typed float64, u Unit, currentKg float64) float64 {
	if currentKg > 0 && round(typed, u.decimals()) == round(FromKg(currentKg, u), u.decimals()) {
		return currentKg
	}
	return StoredKg(typed, u)
}

// Number is kg shown in unit u to 0.1, without the unit: "150.4".
func Number(kg float64, u Unit) string {
	return strconv.FormatFloat(round(FromKg(kg, u), 1), 'f', 1, 64)
}

// Text is kg shown in unit u to 0.1: "68.2 kg", "150.4 lb".
func Text(kg float64, u Unit) string { return Number(kg, u) + " " + string(Or(u, Default)) }

// Precise is kg shown in unit u as finely as it is typed, without trailing
// zeros: "61 kg", "68.22 kg", "150.4 lb". For the body mass a plan was
// computed from, where the second decimal of kg is the one used.
func Precise(kg float64, u Unit) string { return Input(kg, u) + " " + string(Or(u, Default)) }

// Difference is a change of mass in kg shown in unit u: a gain of 1.2–2.0 kg
// reads "1.2–2.0 kg" or "2.6–4.4 lb". hi equal to lo (or under it) shows one figure.
func Difference(lo, hi float64, u Unit) string {
	if hi <= lo || Number(hi, u) == Number(lo, u) {
		return Text(lo, u)
	}
	return Number(lo, u) + "–" + Text(hi, u)
}

func round(x float64, decimals int) float64 {
	p := math.Pow(10, float64(decimals))
	return math.Round(x*p) / p
}

// num writes x with at most the given decimals and no trailing zeros.
func num(x float64, decimals int) string {
	return strconv.FormatFloat(round(x, decimals), 'f', -1, 64)
}

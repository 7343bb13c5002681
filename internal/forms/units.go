package forms

import "math"

// KgPerLb is the international avoirdupois pound, exactly 0.45359237 kg
// (International Yard and Pound Agreement, 1959).
const KgPerLb = 0.45359237

// LbToKg converts pounds to kilograms.
func LbToKg(lb float64) float64 { return lb * KgPerLb }

// KgToLb converts kilograms to pounds.
func KgToLb(kg float64) float64 { return kg / KgPerLb }

// Round rounds x to the given number of decimals.
func Round(x float64, decimals int) float64 {
	p := math.Pow(10, float64(decimals))
	return math.Round(x*p) / p
}

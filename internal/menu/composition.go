package menu

import (
	"math"

	"larder/internal/fuel"
)

// atwater reads a factor (kcal/g) from fuel.Guidelines, the one table of
// guideline values, so that the foods check and the plan's energy figures use
// the same numbers.
func atwater(key string) float64 {
	for _, g := range fuel.Guidelines {
		if g.Key == key {
			return g.Min
		}
	}
	panic("menu: guideline " + key + " missing from fuel.Guidelines")
}

// AtwaterKcal is the energy of 100 g of a food from its carbohydrate, protein
// and fat by the Atwater general factors (4, 4 and 9 kcal/g).
func AtwaterKcal(choG, proteinG, fatG float64) float64 {
	return choG*atwater("atwater.cho") + proteinG*atwater("atwater.protein") + fatG*atwater("atwater.fat")
}

// EnergyFarOff tells whether a stated energy is far from the Atwater estimate:
// more than 25 kcal plus 15 % of the estimate apart. The margin is this
// project's own: labels and tables count fibre, polyols and rounding
// differently, which moves real foods by a few per cent, while a typing slip
// (kJ for kcal, a dropped digit) moves them by far more.
func EnergyFarOff(statedKcal, choG, proteinG, fatG float64) (estimate float64, far bool) {
	est := AtwaterKcal(choG, proteinG, fatG)
	return est, math.Abs(statedKcal-est) > 25+0.15*est
}

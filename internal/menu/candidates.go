package menu

// Which foods suit a feed: how a food is told apart (gel, ready to eat,
// carbohydrate food, low fibre) and the filtered, ranked list of candidates
// that Suggest combines.

import (
	"math"
	"regexp"
	"sort"
)

var gelWord = regexp.MustCompile(`(?i)\bgels?\b`)

// isGel tells a carbohydrate gel by its name, the only sign a foods list has.
func isGel(f Food) bool { return gelWord.MatchString(f.Name) }

var exerciseWord = regexp.MustCompile(`(?i)\b(gels?|sports drinks?|recovery shakes?|energy drinks?|electrolyte)\b`)

// forExercise tells, by its name, a product made for exercise: a gel, a
// sports drink, a recovery shake. Meals are made of food (common practice);
// these products serve the feeds around and during exercise.
func forExercise(f Food) bool { return exerciseWord.MatchString(f.Name) }

// readyToEat: drinks, foods to eat on the move and the practice's own
// products need no kitchen; raw staples such as uncooked rice or flour do,
// and so does a product whose household portion is weighed dry or uncooked
// (rolled oats), the foods list's way of saying so.
func readyToEat(f Food) bool {
	return f.Liquid || f.Portable || f.Practice && !weighedRaw.MatchString(f.PortionName)
}

var weighedRaw = regexp.MustCompile(`(?i)\b(dry|uncooked|raw|flour)\b`)

// maxOtherPerCho: during exercise a food carries at most 0.4 g of protein
// and fat together per g of carbohydrate. Sports drinks, gels, fruit and
// most bars pass; a recovery shake (about 0.5) and milk (over 1) do not:
// carbohydrate with little protein and fat empties from the stomach faster
// (common practice). The threshold is this project's own.
const maxOtherPerCho = 0.4

// duringExercise tells an in-event feed from the other on-the-move ones.
func duringExercise(need Need) bool {
	return need.OnTheMove && !need.afterExercise && need.ProteinG == 0
}

// wantsReady tells the feeds that come during or soon after exercise, where
// ready-to-eat foods and the practice's own products are preferred.
func wantsReady(need Need) bool { return need.OnTheMove || need.PreferOnTheMove }

// CarbohydrateFood tells whether carbohydrate gives at least a quarter of a
// food's energy (4 kcal/g against 4 and 9 for protein and fat): rice, fruit,
// jaggery and milk do; nuts, paneer and eggs do not, and are no way to meet a
// carbohydrate target. A threshold of this project's own.
func CarbohydrateFood(f Food) bool {
	cho := 4 * f.ChoPer100
	total := cho + 4*f.ProtPer100 + 9*f.FatPer100
	return total > 0 && cho >= 0.25*total
}

// IsLowFibre tells whether a food is low in fibre: little for the
// carbohydrate it gives, and little in itself (see LowFibreMaxPer100).
func IsLowFibre(f Food) bool {
	return f.ChoPer100 > 0 && f.FibrePer100 <= LowFibreRatio*f.ChoPer100 && f.FibrePer100 <= LowFibreMaxPer100
}

// candidates filters and ranks the foods list for one need.
func candidates(foods []Food, need Need) []Food {
	avoid := map[int64]bool{}
	for _, id := range need.Avoid {
		avoid[id] = true
	}
	var pool, avoided []Food
	lowFibreCount := 0
	for _, f := range foods {
		if !(f.ChoPer100 > 0) || !(f.PortionG > 0) || math.IsNaN(f.FibrePer100) || !CarbohydrateFood(f) {
			continue
		}
		if need.GlutenFree && f.ContainsGluten || breaks(f, need.Exclude) {
			continue // never, not even as a fallback
		}
		if need.OnTheMove && !f.Liquid && !f.Portable {
			continue
		}
		if duringExercise(need) && f.ProtPer100+f.FatPer100 > maxOtherPerCho*f.ChoPer100 {
			continue // a recovery shake or milk is no in-event drink
		}
		if need.Meal && forExercise(f) {
			continue // a gel, sports drink or recovery shake is for exercise, not a meal
		}
		if avoid[f.ID] {
			avoided = append(avoided, f)
			continue
		}
		if IsLowFibre(f) {
			lowFibreCount++
		}
		pool = append(pool, f)
	}
	if len(pool) == 0 {
		pool = avoided
	}
	if need.LowFibre && !need.anyFibre && lowFibreCount >= 3 {
		kept := pool[:0:0]
		for _, f := range pool {
			if IsLowFibre(f) {
				kept = append(kept, f)
			}
		}
		pool = kept
	}
	// Rank by how well a food's portion suits the target: best when about
	// two portions meet it, so that suggestions are a natural number of
	// portions whatever the size of the feed; a food whose half portion
	// already overshoots is no use. During and after exercise the
	// practice's own products and ready-to-eat foods rank first. Fibre
	// ratio, then name and ID break ties so that the order is deterministic.
	tol := Tolerance(need.ChoG)
	kept := pool[:0:0]
	for _, f := range pool {
		if 0.5*choPerPortion(f) <= need.ChoG+tol {
			kept = append(kept, f)
		}
	}
	pool = kept
	fit := func(f Food) float64 {
		v := math.Abs(math.Log(2 * choPerPortion(f) / need.ChoG))
		if wantsReady(need) && !f.Practice {
			v += 0.5
		}
		if (wantsReady(need) || need.Ready) && !readyToEat(f) {
			v += 1
		}
		return v
	}
	sort.SliceStable(pool, func(i, j int) bool {
		a, b := pool[i], pool[j]
		if need.OnTheMove && a.Liquid != b.Liquid {
			return a.Liquid
		}
		if fa, fb := fit(a), fit(b); fa != fb {
			return fa < fb
		}
		ra, rb := a.FibrePer100/a.ChoPer100, b.FibrePer100/b.ChoPer100
		if ra != rb {
			return ra < rb
		}
		if a.Name != b.Name {
			return a.Name < b.Name
		}
		return a.ID < b.ID
	})
	if len(pool) > poolSize {
		pool = pool[:poolSize]
	}
	return pool
}

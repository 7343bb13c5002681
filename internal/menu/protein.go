package menu

// Protein-aware suggestions: a feed that asks for protein (a meal, a snack
// of some size, the first feed after a session) gets foods whose protein
// meets that target as well as the carbohydrate, with a protein food beside
// the carbohydrate foods when they alone fall short ("rice and chicken", not
// rice alone for a dinner that asks for 30 g of protein).

import (
	"math"
	"sort"
)

// MinProteinAwareG is the smallest protein target a suggestion is held to.
// Below it the carbohydrate foods bring about that much as they are (a cup
// of cooked rice some 5 g, a glass of milk 8 g: IFCT 2017), and a protein
// food on top would make a small snack a meal. Model assumption.
const MinProteinAwareG = 10

// ProteinTolerance is the margin a suggestion's protein keeps to: ±20 % of
// the target or ±5 g, whichever is larger. Model assumption: half a
// household portion of a protein food (half a chicken breast, one egg,
// half a cup of dal) carries 4–11 g of protein (IFCT 2017), so a tighter
// margin often has no answer; and a meal's protein guideline is itself a
// range around 0.3 g/kg (about 0.25–0.4 g/kg, common practice), some
// ±20 % wide.
func ProteinTolerance(targetG float64) float64 {
	return math.Max(5, 0.20*targetG)
}

// proteinAware tells the needs whose protein is held to ProteinTolerance:
// a protein target of MinProteinAwareG or more, not during exercise (an
// in-event feed is carbohydrate only).
func proteinAware(need Need) bool {
	return need.ProteinG >= MinProteinAwareG && !math.IsInf(need.ProteinG, 0) && !duringExercise(need)
}

// ProteinFood tells whether protein gives at least a quarter of a food's
// energy (4 kcal/g for carbohydrate and protein, 9 for fat): chicken, fish,
// eggs, paneer, soya and dals do; rice, fruit and nuts do not. The same
// threshold of this project's own as CarbohydrateFood.
func ProteinFood(f Food) bool {
	prot := 4 * f.ProtPer100
	total := 4*f.ChoPer100 + prot + 9*f.FatPer100
	return total > 0 && prot >= 0.25*total
}

// proteinPoolSize is how many protein foods join the carbohydrate foods'
// pool of a protein-aware need: enough for a choice of meat, fish, egg,
// dairy and pulses, few enough to keep the search quick.
const proteinPoolSize = 6

// withProteinFoods adds to a protein-aware need's pool the protein foods
// that suit it best, ranked by how near one portion comes to two thirds of
// the target (the carbohydrate foods bring the rest), after the same
// filters as candidates: needs, gluten, on the move, avoided foods.
func withProteinFoods(pool, foods []Food, need Need) []Food {
	if !proteinAware(need) {
		return pool
	}
	in := map[int64]bool{}
	for _, f := range pool {
		in[f.ID] = true
	}
	avoid := map[int64]bool{}
	for _, id := range need.Avoid {
		avoid[id] = true
	}
	var extra, avoided []Food
	for _, f := range foods {
		if in[f.ID] || !ProteinFood(f) || !(f.PortionG > 0) || !(f.ProtPer100 > 0) || math.IsNaN(f.ChoPer100) {
			continue
		}
		if need.GlutenFree && f.ContainsGluten || breaks(f, need.Exclude) {
			continue
		}
		if need.OnTheMove && !f.Liquid && !f.Portable || need.Meal && forExercise(f) {
			continue
		}
		if 0.5*protPerPortion(f) > need.ProteinG+ProteinTolerance(need.ProteinG) {
			continue
		}
		if avoid[f.ID] {
			avoided = append(avoided, f)
			continue
		}
		extra = append(extra, f)
	}
	if len(extra) == 0 {
		extra = avoided
	}
	want := 2 * need.ProteinG / 3
	fit := func(f Food) float64 { return math.Abs(math.Log(protPerPortion(f) / want)) }
	sort.SliceStable(extra, func(i, j int) bool {
		a, b := extra[i], extra[j]
		if fa, fb := fit(a), fit(b); fa != fb {
			return fa < fb
		}
		if a.Name != b.Name {
			return a.Name < b.Name
		}
		return a.ID < b.ID
	})
	// One food of each kind: three kinds of chicken crowd out fish and egg.
	seen := map[string]bool{}
	for _, f := range pool {
		seen[kind(f)] = true
	}
	added := 0
	for _, f := range extra {
		if added == proteinPoolSize {
			break
		}
		if k := kind(f); !seen[k] {
			seen[k] = true
			pool = append(pool, f)
			added++
		}
	}
	return pool
}

func protPerPortion(f Food) float64 { return f.PortionG * f.ProtPer100 / 100 }

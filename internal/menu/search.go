package menu

// How Suggest combines the candidate foods: the score of a combination,
// whether it fits, and the search over one-, two- and three-food
// combinations.

import (
	"math"
	"strings"
)

// perFood is the score's cost of each food beyond the first.
const perFood = 0.3

// foodCost is perFood, but less for an in-event total, where a mix of
// drinks, gels and bars over the hours is easier to keep taking than one
// product (common practice).
func foodCost(need Need) float64 {
	if sittings(need) > 1 {
		return perFood / 3
	}
	return perFood
}

type scored struct {
	items []Item
	score float64
}

// score of a combination that fits, lower is better, in parts of the
// tolerance: the distance from the target; a cost per extra food, and per
// portion beyond two of one food, set so that two foods in two portions
// each beat one food in four, while three of one is about even with two
// foods; protein and fat during exercise; a little for each half portion; fibre when
// low fibre is wanted; and, during and after exercise, a cost for foods
// that are not the practice's own or not ready to eat. The weights are
// this project's own.
func score(items []Item, need Need, tol float64) float64 {
	sum := 0.0
	for _, it := range items {
		sum += it.ChoG
	}
	s := math.Abs(sum-need.ChoG)/tol + foodCost(need)*float64(len(items)-1)
	// Two portions of a food at one sitting cost nothing; an in-event total
	// reads better as a mix than as one gel after another, so there only
	// one portion an hour is free.
	free := 2.0
	if sittings(need) > 1 {
		free = 1
	}
	if need.OnTheMove && need.ProteinG == 0 {
		// During exercise carbohydrate with little protein and fat sits
		// easier and empties from the stomach faster (common practice):
		// a sports drink or gel before a shake or milk.
		other := 0.0
		for _, it := range items {
			other += it.Grams * (it.Food.ProtPer100 + it.Food.FatPer100) / 100
		}
		if sum > 0 {
			s += 0.5 * other / sum
		}
	}
	if need.ProteinG > 0 {
		protein := 0.0
		for _, it := range items {
			protein += it.ProteinG
		}
		if proteinAware(need) {
			// The distance from the protein target, in parts of its
			// tolerance, as the carbohydrate's.
			s += math.Abs(protein-need.ProteinG) / ProteinTolerance(need.ProteinG)
		} else {
			// A small protein target only ranks: the share of it the
			// foods leave unmet, weighed like a full tolerance's miss of
			// the carbohydrate (this project's own weight).
			s += math.Max(0, need.ProteinG-protein) / need.ProteinG
		}
	}
	for _, it := range items {
		s += 0.3 * math.Max(0, math.Ceil(it.Portions/sittings(need))-free)
		if it.Portions != math.Trunc(it.Portions) {
			s += 0.1
		}
		if need.LowFibre {
			s += 0.3 * it.FibreG / (LowFibreRatio * need.ChoG)
		}
		if wantsReady(need) && !it.Food.Practice {
			s += 0.15
		}
		if (wantsReady(need) || need.Ready) && !readyToEat(it.Food) {
			s += 0.4
		}
	}
	return s
}

// fits tells whether a combination meets the target within tol and keeps
// its drinks within the cap.
func fits(items []Item, need Need, tol float64) bool {
	sum, protein, drinks, solids, glasses := 0.0, 0.0, 0.0, 0, 0
	for _, it := range items {
		sum += it.ChoG
		protein += it.ProteinG
		if it.Food.Liquid {
			drinks += it.Grams
			glasses++
		} else {
			solids++
		}
	}
	// A meal is food with one drink beside it, as a dietitian writes it, not
	// juice and milk and a shake at one sitting (common practice).
	if need.Meal && (solids == 0 || glasses > 1) {
		return false
	}
	if proteinAware(need) && math.Abs(protein-need.ProteinG) > ProteinTolerance(need.ProteinG)+1e-9 {
		return false
	}
	return math.Abs(sum-need.ChoG) <= tol && drinks <= drinkLimit(need)+1e-9
}

// search tries every one-, two- and three-food combination of the pool
// (the last food of each in the amount that comes nearest the rest of the
// target) and keeps the best-scored one that fits.
func search(pool []Food, need Need, tol float64) ([]Item, bool) {
	// Every allowed amount of every food, worked out once.
	amounts := make([][]Item, len(pool))
	for i, f := range pool {
		for _, p := range steps(f, need) {
			amounts[i] = append(amounts[i], item(f, p))
		}
	}
	var best *scored
	consider := func(items []Item) {
		if !fits(items, need, tol) {
			return
		}
		sc := score(items, need, tol)
		if best == nil || sc < best.score-1e-9 {
			cp := append([]Item(nil), items...)
			best = &scored{items: cp, score: sc}
		}
	}
	for i := range pool {
		for _, a := range amounts[i] {
			consider([]Item{a})
		}
	}
	// Each extra food costs foodCost in the score, so a larger combination
	// is tried only when it could still beat the best so far.
	worthTrying := func(n int) bool { return best == nil || best.score > foodCost(need)*float64(n-1) }
	buf := make([]Item, 3)
	kinds := make([]string, len(pool))
	for i, f := range pool {
		kinds[i] = kind(f)
	}
	for i := 0; i < len(pool) && worthTrying(2); i++ {
		for j := i + 1; j < len(pool); j++ {
			if kinds[i] == kinds[j] {
				continue
			}
			for _, a := range amounts[i] {
				if over(a, need, tol) {
					break
				}
				if short(a, amounts[j], need, tol) {
					continue
				}
				buf[0], buf[1] = a, last(amounts[j], need, tol, a)
				consider(buf[:2])
			}
		}
	}
	for i := 0; i < len(pool) && worthTrying(3); i++ {
		for j := i + 1; j < len(pool); j++ {
			for k := j + 1; k < len(pool); k++ {
				if kinds[i] == kinds[j] || kinds[i] == kinds[k] || kinds[j] == kinds[k] {
					continue
				}
				for _, a := range amounts[i] {
					if over(a, need, tol) {
						break
					}
					for _, b := range amounts[j] {
						ab := Item{ChoG: a.ChoG + b.ChoG, ProteinG: a.ProteinG + b.ProteinG}
						if over(ab, need, tol) {
							break
						}
						if short(ab, amounts[k], need, tol) {
							continue
						}
						buf[0], buf[1], buf[2] = a, b, last(amounts[k], need, tol, ab)
						consider(buf[:3])
					}
				}
			}
		}
	}
	if best == nil {
		return nil, false
	}
	return best.items, true
}

// kind is what a food-table name says before its first comma, lower-cased:
// "rice" for raw, brown and parboiled rice, "milk" for cow's and buffalo
// milk, "wheat flour" for atta and refined flour. Two foods of one kind in a
// suggestion ("rice and rice") read badly, so a combination takes at most
// one of each. A name without a comma (a practice's product) is its own kind.
func kind(f Food) string {
	name := f.Name
	if f.SourceName != "" {
		name = f.SourceName // "Rice" for white, brown and parboiled alike
	}
	k, _, _ := strings.Cut(name, ",")
	return strings.ToLower(strings.TrimSpace(k))
}

// over tells that the foods so far (their sums in so) already reach past
// the carbohydrate target's margin, or the protein's on a protein-aware
// need: a larger amount, or one more food, cannot fit. Amounts are in
// rising order, so a loop over them stops there.
func over(so Item, need Need, tol float64) bool {
	if so.ChoG >= need.ChoG+tol {
		return true
	}
	return proteinAware(need) && so.ProteinG > need.ProteinG+ProteinTolerance(need.ProteinG)
}

// short tells that even the largest of the last food's amounts cannot
// bring the foods so far (their sums in so) up to the carbohydrate
// target's margin, or the protein's on a protein-aware need: no amount of
// it fits, so it need not be tried.
func short(so Item, amounts []Item, need Need, tol float64) bool {
	most := amounts[len(amounts)-1]
	if so.ChoG+most.ChoG < need.ChoG-tol {
		return true
	}
	return proteinAware(need) && so.ProteinG+most.ProteinG < need.ProteinG-ProteinTolerance(need.ProteinG)
}

// last returns the amount (of one food's allowed amounts) that comes
// nearest to the rest of the target once the foods so far (their sums in
// so) are counted: the carbohydrate, and on a protein-aware need the
// protein too, each in parts of its tolerance.
func last(amounts []Item, need Need, tol float64, so Item) Item {
	restC := need.ChoG - so.ChoG
	aware := proteinAware(need)
	restP, ptol := need.ProteinG-so.ProteinG, ProteinTolerance(need.ProteinG)
	best, bestD := amounts[0], math.Inf(1)
	for _, a := range amounts {
		d := math.Abs(a.ChoG-restC) / tol
		if aware {
			d += math.Abs(a.ProteinG-restP) / ptol
		}
		if d < bestD {
			best, bestD = a, d
		}
	}
	return best
}

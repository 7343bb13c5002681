// Package menu turns a feed's carbohydrate target into food suggestions: one to
// three foods from the practice's foods list, each in half-portion steps, whose
// carbohydrate adds up to the target within a stated tolerance. It is pure: no
// I/O, no database; the caller passes the foods list and the feed's needs.
package menu

import (
	"fmt"
	"math"
	"sort"
	"strings"
)

// Food is one row of the foods list as the suggester needs it. Figures are per
// 100 g of the food as eaten or as weighed.
type Food struct {
	ID          int64
	Name        string
	ChoPer100   float64
	ProtPer100  float64
	FatPer100   float64
	FibrePer100 float64
	PortionName string
	PortionG    float64
	Liquid      bool
	Portable    bool
}

// Need describes one feed.
type Need struct {
	ChoG float64 // carbohydrate target of the feed, g
	// LowFibre prefers foods with little fibre per gram of carbohydrate, as
	// advised on carbohydrate-loading days and before an event.
	LowFibre bool
	// OnTheMove restricts the choice to drinks and portable foods (in-event feeds).
	OnTheMove bool
	// PreferOnTheMove tries drinks and portable foods first and falls back to
	// the whole list (feeds every 15–60 min of a repletion window).
	PreferOnTheMove bool
	// Avoid lists food IDs to leave out when an alternative exists, so that
	// successive feeds of a day do not all suggest the same food.
	Avoid []int64
}

// Item is one food of a suggestion.
type Item struct {
	Food     Food
	Portions float64 // in half-portion steps
	Grams    float64
	ChoG     float64
	ProteinG float64
	FibreG   float64
}

// Suggestion is what Suggest returns.
type Suggestion struct {
	Items      []Item
	ChoG       float64 // sum of the items' carbohydrate
	TargetG    float64
	ToleranceG float64 // the sum lies within TargetG ± ToleranceG
}

// Text is a one-line description such as
// "Banana, ripe, robusta: 2 × 1 medium, peeled (100 g) = 200 g + …".
func (s Suggestion) Text() string {
	parts := make([]string, len(s.Items))
	for i, it := range s.Items {
		parts[i] = fmt.Sprintf("%s: %s × %s = %s g", it.Food.Name, formatPortions(it.Portions), it.Food.PortionName, formatPortions(math.Round(it.Grams)))
	}
	return strings.Join(parts, "; ")
}

func formatPortions(p float64) string {
	if p == math.Trunc(p) {
		return fmt.Sprintf("%.0f", p)
	}
	return fmt.Sprintf("%.1f", p)
}

// Tolerance of a suggestion: ±10 % of the target or ±5 g, whichever is larger.
// A practical margin of this project's own: a half portion of most staple foods
// carries 5–20 g of carbohydrate, so a tighter margin often has no answer.
func Tolerance(targetG float64) float64 {
	return math.Max(5, 0.10*targetG)
}

const (
	// LowFibreRatio: a food counts as low-fibre when it carries at most 12 g of
	// fibre per 100 g of carbohydrate (white rice, refined flour, ripe banana,
	// jaggery, milk qualify; whole-wheat flour, dals and dates do not). A
	// threshold of this project's own, chosen for its food list.
	LowFibreRatio = 0.12
	maxPortions   = 8   // at most 8 portions of one food in one feed
	maxItemGrams  = 600 // and at most 600 g of it
	poolSize      = 14  // best-ranked foods considered for combinations
)

// CarbohydrateFood tells whether carbohydrate gives at least a quarter of a
// food's energy (4 kcal/g against 4 and 9 for protein and fat): rice, fruit,
// jaggery and milk do; nuts, paneer and eggs do not, and are no way to meet a
// carbohydrate target. A threshold of this project's own.
func CarbohydrateFood(f Food) bool {
	cho := 4 * f.ChoPer100
	total := cho + 4*f.ProtPer100 + 9*f.FatPer100
	return total > 0 && cho >= 0.25*total
}

// IsLowFibre tells whether a food is low in fibre for the carbohydrate it gives.
func IsLowFibre(f Food) bool {
	return f.ChoPer100 > 0 && f.FibrePer100 <= LowFibreRatio*f.ChoPer100
}

// Suggest picks 1–3 foods whose carbohydrate adds up to need.ChoG within
// Tolerance. It prefers fewer foods, then a closer sum, then (when asked)
// lower fibre. ok is false when no combination fits, for example when the
// list has no drinks or portable foods for an in-event feed.
func Suggest(foods []Food, need Need) (s Suggestion, ok bool) {
	if need.PreferOnTheMove && !need.OnTheMove {
		quick := need
		quick.OnTheMove, quick.PreferOnTheMove = true, false
		if s, ok := Suggest(foods, quick); ok {
			return s, true
		}
		need.PreferOnTheMove = false
	}
	s = Suggestion{TargetG: need.ChoG, ToleranceG: Tolerance(need.ChoG)}
	if !(need.ChoG > 0) || math.IsInf(need.ChoG, 0) {
		return s, false
	}
	pool := candidates(foods, need)
	if len(pool) == 0 {
		return s, false
	}
	best, found := search(pool, need, s.ToleranceG)
	if !found && len(need.Avoid) > 0 {
		// The avoided foods may be the only ones that fit: allow them.
		need.Avoid = nil
		best, found = search(candidates(foods, need), need, s.ToleranceG)
	}
	if !found {
		return s, false
	}
	s.Items = best
	for _, it := range best {
		s.ChoG += it.ChoG
	}
	return s, true
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
		if need.OnTheMove && !f.Liquid && !f.Portable {
			continue
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
	if need.LowFibre && lowFibreCount >= 3 {
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
	// already overshoots is no use. Fibre ratio, then name and ID break ties
	// so that the order is deterministic.
	tol := Tolerance(need.ChoG)
	kept := pool[:0:0]
	for _, f := range pool {
		if 0.5*choPerPortion(f) <= need.ChoG+tol {
			kept = append(kept, f)
		}
	}
	pool = kept
	fit := func(f Food) float64 { return math.Abs(math.Log(2 * choPerPortion(f) / need.ChoG)) }
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

func choPerPortion(f Food) float64 { return f.PortionG * f.ChoPer100 / 100 }

func item(f Food, portions float64) Item {
	g := portions * f.PortionG
	return Item{
		Food: f, Portions: portions, Grams: g,
		ChoG:     g * f.ChoPer100 / 100,
		ProteinG: g * f.ProtPer100 / 100,
		FibreG:   g * f.FibrePer100 / 100,
	}
}

// steps lists the allowed portion counts of a food: 0.5, 1, 1.5 … within the caps.
func steps(f Food) []float64 {
	var out []float64
	for p := 0.5; p <= maxPortions; p += 0.5 {
		if p*f.PortionG > maxItemGrams && p > 0.5 {
			break
		}
		out = append(out, p)
	}
	return out
}

type scored struct {
	items []Item
	score float64
}

// score: distance from the target, plus a small cost per food and per portion
// so that simpler suggestions win among equally close ones, plus fibre when
// low fibre is wanted.
func score(items []Item, need Need) float64 {
	sum, fibre, portions := 0.0, 0.0, 0.0
	for _, it := range items {
		sum += it.ChoG
		fibre += it.FibreG
		portions += it.Portions
	}
	s := math.Abs(sum-need.ChoG) + 2*float64(len(items)) + 0.1*portions
	if need.LowFibre {
		s += fibre
	}
	return s
}

func search(pool []Food, need Need, tol float64) ([]Item, bool) {
	within := func(items []Item) bool {
		sum := 0.0
		for _, it := range items {
			sum += it.ChoG
		}
		return math.Abs(sum-need.ChoG) <= tol
	}
	var best *scored
	consider := func(items []Item) {
		if !within(items) {
			return
		}
		sc := score(items, need)
		if best == nil || sc < best.score-1e-9 {
			cp := append([]Item(nil), items...)
			best = &scored{items: cp, score: sc}
		}
	}
	// Fewer foods first: a larger combination is tried only when no smaller one fits.
	for _, f := range pool {
		for _, p := range steps(f) {
			consider([]Item{item(f, p)})
		}
	}
	if best != nil {
		return best.items, true
	}
	for i := range pool {
		for j := i + 1; j < len(pool); j++ {
			for _, p := range steps(pool[i]) {
				a := item(pool[i], p)
				if a.ChoG >= need.ChoG+tol {
					break
				}
				consider([]Item{a, closest(pool[j], need.ChoG-a.ChoG)})
			}
		}
	}
	if best != nil {
		return best.items, true
	}
	for i := range pool {
		for j := i + 1; j < len(pool); j++ {
			for k := j + 1; k < len(pool); k++ {
				for _, p := range steps(pool[i]) {
					a := item(pool[i], p)
					if a.ChoG >= need.ChoG+tol {
						break
					}
					for _, q := range steps(pool[j]) {
						b := item(pool[j], q)
						if a.ChoG+b.ChoG >= need.ChoG+tol {
							break
						}
						consider([]Item{a, b, closest(pool[k], need.ChoG-a.ChoG-b.ChoG)})
					}
				}
			}
		}
	}
	if best != nil {
		return best.items, true
	}
	return nil, false
}

// closest returns the allowed amount of f whose carbohydrate is nearest to restG.
func closest(f Food, restG float64) Item {
	st := steps(f)
	bestP, bestD := st[0], math.Inf(1)
	for _, p := range st {
		d := math.Abs(p*f.PortionG*f.ChoPer100/100 - restG)
		if d < bestD {
			bestP, bestD = p, d
		}
	}
	return item(f, bestP)
}

// SuggestDay suggests foods for the feeds of one day in order, steering each
// feed away from the foods of the one before it so that a day is not a
// single food eaten five times. ok[i] tells whether feed i got a suggestion.
func SuggestDay(foods []Food, needs []Need) ([]Suggestion, []bool) {
	out := make([]Suggestion, len(needs))
	oks := make([]bool, len(needs))
	var prev []int64
	for i, n := range needs {
		n.Avoid = append(append([]int64(nil), n.Avoid...), prev...)
		out[i], oks[i] = Suggest(foods, n)
		prev = prev[:0]
		for _, it := range out[i].Items {
			prev = append(prev, it.Food.ID)
		}
	}
	return out, oks
}

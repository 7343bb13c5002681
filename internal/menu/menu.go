// Package menu turns a feed's carbohydrate target into food suggestions: one to
// three foods from the practice's foods list, each in half-portion steps and
// a sensible number of household portions, whose carbohydrate adds up to the
// target within a stated tolerance. It also owns the rule that a client's
// recorded cautions call for gluten-free suggestions. It is pure: no I/O, no
// database; the caller passes the foods list and the feed's needs.
package menu

import (
	"fmt"
	"math"
	"regexp"
	"strings"
)

// Food is one row of the foods list as the suggester needs it. Figures are per
// 100 g of the food as eaten or as weighed.
type Food struct {
	ID   int64
	Name string // the everyday name
	// SourceName is the composition table's name ("Rice, raw, milled"),
	// empty for the practice's own products.
	SourceName  string
	ChoPer100   float64
	ProtPer100  float64
	FatPer100   float64
	FibrePer100 float64
	PortionName string
	PortionG    float64
	// CookedYield is the grams as eaten per gram as weighed, for a food
	// eaten cooked but listed (and weighed in PortionG) dry or raw; 0 for a
	// food eaten as weighed.
	CookedYield float64
	Liquid      bool
	Portable    bool
	// Practice marks the practice's own products, entered from the label
	// (sports drinks, gels, bars): preferred for in-event and repletion feeds.
	Practice bool
	// ContainsGluten: wheat, barley, rye, oats unless certified, and foods
	// made from them.
	ContainsGluten bool
	// Facts are the food's dietary facts (Fact* codes); FactsRecorded
	// tells that someone recorded them. A food whose facts were never
	// recorded is left out whenever a dietary need other than gluten-free
	// applies: nothing is known to be safe.
	Facts         []string
	FactsRecorded bool
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
	// DrinksG, when set, lowers the cap on drinks in all (g ≈ ml).
	DrinksG float64
	// Ready prefers foods that are ready to eat (snacks between meals).
	Ready bool
	// Hours is how long a feed is spread over when that is more than one
	// sitting: the in-event total is taken across the whole event, so the
	// caps below apply per hour, and drinks at about 0.75 L an hour. Zero
	// means one sitting.
	Hours float64
	// GlutenFree leaves out foods that contain gluten (see GlutenFreeFor).
	GlutenFree bool
	// Exclude lists the dietary facts (Fact* codes) of foods that must not
	// be suggested: the client's dietary needs. Never relaxed.
	Exclude []string
	// ProteinG, when set, is the protein the feed is to bring (a meal or
	// the first feed after a session carries about 0.3 g/kg). From
	// MinProteinAwareG up, outside exercise, the foods' protein must lie
	// within ProteinTolerance of it, a protein food joining the
	// carbohydrate foods when they fall short; a smaller target only ranks
	// foods that bring protein first.
	ProteinG float64
	// Meal: a breakfast, lunch, dinner or supper, which is eaten: at least
	// one of its foods is not a drink (a 600 ml shake read badly as a
	// dinner), at most one is, and products for exercise (gels, sports
	// drinks, recovery shakes) are left out.
	Meal bool
	// anyFibre: a LowFibre need whose low-fibre foods alone had no fit
	// tries the whole list.
	anyFibre bool
	// afterExercise marks the drinks-and-portables first try of a
	// PreferOnTheMove need: on the move, but not during exercise.
	afterExercise bool
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
	ProteinG   float64 // sum of the items' protein
	// ProteinTargetG and ProteinToleranceG are set when the feed's protein
	// was held to a margin (see MinProteinAwareG): the items' protein lies
	// within ProteinTargetG ± ProteinToleranceG.
	ProteinTargetG    float64
	ProteinToleranceG float64
}

// Text is the suggestion in one short line, as a dietitian writes it: each
// food in its household measure with the amount as eaten, such as
// "White rice, boiled: 1½ × 1 cup, cooked (230 g); Cow's milk, whole:
// 1 glass (250 ml); Banana: 2 × 1 medium, peeled (200 g)". Short, because
// a day of meals of three foods each is printed on the sheet, one line a
// meal.
func (s Suggestion) Text() string {
	parts := make([]string, len(s.Items))
	for i, it := range s.Items {
		parts[i] = it.Food.Name + ": " + Measure(it.Food, it.Portions)
	}
	return strings.Join(parts, "; ")
}

// portionSize is a portion name's own size in brackets: "(500 ml)" of
// "1 bottle (500 ml)".
var portionSize = regexp.MustCompile(`\s*\([^()]*\)$`)

// flourFor is a flour's household portion, "flour for 1 chapati", with the
// size of one in brackets or not.
var flourFor = regexp.MustCompile(`^flour for 1 (\pL+)(?:\s*\([^()]*\))?$`)

// Measure says an amount of a food in household portions with the amount
// as eaten in brackets: "2 × 1 medium, peeled (200 g)", "1 glass (250 ml)".
// One portion whose name gives its size says no more ("1 bar (45 g)"); more
// portions leave the size of one out ("2 × 1 bottle (1000 ml)").
func Measure(f Food, portions float64) string {
	name := f.PortionName
	// Flour is eaten baked: "2 chapatis (made with 60 g of flour)", not
	// "2 × flour for 1 chapati", which reads as if the flour were the meal.
	if m := flourFor.FindStringSubmatch(name); m != nil {
		bread := m[1]
		if portions > 1 {
			bread += "s"
		}
		return formatPortions(portions) + " " + bread + " (made with " + Amount(f, portions*f.PortionG) + " of flour)"
	}
	if portions == 1 {
		if portionSize.MatchString(name) {
			return name
		}
		return name + " (" + Amount(f, portions*f.PortionG) + ")"
	}
	return formatPortions(portions) + " × " + portionSize.ReplaceAllString(name, "") + " (" + Amount(f, portions*f.PortionG) + ")"
}

// Amount says an amount of a food as eaten: ml for a drink (1 g taken as
// 1 ml, near enough for the drinks of a plan), the cooked weight rounded to
// 10 g for a food eaten cooked ("g cooked" unless its portion name already
// says cooked), else grams.
func Amount(f Food, grams float64) string {
	switch {
	case f.Liquid:
		return fmt.Sprintf("%.0f ml", math.Round(grams))
	case f.CookedYield > 0:
		cooked := fmt.Sprintf("%.0f g", math.Round(grams*f.CookedYield/10)*10)
		if !strings.Contains(strings.ToLower(f.PortionName), "cooked") {
			cooked += " cooked"
		}
		return cooked
	}
	return fmt.Sprintf("%.0f g", math.Round(grams))
}

// formatPortions writes a number of portions in half steps as a person
// does: 2, ½, 1½.
func formatPortions(p float64) string {
	whole, half := math.Trunc(p), p-math.Trunc(p)
	switch {
	case half == 0:
		return fmt.Sprintf("%.0f", p)
	case half == 0.5 && whole == 0:
		return "½"
	case half == 0.5:
		return fmt.Sprintf("%.0f½", whole)
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
	// LowFibreMaxPer100: and at most 3 g of fibre per 100 g as weighed in
	// the table (dry for cereals), which keeps whole grains out: brown rice
	// (4.4 g) and parboiled rice (3.7 g) are not low-fibre, white rice (2.8 g)
	// is. A threshold of this project's own; low-fibre eating on loading
	// days favours refined cereals and peeled fruit (common practice).
	LowFibreMaxPer100 = 3.0
	// Caps on one feed, this project's own from what an athlete can eat at
	// one sitting: at most 4 household portions of one food (2 of a gel, whose
	// sachets are taken with water and spaced out), at most 600 g of one
	// solid food, and at most 1.5 L of drinks in all.
	maxPortions    = 4
	maxGelPortions = 2
	maxItemGrams   = 600
	maxDrinkGrams  = 1500
	// drinkGramsPerHour: fluid during exercise is commonly 0.4–0.8 L an hour
	// (common practice); the upper part of that range bounds the drinks of
	// an in-event total.
	drinkGramsPerHour = 750
	poolSize          = 14 // best-ranked foods considered for combinations
)

// Suggest picks 1–3 foods whose carbohydrate adds up to need.ChoG within
// Tolerance, within the caps on portions and drinks. Among the combinations
// that fit it prefers a close sum, then two or three foods in a few portions
// each over many portions of one, whole portions over halves, lower fibre
// when asked, and ready-to-eat and practice foods for feeds during or soon
// after exercise. ok is false when nothing fits: the caller says so rather
// than forcing a bad suggestion.
func Suggest(foods []Food, need Need) (s Suggestion, ok bool) {
	if need.PreferOnTheMove && !need.OnTheMove {
		quick := need
		quick.OnTheMove, quick.PreferOnTheMove, quick.afterExercise = true, false, true
		if s, ok := Suggest(foods, quick); ok {
			return s, true
		}
	}
	s = Suggestion{TargetG: need.ChoG, ToleranceG: Tolerance(need.ChoG)}
	if !(need.ChoG > 0) || math.IsInf(need.ChoG, 0) {
		return s, false
	}
	if proteinAware(need) {
		s.ProteinTargetG, s.ProteinToleranceG = need.ProteinG, ProteinTolerance(need.ProteinG)
	}
	foodPool := pool(foods, need)
	if len(foodPool) == 0 {
		return s, false
	}
	best, found := search(foodPool, need, s.ToleranceG)
	if !found && need.LowFibre && !need.anyFibre {
		// Low-fibre foods alone may not reach a large target within the
		// caps: then the whole list, with fibre still weighed in the score.
		need.anyFibre = true
		best, found = search(pool(foods, need), need, s.ToleranceG)
	}
	if !found && len(need.Avoid) > 0 {
		// The avoided foods may be the only ones that fit: allow them.
		need.Avoid = nil
		best, found = search(pool(foods, need), need, s.ToleranceG)
	}
	if !found {
		return s, false
	}
	s.Items = best
	for _, it := range best {
		s.ChoG += it.ChoG
		s.ProteinG += it.ProteinG
	}
	return s, true
}

// pool is the foods Suggest combines for a need: the carbohydrate foods
// that suit it and, when its protein counts, the protein foods.
func pool(foods []Food, need Need) []Food {
	return withProteinFoods(candidates(foods, need), foods, need)
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

// MaxPortions is the most household portions of one food in one sitting.
func MaxPortions(f Food) float64 {
	if isGel(f) {
		return maxGelPortions
	}
	return maxPortions
}

// sittings is how many times the per-feed caps apply to a need: once, or
// once per started hour of a feed spread over hours.
func sittings(need Need) float64 {
	if need.Hours > 1 && !math.IsInf(need.Hours, 0) {
		return math.Ceil(math.Min(need.Hours, 24))
	}
	return 1
}

// drinkLimit is the most grams of drinks in all for a need.
func drinkLimit(need Need) float64 {
	limit := float64(maxDrinkGrams)
	if n := sittings(need); n > 1 {
		limit = math.Max(maxDrinkGrams, drinkGramsPerHour*need.Hours)
	}
	if need.DrinksG > 0 && need.DrinksG < limit {
		limit = need.DrinksG
	}
	return limit
}

// steps lists the allowed portion counts of a food: 0.5, 1, 1.5 … (whole
// sachets of a gel) within the caps on portions and on grams (the smallest
// step is always allowed).
func steps(f Food, need Need) []float64 {
	n := sittings(need)
	limitG := maxItemGrams * n
	if f.Liquid {
		limitG = drinkLimit(need)
	}
	// A gel sachet is taken whole once opened (common practice).
	first, step := 0.5, 0.5
	if isGel(f) {
		first, step = 1, 1
	}
	var out []float64
	for p := first; p <= MaxPortions(f)*n; p += step {
		if p*f.PortionG > limitG && p > first {
			break
		}
		out = append(out, p)
	}
	return out
}

// SuggestDay suggests foods for the feeds of one day in order, steering each
// feed away from the foods of the two before it so that a day, or a
// repletion window of feeds every 30 min, is not one or two foods over and
// over. ok[i] tells whether feed i got a suggestion.
func SuggestDay(foods []Food, needs []Need) ([]Suggestion, []bool) {
	out := make([]Suggestion, len(needs))
	oks := make([]bool, len(needs))
	for i, n := range needs {
		n.Avoid = append([]int64(nil), n.Avoid...)
		// In-event feeds keep the drinks and gels made for them, whatever
		// the meal before had.
		for j := max(0, i-2); j < i && !n.OnTheMove; j++ {
			for _, it := range out[j].Items {
				n.Avoid = append(n.Avoid, it.Food.ID)
			}
		}
		out[i], oks[i] = Suggest(foods, n)
	}
	return out, oks
}

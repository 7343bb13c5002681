package menu

// The dietitian's own food for a feed: lines of foods from the foods list
// in grams, or free lines in their own words with their carbohydrate, that
// replace the suggestion and are checked against the feed's grams and the
// client's dietary needs.

import (
	"fmt"
	"math"
	"strings"
)

// ChoicePrefix opens the text of a feed whose food the dietitian chose, so
// that every surface that prints the stored text (plan page, sheet,
// calendar, phone page) says whose choice it is.
const ChoicePrefix = "Dietitian’s choice: "

// Limits of one line of a choice. A feed is one sitting or one in-event
// total: 2 kg of one food or 500 g of carbohydrate from one free line is a
// slip of the keyboard, not a feed (this project's own bounds; the largest
// loading-day meal is about 4 g/kg, some 300 g of carbohydrate for a 75 kg
// athlete).
const (
	MaxChoiceGrams = 2000
	MaxChoiceChoG  = 500
	// MaxChoiceProteinG: 200 g of protein on one line is a slip of the
	// keyboard too (a large meal of meat brings some 60 g).
	MaxChoiceProteinG = 200
	MaxChoiceLines    = 4 // foods from the list
	MaxChoiceFree     = 2 // free lines
	MaxChoiceTextLen  = 200
)

// ChoiceLine is one line of a dietitian's food choice. A food line names a
// food of the list (FoodID, its name as it was when chosen) and an amount
// as eaten, in Unit; a free line (Free) is the dietitian's own words with
// the carbohydrate they give it.
type ChoiceLine struct {
	Free     bool
	FoodID   int64 // 0 for a free line, or when the food has since been deleted
	Name     string
	Grams    float64 // food lines only: the amount as eaten, in Unit
	Unit     string  // UnitGrams, UnitMl or UnitCooked
	ChoG     float64
	ProteinG float64
}

// Units of a food line's amount: as eaten, so that a dietitian writes
// "150 g cooked" of rice and "500 ml" of a drink as they would by hand.
const (
	UnitGrams  = "g"
	UnitMl     = "ml"       // a drink, 1 g taken as 1 ml
	UnitCooked = "g cooked" // a food with a CookedYield
)

// UnitOf is the unit a food's amount is given in.
func UnitOf(f Food) string {
	switch {
	case f.Liquid:
		return UnitMl
	case f.CookedYield > 0:
		return UnitCooked
	}
	return UnitGrams
}

// FoodLine makes the line for an amount of a food as eaten (in UnitOf(f)):
// its carbohydrate and protein from the food's per-100 g figures, as
// weighed in the table (the cooked weight over the food's cooked yield).
func FoodLine(f Food, amount float64) ChoiceLine {
	weighed := amount
	if f.CookedYield > 0 && !f.Liquid {
		weighed = amount / f.CookedYield
	}
	return ChoiceLine{FoodID: f.ID, Name: f.Name, Grams: amount, Unit: UnitOf(f),
		ChoG: round1(f.ChoPer100 * weighed / 100), ProteinG: round1(f.ProtPer100 * weighed / 100)}
}

// AsEaten is an amount as weighed in the table turned into the amount as
// eaten, in UnitOf(f), rounded to whole grams (or ml).
func AsEaten(f Food, weighed float64) float64 {
	if f.CookedYield > 0 && !f.Liquid {
		return math.Round(weighed * f.CookedYield)
	}
	return math.Round(weighed)
}

func round1(x float64) float64 { return math.Round(x*10) / 10 }

// ChoiceText is the one-line text of a choice, as stored with the feed.
func ChoiceText(lines []ChoiceLine) string {
	parts := make([]string, 0, len(lines))
	for _, l := range lines {
		if l.Free {
			if l.ProteinG > 0 {
				parts = append(parts, fmt.Sprintf("%s (%s g carbohydrate, %s g protein)", l.Name, trimNum(l.ChoG), trimNum(l.ProteinG)))
			} else {
				parts = append(parts, fmt.Sprintf("%s (%s g carbohydrate)", l.Name, trimNum(l.ChoG)))
			}
		} else {
			unit := l.Unit
			if unit == "" {
				unit = UnitGrams
			}
			parts = append(parts, fmt.Sprintf("%s: %s %s", l.Name, trimNum(l.Grams), unit))
		}
	}
	return ChoicePrefix + strings.Join(parts, "; ")
}

// IsChoice tells a stored text made by ChoiceText from a suggestion.
func IsChoice(text string) bool { return strings.HasPrefix(text, ChoicePrefix) }

func trimNum(x float64) string {
	if x == math.Trunc(x) {
		return fmt.Sprintf("%.0f", x)
	}
	return fmt.Sprintf("%.1f", x)
}

// ChoiceCheck is one finding about a dietitian's choice.
type ChoiceCheck struct {
	Level   string // "caution" or "note", as the plan's findings
	Message string
}

// CheckChoice checks a choice against its feed: the carbohydrate it adds
// up to against the feed's grams within Tolerance (the margin suggestions
// keep to); on a feed whose protein suggestions keep to (feedProteinG of
// MinProteinAwareG or more; the caller passes 0 for an in-event feed) the
// protein it adds up to within ProteinTolerance, a free line counting with
// the protein the dietitian gave it (none given counts as 0 g, and is
// said); and each food line against the client's dietary need codes with
// the food's facts as the foods list has them now (byID; a food no longer
// in the list cannot be checked and is said so). Free lines cannot be
// checked against needs, which is said when needs are recorded.
func CheckChoice(lines []ChoiceLine, feedChoG, feedProteinG float64, byID map[int64]Food, needCodes []string) []ChoiceCheck {
	var out []ChoiceCheck
	sum := 0.0
	for _, l := range lines {
		sum += l.ChoG
	}
	tol := Tolerance(feedChoG)
	switch d := sum - feedChoG; {
	case d < -tol:
		out = append(out, ChoiceCheck{"caution", fmt.Sprintf("The chosen food gives %s g of carbohydrate, %s g short of the feed’s %s g (more than the ±%s g margin).",
			trimNum(round1(sum)), trimNum(round1(-d)), trimNum(round1(feedChoG)), trimNum(round1(tol)))})
	case d > tol:
		out = append(out, ChoiceCheck{"caution", fmt.Sprintf("The chosen food gives %s g of carbohydrate, %s g over the feed’s %s g (more than the ±%s g margin).",
			trimNum(round1(sum)), trimNum(round1(d)), trimNum(round1(feedChoG)), trimNum(round1(tol)))})
	}
	out = append(out, checkProtein(lines, feedProteinG)...)
	labels := NeedLabels(needCodes)
	free := false
	for _, l := range lines {
		if l.Free {
			free = true
			continue
		}
		f, ok := byID[l.FoodID]
		if !ok {
			if len(labels) > 0 {
				out = append(out, ChoiceCheck{"note", l.Name + " is no longer in the foods list, so it cannot be checked against the client’s dietary needs."})
			}
			continue
		}
		if broken := brokenNeeds(f, needCodes); len(broken) > 0 {
			out = append(out, ChoiceCheck{"caution", f.Name + " breaks the client’s recorded dietary needs: " + strings.Join(broken, ", ") + "."})
		}
	}
	if free && len(labels) > 0 {
		out = append(out, ChoiceCheck{"note", "Lines in your own words are not checked against the client’s dietary needs (" + strings.Join(labels, ", ") + ")."})
	}
	return out
}

// brokenNeeds lists the words of the needs a food breaks.
func brokenNeeds(f Food, codes []string) []string {
	var out []string
	for _, n := range Needs {
		for _, c := range codes {
			if c == n.Code && breaks(f, n.Excludes) {
				out = append(out, n.Label)
			}
		}
	}
	return out
}

// checkProtein is CheckChoice's protein check.
func checkProtein(lines []ChoiceLine, feedProteinG float64) []ChoiceCheck {
	if !(feedProteinG >= MinProteinAwareG) {
		return nil
	}
	sum := 0.0
	var uncounted []string
	for _, l := range lines {
		sum += l.ProteinG
		if l.Free && l.ProteinG == 0 {
			uncounted = append(uncounted, "“"+l.Name+"”")
		}
	}
	tol := ProteinTolerance(feedProteinG)
	var out []ChoiceCheck
	switch d := sum - feedProteinG; {
	case d < -tol:
		out = append(out, ChoiceCheck{"caution", fmt.Sprintf("The chosen food gives %s g of protein, %s g short of the feed’s %s g (more than the ±%s g margin).",
			trimNum(round1(sum)), trimNum(round1(-d)), trimNum(round1(feedProteinG)), trimNum(round1(tol)))})
	case d > tol:
		out = append(out, ChoiceCheck{"caution", fmt.Sprintf("The chosen food gives %s g of protein, %s g over the feed’s %s g (more than the ±%s g margin).",
			trimNum(round1(sum)), trimNum(round1(d)), trimNum(round1(feedProteinG)), trimNum(round1(tol)))})
	}
	switch len(uncounted) {
	case 0:
	case 1:
		out = append(out, ChoiceCheck{"note", uncounted[0] + " has no protein figure, so it counts as 0 g of protein here: give the line’s protein to count it."})
	default:
		out = append(out, ChoiceCheck{"note", strings.Join(uncounted, " and ") + " have no protein figure, so they count as 0 g of protein here: give the lines’ protein to count them."})
	}
	return out
}

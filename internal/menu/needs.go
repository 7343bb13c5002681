package menu

import (
	"regexp"
	"slices"
	"strings"
)

// A client's dietary needs are codes from Needs; a food's dietary facts are
// codes from Facts. A need leaves out every food that has any of the facts
// it names, so that a suggestion never breaks a recorded need.

// Facts a food can carry: what it contains or is made from.
const (
	FactGluten        = "gluten"         // wheat, barley, rye, oats unless certified
	FactLactose       = "lactose"        // milk sugar: milk, most fresh dairy
	FactMilkProtein   = "milk_protein"   // casein or whey: any dairy, whey-based shakes
	FactTreeNuts      = "tree_nuts"      // almonds, cashews and the like
	FactPeanuts       = "peanuts"        // peanuts (groundnuts), a legume
	FactEgg           = "egg"            // egg or foods made with it
	FactSoy           = "soy"            // soya beans and soya protein
	FactFishShellfish = "fish_shellfish" // fish, crustaceans, molluscs
	FactMeat          = "meat"           // meat or poultry (not vegetarian)
	FactAnimal        = "animal"         // any food of animal origin (not vegan): meat, fish, egg, milk, honey
	FactPork          = "pork"           // pork or pork-derived (gelatine of pork)
	FactAlcohol       = "alcohol"        // contains alcohol
	FactHighFODMAP    = "high_fodmap"    // high in fermentable carbohydrates at the portion eaten
)

// Facts lists every fact with its words for the foods form, in order.
var Facts = []struct{ Code, Label string }{
	{FactGluten, "Contains gluten"},
	{FactLactose, "Contains lactose"},
	{FactMilkProtein, "Contains milk protein"},
	{FactTreeNuts, "Contains tree nuts"},
	{FactPeanuts, "Contains peanuts"},
	{FactEgg, "Contains egg"},
	{FactSoy, "Contains soy"},
	{FactFishShellfish, "Contains fish or shellfish"},
	{FactMeat, "Contains meat or poultry"},
	{FactAnimal, "Of animal origin (not vegan)"},
	{FactPork, "Contains pork"},
	{FactAlcohol, "Contains alcohol"},
	{FactHighFODMAP, "High FODMAP at its portion"},
}

// DietaryNeed is one need a client can have recorded.
type DietaryNeed struct {
	Code, Label string
	// Excludes are the facts of the foods the need leaves out.
	Excludes []string
	// words tell the need in free text (recorded cautions), for the offer
	// to record it as structured data; they err towards offering.
	words *regexp.Regexp
}

// Needs is every dietary need, in the order the form lists them.
var Needs = []DietaryNeed{
	{"gluten_free", "Gluten-free", []string{FactGluten}, regexp.MustCompile(`(?i)\b(c(o|œ)?eliac|celiac|gluten)`)},
	{"lactose_free", "Lactose-free", []string{FactLactose}, regexp.MustCompile(`(?i)\b(lactose|dairy|milk)`)},
	{"milk_protein_free", "Milk-protein-free", []string{FactMilkProtein, FactLactose},
		regexp.MustCompile(`(?i)\b(milk[- ]protein|cows?'? ?milk allerg|milk allerg|dairy[- ]free|dairy allerg|casein|whey allerg|no milk or dairy|no dairy)`)},
	{"no_nuts", "No tree nuts", []string{FactTreeNuts}, regexp.MustCompile(`(?i)\b(tree[- ]nuts?|nut allerg|nuts?\b|almonds?|cashews?|walnuts?|hazelnuts?|pistachios?)`)},
	{"no_peanuts", "No peanuts", []string{FactPeanuts}, regexp.MustCompile(`(?i)\b(peanuts?|groundnuts?)`)},
	{"no_egg", "No egg", []string{FactEgg}, regexp.MustCompile(`(?i)\beggs?\b`)},
	{"no_soy", "No soy", []string{FactSoy}, regexp.MustCompile(`(?i)\bsoy(a)?\b`)},
	{"no_fish_shellfish", "No fish or shellfish", []string{FactFishShellfish}, regexp.MustCompile(`(?i)\b(fish|shellfish|seafood|prawns?|shrimps?|crustacean|mollus)`)},
	{"vegetarian", "Vegetarian", []string{FactMeat, FactFishShellfish, FactPork}, regexp.MustCompile(`(?i)\bvegetarian`)},
	{"vegan", "Vegan", []string{FactAnimal, FactMeat, FactFishShellfish, FactPork, FactEgg, FactLactose, FactMilkProtein}, regexp.MustCompile(`(?i)\bvegan`)},
	{"no_pork", "No pork", []string{FactPork}, regexp.MustCompile(`(?i)\b(pork|halal|kosher)`)},
	{"no_alcohol", "No alcohol", []string{FactAlcohol}, regexp.MustCompile(`(?i)\b(alcohol)`)},
	{"low_fodmap", "Low FODMAP", []string{FactHighFODMAP}, regexp.MustCompile(`(?i)\b(fodmap|ibs\b|irritable bowel)`)},
}

// NeedByCode finds a need; ok is false for an unknown code.
func NeedByCode(code string) (DietaryNeed, bool) {
	for _, n := range Needs {
		if n.Code == code {
			return n, true
		}
	}
	return DietaryNeed{}, false
}

// NeedLabels gives the words of recorded needs, in the form's order.
func NeedLabels(codes []string) []string {
	var out []string
	for _, n := range Needs {
		if slices.Contains(codes, n.Code) {
			out = append(out, n.Label)
		}
	}
	return out
}

// Mention is a need a free-text note seems to name, with the words it
// was told by.
type Mention struct {
	Need   DietaryNeed
	Phrase string
}

// NeedsIn finds the needs that free text (a client's recorded cautions)
// seems to name. It errs towards finding: the dietitian confirms each one
// before it is recorded.
func NeedsIn(text string) []Mention {
	var out []Mention
	for _, n := range Needs {
		if m := n.words.FindString(text); m != "" {
			out = append(out, Mention{Need: n, Phrase: m})
		}
	}
	return out
}

// excluded gathers the facts that a set of need codes leaves out.
func excluded(codes []string) []string {
	var out []string
	for _, c := range codes {
		if n, ok := NeedByCode(c); ok {
			for _, f := range n.Excludes {
				if !slices.Contains(out, f) {
					out = append(out, f)
				}
			}
		}
	}
	return out
}

// hasFact tells whether a food carries a fact (gluten is also its own flag).
func hasFact(f Food, fact string) bool {
	if fact == FactGluten && f.ContainsGluten {
		return true
	}
	return slices.Contains(f.Facts, fact)
}

// breaks tells whether a food must be left out for a need: it carries an
// excluded fact, or its facts were never recorded while a need other
// than gluten-free applies.
func breaks(f Food, exclude []string) bool {
	if len(exclude) == 0 {
		return false
	}
	for _, x := range exclude {
		// Gluten has its own flag, recorded for every food since the
		// foods list began; the other facts only once FactsRecorded.
		if hasFact(f, x) || x != FactGluten && !f.FactsRecorded {
			return true
		}
	}
	return false
}

// Breaks tells whether a food breaks any of the need codes; tests and
// the dietitian's own choices are checked with it.
func Breaks(f Food, codes []string) bool { return breaks(f, excluded(codes)) }

// needsNote is the line shown next to suggestions made for recorded needs.
func needsNote(codes []string) string {
	labels := NeedLabels(codes)
	if len(labels) == 0 {
		return ""
	}
	return "Suggestions keep to: " + strings.Join(labels, ", ")
}

package menu

import (
	"strings"
	"testing"
)

// A food line's carbohydrate and protein come from the food's per-100 g
// figures: 150 g of raw milled rice (IFCT 2017 A015: 78.24 g carbohydrate,
// 7.94 g protein per 100 g) gives 117.4 g and 11.9 g; 250 g of whole
// buffalo milk (L001: 8.39 g, 3.68 g) gives 21.0 g and 9.2 g.
func TestFoodLineFromTheTable(t *testing.T) {
	for _, c := range []struct {
		f            Food
		grams        float64
		cho, protein float64
	}{
		{milledRice, 150, 117.4, 11.9},
		{buffaloMilk, 250, 21.0, 9.2},
	} {
		l := FoodLine(c.f, c.grams)
		if l.ChoG != c.cho || l.ProteinG != c.protein || l.Free || l.FoodID != c.f.ID || l.Grams != c.grams {
			t.Errorf("%s, %g g: got %+v, want %g g carbohydrate and %g g protein", c.f.Name, c.grams, l, c.cho, c.protein)
		}
	}
}

func TestChoiceText(t *testing.T) {
	got := ChoiceText([]ChoiceLine{FoodLine(milledRice, 75), {Free: true, Name: "banana and a rice cake", ChoG: 30}})
	want := "Dietitian’s choice: Rice, raw, milled: 75 g; banana and a rice cake (30 g carbohydrate)"
	if got != want || !IsChoice(got) {
		t.Fatalf("got %q, want %q", got, want)
	}
	if IsChoice("Rice, raw, milled: 1.5 × ¼ cup, uncooked (50 g) = 75 g") {
		t.Fatal("a suggestion read as the dietitian's choice")
	}
}

// The margin of a choice is the suggestions' (±10 % or ±5 g, whichever is
// larger): for a 60 g feed, 54–66 g passes and 53 or 67 g is said.
func TestCheckChoiceAgainstTheFeed(t *testing.T) {
	byID := map[int64]Food{milledRice.ID: milledRice, buffaloMilk.ID: buffaloMilk}
	free := func(g float64) []ChoiceLine { return []ChoiceLine{{Free: true, Name: "toast and jam", ChoG: g}} }
	for _, c := range []struct {
		cho  float64
		want string
	}{
		{54, ""}, {66, ""}, {60, ""},
		{53, "7 g short of the feed’s 60 g"},
		{67, "7 g over the feed’s 60 g"},
	} {
		checks := CheckChoice(free(c.cho), 60, 0, byID, nil)
		switch {
		case c.want == "" && len(checks) != 0:
			t.Errorf("%g g for a 60 g feed: unexpected %+v", c.cho, checks)
		case c.want != "" && (len(checks) != 1 || checks[0].Level != "caution" || !strings.Contains(checks[0].Message, c.want)):
			t.Errorf("%g g for a 60 g feed: got %+v, want a caution saying %q", c.cho, checks, c.want)
		}
	}
	// A small feed: the margin is 5 g, not 10 %.
	if checks := CheckChoice(free(25), 20, 0, byID, nil); len(checks) != 0 {
		t.Errorf("25 g for a 20 g feed is within ±5 g: %+v", checks)
	}
}

// A swapped food that breaks a recorded need is said, with the need's
// words; a free line is said to be unchecked when needs are recorded; a
// food that fits raises nothing.
func TestCheckChoiceAgainstNeeds(t *testing.T) {
	byID := map[int64]Food{milledRice.ID: milledRice, buffaloMilk.ID: buffaloMilk}
	milk := FoodLine(buffaloMilk, 500) // 42 g carbohydrate
	checks := CheckChoice([]ChoiceLine{milk}, 42, 0, byID, []string{"lactose_free", "no_nuts"})
	if len(checks) != 1 || checks[0].Level != "caution" || !strings.Contains(checks[0].Message, "Milk, whole, Buffalo breaks") ||
		!strings.Contains(checks[0].Message, "Lactose-free") || strings.Contains(checks[0].Message, "No tree nuts") {
		t.Fatalf("milk for a lactose-free client: %+v", checks)
	}
	rice := FoodLine(milledRice, 50) // 39.1 g
	if checks := CheckChoice([]ChoiceLine{rice}, 40, 0, byID, []string{"lactose_free", "vegan"}); len(checks) != 0 {
		t.Fatalf("rice breaks nothing: %+v", checks)
	}
	checks = CheckChoice([]ChoiceLine{rice, {Free: true, Name: "a biscuit", ChoG: 8}}, 47, 0, byID, []string{"gluten_free"})
	if len(checks) != 1 || checks[0].Level != "note" || !strings.Contains(checks[0].Message, "not checked") {
		t.Fatalf("a free line for a gluten-free client: %+v", checks)
	}
	// A food no longer in the list cannot be checked, and is said so.
	gone := ChoiceLine{FoodID: 99, Name: "Old bar", Grams: 40, ChoG: 40}
	checks = CheckChoice([]ChoiceLine{gone}, 40, 0, byID, []string{"no_nuts"})
	if len(checks) != 1 || !strings.Contains(checks[0].Message, "no longer in the foods list") {
		t.Fatalf("a food no longer listed: %+v", checks)
	}
}

// A choice on a feed with a protein target is checked against its protein
// too, within ProteinTolerance (±20 % or ±5 g): for a 25 g dinner, 150 g of
// raw milled rice (IFCT 2017 A015: 7.94 g protein per 100 g, so 11.9 g) and
// a glass of buffalo milk (L001: 3.68 g per 100 g, so 9.2 g) give 21.1 g,
// inside 20–30 g; the rice alone, 11.9 g, is 13.1 g short and said so. A
// free line counts with the protein the dietitian gives it, and one with
// none given is said to count as 0 g. A feed under MinProteinAwareG (an
// in-event feed is passed as 0) is not checked for protein.
func TestCheckChoiceProtein(t *testing.T) {
	byID := map[int64]Food{milledRice.ID: milledRice, buffaloMilk.ID: buffaloMilk}
	rice, milk := FoodLine(milledRice, 150), FoodLine(buffaloMilk, 250)
	has := func(checks []ChoiceCheck, part string) bool {
		for _, c := range checks {
			if strings.Contains(c.Message, part) {
				return true
			}
		}
		return false
	}
	if checks := CheckChoice([]ChoiceLine{rice, milk}, 138, 25, byID, nil); has(checks, "protein") {
		t.Errorf("rice and milk (21.1 g) for 25 g protein: %+v", checks)
	}
	checks := CheckChoice([]ChoiceLine{rice}, 117, 25, byID, nil)
	if !has(checks, "gives 11.9 g of protein, 13.1 g short of the feed’s 25 g (more than the ±5 g margin)") || checks[0].Level != "caution" {
		t.Errorf("rice alone for 25 g protein: %+v", checks)
	}
	if checks := CheckChoice([]ChoiceLine{rice, milk}, 138, 14, byID, nil); !has(checks, "7.1 g over the feed’s 14 g") {
		t.Errorf("21.1 g for 14 g protein: %+v", checks)
	}
	egg := ChoiceLine{Free: true, Name: "two boiled eggs", ChoG: 1, ProteinG: 13}
	if checks := CheckChoice([]ChoiceLine{rice, egg}, 118, 25, byID, nil); has(checks, "protein") {
		t.Errorf("rice and eggs given as 13 g protein (24.9 g): %+v", checks)
	}
	toast := ChoiceLine{Free: true, Name: "toast with peanut butter", ChoG: 30}
	checks = CheckChoice([]ChoiceLine{rice, toast}, 147, 25, byID, nil)
	if !has(checks, "13.1 g short") || !has(checks, "“toast with peanut butter” has no protein figure, so it counts as 0 g") {
		t.Errorf("a free line without protein: %+v", checks)
	}
	if checks := CheckChoice([]ChoiceLine{rice}, 117, 9, byID, nil); len(checks) != 0 {
		t.Errorf("a 9 g protein target is not checked: %+v", checks)
	}
	if checks := CheckChoice([]ChoiceLine{toast}, 30, 0, byID, nil); len(checks) != 0 {
		t.Errorf("an in-event feed (0 g protein) is not checked for protein: %+v", checks)
	}
	if got := ChoiceText([]ChoiceLine{egg}); got != ChoicePrefix+"two boiled eggs (1 g carbohydrate, 13 g protein)" {
		t.Errorf("free line with protein: %q", got)
	}
}

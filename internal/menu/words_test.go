package menu

import (
	"strings"
	"testing"
)

// Fibre tags from the composition table's figures (IFCT 2017, Longvah T et
// al., National Institute of Nutrition, Hyderabad; per 100 g as weighed):
// brown rice A013 has 4.43 g fibre for 74.8 g carbohydrate and parboiled rice
// A014 3.74 g, whole grains that are not low-fibre; raw milled (white) rice
// A015 2.81 g for 78.24 g, refined flour A018 2.76 g, ripe banana E012 1.94 g
// for 23.63 g and jaggery I001 none are (common practice: refined cereals and
// peeled ripe fruit on low-fibre days); raisins E057 (3.92 g) and whole-wheat
// flour A019 (11.36 g) are not.
func TestFibreTagsFromTheTable(t *testing.T) {
	foods, codes := loadIFCTCodes(t)
	want := map[string]bool{"A013": false, "A014": false, "A015": true, "A018": true, "E012": true, "I001": true, "E057": false, "A019": false}
	seen := 0
	for i, f := range foods {
		if w, ok := want[codes[i]]; ok {
			seen++
			if got := IsLowFibre(f); got != w {
				t.Errorf("%s %s (fibre %.2f g, carbohydrate %.2f g per 100 g): low fibre %v, want %v", codes[i], f.Name, f.FibrePer100, f.ChoPer100, got, w)
			}
		}
	}
	if seen != len(want) {
		t.Fatalf("found %d of the %d foods in the extract", seen, len(want))
	}
}

// Amounts as a person measures them: household portions, with ml for a
// drink, the cooked weight for a food eaten cooked (2.6 g boiled rice per g
// uncooked, the seeded yield: 90 g uncooked is 234 g, said as 230 g),
// grams otherwise; the everyday name is what the suggestion says.
func TestSuggestionSaysAmountsAsEaten(t *testing.T) {
	rice := ifctRow(t, "A015", "1 cup, cooked", 60)
	rice.SourceName, rice.Name, rice.CookedYield = rice.Name, "White rice, boiled", 2.6
	milk := ifctRow(t, "L002", "1 glass", 250)
	milk.SourceName, milk.Name, milk.Liquid = milk.Name, "Cow's milk, whole", true
	banana := ifctRow(t, "E012", "1 medium, peeled", 100)
	banana.SourceName, banana.Name = banana.Name, "Banana"
	s := Suggestion{Items: []Item{item(rice, 1.5), item(milk, 1), item(banana, 2)}}
	want := "White rice, boiled: 1½ × 1 cup, cooked (230 g); " +
		"Cow's milk, whole: 1 glass (250 ml); Banana: 2 × 1 medium, peeled (200 g)"
	if got := s.Text(); got != want {
		t.Fatalf("got  %q\nwant %q", got, want)
	}
	// A portion whose name gives its size says it once; more portions give
	// the amount of them all; a food eaten cooked whose portion name does
	// not say so is given "g cooked".
	drink := Food{Name: "Sports drink", PortionName: "1 bottle (500 ml)", PortionG: 500, Liquid: true}
	dal := Food{Name: "Moong dal, boiled", PortionName: "40 g dry", PortionG: 40, CookedYield: 2.5}
	// Flour is said as the breads it makes, with the flour's weight: a
	// chapati takes about 30 g of atta (common practice, the seeded portion).
	atta := Food{Name: "Whole-wheat flour (atta)", PortionName: "flour for 1 chapati", PortionG: 30}
	maida := Food{Name: "Refined wheat flour (maida)", PortionName: "flour for 1 flatbread (30 g)", PortionG: 30}
	for _, c := range []struct {
		f    Food
		p    float64
		want string
	}{
		{drink, 1, "1 bottle (500 ml)"}, {drink, 2, "2 × 1 bottle (1000 ml)"}, {dal, 0.5, "½ × 40 g dry (50 g cooked)"},
		{atta, 2, "2 chapatis (made with 60 g of flour)"}, {atta, 0.5, "½ chapati (made with 15 g of flour)"},
		{maida, 1, "1 flatbread (made with 30 g of flour)"}, {maida, 1.5, "1½ flatbreads (made with 45 g of flour)"},
	} {
		if got := Measure(c.f, c.p); got != c.want {
			t.Errorf("Measure(%s, %g) = %q, want %q", c.f.Name, c.p, got, c.want)
		}
	}
	// A dietitian's line is given as eaten: 230 g of boiled rice is 88.5 g
	// uncooked, so 69.2 g carbohydrate at 78.24 g per 100 g (A015).
	l := FoodLine(rice, 230)
	if l.Unit != UnitCooked || l.ChoG != 69.2 {
		t.Fatalf("230 g cooked rice: %+v, want 69.2 g carbohydrate in g cooked", l)
	}
	if got := ChoiceText([]ChoiceLine{l, FoodLine(milk, 300)}); got != ChoicePrefix+"White rice, boiled: 230 g cooked; Cow's milk, whole: 300 ml" {
		t.Fatalf("choice text %q", got)
	}
	if AsEaten(rice, 90) != 234 || AsEaten(milk, 250) != 250 {
		t.Fatal("AsEaten disagrees with the yield")
	}
}

// White, brown and parboiled rice are one kind by the table's name, whatever
// their everyday names: a suggestion never pairs two of them.
func TestKindFromTheTableName(t *testing.T) {
	white := Food{ID: 1, Name: "White rice, boiled", SourceName: "Rice, raw, milled"}
	brown := Food{ID: 2, Name: "Brown rice, boiled", SourceName: "Rice, raw, brown"}
	gel := Food{ID: 3, Name: "Harbourside energy gel"}
	if kind(white) != kind(brown) || kind(white) != "rice" {
		t.Fatalf("kinds %q and %q", kind(white), kind(brown))
	}
	if !strings.EqualFold(kind(gel), gel.Name) {
		t.Fatalf("a practice product is its own kind, got %q", kind(gel))
	}
}

package menu

import (
	"strings"
	"testing"
)

// Milk figures per 100 g: IFCT 2017 L001 (buffalo milk, whole); rice: A015
// (raw milled rice); coconut water: K002.
var (
	buffaloMilk = Food{ID: 1, Name: "Milk, whole, Buffalo", ChoPer100: 8.39, ProtPer100: 3.68, FatPer100: 6.58, PortionName: "1 glass (250 ml)", PortionG: 250, Liquid: true,
		Facts: []string{FactLactose, FactMilkProtein, FactAnimal, FactHighFODMAP}, FactsRecorded: true}
	milledRice = Food{ID: 2, Name: "Rice, raw, milled", ChoPer100: 78.24, ProtPer100: 7.94, FatPer100: 0.52, FibrePer100: 2.81, PortionName: "¼ cup, uncooked (50 g)", PortionG: 50, FactsRecorded: true}
	unknownBar = Food{ID: 3, Name: "Practice bar", ChoPer100: 60, ProtPer100: 8, FatPer100: 8, FibrePer100: 2, PortionName: "1 bar (40 g)", PortionG: 40, Portable: true}
)

// The client's note names lactose intolerance: before anyone ticks a box,
// suggestions leave milk out; with the needs confirmed and none recorded,
// milk is allowed again (the dietitian's word stands).
func TestCautionsNameNeedsUntilConfirmed(t *testing.T) {
	foods := []Food{buffaloMilk, milledRice}
	// 42 g carbohydrate: two glasses of buffalo milk (2 × 21 g) fit exactly,
	// and are the suggestion when nothing rules milk out.
	need := Need{ChoG: 42}
	if s, ok := Suggest(foods, need); !ok || !strings.Contains(s.Text(), "Milk") {
		t.Fatalf("without needs the suggestion should use milk here, got %q (ok %v)", s.Text(), ok)
	}
	o := OptionsForClient("Lactose intolerance: no milk or dairy", nil, false)
	s, ok := Suggest(foods, o.apply(need))
	if !ok || strings.Contains(s.Text(), "Milk") {
		t.Fatalf("unconfirmed needs from the note: got %q (ok %v)", s.Text(), ok)
	}
	if o := OptionsForClient("Lactose intolerance: no milk or dairy", nil, true); len(o.Needs) != 0 || o.GlutenFree {
		t.Fatalf("confirmed with none recorded, the note should not apply: %+v", o)
	}
}

// A food whose facts nobody recorded is left out for any need but
// gluten-free, and when nothing fits the suggestion says so.
func TestUnrecordedFactsAndNothingFits(t *testing.T) {
	need := Need{ChoG: 48}
	if _, ok := Suggest([]Food{unknownBar}, need); !ok {
		t.Fatal("without needs the bar should do")
	}
	if _, ok := Suggest([]Food{unknownBar}, Options{Needs: []string{"no_nuts"}}.apply(need)); ok {
		t.Fatal("a food of unknown facts was suggested to a client with no nuts")
	}
	if _, ok := Suggest([]Food{unknownBar}, Options{Needs: []string{"gluten_free"}}.apply(need)); !ok {
		t.Fatal("gluten is recorded for every food: the bar (no gluten flag) should do for gluten-free")
	}
	if !Breaks(buffaloMilk, []string{"vegan"}) || Breaks(milledRice, []string{"vegan", "low_fodmap", "no_nuts"}) {
		t.Fatal("Breaks disagrees with the facts")
	}
}

func TestNeedsIn(t *testing.T) {
	for _, c := range []struct {
		text string
		want []string
	}{
		{"Lactose intolerance: no milk or dairy", []string{"lactose_free", "milk_protein_free"}},
		{"Coeliac disease; peanut allergy", []string{"gluten_free", "no_peanuts"}},
		{"Vegan since 2020. IBS: follows a low FODMAP diet", []string{"vegan", "low_fodmap"}},
		{"Type 1 diabetes (insulin pump)", nil},
	} {
		var got []string
		for _, m := range NeedsIn(c.text) {
			got = append(got, m.Need.Code)
		}
		if strings.Join(got, ",") != strings.Join(c.want, ",") {
			t.Errorf("NeedsIn(%q) = %v, want %v", c.text, got, c.want)
		}
	}
}

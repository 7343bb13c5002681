package menu

import (
	"math/rand"
	"testing"
)

// A meal is food with a drink beside it (common practice): over the
// seeded composition table (IFCT 2017) and a practice's exercise products
// (invented names, as a practice would enter them), no breakfast, lunch,
// dinner or supper suggestion holds a gel, sports drink or recovery shake,
// or more than one drink; the feeds around exercise may still use them.
func TestMealsAreFoodWithOneDrink(t *testing.T) {
	foods := []Food{
		{ID: 9001, Name: "Riverside sports drink (6 %)", ChoPer100: 6, PortionName: "1 bottle (500 ml)", PortionG: 500, Liquid: true, Portable: true, Practice: true},
		{ID: 9002, Name: "Riverside recovery shake", ChoPer100: 12, ProtPer100: 5, FatPer100: 0.5, PortionName: "1 shaker (400 ml)", PortionG: 400, Liquid: true, Portable: true, Practice: true},
		{ID: 9003, Name: "Riverside energy gel", ChoPer100: 55, PortionName: "1 sachet (40 g)", PortionG: 40, Portable: true, Practice: true},
	}
	for _, r := range loadSeed(t) {
		foods = append(foods, r.Food)
	}
	rng := rand.New(rand.NewSource(11))
	meals, exercise := 0, 0
	// The loading meals of a 70 kg athlete at 10 g/kg over six eating
	// occasions (ACSM/AND/DC 2016: 10–12 g/kg/day for loading), with
	// about 0.3 g/kg of protein at a meal, then random ones.
	needs := []Need{{ChoG: 135, ProteinG: 21, Meal: true}, {ChoG: 136, ProteinG: 21, Meal: true}, {ChoG: 68, ProteinG: 10, Meal: true}}
	for i := 0; i < 120; i++ {
		need := Need{ChoG: 40 + rng.Float64()*140, Meal: true}
		if rng.Intn(2) == 0 {
			need.ProteinG = 15 + rng.Float64()*20 // about 0.3 g/kg (ACSM/AND/DC 2016)
		}
		// Successive feeds of a day avoid each other's foods, which pushes
		// a meal towards what is left, drinks among it.
		for _, f := range foods {
			if rng.Intn(3) == 0 {
				need.Avoid = append(need.Avoid, f.ID)
			}
		}
		needs = append(needs, need)
	}
	for _, need := range needs {
		s, ok := Suggest(foods, need)
		if !ok {
			continue
		}
		meals++
		drinks := 0
		for _, it := range s.Items {
			if forExercise(it.Food) {
				t.Errorf("meal of %.0f g: %q holds a product for exercise", need.ChoG, s.Text())
			}
			if it.Food.Liquid {
				drinks++
			}
		}
		if drinks > 1 {
			t.Errorf("meal of %.0f g: %q holds %d drinks", need.ChoG, s.Text(), drinks)
		}
	}
	// The same products still serve a feed during exercise.
	for _, cho := range []float64{30, 60, 90} {
		s, ok := Suggest(foods, Need{ChoG: cho, OnTheMove: true})
		if !ok {
			t.Fatalf("no in-event suggestion for %.0f g", cho)
		}
		for _, it := range s.Items {
			if forExercise(it.Food) {
				exercise++
			}
		}
	}
	if meals < 100 || exercise == 0 {
		t.Fatalf("%d meals suggested of 123, %d exercise products in the in-event feeds", meals, exercise)
	}
}

// A loading lunch once suggested as sugarcane juice, grapes and cow's milk
// (IFCT 2017 I002 and L002: 13.11 and 4.94 g carbohydrate per 100 ml;
// grapes about 13 g per 100 g, from memory) meets its grams but is two drinks at one sitting: it is no meal,
// though the same foods may make up a snack.
func TestTwoDrinksAreNoMeal(t *testing.T) {
	juice := Food{ID: 1, Name: "Sugarcane juice", ChoPer100: 13.11, ProtPer100: 0.16, PortionName: "1 glass", PortionG: 250, Liquid: true}
	grapes := Food{ID: 2, Name: "Grapes, black, seedless", ChoPer100: 13.0, ProtPer100: 0.6, PortionName: "1 cup", PortionG: 150}
	milk := Food{ID: 3, Name: "Cow's milk, whole", ChoPer100: 4.94, ProtPer100: 3.26, PortionName: "1 glass", PortionG: 250, Liquid: true}
	items := []Item{item(juice, 1.5), item(grapes, 2), item(milk, 2)}
	sum := 0.0
	for _, it := range items {
		sum += it.ChoG
	}
	need := Need{ChoG: sum}
	if !fits(items, need, Tolerance(sum)) {
		t.Fatalf("as a snack the %.0f g should fit", sum)
	}
	need.Meal = true
	if fits(items, need, Tolerance(sum)) {
		t.Fatalf("two drinks fit a meal: %q", Suggestion{Items: items}.Text())
	}
	if !fits(items[1:], Need{ChoG: items[1].ChoG + items[2].ChoG, Meal: true}, Tolerance(items[1].ChoG+items[2].ChoG)) {
		t.Fatal("grapes and one glass of milk should fit a meal")
	}
}

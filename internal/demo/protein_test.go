package demo

import (
	"context"
	"math"
	"strings"
	"testing"

	"larder/internal/fuel"
	"larder/internal/menu"
	"larder/internal/store"
	"larder/internal/testdb"
)

// demoPlansAndFoods loads the demo practice and returns its published
// plans' results with the active foods list as internal/menu reads it.
func demoPlansAndFoods(t *testing.T) (map[string]fuel.Plan, []menu.Food) {
	t.Helper()
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
		mf = append(mf, f.Menu())
	}
	plans, err := st.ListPlans(ctx, 0)
	if err != nil {
		t.Fatal(err)
	}
	out := map[string]fuel.Plan{}
	for _, p := range plans {
		if p.CreatedBy != nil || p.PublishedVersion == nil {
			continue
		}
		v, err := st.PublishedPlanVersion(ctx, p.ID)
		if err != nil {
			t.Fatal(err)
		}
		out[p.Title] = v.Result
	}
	if len(out) == 0 {
		t.Fatal("no published demo plan")
	}
	return out, mf
}

// TestMealSuggestionsMeetProtein: on every demo plan, with no dietary need
// and with each recorded need in turn, every feed outside exercise whose
// protein target is at least menu.MinProteinAwareG gets foods whose
// protein, worked out again from the foods' per-100 g figures and grams,
// lies within menu.ProteinTolerance of the plan's figure for that feed (and
// their carbohydrate within menu.Tolerance), or says that nothing fits. An
// in-event feed brings carbohydrate only. Without any need, nothing-fits
// stays rare.
func TestMealSuggestionsMeetProtein(t *testing.T) {
	plans, foods := demoPlansAndFoods(t)
	needSets := [][]string{nil}
	for _, n := range menu.Needs {
		needSets = append(needSets, []string{n.Code})
	}
	for _, codes := range needSets {
		aware, met, nothing := 0, 0, 0
		for title, plan := range plans {
			sugg := menu.PlanSuggestionsDetail(plan, foods, menu.OptionsForClient("", codes, true))
			for _, d := range plan.Days {
				for i, f := range d.Feeds {
					s, ok := sugg[menu.FeedKey("day", d.Date, i)]
					if !ok || f.ChoG <= 0 {
						continue
					}
					var cho, prot float64
					for _, it := range s.Items {
						cho += it.Grams * it.Food.ChoPer100 / 100
						prot += it.Grams * it.Food.ProtPer100 / 100
					}
					during := strings.Contains(f.Label, "during")
					if during || f.ProteinG < menu.MinProteinAwareG {
						continue
					}
					aware++
					if len(s.Items) == 0 {
						nothing++
						continue
					}
					if math.Abs(cho-f.ChoG) > menu.Tolerance(f.ChoG)+1e-6 {
						t.Errorf("%s %v, %s %s: %.1f g carbohydrate for a %.0f g feed (%s)", title, codes, d.Date, f.Label, cho, f.ChoG, s.Text())
					}
					if math.Abs(prot-f.ProteinG) > menu.ProteinTolerance(f.ProteinG)+1e-6 {
						t.Errorf("%s %v, %s %s: %.1f g protein for a %.0f g target (%s)", title, codes, d.Date, f.Label, prot, f.ProteinG, s.Text())
					}
					met++
				}
			}
		}
		if aware == 0 {
			t.Fatal("no feed with a protein target was checked")
		}
		t.Logf("needs %v: %d feeds with a protein target, %d met, %d nothing fits", codes, aware, met, nothing)
		if codes == nil && nothing*10 > aware {
			t.Errorf("without any need %d of %d feeds found nothing that fits", nothing, aware)
		}
	}
}

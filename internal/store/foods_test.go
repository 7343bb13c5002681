package store_test

import (
	"context"
	"strings"
	"testing"

	"larder/internal/store"
	"larder/internal/testdb"
)

// The seeded rows made from wheat carry the gluten flag and the rice, millet
// and fruit rows do not. Codes and names are those of the Indian Food
// Composition Tables 2017 (Longvah T et al., National Institute of Nutrition,
// Hyderabad); that wheat, semolina and vermicelli hold gluten and rice, ragi
// and jowar do not is common practice.
func TestSeededFoodsGlutenFlag(t *testing.T) {
	st := store.New(testdb.Pool(t))
	foods, err := st.ListFoods(context.Background(), true)
	if err != nil {
		t.Fatal(err)
	}
	bySource := map[string]store.Food{}
	for _, f := range foods {
		bySource[f.Source] = f
	}
	for code, want := range map[string]bool{
		"A018": true,  // Wheat flour, refined
		"A019": true,  // Wheat flour, atta
		"A022": true,  // Wheat, semolina
		"A023": true,  // Wheat, vermicelli
		"A015": false, // Rice, raw, milled
		"A011": false, // Rice flakes
		"A010": false, // Ragi
		"A005": false, // Jowar
		"A009": false, // Quinoa
		"E012": false, // Banana, ripe, robusta
		"I001": false, // Jaggery, cane
		"L002": false, // Milk, whole, Cow
	} {
		f, ok := bySource[code]
		if !ok {
			t.Errorf("seeded food %s missing", code)
			continue
		}
		if f.ContainsGluten != want {
			t.Errorf("%s %s: contains gluten = %v, want %v", code, f.Name, f.ContainsGluten, want)
		}
	}
}

func TestFoodGlutenFlagSavedAndAudited(t *testing.T) {
	ctx := context.Background()
	st := store.New(testdb.Pool(t))
	f := store.Food{Name: uniq("Practice oat biscuit"), CarbohydrateG: 65, ProteinG: 7, FatG: 15, FibreG: 5, EnergyKcal: 423,
		PortionName: "2 biscuits (30 g)", PortionG: 30, Portable: true, ContainsGluten: true, Source: store.SourceLabel}
	if err := st.AddFood(ctx, store.System, &f); err != nil {
		t.Fatal(err)
	}
	got, err := st.FoodByID(ctx, f.ID)
	if err != nil || !got.ContainsGluten {
		t.Fatalf("after add: %+v, %v; want contains gluten", got, err)
	}
	got.ContainsGluten = false // e.g. the practice switched to certified gluten-free oats
	if err := st.UpdateFood(ctx, store.System, &got); err != nil {
		t.Fatal(err)
	}
	again, err := st.FoodByID(ctx, f.ID)
	if err != nil || again.ContainsGluten {
		t.Fatalf("after update: %+v, %v; want no gluten", again, err)
	}
	var detail string
	if err := st.Pool.QueryRow(ctx, `SELECT detail::text FROM audit_log WHERE entity = 'food' AND entity_id = $1 AND action = 'update'`, f.ID).Scan(&detail); err != nil {
		t.Fatal(err)
	}
	if want := `"contains_gluten": false`; !strings.Contains(detail, want) {
		t.Errorf("audit detail %s lacks %s", detail, want)
	}
}
